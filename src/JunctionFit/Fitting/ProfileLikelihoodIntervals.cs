using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using MathNet.Numerics.Distributions;

namespace JunctionFit.Fitting;

/// <summary>
/// Profile-likelihood 95 % intervals for the free parameters of a finished fit.
/// <para>
/// For a free parameter θₖ with solver variable xₖ = T(θₖ) (see <see cref="ParameterTransforms"/>) the profile is
/// S_p(xₖ) = min over the other free parameters of the weighted residual sum of squares S with θₖ held at T⁻¹(xₖ); it is
/// computed by refitting with <see cref="JunctionFitter.Fit"/> and θₖ in <see cref="FitOptions.FixedValues"/>. The interval
/// is the set of xₖ where S_p stays below a threshold S_c, mapped back to θₖ (so it stays inside the physical bounds):
/// </para>
/// <list type="bullet">
/// <item>Noise unknown (covariance scaled by the reduced χ²): S_c = S_min · (1 + F₀.₉₅(1, ν)/ν), ν = points − free
/// parameters, the likelihood-ratio region with the residual variance estimated (D. M. Bates and D. G. Watts, Nonlinear
/// Regression Analysis and Its Applications, Wiley 1988, the profile-t construction; from memory). Since
/// F₀.₉₅(1, ν) = t²₀.₉₇₅,ν this equals the Wald interval x̂ ± t·se when S is quadratic in x.</item>
/// <item>Noise known (<see cref="FitOptions.RelativeNoise"/> set): S_c = S_min + χ²₀.₉₅(1) = S_min + 3.841.</item>
/// </list>
/// <para>
/// Root finding per side: h(δ) = √max(S_p(x̂ ± δ) − S_min, 0) − √(S_c − S_min), the profile-t statistic up to a constant,
/// is close to linear in δ, so the first probe at the Wald half-width usually lands near the root. The probe distance
/// doubles until h changes sign (a bracket), then Brent's method (R. P. Brent, Algorithms for Minimization without
/// Derivatives, Prentice-Hall 1973) refines the crossing to <see cref="RelativeTolerance"/> of the first probe distance (the Wald half-width, at most
/// <see cref="MaxFirstStep"/>). Each
/// refit starts from the other parameters of the previous probe on the same side (warm start through
/// <see cref="FitOptions.StartValues"/>). A side that does not cross before the physical bound (or before
/// <see cref="MaxSearchSpan"/> in x for a bound at infinity in x, such as 0 for a log-transformed parameter) is reported as
/// the bound itself, with a warning that the interval is open-ended.
/// </para>
/// <para>
/// Consistency of S: the refits see the same curve, mask and options, so their weights (from
/// <see cref="FitOptions.RelativeNoise"/> or from <see cref="NoiseEstimator"/> on the same used points) are identical
/// to those of the original fit, and their <see cref="FitQuality.ResidualSumOfSquares"/> values are directly comparable.
/// </para>
/// Pure computation; thread-safe.
/// </summary>
public static class ProfileLikelihoodIntervals
{
    /// <summary>Text of <see cref="FitQuality.IntervalMethod"/> when the noise is unknown.</summary>
    public const string MethodScaled =
        "profile likelihood, threshold RSS_min(1 + F(0.95; 1, nu)/nu), in transformed parameters, mapped back (stays inside the physical bounds)";

    /// <summary>Text of <see cref="FitQuality.IntervalMethod"/> when the noise is known.</summary>
    public const string MethodKnownNoise =
        "profile likelihood, threshold RSS_min + chi2(0.95; 1) = RSS_min + 3.84, in transformed parameters, mapped back (stays inside the physical bounds)";

    /// <summary>Crossing located to this fraction of the Wald half-width (in the solver variable).</summary>
    public const double RelativeTolerance = 1e-3;

    /// <summary>Largest distance from the estimate searched in the solver variable (for a log parameter, a factor e²⁰ ≈ 5·10⁸).</summary>
    public const double MaxSearchSpan = 20.0;

