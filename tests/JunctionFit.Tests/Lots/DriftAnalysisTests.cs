using JunctionFit.Lots;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class DriftAnalysisTests
{
    private static readonly DriftOptions Reference = new("KM-A01");

    [Fact]
    public void Compute_PlantedBarrierShiftInOneOfThreeLots_FlagsOnlyThatLotAndParameter()
    {
        var rows = LotSimulation.ThreeLotsWithPlantedShift();

        var drift = DriftAnalysis.Compute(rows, Reference);

        var flagged = Assert.Single(drift.Flagged);
        Assert.Equal("KM-A02", flagged.Lot);
        Assert.Equal("barrier_height_eV", flagged.Key);
        Assert.InRange(flagged.Shift!.Value, 0.13, 0.17);
        Assert.True(flagged.Lower95 < 0.15 && flagged.Upper95 > 0.15, "the interval should cover the planted shift");
        Assert.True(flagged.PValueHolm < 1e-6);
    }

    [Fact]
    public void Compute_ThreeLots_TestsEveryFreeParameterOfEveryOtherLot()
    {
        var drift = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), Reference);

        // mass_ratio is fixed in every fit, so it is not analysed by default; the transition voltage is.
        Assert.Equal(["barrier_height_eV", "thickness_nm", "area_m2", "transition_voltage_V"], drift.Keys.ToArray());
        Assert.Equal(8, drift.Rows.Length);
        Assert.DoesNotContain(drift.Rows, r => r.Lot == "KM-A01");
        Assert.All(drift.Rows, r => Assert.NotNull(r.PValueHolm));
        Assert.All(drift.Rows, r => Assert.True(r.PValueHolm >= r.PValue));
        Assert.Equal(["KM-A01", "KM-A02", "KM-A03"], drift.Lots.ToArray());
    }

    [Fact]
    public void Compute_GoodDiesOnly_CountsExcludeFailedAndPoorFits()
    {
        var drift = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), Reference);

        var a02 = drift.Rows.Single(r => r.Lot == "KM-A02" && r.Key == "barrier_height_eV");
        Assert.Equal(59, a02.N);          // 60 dies, 1 failed
        Assert.Equal(57, a02.ReferenceN); // 60 dies, 2 failed, 1 poor fit
    }

    [Fact]
    public void Compute_SignificantButSmallShift_IsNotFlagged()
    {
        // 0.02 eV with 600 dies per lot is highly significant but below the 0.05 eV practical threshold.
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01") { Wafers = 20, BarrierSdEv = 0.01 }, 1);
        rows.AddRange(LotSimulation.Lot(new LotSimulation.LotSpec("KM-A02", BarrierHeightEv: 2.02) { Wafers = 20, BarrierSdEv = 0.01 }, 2));

        var drift = DriftAnalysis.Compute(rows, Reference);

        var phi = drift.Rows.Single(r => r.Key == "barrier_height_eV");
        Assert.True(phi.PValueHolm < 1e-10);
        Assert.Equal(0.05, phi.Threshold);
        Assert.False(phi.Flagged);
    }

    [Fact]
    public void Compute_ThresholdLowered_FlagsTheSmallShift()
    {
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01") { Wafers = 20, BarrierSdEv = 0.01 }, 1);
        rows.AddRange(LotSimulation.Lot(new LotSimulation.LotSpec("KM-A02", BarrierHeightEv: 2.02) { Wafers = 20, BarrierSdEv = 0.01 }, 2));
        var options = Reference with
        {
            Thresholds = DriftOptions.DefaultThresholds.SetItem("barrier_height_eV", PracticalThreshold.Absolute(0.01)),
        };

        var drift = DriftAnalysis.Compute(rows, options);

        Assert.True(drift.Rows.Single(r => r.Key == "barrier_height_eV").Flagged);
    }

    [Fact]
    public void Compute_RelativeAreaThreshold_ResolvesAgainstReferenceMean()
    {
        var drift = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), Reference);

        var area = drift.Rows.First(r => r.Key == "area_m2");
        Assert.Equal(0.10 * area.ReferenceMean!.Value, area.Threshold!.Value, 1e-24);
    }

    [Fact]
    public void Compute_LotWithTwoGoodDies_ReportsReasonInsteadOfNumbers()
    {
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01"), 3);
        rows.Add(LotSimulation.Row("KM-A03", FitStatus.Ok, 2.01));
        rows.Add(LotSimulation.Row("KM-A03", FitStatus.Ok, 2.02));
        rows.Add(LotSimulation.Row("KM-A03", FitStatus.PoorFit, 2.5));

        var drift = DriftAnalysis.Compute(rows, Reference with { ParameterKeys = ["barrier_height_eV"] });

        var row = Assert.Single(drift.Rows);
        Assert.Equal("KM-A03", row.Lot);
        Assert.Equal(2, row.N);
        Assert.Null(row.Shift);
        Assert.Null(row.PValue);
        Assert.Null(row.PValueHolm);
        Assert.False(row.Flagged);
        Assert.Contains("2 good dies", row.Reason, StringComparison.Ordinal);
        Assert.Contains("at least 3", row.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Compute_ReasonRows_AreLeftOutOfTheHolmFamily()
    {
        // One testable comparison: its Holm p equals its raw p (m = 1).
        var rows = LotSimulation.ThreeLotsWithPlantedShift().Where(r => r.Lot != "KM-A03").ToList();
        rows.Add(LotSimulation.Row("KM-A03", FitStatus.Ok, 2.0));

        var drift = DriftAnalysis.Compute(rows, Reference with { ParameterKeys = ["barrier_height_eV"] });

        var tested = drift.Rows.Single(r => r.Lot == "KM-A02");
        Assert.Equal(tested.PValue, tested.PValueHolm);
    }

    [Fact]
    public void Compute_UnknownReferenceLot_ThrowsNamingLotsPresent()
    {
        var ex = Assert.Throws<ArgumentException>(() => DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), new DriftOptions("KM-A09")));
        Assert.Contains("KM-A09", ex.Message, StringComparison.Ordinal);
        Assert.Contains("KM-A01, KM-A02, KM-A03", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Compute_OneReferenceLot_ChartLimitsFromReferenceDiesAndShiftedLotOutside()
    {
        var rows = LotSimulation.ThreeLotsWithPlantedShift();

        var chart = DriftAnalysis.Compute(rows, Reference).Charts.Single(c => c.Key == "barrier_height_eV");

        Assert.Equal(ControlLimitBasis.ReferenceDies, chart.Basis);
        var referenceDies = rows.Where(r => r.Lot == "KM-A01" && r.IsGood).Select(r => r.ValueOf("barrier_height_eV")!.Value).ToList();
        Assert.Equal(LotStatistics.Median(referenceDies), chart.CentreLine!.Value, 12);
        Assert.Equal(LotStatistics.MovingRangeSigma(referenceDies), chart.Sigma!.Value, 12);
        Assert.Equal(chart.CentreLine!.Value + 3 * chart.Sigma!.Value, chart.UpperLimit!.Value, 12);
        Assert.Equal(["KM-A01", "KM-A02", "KM-A03"], chart.Points.Select(p => p.Lot));
        Assert.Equal([false, true, false], chart.Points.Select(p => p.OutOfControl));
        Assert.Equal([true, false, false], chart.Points.Select(p => p.IsReference));
    }

    [Fact]
    public void Compute_TwoReferenceLots_ChartFromMovingRangeOfTheirMedians()
    {
        // Lot medians by construction: A01 = 2.00, A02 = 2.04, A03 = 2.40; references A01 and A02.
        var rows = new List<ResultRow>();
        foreach (var (lot, centre) in new[] { ("KM-A01", 2.00), ("KM-A02", 2.04), ("KM-A03", 2.40) })
        {
            foreach (double offset in new[] { -0.01, 0.0, 0.01 }) rows.Add(LotSimulation.Row(lot, FitStatus.Ok, centre + offset));
        }

        var drift = DriftAnalysis.Compute(rows, new DriftOptions("KM-A01", "KM-A02") { ParameterKeys = ["barrier_height_eV"] });
        var chart = Assert.Single(drift.Charts);

        // Montgomery's individuals chart: centre 2.02, MR̄ = 0.04, σ̂ = 0.04 / 1.128.
        Assert.Equal(ControlLimitBasis.ReferenceLotMedians, chart.Basis);
        Assert.Equal(2.02, chart.CentreLine!.Value, 12);
        Assert.Equal(0.04 / 1.128, chart.Sigma!.Value, 12);
        Assert.Equal([false, false, true], chart.Points.Select(p => p.OutOfControl));
        Assert.Contains("rough", chart.Reason, StringComparison.Ordinal);
        Assert.Equal("KM-A03", Assert.Single(drift.Rows).Lot);
    }

    [Fact]
    public void Compute_LotOrderGiven_ChartFollowsIt()
    {
        var options = Reference with { LotOrder = ["KM-A03", "KM-A01"] };

        var chart = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), options).Charts[0];

        Assert.Equal(["KM-A03", "KM-A01", "KM-A02"], chart.Points.Select(p => p.Lot));
    }

    [Fact]
    public void Compute_RowsWithoutLot_AreCountedNotAnalysed()
    {
        var rows = LotSimulation.ThreeLotsWithPlantedShift();
        rows.Add(LotSimulation.Row("", FitStatus.Ok, 5.0) with { Lot = null });

        var drift = DriftAnalysis.Compute(rows, Reference);

        Assert.Equal(1, drift.RowsWithoutLot);
        Assert.Equal(3, drift.Lots.Length);
    }

    [Fact]
    public void DriftOptions_InvalidSettings_Throw()
    {
        Assert.Throws<ArgumentException>(() => new DriftOptions());
        Assert.Throws<ArgumentOutOfRangeException>(() => Reference with { Alpha = 1.5 });
        Assert.Throws<ArgumentOutOfRangeException>(() => Reference with { MinimumGoodDies = 1 });
        Assert.Throws<ArgumentOutOfRangeException>(() => PracticalThreshold.Absolute(-1));
    }
}
