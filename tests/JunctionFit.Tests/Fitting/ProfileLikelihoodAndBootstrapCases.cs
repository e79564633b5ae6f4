using System.Collections.Immutable;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The simulated junctions of the interval tests: φ = 2.0 eV, d = 1.5 nm, area 100 µm², mass ratio 1, 1 % relative current
/// noise, a linear sweep over ±1.2 V (±0.6 φ) with 201 points, as in <see cref="IntervalCoverageTests"/>. Invented truth,
/// the project's own simulator.
/// </summary>
internal static class ProfileLikelihoodAndBootstrapCases
{
    public const double PhiEv = 2.0, ThicknessNm = 1.5, AreaM2 = 100e-12, Noise = 0.01;

    public static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    public static readonly double[] TruthSi = [PhiEv * PhysicalConstants.JoulePerElectronVolt, ThicknessNm * 1e-9, 1.0, AreaM2];

    public static IvCurve Simulate(int seed)
    {
        var (v, i) = IvSimulator.Simulate(Model, TruthSi, new SimulationSpec(-1.2, 1.2, 201) { RelativeNoise = Noise, Seed = seed });
        return new IvCurve($"sim-{seed}.csv", v, i);
    }

    public static FitOptions Options(bool areaKnown) => areaKnown
        ? FitOptions.Default with { FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, AreaM2) }
        : FitOptions.Default;

    /// <summary>Keys of the free parameters and their true values in display units.</summary>
    public static (string Key, double Truth)[] FreeKeys(bool areaKnown) => areaKnown
        ? [("barrier_height_eV", PhiEv), ("thickness_nm", ThicknessNm)]
        : [("barrier_height_eV", PhiEv), ("thickness_nm", ThicknessNm), ("area_m2", AreaM2)];

    /// <summary>Width of an interval in the transformed (log) space, where all three parameters live.</summary>
    public static double LogWidth(ParameterEstimate p) => Math.Log(p.Upper95!.Value / p.Lower95!.Value);

    /// <summary>
    /// Physical bounds of a parameter in display units (0 &lt; φ ≤ 20 eV, 0 &lt; d ≤ 100 nm, 0 &lt; area), from the model's
    /// parameter definitions.
    /// </summary>
    public static (double Lower, double Upper) Bounds(string key)
    {
        var def = Model.Parameters[Model.IndexOf(key)];
        return (def.ToDisplay(def.LowerSi), def.ToDisplay(def.UpperSi));
    }
}
