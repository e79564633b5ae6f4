using System.Globalization;
using System.Text;
using System.Text.Json;
using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// The same simulated sweep (φ = 2.1 eV, d = 1.6 nm, 100 µm², 1 % noise) written in the layouts the importer accepts,
/// each fitted end to end by <c>fit --json --area 100</c>: every layout must give the same barrier.
/// </summary>
public class FitLayoutsTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static (double[] V, double[] I) Sweep(int seed = 77)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        double[] theta = [2.1 * PhysicalConstants.JoulePerElectronVolt, 1.6e-9, 1.0, 100e-12];
        var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-1.0, 1.0, 101) { RelativeNoise = 0.01, Seed = seed });
        return ([.. v], [.. i]);
    }

    public static TheoryData<string> Layouts => new()
    {
        "comma-V-A", "tab-mV-nA", "semicolon-decimal-comma-uA", "spaces-units-row", "bracket-units-extra-columns",
        "preamble-key-equals", "current-density-A-per-cm2", "crlf-bom-quoted", "reversed-columns-Id-Vd", "loop-sweep",
    };

    private static string Write(string layout, double[] v, double[] i)
    {
        var sb = new StringBuilder();
        string F(double x) => x.ToString("R", Inv);
        string Fc(double x) => x.ToString("R", Inv).Replace('.', ',');
        switch (layout)
        {
            case "comma-V-A":
                sb.Append("Voltage (V),Current (A)\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(v[k])).Append(',').Append(F(i[k])).Append('\n');
                break;
            case "tab-mV-nA":
                sb.Append("Bias (mV)\tCurrent (nA)\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(v[k] * 1e3)).Append('\t').Append(F(i[k] * 1e9)).Append('\n');
                break;
            case "semicolon-decimal-comma-uA":
                sb.Append("# lot: KM-L01\nU [V];I [uA]\n");
                for (int k = 0; k < v.Length; k++) sb.Append(Fc(v[k])).Append(';').Append(Fc(i[k] * 1e6)).Append('\n');
                break;
            case "spaces-units-row":
                sb.Append("Vbias   Imeas\nV   A\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(v[k])).Append("   ").Append(F(i[k])).Append('\n');
                break;
            case "bracket-units-extra-columns":
                sb.Append("index,time [s],V [V],I [A],status\n");
                for (int k = 0; k < v.Length; k++) sb.Append(k).Append(',').Append(F(0.1 * k)).Append(',').Append(F(v[k])).Append(',').Append(F(i[k])).Append(",ok\n");
                break;
            case "preamble-key-equals":
                sb.Append("Kestrel Microsystems probe log (invented)\nlot = KM-L01\nwafer = W03\narea = 100 um2\n\nV,I\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(v[k])).Append(',').Append(F(i[k])).Append('\n');
                break;
            case "current-density-A-per-cm2":
                sb.Append("# area: 100 um2\nV (V),J (A/cm2)\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(v[k])).Append(',').Append(F(i[k] / 1e-6)).Append('\n'); // 100 µm² = 1e-6 cm²
                break;
            case "crlf-bom-quoted":
                sb.Append('\uFEFF').Append("\"Voltage (V)\",\"Current (A)\"\r\n");
                for (int k = 0; k < v.Length; k++) sb.Append('"').Append(F(v[k])).Append("\",\"").Append(F(i[k])).Append("\"\r\n");
                break;
            case "reversed-columns-Id-Vd":
                sb.Append("Id (A),Vd (V)\n");
                for (int k = 0; k < v.Length; k++) sb.Append(F(i[k])).Append(',').Append(F(v[k])).Append('\n');
                break;
            case "loop-sweep":
                {
                    // 0 → +1 V → −1 V → 0: the return passes are measured again, with their own noise.
                    var (_, again) = Sweep(seed: 78);
                    sb.Append("Voltage (V),Current (A)\n");
                    for (int k = 50; k < v.Length; k++) sb.Append(F(v[k])).Append(',').Append(F(i[k])).Append('\n');
                    for (int k = v.Length - 2; k >= 0; k--) sb.Append(F(v[k])).Append(',').Append(F(k >= 50 ? again[k] : i[k])).Append('\n');
                    for (int k = 1; k <= 50; k++) sb.Append(F(v[k])).Append(',').Append(F(again[k])).Append('\n');
                    break;
                }
        }
        return sb.ToString();
    }

    [Theory]
    [MemberData(nameof(Layouts))]
    public void FitJson_EachLayout_RecoversTheSameBarrier(string layout)
    {
        using var dir = new TempFolder();
        var (v, i) = Sweep();
        string path = dir.File(layout + ".csv");
        File.WriteAllText(path, Write(layout, v, i), new UTF8Encoding(false));
        var (code, output, err) = CliRunner.Run("fit", path, "--json", "--area", "100");
        Assert.True(code == 0, $"{layout}: exit {code}\n{err}\n{output}");
        using var doc = JsonDocument.Parse(output.Trim());
        var pars = doc.RootElement.GetProperty("parameters");
        Assert.InRange(pars.GetProperty("barrier_height_eV").GetProperty("value").GetDouble(), 2.07, 2.13);
        Assert.InRange(pars.GetProperty("thickness_nm").GetProperty("value").GetDouble(), 1.58, 1.62);
    }
}
