using System.Collections.Immutable;
using System.Globalization;

namespace JunctionFit.Fitting;

/// <summary>
/// Levenberg–Marquardt minimisation of a sum of squares with scaled trust-region steps, after
/// Moré (1978) and MINPACK-1 (lmder / lmdif).
/// </summary>
/// <remarks>
/// <para>
/// Objective. S(x) = ‖f(x)‖² = Σᵢ fᵢ(x)², f: ℝⁿ → ℝᵐ, m ≥ n, with Jacobian J = ∂f/∂x (analytic when
/// the problem supplies it, otherwise forward differences with step hⱼ = √ε·|xⱼ|, or √ε when xⱼ = 0).
/// </para>
/// <para>
/// Step. At x with J P = Q R (Householder QR with column pivoting), the step p solves the
/// trust-region subproblem min ‖f + J p‖ subject to ‖D p‖ ≤ Δ, whose solution is
/// p(λ) = −(JᵀJ + λ DᵀD)⁻¹ Jᵀ f with λ = 0 if the Gauss–Newton step fits inside, otherwise the λ that
/// makes ‖D p(λ)‖ ≈ Δ (see <see cref="LevenbergMarquardtStep"/>). D = diag(dⱼ) with dⱼ the largest
/// Euclidean norm of Jacobian column j seen so far, which makes the method invariant to the
/// scaling of the variables.
/// </para>
/// <para>
/// Acceptance and radius update. With actual and predicted relative reductions
/// <code>
///     ρ_act = 1 − (‖f(x+p)‖/‖f‖)²,
///     ρ_pred = (‖J p‖/‖f‖)² + 2 λ (‖D p‖/‖f‖)²,         ratio = ρ_act / ρ_pred,
/// </code>
/// the step is taken when ratio ≥ 10⁻⁴. The radius shrinks (Δ ← μ·min(Δ, 10‖D p‖), λ ← λ/μ,
/// μ ∈ [0.1, 0.5] from a quadratic interpolation of S along p) when ratio ≤ 1/4, and grows to
/// Δ = 2‖D p‖ (λ ← λ/2) when ratio ≥ 3/4 or λ = 0. A trial point with non-finite residuals counts as a
/// failed step with μ = 0.1, so the region shrinks and the solver never throws on it.
/// </para>
/// <para>
/// Stopping (tolerances from <see cref="LevenbergMarquardtOptions"/>): relative reduction
/// |ρ_act| ≤ ftol and ρ_pred ≤ ftol and ratio ≤ 2; relative step Δ ≤ xtol·‖D x‖; gradient
/// maxⱼ |jⱼᵀ f| / (‖jⱼ‖ ‖f‖) ≤ gtol; zero residual; the iteration and evaluation limits; or the
/// tolerances falling to machine precision (no further progress possible).
/// </para>
/// <para>
/// The method keeps no state between calls and can be used concurrently on different problems.
/// </para>
/// <para>
/// References: [1] J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory",
/// in G. A. Watson (ed.), Numerical Analysis (Dundee 1977), Springer LNM 630, pp. 105–116, 1978.
/// [2] J. J. Moré, B. S. Garbow, K. E. Hillstrom, User guide for MINPACK-1, Argonne National
/// Laboratory report ANL-80-74, 1980.
/// </para>
/// </remarks>
public static class LevenbergMarquardtSolver
{
    private const double Eps = PivotedQr.MachineEpsilon;

