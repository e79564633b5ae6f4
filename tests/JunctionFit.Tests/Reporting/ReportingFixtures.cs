using System.Collections.Immutable;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Tests.Reporting;

/// <summary>Hand-built results around a synthetic Simmons curve. Invented data (lab "Kestrel Microsystems").</summary>
internal static class ReportingFixtures
{
    public const string HostileName = "<script>alert(1)</script>&\"";

    /// <summary>φ = 2.0 eV, d = 1.5 nm, area 100 µm², −0.8 … 0.8 V, 2 % noise and a 20 fA floor.</summary>
    public static CurveSnapshot SyntheticCurve(int points = 161, int seed = 7)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        double[] truth = [2.0 * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 1e-10];
        double[] fitted = [2.001 * PhysicalConstants.JoulePerElectronVolt, 1.4995e-9, 1.0, 1.0e-10];
        var spec = new SimulationSpec(-0.8, 0.8, points) { RelativeNoise = 0.02, NoiseFloorA = 2e-14, Seed = seed };
        var (v, i) = IvSimulator.Simulate(model, truth, spec);
        var modelI = new double[points];
        var used = new bool[points];
        var residual = new double[points];
        for (int k = 0; k < points; k++)
        {
            modelI[k] = model.Current(v[k], fitted);
            used[k] = Math.Abs(i[k]) > 2e-13 && Math.Sign(i[k]) == Math.Sign(v[k]);
            residual[k] = i[k] != 0 && modelI[k] != 0 ? Math.Log(Math.Abs(i[k])) - Math.Log(Math.Abs(modelI[k])) : double.NaN;
        }
        return new CurveSnapshot(v, i, [.. modelI], [.. used], [.. residual]);
    }

    public static FitResult OkResult(string sourcePath = "KM-A01/W07/die_03_05.csv", string lot = "KM-A01")
    {
        var curve = SyntheticCurve();
        int used = 0;
        foreach (bool u in curve.Used) if (u) used++;
        return new FitResult
        {
            SourcePath = sourcePath,
            Model = "simmons",
            Status = FitStatus.Ok,
            Lot = lot,
            Wafer = "W07",
            DieX = 3,
            DieY = 5,
            Parameters =
            [
                new ParameterEstimate("barrier_height_eV", "φ", "eV", 2.0041, 0.0043, 1.9957, 2.0126, false),
                new ParameterEstimate("thickness_nm", "d", "nm", 1.4968, 0.0021, 1.4927, 1.5009, false),
                new ParameterEstimate("mass_ratio", "m*/mₑ", "", 1.0, null, null, null, true),
                new ParameterEstimate("area_m2", "A", "m²", 1.01e-10, 0.018e-10, 0.975e-10, 1.046e-10, false),
            ],
            Quality = new FitQuality(used, curve.VoltageV.Length - used, 9, 0.0123 * used, 1.03, true,
                "relative step below tolerance", "scaled by reduced chi-square", "Wald, log-transformed"),
            CorrelationKeys = ["barrier_height_eV", "thickness_nm", "area_m2"],
            CorrelationRowMajor = [1.0, -0.93, 0.71, -0.93, 1.0, -0.88, 0.71, -0.88, 1.0],
            Curve = curve,
            TransitionVoltageV = 0.781,
            Warnings = ["11 points at or below the noise floor were masked"],
        };
    }

    public static FitResult PoorResult() => OkResult("KM-A01/W07/die_04_05.csv") with
    {
        Status = FitStatus.PoorFit,
        DieX = 4,
        Warnings = ["residuals show a systematic trend: the model does not describe the data", "thickness and area are strongly correlated (|ρ| > 0.99); fix the area"],
    };

    /// <summary>A one-sided sweep with a 0.1 nA noise floor: many masked points near zero bias, a few of the wrong sign.</summary>
    public static FitResult NoisyResult()
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        double[] p = [1.2 * PhysicalConstants.JoulePerElectronVolt, 2.1e-9, 1.0, 4e-11];
        var spec = new SimulationSpec(0.0, 1.1, 221) { RelativeNoise = 0.04, NoiseFloorA = 1.5e-9, Seed = 3 };
        var (v, i) = IvSimulator.Simulate(model, p, spec);
        int n = v.Length;
        var modelI = new double[n];
        var used = new bool[n];
        var residual = new double[n];
        int usedCount = 0;
        for (int k = 0; k < n; k++)
        {
            modelI[k] = model.Current(v[k], p);
            used[k] = i[k] > 4e-9;
            if (used[k]) usedCount++;
            residual[k] = i[k] != 0 && modelI[k] != 0 ? Math.Log(Math.Abs(i[k])) - Math.Log(Math.Abs(modelI[k])) : double.NaN;
        }
        return OkResult("/data/kestrel/KM-A02/W11/a very long folder name that keeps going/die_12_07 (re-probe, second touchdown).csv", "KM-A02") with
        {
            Status = FitStatus.PoorFit,
            Wafer = "W11",
            DieX = 12,
            DieY = 7,
            Parameters =
            [
                new ParameterEstimate("barrier_height_eV", "φ", "eV", 1.2, 0.03, 1.14, 1.26, false),
                new ParameterEstimate("thickness_nm", "d", "nm", 2.1, 0.04, 2.02, 2.18, false),
                new ParameterEstimate("mass_ratio", "m*/mₑ", "", 0.62, 0.05, 0.53, 0.73, false),
                new ParameterEstimate("area_m2", "A", "m²", 4e-11, null, null, null, false),
            ],
            Quality = new FitQuality(usedCount, n - usedCount, 37, 812.5, 4.1, true, "gradient below tolerance", "unscaled", "profile likelihood"),
            Curve = new CurveSnapshot(v, i, [.. modelI], [.. used], [.. residual]),
            TransitionVoltageV = null,
            Warnings =
            [
                "the sweep reaches |V| = 1.1 V, at or above the fitted barrier height of 1.2 eV: the intermediate-bias Simmons formula is outside its range there; restrict the bias range or use a high-field model",
                "thickness and mass ratio are strongly correlated (|ρ| = 0.995); fix the mass ratio or widen the bias range",
                "the area's standard error could not be estimated",
                "reduced χ² = 4.1: the model does not describe the data within the noise model",
            ],
        };
    }

    public static FitResult FailedResult() =>
        FitResult.Failed("KM-A01/W07/die_05_05.csv", "simmons", "every point is below the noise floor; check the probe contact") with
        {
            Lot = "KM-A01",
            Wafer = "W07",
            DieX = 5,
            DieY = 5,
        };
}
