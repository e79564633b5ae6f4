using JunctionFit.Fitting;
using MathNet.Numerics.LinearAlgebra;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The trust-region subproblem against MathNet.Numerics. For the λ it returns, the step must solve the damped normal
/// equations (JᵀJ + λDᵀD) p = Jᵀb (Marquardt 1963; Moré 1978, eq. 3.3), here solved by MathNet's QR of the stacked system
/// [J; √λ D] p ≈ [b; 0]; and it must meet Moré's acceptance rule: λ = 0 when the Gauss–Newton step lies within
/// (1 + 0.1)Δ, otherwise |‖D p‖ − Δ| ≤ 0.1 Δ (Moré 1978, §5; MINPACK-1 lmpar, ANL-80-74).
/// </summary>
public sealed class LevenbergMarquardtStepTests
{
    private sealed record Subproblem(int M, int N, Matrix<double> J, Vector<double> B, double[] D, double[] A, int[] Pivot, double[] Qtb);

    /// <summary>Factors J as the solver does (pivoted QR, R's diagonal written back into the matrix) and forms Qᵀb.</summary>
    private static Subproblem Build(Matrix<double> j, Vector<double> b, double[] d)
    {
        int m = j.RowCount, n = j.ColumnCount;
        double[] a = j.ToColumnMajorArray();
        var pivot = new int[n];
        var rdiag = new double[n];
        PivotedQr.Factor(m, n, a, pivot, rdiag, new double[n], new double[n]);
        double[] qtb = b.ToArray();
        PivotedQr.ApplyQTranspose(m, n, a, qtb);
        for (int k = 0; k < n; k++) a[(k * m) + k] = rdiag[k];
        return new Subproblem(m, n, j, b, d, a, pivot, qtb[..n]);
    }

    private static Matrix<double> RandomMatrix(int m, int n, int seed)
    {
        var rng = new Random(seed);
        return Matrix<double>.Build.Dense(m, n, (_, _) => (2 * rng.NextDouble()) - 1);
    }

    private static Vector<double> RandomVector(int m, int seed)
    {
        var rng = new Random(seed);
        return Vector<double>.Build.Dense(m, _ => (2 * rng.NextDouble()) - 1);
    }

    private static (double Lambda, double[] Step) Solve(Subproblem s, double delta, double lambdaIn = 0.0)
    {
        int n = s.N;
        var x = new double[n];
        double lambda = lambdaIn;
        LevenbergMarquardtStep.Solve(n, (double[])s.A.Clone(), s.M, s.Pivot, s.D, s.Qtb, delta, ref lambda, x, new double[n], new double[n], new double[n]);
        return (lambda, x);
    }

    /// <summary>MathNet's minimiser of ‖J p − b‖² + λ‖D p‖², by QR of the stacked system.</summary>
    private static Vector<double> Damped(Subproblem s, double lambda)
    {
        Matrix<double> stacked = s.J.Stack(Matrix<double>.Build.DiagonalOfDiagonalArray(s.D.Select(v => Math.Sqrt(lambda) * v).ToArray()));
        Vector<double> rhs = Vector<double>.Build.DenseOfEnumerable(s.B.Concat(new double[s.N]));
        return stacked.QR().Solve(rhs);
    }

    private static double ScaledNorm(Subproblem s, IReadOnlyList<double> p)
    {
        double sum = 0;
        for (int k = 0; k < s.N; k++) sum += (s.D[k] * p[k]) * (s.D[k] * p[k]);
        return Math.Sqrt(sum);
    }

    private static void AssertClose(Vector<double> expected, IReadOnlyList<double> actual, double relative)
    {
        double scale = expected.L2Norm();
        for (int k = 0; k < expected.Count; k++)
            Assert.True(Math.Abs(expected[k] - actual[k]) <= relative * scale, $"p[{k}]: MathNet {expected[k]:R}, ours {actual[k]:R}");
    }

    private static double[] ColumnNorms(Matrix<double> j) => Enumerable.Range(0, j.ColumnCount).Select(k => j.Column(k).L2Norm()).ToArray();

