using System.Collections.Immutable;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Benchmarks;

/// <summary>
/// The one simulated curve every fit benchmark uses: Simmons rectangular barrier, φ = 2.0 eV, d = 1.5 nm,
/// area 100 µm², m*/mₑ = 1, 201 points from −1.2 V to +1.2 V, 1 % Gaussian current noise, fixed seed.
/// Invented data (the project's own simulator), for timing only.
/// </summary>
internal static class BenchmarkCurves
{
    public const int Points = 201;
    public const double FromV = -1.2;
    public const double ToV = 1.2;
    public const double RelativeNoise = 0.01;
    public const double BarrierHeightEv = 2.0;
    public const double ThicknessNm = 1.5;
    public const double AreaUm2 = 100.0;
    public const double AreaM2 = AreaUm2 * 1e-12;

    /// <summary>The barrier models timed per point and per fit (wkb is timed apart: it is a numerical integral).</summary>
    public static readonly string[] AnalyticModels =
        [BarrierModelCatalog.Simmons, BarrierModelCatalog.SimmonsImage, BarrierModelCatalog.Bdr, BarrierModelCatalog.FowlerNordheim];

    /// <summary>The junction model (no parasitics) for <paramref name="name"/>.</summary>
    public static JunctionCurrentModel Model(string name) => new(BarrierModelCatalog.Create(name));

    /// <summary>
    /// SI parameters for <paramref name="model"/>: φ = 2.0 eV, d = 1.5 nm, area 100 µm², everything else at its default.
    /// </summary>
    public static double[] TrueParameters(JunctionCurrentModel model)
    {
        var defs = model.Parameters;
        var theta = new double[defs.Count];
        for (int k = 0; k < theta.Length; k++) theta[k] = defs[k].DefaultSi;
        theta[model.IndexOf(StandardParameters.BarrierHeight.Key)] = BarrierHeightEv * PhysicalConstants.JoulePerElectronVolt;
        theta[model.IndexOf(StandardParameters.Thickness.Key)] = ThicknessNm * 1e-9;
        theta[model.AreaIndex] = AreaM2;
        return theta;
    }

    /// <summary>The 201-point Simmons curve with 1 % noise; <paramref name="seed"/> picks the noise realisation.</summary>
    public static IvCurve SimmonsCurve(int seed = 1)
    {
        var model = Model(BarrierModelCatalog.Simmons);
        var spec = new SimulationSpec(FromV, ToV, Points) { RelativeNoise = RelativeNoise, Seed = seed };
        var (v, i) = IvSimulator.Simulate(model, TrueParameters(model), spec);
        return new IvCurve($"sim-{seed}.csv", v, i) { AreaM2 = AreaM2 };
    }

    /// <summary>The noise-free sweep voltages of the benchmark curve.</summary>
    public static double[] Voltages() => IvSimulator.SweepVoltages(new SimulationSpec(FromV, ToV, Points));

    /// <summary>Area known: fixed at 100 µm² (what <c>--area 100</c> does).</summary>
    public static FitOptions AreaKnown { get; } = new()
    {
        FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, AreaM2),
    };

    /// <summary>Area free: φ, d and the area are fitted; the file's area is only the start value.</summary>
    public static FitOptions AreaFree { get; } = FitOptions.Default;
}
