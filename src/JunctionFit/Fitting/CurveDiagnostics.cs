namespace JunctionFit.Fitting;

/// <summary>
/// Model-free diagnoses of a measured curve: the settling artefact at the start of a trace, the sweep direction of every
/// point, a straight-line (ohmic) test, an open-circuit test and plausibility of the units. Pure computation; O(n).
/// </summary>
internal static class CurveDiagnostics
{
    /// <summary>Smallest discrepancy (20 % in current) for a settling artefact (common practice, no source).</summary>
    public const double SettlingMinimumLogRatio = 0.18232155679395462; // ln 1.2

    /// <summary>A settling artefact must exceed this many times the discrepancy of the points after it.</summary>
    public const double SettlingContrast = 3.0;

    /// <summary>|V| beyond which the bias is implausible for a tunnel junction or thin oxide (common practice, no source).</summary>
    public const double ImplausibleBiasV = 50.0;

    /// <summary>|I| beyond which the current is implausible for a probed die (common practice, no source).</summary>
    public const double ImplausibleCurrentA = 0.1;

    /// <summary>Resistance below which an ohmic die is called shorted (common practice, no source).</summary>
    public const double ShortResistanceOhm = 100.0;

    /// <summary>Largest RMS deviation of ln|I/V| for a curve to count as a straight line, beside the noise (common practice, no source).</summary>
    public const double OhmicLogTolerance = 0.02;

    /// <summary>
    /// Indices of settling artefacts: at the start of each trace (the first point and every return to the start bias that is
    /// followed by a departure in the first direction), the first point off the start bias is compared with its repeat at
    /// the same bias later in the trace; it is an artefact when |ln(I/I_repeat)| exceeds 20 % and
    /// <see cref="SettlingContrast"/> times the largest such discrepancy of the next three points.
    /// </summary>
    public static int[] SettlingPoints(ReadOnlySpan<double> v, ReadOnlySpan<double> c, double step)
    {
        int n = v.Length;
        if (n < 8 || !(step > 0)) return [];
        double tol = 1e-3 * step;
        double v0 = v[0];
        if (!double.IsFinite(v0)) return [];
        int firstOff = -1;
        for (int i = 1; i < n; i++) if (double.IsFinite(v[i]) && Math.Abs(v[i] - v0) > tol) { firstOff = i; break; }
        if (firstOff < 0) return [];
        int direction = Math.Sign(v[firstOff] - v0);
        var starts = new List<int> { firstOff };
        for (int i = firstOff + 1; i < n - 1; i++)
        {
            if (Math.Abs(v[i] - v0) <= tol && Math.Abs(v[i + 1] - v0) > tol && Math.Sign(v[i + 1] - v0) == direction)
            {
                starts.Add(i + 1);
            }
        }
        var result = new List<int>();
        for (int s = 0; s < starts.Count; s++)
        {
            int begin = starts[s], end = s + 1 < starts.Count ? starts[s + 1] : n;
            double first = RepeatDiscrepancy(v, c, begin, begin + 1, end, tol);
            if (!double.IsFinite(first) || first < SettlingMinimumLogRatio) continue;
            double reference = 0;
            int compared = 0;
            for (int j = begin + 1; j < Math.Min(begin + 4, end); j++)
            {
                double d = RepeatDiscrepancy(v, c, j, j + 1, end, tol);
                if (double.IsFinite(d)) { reference = Math.Max(reference, d); compared++; }
            }
            if (compared > 0 && first > SettlingContrast * reference) result.Add(begin);
        }
        return result.ToArray();
    }

