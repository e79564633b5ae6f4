using JunctionFit.Fitting;
using Xunit;

namespace JunctionFit.Tests.Fitting;

public sealed class LevenbergMarquardtSolverTests
{
    /// <summary>rᵢ = a e^{−k tᵢ} + c − yᵢ on tᵢ = 4i/(m−1).</summary>
    private sealed class ExponentialProblem : ILeastSquaresProblem
    {
        private readonly double[] _t;
        private readonly double[] _y;

        public ExponentialProblem(int m, double a, double k, double c, bool analytic = true, double noise = 0.0)
        {
            _t = new double[m];
            _y = new double[m];
            for (int i = 0; i < m; i++)
            {
                _t[i] = 4.0 * i / (m - 1);
                // Deterministic "noise": a fixed alternating pattern, so the answer is reproducible.
                _y[i] = (a * Math.Exp(-k * _t[i])) + c + (noise * ((i % 3) - 1));
            }

            HasAnalyticJacobian = analytic;
        }

        public int ResidualCount => _t.Length;
        public int ParameterCount => 3;
        public bool HasAnalyticJacobian { get; }

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
        {
            for (int i = 0; i < _t.Length; i++)
            {
                residuals[i] = (x[0] * Math.Exp(-x[1] * _t[i])) + x[2] - _y[i];
            }
        }

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
        {
            for (int i = 0; i < _t.Length; i++)
            {
                double e = Math.Exp(-x[1] * _t[i]);
                jacobian[(i * 3) + 0] = e;
                jacobian[(i * 3) + 1] = -x[0] * _t[i] * e;
                jacobian[(i * 3) + 2] = 1.0;
            }
        }
    }

    /// <summary>r = [ln x − ln 2, 0]: NaN for x ≤ 0, so a full Gauss–Newton step from far away lands where it cannot be evaluated.</summary>
    private sealed class LogProblem : ILeastSquaresProblem
    {
        public int NonFiniteEvaluations { get; private set; }
        public int ResidualCount => 2;
        public int ParameterCount => 1;
        public bool HasAnalyticJacobian => true;

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
        {
            residuals[0] = Math.Log(x[0]) - Math.Log(2.0);
            residuals[1] = 0.0;
            if (!double.IsFinite(residuals[0]))
            {
                NonFiniteEvaluations++;
            }
        }

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
        {
            jacobian[0] = 1.0 / x[0];
            jacobian[1] = 0.0;
        }
    }

