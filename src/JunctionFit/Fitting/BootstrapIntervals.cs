using System.Collections.Immutable;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Fitting;

/// <summary>
/// Residual-bootstrap percentile 95 % intervals for the free parameters of a finished fit.
/// <para>
/// Scheme (a residual bootstrap in ln|I|; B. Efron and R. J. Tibshirani, An Introduction to the Bootstrap, Chapman &amp; Hall
/// 1993, bootstrapping regression models by resampling residuals; A. C. Davison and D. V. Hinkley, Bootstrap Methods and
/// their Application, Cambridge 1997; both from memory):
/// </para>
/// <list type="number">
/// <item>Over the m used points, eᵢ = ln|Iᵢ| − ln|Î(Vᵢ)| from the fit (<see cref="CurveSnapshot.LogResidual"/>), standardised
/// by the relative noise model sᵢ = √(r² + (σ_floor/|Iᵢ|)²) when a noise floor is set (sᵢ = 1 otherwise, where all points
/// weigh the same): uᵢ = eᵢ/sᵢ; centred, uᵢ − ū, and inflated by √(m/(m − p)) for the p fitted parameters, so that the
/// resampled residuals have the variance of the noise and not the smaller variance of the fitted residuals (common
/// practice).</item>
/// <item>Replicate b draws m indices jᵢ uniformly with replacement and builds the curve
/// I*ᵢ = sign(Îᵢ) · exp(ln|Îᵢ| + sᵢ·u_jᵢ) at the used points; unused points keep their measured current, so the mask is
/// reproduced.</item>
/// <item>Each replicate is refitted with <see cref="JunctionFitter.Fit"/> and the same options; the interval of θₖ is the
/// 2.5 % and 97.5 % quantile (see <see cref="Quantile"/>) of the replicate estimates in the solver
/// variable xₖ = T(θₖ), mapped back, so it stays inside the physical bounds.</item>
/// </list>
/// <para>
/// Determinism: replicate b uses its own <see cref="Random"/> seeded with the b-th draw of <c>new Random(seed)</c>, drawn
/// before the (parallel) refits, and writes into slot b; the result does not depend on thread scheduling.
/// Replicates whose refit fails are left out and counted in a warning.
/// </para>
/// Pure computation; thread-safe.
/// </summary>
public static class BootstrapIntervals
{
    /// <summary>Default number of bootstrap replicates.</summary>
    public const int DefaultReplicates = 200;

    /// <summary>Fewest successful replicates for which intervals are given.</summary>
    public const int MinimumReplicates = 20;

