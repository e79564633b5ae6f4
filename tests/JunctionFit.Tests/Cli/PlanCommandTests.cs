using System.Text.Json;
using System.Text.RegularExpressions;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>End-to-end tests of <c>junctionfit plan</c>.</summary>
public class PlanCommandTests
{
    private static readonly string[] IssueCase =
        ["plan", "--barrier-height", "2", "--thickness", "1.5", "--area", "100", "--noise", "0.01", "--from", "-0.8", "--to", "0.8", "--points", "201"];

    [Fact]
    public void PlanJson_IssueCaseWithMaxField5_RecommendsAtOrBelow0p75VWithTheIssueShape()
    {
        var (code, output, err) = CliRunner.Run([.. IssueCase, "--max-field", "5", "--json"]);
        Assert.True(code == 0, err + output);
        using var doc = JsonDocument.Parse(output.Trim());
        var root = doc.RootElement;
        var phi = root.GetProperty("predicted").GetProperty("barrier_height_eV");
        Assert.True(phi.GetProperty("stderr").GetDouble() > 0);
        Assert.True(phi.GetProperty("ci95_halfwidth").GetDouble() > phi.GetProperty("stderr").GetDouble());
        Assert.True(root.GetProperty("predicted").GetProperty("thickness_nm").GetProperty("stderr").GetDouble() > 0);
        var rec = root.GetProperty("recommended_sweep");
        // Issue 16: 5 MV/cm × 1.5 nm = 0.75 V.
        Assert.True(rec.GetProperty("to").GetDouble() <= 0.75);
        Assert.True(rec.GetProperty("from").GetDouble() >= -0.75);
        Assert.True(rec.GetProperty("points").GetInt32() >= 5);
        Assert.True(rec.GetProperty("max_field_MV_per_cm").GetDouble() <= 5.0 + 1e-9);
        string safety = string.Join(" ", root.GetProperty("safety").EnumerateArray().Select(s => s.GetString()));
        Assert.Contains("never drives an instrument", safety, StringComparison.Ordinal);
        Assert.Contains("depends on the oxide", safety, StringComparison.Ordinal);
        Assert.Contains("instrument maker", safety, StringComparison.Ordinal);
        Assert.Contains("stress rules", safety, StringComparison.Ordinal);
    }

    [Fact]
    public void PlanText_IssueCase_ShowsTheTableAndTheSafetyNotes()
    {
        var (code, output, err) = CliRunner.Run([.. IssueCase, "--max-bias", "0.7"]);
        Assert.True(code == 0, err + output);
        Assert.Contains("Recommended sweep", output, StringComparison.Ordinal);
        Assert.Contains("φ (eV)", output, StringComparison.Ordinal);
        Assert.Contains("never drives an instrument", output, StringComparison.Ordinal);
    }

    [Fact]
    public void PlanJson_AreaFree_SaysNotIdentifiableAndExitsOne()
    {
        var (code, output, _) = CliRunner.Run([.. IssueCase, "--free", "area", "--json"]);
        Assert.Equal(1, code);
        using var doc = JsonDocument.Parse(output.Trim());
        Assert.False(doc.RootElement.GetProperty("identifiable").GetBoolean());
        Assert.NotEqual(0, doc.RootElement.GetProperty("not_identifiable_reasons").GetArrayLength());
    }

    [Fact]
    public void PlanJson_Ranges_ReportTheWorstCase()
    {
        var (code, output, err) = CliRunner.Run("plan", "--barrier-height", "1.8:2.2", "--thickness", "1.4:1.6", "--area", "100", "--noise", "0.01",
            "--from", "-0.8", "--to", "0.8", "--points", "101", "--max-field", "5", "--json");
        Assert.True(code is 0 or 1, err);
        using var doc = JsonDocument.Parse(output.Trim());
        var worst = doc.RootElement.GetProperty("worst_case");
        Assert.Equal(9, worst.GetProperty("grid_points").GetInt32());
        double worstPhi = worst.GetProperty("predicted").GetProperty("barrier_height_eV").GetProperty("ci95_halfwidth").GetDouble();
        double centrePhi = doc.RootElement.GetProperty("predicted").GetProperty("barrier_height_eV").GetProperty("ci95_halfwidth").GetDouble();
        Assert.True(worstPhi > centrePhi);
        // The field limit applies at the thinnest nominal thickness: 5 MV/cm × 1.4 nm = 0.7 V.
        Assert.True(doc.RootElement.GetProperty("recommended_sweep").GetProperty("to").GetDouble() <= 0.7);
        Assert.Equal(1.4, doc.RootElement.GetProperty("limits").GetProperty("field_thickness_nm").GetDouble(), 9);
    }

