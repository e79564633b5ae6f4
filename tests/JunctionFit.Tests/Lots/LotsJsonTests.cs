using System.Text.Json;
using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Reporting;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class LotsJsonTests
{
    [Fact]
    public void FormatDrift_FlaggedRow_HasTheIssueKeysFirst()
    {
        var row = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), new DriftOptions("KM-A01")).Flagged.Single();

        string line = LotsJsonFormatter.FormatDrift(row);

        Assert.DoesNotContain('\n', line);
        using var doc = JsonDocument.Parse(line);
        var names = doc.RootElement.EnumerateObject().Select(p => p.Name).Take(7);
        Assert.Equal(["lot", "parameter", "shift", "ci95", "p_value", "flagged", "n"], names);
        Assert.Equal("barrier_height_eV", doc.RootElement.GetProperty("parameter").GetString());
        Assert.True(doc.RootElement.GetProperty("flagged").GetBoolean());
        Assert.Equal(2, doc.RootElement.GetProperty("ci95").GetArrayLength());
        Assert.Equal(row.PValueHolm!.Value, doc.RootElement.GetProperty("p_value").GetDouble());
    }

    [Fact]
    public void FormatDrift_ReasonRow_HasNullsAndReason()
    {
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01"), 1);
        rows.Add(LotSimulation.Row("KM-A02", FitStatus.Ok, 2.0));
        var row = DriftAnalysis.Compute(rows, new DriftOptions("KM-A01") { ParameterKeys = ["barrier_height_eV"] }).Rows.Single();

        using var doc = JsonDocument.Parse(LotsJsonFormatter.FormatDrift(row));

        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("shift").ValueKind);
        Assert.Equal(JsonValueKind.Null, doc.RootElement.GetProperty("p_value").ValueKind);
        Assert.Contains("1 good die", doc.RootElement.GetProperty("reason").GetString(), StringComparison.Ordinal);
    }

    [Fact]
    public void FormatThickness_Comparison_HasBiasLimitsAndUnmatched()
    {
        var c = ThicknessComparison.Compare(LotSimulation.ThreeLotsWithPlantedShift(),
            [new EllipsometryRow("KM-A01", "W01", null, null, 1.25, 2), new EllipsometryRow("KM-A01", "W02", null, null, 1.25, 3), new EllipsometryRow("KM-A09", "W01", null, null, 1.25, 4)]);

        using var doc = JsonDocument.Parse(LotsJsonFormatter.FormatThickness(c));
        var root = doc.RootElement;

        Assert.Equal(["bias_nm", "ci95", "limits_of_agreement", "n"], root.EnumerateObject().Select(p => p.Name).Take(4));
        Assert.Equal(2, root.GetProperty("n").GetInt32());
        Assert.Equal("wafer", root.GetProperty("level").GetString());
        Assert.Equal(4, root.GetProperty("unmatched_ellipsometry")[0].GetProperty("line").GetInt32());
        Assert.True(root.GetProperty("unmatched_results").GetArrayLength() > 0);
    }
}
