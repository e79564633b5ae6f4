using JunctionFit.Fitting;
using MathNet.Numerics.LinearAlgebra;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The safe Euclidean norm against exact values and MathNet's <c>L2Norm</c>: ordinary vectors, vectors whose squares
/// overflow or underflow (IEEE 754 binary64: largest finite 1.8e308, smallest normal 2.2e-308), and NaN and infinite entries.
/// </summary>
public sealed class DenseKernelsTests
{
    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void Norm_OrdinaryVector_MatchesMathNet(int seed)
    {
        var rng = new Random(seed);
        double[] v = Enumerable.Range(0, 37).Select(_ => (2 * rng.NextDouble()) - 1).ToArray();
        Assert.InRange(DenseKernels.Norm(v) / Vector<double>.Build.DenseOfArray(v).L2Norm(), 1 - 1e-15, 1 + 1e-15);
    }

    [Fact]
    public void Norm_PythagoreanTriple_IsExact()
    {
        Assert.Equal(5.0, DenseKernels.Norm([3.0, -4.0]));
        Assert.Equal(13.0, DenseKernels.Norm([-5.0, 12.0]));
    }

    [Theory]
    [InlineData(1e200)]    // squares overflow to ∞
    [InlineData(1e154)]    // squares just below overflow, their sum above it
    [InlineData(1e-160)]   // squares underflow into subnormals or to 0
    [InlineData(1e-200)]
    [InlineData(1e-145)]   // squares (1e-290) normal but their sum below the 1e-280 cut, still exact
    public void Norm_EqualEntriesOfExtremeSize_IsTheirSizeTimesRootN(double size)
    {
        // ‖(s, s, …, s)‖ = s·√n exactly in real arithmetic; the mixture of signs must not matter.
        double[] v = [size, -size, size, size, -size, size, size, -size, size];
        double expected = size * 3.0;
        Assert.InRange(DenseKernels.Norm(v) / expected, 1 - 1e-15, 1 + 1e-15);
    }

    [Fact]
    public void Norm_MixedScales_KeepsTheSmallEntriesAndScalesByTheLargest()
    {
        // (3e-170, 4e-170) → 5e-170; one large entry among tiny ones is the norm to rounding; the scale is the largest |vᵢ|
        // wherever it sits.
        Assert.InRange(DenseKernels.Norm([3e-170, 4e-170]) / 5e-170, 1 - 1e-15, 1 + 1e-15);
        Assert.InRange(DenseKernels.Norm([4e-170, -3e-170, 0.0]) / 5e-170, 1 - 1e-15, 1 + 1e-15);
        Assert.InRange(DenseKernels.Norm([1e-170, 2e-170, 2e-170]) / 3e-170, 1 - 1e-15, 1 + 1e-15);
        Assert.InRange(DenseKernels.Norm([3e300, -4e300]) / 5e300, 1 - 1e-15, 1 + 1e-15);
    }

    [Fact]
    public void Norm_ZeroNaNAndInfinity()
    {
        Assert.Equal(0.0, DenseKernels.Norm([0.0, -0.0, 0.0]));
        Assert.Equal(0.0, DenseKernels.Norm(ReadOnlySpan<double>.Empty));
        Assert.True(double.IsNaN(DenseKernels.Norm([1.0, double.NaN, 2.0])));
        Assert.True(double.IsNaN(DenseKernels.Norm([double.PositiveInfinity, double.NaN])));
        Assert.Equal(double.PositiveInfinity, DenseKernels.Norm([1.0, double.NegativeInfinity]));
        Assert.Equal(double.PositiveInfinity, DenseKernels.Norm([1e-200, double.PositiveInfinity]));
        // The smallest subnormal alone: its square is 0, its norm is itself.
        Assert.Equal(double.Epsilon, DenseKernels.Norm([double.Epsilon, 0.0]));
    }

    [Fact]
    public void ColumnNorm_IsTheNormOfTheRowRangeOfOneColumn()
    {
        // 3×2 column-major [[1, 4], [2, 5], [2, 6]]: column 0 rows 0..3 → 3; column 1 rows 1..3 → √61.
        double[] a = [1, 2, 2, 4, 5, 6];
        Assert.Equal(3.0, DenseKernels.ColumnNorm(a, 3, 0, 0, 3));
        Assert.Equal(Math.Sqrt(61), DenseKernels.ColumnNorm(a, 3, 1, 1, 3), 1e-15);
        Assert.Equal(0.0, DenseKernels.ColumnNorm(a, 3, 1, 2, 2));
    }

    [Fact]
    public void AllFinite_FindsEveryNonFiniteKind()
    {
        Assert.True(DenseKernels.AllFinite([0.0, -1e308, double.Epsilon]));
        Assert.True(DenseKernels.AllFinite(ReadOnlySpan<double>.Empty));
        Assert.False(DenseKernels.AllFinite([1.0, 2.0, double.NaN]));
        Assert.False(DenseKernels.AllFinite([double.PositiveInfinity, 1.0]));
        Assert.False(DenseKernels.AllFinite([1.0, double.NegativeInfinity, 1.0]));
    }
}
