using System.Globalization;
using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>
/// The identity of a model parameter: its <see cref="Name"/> (the JSON key, which carries the display unit, for example
/// <c>thickness_nm</c>), the SI unit its values have inside the library (<see cref="SiUnit"/>, metre for the thickness), the
/// display unit of the name and the factor between the two, and the physical bounds in SI. Values keyed by a
/// <see cref="ParameterKey"/> (fixed values, start values, bounds in <c>FitOptions</c>) are always SI; they are converted to
/// the display unit once, at the edge (<see cref="ToDisplay"/>). Two keys are equal when their names are.
/// </summary>
public sealed class ParameterKey : IEquatable<ParameterKey>
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;

    /// <summary>Creates a key.</summary>
    /// <param name="name">JSON key with its display unit (for example <c>thickness_nm</c>).</param>
    /// <param name="siUnit">Unit of the values inside the library (for example m); empty for a pure number.</param>
    /// <param name="displayUnit">Unit of the name (for example nm); empty for a pure number.</param>
    /// <param name="displayPerSi">Display value per SI value (1e9 for nm per m), positive and finite.</param>
    /// <param name="lowerSi">Physical lower bound in SI (may be −∞).</param>
    /// <param name="upperSi">Physical upper bound in SI (may be +∞), above <paramref name="lowerSi"/>.</param>
    /// <exception cref="ArgumentException">The name is empty, the factor is not positive and finite, or the bounds are out of order or NaN.</exception>
    public ParameterKey(string name, string siUnit, string displayUnit, double displayPerSi, double lowerSi, double upperSi)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(name);
        ArgumentNullException.ThrowIfNull(siUnit);
        ArgumentNullException.ThrowIfNull(displayUnit);
        Guard.Positive(displayPerSi);
        if (!(lowerSi < upperSi)) throw new ArgumentException($"bounds of {name} must satisfy lower < upper", nameof(upperSi));
        Name = name;
        SiUnit = siUnit;
        DisplayUnit = displayUnit;
        DisplayPerSi = displayPerSi;
        LowerSi = lowerSi;
        UpperSi = upperSi;
    }

    /// <summary>JSON key, with the display unit in it (for example <c>thickness_nm</c>).</summary>
    public string Name { get; }

    /// <summary>Unit of the SI values inside the library (for example m); empty for a pure number.</summary>
    public string SiUnit { get; }

    /// <summary>Unit of displayed values, the one in <see cref="Name"/> (for example nm); empty for a pure number.</summary>
    public string DisplayUnit { get; }

    /// <summary>Display value per SI value.</summary>
    public double DisplayPerSi { get; }

    /// <summary>Physical lower bound in SI (exclusive for positive quantities).</summary>
    public double LowerSi { get; }

    /// <summary>Physical upper bound in SI (inclusive; may be +∞).</summary>
    public double UpperSi { get; }

    /// <summary>Converts an SI value to the display unit.</summary>
    /// <param name="si">Value in <see cref="SiUnit"/>.</param>
    /// <returns>Value in <see cref="DisplayUnit"/>.</returns>
    public double ToDisplay(double si) => si * DisplayPerSi;

    /// <summary>Converts a display-unit value to SI.</summary>
    /// <param name="display">Value in <see cref="DisplayUnit"/>.</param>
    /// <returns>Value in <see cref="SiUnit"/>.</returns>
    public double FromDisplay(double display) => display / DisplayPerSi;

    /// <summary>True when an SI value lies inside the physical range (lower bound exclusive, upper inclusive).</summary>
    /// <param name="si">Value in <see cref="SiUnit"/>.</param>
    /// <returns>Whether <paramref name="si"/> is physical.</returns>
    public bool Admits(double si) => si > LowerSi && si <= UpperSi;

    /// <summary>An SI value written in the display unit with its unit, for messages (for example <c>1.5 nm</c>).</summary>
    /// <param name="si">Value in <see cref="SiUnit"/>.</param>
    /// <returns>The text.</returns>
    public string Describe(double si)
        => (ToDisplay(si).ToString("G6", CultureInfo.InvariantCulture) + " " + DisplayUnit).TrimEnd();

    /// <inheritdoc/>
    public bool Equals(ParameterKey? other) => other is not null && string.Equals(Name, other.Name, StringComparison.Ordinal);

    /// <inheritdoc/>
    public override bool Equals(object? obj) => Equals(obj as ParameterKey);

    /// <inheritdoc/>
    public override int GetHashCode() => StringComparer.Ordinal.GetHashCode(Name);

    /// <summary>The <see cref="Name"/>.</summary>
    /// <returns>The JSON key.</returns>
    public override string ToString() => Name;

    /// <summary>Equal names.</summary>
    /// <param name="left">A key.</param>
    /// <param name="right">Another key.</param>
    /// <returns>Whether the names are equal.</returns>
    public static bool operator ==(ParameterKey? left, ParameterKey? right) => left is null ? right is null : left.Equals(right);

    /// <summary>Different names.</summary>
    /// <param name="left">A key.</param>
    /// <param name="right">Another key.</param>
    /// <returns>Whether the names differ.</returns>
    public static bool operator !=(ParameterKey? left, ParameterKey? right) => !(left == right);

    /// <summary>Barrier height φ: <c>barrier_height_eV</c>, SI joule, 0 &lt; φ ≤ 20 eV.</summary>
    public static ParameterKey BarrierHeight { get; } = new("barrier_height_eV", "J", "eV", 1.0 / Ev, 0.0, 20.0 * Ev);

    /// <summary>Barrier thickness d: <c>thickness_nm</c>, SI metre, 0 &lt; d ≤ 100 nm.</summary>
    public static ParameterKey Thickness { get; } = new("thickness_nm", "m", "nm", 1e9, 0.0, 100e-9);

    /// <summary>Effective mass ratio m*/mₑ: <c>mass_ratio</c>, a pure number, 0 &lt; m*/mₑ ≤ 10.</summary>
    public static ParameterKey MassRatio { get; } = new("mass_ratio", "", "", 1.0, 0.0, 10.0);

    /// <summary>Effective conducting area: <c>area_m2</c>, SI m², area &gt; 0 (shown in µm² by reports and accepted in µm² by the CLI).</summary>
    public static ParameterKey Area { get; } = new("area_m2", "m²", "m²", 1.0, 0.0, double.PositiveInfinity);

    /// <summary>Barrier asymmetry Δφ: <c>asymmetry_eV</c>, SI joule, −10 eV &lt; Δφ &lt; 10 eV.</summary>
    public static ParameterKey Asymmetry { get; } = new("asymmetry_eV", "J", "eV", 1.0 / Ev, -10.0 * Ev, 10.0 * Ev);

    /// <summary>Relative permittivity ε_r: <c>relative_permittivity</c>, a pure number, 1 &lt; ε_r ≤ 100.</summary>
    public static ParameterKey RelativePermittivity { get; } = new("relative_permittivity", "", "", 1.0, 1.0, 100.0);

    /// <summary>Fermi energy E_F: <c>fermi_energy_eV</c>, SI joule, 0 &lt; E_F ≤ 30 eV.</summary>
    public static ParameterKey FermiEnergy { get; } = new("fermi_energy_eV", "J", "eV", 1.0 / Ev, 0.0, 30.0 * Ev);

    /// <summary>Series resistance R_s: <c>series_resistance_ohm</c>, SI ohm, R_s &gt; 0.</summary>
    public static ParameterKey SeriesResistance { get; } = new("series_resistance_ohm", "Ω", "Ω", 1.0, 0.0, double.PositiveInfinity);

    /// <summary>Parallel leakage conductance G_leak: <c>leakage_conductance_S</c>, SI siemens, G &gt; 0.</summary>
    public static ParameterKey LeakageConductance { get; } = new("leakage_conductance_S", "S", "S", 1.0, 0.0, double.PositiveInfinity);

    /// <summary>Instrument voltage offset V₀: <c>voltage_offset_V</c>, SI volt, unbounded.</summary>
    public static ParameterKey VoltageOffset { get; } = new("voltage_offset_V", "V", "V", 1.0, double.NegativeInfinity, double.PositiveInfinity);

    /// <summary>Instrument current offset I₀: <c>current_offset_A</c>, SI ampere, unbounded.</summary>
    public static ParameterKey CurrentOffset { get; } = new("current_offset_A", "A", "A", 1.0, double.NegativeInfinity, double.PositiveInfinity);

    /// <summary>Flat-band voltage V_fb of the mos model: <c>flatband_voltage_V</c>, SI volt, −3 V &lt; V_fb &lt; 3 V.</summary>
    public static ParameterKey FlatBandVoltage { get; } = new("flatband_voltage_V", "V", "V", 1.0, -3.0, 3.0);

    /// <summary>Transition voltage V_t (a derived quantity, not fitted): <c>transition_voltage_V</c>, SI volt.</summary>
    public static ParameterKey TransitionVoltage { get; } = new("transition_voltage_V", "V", "V", 1.0, double.NegativeInfinity, double.PositiveInfinity);
}

/// <summary>
/// Fit bounds of one parameter in SI, inside its physical range (<see cref="ParameterKey.LowerSi"/>,
/// <see cref="ParameterKey.UpperSi"/>); an infinite end leaves that side at the physical bound.
/// </summary>
public sealed record ParameterBounds
{
    /// <summary>Creates bounds.</summary>
    /// <param name="lowerSi">Lower end in SI, or −∞ for the physical bound.</param>
    /// <param name="upperSi">Upper end in SI, or +∞ for the physical bound.</param>
    /// <exception cref="ArgumentException">An end is NaN, or lower ≥ upper.</exception>
    public ParameterBounds(double lowerSi, double upperSi)
    {
        if (double.IsNaN(lowerSi) || double.IsNaN(upperSi) || !(lowerSi < upperSi))
        {
            throw new ArgumentException($"bounds need lower < upper (got {lowerSi} and {upperSi})", nameof(upperSi));
        }
        LowerSi = lowerSi;
        UpperSi = upperSi;
    }

    /// <summary>Lower end in SI (−∞: the physical bound).</summary>
    public double LowerSi { get; }

    /// <summary>Upper end in SI (+∞: the physical bound).</summary>
    public double UpperSi { get; }
}
