using System.Globalization;
using System.Text.Json;
using Xunit;

namespace JunctionFit.Tests.Cli;

public class TemperatureSeriesTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static List<string> Series(TempFolder dir, double activationEv)
    {
        var files = new List<string>();
        foreach (double t in new[] { 200.0, 250.0, 300.0, 350.0 })
        {
            var (code, csv, err) = CliRunner.Run("simulate", "--barrier-height", "2.0", "--thickness", "1.5", "--area", "100", "--from", "-0.8", "--to", "0.8",
                "--points", "121", "--noise", "0.01", "--seed", ((int)t).ToString(Inv), "--temperature", t.ToString(Inv),
                "--header", $"temperature={t.ToString(Inv)} K", "--header", "area=100 um2");
            Assert.True(code == 0, err);
            if (activationEv > 0)
            {
                // An activated channel: every current scaled by exp(−E_a/kT) relative to 300 K (k = 8.617333262e-5 eV/K, CODATA 2018).
                double factor = Math.Exp(-activationEv / 8.617333262e-5 * (1 / t - 1 / 300.0));
                var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries).Select(l =>
                {
                    if (l.StartsWith('#') || l.StartsWith('V')) return l;
                    var parts = l.Split(',');
                    return parts[0] + "," + (double.Parse(parts[1], Inv) * factor).ToString("R", Inv);
                });
                csv = string.Join('\n', lines) + "\n";
            }
            string path = dir.File($"dev_{t:0}K.csv");
            File.WriteAllText(path, csv);
            files.Add(path);
        }
        return files;
    }

    [Fact]
    public void TemperatureSeries_DirectTunnelling_JointFitRecoversBarrierAndCallsItTunnelling()
    {
        // Thermal factor πckT/sin(πckT) (Simmons 1964; Stratton 1962) applied by simulate at each temperature.
        using var dir = new TempFolder();
        var files = Series(dir, 0);
        var (code, output, err) = CliRunner.Run(["temperature-series", .. files, "--area-from-file", "--json"]);
        Assert.True(code == 0, err + output);
        using var doc = JsonDocument.Parse(output.Trim());
        var root = doc.RootElement;
        Assert.Equal("ok", root.GetProperty("status").GetString());
        var phi = root.GetProperty("parameters").GetProperty("barrier_height_eV");
        Assert.InRange(phi.GetProperty("value").GetDouble(), 1.98, 2.02);
        Assert.InRange(2.0, phi.GetProperty("ci95")[0].GetDouble(), phi.GetProperty("ci95")[1].GetDouble());
        Assert.True(root.GetProperty("arrhenius").GetProperty("direct_tunnelling").GetBoolean());
    }

    [Fact]
    public void TemperatureSeries_StrongArrhenius_ReportedAsNotDirectTunnelling()
    {
        using var dir = new TempFolder();
        var files = Series(dir, 0.3); // E_a = 0.3 eV: hopping or Poole–Frenkel-like, far above the thermal factor's few meV
        var (code, output, _) = CliRunner.Run(["temperature-series", .. files, "--area-from-file", "--json"]);
        Assert.Equal(1, code);
        using var doc = JsonDocument.Parse(output.Trim());
        var root = doc.RootElement;
        Assert.NotEqual("ok", root.GetProperty("status").GetString());
        var arrhenius = root.GetProperty("arrhenius");
        Assert.False(arrhenius.GetProperty("direct_tunnelling").GetBoolean());
        Assert.InRange(arrhenius.GetProperty("activation_energy_eV").GetDouble(), 0.27, 0.33);
        Assert.Contains("not direct tunneling", arrhenius.GetProperty("verdict").GetString(), StringComparison.Ordinal);
    }
}
