using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// A value the library refuses reaches the user in the user's words: exit 2, the message names the command-line option
/// that was typed, and no exception parameter name ("(Parameter 'value')") or internal property name leaks through.
/// </summary>
public class OptionMessageTests
{
    private static string Simulated(TempFolder dir)
    {
        // Invented data (sample-data/README.md's scenario): Simmons, 2 eV, 1.5 nm, 100 µm², 1 % noise.
        var (code, csv, err) = CliRunner.Run("simulate", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--from", "-0.8", "--to", "0.8", "--points", "41", "--noise", "0.01", "--seed", "3");
        Assert.True(code == 0, err);
        string path = dir.File("die.csv");
        File.WriteAllText(path, csv);
        return path;
    }

    private static void AssertNamesOption(int code, string err, string option)
    {
        Assert.Equal(2, code);
        Assert.StartsWith("junctionfit: " + option + ":", err.TrimStart(), StringComparison.Ordinal);
        Assert.DoesNotContain("(Parameter", err, StringComparison.Ordinal);
        Assert.DoesNotContain("Actual value was", err, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal); // no stack trace
    }

    [Theory]
    [InlineData("fit", "--voltage-column", "0")]
    [InlineData("fit", "--current-column", "0")]
    [InlineData("fit", "--voltage-column", " ")]
    [InlineData("fit", "--voltage-unit", "nA")]
    [InlineData("fit", "--current-unit", "V")]
    [InlineData("fit", "--path-pattern", "{lot}/{lot}")]
    [InlineData("fit", "--path-pattern", "{nonsense}")]
    [InlineData("inspect", "--current-column", "0")]
    [InlineData("inspect", "--voltage-unit", "nA")]
    [InlineData("temperature-series", "--voltage-unit", "nA")]
    public void ReadOverride_RefusedValue_Exit2NamingTheOption(string command, string option, string value)
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run(command, Simulated(dir), option, value);
        AssertNamesOption(code, err, option);
    }

    [Fact]
    public void ColumnZero_Message_SaysWhatIsWrongWithTheValue()
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run("fit", Simulated(dir), "--voltage-column", "0");
        AssertNamesOption(code, err, "--voltage-column");
        Assert.Contains("'0' must be 1 or more", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Batch_RefusedUnit_Exit2NamingTheOptionAndWritesNothing()
    {
        using var dir = new TempFolder();
        Simulated(dir);
        string outDir = dir.File("out");
        var (code, _, err) = CliRunner.Run("batch", dir.Path, "--out", outDir, "--current-unit", "V");
        AssertNamesOption(code, err, "--current-unit");
        Assert.False(Directory.Exists(outDir));
    }

    /// <summary>Invented rows in the layout of results.csv (docs/file-formats.md): lots KM-C01 and KM-C02 of five good dies.</summary>
    private static string TwoLots(TempFolder dir)
    {
        var lines = new List<string>
        {
            "file,lot,wafer,die_x,die_y,model,status,barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi,thickness_nm,thickness_nm_stderr,thickness_nm_lo,thickness_nm_hi,area_m2,area_m2_stderr,area_m2_lo,area_m2_hi,mass_ratio,mass_ratio_stderr,mass_ratio_lo,mass_ratio_hi,reduced_chi2,transition_voltage_V,warnings,error",
        };
        for (int k = 0; k < 5; k++) lines.Add($"a{k}.csv,KM-C01,W01,{k},0,simmons,ok,{2.0 + 0.01 * k},0.004,1.99,2.01,1.5,0.002,1.49,1.51,1E-10,,,,1,,,,1.0,,,");
        for (int k = 0; k < 5; k++) lines.Add($"b{k}.csv,KM-C02,W01,{k},0,simmons,ok,{2.1 + 0.01 * k},0.004,2.09,2.11,1.5,0.002,1.49,1.51,1E-10,,,,1,,,,1.0,,,");
        string path = dir.File("results.csv");
        File.WriteAllLines(path, lines);
        return path;
    }

    [Theory]
    [InlineData("--alpha", "2")]
    [InlineData("--alpha", "0")]
    [InlineData("--min-dies", "1")]
    public void Drift_RefusedSetting_Exit2NamingTheOptionAndValue(string option, string value)
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run("drift", TwoLots(dir), "--reference", "KM-C01", option, value);
        AssertNamesOption(code, err, option);
        Assert.Contains($"{option}: {value} must", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Drift_UnknownReferenceLot_Exit2NamingReferenceAndTheLotsPresent()
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run("drift", TwoLots(dir), "--reference", "KM-C09");
        AssertNamesOption(code, err, "--reference");
        Assert.Contains("'KM-C09' is not in the results (lots present: KM-C01, KM-C02)", err, StringComparison.Ordinal);
    }
}