    /// <summary>Minimises Σ r(x)² from <paramref name="start"/>.</summary>
    /// <param name="problem">The residual function and (optionally) its Jacobian.</param>
    /// <param name="start">Starting point, length <see cref="ILeastSquaresProblem.ParameterCount"/>, finite.</param>
    /// <param name="options">Tolerances and limits; <see cref="LevenbergMarquardtOptions.Default"/> when null.</param>
    /// <returns>
    /// The end point with its residuals and Jacobian and the exit condition. Non-convergence is a
    /// <see cref="SolverTermination"/> value, never an exception.
    /// </returns>
    /// <exception cref="ArgumentNullException"><paramref name="problem"/> is null.</exception>
    /// <exception cref="ArgumentException">
    /// The sizes are inconsistent (n &lt; 1, m &lt; n, or <paramref name="start"/> of the wrong length), or
    /// <paramref name="start"/> holds NaN or an infinity.
    /// </exception>
    public static LeastSquaresSolution Minimize(ILeastSquaresProblem problem, ReadOnlySpan<double> start, LevenbergMarquardtOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(problem);
        options ??= LevenbergMarquardtOptions.Default;
        int m = problem.ResidualCount;
        int n = problem.ParameterCount;
        if (n < 1)
        {
            throw new ArgumentException($"The problem has {n} parameters; at least 1 is needed.", nameof(problem));
        }

        if (m < n)
        {
            throw new ArgumentException($"The problem has {m} residuals for {n} parameters; at least as many residuals as parameters are needed.", nameof(problem));
        }

        if (start.Length != n)
        {
            throw new ArgumentException($"The start has {start.Length} values; the problem has {n} parameters.", nameof(start));
        }

        if (!DenseKernels.AllFinite(start))
        {
            throw new ArgumentException("The start holds NaN or an infinity.", nameof(start));
        }

        return new Run(problem, m, n, options).Execute(start);
    }