    /// <summary>Finite only at the start point x = 1: every trial step is NaN.</summary>
    private sealed class IsolatedPointProblem : ILeastSquaresProblem
    {
        public int ResidualCount => 1;
        public int ParameterCount => 1;
        public bool HasAnalyticJacobian => true;

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals) => residuals[0] = x[0] == 1.0 ? 1.0 : double.NaN;

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian) => jacobian[0] = 1.0;
    }

    /// <summary>Rosenbrock as least squares, r = (10(x₂ − x₁²), 1 − x₁) (Moré, Garbow &amp; Hillstrom, ACM TOMS 7, 17, 1981, problem 1).</summary>
    private sealed class RosenbrockProblem : ILeastSquaresProblem
    {
        public int ResidualCount => 2;
        public int ParameterCount => 2;
        public bool HasAnalyticJacobian => true;

        public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
        {
            residuals[0] = 10.0 * (x[1] - (x[0] * x[0]));
            residuals[1] = 1.0 - x[0];
        }

        public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
        {
            jacobian[0] = -20.0 * x[0];
            jacobian[1] = 10.0;
            jacobian[2] = -1.0;
            jacobian[3] = 0.0;
        }
    }

    [Fact]
    public void Minimize_ExactExponentialData_RecoversParameters()
    {
        var problem = new ExponentialProblem(41, a: 2.5, k: 1.3, c: 0.4);

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(problem, [1.0, 0.5, 0.0]);

        Assert.True(s.Converged, s.Reason);
        // Known answer: the data were generated from a = 2.5, k = 1.3, c = 0.4 without noise.
        Assert.Equal(2.5, s.Parameters[0], 1e-9);
        Assert.Equal(1.3, s.Parameters[1], 1e-9);
        Assert.Equal(0.4, s.Parameters[2], 1e-9);
        Assert.True(s.ResidualSumOfSquares < 1e-20);
        Assert.Equal(41, s.Residuals.Length);
        Assert.Equal(41 * 3, s.JacobianRowMajor.Length);
    }

    [Fact]
    public void Minimize_RosenbrockFromStandardStart_ReachesMinimumAtOnes()
    {
        // Standard start (−1.2, 1) and minimum (1, 1): Moré, Garbow & Hillstrom, ACM TOMS 7, 17, 1981.
        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(new RosenbrockProblem(), [-1.2, 1.0]);

        Assert.True(s.Converged, s.Reason);
        Assert.Equal(1.0, s.Parameters[0], 1e-10);
        Assert.Equal(1.0, s.Parameters[1], 1e-10);
    }

    [Fact]
    public void Minimize_IterationLimitReached_ReportsIterationLimitWithoutThrowing()
    {
        var options = new LevenbergMarquardtOptions { MaxIterations = 2 };

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(new RosenbrockProblem(), [-1.2, 1.0], options);

        Assert.Equal(SolverTermination.IterationLimit, s.Termination);
        Assert.False(s.Converged);
        Assert.Equal(2, s.Iterations);
        Assert.Contains("iteration limit", s.Reason, StringComparison.Ordinal); // the tool's own wording of this stop
        Assert.All(s.Parameters, v => Assert.True(double.IsFinite(v)));
    }

    [Fact]
    public void Minimize_EvaluationLimitReached_ReportsEvaluationLimit()
    {
        var options = new LevenbergMarquardtOptions { MaxFunctionEvaluations = 3 };

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(new RosenbrockProblem(), [-1.2, 1.0], options);

        Assert.Equal(SolverTermination.EvaluationLimit, s.Termination);
        Assert.False(s.Converged);
        Assert.Equal(3, s.FunctionEvaluations);
    }

    [Fact]
    public void Minimize_TrialStepWithNonFiniteResiduals_ShrinksRegionAndConverges()
    {
        var problem = new LogProblem();

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(problem, [100.0]);

        Assert.True(problem.NonFiniteEvaluations > 0, "the test must actually hit a non-finite trial point");
        Assert.True(s.Converged, s.Reason);
        Assert.Equal(2.0, s.Parameters[0], 1e-10);
    }

    [Fact]
    public void Minimize_EveryTrialNonFinite_ReportsNonFinite()
    {
        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(new IsolatedPointProblem(), [1.0]);

        Assert.Equal(SolverTermination.NonFinite, s.Termination);
        Assert.False(s.Converged);
        Assert.Equal(1.0, s.Parameters[0]);
        Assert.Equal(1.0, s.ResidualSumOfSquares);
    }

    [Fact]
    public void Minimize_NonFiniteAtStart_ReportsNonFinite()
    {
        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(new LogProblem(), [-1.0]);

        Assert.Equal(SolverTermination.NonFinite, s.Termination);
        Assert.Equal(1, s.FunctionEvaluations);
        Assert.Contains("start", s.Reason, StringComparison.Ordinal);
    }

    [Fact]
    public void Minimize_FiniteDifferenceJacobian_MatchesAnalyticAnswer()
    {
        var analytic = new ExponentialProblem(201, a: 2.5, k: 1.3, c: 0.4, analytic: true, noise: 0.01);
        var numeric = new ExponentialProblem(201, a: 2.5, k: 1.3, c: 0.4, analytic: false, noise: 0.01);

        LeastSquaresSolution sa = LevenbergMarquardtSolver.Minimize(analytic, [1.0, 0.5, 0.0]);
        LeastSquaresSolution sn = LevenbergMarquardtSolver.Minimize(numeric, [1.0, 0.5, 0.0]);

        Assert.True(sa.Converged, sa.Reason);
        Assert.True(sn.Converged, sn.Reason);
        for (int j = 0; j < 3; j++)
        {
            Assert.Equal(sa.Parameters[j], sn.Parameters[j], 1e-7 * Math.Abs(sa.Parameters[j]));
        }

        Assert.Equal(sa.ResidualSumOfSquares, sn.ResidualSumOfSquares, 1e-12 * sa.ResidualSumOfSquares);
        // Forward differences cost n extra evaluations per Jacobian.
        Assert.True(sn.FunctionEvaluations >= sn.Iterations * 3);
    }

    [Theory]
    [InlineData("Misra1a", 2)]
    [InlineData("Thurber", 2)]
    [InlineData("MGH09", 2)]
    [InlineData("Rat43", 2)]
    public void Minimize_NistWithFiniteDifferences_MatchesCertifiedValues(string dataset, int start)
    {
        NistDataset data = NistDataset.Load(dataset);
        var problem = new NistProblem(data, NistModels.Get(dataset), analytic: false);

        LeastSquaresSolution s = LevenbergMarquardtSolver.Minimize(problem, start == 1 ? data.Start1 : data.Start2, NistStrdTests.NistOptions);

        Assert.True(s.Converged, s.Reason);
        for (int j = 0; j < data.ParameterCount; j++)
        {
            // NIST StRD certified values; forward differences lose about half the digits of J, not of x̂.
            Assert.True(NistStrdTests.LogRelativeError(s.Parameters[j], data.CertifiedValues[j]) >= 6.0, $"b{j + 1} = {s.Parameters[j]}");
        }
    }

    [Fact]
    public void Minimize_ConcurrentCallsOnDifferentProblems_GiveTheSequentialAnswers()
    {
        var problems = new ExponentialProblem[16];
        var sequential = new LeastSquaresSolution[problems.Length];
        for (int p = 0; p < problems.Length; p++)
        {
            problems[p] = new ExponentialProblem(101, a: 1.0 + p, k: 0.5 + (0.1 * p), c: 0.1 * p, noise: 0.001);
            sequential[p] = LevenbergMarquardtSolver.Minimize(problems[p], [1.0, 1.0, 0.0]);
        }

        var concurrent = new LeastSquaresSolution[problems.Length];
        Parallel.For(0, problems.Length * 8, new ParallelOptions { MaxDegreeOfParallelism = 4 }, q =>
        {
            int p = q % problems.Length;
            concurrent[p] = LevenbergMarquardtSolver.Minimize(problems[p], [1.0, 1.0, 0.0]);
        });

        for (int p = 0; p < problems.Length; p++)
        {
            Assert.Equal(sequential[p].Parameters.ToArray(), concurrent[p].Parameters.ToArray());
        }
    }

    [Fact]
    public void Minimize_StartOfWrongLength_ThrowsArgumentException()
        => Assert.Throws<ArgumentException>(() => LevenbergMarquardtSolver.Minimize(new RosenbrockProblem(), [1.0]));

    [Fact]
    public void Minimize_NonFiniteStart_ThrowsArgumentException()
        => Assert.Throws<ArgumentException>(() => LevenbergMarquardtSolver.Minimize(new RosenbrockProblem(), [double.NaN, 1.0]));

    }
