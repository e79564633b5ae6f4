using JunctionFit.Fitting;
using MathNet.Numerics.LinearAlgebra;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The pivoted Householder QR against MathNet.Numerics (an independent general-purpose implementation): for the column
/// order our pivoting picks, MathNet's unpivoted QR of A·P has the same R up to the sign of each row, and its least-squares
/// solution is the one our Qᵀb and R give. Pivoting by largest remaining norm (Golub &amp; Van Loan, Matrix Computations,
/// §5.4.1) makes |r₀₀| ≥ |r₁₁| ≥ …, checked directly.
/// </summary>
public sealed class PivotedQrTests
{
    private sealed record Factored(int M, int N, double[] A, int[] Pivot, double[] RDiag, double[] ColumnNorms);

    private static Factored Factor(double[,] a)
    {
        int m = a.GetLength(0), n = a.GetLength(1);
        var cm = new double[m * n];
        for (int j = 0; j < n; j++)
            for (int i = 0; i < m; i++)
                cm[(j * m) + i] = a[i, j];
        var pivot = new int[n];
        var rdiag = new double[n];
        var norms = new double[n];
        PivotedQr.Factor(m, n, cm, pivot, rdiag, norms, new double[n]);
        return new Factored(m, n, cm, pivot, rdiag, norms);
    }

    private static double[,] Random(int m, int n, int seed)
    {
        var rng = new Random(seed);
        var a = new double[m, n];
        for (int i = 0; i < m; i++)
            for (int j = 0; j < n; j++)
                a[i, j] = (2 * rng.NextDouble()) - 1;
        return a;
    }

    /// <summary>R (n×n) from the factored storage: the returned diagonal and the strict upper triangle left in place.</summary>
    private static Matrix<double> R(Factored f)
    {
        var r = Matrix<double>.Build.Dense(f.N, f.N);
        for (int i = 0; i < f.N; i++)
        {
            r[i, i] = f.RDiag[i];
            for (int j = i + 1; j < f.N; j++) r[i, j] = f.A[(j * f.M) + i];
        }

        return r;
    }

    private static Matrix<double> Permuted(double[,] a, int[] pivot)
    {
        var ap = Matrix<double>.Build.Dense(a.GetLength(0), pivot.Length);
        for (int j = 0; j < pivot.Length; j++)
            for (int i = 0; i < a.GetLength(0); i++)
                ap[i, j] = a[i, pivot[j]];
        return ap;
    }

    private static void AssertSameRUpToRowSigns(Matrix<double> expected, Matrix<double> actual, double tolerance)
    {
        for (int i = 0; i < expected.RowCount; i++)
        {
            double sign = Math.Sign(expected[i, i]) * Math.Sign(actual[i, i]);
            for (int j = i; j < expected.ColumnCount; j++)
                Assert.True(Math.Abs(expected[i, j] - (sign * actual[i, j])) <= tolerance,
                    $"R[{i},{j}]: MathNet {expected[i, j]:R}, ours {actual[i, j]:R}");
        }
    }

    [Theory]
    [InlineData(12, 4, 1)]
    [InlineData(40, 6, 2)]
    [InlineData(5, 5, 3)]
    [InlineData(201, 3, 4)]
    public void Factor_RandomMatrix_GivesMathNetRForTheChosenColumnOrder(int m, int n, int seed)
    {
        double[,] a = Random(m, n, seed);
        Factored f = Factor(a);

        Assert.Equal(Enumerable.Range(0, n), f.Pivot.Order());
        Matrix<double> expected = Permuted(a, f.Pivot).QR().R.SubMatrix(0, n, 0, n);
        AssertSameRUpToRowSigns(expected, R(f), 1e-13);
        for (int j = 0; j < n; j++)
            Assert.Equal(Matrix<double>.Build.DenseOfArray(a).Column(j).L2Norm(), f.ColumnNorms[j], 1e-14);
    }

