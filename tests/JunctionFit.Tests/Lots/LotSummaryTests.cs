using JunctionFit.Lots;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class LotSummaryTests
{
    [Fact]
    public void Compute_MixedStatuses_MedianSpreadAndYieldOverGoodDiesOnly()
    {
        ResultRow[] rows =
        [
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.1),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.3),
            LotSimulation.Row("KM-A01", FitStatus.PoorFit, 9.0),
            LotSimulation.Row("KM-A01", FitStatus.Failed, null),
        ];

        var lot = Assert.Single(LotSummary.Compute(rows));

        Assert.Equal("KM-A01", lot.Lot);
        Assert.Equal((5, 3, 1, 1), (lot.Total, lot.Ok, lot.PoorFit, lot.Failed));
        Assert.Equal(0.6, lot.Yield, 12);
        var phi = lot.Find("barrier_height_eV")!;
        Assert.Equal(3, phi.GoodCount);
        Assert.Equal(2.1, phi.Median!.Value, 12);
        // By hand: |deviations| 0.1, 0, 0.2 → median 0.1 → × 1.4826.
        Assert.Equal(0.14826, phi.RobustSpread!.Value, 10);
    }

    [Fact]
    public void Compute_LotWithoutGoodDies_HasZeroCountAndNoMedian()
    {
        var lot = Assert.Single(LotSummary.Compute([LotSimulation.Row("KM-A02", FitStatus.Failed, null)], ["barrier_height_eV"]));

        Assert.Equal(0, lot.Yield);
        Assert.Equal(0, lot.Parameters[0].GoodCount);
        Assert.Null(lot.Parameters[0].Median);
    }

    [Fact]
    public void Compute_SeveralLots_OrdinalOrderAndDefaultKeys()
    {
        var summary = LotSummary.Compute(LotSimulation.ThreeLotsWithPlantedShift());

        Assert.Equal(["KM-A01", "KM-A02", "KM-A03"], summary.Select(s => s.Lot));
        Assert.Equal(["barrier_height_eV", "thickness_nm", "area_m2", "mass_ratio", "transition_voltage_V"], summary[0].Parameters.Select(p => p.Key));
        Assert.InRange(summary[1].Find("barrier_height_eV")!.Median!.Value, 2.13, 2.17);
        Assert.InRange(summary[1].Find("barrier_height_eV")!.RobustSpread!.Value, 0.015, 0.05);
    }
}
