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
/// A named model parameter. Values inside the library are SI; <see cref="DisplayPerSi"/> converts to the
/// unit in <see cref="Key"/> (for example <c>barrier_height_eV</c> holds eV = J / e).
/// </summary>
/// <param name="Key">Stable machine name, also the JSON key, with its unit (for example <c>thickness_nm</c>).</param>
/// <param name="Symbol">Symbol for plots and reports (for example φ).</param>
/// <param name="Description">Words for a report.</param>
/// <param name="DisplayUnit">Unit of the displayed value (for example eV).</param>
/// <param name="DisplayPerSi">Factor from the SI value to the displayed value.</param>
/// <param name="LowerSi">Physical lower bound in SI (exclusive for log-transformed parameters).</param>
/// <param name="UpperSi">Physical upper bound in SI (may be +∞).</param>
/// <param name="DefaultSi">Start or fixed value in SI when nothing better is known.</param>
/// <param name="Transform">Bound enforcement used by the fitter.</param>
/// <param name="FixedByDefault">True when the parameter is held fixed unless freed explicitly (for example the mass ratio).</param>
public sealed record ParameterDefinition(
    string Key,
    string Symbol,
    string Description,
    string DisplayUnit,
    double DisplayPerSi,
    double LowerSi,
    double UpperSi,
    double DefaultSi,
    ParameterTransform Transform,
    bool FixedByDefault)
{
    /// <summary>Converts an SI value to the display unit.</summary>
    public double ToDisplay(double si) => si * DisplayPerSi;

    /// <summary>Converts a display-unit value to SI.</summary>
    public double FromDisplay(double display) => display / DisplayPerSi;
}
