using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class ThicknessComparisonTests
{
    [Fact]
    public void BlandAltman_SmallSet_MatchesHandCalculation()
    {
        // By hand: d = 0.1, 0.3, 0.2, 0.4, 0.0 → d̄ = 0.2, Σ(d − d̄)² = 0.1, s² = 0.025, s = 0.158114.
        // Limits of agreement d̄ ± 1.96 s (Bland & Altman, Lancet 1986) = −0.109903 … 0.509903.
        // t(0.975, 4) = 2.776 (Student t table, from memory): bias interval 0.2 ± 2.776 · s/√5 = 0.2 ± 0.1963;
        // SE of a limit √(3 s²/n) = 0.122474 (Bland & Altman 1986), half-width 2.776 · 0.122474 = 0.3400.
        var a = ThicknessComparison.BlandAltman([0.1, 0.3, 0.2, 0.4, 0.0]);

        Assert.Equal(5, a.N);
        Assert.Equal(0.2, a.BiasNm, 12);
        Assert.Equal(0.158114, a.DifferenceSdNm, 6);
        Assert.Equal(-0.109903, a.LowerLimitNm, 6);
        Assert.Equal(0.509903, a.UpperLimitNm, 6);
        Assert.Equal(0.2 - 0.1963, a.BiasLower95Nm, 3);
        Assert.Equal(0.2 + 0.1963, a.BiasUpper95Nm, 3);
        Assert.Equal(-0.109903 - 0.3400, a.LowerLimitLower95Nm, 3);
        Assert.Equal(0.509903 + 0.3400, a.UpperLimitUpper95Nm, 3);
    }

    [Fact]
    public void Compare_PerWafer_UsesMedianOfGoodDiesAndListsUnmatchedBothSides()
    {
        ResultRow[] results =
        [
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W01", 0, 0, 1.50),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W01", 1, 0, 1.60),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W01", 2, 0, 1.55),
            LotSimulation.Row("KM-A01", FitStatus.PoorFit, 2.0, "W01", 3, 0, 3.00),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W02", 0, 0, 1.70),
            LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W03", 0, 0, 1.40),
        ];
        EllipsometryRow[] ellipsometry =
        [
            new("KM-A01", "W01", null, null, 1.30, 2),
            new("KM-A01", "W02", null, null, 1.45, 3),
            new("KM-A01", "W09", null, null, 1.30, 4),
        ];

        var c = ThicknessComparison.Compare(results, ellipsometry);

        Assert.Equal(ThicknessMatchLevel.Wafer, c.Level);
        Assert.Equal(2, c.Pairs.Length);
        Assert.Equal(1.55, c.Pairs[0].ElectricalNm, 12); // median of 1.50, 1.60, 1.55; the poor fit is not used
        Assert.Equal(3, c.Pairs[0].DieCount);
        Assert.Equal(0.25, c.Pairs[0].DifferenceNm, 12);
        Assert.Equal(0.25, c.Pairs[1].DifferenceNm, 12);
        Assert.Equal(0.25, c.Agreement!.BiasNm, 12);

        Assert.Equal(2, c.UnmatchedResults.Length);
        Assert.Contains(c.UnmatchedResults, u => u.Wafer == "W01" && u.Reason.Contains("poor-fit", StringComparison.Ordinal));
        Assert.Contains(c.UnmatchedResults, u => u.Wafer == "W03" && u.Reason.Contains("no ellipsometry value for this wafer", StringComparison.Ordinal));
        var e = Assert.Single(c.UnmatchedEllipsometry);
        Assert.Equal(("W09", 4), (e.Row.Wafer, e.Row.SourceLine));
        Assert.Contains("no good result", e.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_PerSite_MatchesEachDieToItsSite()
    {
        ResultRow[] results =
        [
            LotSimulation.Row("KM-A02", FitStatus.Ok, 2.0, "W01", 0, 0, 1.52),
            LotSimulation.Row("KM-A02", FitStatus.Ok, 2.0, "W01", 1, 0, 1.58),
            LotSimulation.Row("KM-A02", FitStatus.Ok, 2.0, "W01", 2, 0, 1.61),
            LotSimulation.Row("KM-A02", FitStatus.Failed, null, "W01", 3, 0),
        ];
        EllipsometryRow[] ellipsometry =
        [
            new("KM-A02", "W01", 0, 0, 1.30, 2),
            new("KM-A02", "W01", 1, 0, 1.31, 3),
            new("KM-A02", "W01", 2, 0, 1.33, 4),
            new("KM-A02", "W01", 3, 0, 1.32, 5),
            new("KM-A02", "W01", 0, 0, 1.29, 6),
        ];

        var c = ThicknessComparison.Compare(results, ellipsometry);

        Assert.Equal(ThicknessMatchLevel.Site, c.Level);
        Assert.Equal([0.22, 0.27, 0.28], c.Pairs.Select(p => Math.Round(p.DifferenceNm, 10)));
        Assert.All(c.Pairs, p => Assert.Equal(1, p.DieCount));
        var failed = Assert.Single(c.UnmatchedResults);
        Assert.Equal(3, failed.DieX);
        Assert.Equal(2, c.UnmatchedEllipsometry.Length);
        Assert.Contains(c.UnmatchedEllipsometry, u => u.Row.SourceLine == 5 && u.Reason.Contains("no good result at this site", StringComparison.Ordinal));
        Assert.Contains(c.UnmatchedEllipsometry, u => u.Row.SourceLine == 6 && u.Reason.Contains("repeats", StringComparison.Ordinal));
    }

    [Fact]
    public void Compare_OnePair_GivesReasonInsteadOfStatistics()
    {
        var c = ThicknessComparison.Compare(
            [LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0, "W01", 0, 0, 1.5)],
            [new EllipsometryRow("KM-A01", "W01", null, null, 1.3)]);

        Assert.Single(c.Pairs);
        Assert.Null(c.Agreement);
        Assert.Contains("at least 2", c.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Compare_MixedEllipsometryLayouts_Throws()
    {
        Assert.Throws<ArgumentException>(() => ThicknessComparison.Compare([],
            [new EllipsometryRow("KM-A01", "W01", null, null, 1.3), new EllipsometryRow("KM-A01", "W02", 1, 1, 1.3)]));
    }

    [Fact]
    public void ConsistencyFTest_KnownSums_MatchesStudentTIdentity()
    {
        // F = ((12 − 10)/1)/(10/100) = 20. With one numerator degree of freedom F(1, ν) = T_ν², so
        // p = 2 P(T_ν ≤ −√F) — an identity of the distributions, checked with MathNet's Student t.
        var test = ThicknessComparison.ConsistencyFTest(rssFree: 10, dfFree: 100, rssFixed: 12);

        Assert.Equal(20, test.F, 12);
        Assert.Equal(2 * StudentT.CDF(0, 1, 100, -Math.Sqrt(20)), test.PValue, 10);
        Assert.False(test.Consistent);
        Assert.StartsWith("inconsistent", test.Verdict, StringComparison.Ordinal);
    }

    [Fact]
    public void ConsistencyFTest_AroundTableCriticalValue_SwitchesVerdict()
    {
        // F(0.95; 1, 100) ≈ 3.936 (F table, from memory). RSS_fixed = 10 + F·0.1.
        Assert.True(ThicknessComparison.ConsistencyFTest(10, 100, 10 + 3.90 * 0.1).Consistent);
        Assert.False(ThicknessComparison.ConsistencyFTest(10, 100, 10 + 3.97 * 0.1).Consistent);
    }

    [Fact]
    public void ConsistencyFTest_FixedFitBetterThanFree_IsConsistentWithNote()
    {
        var test = ThicknessComparison.ConsistencyFTest(10, 50, 9.9);

        Assert.Equal(0, test.F);
        Assert.Equal(1, test.PValue);
        Assert.True(test.Consistent);
        Assert.Contains("missed its optimum", test.Verdict, StringComparison.Ordinal);
    }

    [Fact]
    public void ConsistencyFTest_BadArguments_Throw()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => ThicknessComparison.ConsistencyFTest(0, 10, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => ThicknessComparison.ConsistencyFTest(1, 0, 1));
        Assert.Throws<ArgumentOutOfRangeException>(() => ThicknessComparison.ConsistencyFTest(1, 10, double.NaN));
    }
}
