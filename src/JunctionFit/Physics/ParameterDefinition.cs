namespace JunctionFit.Physics;

/// <summary>How the fitter maps a bounded physical parameter onto an unbounded solver variable.</summary>
public enum ParameterTransform
{
    /// <summary>No bounds: the solver variable is the parameter.</summary>
    Identity,

    /// <summary>Positive quantity: x = ln(p), so p = eˣ &gt; 0 always.</summary>
    Log,

    /// <summary>Two-sided bounds: p = lo + (hi − lo) / (1 + e⁻ˣ).</summary>
    Logistic,
}

/// <summary>
/// A model parameter: its identity <see cref="Id"/> (name, SI and display units, physical bounds), symbol and words for
/// reports, start value and bound transform. Values inside the library are SI; <see cref="DisplayPerSi"/> converts to the
/// unit in <see cref="Key"/> (for example <c>barrier_height_eV</c> holds eV = J / e). <see cref="LowerSi"/> and
/// <see cref="UpperSi"/> are the bounds of the fit: the key's physical ones unless narrowed (<see cref="WithBounds"/>).
/// </summary>
/// <param name="Id">The parameter's key: name, units, physical bounds.</param>
/// <param name="Symbol">Symbol for plots and reports (for example φ).</param>
/// <param name="Description">Words for a report.</param>
/// <param name="DefaultSi">Start or fixed value in SI when nothing better is known.</param>
/// <param name="Transform">Bound enforcement used by the fitter.</param>
/// <param name="FixedByDefault">True when the parameter is held fixed unless freed explicitly (for example the mass ratio).</param>
public sealed record ParameterDefinition(
    ParameterKey Id,
    string Symbol,
    string Description,
    double DefaultSi,
    ParameterTransform Transform,
    bool FixedByDefault)
{
    /// <summary>Stable machine name, also the JSON key, with its display unit (for example <c>thickness_nm</c>).</summary>
    public string Key => Id.Name;

    /// <summary>Unit of the displayed value (for example eV).</summary>
    public string DisplayUnit => Id.DisplayUnit;

    /// <summary>Factor from the SI value to the displayed value.</summary>
    public double DisplayPerSi => Id.DisplayPerSi;

    /// <summary>Lower bound of the fit in SI (exclusive for log-transformed parameters); the physical one by default.</summary>
    public double LowerSi { get; init; } = Id.LowerSi;

    /// <summary>Upper bound of the fit in SI (may be +∞); the physical one by default.</summary>
    public double UpperSi { get; init; } = Id.UpperSi;

    /// <summary>Converts an SI value to the display unit.</summary>
    public double ToDisplay(double si) => si * DisplayPerSi;

    /// <summary>Converts a display-unit value to SI.</summary>
    public double FromDisplay(double display) => display / DisplayPerSi;

    /// <summary>
    /// This parameter with its fit bounds narrowed to <paramref name="bounds"/> (intersected with the physical range): two
    /// finite ends use the logistic transform, a finite lower end alone the log transform θ = lo + eˣ.
    /// </summary>
    /// <param name="bounds">The bounds in SI.</param>
    /// <returns>The narrowed parameter.</returns>
    /// <exception cref="ArgumentException">The bounds leave nothing of the physical range, or give only an upper end to a
    /// parameter unbounded below.</exception>
    public ParameterDefinition WithBounds(ParameterBounds bounds)
    {
        ArgumentNullException.ThrowIfNull(bounds);
        double lo = Math.Max(LowerSi, bounds.LowerSi), hi = Math.Min(UpperSi, bounds.UpperSi);
        if (!(lo < hi)) throw new ArgumentException($"the bounds of {Key} leave nothing of its range", nameof(bounds));
        var transform = double.IsFinite(lo) && double.IsFinite(hi) ? ParameterTransform.Logistic
            : double.IsFinite(lo) ? ParameterTransform.Log
            : double.IsFinite(hi) ? throw new ArgumentException($"{Key} is unbounded below; give both ends", nameof(bounds))
            : Transform;
        double start = Math.Clamp(DefaultSi, lo, hi);
        if (!(start > lo && start < hi)) start = double.IsFinite(hi) ? lo + 0.5 * (hi - lo) : lo > 0 ? 2.0 * lo : lo + 1.0;
        return this with { LowerSi = lo, UpperSi = hi, Transform = transform, DefaultSi = start };
    }
}