    /// <summary>|ln|I_i| − ln|I_k||, k the first later point in [from, end) at the same bias with a same-sign current; NaN if none.</summary>
    private static double RepeatDiscrepancy(ReadOnlySpan<double> v, ReadOnlySpan<double> c, int i, int from, int end, double tol)
    {
        if (c[i] == 0 || !double.IsFinite(c[i])) return double.NaN;
        for (int k = from; k < end; k++)
        {
            if (Math.Abs(v[k] - v[i]) <= tol && c[k] != 0 && Math.Sign(c[k]) == Math.Sign(c[i]) && double.IsFinite(c[k]))
            {
                return Math.Abs(Math.Log(Math.Abs(c[i] / c[k])));
            }
        }
        return double.NaN;
    }

    /// <summary>
    /// Sweep direction of every point: +1 while the bias rises, −1 while it falls (a turning point belongs to the sweep that
    /// ends there), 0 when the bias never changes.
    /// </summary>
    public static sbyte[] Directions(ReadOnlySpan<double> v)
    {
        int n = v.Length;
        var dir = new sbyte[n];
        sbyte last = 0;
        for (int i = 1; i < n; i++)
        {
            if (v[i] > v[i - 1]) last = 1;
            else if (v[i] < v[i - 1]) last = -1;
            dir[i] = last;
        }
        // The first points take the direction of the first move.
        sbyte firstMove = 0;
        for (int i = 1; i < n && firstMove == 0; i++) firstMove = dir[i];
        for (int i = 0; i < n && (i == 0 || v[i] == v[0]); i++) dir[i] = firstMove;
        return dir;
    }

    /// <summary>
    /// Straight-line test on the used points: the weighted mean and RMS of ln|I/V| (a resistor has I/V constant).
    /// Returns the conductance G = exp(mean) in siemens and the RMS deviation.
    /// </summary>
    public static (double ConductanceS, double LogRms) StraightLine(ReadOnlySpan<double> v, ReadOnlySpan<double> logAbsCurrent, ReadOnlySpan<double> inverseSigma)
    {
        double sw = 0, swg = 0;
        for (int i = 0; i < v.Length; i++)
        {
            double w = inverseSigma[i] * inverseSigma[i];
            sw += w;
            swg += w * (logAbsCurrent[i] - Math.Log(Math.Abs(v[i])));
        }
        if (!(sw > 0)) return (double.NaN, double.NaN);
        double mean = swg / sw, ss = 0;
        for (int i = 0; i < v.Length; i++)
        {
            double w = inverseSigma[i] * inverseSigma[i];
            double d = logAbsCurrent[i] - Math.Log(Math.Abs(v[i])) - mean;
            ss += w * d * d;
        }
        return (Math.Exp(mean), Math.Sqrt(ss / sw));
    }

    /// <summary>Largest |V| and |I| among the finite points.</summary>
    public static (double MaxAbsV, double MaxAbsI) Extremes(ReadOnlySpan<double> v, ReadOnlySpan<double> c)
    {
        double mv = 0, mi = 0;
        for (int i = 0; i < v.Length; i++)
        {
            if (double.IsFinite(v[i])) mv = Math.Max(mv, Math.Abs(v[i]));
            if (double.IsFinite(c[i])) mi = Math.Max(mi, Math.Abs(c[i]));
        }
        return (mv, mi);
    }

    /// <summary>Warnings about units that are implausible for a probed tunnel junction or thin oxide.</summary>
    public static List<string> UnitWarnings(double maxAbsV, double maxAbsI)
    {
        var w = new List<string>();
        if (maxAbsV > ImplausibleBiasV)
        {
            w.Add($"likely unit mistake: the bias reaches {maxAbsV:G4} V, far beyond any tunnel barrier or thin oxide (a few-nm oxide breaks " +
                  "down at a few volts); if the voltage column is in mV, give --voltage-unit mV");
        }
        if (maxAbsI > ImplausibleCurrentA)
        {
            w.Add($"likely unit mistake: the current reaches {maxAbsI:G4} A, more than a probed die passes (instruments clamp far lower); " +
                  "if the current column is in mA, µA or nA, give --current-unit mA (or uA, nA)");
        }
        return w;
    }
}
