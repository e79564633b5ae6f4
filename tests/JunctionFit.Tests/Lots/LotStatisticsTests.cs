using JunctionFit.Lots;
using MathNet.Numerics.Distributions;
using Xunit;

namespace JunctionFit.Tests.Lots;

public class LotStatisticsTests
{
    [Fact]
    public void Welch_HandWorkedSamples_MatchesHandCalculation()
    {
        // Independent calculation in this test: x = 1…5 (mean 3, s² = 2.5), y = 2,4,6,8 (mean 5, s² = 20/3).
        double[] x = [1, 2, 3, 4, 5];
        double[] y = [2, 4, 6, 8];
        double v1 = 2.5 / 5, v2 = (20.0 / 3) / 4;
        double se = Math.Sqrt(v1 + v2);
        double df = (v1 + v2) * (v1 + v2) / (v1 * v1 / 4 + v2 * v2 / 3); // Welch–Satterthwaite by hand
        double t = -2 / se;
        // p and quantile from MathNet's Student t (a general-purpose reference library) at the hand-computed df.
        double p = 2 * StudentT.CDF(0, 1, df, -Math.Abs(t));
        double q = StudentT.InvCDF(0, 1, df, 0.975);

        var w = LotStatistics.Welch(x, y)!;

        Assert.Equal(-2.0, w.Difference, 12);
        Assert.Equal(se, w.StandardError, 12);
        Assert.Equal(4.7494, df, 4); // by hand: 4.694444 / 0.988426
        Assert.Equal(df, w.DegreesOfFreedom, 10);
        Assert.Equal(t, w.T, 10);
        Assert.Equal(p, w.PValue, 10);
        Assert.Equal(-2 - q * se, w.Lower95, 10);
        Assert.Equal(-2 + q * se, w.Upper95, 10);
    }

    [Fact]
    public void Welch_TextbookExample_MatchesPublishedValues()
    {
        // Worked example of Welch's t-test as given on Wikipedia ("Welch's t-test", example 1), from memory:
        // t ≈ −2.46, ν ≈ 25.0, p ≈ 0.021.
        double[] a1 = [27.5, 21.0, 19.0, 23.6, 17.0, 17.9, 16.9, 20.1, 21.9, 22.6, 23.1, 19.6, 19.0, 21.7, 21.4];
        double[] a2 = [27.1, 22.0, 20.8, 23.4, 23.4, 23.5, 25.8, 22.0, 24.8, 20.2, 21.9, 22.1, 22.9, 20.5, 24.4];

        var w = LotStatistics.Welch(a1, a2)!;

        Assert.Equal(-2.46, w.T, 2);
        Assert.Equal(25.0, w.DegreesOfFreedom, 0);
        Assert.Equal(0.021, w.PValue, 3);
    }

    [Fact]
    public void Welch_BothSamplesConstant_ReturnsNull()
    {
        Assert.Null(LotStatistics.Welch([1.0, 1.0, 1.0], [1.0, 1.0]));
    }

    [Fact]
    public void Welch_OneValue_Throws()
    {
        Assert.Throws<ArgumentException>(() => LotStatistics.Welch([1.0], [1.0, 2.0]));
    }

    [Fact]
    public void HolmAdjust_HandWorkedFamily_MatchesStepDownProcedure()
    {
        // Holm (1979) by hand, m = 4: sorted 0.005, 0.01, 0.03, 0.04 → ×4, ×3, ×2, ×1 = 0.02, 0.03, 0.06, 0.04;
        // running maximum → 0.02, 0.03, 0.06, 0.06. At α = 0.05: 0.005 ≤ 0.0125 and 0.01 ≤ 0.0167 are rejected,
        // 0.03 > 0.025 stops the procedure.
        double[] p = [0.01, 0.04, 0.03, 0.005];

        var adjusted = LotStatistics.HolmAdjust(p);

        Assert.Equal(0.03, adjusted[0], 12);
        Assert.Equal(0.06, adjusted[1], 12);
        Assert.Equal(0.06, adjusted[2], 12);
        Assert.Equal(0.02, adjusted[3], 12);
        Assert.Equal([true, false, false, true], adjusted.Select(a => a <= 0.05));
    }

    [Fact]
    public void HolmAdjust_LargeProducts_CappedAtOne()
    {
        var adjusted = LotStatistics.HolmAdjust([0.6, 0.9]);
        Assert.Equal(1.0, adjusted[0]);
        Assert.Equal(1.0, adjusted[1]);
    }

    [Fact]
    public void HolmAdjust_PValueOutsideUnitInterval_Throws()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => LotStatistics.HolmAdjust([0.2, 1.5]));
    }

    [Fact]
    public void ScaledMad_OneOutlier_IsMedianDeviationTimesConstant()
    {
        // By hand: median 3, |deviations| 2, 1, 0, 1, 97 → median 1 → 1.4826.
        Assert.Equal(1.4826, LotStatistics.ScaledMad([1, 2, 3, 4, 100]), 12);
    }

    [Fact]
    public void MadNormalConsistency_EqualsInverseNormalQuartile()
    {
        // Rousseeuw & Croux (1993): the factor is 1/Φ⁻¹(3/4); Φ⁻¹ from MathNet's Normal distribution.
        double expected = 1 / Normal.InvCDF(0, 1, 0.75);
        double actual = LotStatistics.MadNormalConsistency;
        Assert.Equal(expected, actual, 4);
    }

    [Fact]
    public void Median_EvenCount_AveragesMiddlePair()
    {
        Assert.Equal(2.5, LotStatistics.Median([4, 1, 3, 2]));
        Assert.Equal(3, LotStatistics.Median([5, 1, 3]));
    }

    [Fact]
    public void Median_NonFiniteValue_Throws()
    {
        Assert.Throws<ArgumentException>(() => LotStatistics.Median([1, double.NaN]));
    }

    [Fact]
    public void MovingRangeSigma_HandWorkedSeries_IsAverageRangeOverD2()
    {
        // Ranges 2, 1, 4 → MR̄ = 7/3; σ̂ = MR̄ / 1.128 (d₂ for n = 2, Montgomery's table of control-chart constants).
        Assert.Equal(7.0 / 3 / 1.128, LotStatistics.MovingRangeSigma([10, 12, 11, 15]), 12);
    }
}
