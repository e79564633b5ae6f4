using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Batch throughput: N = 1000 different in-memory 201-point curves (the benchmark curve with 1000 noise seeds) through
/// <see cref="JunctionFitter.Fit"/>, area known (as <c>fit --area 100</c>), one after the other and with
/// <see cref="Parallel.For(int, int, ParallelOptions, Action{int})"/> on 2 cores. Times are per curve
/// (<see cref="BenchmarkAttribute.OperationsPerInvoke"/> = 1000); no file I/O (see <c>run-cli-throughput.sh</c> for the
/// whole command). Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*BatchBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class BatchBenchmarks
{
    public const int Curves = 1000;

    private IvCurve[] _curves = [];
    private JunctionCurrentModel _model = null!;
    private readonly ParallelOptions _twoCores = new() { MaxDegreeOfParallelism = 2 };

    [GlobalSetup]
    public void Setup()
    {
        _model = BenchmarkCurves.Model(BarrierModelCatalog.Simmons);
        _curves = new IvCurve[Curves];
        for (int k = 0; k < Curves; k++) _curves[k] = BenchmarkCurves.SimmonsCurve(k + 1);
    }

    [Benchmark(Baseline = true, OperationsPerInvoke = Curves)]
    public int Fit1000_Sequential()
    {
        int ok = 0;
        for (int k = 0; k < _curves.Length; k++)
        {
            if (JunctionFitter.Fit(_curves[k], _model, BenchmarkCurves.AreaKnown).Status == Results.FitStatus.Ok) ok++;
        }
        return ok;
    }

    [Benchmark(OperationsPerInvoke = Curves)]
    public int Fit1000_ParallelFor_2Cores()
    {
        int ok = 0;
        Parallel.For(0, _curves.Length, _twoCores, k =>
        {
            if (JunctionFitter.Fit(_curves[k], _model, BenchmarkCurves.AreaKnown).Status == Results.FitStatus.Ok) Interlocked.Increment(ref ok);
        });
        return ok;
    }
}
