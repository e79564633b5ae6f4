using System.Collections.Immutable;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Fitting;

/// <summary>
/// The default bias branch of a <c>mos</c> fit: the points in the inversion polarity of the substrate (V_g &gt; 0 on a p substrate,
/// V_g &lt; 0 on an n substrate) whose gate current lies within <see cref="DecadesBelowMaximum"/> decades of the largest one of that
/// polarity. The rest (accumulation and depletion, and the subthreshold and floor region where overlap, trap-assisted and
/// instrument currents dominate) is left out through the curve's point mask, and a warning says so.
/// Pure computation.
/// </summary>
public static class MosBranch
{
    /// <summary>Decades of gate current below the largest that are fitted (common practice, no source: the top three decades
    /// of a gate-current sweep are tunnelling from a strong inversion layer).</summary>
    public const double DecadesBelowMaximum = 3.0;

    /// <summary>The curve with the points outside the default branch masked, and a warning; the curve itself when nothing is masked.</summary>
    /// <param name="curve">The measured curve.</param>
    /// <param name="model">The MOS model (its substrate sets the polarity).</param>
    /// <param name="decades">Decades of current below the largest that are kept (default <see cref="DecadesBelowMaximum"/>).</param>
    public static IvCurve Select(IvCurve curve, MosGateStackModel model, double decades = DecadesBelowMaximum)
    {
        ArgumentNullException.ThrowIfNull(curve);
        ArgumentNullException.ThrowIfNull(model);
        int sign = model.InversionSign, n = curve.Count;
        double max = 0;
        for (int i = 0; i < n; i++)
        {
            double v = curve.VoltageV[i], c = curve.CurrentA[i];
            if (Math.Sign(v) == sign && Math.Sign(c) == sign && double.IsFinite(c)) max = Math.Max(max, Math.Abs(c));
        }
        double threshold = max * Math.Pow(10.0, -Common.Guard.Positive(decades));
        var mask = ImmutableArray.CreateBuilder<bool>(n);
        int outside = 0;
        for (int i = 0; i < n; i++)
        {
            bool flagged = curve.ImportMask.Length == n && curve.ImportMask[i];
            double v = curve.VoltageV[i], c = curve.CurrentA[i];
            bool inBranch = Math.Sign(v) == sign && Math.Abs(c) >= threshold && max > 0;
            if (!flagged && !inBranch && v != 0) outside++;
            mask.Add(flagged || !inBranch);
        }
        if (outside == 0) return curve;
        string polarity = sign > 0 ? "V_g > 0 (p substrate)" : "V_g < 0 (n substrate)";
        string note = $"mos: fitted the inversion branch, {polarity}, where the gate current lies within {decades:0.#} decades of its largest value; " +
                      $"{outside} point(s) outside it are left out (reported as flagged by the importer)";
        return curve with { ImportMask = mask.MoveToImmutable(), Warnings = curve.Warnings.Add(note) };
    }
}
