using System.Text.Json;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Cli;

public class MosCommandTests
{
    private static string Folder => Path.Combine(AppContext.BaseDirectory, "Reference", "RealData", "gate-oxide-nmos");

    [Fact]
    public void Fit_MosWithCv_JsonCarriesThicknessFlatBandAndCet()
    {
        // IHP Open PDK SG13G2 nMOS and gate capacitor (Apache-2.0; Reference/RealData/gate-oxide-nmos/SOURCE.md), the command of
        // issue 12. CET = 3.9 ε₀ A/C_max = 3.048 nm (hand calculation from the file, see CvFileReaderTests); t_ox plausible
        // (1.8-2.5 nm; common practice, no source) and below CET.
        var (code, stdout, stderr) = CliRunner.Run("fit", Path.Combine(Folder, "nmos_gate_W10_L10_300K.csv"), "--model", "mos", "--substrate", "p",
            "--area-from-file", "--voltage-column", "vg", "--current-column", "ig", "--json", "--cv", Path.Combine(Folder, "nmos_gate_capacitor_cv_300K.csv"));
        Assert.True(code is 0 or 1, stderr);
        using var doc = JsonDocument.Parse(stdout.Trim());
        var root = doc.RootElement;
        Assert.Equal("mos", root.GetProperty("model").GetString());
        Assert.NotEqual("failed", root.GetProperty("status").GetString());
        double t = root.GetProperty("parameters").GetProperty("thickness_nm").GetProperty("value").GetDouble();
        Assert.InRange(t, 1.8, 2.5);
        Assert.True(root.GetProperty("parameters").TryGetProperty("flatband_voltage_V", out _));
        double cet = root.GetProperty("cet_nm").GetProperty("value").GetDouble();
        Assert.Equal(3.048, cet, 1e-3);
        Assert.True(cet > t);
    }

    [Fact]
    public void Fit_MosOptionsWithOtherModel_IsUsageError()
    {
        var (code, _, stderr) = CliRunner.Run("fit", Path.Combine(Folder, "nmos_gate_W10_L10_300K.csv"), "--substrate", "n",
            "--voltage-column", "vg", "--current-column", "ig");
        Assert.Equal(2, code);
        Assert.Contains("--model mos", stderr, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_SimulatedPChannel_RecoversThicknessAndFlatBand()
    {
        // Invented p-channel gate current from the model itself (n substrate, p+ poly, t_ox = 1.97 nm, V_fb = +0.9 V, holes),
        // 0.5 % noise with a fixed seed: the fit recovers t_ox within 1 % and V_fb within 30 mV (self-consistency, no outside source).
        var model = new MosGateStackModel(new MosStackOptions { Substrate = SubstrateType.N }, 300);
        double[] p = [1.97e-9, 0.9, 4.5 * PhysicalConstants.JoulePerElectronVolt, 0.32];
        var rng = new Random(7);
        var v = new List<double>();
        var i = new List<double>();
        for (double vg = -1.5; vg <= 0.5001; vg += 0.05)
        {
            v.Add(Math.Round(vg, 3));
            i.Add(1e-10 * model.CurrentDensity(Math.Round(vg, 3), p) * (1 + 0.005 * (rng.NextDouble() * 2 - 1)));
        }
        var curve = new IvCurve("pmos-sim.csv", [.. v], [.. i]) { AreaM2 = 1e-10, TemperatureK = 300 };
        var plan = new FitPlan(["mos"], BarrierModelOptions.Default with { Mos = new MosStackOptions { Substrate = SubstrateType.N } },
            ParasiticOptions.None, new FitOptions { FixAreaFromMetadata = true });
        var fit = plan.Fit(curve);
        Assert.NotEqual(JunctionFit.Results.FitStatus.Failed, fit.Status);
        Assert.Equal(1.97, fit.Find("thickness_nm")!.Value, 0.02);
        Assert.Equal(0.9, fit.Find("flatband_voltage_V")!.Value, 0.03);
    }
}
