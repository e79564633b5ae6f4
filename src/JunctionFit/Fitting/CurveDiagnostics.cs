using JunctionFit.Common;
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

    /// <summary>Points searched on either side of a candidate for its repeat at the same bias (keeps the search O(n)).</summary>
    private const int RepeatSearchSpan = 4096;

    /// <summary>
    /// Indices of settling artefacts. Candidates are the first point of the sweep and every point that follows a zero-bias
    /// reading (where an instrument drops to its most sensitive range and must settle again on the next step). A candidate
    /// is compared with its nearest repeat at the same bias elsewhere in the sweep; it is an artefact when |ln(I/I_repeat)|
    /// exceeds 20 % and <see cref="SettlingContrast"/> times the largest such discrepancy of the next three points.
    /// </summary>
    public static int[] SettlingPoints(ReadOnlySpan<double> v, ReadOnlySpan<double> c, double step)
    {
        int n = v.Length;
        if (n < 8 || !(step > 0)) return [];
        double tol = 1e-3 * step;
        List<int>? result = null;
        int firstOff = -1;
        for (int i = 0; i < n; i++) if (double.IsFinite(v[i]) && Math.Abs(v[i]) > tol) { firstOff = i; break; }
        for (int j = Math.Max(firstOff, 0); j < n; j++)
        {
            if (!double.IsFinite(v[j]) || Math.Abs(v[j]) <= tol) continue;
            bool candidate = j == firstOff || (j > 0 && double.IsFinite(v[j - 1]) && Math.Abs(v[j - 1]) <= tol);
            if (!candidate) continue;
            double first = RepeatDiscrepancy(v, c, j, tol);
            if (!double.IsFinite(first) || first < SettlingMinimumLogRatio) continue;
            double reference = 0;
            int compared = 0;
            for (int k = j + 1; k < Math.Min(j + 4, n); k++)
            {
                if (!double.IsFinite(v[k]) || Math.Abs(v[k]) <= tol) break;
                double d = RepeatDiscrepancy(v, c, k, tol);
                if (double.IsFinite(d)) { reference = Math.Max(reference, d); compared++; }
            }
            if (compared > 0 && first > SettlingContrast * reference) (result ??= []).Add(j);
        }
        return result is null ? [] : result.ToArray();
    }

    /// <summary>Point k repeats point i: the same bias within tol, a finite current of the same sign.</summary>
    private static bool IsRepeat(ReadOnlySpan<double> v, ReadOnlySpan<double> c, int i, int k, double tol)
        => Math.Abs(v[k] - v[i]) <= tol && c[k] != 0 && Math.Sign(c[k]) == Math.Sign(c[i]) && double.IsFinite(c[k]);

    /// <summary>|ln|I_i| − ln|I_k||, k the nearest other point in time at the same bias with a same-sign current; NaN if none.</summary>
    private static double RepeatDiscrepancy(ReadOnlySpan<double> v, ReadOnlySpan<double> c, int i, double tol)
    {
        if (c[i] == 0 || !double.IsFinite(c[i])) return double.NaN;
        // Nearest first, the later point before the earlier at equal distance; the search stops where both sides run out.
        int span = Math.Min(RepeatSearchSpan, Math.Max(i, v.Length - 1 - i));
        for (int offset = 1; offset <= span; offset++)
        {
            int k = i + offset;
            if (k < v.Length && IsRepeat(v, c, i, k, tol)) return Math.Abs(Math.Log(Math.Abs(c[i] / c[k])));
            k = i - offset;
            if (k >= 0 && IsRepeat(v, c, i, k, tol)) return Math.Abs(Math.Log(Math.Abs(c[i] / c[k])));
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
                  $"down at a few volts); if the voltage column is in mV, give {new Remedy(RemedyKind.VoltageUnit, "mV")}");
        }
        if (maxAbsI > ImplausibleCurrentA)
        {
            w.Add($"likely unit mistake: the current reaches {maxAbsI:G4} A, more than a probed die passes (instruments clamp far lower); " +
                  $"if the current column is in mA, µA or nA, give {new Remedy(RemedyKind.CurrentUnit, "mA")} (or uA, nA)");
        }
        return w;
    }
}
