using System.Globalization;
using System.Text.Json;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// The lot flow end to end (batch → drift → thickness) on simulated lots with planted effects: the acceptance case of
/// the lot issue. Invented data, made with the tool's own simulate command; the truth is known by construction.
/// </summary>
public class LotFlowTests
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Three lots × one wafer × nine dies; KM-C02 +0.15 eV; die scatter ±0.01 eV, ±0.005 nm.</summary>
    private static void MakeLots(TempFolder dir)
    {
        var rng = new Random(42);
        foreach (var (lot, phi0) in new[] { ("KM-C01", 2.0), ("KM-C02", 2.15), ("KM-C03", 2.0) })
        {
            string folder = Path.Combine(dir.Path, "lots", lot, "W01");
            Directory.CreateDirectory(folder);
            for (int x = 0; x < 3; x++)
            for (int y = 0; y < 3; y++)
            {
                double phi = phi0 + 0.01 * (2 * rng.NextDouble() - 1);
                double d = 1.5 + 0.005 * (2 * rng.NextDouble() - 1);
                var (code, output, err) = CliRunner.Run("simulate", "--barrier-height", phi.ToString(Inv), "--thickness", d.ToString(Inv),
                    "--area", "100", "--from", "-0.8", "--to", "0.8", "--points", "81", "--noise", "0.01", "--seed", rng.Next(1, 1_000_000).ToString(Inv),
                    "--header", $"lot={lot}", "--header", "wafer=W01", "--header", $"die={x},{y}", "--header", "area=100 um2");
                Assert.True(code == 0, err);
                File.WriteAllText(Path.Combine(folder, $"die_{x}_{y}.csv"), output);
            }
        }
        // Ellipsometry per wafer; KM-C03 carries a planted +0.25 nm offset.
        File.WriteAllText(dir.File("ellipsometry.csv"), "lot,wafer,thickness_nm\nKM-C01,W01,1.50\nKM-C02,W01,1.50\nKM-C03,W01,1.75\n");
    }

    [Fact]
    public void BatchDriftThickness_PlantedShiftAndOffset_FindBothAndFlagNothingElse()
    {
        using var dir = new TempFolder();
        MakeLots(dir);
        string outDir = dir.File("out");

        var (batchCode, _, batchErr) = CliRunner.Run("batch", dir.File("lots"), "--out", outDir, "--area-from-file", "--no-plots");
        Assert.True(batchCode == 0, batchErr);
        var resultLines = File.ReadAllLines(Path.Combine(outDir, "results.csv"));
        Assert.Equal(28, resultLines.Length); // header + 27 dies, each exactly once
        Assert.Equal(27, resultLines.Skip(1).Select(l => l.Split(',')[0]).Distinct().Count());
        Assert.StartsWith("file,lot,wafer,die_x,die_y,model,status,barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi", resultLines[0], StringComparison.Ordinal);
        Assert.True(File.Exists(Path.Combine(outDir, "report.html")));
        Assert.Equal(6, Directory.GetFiles(Path.Combine(outDir, "maps"), "wafer-*.png").Length); // 3 wafers × φ, d (the area is fixed)
        Assert.False(Directory.Exists(Path.Combine(outDir, "plots")) && Directory.GetFiles(Path.Combine(outDir, "plots")).Length > 0);

        var (driftCode, driftOut, driftErr) = CliRunner.Run("drift", Path.Combine(outDir, "results.csv"), "--reference", "KM-C01", "--json");
        Assert.True(driftCode == 0, driftErr);
        var flagged = new List<(string Lot, string Parameter, double Shift)>();
        foreach (string line in driftOut.Split('\n', StringSplitOptions.RemoveEmptyEntries))
        {
            using var doc = JsonDocument.Parse(line);
            var root = doc.RootElement;
            if (root.GetProperty("flagged").GetBoolean())
            {
                flagged.Add((root.GetProperty("lot").GetString()!, root.GetProperty("parameter").GetString()!, root.GetProperty("shift").GetDouble()));
            }
        }
        var only = Assert.Single(flagged);
        Assert.Equal(("KM-C02", "barrier_height_eV"), (only.Lot, only.Parameter));
        Assert.InRange(only.Shift, 0.13, 0.17);

        var (thickCode, thickOut, thickErr) = CliRunner.Run("thickness", Path.Combine(outDir, "results.csv"), dir.File("ellipsometry.csv"), "--area-from-file");
        Assert.True(thickCode == 0, thickErr);
        var waferLines = thickOut.Split('\n').Where(l => l.StartsWith("wafer ", StringComparison.Ordinal)).ToList();
        Assert.Equal(3, waferLines.Count);
        var inconsistent = Assert.Single(waferLines, l => l.Contains("INCONSISTENT", StringComparison.Ordinal));
        Assert.StartsWith("wafer KM-C03/W01", inconsistent, StringComparison.Ordinal);

        var (jsonCode, jsonOut, _) = CliRunner.Run("thickness", Path.Combine(outDir, "results.csv"), dir.File("ellipsometry.csv"), "--area-from-file", "--json");
        Assert.Equal(0, jsonCode);
        using var thick = JsonDocument.Parse(jsonOut.Trim());
        Assert.Equal(3, thick.RootElement.GetProperty("n").GetInt32());
        Assert.InRange(thick.RootElement.GetProperty("bias_nm").GetDouble(), -0.25 / 3 - 0.03, -0.25 / 3 + 0.03); // mean of 0, 0, −0.25
    }

    [Fact]
    public void Batch_EmptyFolder_ExitTwoWithMessage()
    {
        using var dir = new TempFolder();
        Directory.CreateDirectory(dir.File("empty"));
        var (code, _, err) = CliRunner.Run("batch", dir.File("empty"), "--out", dir.File("out"));
        Assert.Equal(2, code);
        Assert.Contains("no I–V files", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Batch_FolderOfNonIvFiles_ExitTwoEachNamed()
    {
        using var dir = new TempFolder();
        Directory.CreateDirectory(dir.File("junk"));
        File.WriteAllText(dir.File("junk/a.csv"), "name,colour\nalpha,red\n");
        File.WriteAllText(dir.File("junk/b.txt"), "meeting notes\n");
        var (code, _, err) = CliRunner.Run("batch", dir.File("junk"), "--out", dir.File("out"));
        Assert.Equal(2, code);
        Assert.Contains("a.csv:", err, StringComparison.Ordinal);
        Assert.Contains("b.txt:", err, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Drift_ResultsFileMissingColumns_ExitTwoNamingFileAndLine()
    {
        using var dir = new TempFolder();
        File.WriteAllText(dir.File("results.csv"), "file,lot\nx.csv,KM-C01\n");
        var (code, _, err) = CliRunner.Run("drift", dir.File("results.csv"), "--reference", "KM-C01");
        Assert.Equal(2, code);
        Assert.StartsWith(dir.File("results.csv") + ":1", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Drift_UnknownReferenceLot_ExitTwo()
    {
        using var dir = new TempFolder();
        MakeSmallResults(dir, dies: 4);
        var (code, _, err) = CliRunner.Run("drift", dir.File("results.csv"), "--reference", "KM-Z99");
        Assert.Equal(2, code);
        Assert.Contains("KM-Z99", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Drift_LotWithTooFewGoodDies_SaysSoAndExitsOne()
    {
        using var dir = new TempFolder();
        MakeSmallResults(dir, dies: 2);
        var (code, output, _) = CliRunner.Run("drift", dir.File("results.csv"), "--reference", "KM-C01", "--json");
        Assert.Equal(1, code);
        Assert.Contains("at least 3 are needed", output, StringComparison.Ordinal); // the lot has 2 good dies
    }

    private static void MakeSmallResults(TempFolder dir, int dies)
    {
        var lines = new List<string>
        {
            "file,lot,wafer,die_x,die_y,model,status,barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi,thickness_nm,thickness_nm_stderr,thickness_nm_lo,thickness_nm_hi,area_m2,area_m2_stderr,area_m2_lo,area_m2_hi,mass_ratio,mass_ratio_stderr,mass_ratio_lo,mass_ratio_hi,reduced_chi2,transition_voltage_V,warnings,error",
        };
        for (int k = 0; k < 5; k++) lines.Add($"a{k}.csv,KM-C01,W01,{k},0,simmons,ok,{2.0 + 0.01 * k},0.004,1.99,2.01,1.5,0.002,1.49,1.51,1E-10,,,,1,,,,1.0,,,");
        for (int k = 0; k < dies; k++) lines.Add($"b{k}.csv,KM-C02,W01,{k},0,simmons,ok,{2.1 + 0.01 * k},0.004,2.09,2.11,1.5,0.002,1.49,1.51,1E-10,,,,1,,,,1.0,,,");
        File.WriteAllLines(dir.File("results.csv"), lines);
    }
}
