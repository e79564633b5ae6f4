using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Benchmarks;

/// <summary>
/// One whole <see cref="JunctionFitter.Fit"/> per analytic model (masking, data-driven grid start, multi-start
/// Levenberg–Marquardt, covariance, diagnostics) on the same 201-point simulated Simmons curve
/// (φ = 2.0 eV, d = 1.5 nm, 100 µm², 1 % noise, ±1.2 V), with the area known (fixed at 100 µm², as <c>--area 100</c>)
/// and with the area free. Every model fits the Simmons curve, so for the other models the time includes whatever misfit
/// that implies; the status and iteration count of each case are printed once in the setup.
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*FitBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class FitBenchmarks
{
    private IvCurve _curve = null!;
    private JunctionCurrentModel _model = null!;
    private FitOptions _options = null!;

    [ParamsSource(nameof(ModelNames))]
    public string Model { get; set; } = BarrierModelCatalog.Simmons;

    /// <summary>True: area fixed at 100 µm² (φ, d free); false: φ, d and area free.</summary>
    [Params(true, false)]
    public bool AreaKnown { get; set; }

    public static IEnumerable<string> ModelNames => BenchmarkCurves.AnalyticModels;

    [GlobalSetup]
    public void Setup()
    {
        _curve = BenchmarkCurves.SimmonsCurve();
        _model = BenchmarkCurves.Model(Model);
        _options = AreaKnown ? BenchmarkCurves.AreaKnown : BenchmarkCurves.AreaFree;
        string label = $"// fit {Model}, area {(AreaKnown ? "known" : "free")}";
        try
        {
            Console.WriteLine($"{label}: {Describe(JunctionFitter.Fit(_curve, _model, _options))}");
        }
        catch (ArgumentException e)
        {
            // A fit must report failure as a status; print the exception so the NA row in the table has its reason.
            Console.WriteLine($"{label}: JunctionFitter.Fit threw {e.GetType().Name}: {e.Message}");
        }
    }

    [Benchmark]
    public FitResult Fit() => JunctionFitter.Fit(_curve, _model, _options);

    internal static string Describe(FitResult r)
    {
        var parts = new List<string>(r.Parameters.Length);
        foreach (var p in r.Parameters) parts.Add($"{p.Key}={p.Value:G6}");
        return $"status {r.Status}, iterations {r.Quality?.Iterations}, rss {r.Quality?.ResidualSumOfSquares:G8}, {string.Join(", ", parts)}";
    }
}

/// <summary>
/// The numerical reference model (<c>wkb</c>) in one whole fit of the same curve, area known. Slow (each model value is a
/// quadrature), so the job is short. Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*WkbFitBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Monitoring, launchCount: 1, warmupCount: 1, iterationCount: 3)]
public class WkbFitBenchmarks
{
    private IvCurve _curve = null!;
    private JunctionCurrentModel _model = null!;

    [GlobalSetup]
    public void Setup()
    {
        _curve = BenchmarkCurves.SimmonsCurve();
        _model = BenchmarkCurves.Model(BarrierModelCatalog.Wkb);
    }

    [Benchmark]
    public FitResult Wkb_Fit_AreaKnown() => JunctionFitter.Fit(_curve, _model, BenchmarkCurves.AreaKnown);
}
