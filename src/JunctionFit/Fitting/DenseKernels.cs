namespace JunctionFit.Fitting;

/// <summary>
/// Small dense kernels shared by the least-squares code: an overflow- and underflow-safe
/// Euclidean norm.
/// </summary>
/// <remarks>
/// ‖v‖₂ = √(Σ vᵢ²). The plain sum of squares is used when it is finite and not so small that
/// squares may have underflowed; otherwise the norm is recomputed as s·√(Σ (vᵢ/s)²) with
/// s = maxᵢ |vᵢ|, which cannot overflow or lose the small entries. This is the same purpose as the
/// MINPACK-1 norm routine (Moré, Garbow &amp; Hillstrom, ANL-80-74, 1980) with a simpler two-pass
/// scheme: one cheap pass in the common case.
/// </remarks>
internal static class DenseKernels
{
    // Below this the plain sum of squares may have lost entries to underflow.
    private const double SmallSumOfSquares = 1e-280;

    /// <summary>Euclidean norm of <paramref name="v"/>; NaN if any entry is NaN.</summary>
    public static double Norm(ReadOnlySpan<double> v)
    {
        double sum = 0.0;
        for (int i = 0; i < v.Length; i++)
        {
            sum += v[i] * v[i];
        }

        // A zero sum is not taken as is: entries below ~1.5e-162 square to 0 (a zero vector costs one more pass).
        if (double.IsFinite(sum) && sum > SmallSumOfSquares)
        {
            return Math.Sqrt(sum);
        }

        if (double.IsNaN(sum))
        {
            return double.NaN;
        }

        double scale = 0.0;
        for (int i = 0; i < v.Length; i++)
        {
            double a = Math.Abs(v[i]);
            if (a > scale)
            {
                scale = a;
            }
        }

        if (scale == 0.0 || double.IsInfinity(scale))
        {
            return scale;
        }

        double scaled = 0.0;
        for (int i = 0; i < v.Length; i++)
        {
            double t = v[i] / scale;
            scaled += t * t;
        }

        return scale * Math.Sqrt(scaled);
    }

    /// <summary>Euclidean norm of a column segment of a column-major matrix.</summary>
    public static double ColumnNorm(ReadOnlySpan<double> a, int ld, int column, int fromRow, int toRowExclusive)
        => Norm(a.Slice((column * ld) + fromRow, toRowExclusive - fromRow));

    /// <summary>True when every entry is finite.</summary>
    public static bool AllFinite(ReadOnlySpan<double> v)
    {
        for (int i = 0; i < v.Length; i++)
        {
            if (!double.IsFinite(v[i]))
            {
                return false;
            }
        }

        return true;
    }
}
