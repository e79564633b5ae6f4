using JunctionFit.Fitting;
using Xunit;

namespace JunctionFit.Tests.Fitting;

public sealed class LinearizedCovarianceTests
{
    [Fact]
    public void Compute_StraightLine_MatchesOrdinaryLeastSquaresFormulas()
    {
        // y = a + b t, J = [1 t]; (JᵀJ)⁻¹ = [Σt², −Σt; −Σt, m] / (m Σt² − (Σt)²) (textbook linear regression, common practice).
        double[] t = [0, 1, 2, 3, 4, 5];
        int m = t.Length;
        var jac = new double[m * 2];
        double st = 0;
        double stt = 0;
        for (int i = 0; i < m; i++)
        {
            jac[2 * i] = 1;
            jac[(2 * i) + 1] = t[i];
            st += t[i];
            stt += t[i] * t[i];
        }

        double det = (m * stt) - (st * st);
        const double rss = 0.8;

        LinearizedCovarianceResult c = LinearizedCovariance.Compute(jac, m, 2, rss);

        Assert.Equal(stt / det, c.UnscaledCovariance[0], 1e-14);
        Assert.Equal(-st / det, c.UnscaledCovariance[1], 1e-14);
        Assert.Equal(-st / det, c.UnscaledCovariance[2], 1e-14);
        Assert.Equal(m / det, c.UnscaledCovariance[3], 1e-14);
        Assert.Equal(rss / (m - 2), c.ResidualVariance, 1e-15);
        Assert.Equal(Math.Sqrt(rss / (m - 2) * stt / det), c.StandardErrors[0], 1e-14);
        Assert.Equal(Math.Sqrt(rss / (m - 2) * m / det), c.StandardErrors[1], 1e-14);
        Assert.Equal(1.0, c.Correlation[0]);
        Assert.Equal(-st / Math.Sqrt(stt * m), c.Correlation[1], 1e-14);
        Assert.Equal(m - 2, c.DegreesOfFreedom);
        Assert.Equal(2, c.Rank);
        Assert.False(c.IsNearSingular);
        Assert.False(c.IsRankDeficient);
    }

    [Fact]
    public void Compute_DuplicatedColumn_FlagsRankDeficiency()
    {
        double[] jac = [1, 1, 2, 2, 3, 3, 4, 4];

        LinearizedCovarianceResult c = LinearizedCovariance.Compute(jac, 4, 2, 1.0);

        Assert.True(c.IsRankDeficient);
        Assert.True(c.IsNearSingular);
        Assert.Equal(1, c.Rank);
        Assert.True(double.IsPositiveInfinity(c.ConditionNumber));
    }

    [Fact]
    public void Compute_NearlyParallelColumns_FlagsNearSingularButFullRank()
    {
        double[] jac = [1, 1, 2, 2 + 1e-9, 3, 3, 4, 4];

        LinearizedCovarianceResult c = LinearizedCovariance.Compute(jac, 4, 2, 1.0);

        Assert.False(c.IsRankDeficient);
        Assert.True(c.IsNearSingular);
        Assert.True(c.ConditionNumber > 1e8);
        Assert.True(Math.Abs(c.Correlation[1]) > 0.999);
    }

    [Fact]
    public void Compute_SquareSystem_GivesNaNScaledCovariance()
    {
        LinearizedCovarianceResult c = LinearizedCovariance.Compute([2.0, 0.0, 0.0, 4.0], 2, 2, 0.0);

        Assert.Equal(0, c.DegreesOfFreedom);
        Assert.True(double.IsNaN(c.ResidualVariance));
        Assert.True(double.IsNaN(c.StandardErrors[0]));
        Assert.Equal(0.25, c.UnscaledCovariance[0], 1e-15);
        Assert.Equal(1.0 / 16.0, c.UnscaledCovariance[3], 1e-15);
    }

    [Fact]
    public void Compute_NonFiniteJacobian_ThrowsArgumentException()
        => Assert.Throws<ArgumentException>(() => LinearizedCovariance.Compute([1.0, double.NaN], 2, 1, 1.0));

    [Fact]
    public void Compute_InconsistentSizes_ThrowArgumentException()
    {
        // Fewer residuals than parameters, no parameter, and a Jacobian of the wrong length: programmer errors.
        Assert.Throws<ArgumentException>(() => LinearizedCovariance.Compute([1.0, 2.0], 1, 2, 1.0));
        Assert.Throws<ArgumentException>(() => LinearizedCovariance.Compute([], 3, 0, 1.0));
        ArgumentException e = Assert.Throws<ArgumentException>(() => LinearizedCovariance.Compute([1.0, 2.0, 3.0], 2, 2, 1.0));
        Assert.Contains("4", e.Message, StringComparison.Ordinal);   // m·n, the length it expected
        Assert.Throws<ArgumentOutOfRangeException>(() => LinearizedCovariance.Compute([1.0, 2.0], 2, 1, -1.0));
        Assert.Throws<ArgumentOutOfRangeException>(() => LinearizedCovariance.Compute([1.0, 2.0], 2, 1, 1.0, conditionThreshold: 0.5));
    }
}
