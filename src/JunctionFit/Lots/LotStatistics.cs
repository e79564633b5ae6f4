using System.Collections.Immutable;
using MathNet.Numerics.Distributions;
using JunctionFit.Common;

namespace JunctionFit.Lots;

/// <summary>
/// Result of Welch's two-sample comparison of means (unequal variances).
/// </summary>
/// <param name="Difference">x̄₁ − x̄₂.</param>
/// <param name="StandardError">√(s₁²/n₁ + s₂²/n₂).</param>
/// <param name="DegreesOfFreedom">Welch–Satterthwaite degrees of freedom ν.</param>
/// <param name="T">t = (x̄₁ − x̄₂)/SE.</param>
/// <param name="PValue">Two-sided p-value 2·P(T_ν ≤ −|t|).</param>
/// <param name="Lower95">Lower end of the 95 % interval of the difference.</param>
/// <param name="Upper95">Upper end of the 95 % interval of the difference.</param>
public sealed record WelchComparison(
    double Difference, double StandardError, double DegreesOfFreedom, double T, double PValue, double Lower95, double Upper95);

/// <summary>
/// The small statistics the lot analyses are built from. Pure functions over arrays; NaN and infinities are
/// rejected by the callers' filtering, not silently skipped here.
/// <para>
/// References (numbered in the comments):
/// [1] B. L. Welch, "The generalization of 'Student's' problem when several different population variances
///     are involved", Biometrika 34, 28–35 (1947); F. E. Satterthwaite, Biometrics Bulletin 2, 110–114 (1946).
/// [2] S. Holm, "A simple sequentially rejective multiple test procedure", Scand. J. Statist. 6, 65–70 (1979).
/// [3] P. J. Rousseeuw and C. Croux, "Alternatives to the median absolute deviation", J. Amer. Statist.
///     Assoc. 88, 1273–1283 (1993) — the MAD and its consistency factor 1/Φ⁻¹(3/4) ≈ 1.4826 for normal data.
/// [4] D. C. Montgomery, Introduction to Statistical Quality Control (Wiley), individuals and moving-range
///     chart: σ̂ = MR̄ / d₂ with d₂ = 1.128 for ranges of two consecutive points.
/// </para>
/// </summary>
public static class LotStatistics
{
    /// <summary>Consistency factor of the MAD for a normal distribution, 1/Φ⁻¹(0.75) ≈ 1.4826 [3].</summary>
    public const double MadNormalConsistency = 1.4826;

    /// <summary>d₂ for moving ranges of two consecutive observations [4].</summary>
    public const double MovingRangeD2 = 1.128;

    /// <summary>Median of <paramref name="values"/> (mean of the two middle values for an even count).</summary>
    /// <param name="values">At least one finite value.</param>
    /// <returns>The median.</returns>
    /// <exception cref="ArgumentException"><paramref name="values"/> is empty or holds a non-finite value.</exception>
    public static double Median(IReadOnlyList<double> values)
    {
        var sorted = SortedFinite(values, nameof(values));
        int n = sorted.Length;
        return n % 2 == 1 ? sorted[n / 2] : 0.5 * (sorted[n / 2 - 1] + sorted[n / 2]);
    }

    /// <summary>
    /// Robust spread: the median absolute deviation from the median times 1.4826 [3], so that it estimates σ for
    /// normal data: σ̂ = 1.4826 · median |xᵢ − median(x)|.
    /// </summary>
    /// <param name="values">At least one finite value.</param>
    /// <returns>The scaled MAD (0 for a single value).</returns>
    /// <exception cref="ArgumentException"><paramref name="values"/> is empty or holds a non-finite value.</exception>
    public static double ScaledMad(IReadOnlyList<double> values)
    {
        double m = Median(values);
        var deviations = new double[values.Count];
        for (int i = 0; i < deviations.Length; i++) deviations[i] = Math.Abs(values[i] - m);
        return MadNormalConsistency * Median(deviations);
    }

    /// <summary>Arithmetic mean and sample variance (n − 1 in the denominator; 0 for a single value).</summary>
    /// <param name="values">At least one finite value.</param>
    /// <returns>Mean and variance.</returns>
    /// <exception cref="ArgumentException"><paramref name="values"/> is empty or holds a non-finite value.</exception>
    public static (double Mean, double Variance) MeanAndVariance(IReadOnlyList<double> values)
    {
        CheckFinite(values, nameof(values));
        // Two passes: the mean first, then squared deviations (no cancellation for values far from zero).
        double sum = 0;
        foreach (double x in values) sum += x;
        double mean = sum / values.Count;
        if (values.Count == 1) return (mean, 0);
        double ss = 0;
        foreach (double x in values) ss += (x - mean) * (x - mean);
        return (mean, ss / (values.Count - 1));
    }

