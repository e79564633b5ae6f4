using JunctionFit.Physics.Numerics;
namespace JunctionFit.Fitting;

/// <summary>
/// Estimates the relative current noise of a curve from its point-to-point scatter, without a model.
/// <para>
/// For points sorted by bias, the second difference eᵢ = yᵢ − (wₗ yᵢ₋₁ + wᵣ yᵢ₊₁) of y = ln|I|, with the linear
/// interpolation weights wₗ = (Vᵢ₊₁ − Vᵢ)/(Vᵢ₊₁ − Vᵢ₋₁), wᵣ = 1 − wₗ, removes any locally linear trend; for independent
/// noise of standard deviation s in y, Var eᵢ = s²(1 + wₗ² + wᵣ²). The estimate is the normalised median absolute
/// value, s = 1.4826 · median(|eᵢ| / √(1 + wₗ² + wᵣ²)), robust to the few triples where the curve bends sharply
/// (near zero bias). 1.4826 = 1/Φ⁻¹(3/4) makes the median absolute value consistent for a normal distribution
/// (Hampel 1974). Triples that straddle zero bias are skipped. Since s is the standard deviation of ln|I|, it is the
/// relative current noise r of σ_I = r·|I| to first order.
/// </para>
/// </summary>
public static class NoiseEstimator
{
    /// <summary>Minimum number of triples for an estimate.</summary>
    public const int MinimumTriples = 8;

    /// <summary>Smallest estimate returned, so that noise-free (simulated) data still give finite weights.</summary>
    public const double SmallestEstimate = 1e-9;

    /// <summary>The relative noise r of ln|I| against V, or null when there are too few points.</summary>
    /// <param name="voltageV">Bias of each point (any order).</param>
    /// <param name="logAbsCurrent">ln|I| of each point.</param>
    public static double? RelativeNoise(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> logAbsCurrent)
        => RelativeNoise(voltageV, logAbsCurrent, default);

    /// <summary>
    /// The relative noise r of ln|I| against V, with the triples formed within each group (for example each sweep
    /// direction, so that hysteresis between a rising and a falling sweep is not taken for noise); null when there are too
    /// few points.
    /// </summary>
    /// <param name="voltageV">Bias of each point (any order).</param>
    /// <param name="logAbsCurrent">ln|I| of each point.</param>
    /// <param name="groups">Group label of each point, or empty for one group.</param>
    public static double? RelativeNoise(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> logAbsCurrent, ReadOnlySpan<sbyte> groups)
    {
        if (voltageV.Length != logAbsCurrent.Length) throw new ArgumentException("voltage and current lengths differ");
        if (!groups.IsEmpty && groups.Length != voltageV.Length) throw new ArgumentException("group labels and points differ in length");
        int m = voltageV.Length;
        if (m < MinimumTriples + 2) return null;
        var scaled = new double[m];
        int count = 0;
        if (groups.IsEmpty)
        {
            count = AddTriples(voltageV.ToArray(), logAbsCurrent.ToArray(), scaled, 0);
        }
        else
        {
            Span<sbyte> labels = stackalloc sbyte[] { -1, 0, 1 };
            foreach (sbyte label in labels)
            {
                int size = 0;
                foreach (sbyte g in groups) if (g == label) size++;
                if (size < 3) continue;
                var v = new double[size];
                var y = new double[size];
                for (int i = 0, u = 0; i < m; i++)
                {
                    if (groups[i] != label) continue;
                    v[u] = voltageV[i];
                    y[u++] = logAbsCurrent[i];
                }
                count = AddTriples(v, y, scaled, count);
            }
        }
        if (count < MinimumTriples) return null;
        double median = SortKernels.Median(scaled.AsSpan(0, count));
        return Math.Max(1.4826 * median, SmallestEstimate);
    }

    /// <summary>Sorts (v, y) by v and appends the scaled second differences of its triples to <paramref name="scaled"/>.</summary>
    private static int AddTriples(double[] v, double[] y, double[] scaled, int count)
    {
        int m = v.Length;
        SortKernels.SortWithItems(v, y);
        for (int i = 1; i < m - 1; i++)
        {
            if (!TrySecondDifference(v, y, i, out double e, out double wl, out double wr)) continue;
            scaled[count++] = Math.Abs(e) / Math.Sqrt(1.0 + wl * wl + wr * wr);
        }
        return count;
    }

    /// <summary>
    /// The second difference eᵢ = yᵢ − (wₗ yᵢ₋₁ + wᵣ yᵢ₊₁) of the triple centred on i of points sorted by v, with its linear
    /// interpolation weights; false when the triple straddles zero bias or its outer biases coincide.
    /// </summary>
    internal static bool TrySecondDifference(double[] v, double[] y, int i, out double e, out double wl, out double wr)
    {
        double v0 = v[i - 1], v1 = v[i], v2 = v[i + 1];
        if (Math.Sign(v0) != Math.Sign(v2) || v2 <= v0)
        {
            e = wl = wr = 0;
            return false;
        }
        wl = (v2 - v1) / (v2 - v0);
        wr = 1.0 - wl;
        e = y[i] - (wl * y[i - 1] + wr * y[i + 1]);
        return true;
    }
}