    [Fact]
    public void Plan_FromFittedResult_TakesModelValuesAndNoise()
    {
        using var dir = new TempFolder();
        var (sc, csv, se) = CliRunner.Run("simulate", "--barrier-height", "2.1", "--thickness", "1.6", "--area", "100", "--from", "-0.8", "--to", "0.8",
            "--points", "161", "--noise", "0.01", "--seed", "16");
        Assert.True(sc == 0, se);
        string file = dir.File("die.csv");
        File.WriteAllText(file, csv);
        var (fc, fitJson, fe) = CliRunner.Run("fit", file, "--area", "100", "--noise", "0.01", "--json");
        Assert.True(fc == 0, fe + fitJson);
        string resultFile = dir.File("fit.jsonl");
        File.WriteAllText(resultFile, fitJson);
        var (code, output, err) = CliRunner.Run("plan", "--result", resultFile, "--from", "-0.6", "--to", "0.6", "--points", "121", "--json");
        Assert.True(code == 0, err + output);
        using var fit = JsonDocument.Parse(fitJson.Trim());
        using var plan = JsonDocument.Parse(output.Trim());
        double fittedPhi = fit.RootElement.GetProperty("parameters").GetProperty("barrier_height_eV").GetProperty("value").GetDouble();
        Assert.Equal(fittedPhi, plan.RootElement.GetProperty("nominal").GetProperty("barrier_height_eV").GetDouble(), 9);
        Assert.Equal(0.01, plan.RootElement.GetProperty("noise").GetProperty("relative").GetDouble(), 12);
        // The area was fixed in the fit, so it stays fixed in the plan.
        var free = plan.RootElement.GetProperty("free").EnumerateArray().Select(e => e.GetString() ?? "").ToArray();
        Assert.Equal(new[] { "barrier_height_eV", "thickness_nm" }, free);
    }

    [Fact]
    public void Plan_Plot_WritesAPng()
    {
        using var dir = new TempFolder();
        string png = dir.File("plan.png");
        var (code, _, err) = CliRunner.Run([.. IssueCase, "--max-field", "5", "--target", "barrier-height=0.5%", "--plot", png]);
        Assert.True(code == 0, err);
        var bytes = File.ReadAllBytes(png);
        Assert.True(bytes.Length > 1000);
        Assert.Equal(new byte[] { 0x89, 0x50, 0x4E, 0x47 }, bytes[..4]); // PNG signature (PNG specification, ISO/IEC 15948)
    }

    [Theory]
    [InlineData("--noise", "-1")]
    [InlineData("--max-field", "0")]
    [InlineData("--target", "barrier-height")]
    [InlineData("--target", "mass-ratio=1%")]
    [InlineData("--sweep", "zigzag")]
    [InlineData("--points", "3")]
    public void Plan_BadValue_ExitTwoNamingTheOption(string option, string value)
    {
        var args = IssueCase.ToList();
        int at = args.IndexOf(option);
        if (at >= 0) args[at + 1] = value; else args.AddRange([option, value]);
        var (code, _, err) = CliRunner.Run([.. args]);
        Assert.Equal(2, code);
        Assert.Contains(option, err, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Plan_BadResultFile_ExitTwoWithPathAndLine()
    {
        using var dir = new TempFolder();
        string bad = dir.File("bad.jsonl");
        File.WriteAllText(bad, "{\"file\":\"x\",\"model\":\"simmons\",\"status\":\"failed\",\"parameters\":{}}\nnot json\n");
        var (code, _, err) = CliRunner.Run("plan", "--result", bad, "--noise", "0.01", "--from", "-0.5", "--to", "0.5", "--points", "51");
        Assert.Equal(2, code);
        Assert.Contains($"{bad}:2:", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Plan_NoSweepAndNoLimit_ExitTwo()
    {
        var (code, _, err) = CliRunner.Run("plan", "--barrier-height", "2", "--thickness", "1.5", "--area", "100", "--noise", "0.01");
        Assert.Equal(2, code);
        Assert.Contains("--max-bias", err, StringComparison.Ordinal);
    }

    [Fact]
    public void CliDoc_ListsEveryPlanOption()
    {
        // docs/cli.md lists every CLI option (DEVELOPERS.md); the options are read from the command's own help.
        var (_, help, _) = CliRunner.Run("plan", "--help");
        string doc = File.ReadAllText(Path.Combine(RepoRoot(), "docs", "cli.md"));
        int section = doc.IndexOf("## `plan", StringComparison.Ordinal);
        Assert.True(section >= 0, "docs/cli.md has no plan section");
        int end = doc.IndexOf("\n## ", section + 5, StringComparison.Ordinal);
        string planDoc = end > 0 ? doc[section..end] : doc[section..];
        var options = Regex.Matches(help, @"--[a-z][a-z0-9-]+").Select(m => m.Value).Distinct().Where(o => o != "--help" && o != "--version").ToList();
        Assert.NotEmpty(options);
        foreach (string option in options) Assert.Contains($"`{option}", planDoc, StringComparison.Ordinal);
    }

    private static string RepoRoot()
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (d is not null && !File.Exists(Path.Combine(d.FullName, "JunctionFit.sln"))) d = d.Parent;
        return d?.FullName ?? throw new InvalidOperationException("repository root not found");
    }
}
