using JunctionFit.Fitting;
using MathNet.Numerics.LinearAlgebra;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The solver's exits and what it returns with them: that the reported Jacobian belongs to the reported point, that no
/// evaluation is spent after an exit, that a parameter without effect does not hide a minimum, that the limits are kept,
/// and that the finite-difference Jacobian is the forward difference of MINPACK-1's fdjac2 (ANL-80-74). Linear problems
/// are checked against MathNet's least-squares solution.
/// </summary>
public sealed class LevenbergMarquardtExitTests
{
    /// <summary>A problem from delegates, counting its Jacobian calls.</summary>
    private sealed class Problem(int m, int n, Action<double[], double[]> evaluate, Action<double[], double[]>? jacobian = null) : ILeastSquaresProblem
    {
        public int JacobianCalls { get; private set; }
        public int ResidualCount => m;
        public int ParameterCount => n;
        public bool HasAnalyticJacobian => jacobian is not null;

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
        {
            var r = new double[m];
            evaluate(x.ToArray(), r);
            r.CopyTo(residuals);
        }

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jac)
        {
            JacobianCalls++;
            var j = new double[m * n];
            jacobian!(x.ToArray(), j);
            j.CopyTo(jac);
        }
    }

    private static readonly double[,] A = { { 1, 0, 0 }, { 1, 1, 0 }, { 1, 2, 0 }, { 1, 3, 0 }, { 1, 5, 0 } };  // third column: no effect
    private static readonly double[] B = [0.9, 3.1, 4.8, 7.2, 10.9];

    private static Problem Linear(bool analytic)
    {
        void Eval(double[] x, double[] r)
        {
            for (int i = 0; i < 5; i++) r[i] = (A[i, 0] * x[0]) + (A[i, 1] * x[1]) + (A[i, 2] * x[2]) - B[i];
        }

        void Jac(double[] x, double[] j)
        {
            for (int i = 0; i < 5; i++)
                for (int k = 0; k < 3; k++) j[(i * 3) + k] = A[i, k];
        }

        return analytic ? new Problem(5, 3, Eval, Jac) : new Problem(5, 3, Eval);
    }

    private static double[] LeastSquaresOfTheFirstTwoColumns()
    {
        Matrix<double> a = Matrix<double>.Build.DenseOfArray(A).SubMatrix(0, 5, 0, 2);
        Vector<double> x = a.QR().Solve(Vector<double>.Build.DenseOfArray(B));
        return [x[0], x[1], 0.7];
    }

    [Fact]
    public void AtTheMinimum_AParameterWithoutEffect_StillEndsOnTheGradientTest()
    {
        // The zero Jacobian column has no angle with the residuals and is left out of the cosine test; the other two
        // are orthogonal to the residuals at MathNet's least-squares point.
        double[] start = LeastSquaresOfTheFirstTwoColumns();

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(Linear(analytic: true), start);

        Assert.Equal(SolverTermination.Gradient, s.Termination);
        Assert.Equal(1, s.Iterations);
        Assert.Equal(start, s.Parameters.ToArray());
    }

    [Fact]
    public void GradientExit_KeepsTheJacobianItHasWithoutAnotherEvaluation()
    {
        // Finite differences (3 evaluations) plus the start: 4, and none after the exit.
        var options = new LevenbergMarquardtOptions { GradientTolerance = 1e-6 };

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(Linear(analytic: false), LeastSquaresOfTheFirstTwoColumns(), options);

        Assert.Equal(SolverTermination.Gradient, s.Termination);
        Assert.Equal(4, s.FunctionEvaluations);
        for (int i = 0; i < 5; i++)
            for (int k = 0; k < 2; k++) Assert.Equal(A[i, k], s.JacobianRowMajor[(i * 3) + k], 1e-6);
    }

    [Fact]
    public void ExactFitAtTheStart_EndsOnZeroResidual()
    {
        // b = A·(2, 3, ·) in integers: the residuals are exactly zero at the start.
        double[] b = [2, 5, 8, 11, 17];
        var p = new Problem(5, 3,
            (x, r) => { for (int i = 0; i < 5; i++) r[i] = (A[i, 0] * x[0]) + (A[i, 1] * x[1]) - b[i]; },
            (x, j) => { for (int i = 0; i < 5; i++) { j[i * 3] = A[i, 0]; j[(i * 3) + 1] = A[i, 1]; j[(i * 3) + 2] = 0; } });

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [2.0, 3.0, 1.0]);

        Assert.Equal(SolverTermination.ZeroResidual, s.Termination);
        Assert.True(s.Converged);
        Assert.Equal(1, s.Iterations);
        Assert.Equal(0.0, s.ResidualSumOfSquares);
    }

    [Fact]
    public void NonFiniteStart_SpendsOneEvaluation_AndReportsANaNJacobian()
    {
        var p = new Problem(2, 1, (x, r) => { r[0] = Math.Sqrt(x[0]) - 1; r[1] = 0; });

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [-1.0]);

        Assert.Equal(SolverTermination.NonFinite, s.Termination);
        Assert.Equal(1, s.FunctionEvaluations);
        Assert.Equal(0, s.Iterations);
        Assert.All(s.JacobianRowMajor, v => Assert.True(double.IsNaN(v)));
    }

    [Fact]
    public void NonFiniteJacobian_StopsWithoutEvaluatingItAgain()
    {
        // Finite for x ≤ 1, NaN beyond: from x = 1 the forward difference steps out, so the Jacobian is NaN. One
        // evaluation at the start, one for the difference, none after.
        var p = new Problem(2, 1, (x, r) => { r[0] = x[0] <= 1.0 ? 1.5 - x[0] : double.NaN; r[1] = 0.1; });

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [1.0]);

        Assert.Equal(SolverTermination.NonFinite, s.Termination);
        Assert.Equal(2, s.FunctionEvaluations);
        Assert.Equal(1, s.Iterations);
        Assert.Equal(1.0, s.Parameters[0]);
    }

    [Fact]
    public void IterationLimit_ReportsTheJacobianAtTheReportedPoint()
    {
        // Rosenbrock as least squares, r = (10(x₂ − x₁²), 1 − x₁), J = [[−20x₁, 10], [−1, 0]] (Moré, Garbow &amp;
        // Hillstrom 1981, problem 1), stopped after two iterations, moved from the start.
        var p = new Problem(2, 2,
            (x, r) => { r[0] = 10 * (x[1] - (x[0] * x[0])); r[1] = 1 - x[0]; },
            (x, j) => { j[0] = -20 * x[0]; j[1] = 10; j[2] = -1; j[3] = 0; });

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [-1.2, 1.0], new LevenbergMarquardtOptions { MaxIterations = 2 });

        Assert.Equal(SolverTermination.IterationLimit, s.Termination);
        Assert.NotEqual(-1.2, s.Parameters[0]);
        Assert.Equal(-20 * s.Parameters[0], s.JacobianRowMajor[0], 1e-14);
        Assert.Equal([10.0, -1.0, 0.0], s.JacobianRowMajor.Skip(1).ToArray());
    }

    [Fact]
    public void EveryTrialNonFinite_KeepsTheEvaluationLimit()
    {
        // Finite only at x = 1 exactly: every trial step fails, the region shrinks tenfold each time, and the limit of
        // five evaluations is reached well before the region collapses.
        var p = new Problem(1, 1, (x, r) => r[0] = x[0] == 1.0 ? 1.0 : double.NaN, (x, j) => j[0] = 1.0);

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [1.0], new LevenbergMarquardtOptions { MaxFunctionEvaluations = 5 });

        Assert.Equal(SolverTermination.EvaluationLimit, s.Termination);
        Assert.Equal(5, s.FunctionEvaluations);
        Assert.Equal(1.0, s.Parameters[0]);
    }

    [Fact]
    public void ZeroTolerances_EndOnNoFurtherProgress_AtTheLeastSquaresPoint()
    {
        // With every tolerance at zero only the machine-precision tests can stop the run; it must still converge, to
        // the same point as the default tolerances (a nonlinear exponential decay with a deterministic misfit).
        double[] t = Enumerable.Range(0, 21).Select(i => 0.2 * i).ToArray();
        double[] y = t.Select((v, i) => (3 * Math.Exp(-0.7 * v)) + 0.5 + (0.01 * ((i % 3) - 1))).ToArray();
        Problem Exp() => new(21, 3,
            (x, r) => { for (int i = 0; i < 21; i++) r[i] = (x[0] * Math.Exp(-x[1] * t[i])) + x[2] - y[i]; },
            (x, j) => { for (int i = 0; i < 21; i++) { double e = Math.Exp(-x[1] * t[i]); j[i * 3] = e; j[(i * 3) + 1] = -x[0] * t[i] * e; j[(i * 3) + 2] = 1; } });
        var zero = new LevenbergMarquardtOptions { RelativeReductionTolerance = 0, StepTolerance = 0, GradientTolerance = 0 };

        LeastSquaresSolution reference = LevenbergMarquardtSolver.Minimize(Exp(), [1.0, 1.0, 0.0]);
        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(Exp(), [1.0, 1.0, 0.0], zero);

        Assert.True(reference.Converged, reference.Reason);
        Assert.Equal(SolverTermination.NoFurtherProgress, s.Termination);
        Assert.True(s.Converged);
        for (int k = 0; k < 3; k++) Assert.Equal(reference.Parameters[k], s.Parameters[k], 1e-9);
        Assert.InRange(s.ResidualSumOfSquares, 0, reference.ResidualSumOfSquares * (1 + 1e-12));
    }

    [Fact]
    public void FiniteDifferenceJacobian_IsTheForwardDifferenceOfFdjac2()
    {
        // r = e^{kx} − (0.75, 1.25)·e^{100}, k = 100: minimum at kx = 100, x = 1. The reported Jacobian is (r(x + h) − r(x))/h
        // with h = √ε|x| rounded to x + h − x: k e^{kx}·(e^{kh} − 1)/(kh) in closed form, which differs from the backward
        // difference by about kh = 100√ε ≈ 1.5e-6 relative, far above the rounding (about √ε/400 ≈ 4e-11 here).
        const double k = 100;
        double e100 = Math.Exp(100);
        var p = new Problem(2, 1, (x, r) => { r[0] = Math.Exp(k * x[0]) - (0.75 * e100); r[1] = Math.Exp(k * x[0]) - (1.25 * e100); });

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(p, [0.99]);

        Assert.True(s.Converged, s.Reason);
        double x = s.Parameters[0];
        Assert.Equal(1.0, x, 1e-9);
        double h = (x + (Math.Sqrt(PivotedQr.MachineEpsilon) * x)) - x;
        double forward = k * Math.Exp(k * x) * (Math.Exp(k * h) - 1) / (k * h);
        double backward = k * Math.Exp(k * x) * (1 - Math.Exp(-k * h)) / (k * h);
        Assert.True(Math.Abs(forward - backward) > 1e-6 * forward, "the test must tell the two apart");
        Assert.InRange(s.JacobianRowMajor[0] / forward, 1 - 1e-8, 1 + 1e-8);
        Assert.Equal(s.JacobianRowMajor[0], s.JacobianRowMajor[1]);
    }

    [Fact]
    public void Minimize_ProblemOfInconsistentSize_ThrowsArgumentException()
    {
        // No parameter, or fewer residuals than parameters: programmer errors, refused before any evaluation.
        var none = new Problem(3, 0, (_, _) => throw new InvalidOperationException("must not be evaluated"));
        var under = new Problem(1, 2, (_, _) => throw new InvalidOperationException("must not be evaluated"));
        Assert.Throws<ArgumentException>(() => LevenbergMarquardtSolver.Minimize(none, []));
        Assert.Throws<ArgumentException>(() => LevenbergMarquardtSolver.Minimize(under, [1.0, 2.0]));
    }
}