    /// <summary>One minimisation: the work arrays and counters of a single call.</summary>
    private ref struct Run
    {
        private readonly ILeastSquaresProblem _problem;
        private readonly LevenbergMarquardtOptions _options;
        private readonly int _m;
        private readonly int _n;
        private readonly int _maxEvaluations;

        // Work storage: one block for the n-vectors, one for the m-vectors, two m×n matrices.
        private readonly Span<double> _x;
        private readonly Span<double> _xTrial;
        private readonly Span<double> _diag;
        private readonly Span<double> _qtf;
        private readonly Span<double> _rdiag;
        private readonly Span<double> _columnNorms;
        private readonly Span<double> _wa1;
        private readonly Span<double> _wa2;
        private readonly Span<double> _wa3;
        private readonly Span<double> _f;
        private readonly Span<double> _fTrial;
        private readonly Span<double> _fWork;
        private readonly Span<double> _jacobian;  // row-major, as the problem writes it
        private readonly Span<double> _a;         // column-major working copy for the QR
        private readonly Span<int> _pivot;

        private int _evaluations;

        public Run(ILeastSquaresProblem problem, int m, int n, LevenbergMarquardtOptions options)
        {
            _problem = problem;
            _options = options;
            _m = m;
            _n = n;
            long defaultLimit = 100L * (n + 1) * options.MaxIterations;
            _maxEvaluations = options.MaxFunctionEvaluations ?? (int)Math.Min(int.MaxValue, defaultLimit);

            var vectors = new double[9 * n];
            var residuals = new double[3 * m];
            var matrices = new double[2 * m * n];
            _pivot = new int[n];
            Span<double> v = vectors;
            _x = v.Slice(0, n);
            _xTrial = v.Slice(n, n);
            _diag = v.Slice(2 * n, n);
            _qtf = v.Slice(3 * n, n);
            _rdiag = v.Slice(4 * n, n);
            _columnNorms = v.Slice(5 * n, n);
            _wa1 = v.Slice(6 * n, n);
            _wa2 = v.Slice(7 * n, n);
            _wa3 = v.Slice(8 * n, n);
            Span<double> r = residuals;
            _f = r.Slice(0, m);
            _fTrial = r.Slice(m, m);
            _fWork = r.Slice(2 * m, m);
            Span<double> mat = matrices;
            _jacobian = mat.Slice(0, m * n);
            _a = mat.Slice(m * n, m * n);
            _evaluations = 0;
        }

        public LeastSquaresSolution Execute(ReadOnlySpan<double> start)
        {
            int m = _m;
            int n = _n;
            start.CopyTo(_x);

            _problem.Evaluate(_x, _f);
            _evaluations++;
            double fnorm = DenseKernels.Norm(_f);
            if (!double.IsFinite(fnorm))
            {
                _jacobian.Fill(double.NaN);
                return Finish(fnorm, 0, SolverTermination.NonFinite,
                    "The residuals at the start are NaN or infinite; choose a start where the model can be evaluated.", jacobianCurrent: true);
            }

            double lambda = 0.0;
            double delta = 0.0;
            double xnorm = 0.0;
            int iterations = 0;
            double ftol = _options.RelativeReductionTolerance;
            double xtol = _options.StepTolerance;
            double gtol = _options.GradientTolerance;

            while (true)
            {
                if (iterations >= _options.MaxIterations)
                {
                    return Finish(fnorm, iterations, SolverTermination.IterationLimit,
                        Format("Gave up at the iteration limit ({0} iterations): the misfit was still falling or the steps were still moving the parameters.", _options.MaxIterations), jacobianCurrent: false);
                }

                // Jacobian at x, copied column-major for the QR.
                EvaluateJacobian();
                iterations++;
                if (!DenseKernels.AllFinite(_jacobian))
                {
                    return Finish(fnorm, iterations, SolverTermination.NonFinite,
                        "The Jacobian holds NaN or infinite entries at the current point; the model cannot be linearised there.", jacobianCurrent: true);
                }

                for (int i = 0; i < m; i++)
                {
                    int row = i * n;
                    for (int j = 0; j < n; j++)
                    {
                        _a[(j * m) + i] = _jacobian[row + j];
                    }
                }

                PivotedQr.Factor(m, n, _a, _pivot, _rdiag, _columnNorms, _wa1);

                // Scaling D and the initial radius Δ₀ = factor·‖D x₀‖ (or factor when x₀ = 0).
                if (iterations == 1)
                {
                    for (int j = 0; j < n; j++)
                    {
                        _diag[j] = _columnNorms[j] == 0.0 ? 1.0 : _columnNorms[j];
                        _wa3[j] = _diag[j] * _x[j];
                    }

                    xnorm = DenseKernels.Norm(_wa3);
                    delta = _options.InitialStepFactor * xnorm;
                    if (delta == 0.0)
                    {
                        delta = _options.InitialStepFactor;
                    }
                }

                // Qᵀ f (first n entries kept), then put R's diagonal in place.
                _f.CopyTo(_fWork);
                PivotedQr.ApplyQTranspose(m, n, _a, _fWork);
                for (int j = 0; j < n; j++)
                {
                    _a[(j * m) + j] = _rdiag[j];
                    _qtf[j] = _fWork[j];
                }

                // Scaled gradient test: max over columns of |cos(angle(f, J e_j))|.
                double gnorm = 0.0;
                if (fnorm != 0.0)
                {
                    for (int j = 0; j < n; j++)
                    {
                        int l = _pivot[j];
                        if (_columnNorms[l] == 0.0)
                        {
                            continue;
                        }

                        double sum = 0.0;
                        int cj = j * m;
                        for (int i = 0; i <= j; i++)
                        {
                            sum += _a[cj + i] * (_qtf[i] / fnorm);
                        }

                        gnorm = Math.Max(gnorm, Math.Abs(sum / _columnNorms[l]));
                    }
                }
                else
                {
                    return Finish(fnorm, iterations, SolverTermination.ZeroResidual, "The residuals are exactly zero.", jacobianCurrent: true);
                }

                if (gnorm <= gtol)
                {
                    return Finish(fnorm, iterations, SolverTermination.Gradient,
                        Format("Flat ground: no parameter direction changes the misfit any more (cosine between misfit and slopes at most {0:G3}).", gtol), jacobianCurrent: true);
                }

                for (int j = 0; j < n; j++)
                {
                    _diag[j] = Math.Max(_diag[j], _columnNorms[j]);
                }

                // Inner loop: shrink the region until a step reduces S enough.
                double ratio = 0.0;
                while (ratio < 1e-4)
                {
                    LevenbergMarquardtStep.Solve(n, _a, m, _pivot, _diag, _qtf, delta, ref lambda, _wa1, _rdiag, _wa2, _wa3);

                    // p = −(solution); trial point and scaled step length ‖D p‖.
                    for (int j = 0; j < n; j++)
                    {
                        _wa1[j] = -_wa1[j];
                        _xTrial[j] = _x[j] + _wa1[j];
                        _wa3[j] = _diag[j] * _wa1[j];
                    }

                    double pnorm = DenseKernels.Norm(_wa3);
                    if (iterations == 1)
                    {
                        delta = Math.Min(delta, pnorm);
                    }

                    _problem.Evaluate(_xTrial, _fTrial);
                    _evaluations++;
                    double fnorm1 = DenseKernels.Norm(_fTrial);
                    bool finite = double.IsFinite(fnorm1);

                    // Actual reduction (−1 when S grew tenfold or the trial is not finite).
                    double actual = finite && 0.1 * fnorm1 < fnorm ? 1.0 - ((fnorm1 / fnorm) * (fnorm1 / fnorm)) : -1.0;

                    // Predicted reduction from the linear model: ‖R Pᵀ p‖ = ‖J p‖.
                    for (int j = 0; j < n; j++)
                    {
                        _wa3[j] = 0.0;
                        double pj = _wa1[_pivot[j]];
                        int cj = j * m;
                        for (int i = 0; i <= j; i++)
                        {
                            _wa3[i] += _a[cj + i] * pj;
                        }
                    }

                    double t1 = DenseKernels.Norm(_wa3) / fnorm;
                    double t2 = Math.Sqrt(lambda) * pnorm / fnorm;
                    double predicted = (t1 * t1) + (2.0 * t2 * t2);
                    double directional = -((t1 * t1) + (t2 * t2));
                    ratio = predicted != 0.0 ? actual / predicted : 0.0;

                    // Radius update.
                    if (ratio <= 0.25)
                    {
                        double mu;
                        if (!finite)
                        {
                            mu = 0.1;
                        }
                        else
                        {
                            mu = actual >= 0.0 ? 0.5 : 0.5 * directional / (directional + (0.5 * actual));
                            if (0.1 * fnorm1 >= fnorm || mu < 0.1)
                            {
                                mu = 0.1;
                            }
                        }

                        delta = mu * Math.Min(delta, pnorm / 0.1);
                        lambda /= mu;
                    }
                    else if (lambda == 0.0 || ratio >= 0.75)
                    {
                        delta = pnorm / 0.5;
                        lambda *= 0.5;
                    }

                    // Accept a successful step.
                    if (ratio >= 1e-4)
                    {
                        _xTrial.CopyTo(_x);
                        _fTrial.CopyTo(_f);
                        for (int j = 0; j < n; j++)
                        {
                            _wa2[j] = _diag[j] * _x[j];
                        }

                        xnorm = DenseKernels.Norm(_wa2);
                        fnorm = fnorm1;
                    }

                    bool current = ratio < 1e-4;
                    if (fnorm == 0.0)
                    {
                        return Finish(fnorm, iterations, SolverTermination.ZeroResidual, "The residuals are exactly zero.", current);
                    }

                    // A non-finite trial says nothing about convergence: only shrink, and give up
                    // when the region has collapsed to rounding size around x.
                    if (!finite)
                    {
                        if (_evaluations >= _maxEvaluations)
                        {
                            return Finish(fnorm, iterations, SolverTermination.EvaluationLimit,
                                Format("Stopped after the limit of {0} residual evaluations; the last trial steps gave NaN or infinite residuals.", _maxEvaluations), current);
                        }

                        if (delta <= Eps * Math.Max(xnorm, 1.0))
                        {
                            return Finish(fnorm, iterations, SolverTermination.NonFinite,
                                "Every trial step gave NaN or infinite residuals, down to a step of machine-precision size; the model cannot be evaluated near the current point.", current);
                        }

                        continue;
                    }

                    // Convergence tests.
                    bool reduction = Math.Abs(actual) <= ftol && predicted <= ftol && 0.5 * ratio <= 1.0;
                    bool step = delta <= xtol * xnorm;
                    if (reduction && step)
                    {
                        return Finish(fnorm, iterations, SolverTermination.ReductionAndStep,
                            Format("Settled: the last step lowered the misfit by at most {0:G3} of itself and moved the parameters by at most {1:G3} of their size.", ftol, xtol), current);
                    }

                    if (reduction)
                    {
                        return Finish(fnorm, iterations, SolverTermination.RelativeReduction,
                            Format("Settled on the misfit: neither the last step nor the model of the next one lowers it by more than {0:G3} of itself.", ftol), current);
                    }

                    if (step)
                    {
                        return Finish(fnorm, iterations, SolverTermination.StepSize,
                            Format("Settled on the parameters: the last step moved them by at most {0:G3} of their size.", xtol), current);
                    }

                    // Limits and tests that mean the tolerances are below machine precision.
                    if (_evaluations >= _maxEvaluations)
                    {
                        return Finish(fnorm, iterations, SolverTermination.EvaluationLimit,
                            Format("Gave up after {0} evaluations of the model without settling.", _maxEvaluations), current);
                    }

                    if (Math.Abs(actual) <= Eps && predicted <= Eps && 0.5 * ratio <= 1.0)
                    {
                        return Finish(fnorm, iterations, SolverTermination.NoFurtherProgress,
                            "The misfit is as low as double precision can tell apart; asking for a smaller change of it cannot be met.", current);
                    }

                    if (delta <= Eps * xnorm)
                    {
                        return Finish(fnorm, iterations, SolverTermination.NoFurtherProgress,
                            "The steps are below what double precision can resolve in the parameters; asking for smaller steps cannot be met.", current);
                    }

                    if (gnorm <= Eps)
                    {
                        return Finish(fnorm, iterations, SolverTermination.NoFurtherProgress,
                            "No parameter direction changes the misfit at double precision; asking for a flatter slope cannot be met.", current);
                    }
                }
            }
        }

        /// <summary>
        /// Fills the row-major Jacobian at x: analytic, or forward differences
        /// ∂fᵢ/∂xⱼ ≈ (fᵢ(x + hⱼ eⱼ) − fᵢ(x)) / hⱼ with hⱼ = √ε |xⱼ| (√ε if xⱼ = 0), the step rounded so
        /// that x + hⱼ − x is exactly hⱼ (MINPACK-1 fdjac2, ANL-80-74).
        /// </summary>
        private void EvaluateJacobian()
        {
            if (_problem.HasAnalyticJacobian)
            {
                _problem.Jacobian(_x, _jacobian);
                return;
            }

            int m = _m;
            int n = _n;
            double root = Math.Sqrt(Eps);
            _x.CopyTo(_xTrial);
            for (int j = 0; j < n; j++)
            {
                double xj = _x[j];
                double h = root * Math.Abs(xj);
                if (h == 0.0)
                {
                    h = root;
                }

                _xTrial[j] = xj + h;
                h = _xTrial[j] - xj;
                _problem.Evaluate(_xTrial, _fWork);
                _evaluations++;
                _xTrial[j] = xj;
                double inv = 1.0 / h;
                for (int i = 0; i < m; i++)
                {
                    _jacobian[(i * n) + j] = (_fWork[i] - _f[i]) * inv;
                }
            }
        }

        private LeastSquaresSolution Finish(double fnorm, int iterations, SolverTermination termination, string reason, bool jacobianCurrent)
        {
            // The reported Jacobian must belong to the reported x; re-evaluate it after an accepted
            // step that was not followed by a new linearisation.
            if (!jacobianCurrent)
            {
                EvaluateJacobian();
            }

            double rss = fnorm * fnorm;
            if (double.IsFinite(fnorm))
            {
                rss = 0.0;
                for (int i = 0; i < _m; i++)
                {
                    rss += _f[i] * _f[i];
                }
            }

            return new LeastSquaresSolution(
                ImmutableArray.Create<double>(_x),
                ImmutableArray.Create<double>(_f),
                ImmutableArray.Create<double>(_jacobian),
                rss,
                iterations,
                _evaluations,
                termination,
                reason);
        }

        private static string Format(string format, params object[] args) => string.Format(CultureInfo.InvariantCulture, format, args);
    }
}
