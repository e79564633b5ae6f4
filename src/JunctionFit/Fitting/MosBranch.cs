using JunctionFit.Common;
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

    /// <summary>
    /// The default branch as a bias window: from the smallest to the largest |V_g| of the inversion polarity at which the gate
    /// current lies within <paramref name="decades"/> of its largest value (the gate current rises monotonically with |V_g| in
    /// inversion, so the branch is one interval). Null when the curve has no current of the inversion polarity.
    /// </summary>
    /// <param name="curve">The measured curve.</param>
    /// <param name="model">The MOS model (its substrate sets the polarity).</param>
    /// <param name="decades">Decades of current below the largest that are kept.</param>
    public static (double LowV, double HighV)? Window(IvCurve curve, MosGateStackModel model, double decades = DecadesBelowMaximum)
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
        if (!(max > 0)) return null;
        double threshold = max * Math.Pow(10.0, -Common.Guard.Positive(decades));
        double nearest = double.PositiveInfinity;
        for (int i = 0; i < n; i++)
        {
            double v = curve.VoltageV[i], c = curve.CurrentA[i];
            if (Math.Sign(v) == sign && Math.Sign(c) == sign && Math.Abs(c) >= threshold) nearest = Math.Min(nearest, Math.Abs(v));
        }
        return sign > 0 ? (nearest, double.PositiveInfinity) : (double.NegativeInfinity, -nearest);
    }

    /// <summary>
    /// Applies the default branch when the options give no bias window: the options with the window of
    /// <see cref="Window"/>, and the curve with a warning that says so. Otherwise both unchanged.
    /// </summary>
    /// <param name="curve">The measured curve.</param>
    /// <param name="model">The MOS model.</param>
    /// <param name="options">The fit options.</param>
    /// <param name="decades">Decades of current below the largest that are kept.</param>
    public static (IvCurve Curve, FitOptions Options) Apply(IvCurve curve, MosGateStackModel model, FitOptions options, double decades = DecadesBelowMaximum)
    {
        ArgumentNullException.ThrowIfNull(options);
        if (options.BiasWindowLowV is not null || options.BiasWindowHighV is not null) return (curve, options);
        if (Window(curve, model, decades) is not (double low, double high)) return (curve, options);
        string range = model.InversionSign > 0 ? $"V_g ≥ {low:0.###} V (p substrate)" : $"V_g ≤ {high:0.###} V (n substrate)";
        string note = $"mos: fitted the inversion branch, {range}, where the gate current lies within {decades:0.#} decades of its largest value " +
                      $"(below it overlap, trap-assisted and instrument currents dominate); choose another branch with {Remedy.BiasWindow} or {new Remedy(RemedyKind.Polarity)}";
        var windowed = options with
        {
            BiasWindowLowV = double.IsFinite(low) ? low : null,
            BiasWindowHighV = double.IsFinite(high) ? high : null,
        };
        return (curve with { Warnings = curve.Warnings.Add(note) }, windowed);
    }
}
