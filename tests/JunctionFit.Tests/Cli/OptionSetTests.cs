using System.Globalization;
using System.Text;
using System.Text.Json;
using JunctionFit.Physics;
using JunctionFit.Storage;
using JunctionFit.Tests.Storage;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// Two batch runs of the same dies with different options into one database: the rows are told apart by their option set
/// (results --db), and drift --db and thickness --db refuse to pool them unless one set is chosen (issue 14, item 5).
/// </summary>
public class OptionSetTests
{
    private const int DiesPerLot = 5;

    /// <summary>Two lots of simulated Simmons dies (invented data, the shape of sample-data/), a slightly higher barrier in L2.</summary>
    private static void MakeLots(string folder)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        foreach (var (lot, phi) in new[] { ("L1", 1.9), ("L2", 1.95) })
        {
            for (int k = 0; k < DiesPerLot; k++)
            {
                double[] theta = [(phi + 0.002 * k) * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 100e-12];
                var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-0.8, 0.8, 61) { RelativeNoise = 0.01, Seed = 100 * k + lot.Length + (int)(phi * 100) });
                var sb = new StringBuilder($"# lot: {lot}\n# wafer: W01\n# die: {k},0\nVoltage (V),Current (A)\n");
                for (int p = 0; p < v.Length; p++) sb.Append(v[p].ToString("R", CultureInfo.InvariantCulture)).Append(',').Append(i[p].ToString("R", CultureInfo.InvariantCulture)).Append('\n');
                File.WriteAllText(Path.Combine(folder, $"{lot}_die_{k}.csv"), sb.ToString());
            }
        }
    }

    private static (TempFolder Dir, string Db) TwoOptionSetsInOneDatabase()
    {
        var dir = new TempFolder();
        string input = dir.File("in");
        Directory.CreateDirectory(input);
        MakeLots(input);
        string db = dir.File("results.db");
        var (c1, _, e1) = CliRunner.Run("batch", input, "--out", dir.File("out1"), "--db", db, "--no-plots", "--area", "100");
        Assert.True(c1 == 0, e1);
        var (c2, _, e2) = CliRunner.Run("batch", input, "--out", dir.File("out2"), "--db", db, "--no-plots", "--area", "100", "--ignore-file-temperature");
        Assert.True(c2 == 0, e2);
        return (dir, db);
    }

    [Fact]
    public void Results_TwoOptionSets_EveryRowNamesItsSetAndStderrListsBoth()
    {
        var (dir, db) = TwoOptionSetsInOneDatabase();
        using var _ = dir;
        var (code, csv, err) = CliRunner.Run("results", "--db", db);
        Assert.True(code == 0, err);
        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(4 * DiesPerLot + 1, lines.Length); // 2 lots × 5 dies × 2 option sets, and the header
        Assert.EndsWith(",option_set", lines[0], StringComparison.Ordinal);
        Assert.Equal(2 * DiesPerLot, lines.Count(l => l.Contains("extra.temperature_from_file=false", StringComparison.Ordinal)));
        Assert.Equal(2 * DiesPerLot, lines.Count(l => l.Contains("extra.temperature_from_file=true", StringComparison.Ordinal)));
        Assert.Contains("2 option sets", err, StringComparison.Ordinal);
        Assert.Contains("option set 1 (", err, StringComparison.Ordinal);
        Assert.Contains("option set 2 (", err, StringComparison.Ordinal);
        // Only the line that tells the sets apart is listed, not the options they share.
        Assert.DoesNotContain("extra.models=", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Drift_DatabaseWithTwoOptionSets_RefusesWithExit2NamingBoth()
    {
        var (dir, db) = TwoOptionSetsInOneDatabase();
        using var _ = dir;
        var (code, _, err) = CliRunner.Run("drift", "--db", db, "--reference", "L1", "--out", dir.File("drift"));
        Assert.Equal(2, code);
        Assert.Contains("2 option sets", err, StringComparison.Ordinal);
        Assert.Contains("--option-set", err, StringComparison.Ordinal);
        Assert.Contains("extra.temperature_from_file=false", err, StringComparison.Ordinal);
        Assert.Contains("extra.temperature_from_file=true", err, StringComparison.Ordinal);
        Assert.False(Directory.Exists(dir.File("drift"))); // nothing computed, nothing written
    }

    [Fact]
    public void Drift_DatabaseWithTwoOptionSets_ChosenSetPoolsOnlyItsRows()
    {
        var (dir, db) = TwoOptionSetsInOneDatabase();
        using var _ = dir;
        foreach (string choice in new[] { "2", "extra.temperature_from_file=true" })
        {
            var (code, json, err) = CliRunner.Run("drift", "--db", db, "--reference", "L1", "--json", "--out", dir.File("drift"), "--option-set", choice);
            Assert.True(code is 0 or 1, err);
            var lines = json.Split('\n', StringSplitOptions.RemoveEmptyEntries);
            Assert.NotEmpty(lines);
            foreach (string line in lines)
            {
                using var doc = JsonDocument.Parse(line);
                // One set: each lot's dies once (pooling both sets would count every die twice).
                Assert.True(doc.RootElement.GetProperty("n").GetInt32() <= DiesPerLot, line);
            }
        }
        var (bad, _, badErr) = CliRunner.Run("drift", "--db", db, "--reference", "L1", "--out", dir.File("drift-bad"), "--option-set", "7");
        Assert.Equal(2, bad);
        Assert.Contains("--option-set: '7' names none of the 2 option set(s) found", badErr, StringComparison.Ordinal);
    }

    [Fact]
    public void Thickness_DatabaseWithTwoOptionSets_RefusesWithExit2()
    {
        var (dir, db) = TwoOptionSetsInOneDatabase();
        using var _ = dir;
        string ell = dir.File("ellipsometry.csv");
        File.WriteAllText(ell, "lot,wafer,thickness_nm\nL1,W01,1.5\nL2,W01,1.5\n");
        var (code, _, err) = CliRunner.Run("thickness", "--db", db, ell, "--area", "100", "--out", dir.File("thick"));
        Assert.Equal(2, code);
        Assert.Contains("thickness: the results hold 2 option sets", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Batch_WithPlots_ResultsCsvPlotColumnNamesTheWrittenFile()
    {
        using var dir = new TempFolder();
        string input = dir.File("in");
        Directory.CreateDirectory(input);
        MakeLots(input);
        string outDir = dir.File("out");
        var (code, _, err) = CliRunner.Run("batch", input, "--out", outDir, "--no-db", "--area", "100", "--jobs", "1");
        Assert.True(code == 0, err);
        var rows = ResultsCsv.Read(Path.Combine(outDir, ResultsCsv.FileName));
        Assert.Equal(2 * DiesPerLot, rows.Length);
        Assert.All(rows, r =>
        {
            Assert.NotNull(r.Plot);
            Assert.False(Path.IsPathRooted(r.Plot)); // relative to the output folder
            Assert.True(File.Exists(Path.Combine(outDir, r.Plot!)), r.Plot);
            Assert.Contains("extra.temperature_from_file=", r.OptionSet, StringComparison.Ordinal);
        });
        Assert.Equal(rows.Length, rows.Select(r => r.Plot).Distinct(StringComparer.Ordinal).Count());
    }
}
