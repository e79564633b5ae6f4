using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Physics;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Model and Jacobian cost per bias point for the analytic barrier models: J(V) alone, J(V) with ∂J/∂θ, and the junction
/// current I = A·J with and without ∂I/∂θ. Each invocation sweeps the 201 bias points of the benchmark curve, and the
/// reported time is per point (<see cref="BenchmarkAttribute.OperationsPerInvoke"/> = 201).
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*ModelBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class ModelBenchmarks
{
    private IBarrierModel _barrier = SimmonsRectangularModel.Instance;
    private JunctionCurrentModel _junction = null!;
    private double[] _voltages = [];
    private double[] _theta = [];
    private double[] _barrierTheta = [];
    private double[] _gradient = [];

    /// <summary>Barrier model, by its <c>--model</c> name.</summary>
    [ParamsSource(nameof(ModelNames))]
    public string Model { get; set; } = BarrierModelCatalog.Simmons;

    public static IEnumerable<string> ModelNames => BenchmarkCurves.AnalyticModels;

    [GlobalSetup]
    public void Setup()
    {
        _junction = BenchmarkCurves.Model(Model);
        _barrier = _junction.Barrier;
        _voltages = BenchmarkCurves.Voltages();
        _theta = BenchmarkCurves.TrueParameters(_junction);
        _barrierTheta = _theta[.._junction.AreaIndex];
        _gradient = new double[_theta.Length];
    }

    [Benchmark(OperationsPerInvoke = BenchmarkCurves.Points)]
    public double CurrentDensity()
    {
        double sum = 0;
        ReadOnlySpan<double> theta = _barrierTheta;
        foreach (double v in _voltages) sum += _barrier.CurrentDensity(v, theta);
        return sum;
    }

    [Benchmark(OperationsPerInvoke = BenchmarkCurves.Points)]
    public double CurrentDensityWithGradient()
    {
        double sum = 0;
        ReadOnlySpan<double> theta = _barrierTheta;
        Span<double> gradient = _gradient.AsSpan(0, _barrierTheta.Length);
        foreach (double v in _voltages) sum += _barrier.CurrentDensity(v, theta, gradient) + gradient[0];
        return sum;
    }

    [Benchmark(OperationsPerInvoke = BenchmarkCurves.Points)]
    public double JunctionCurrent()
    {
        double sum = 0;
        ReadOnlySpan<double> theta = _theta;
        foreach (double v in _voltages) sum += _junction.Current(v, theta);
        return sum;
    }

    [Benchmark(OperationsPerInvoke = BenchmarkCurves.Points)]
    public double JunctionCurrentWithGradient()
    {
        double sum = 0;
        ReadOnlySpan<double> theta = _theta;
        Span<double> gradient = _gradient;
        foreach (double v in _voltages) sum += _junction.Current(v, theta, gradient) + gradient[0];
        return sum;
    }
}

/// <summary>
/// The numerical reference model (<c>wkb</c>: Tsu–Esaki integral with WKB transmission) per bias point. It is orders of
/// magnitude slower than the analytic models, so each invocation sweeps only 21 points of the ±1.2 V range and the job
/// is shorter. Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*WkbModelBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 2, iterationCount: 5)]
public class WkbModelBenchmarks
{
    private const int Points = 21;
    private JunctionCurrentModel _junction = null!;
    private double[] _voltages = [];
    private double[] _theta = [];
    private double[] _barrierTheta = [];
    private double[] _gradient = [];

    [GlobalSetup]
    public void Setup()
    {
        _junction = BenchmarkCurves.Model(BarrierModelCatalog.Wkb);
        _voltages = IvSimulator.SweepVoltages(new SimulationSpec(BenchmarkCurves.FromV, BenchmarkCurves.ToV, Points));
        _theta = BenchmarkCurves.TrueParameters(_junction);
        _barrierTheta = _theta[.._junction.AreaIndex];
        _gradient = new double[_theta.Length];
    }

    [Benchmark(OperationsPerInvoke = Points)]
    public double Wkb_CurrentDensity()
    {
        double sum = 0;
        foreach (double v in _voltages) sum += _junction.Barrier.CurrentDensity(v, _barrierTheta);
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Points)]
    public double Wkb_CurrentDensityWithGradient()
    {
        double sum = 0;
        Span<double> gradient = _gradient.AsSpan(0, _barrierTheta.Length);
        foreach (double v in _voltages) sum += _junction.Barrier.CurrentDensity(v, _barrierTheta, gradient) + gradient[0];
        return sum;
    }

    [Benchmark(OperationsPerInvoke = Points)]
    public double Wkb_JunctionCurrentWithGradient()
    {
        double sum = 0;
        foreach (double v in _voltages) sum += _junction.Current(v, _theta, _gradient) + _gradient[0];
        return sum;
    }
}