    /// <summary>Computes bootstrap intervals for every free parameter of <paramref name="fit"/>.</summary>
    /// <param name="curve">The curve that was fitted.</param>
    /// <param name="model">The model that was fitted.</param>
    /// <param name="options">The options of the fit.</param>
    /// <param name="fit">The result of <see cref="JunctionFitter.Fit"/> for these arguments (Wald intervals).</param>
    /// <param name="replicates">Number of bootstrap replicates B, at least <see cref="MinimumReplicates"/>.</param>
    /// <param name="seed">Seed of the resampling; the same seed gives the same intervals.</param>
    /// <returns>
    /// <paramref name="fit"/> with the 95 % intervals of the free parameters replaced (values and standard errors kept) and
    /// <see cref="FitQuality.IntervalMethod"/> naming the method, B and the seed; <paramref name="fit"/> itself with a warning
    /// when it failed or too few replicates could be fitted.
    /// </returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="replicates"/> is below <see cref="MinimumReplicates"/>.</exception>
    /// <exception cref="ArgumentException">The fit's parameters or curve do not match the model or the curve.</exception>
    public static FitResult Compute(IvCurve curve, JunctionCurrentModel model, FitOptions options, FitResult fit,
        int replicates = DefaultReplicates, int seed = 1)
    {
        ArgumentNullException.ThrowIfNull(curve);
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        ArgumentNullException.ThrowIfNull(fit);
        model = model.WithBounds(options.Bounds);
        ArgumentOutOfRangeException.ThrowIfLessThan(replicates, MinimumReplicates);
        if (fit.Status == FitStatus.Failed || fit.Quality is null || fit.Curve is null)
        {
            return fit with { Warnings = fit.Warnings.Add("bootstrap intervals not computed: the fit failed") };
        }
        var defs = model.Parameters;
        if (fit.Parameters.Length != defs.Count)
        {
            throw new ArgumentException($"the fit has {fit.Parameters.Length} parameters, the model {defs.Count}", nameof(fit));
        }
        var snapshot = fit.Curve;
        int n = curve.Count;
        if (snapshot.Used.Length != n || snapshot.ModelCurrentA.Length != n || snapshot.LogResidual.Length != n)
        {
            throw new ArgumentException("the fit's curve snapshot does not match the curve", nameof(fit));
        }

        // ---- standardised, centred, inflated residuals of the used points -----------------------------------
        var usedIndex = new List<int>(n);
        for (int i = 0; i < n; i++)
        {
            if (snapshot.Used[i] && double.IsFinite(snapshot.LogResidual[i]) && snapshot.ModelCurrentA[i] != 0
                && double.IsFinite(snapshot.ModelCurrentA[i]))
            {
                usedIndex.Add(i);
            }
        }
        int m = usedIndex.Count;
        int nFree = 0;
        foreach (var p in fit.Parameters) if (!p.IsFixed) nFree++;
        if (nFree == 0 || m <= nFree + 1)
        {
            return fit with { Warnings = fit.Warnings.Add("bootstrap intervals not computed: no free parameters or too few points") };
        }
        var scale = RelativeScale(curve, options, usedIndex);
        var u = new double[m];
        double mean = 0;
        for (int j = 0; j < m; j++)
        {
            u[j] = snapshot.LogResidual[usedIndex[j]] / scale[j];
            mean += u[j];
        }
        mean /= m;
        double inflation = Math.Sqrt(m / (double)(m - nFree));
        for (int j = 0; j < m; j++) u[j] = (u[j] - mean) * inflation;

        // ---- replicates ------------------------------------------------------------------------------------
        var seeds = new int[replicates];
        var master = new Random(seed);
        for (int b = 0; b < replicates; b++) seeds[b] = master.Next();
        var freeIndex = new List<int>();
        for (int k = 0; k < defs.Count; k++) if (!fit.Parameters[k].IsFixed) freeIndex.Add(k);
        var draws = new double[freeIndex.Count][];
        for (int f = 0; f < draws.Length; f++) draws[f] = new double[replicates];
        var ok = new bool[replicates];
        var replicateOptions = options with { DirectionFits = false };
        Parallel.For(0, replicates, b =>
        {
            var rng = new Random(seeds[b]);
            var current = curve.CurrentA.ToArray();
            for (int j = 0; j < m; j++)
            {
                int i = usedIndex[j];
                double fitted = snapshot.ModelCurrentA[i];
                current[i] = Math.Sign(fitted) * Math.Exp(Math.Log(Math.Abs(fitted)) + scale[j] * u[rng.Next(m)]);
            }
            var replicate = JunctionFitter.Fit(WithCurrent(curve, current), model, replicateOptions);
            if (replicate.Status == FitStatus.Failed || replicate.Parameters.Length != defs.Count) return;
            for (int f = 0; f < freeIndex.Count; f++)
            {
                int k = freeIndex[f];
                draws[f][b] = ParameterTransforms.ToSolver(defs[k], defs[k].FromDisplay(replicate.Parameters[k].Value));
            }
            ok[b] = true;
        });
        int good = 0;
        foreach (bool g in ok) if (g) good++;
        var warnings = fit.Warnings.ToBuilder();
        if (good < MinimumReplicates)
        {
            warnings.Add($"bootstrap intervals not computed: only {good} of {replicates} replicates could be fitted");
            return fit with { Warnings = warnings.ToImmutable() };
        }
        if (good < replicates)
        {
            warnings.Add($"{replicates - good} of {replicates} bootstrap replicates failed to fit and were left out; " +
                         "the intervals may be too narrow");
        }

        // ---- percentile intervals in the solver variables --------------------------------------------------
        var estimates = fit.Parameters.ToBuilder();
        var sample = new double[good];
        for (int f = 0; f < freeIndex.Count; f++)
        {
            int k = freeIndex[f];
            for (int b = 0, g = 0; b < replicates; b++) if (ok[b]) sample[g++] = draws[f][b];
            Array.Sort(sample);
            double lo = defs[k].ToDisplay(ParameterTransforms.FromSolver(defs[k], Quantile(sample, 0.025)));
            double hi = defs[k].ToDisplay(ParameterTransforms.FromSolver(defs[k], Quantile(sample, 0.975)));
            estimates[k] = estimates[k] with { Lower95 = Math.Min(lo, hi), Upper95 = Math.Max(lo, hi) };
        }
        string method = $"residual bootstrap in ln|I| (B = {replicates}, {good} fitted, seed {seed}), percentile, " +
                        "in transformed parameters, mapped back (stays inside the physical bounds)";
        return fit with
        {
            Parameters = estimates.MoveToImmutable(),
            Warnings = warnings.ToImmutable(),
            Quality = fit.Quality with { IntervalMethod = method },
        };
    }