    /// <summary>
    /// Welch's comparison of the means of two samples with possibly unequal variances [1]:
    /// SE = √(v₁ + v₂) with vᵢ = sᵢ²/nᵢ; ν = (v₁ + v₂)² / (v₁²/(n₁ − 1) + v₂²/(n₂ − 1)) (Welch–Satterthwaite);
    /// t = (x̄₁ − x̄₂)/SE; p = 2 P(T_ν ≤ −|t|); 95 % interval (x̄₁ − x̄₂) ± t_{0.975, ν} SE, with the Student t
    /// distribution of MathNet.Numerics.
    /// </summary>
    /// <param name="sample">First sample (the lot), at least 2 values.</param>
    /// <param name="reference">Second sample (the reference), at least 2 values.</param>
    /// <returns>The comparison, or null when both samples have zero variance (the test is undefined).</returns>
    /// <exception cref="ArgumentException">A sample has fewer than 2 values or a non-finite value.</exception>
    public static WelchComparison? Welch(IReadOnlyList<double> sample, IReadOnlyList<double> reference)
    {
        ArgumentNullException.ThrowIfNull(sample);
        ArgumentNullException.ThrowIfNull(reference);
        if (sample.Count < 2) throw new ArgumentException("needs at least 2 values", nameof(sample));
        if (reference.Count < 2) throw new ArgumentException("needs at least 2 values", nameof(reference));
        var (m1, var1) = MeanAndVariance(sample);
        var (m2, var2) = MeanAndVariance(reference);
        double v1 = var1 / sample.Count;
        double v2 = var2 / reference.Count;
        double se2 = v1 + v2;
        if (!(se2 > 0)) return null;
        double se = Math.Sqrt(se2);
        double df = se2 * se2 / (v1 * v1 / (sample.Count - 1) + v2 * v2 / (reference.Count - 1));
        double diff = m1 - m2;
        double t = diff / se;
        double p = Math.Min(1.0, 2.0 * StudentT.CDF(0, 1, df, -Math.Abs(t)));
        double q = StudentT.InvCDF(0, 1, df, 0.975);
        return new WelchComparison(diff, se, df, t, p, diff - q * se, diff + q * se);
    }

    /// <summary>
    /// Holm's step-down adjustment [2] of <paramref name="pValues"/> for a family of m tests: with the p-values
    /// sorted, p₍₁₎ ≤ … ≤ p₍ₘ₎, the adjusted p̃₍ᵢ₎ = max_{j ≤ i} min(1, (m − j + 1) p₍ⱼ₎). Rejecting where p̃ ≤ α is
    /// Holm's procedure at family-wise level α. Ties keep their input order.
    /// </summary>
    /// <param name="pValues">p-values in [0, 1], in any order.</param>
    /// <returns>The adjusted p-values in the input order.</returns>
    /// <exception cref="ArgumentOutOfRangeException">A p-value is outside [0, 1] or NaN.</exception>
    public static ImmutableArray<double> HolmAdjust(IReadOnlyList<double> pValues)
    {
        ArgumentNullException.ThrowIfNull(pValues);
        int m = pValues.Count;
        for (int i = 0; i < m; i++)
        {
            Guard.InRange(pValues[i], 0.0, 1.0, "0 and 1 (a p-value)", nameof(pValues));
        }
        var order = Enumerable.Range(0, m).OrderBy(i => pValues[i]).ThenBy(i => i).ToArray();
        var adjusted = new double[m];
        double running = 0;
        for (int rank = 0; rank < m; rank++)
        {
            int i = order[rank];
            running = Math.Max(running, Math.Min(1.0, (m - rank) * pValues[i]));
            adjusted[i] = running;
        }
        return [.. adjusted];
    }

    /// <summary>
    /// σ̂ of an individuals chart from the average moving range [4]: σ̂ = MR̄ / 1.128, with
    /// MR̄ = mean of |xᵢ − xᵢ₋₁| over consecutive values in the order given.
    /// </summary>
    /// <param name="values">At least 2 finite values, in time (or run) order.</param>
    /// <returns>σ̂.</returns>
    /// <exception cref="ArgumentException">Fewer than 2 values, or a non-finite value.</exception>
    public static double MovingRangeSigma(IReadOnlyList<double> values)
    {
        CheckFinite(values, nameof(values));
        if (values.Count < 2) throw new ArgumentException("needs at least 2 values", nameof(values));
        double sum = 0;
        for (int i = 1; i < values.Count; i++) sum += Math.Abs(values[i] - values[i - 1]);
        return sum / (values.Count - 1) / MovingRangeD2;
    }

    private static double[] SortedFinite(IReadOnlyList<double> values, string name)
    {
        CheckFinite(values, name);
        var sorted = values.ToArray();
        Array.Sort(sorted);
        return sorted;
    }

    private static void CheckFinite(IReadOnlyList<double> values, string name)
    {
        ArgumentNullException.ThrowIfNull(values, name);
        if (values.Count == 0) throw new ArgumentException("needs at least one value", name);
        for (int i = 0; i < values.Count; i++)
        {
            if (!double.IsFinite(values[i])) throw new ArgumentException($"value {i} is not a finite number ({values[i]})", name);
        }
    }
}
