namespace JunctionFit.Import;

/// <summary>Monotonic segments of a sweep and the points at current compliance.</summary>
internal static class SweepAnalysis
{
    /// <summary>
    /// Relative size of a voltage reversal (against the full voltage span) below which it is taken
    /// as noise of a measured voltage rather than a turn of the sweep (common practice, no source).
    /// </summary>
    public const double ReversalTolerance = 1e-4;

    /// <summary>Relative spread allowed inside a flat run at the largest |I| (common practice, no source).</summary>
    public const double FlatTolerance = 1e-4;

    /// <summary>Shortest flat run taken as compliance (common practice, no source).</summary>
    public const int MinFlatRun = 3;

    /// <summary>
    /// Splits the sweep where the voltage turns. A turn is recognised when the voltage moves back from
    /// the extreme of the current segment by more than <see cref="ReversalTolerance"/> of the span; the
    /// extreme point ends its segment and the next point starts the new one. Repeated voltages stay in
    /// the segment they are in.
    /// </summary>
    public static int[] Segments(ReadOnlySpan<double> v)
    {
        var seg = new int[v.Length];
        if (v.Length == 0)
        {
            return seg;
        }
        double min = v[0], max = v[0];
        foreach (double x in v)
        {
            min = Math.Min(min, x);
            max = Math.Max(max, x);
        }
        double tol = ReversalTolerance * (max - min);
        int current = 0;
        int dir = 0;
        int extreme = 0;
        for (int i = 1; i < v.Length; i++)
        {
            seg[i] = current;
            if (dir == 0)
            {
                if (Math.Abs(v[i] - v[0]) > tol)
                {
                    dir = v[i] > v[0] ? 1 : -1;
                    extreme = i;
                }
                continue;
            }
            if ((dir > 0 && v[i] >= v[extreme]) || (dir < 0 && v[i] <= v[extreme]))
            {
                extreme = i;
                continue;
            }
            if (Math.Abs(v[i] - v[extreme]) > tol)
            {
                current++;
                for (int k = extreme + 1; k <= i; k++)
                {
                    seg[k] = current;
                }
                dir = -dir;
                extreme = i;
            }
        }
        return seg;
    }

    /// <summary>
    /// Flags points at compliance: with a stated compliance, every point with |I| at or above
    /// (1 − 10⁻³)·compliance; without, runs of at least <see cref="MinFlatRun"/> consecutive points
    /// within <see cref="FlatTolerance"/> of the largest current of their polarity.
    /// </summary>
    public static bool[] ComplianceMask(ReadOnlySpan<double> current, double? complianceA, out int masked)
    {
        var mask = new bool[current.Length];
        masked = 0;
        if (complianceA is double c && c > 0)
        {
            double threshold = c * (1 - 1e-3);
            for (int i = 0; i < current.Length; i++)
            {
                if (Math.Abs(current[i]) >= threshold)
                {
                    mask[i] = true;
                    masked++;
                }
            }
            return mask;
        }

        double maxPos = 0, maxNeg = 0;
        foreach (double x in current)
        {
            maxPos = Math.Max(maxPos, x);
            maxNeg = Math.Min(maxNeg, x);
        }
        masked += MarkFlatRuns(current, mask, maxPos);
        masked += MarkFlatRuns(current, mask, maxNeg);
        return mask;
    }

    private static int MarkFlatRuns(ReadOnlySpan<double> current, bool[] mask, double extreme)
    {
        if (extreme == 0)
        {
            return 0;
        }
        double limit = Math.Abs(extreme) * (1 - FlatTolerance);
        int count = 0;
        int runStart = -1;
        for (int i = 0; i <= current.Length; i++)
        {
            bool inRun = i < current.Length && Math.Sign(current[i]) == Math.Sign(extreme) && Math.Abs(current[i]) >= limit;
            if (inRun)
            {
                if (runStart < 0)
                {
                    runStart = i;
                }
                continue;
            }
            if (runStart >= 0 && i - runStart >= MinFlatRun)
            {
                for (int k = runStart; k < i; k++)
                {
                    if (!mask[k])
                    {
                        mask[k] = true;
                        count++;
                    }
                }
            }
            runStart = -1;
        }
        return count;
    }
}