    [Fact]
    public void Factor_PicksTheColumnOfLargestRemainingNormAtEachStage()
    {
        double[,] a = Random(30, 5, 7);
        for (int i = 0; i < 30; i++)
        {
            a[i, 3] *= 10;    // largest column: must come first
            a[i, 1] *= 0.01;  // smallest: must come last
        }

        Factored f = Factor(a);

        Assert.Equal(3, f.Pivot[0]);
        Assert.Equal(1, f.Pivot[^1]);
        for (int j = 1; j < f.N; j++)
            Assert.True(Math.Abs(f.RDiag[j]) <= Math.Abs(f.RDiag[j - 1]) * (1 + 1e-14), $"|r{j}{j}| > |r{j - 1}{j - 1}|");

        AssertEachPivotHasTheLargestRemainingNorm(a, f, 1e-13);
    }

    /// <summary>
    /// Stage by stage, |r_jj| is the largest norm of the columns not yet chosen after projecting out the ones chosen
    /// before, computed here from MathNet's orthonormal basis of those columns.
    /// </summary>
    private static void AssertEachPivotHasTheLargestRemainingNorm(double[,] a, Factored f, double relativeTolerance)
    {
        var full = Matrix<double>.Build.DenseOfArray(a);
        int m = a.GetLength(0);
        for (int j = 1; j < f.N; j++)
        {
            Matrix<double> q = Permuted(a, f.Pivot[..j]).QR().Q.SubMatrix(0, m, 0, j);
            double best = 0;
            foreach (int k in f.Pivot[j..])
            {
                Vector<double> c = full.Column(k);
                best = Math.Max(best, (c - (q * q.TransposeThisAndMultiply(c))).L2Norm());
            }

            Assert.True(Math.Abs(best - Math.Abs(f.RDiag[j])) <= relativeTolerance * best,
                $"stage {j}: |r_jj| = {Math.Abs(f.RDiag[j]):E6}, largest remaining norm {best:E6}");
        }
    }

    [Fact]
    public void Factor_NearlyParallelColumns_RecomputesTheDowndatedNorms()
    {
        // Columns k = 1…4 are column 0 plus δ_k·noise, δ = 1e-10 … 3e-9. After stage 0 their remaining norms are ~δ_k of
        // their first norms, so downdating by ‖a‖² − r² has lost every digit (it gives 0 or rounding noise, which would
        // keep them in index order), and the norms must be recomputed (MINPACK-1's rule) for the pivots to follow the
        // true remainders, largest δ first.
        var rng = new Random(11);
        int m = 25;
        double[] delta = [0, 1e-10, 3e-10, 1e-9, 3e-9];
        var a = new double[m, delta.Length];
        for (int i = 0; i < m; i++)
        {
            a[i, 0] = (2 * rng.NextDouble()) - 1;
            for (int k = 1; k < delta.Length; k++) a[i, k] = a[i, 0] + (delta[k] * ((2 * rng.NextDouble()) - 1));
        }

        Factored f = Factor(a);

        AssertEachPivotHasTheLargestRemainingNorm(a, f, 1e-4);
        Assert.NotEqual([0, 1, 2, 3, 4], f.Pivot);   // the index order the lost digits would leave
    }

    [Fact]
    public void Factor_RankDeficientMatrix_PutsTheZeroAtTheEndOfR()
    {
        double[,] a = Random(20, 4, 5);
        for (int i = 0; i < 20; i++) a[i, 2] = a[i, 0] - (2 * a[i, 1]);   // exact dependence

        Factored f = Factor(a);

        Assert.True(Math.Abs(f.RDiag[3]) <= 1e-14 * Math.Abs(f.RDiag[0]), $"|r33| = {Math.Abs(f.RDiag[3]):E3}");
        Assert.True(Math.Abs(f.RDiag[2]) > 1e-3 * Math.Abs(f.RDiag[0]));
        Assert.Equal(3, Matrix<double>.Build.DenseOfArray(a).Rank());   // MathNet (SVD) agrees on the rank
    }