    /// <summary>
    /// The relative standard deviation sᵢ of ln|I| at each used point up to a common factor: √(r² + (σ_floor/|Iᵢ|)²) with r as
    /// the fitter takes it (given, or estimated from the point-to-point scatter), or 1 everywhere without a noise floor.
    /// </summary>
    private static double[] RelativeScale(IvCurve curve, FitOptions options, List<int> usedIndex)
    {
        int m = usedIndex.Count;
        var s = new double[m];
        double floor = options.NoiseFloorA ?? 0.0;
        if (floor <= 0)
        {
            Array.Fill(s, 1.0);
            return s;
        }
        var v = new double[m];
        var y = new double[m];
        for (int j = 0; j < m; j++)
        {
            v[j] = curve.VoltageV[usedIndex[j]];
            y[j] = Math.Log(Math.Abs(curve.CurrentA[usedIndex[j]]));
        }
        double r = options.RelativeNoise ?? NoiseEstimator.RelativeNoise(v, y) ?? 1.0;
        for (int j = 0; j < m; j++)
        {
            double ratio = floor / Math.Exp(y[j]);
            s[j] = Math.Sqrt(r * r + ratio * ratio);
        }
        return s;
    }

    /// <summary>The curve with other currents and everything else (metadata, masks, compliance) unchanged.</summary>
    private static IvCurve WithCurrent(IvCurve curve, double[] currentA) => new(curve.SourcePath, curve.VoltageV, ImmutableArray.Create(currentA))
    {
        SourceLines = curve.SourceLines,
        Segments = curve.Segments,
        ImportMask = curve.ImportMask,
        AreaM2 = curve.AreaM2,
        TemperatureK = curve.TemperatureK,
        ComplianceA = curve.ComplianceA,
        Lot = curve.Lot,
        Wafer = curve.Wafer,
        DieX = curve.DieX,
        DieY = curve.DieY,
        Metadata = curve.Metadata,
        Warnings = curve.Warnings,
    };

    /// <summary>
    /// Quantile of a sorted sample by linear interpolation between order statistics at the 1-based position (n + 1)·q,
    /// clamped to the sample (R. J. Hyndman and Y. Fan, Am. Stat. 50, 361, 1996, definition 6; from memory). The r-th order
    /// statistic sits on average at the r/(n + 1) quantile of the distribution, so this choice does not pull the ends of a
    /// percentile interval inwards; with B = 100 the interpolation at (n − 1)·q + 1 would give a 93 % interval instead of 95 %.
    /// </summary>
    internal static double Quantile(double[] sorted, double q)
    {
        int n = sorted.Length;
        double position = (n + 1) * q;
        if (position <= 1) return sorted[0];
        if (position >= n) return sorted[n - 1];
        int below = (int)Math.Floor(position);
        double fraction = position - below;
        return sorted[below - 1] + fraction * (sorted[below] - sorted[below - 1]);
    }
}
