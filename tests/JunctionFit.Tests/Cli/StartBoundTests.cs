using System.Text.Json;
using JunctionFit.Physics;
using JunctionFit.Storage;
using JunctionFit.Fitting;
using System.Collections.Immutable;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>--start and --bound: parsed with units, validated (exit 2 naming the option), used by the fit, in the identity.</summary>
public class StartBoundTests
{
    private static string Simulated(TempFolder dir)
    {
        // Invented data (sample-data/README.md's scenario): Simmons, 2 eV, 1.5 nm, 100 µm², 1 % noise.
        var (code, csv, err) = CliRunner.Run("simulate", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--from", "-0.8", "--to", "0.8", "--points", "81", "--noise", "0.01", "--seed", "5");
        Assert.True(code == 0, err);
        string path = dir.File("die.csv");
        File.WriteAllText(path, csv);
        return path;
    }

    [Theory]
    [InlineData("--bound", "thickness=3:1", "--bound")]
    [InlineData("--bound", "thickness=abc:2", "--bound")]
    [InlineData("--bound", "nonsense=1:2", "--bound")]
    [InlineData("--bound", "voltage-offset=:0.1", "--bound")]
    [InlineData("--start", "thickness=-1", "--start")]
    [InlineData("--start", "mass-ratio=0.5", "--start")]
    [InlineData("--start", "thickness", "--start")]
    public void Fit_BadStartOrBound_Exit2NamingTheOption(string option, string value, string named)
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run("fit", Simulated(dir), "--area", "100", option, value);
        Assert.Equal(2, code);
        Assert.StartsWith("junctionfit", err.TrimStart(), StringComparison.Ordinal);
        Assert.Contains(named, err, StringComparison.Ordinal);
        Assert.DoesNotContain("(Parameter", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_StartOutsideBound_Exit2()
    {
        using var dir = new TempFolder();
        var (code, _, err) = CliRunner.Run("fit", Simulated(dir), "--area", "100", "--bound", "thickness=1:2", "--start", "thickness=3");
        Assert.Equal(2, code);
        Assert.Contains("--start", err, StringComparison.Ordinal);
    }

    [Fact]
    public void Fit_BoundAroundTruth_KeepsEstimateAndIntervalInside()
    {
        using var dir = new TempFolder();
        var (code, output, err) = CliRunner.Run("fit", Simulated(dir), "--area", "100", "--json",
            "--bound", "thickness=1.4:1.6", "--start", "thickness=1.45", "--bound", "barrier-height=1.8:2.2");
        Assert.True(code is 0 or 1, err);
        using var doc = JsonDocument.Parse(output.Trim());
        var d = doc.RootElement.GetProperty("parameters").GetProperty("thickness_nm");
        double value = d.GetProperty("value").GetDouble();
        // Simulated truth 1.5 nm (the simulate call above); 1 % noise on 81 points pins d to a few 0.01 nm.
        Assert.InRange(value, 1.45, 1.55);
        var ci = d.GetProperty("ci95");
        Assert.InRange(ci[0].GetDouble(), 1.4, 1.6);
        Assert.InRange(ci[1].GetDouble(), 1.4, 1.6);
    }

    [Fact]
    public void Fit_BoundExcludingTruth_EstimateStaysInsideTheBound()
    {
        using var dir = new TempFolder();
        var (_, output, err) = CliRunner.Run("fit", Simulated(dir), "--area", "100", "--json", "--bound", "thickness=1.6:2");
        using var doc = JsonDocument.Parse(output.Trim());
        double value = doc.RootElement.GetProperty("parameters").GetProperty("thickness_nm").GetProperty("value").GetDouble();
        Assert.True(value > 1.6 && value < 2.0, $"d = {value} nm; {err}");
    }

    [Fact]
    public void CanonicalOptions_ValuesInTheKeysUnit_AndBoundsListed()
    {
        var options = FitOptions.Default with
        {
            FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Thickness, 1.6e-9),
            Bounds = ImmutableDictionary<ParameterKey, ParameterBounds>.Empty.Add(ParameterKey.BarrierHeight,
                new ParameterBounds(ParameterKey.BarrierHeight.FromDisplay(1.5), ParameterKey.BarrierHeight.FromDisplay(2.5))),
        };
        string text = FitOptionsText.Canonical(options);
        Assert.Contains("\nfixed.thickness_nm=1.6", text, StringComparison.Ordinal);
        Assert.Contains("\nbound.barrier_height_eV=1.5:2.5", text, StringComparison.Ordinal);
        Assert.NotEqual(ResultIdentity.OptionsHash(text), ResultIdentity.OptionsHash(FitOptionsText.Canonical(FitOptions.Default)));
    }
}