    /// <summary>Doublings of the probe distance before a side is declared open-ended.</summary>
    public const int MaxExpansions = 12;

    /// <summary>Refits per side at most during Brent's refinement.</summary>
    public const int MaxRefinements = 30;

    /// <summary>Probe distance used when the fit gives no standard error for a parameter, in the solver variable.</summary>
    public const double FallbackStep = 0.1;

    /// <summary>Largest first probe distance in the solver variable (a factor e for a log parameter), for fits whose Wald
    /// standard error is meaninglessly large.</summary>
    public const double MaxFirstStep = 1.0;

    /// <summary>Computes profile-likelihood intervals for every free parameter of <paramref name="fit"/>.</summary>
    /// <param name="curve">The curve that was fitted.</param>
    /// <param name="model">The model that was fitted.</param>
    /// <param name="options">The options of the fit.</param>
    /// <param name="fit">The result of <see cref="JunctionFitter.Fit"/> for these arguments (Wald intervals).</param>
    /// <returns>
    /// <paramref name="fit"/> with the 95 % intervals of the free parameters replaced (values and standard errors kept),
    /// <see cref="FitQuality.IntervalMethod"/> naming the method, and warnings for open-ended sides; <paramref name="fit"/>
    /// itself with a warning when it failed or has no degrees of freedom.
    /// </returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException">The fit's parameters do not match the model's.</exception>
    public static FitResult Compute(IvCurve curve, JunctionCurrentModel model, FitOptions options, FitResult fit)
    {
        ArgumentNullException.ThrowIfNull(curve);
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(fit);
        model = model.WithBounds(options.Bounds);
        if (fit.Status == FitStatus.Failed || fit.Quality is null)
        {
            return fit with { Warnings = fit.Warnings.Add("profile-likelihood intervals not computed: the fit failed") };
        }
        var defs = model.Parameters;
        if (fit.Parameters.Length != defs.Count)
        {
            throw new ArgumentException($"the fit has {fit.Parameters.Length} parameters, the model {defs.Count}", nameof(fit));
        }
        var quality = fit.Quality;
        int nFree = 0;
        foreach (var p in fit.Parameters) if (!p.IsFixed) nFree++;
        int dof = quality.PointsUsed - nFree;
        double sMin = quality.ResidualSumOfSquares;
        if (nFree == 0 || dof <= 0 || !double.IsFinite(sMin))
        {
            return fit with { Warnings = fit.Warnings.Add("profile-likelihood intervals not computed: no free parameters or no degrees of freedom") };
        }
        bool noiseKnown = options.RelativeNoise is not null;
        double deltaS = noiseKnown ? ChiSquared.InvCDF(1.0, 0.95) : sMin * FisherSnedecor.InvCDF(1.0, dof, 0.95) / dof;
        double waldQuantile = noiseKnown ? Math.Sqrt(deltaS) : StudentT.InvCDF(0.0, 1.0, dof, 0.975);

        var thetaHat = new double[defs.Count];
        for (int k = 0; k < defs.Count; k++) thetaHat[k] = defs[k].FromDisplay(fit.Parameters[k].Value);

        var warnings = fit.Warnings.ToBuilder();
        var estimates = fit.Parameters.ToBuilder();
        for (int k = 0; k < defs.Count; k++)
        {
            var estimate = fit.Parameters[k];
            if (estimate.IsFixed) continue;
            var def = defs[k];
            var profile = new Profile(curve, model, options, fit, thetaHat, k, sMin, deltaS);
            double xHat = ParameterTransforms.ToSolver(def, thetaHat[k]);
            double step = FallbackStep;
            if (estimate.StandardError is double se && se > 0)
            {
                double dThetaDx = Math.Abs(ParameterTransforms.Derivative(def, thetaHat[k]));
                double seX = dThetaDx > 0 ? def.FromDisplay(se) / dThetaDx : double.NaN;
                if (double.IsFinite(seX) && seX > 0) step = Math.Min(waldQuantile * seX, MaxFirstStep);
            }
            var lower = profile.Side(-1, xHat, step);
            var upper = profile.Side(+1, xHat, step);
            double lo = def.ToDisplay(lower.Theta), hi = def.ToDisplay(upper.Theta);
            estimates[k] = estimate with { Lower95 = Math.Min(lo, hi), Upper95 = Math.Max(lo, hi) };
            if (lower.OpenEnded || upper.OpenEnded)
            {
                string sides = lower.OpenEnded && upper.OpenEnded ? "both ends" : lower.OpenEnded ? "the lower end" : "the upper end";
                warnings.Add($"the profile-likelihood interval of the {def.Description} is open-ended at {sides}: the residual sum of squares " +
                             "stays below the 95 % threshold out to the physical bound, so the data do not bound it there; " +
                             $"the reported end is the bound. Remedy: fix the area from the lithography ({Remedy.GiveArea}) or widen the bias range");
            }
            if (profile.LowestFound < sMin * (1 - 1e-7))
            {
                warnings.Add($"the profile of the {def.Description} reached a lower residual sum of squares ({profile.LowestFound:0.####e+0}) " +
                             $"than the fit ({sMin:0.####e+0}): the fit is not at the global optimum; the interval is relative to the fit's minimum");
            }
            if (profile.NotConverged > 0)
            {
                warnings.Add($"{profile.NotConverged} of {profile.Refits} profile refits of the {def.Description} did not converge; " +
                             "their residual sums of squares were used as they are (the interval may be slightly short)");
            }
        }
        return fit with
        {
            Parameters = estimates.MoveToImmutable(),
            Warnings = warnings.ToImmutable(),
            Quality = quality with { IntervalMethod = noiseKnown ? MethodKnownNoise : MethodScaled },
        };
    }

