using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Physics;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class CetCrossCheckTests
{
    [Fact]
    public void Analyse_CetOfSaturatedCurve_MatchesHandCalculation()
    {
        // Hand calculation: CET = ε_ox ε₀ A / C_max with ε_ox = 3.9 (SiO₂) and ε₀ = 8.8541878128e-12 F/m (CODATA 2018):
        // 3.9 × 8.8541878128e-12 × 1e-8 m² / 1e-10 F = 3.4531332470e-9 m = 3.453133247 nm.
        var s = CvAnalysis.Analyse([-1.0, 0.0, 0.5, 1.0], [2e-11, 6e-11, 1e-10, 1e-10], 1e-8);

        Assert.Equal(3.453133247, s.CapacitanceEquivalentThicknessNm, 1e-8);
        Assert.True(s.Saturated);
    }

    private static ResultRow[] TwoWafers() =>
    [
        LotSimulation.Row("KM-G01", FitStatus.Ok, 3.1, "W01", 0, 0, 2.00),
        LotSimulation.Row("KM-G01", FitStatus.Ok, 3.1, "W01", 1, 0, 2.02),
        LotSimulation.Row("KM-G01", FitStatus.Ok, 3.1, "W01", 2, 0, 2.06),
        LotSimulation.Row("KM-G01", FitStatus.Failed, null, "W01", 3, 0),
        LotSimulation.Row("KM-G01", FitStatus.Ok, 3.1, "W02", 0, 0, 2.10),
    ];

    [Fact]
    public void Compare_PerWafer_MedianSpreadDifferencesAndAssignment()
    {
        EllipsometryRow[] ellipsometry = [new("KM-G01", "W01", null, null, 2.05, 2), new("KM-G01", "W02", null, null, 2.00, 3)];
        CetMeasurement[] cet =
        [
            new("a.csv", "KM-G01", "W01", 2.50, true),
            new("b.csv", "KM-G01", "W01", 2.60, true),
            new("c.csv", "KM-G01", "W01", 2.58, true),
            new("d.csv", null, "W01", 2.55, true),
            new("e.csv", "KM-G01", "W07", 2.55, false),
        ];

        var r = CetCrossCheck.Compare(TwoWafers(), ellipsometry, cet);

        // Order: the ellipsometry wafers, then the C–V-only wafer W07.
        Assert.Equal(["W01", "W02", "W07"], r.Wafers.Select(w => w.Wafer));
        var w1 = r.Wafers[0];
        Assert.Equal(3, w1.Dies);                                   // the failed die is not used
        Assert.Equal(2.02, w1.ElectricalMedianNm!.Value, 12);       // median of 2.00, 2.02, 2.06
        Assert.Equal(1.4826 * 0.02, w1.ElectricalSpreadNm!.Value, 4); // |dev| = 0.02, 0, 0.04 → MAD 0.02 (Rousseeuw & Croux 1993 scale)
        Assert.Equal(2.58, w1.CetNm!.Value, 12);                    // median of the three C–V files on W01
        Assert.Equal(3, w1.CetFiles);
        Assert.Equal(-0.03, w1.ElectricalMinusEllipsometryNm!.Value, 12);
        Assert.Equal(0.56, w1.CetMinusElectricalNm!.Value, 12);
        Assert.False(w1.CetFlagged);
        Assert.Contains("median of 3 C-V files", w1.Note, StringComparison.Ordinal);

        var w2 = r.Wafers[1];
        Assert.Null(w2.CetNm);
        Assert.Equal(0.10, w2.ElectricalMinusEllipsometryNm!.Value, 12);
        Assert.False(w2.CetFlagged);

        var w7 = r.Wafers[2];
        Assert.Null(w7.ElectricalMedianNm);
        Assert.True(w7.CetIsUpperBound);
        Assert.Contains("not in the results", w7.Note, StringComparison.Ordinal);

        var u = Assert.Single(r.UnmatchedCet);
        Assert.Equal("d.csv", u.Measurement.Source);
        Assert.Contains(new Remedy(RemedyKind.PathPattern), Remedy.Find(u.Reason));
    }

    [Theory]
    [InlineData(2.52, false)] // CET − t_ox = 0.50 nm
    [InlineData(3.30, true)]  // 1.28 nm > 1.2
    [InlineData(1.95, true)]  // −0.07 nm < 0
    [InlineData(3.20, false)] // 1.18 nm, just inside
    public void Compare_CetMinusToxOutsideDefaultRange_Flagged(double cetNm, bool flagged)
    {
        var r = CetCrossCheck.Compare(TwoWafers(), [], [new CetMeasurement("a.csv", "KM-G01", "W01", cetNm, true)]);

        var w = Assert.Single(r.Wafers);
        Assert.Equal(flagged, w.CetFlagged);
        Assert.Equal(flagged, w.Note.StartsWith("FLAGGED", StringComparison.Ordinal));
        Assert.Equal(flagged ? 1 : 0, r.Flagged.Count());
    }

    [Fact]
    public void Compare_SettableRange_ChangesTheFlag()
    {
        CetMeasurement[] cet = [new("a.csv", "KM-G01", "W01", 3.30, true)]; // CET − t_ox = 1.28 nm

        Assert.True(CetCrossCheck.Compare(TwoWafers(), [], cet).Wafers[0].CetFlagged);
        Assert.False(CetCrossCheck.Compare(TwoWafers(), [], cet, 0.2, 1.5).Wafers[0].CetFlagged);
        Assert.True(CetCrossCheck.Compare(TwoWafers(), [], [new("a.csv", "KM-G01", "W01", 2.22, true)], 0.3, 0.7).Wafers[0].CetFlagged); // 0.20 nm
    }

    [Fact]
    public void Compare_BadRangeOrCet_Throws()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => CetCrossCheck.Compare(TwoWafers(), [], [], 1.0, 0.5));
        Assert.Throws<ArgumentOutOfRangeException>(() => CetCrossCheck.Compare(TwoWafers(), [], [], double.NaN, 1.0));
        Assert.Throws<ArgumentOutOfRangeException>(() => CetCrossCheck.Compare(TwoWafers(), [], [new("a.csv", "KM-G01", "W01", -1, true)]));
    }

    [Fact]
    public void Compare_PerSiteEllipsometry_UsesTheWaferMean()
    {
        EllipsometryRow[] sites = [new("KM-G01", "W01", 0, 0, 2.00, 2), new("KM-G01", "W01", 1, 0, 2.10, 3)];

        var r = CetCrossCheck.Compare(TwoWafers(), sites, []);

        Assert.Equal(2.05, r.Wafers[0].EllipsometricNm!.Value, 12);
        Assert.Equal("no C-V file on this wafer", r.Wafers[0].Note);
    }
}