    [Theory]
    [InlineData(20, 3, 1)]
    [InlineData(50, 5, 2)]
    [InlineData(6, 6, 3)]
    public void Solve_GaussNewtonStepInsideTheRegion_TakesItWithLambdaZero(int m, int n, int seed)
    {
        Matrix<double> j = RandomMatrix(m, n, seed);
        Subproblem s = Build(j, RandomVector(m, seed + 50), ColumnNorms(j));
        Vector<double> gaussNewton = j.QR().Solve(s.B);
        double norm = ScaledNorm(s, gaussNewton.ToArray());

        // Just inside the 10 % allowance: Δ = ‖D p_GN‖ / 1.09.
        (double lambda, double[] step) = Solve(s, norm / 1.09, lambdaIn: 0.7);

        Assert.Equal(0.0, lambda);
        AssertClose(gaussNewton, step, 1e-12);
    }

    [Theory]
    [InlineData(20, 3, 1, 0.5)]
    [InlineData(50, 5, 2, 0.2)]
    [InlineData(50, 5, 2, 0.01)]
    [InlineData(6, 6, 3, 0.3)]
    [InlineData(30, 4, 4, 1e-4)]
    public void Solve_GaussNewtonStepOutside_ReturnsTheDampedStepOnTheBoundary(int m, int n, int seed, double fraction)
    {
        Matrix<double> j = RandomMatrix(m, n, seed);
        // Unequal scaling D, as the solver's running column norms give.
        double[] d = ColumnNorms(j).Select((v, k) => v * (1 + k)).ToArray();
        Subproblem s = Build(j, RandomVector(m, seed + 50), d);
        double delta = fraction * ScaledNorm(s, j.QR().Solve(s.B).ToArray());

        foreach (double start in new[] { 0.0, 1e-6, 1e6 })
        {
            (double lambda, double[] step) = Solve(s, delta, start);

            Assert.True(lambda > 0, $"λ = {lambda}");
            AssertClose(Damped(s, lambda), step, 1e-10);
            double dp = ScaledNorm(s, step);
            Assert.True(Math.Abs(dp - delta) <= 0.1 * delta, $"start λ {start}: ‖D p‖ = {dp:E6}, Δ = {delta:E6}");
        }
    }

    [Fact]
    public void Solve_LambdaLiesBetweenTheBracketsOfMore()
    {
        // The root λ* of ‖D p(λ)‖ = Δ, found here by bisection on MathNet's damped solutions; the returned λ must give
        // a step within 10 % of Δ, so it lies within the bracket [λ(1.1Δ), λ(0.9Δ)] of that monotone function.
        Matrix<double> j = RandomMatrix(40, 4, 8);
        Subproblem s = Build(j, RandomVector(40, 9), ColumnNorms(j));
        double delta = 0.05 * ScaledNorm(s, j.QR().Solve(s.B).ToArray());

        double LambdaFor(double target)
        {
            double lo = 0, hi = 1e12;
            for (int k = 0; k < 200; k++)
            {
                double mid = lo + ((hi - lo) / 2);
                if (ScaledNorm(s, Damped(s, mid).ToArray()) > target) lo = mid; else hi = mid;
            }

            return lo;
        }

        (double lambda, _) = Solve(s, delta);

        Assert.InRange(lambda, LambdaFor(1.1 * delta), LambdaFor(0.9 * delta));
    }

    [Fact]
    public void Solve_RankDeficientJacobian_GivesTheDampedStepOfTheSingularSystem()
    {
        // Column 2 = column 0 + column 1: R has a zero at the end, the Gauss–Newton step is the basic solution over the
        // nonsingular block, and the lower bound of λ is 0. With a small Δ the damped system is nonsingular again and its
        // solution is unique: MathNet's stacked QR must agree.
        Matrix<double> j = RandomMatrix(25, 3, 12);
        j.SetColumn(2, j.Column(0) + j.Column(1));
        Subproblem s = Build(j, RandomVector(25, 13), [1.0, 1.0, 1.0]);
        Assert.True(Math.Abs(s.A[(2 * s.M) + 2]) < 1e-14 * Math.Abs(s.A[0]), "R should be singular");
        s.A[(2 * s.M) + 2] = 0.0;   // as exact as the solver's rank test needs

        foreach (double fraction in new[] { 0.3, 0.02 })
        {
            // The basic Gauss–Newton step (zero in the dependent pivot direction) sets the scale of Δ.
            (double gnLambda, double[] basic) = Solve(s, 1e300);
            Assert.Equal(0.0, gnLambda);
            Assert.Equal(0.0, basic[s.Pivot[2]]);
            double delta = fraction * ScaledNorm(s, basic);

            (double lambda, double[] step) = Solve(s, delta);

            Assert.True(lambda > 0);
            AssertClose(Damped(s, lambda), step, 1e-9);
            Assert.True(Math.Abs(ScaledNorm(s, step) - delta) <= 0.1 * delta, $"‖D p‖ = {ScaledNorm(s, step):E6}, Δ = {delta:E6}");
        }

        // The basic step has the least residual: that of MathNet's least-squares fit on the two independent columns.
        (_, double[] p0) = Solve(s, 1e300);
        Matrix<double> independent = j.SubMatrix(0, 25, 0, 2);
        double least = (independent * independent.QR().Solve(s.B) - s.B).L2Norm();
        Assert.Equal(least, (j * Vector<double>.Build.DenseOfArray(p0) - s.B).L2Norm(), 1e-12);
    }