    /// <summary>One end of a profile interval: θ in SI, and whether it is the physical bound for want of a crossing.</summary>
    private readonly record struct End(double Theta, bool OpenEnded);

    /// <summary>The profile of one parameter: refits with it fixed, and the root finding on each side.</summary>
    private sealed class Profile(
        IvCurve curve, JunctionCurrentModel model, FitOptions options, FitResult fit, double[] thetaHat, int index, double sMin, double deltaS)
    {
        private readonly ParameterDefinition _def = model.Parameters[index];
        private readonly double _rootDeltaS = Math.Sqrt(deltaS);
        private readonly double[] _thetaHat = thetaHat;
        private double[] _warm = thetaHat;

        public int Refits { get; private set; }

        public int NotConverged { get; private set; }

        public double LowestFound { get; private set; } = double.PositiveInfinity;

        /// <summary>Finds the crossing on side <paramref name="sign"/> (−1 lower, +1 upper) of <paramref name="xHat"/>.</summary>
        public End Side(int sign, double xHat, double firstStep)
        {
            _warm = _thetaHat;
            double bound = sign < 0 ? _def.LowerSi : _def.UpperSi;
            double xBound = double.IsFinite(bound) ? ParameterTransforms.ToSolver(_def, bound) : double.NaN;
            // Distance to the bound in x; the log transform maps a lower bound to −∞ and the logistic both bounds to ±∞.
            double limit = double.IsFinite(xBound) ? Math.Min(Math.Abs(xBound - xHat), MaxSearchSpan) : MaxSearchSpan;
            bool limitIsBound = double.IsFinite(xBound) && Math.Abs(xBound - xHat) <= MaxSearchSpan;

            double a = 0, ha = -_rootDeltaS;
            double first = Math.Min(firstStep, limit);
            double b = first, hb = H(sign, xHat, b, limitIsBound && b >= limit);
            int expansions = 0;
            while (hb < 0)
            {
                if (b >= limit || expansions++ >= MaxExpansions) return new End(bound, true);
                a = b;
                ha = hb;
                b = Math.Min(2 * b, limit);
                hb = H(sign, xHat, b, limitIsBound && b >= limit);
            }
            double delta = Brent(sign, xHat, a, ha, b, hb, RelativeTolerance * first);
            return new End(ParameterTransforms.FromSolver(_def, xHat + sign * delta), false);
        }

        /// <summary>h(δ) = √max(S_p − S_min, 0) − √ΔS at x̂ + sign·δ; +∞ where the refit gives no finite S.</summary>
        private double H(int sign, double xHat, double delta, bool atBound)
        {
            double theta = atBound
                ? (sign < 0 ? _def.LowerSi : _def.UpperSi)
                : ParameterTransforms.FromSolver(_def, xHat + sign * delta);
            var starts = ImmutableDictionary.CreateBuilder<ParameterKey, double>();
            foreach (var pair in options.StartValues) starts[pair.Key] = pair.Value;
            for (int k = 0; k < _warm.Length; k++)
            {
                if (k != index && !fit.Parameters[k].IsFixed) starts[model.Parameters[k].Id] = _warm[k];
            }
            var refitOptions = options with
            {
                FixedValues = options.FixedValues.SetItem(_def.Id, theta),
                StartValues = starts.ToImmutable(),
                DirectionFits = false,
            };
            var refit = JunctionFitter.Fit(curve, model, refitOptions);
            Refits++;
            double s = refit.Quality?.ResidualSumOfSquares ?? double.NaN;
            if (!double.IsFinite(s)) return double.PositiveInfinity;
            if (refit.Quality is { Converged: false }) NotConverged++;
            LowestFound = Math.Min(LowestFound, s);
            if (refit.Parameters.Length == _warm.Length)
            {
                var next = new double[_warm.Length];
                for (int k = 0; k < next.Length; k++) next[k] = model.Parameters[k].FromDisplay(refit.Parameters[k].Value);
                _warm = next;
            }
            return Math.Sqrt(Math.Max(s - sMin, 0.0)) - _rootDeltaS;
        }

        /// <summary>
        /// Brent's method on [a, b] with h(a) &lt; 0 ≤ h(b): inverse quadratic interpolation or secant steps, falling back
        /// to bisection whenever they do not shrink the bracket fast enough. Returns δ within <paramref name="tolerance"/>.
        /// </summary>
        private double Brent(int sign, double xHat, double a, double fa, double b, double fb, double tolerance)
        {
            double c = a, fc = fa, d = b - a, e = d;
            for (int iteration = 0; iteration < MaxRefinements; iteration++)
            {
                if (Math.Sign(fb) == Math.Sign(fc) && fb != 0)
                {
                    c = a;
                    fc = fa;
                    d = e = b - a;
                }
                if (Math.Abs(fc) < Math.Abs(fb))
                {
                    a = b; b = c; c = a;
                    fa = fb; fb = fc; fc = fa;
                }
                double tol = 2 * double.Epsilon + 0.5 * tolerance;
                double m = 0.5 * (c - b);
                if (Math.Abs(m) <= tol || fb == 0) return b;
                if (Math.Abs(e) >= tol && Math.Abs(fa) > Math.Abs(fb) && double.IsFinite(fa) && double.IsFinite(fb) && double.IsFinite(fc))
                {
                    double s = fb / fa, p, q;
                    if (a == c)
                    {
                        p = 2 * m * s;
                        q = 1 - s;
                    }
                    else
                    {
                        double r = fb / fc;
                        q = fa / fc;
                        p = s * (2 * m * q * (q - r) - (b - a) * (r - 1));
                        q = (q - 1) * (r - 1) * (s - 1);
                    }
                    if (p > 0) q = -q; else p = -p;
                    if (2 * p < Math.Min(3 * m * q - Math.Abs(tol * q), Math.Abs(e * q)))
                    {
                        e = d;
                        d = p / q;
                    }
                    else
                    {
                        d = m;
                        e = m;
                    }
                }
                else
                {
                    d = m;
                    e = m;
                }
                a = b;
                fa = fb;
                b += Math.Abs(d) > tol ? d : (m > 0 ? tol : -tol);
                fb = H(sign, xHat, b, false);
            }
            return b;
        }
    }
}