    [Fact]
    public void Factor_ZeroColumn_StaysZeroAndComesLast()
    {
        double[,] a = Random(10, 3, 9);
        for (int i = 0; i < 10; i++) a[i, 0] = 0;

        Factored f = Factor(a);

        Assert.Equal(0, f.Pivot[2]);
        Assert.Equal(0.0, f.RDiag[2]);
        Assert.Equal(0.0, f.ColumnNorms[0]);
        Matrix<double> expected = Permuted(a, f.Pivot).QR().R.SubMatrix(0, 2, 0, 2);
        AssertSameRUpToRowSigns(expected, R(f).SubMatrix(0, 2, 0, 2), 1e-14);
    }

    [Theory]
    [InlineData(15, 3, 21)]
    [InlineData(60, 5, 22)]
    public void ApplyQTranspose_GivesTheLeastSquaresSolutionOfMathNet(int m, int n, int seed)
    {
        double[,] a = Random(m, n, seed);
        var rng = new Random(seed + 100);
        var b = new double[m];
        for (int i = 0; i < m; i++) b[i] = (2 * rng.NextDouble()) - 1;

        Factored f = Factor(a);
        var qtb = (double[])b.Clone();
        PivotedQr.ApplyQTranspose(m, n, f.A, qtb);

        // Q is orthogonal: ‖Qᵀb‖ = ‖b‖.
        Assert.Equal(Vector<double>.Build.DenseOfArray(b).L2Norm(), Vector<double>.Build.DenseOfArray(qtb).L2Norm(), 1e-13);

        // Back-substitute R z = (Qᵀb)[0..n), x = P z; MathNet solves the same least-squares problem by its own QR.
        Vector<double> z = R(f).Solve(Vector<double>.Build.DenseOfArray(qtb[..n]));
        var x = new double[n];
        for (int j = 0; j < n; j++) x[f.Pivot[j]] = z[j];
        Vector<double> expected = Matrix<double>.Build.DenseOfArray(a).QR().Solve(Vector<double>.Build.DenseOfArray(b));
        for (int j = 0; j < n; j++) Assert.Equal(expected[j], x[j], 1e-12);

        // The residual norm is the norm of the trailing m − n entries of Qᵀb.
        double residual = (Matrix<double>.Build.DenseOfArray(a) * expected - Vector<double>.Build.DenseOfArray(b)).L2Norm();
        Assert.Equal(residual, Vector<double>.Build.DenseOfArray(qtb[n..]).L2Norm(), 1e-12);
    }

    [Fact]
    public void ApplyQTranspose_SkipsTheReflectorOfAZeroColumn()
    {
        double[,] a = Random(8, 2, 31);
        for (int i = 0; i < 8; i++) a[i, 1] = 0;
        Factored f = Factor(a);
        var b = new double[8];
        for (int i = 0; i < 8; i++) b[i] = i + 1;

        var qtb = (double[])b.Clone();
        PivotedQr.ApplyQTranspose(8, 2, f.A, qtb);

        // Only the first reflector acts: its first entry is ∓ the projection of b on the unit first column.
        Vector<double> c0 = Matrix<double>.Build.DenseOfArray(a).Column(0);
        double projection = c0.DotProduct(Vector<double>.Build.DenseOfArray(b)) / c0.L2Norm();
        Assert.Equal(Math.Abs(projection), Math.Abs(qtb[0]), 1e-12);
        Assert.Equal(Vector<double>.Build.DenseOfArray(b).L2Norm(), Vector<double>.Build.DenseOfArray(qtb).L2Norm(), 1e-12);
    }

    [Fact]
    public void MachineEpsilon_IsTheSpacingOfDoublesAtOne()
    {
        // IEEE 754 binary64: 2⁻⁵².
        Assert.Equal(PivotedQr.MachineEpsilon, Math.BitIncrement(1.0) - 1.0);
    }
}
