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
    /// Splits the sweep where the voltage turns, and where a new trace begins (see <see cref="Traces"/>).
    /// A turn is recognised when the voltage moves back from the extreme of the current segment by more
    /// than <see cref="ReversalTolerance"/> of the span; the extreme point ends its segment and the next
    /// point starts the new one. Repeated voltages stay in the segment they are in.
    /// </summary>
    public static int[] Segments(ReadOnlySpan<double> v)
    {
        var seg = new int[v.Length];
        if (v.Length == 0)
        {
            return seg;
        }
        double tol = ReversalTolerance * Span(v);
        int[] trace = Traces(v, out _);
        int offset = 0;
        int start = 0;
        for (int i = 1; i <= v.Length; i++)
        {
            if (i == v.Length || trace[i] != trace[start])
            {
                offset = SegmentsOf(v[start..i], tol, seg.AsSpan(start, i - start), offset) + 1;
                start = i;
            }
        }
        return seg;
    }

    /// <summary>
    /// Numbers the traces of a sweep that repeats itself: a new trace begins after the voltage has left
    /// its first value, come back to it (within <see cref="ReversalTolerance"/> of the span), and then
    /// leaves it again in the direction the first trace started in (0 → +0.5 → −0.5 → 0, then 0 → +0.5 …).
    /// When the start bias is measured twice in a row there, the first point ends the old trace and the
    /// second starts the new one; when once, that point starts the new trace.
    /// </summary>
    /// <param name="v">Voltages in measurement order.</param>
    /// <param name="count">Number of traces (1 for a sweep that does not repeat).</param>
    /// <returns>The 0-based trace number of each point.</returns>
    public static int[] Traces(ReadOnlySpan<double> v, out int count)
    {
        var trace = new int[v.Length];
        count = v.Length == 0 ? 0 : 1;
        if (v.Length < 3)
        {
            return trace;
        }
        double tol = ReversalTolerance * Span(v);
        double v0 = v[0];
        int firstDir = 0;
        bool left = false;
        int current = 0;
        for (int i = 1; i < v.Length; i++)
        {
            trace[i] = current;
            double d = v[i] - v0;
            if (Math.Abs(d) > tol)
            {
                if (firstDir == 0)
                {
                    firstDir = Math.Sign(d);
                }
                left = true;
                continue;
            }
            if (!left)
            {
                continue;
            }
            // Back at the start bias: does the sweep leave it again the way it first did?
            int j = i + 1;
            while (j < v.Length && Math.Abs(v[j] - v0) <= tol)
            {
                j++;
            }
            if (j < v.Length && Math.Sign(v[j] - v0) == firstDir)
            {
                // With the start bias measured twice (end of one trace, start of the next) the first
                // of them ends the old trace; measured once, it starts the new one.
                current++;
                left = false;
                for (int k = j == i + 1 ? i : i + 1; k < j; k++)
                {
                    trace[k] = current;
                }
                i = j - 1;
            }
        }
        count = current + 1;
        return trace;
    }

    private static double Span(ReadOnlySpan<double> v)
    {
        double min = v[0], max = v[0];
        foreach (double x in v)
        {
            min = Math.Min(min, x);
            max = Math.Max(max, x);
        }
        return max - min;
    }

    /// <summary>Segments of one trace, numbered from <paramref name="first"/>; returns the last number used.</summary>
    private static int SegmentsOf(ReadOnlySpan<double> v, double tol, Span<int> seg, int first)
    {
        int current = first;
        seg[0] = current;
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
        return current;
    }

    /// <summary>Smallest |I| (as a fraction of the largest) taken as well above zero for the I/J ratio (common practice, no source).</summary>
    public const double RatioFloor = 1e-3;

    /// <summary>
    /// The ratio a/b (for the area: current over current density) as the median over the points where
    /// both are finite and |a| is at least <see cref="RatioFloor"/> of the largest |a|, and b is not zero;
    /// with the largest relative deviation of a single point from that median.
    /// </summary>
    /// <returns>False when fewer than three points qualify.</returns>
    public static bool TryMedianRatio(ReadOnlySpan<double> a, ReadOnlySpan<double> b, out double median, out double spread, out int used)
    {
        median = double.NaN;
        spread = double.NaN;
        double max = 0;
        for (int i = 0; i < a.Length; i++)
        {
            if (double.IsFinite(a[i]) && double.IsFinite(b[i]))
            {
                max = Math.Max(max, Math.Abs(a[i]));
            }
        }
        var ratios = new List<double>();
        for (int i = 0; i < a.Length; i++)
        {
            double x = Math.Abs(a[i]), y = Math.Abs(b[i]);
            if (double.IsFinite(x) && double.IsFinite(y) && y > 0 && x > 0 && x >= RatioFloor * max)
            {
                ratios.Add(x / y);
            }
        }
        used = ratios.Count;
        if (used < 3)
        {
            return false;
        }
        ratios.Sort();
        median = used % 2 == 1 ? ratios[used / 2] : 0.5 * (ratios[(used / 2) - 1] + ratios[used / 2]);
        spread = Math.Max(ratios[^1] / median - 1, 1 - ratios[0] / median);
        return true;
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
