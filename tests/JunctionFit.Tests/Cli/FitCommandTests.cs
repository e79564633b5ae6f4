using System.Diagnostics;
using System.Text.Json;
using System.Text.RegularExpressions;
using Xunit;

namespace JunctionFit.Tests.Cli;

public class FitCommandTests
{
    private static string SimulateTo(TempFolder dir, string name, string phi, string d, string extra = "--noise 0.01 --seed 5")
    {
        var args = new List<string> { "simulate", "--model", "simmons", "--barrier-height", phi, "--thickness", d, "--area", "100",
            "--from", "-1", "--to", "1", "--points", "201" };
        args.AddRange(extra.Split(' ', StringSplitOptions.RemoveEmptyEntries));
        var (code, output, err) = CliRunner.Run([.. args]);
        Assert.True(code == 0, err);
        string path = dir.File(name);
        File.WriteAllText(path, output);
        return path;
    }

    [Fact]
    public void Simulate_NoNoise_WritesHeaderAndOddCurve()
    {
        var (code, output, _) = CliRunner.Run("simulate", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--from", "-0.5", "--to", "0.5", "--points", "11");
        Assert.Equal(0, code);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal("Voltage (V),Current (A)", lines[0]);
        Assert.Equal(12, lines.Length);
        double first = double.Parse(lines[1].Split(',')[1], System.Globalization.CultureInfo.InvariantCulture);
        double last = double.Parse(lines[^1].Split(',')[1], System.Globalization.CultureInfo.InvariantCulture);
        Assert.Equal(-first, last, 15); // odd in V (Simmons 1963, symmetric barrier)
    }

    [Fact]
    public void FitJson_AreaFixed_RecoversSimulatedBarrier()
    {
        // The issue's acceptance case: φ = 2.1 eV, d = 1.6 nm, fit --json --area 100 recovers both within 0.02.
        using var dir = new TempFolder();
        string file = SimulateTo(dir, "km-a01-die.csv", "2.1", "1.6");
        var (code, output, err) = CliRunner.Run("fit", file, "--json", "--area", "100");

        Assert.True(code == 0, err);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Single(lines);
        using var doc = JsonDocument.Parse(lines[0]);
        var root = doc.RootElement;
        Assert.Equal(file, root.GetProperty("file").GetString());
        Assert.Equal("simmons", root.GetProperty("model").GetString());
        Assert.Equal("ok", root.GetProperty("status").GetString());
        Assert.Equal(JsonValueKind.Null, root.GetProperty("error").ValueKind);
        var pars = root.GetProperty("parameters");
        var phi = pars.GetProperty("barrier_height_eV");
        var d = pars.GetProperty("thickness_nm");
        Assert.InRange(phi.GetProperty("value").GetDouble(), 2.08, 2.12);
        Assert.InRange(d.GetProperty("value").GetDouble(), 1.58, 1.62);
        Assert.InRange(2.1, phi.GetProperty("ci95")[0].GetDouble(), phi.GetProperty("ci95")[1].GetDouble());
        Assert.InRange(1.6, d.GetProperty("ci95")[0].GetDouble(), d.GetProperty("ci95")[1].GetDouble());
        var area = pars.GetProperty("area_m2");
        Assert.True(area.GetProperty("fixed").GetBoolean());
        Assert.Equal(1e-10, area.GetProperty("value").GetDouble(), 1e-22);
        Assert.Equal(JsonValueKind.Null, area.GetProperty("ci95").ValueKind);
        Assert.True(pars.GetProperty("mass_ratio").GetProperty("fixed").GetBoolean());
        var fit = root.GetProperty("fit");
        Assert.Equal(200, fit.GetProperty("points_used").GetInt32());
        Assert.Equal(1, fit.GetProperty("points_masked").GetInt32());
        Assert.True(fit.GetProperty("converged").GetBoolean());
        Assert.True(fit.GetProperty("iterations").GetInt32() > 0);
    }

    [Fact]
    public void Fit_GarbageFile_ExitTwoWithPathAndLineAndNoStackTrace()
    {
        using var dir = new TempFolder();
        string garbage = dir.File("notes.csv");
        File.WriteAllText(garbage, "this is a shopping list\nmilk, eggs\nbread\n");
        var (code, output, err) = CliRunner.Run("fit", garbage);

        Assert.Equal(2, code);
        Assert.StartsWith(garbage + ":", err, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal);
        Assert.DoesNotContain("Exception", err, StringComparison.Ordinal);
        Assert.Equal("this is a shopping list\nmilk, eggs\nbread\n", File.ReadAllText(garbage)); // input untouched
        _ = output;
    }

    [Fact]
    public void FitJson_OneGoodOneGarbage_ExitOneAndBothReported()
    {
        using var dir = new TempFolder();
        string good = SimulateTo(dir, "a-good.csv", "2.0", "1.5");
        string bad = dir.File("b-bad.csv");
        File.WriteAllBytes(bad, [0, 1, 2, 255, 254, 0, 7]);
        var (code, output, err) = CliRunner.Run("fit", dir.Path, "--json", "--area", "100");

        Assert.Equal(1, code);
        var lines = output.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(2, lines.Length);
        using var first = JsonDocument.Parse(lines[0]);
        using var second = JsonDocument.Parse(lines[1]);
        Assert.Equal(good, first.RootElement.GetProperty("file").GetString());
        Assert.Equal("ok", first.RootElement.GetProperty("status").GetString());
        Assert.Equal("failed", second.RootElement.GetProperty("status").GetString());
        Assert.False(string.IsNullOrWhiteSpace(second.RootElement.GetProperty("error").GetString()));
        Assert.Contains(bad + ":", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_UnknownOption_ExitTwo()
    {
        var (code, _, err) = CliRunner.Run("fit", "x.csv", "--frobnicate");
        Assert.Equal(2, code);
        Assert.Contains("--frobnicate", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_BadAreaValue_ExitTwoNamingTheOption()
    {
        var (code, _, err) = CliRunner.Run("fit", "x.csv", "--area", "lots");
        Assert.Equal(2, code);
        Assert.Contains("--area", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Process_FitJsonOnGarbage_RealExitCodeAndNoStackTrace()
    {
        // The built tool as a user runs it: a separate process, real exit code, nothing but messages on stderr.
        using var dir = new TempFolder();
        string garbage = dir.File("garbage.csv");
        File.WriteAllText(garbage, "\u0001\u0002 not a table at all\n");
        string tool = Path.Combine(AppContext.BaseDirectory, "junctionfit.dll");
        var info = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in new[] { tool, "fit", garbage, "--json" }) info.ArgumentList.Add(a);
        using var process = Process.Start(info)!;
        string stdout = process.StandardOutput.ReadToEnd();
        string stderr = process.StandardError.ReadToEnd();
        process.WaitForExit();

        Assert.Equal(2, process.ExitCode);
        Assert.Contains(garbage + ":", stderr, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", stderr, StringComparison.Ordinal);
        using var doc = JsonDocument.Parse(stdout.Trim());
        Assert.Equal("failed", doc.RootElement.GetProperty("status").GetString());
    }
}

public class FitIntervalOptionTests
{
    [Theory]
    [InlineData("profile", "profile likelihood")]
    [InlineData("bootstrap", "bootstrap")]
    public void FitJson_IntervalOption_UsesThatMethodAndCoversTruth(string method, string expectedText)
    {
        using var dir = new TempFolder();
        var (sc, csv, se) = CliRunner.Run("simulate", "--barrier-height", "2.1", "--thickness", "1.6", "--area", "100", "--from", "-1", "--to", "1",
            "--points", "101", "--noise", "0.01", "--seed", "9");
        Assert.True(sc == 0, se);
        string file = dir.File("die.csv");
        File.WriteAllText(file, csv);
        var (code, output, err) = CliRunner.Run("fit", file, "--json", "--area", "100", "--interval", method, "--bootstrap-replicates", "60");
        Assert.True(code == 0, err);
        using var doc = System.Text.Json.JsonDocument.Parse(output.Trim());
        Assert.Contains(expectedText, doc.RootElement.GetProperty("fit").GetProperty("interval_method").GetString(), StringComparison.OrdinalIgnoreCase);
        var phi = doc.RootElement.GetProperty("parameters").GetProperty("barrier_height_eV").GetProperty("ci95");
        Assert.InRange(2.1, phi[0].GetDouble(), phi[1].GetDouble()); // truth of the simulation
    }

    [Fact]
    public void Fit_UnknownIntervalMethod_ExitTwo()
    {
        var (code, _, err) = CliRunner.Run("fit", "x.csv", "--interval", "guess");
        Assert.Equal(2, code);
        Assert.Contains("--interval", err, StringComparison.Ordinal);
    }
}

public class HelpTextTests
{
    /// <summary>The commands the README and docs/cli.md document (the script interface of DESIGN.md).</summary>
    private static readonly string[] Commands = ["fit", "simulate", "demo", "inspect", "batch", "drift", "thickness", "temperature-series", "results", "plan"];

    /// <summary>The command names of the root help's "Commands:" section: the first word of each entry line.</summary>
    private static List<string> ListedCommands(string help)
    {
        var names = new List<string>();
        bool inSection = false;
        foreach (string line in help.Split('\n'))
        {
            if (line.TrimEnd() == "Commands:") { inSection = true; continue; }
            if (!inSection) continue;
            if (line.Trim().Length == 0) break;
            if (line.StartsWith("  ", StringComparison.Ordinal) && !line.StartsWith("   ", StringComparison.Ordinal))
            {
                names.Add(line.Trim().Split(' ')[0]);
            }
        }
        return names;
    }

    [Fact]
    public void Help_Root_ListsExactlyTheDocumentedCommandsAndExitsZero()
    {
        // A command gone, renamed or added without docs fails here: the listed names are read from the section, not searched
        // for anywhere in the text (where descriptions mention other commands' names).
        var (code, output, _) = CliRunner.Run("--help");
        Assert.Equal(0, code);
        Assert.Equal(Commands.Order(StringComparer.Ordinal), ListedCommands(output).Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Help_EveryCommand_HasItsOwnUsageLineAndExitsZero()
    {
        foreach (string command in Commands)
        {
            var (code, output, err) = CliRunner.Run(command, "--help");
            Assert.True(code == 0, $"{command} --help: exit {code} {err}");
            // The usage line names the command after the program name (which is the test host's name in process).
            Assert.Matches($@"Usage:\r?\n  \S+ {Regex.Escape(command)}( |\r?\n)", output);
        }
    }

    [Fact]
    public void Help_RemovedCommand_IsAnErrorNotHelp()
    {
        // The check above can fail: a name that is not a command is refused with exit 2 (the documented usage-error code).
        var (code, _, err) = CliRunner.Run("fitt", "--help");
        Assert.Equal(2, code);
        Assert.Contains("'fitt' is not a command", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Help_Fit_DescribesTheScriptInterface()
    {
        // Options listed in the help's option section (each at the start of an entry line), not merely mentioned in a text.
        var (code, output, _) = CliRunner.Run("fit", "--help");
        Assert.Equal(0, code);
        var optionLines = output.Split('\n').Select(l => l.TrimStart()).Where(l => l.StartsWith("--", StringComparison.Ordinal) || l.StartsWith('-')).ToList();
        foreach (string option in new[] { "--model", "--area", "--mass-ratio", "--json", "--out", "--interval", "--free", "--fix" })
        {
            Assert.Contains(optionLines, l => l.Split(' ', ',')[0] == option || l.Contains(", " + option + " ", StringComparison.Ordinal));
        }
    }
}

public class ReviewRegressionTests
{
    [Fact]
    public void Simulate_PositiveSweepWithNegativeEnd_ExitTwoWithoutStackTrace()
    {
        var (code, _, err) = CliRunner.Run("simulate", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--from", "-1", "--to", "-0.5", "--points", "5", "--sweep", "positive");
        Assert.Equal(2, code);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal);
        Assert.DoesNotContain("(Parameter", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_UnknownOptionAfterPath_ExitTwo()
    {
        using var dir = new TempFolder();
        string file = dir.File("x.csv");
        File.WriteAllText(file, "Voltage (V),Current (A)\n0.1,1e-9\n0.2,2.1e-9\n0.3,3.3e-9\n0.4,4.7e-9\n");
        var (code, _, err) = CliRunner.Run("fit", file, "--bogus");
        Assert.Equal(2, code);
        Assert.Contains("--bogus", err, StringComparison.Ordinal);
    }

    [Fact]
    public void FitJson_NoiseFreeSimulation_IsOkNotPoorFit()
    {
        // Residuals at rounding level carry no sign information; the misfit tests must not fire on an exact fit.
        using var dir = new TempFolder();
        var (sc, csv, se) = CliRunner.Run("simulate", "--model", "bdr", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--asymmetry", "0.2", "--from", "-0.6", "--to", "0.6", "--points", "61");
        Assert.True(sc == 0, se);
        string file = dir.File("exact.csv");
        File.WriteAllText(file, csv);
        var (code, output, err) = CliRunner.Run("fit", file, "--model", "bdr", "--area", "100", "--json");
        Assert.True(code == 0, err + output);
        Assert.Contains("\"status\":\"ok\"", output, StringComparison.Ordinal);
    }

    [Fact]
    public void FitJson_LeakyDieWithLeakageFreed_RecoversTheLeak()
    {
        // Simmons plus a 0.2 µS parallel leak (the demo's bad die): freeing the leak gives it back and the barrier with it.
        using var dir = new TempFolder();
        var (sc, csv, se) = CliRunner.Run("simulate", "--barrier-height", "1.99", "--thickness", "1.53", "--area", "100", "--from", "-0.8", "--to", "0.8",
            "--points", "161", "--noise", "0.01", "--seed", "1064", "--set", "leakage-conductance=2e-7");
        Assert.True(sc == 0, se);
        string file = dir.File("leaky.csv");
        File.WriteAllText(file, csv);
        var (code, output, err) = CliRunner.Run("fit", file, "--area", "100", "--free", "leakage-conductance", "--json");
        Assert.True(code == 0, err + output);
        using var doc = System.Text.Json.JsonDocument.Parse(output.Trim());
        var pars = doc.RootElement.GetProperty("parameters");
        var leak = pars.GetProperty("leakage_conductance_S").GetProperty("ci95");
        Assert.InRange(2e-7, leak[0].GetDouble(), leak[1].GetDouble());
        Assert.InRange(pars.GetProperty("barrier_height_eV").GetProperty("value").GetDouble(), 1.95, 2.03);
    }
}
