using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Fitting;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Output cost per fit: the PNG fit plot (<see cref="FitPlotRenderer.RenderPng"/>, 900 × 700 px; target from issue 6: under
/// 30 ms per plot) and the JSON line that <c>fit --json</c> prints (<see cref="FitJsonFormatter.Format"/>), for the area-known
/// Simmons fit of the benchmark curve.
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*ReportingBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class ReportingBenchmarks
{
    private FitResult _result = null!;

    [GlobalSetup]
    public void Setup() =>
        _result = JunctionFitter.Fit(BenchmarkCurves.SimmonsCurve(), BenchmarkCurves.Model(BarrierModelCatalog.Simmons), BenchmarkCurves.AreaKnown);

    [Benchmark]
    public int RenderPng() => FitPlotRenderer.RenderPng(_result).Length;

    [Benchmark]
    public int FormatJsonLine() => FitJsonFormatter.Format(_result).Length;
}