    [Theory]
    [InlineData(1)]
    [InlineData(2)]
    [InlineData(3)]
    public void SolveAugmented_MatchesTheStackedLeastSquaresAndItsCholeskyFactor(int seed)
    {
        // min ‖J x − b‖² + ‖S x‖² = ‖R Pᵀx − Qᵀb‖² + ‖S x‖² + const: the same x as MathNet's QR of [J; S]; and the
        // triangular T it builds has TᵀT = RᵀR + PᵀS²P, so |diag T| is the diagonal of the Cholesky factor of that matrix.
        int m = 12, n = 4;
        Matrix<double> j = RandomMatrix(m, n, seed);
        var rng = new Random(seed + 7);
        double[] sDiag = Enumerable.Range(0, n).Select(_ => 0.1 + rng.NextDouble()).ToArray();
        sDiag[1] = 0.0;   // a zero entry of S is skipped
        Subproblem p = Build(j, RandomVector(m, seed + 3), sDiag);

        var x = new double[n];
        var sdiag = new double[n];
        double[] a = (double[])p.A.Clone();
        LevenbergMarquardtStep.SolveAugmented(n, a, m, p.Pivot, sDiag, p.Qtb, x, sdiag, new double[n]);

        Matrix<double> stacked = j.Stack(Matrix<double>.Build.DiagonalOfDiagonalArray(sDiag));
        Vector<double> expected = stacked.QR().Solve(Vector<double>.Build.DenseOfEnumerable(p.B.Concat(new double[n])));
        AssertClose(expected, x, 1e-12);

        var r = Matrix<double>.Build.Dense(n, n);
        for (int i = 0; i < n; i++)
            for (int k = i; k < n; k++) r[i, k] = p.A[(k * m) + i];
        var ps = Matrix<double>.Build.Dense(n, n);
        for (int k = 0; k < n; k++) ps[k, k] = sDiag[p.Pivot[k]] * sDiag[p.Pivot[k]];
        Matrix<double> l = (r.TransposeThisAndMultiply(r) + ps).Cholesky().Factor;
        for (int k = 0; k < n; k++) Assert.Equal(l[k, k], Math.Abs(sdiag[k]), 1e-12 * l[0, 0]);

        // R's upper triangle, diagonal included, is kept for the next call.
        for (int i = 0; i < n; i++)
            for (int k = i; k < n; k++) Assert.Equal(p.A[(k * m) + i], a[(k * m) + i]);
    }

    [Fact]
    public void SolveAugmented_SingularAugmentedFactor_SolvesTheLeadingBlock()
    {
        // R with a zero last diagonal and S = 0: T = R, singular; the back substitution stops at the zero and the
        // dependent direction gets 0 (the basic solution), the rest solves the leading 2×2 block exactly.
        const int n = 3;
        double[] a =
        [
            2.0, 0.0, 0.0,    // column 0: r00
            1.0, 3.0, 0.0,    // column 1: r01, r11
            0.5, 0.25, 0.0,   // column 2: r02, r12, r22 = 0
        ];
        int[] pivot = [0, 1, 2];
        double[] c = [4.0, 6.0, 1.0];
        var x = new double[n];
        var sdiag = new double[n];

        LevenbergMarquardtStep.SolveAugmented(n, a, n, pivot, new double[n], c, x, sdiag, new double[n]);

        // 3 x1 = 6 → x1 = 2; 2 x0 + 1·x1 = 4 → x0 = 1 (hand calculation).
        Assert.Equal(1.0, x[0], 1e-15);
        Assert.Equal(2.0, x[1], 1e-15);
        Assert.Equal(0.0, x[2]);
        Assert.Equal(0.0, sdiag[2]);
    }
}
