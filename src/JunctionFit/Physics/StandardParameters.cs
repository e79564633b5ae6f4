namespace JunctionFit.Physics;

/// <summary>Definitions shared by several models, so that keys and bounds agree everywhere.</summary>
public static class StandardParameters
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;

    /// <summary>Barrier height φ: key <c>barrier_height_eV</c>, SI joule, bounds 0 &lt; φ ≤ 20 eV.</summary>
    public static ParameterDefinition BarrierHeight { get; } = new(
        ParameterKey.BarrierHeight, "φ", "barrier height", 2.0 * PhysicalConstants.JoulePerElectronVolt, ParameterTransform.Log, false);

    /// <summary>
    /// Mean barrier height φ̄ = (φ_bottom + φ_top)/2 of an asymmetric barrier: same key, unit and bounds as
    /// <see cref="BarrierHeight"/> (<c>barrier_height_eV</c>), so that results of all models line up.
    /// </summary>
    public static ParameterDefinition MeanBarrierHeight { get; } = BarrierHeight with
    {
        Symbol = "φ̄",
        Description = "mean barrier height (average of the heights at the two interfaces)",
    };

    /// <summary>Barrier thickness d: key <c>thickness_nm</c>, SI metre, bounds 0 &lt; d ≤ 100 nm.</summary>
    public static ParameterDefinition Thickness { get; } = new(
        ParameterKey.Thickness, "d", "barrier thickness", 1.5e-9, ParameterTransform.Log, false);

    /// <summary>Effective mass ratio m*/mₑ: key <c>mass_ratio</c>, fixed at 1 unless freed.</summary>
    public static ParameterDefinition MassRatio { get; } = new(
        ParameterKey.MassRatio, "m*/mₑ", "effective mass ratio", 1.0, ParameterTransform.Log, true);

    /// <summary>Effective conducting area: key <c>area_m2</c>, SI m², 0 &lt; area.</summary>
    public static ParameterDefinition Area { get; } = new(
        ParameterKey.Area, "A", "effective area", 1e-10, ParameterTransform.Log, false);

    /// <summary>
    /// Barrier asymmetry Δφ = φ_top − φ_bottom: key <c>asymmetry_eV</c>, SI joule, −10 eV &lt; Δφ &lt; 10 eV, start 0.
    /// φ_top is the barrier height at the interface with the top electrode, the electrode whose potential is the bias V;
    /// φ_bottom the height at the grounded (bottom) electrode. Δφ &gt; 0 makes |I(−V)| &gt; |I(+V)| at low bias.
    /// </summary>
    public static ParameterDefinition Asymmetry { get; } = new(
        ParameterKey.Asymmetry, "Δφ", "barrier asymmetry, top interface minus bottom interface", 0.0, ParameterTransform.Logistic, false);

    /// <summary>Relative permittivity ε_r of the barrier for the image force: key <c>relative_permittivity</c>, fixed by default.</summary>
    public static ParameterDefinition RelativePermittivity { get; } = new(
        ParameterKey.RelativePermittivity, "ε_r", "relative permittivity of the barrier seen by the image charge", 3.9, ParameterTransform.Logistic, true);

    /// <summary>Fermi energy E_F of the electrodes above their conduction-band bottom: key <c>fermi_energy_eV</c>, fixed by default.</summary>
    public static ParameterDefinition FermiEnergy { get; } = new(
        ParameterKey.FermiEnergy, "E_F", "Fermi energy of the electrodes", 5.5 * Ev, ParameterTransform.Log, true);

    /// <summary>Series resistance R_s: key <c>series_resistance_ohm</c>, SI ohm, R_s &gt; 0.</summary>
    public static ParameterDefinition SeriesResistance { get; } = new(
        ParameterKey.SeriesResistance, "R_s", "series resistance (leads, contacts, electrodes)", 1.0, ParameterTransform.Log, false);

    /// <summary>Parallel leakage conductance G_leak: key <c>leakage_conductance_S</c>, SI siemens, G &gt; 0.</summary>
    public static ParameterDefinition LeakageConductance { get; } = new(
        ParameterKey.LeakageConductance, "G_leak", "parallel leakage conductance", 1e-12, ParameterTransform.Log, false);

    /// <summary>Instrument voltage offset V₀: key <c>voltage_offset_V</c>, SI volt, start 0, unbounded.</summary>
    public static ParameterDefinition VoltageOffset { get; } = new(
        ParameterKey.VoltageOffset, "V₀", "instrument voltage offset", 0.0, ParameterTransform.Identity, false);

    /// <summary>Instrument current offset I₀: key <c>current_offset_A</c>, SI ampere, start 0, unbounded.</summary>
    public static ParameterDefinition CurrentOffset { get; } = new(
        ParameterKey.CurrentOffset, "I₀", "instrument current offset", 0.0, ParameterTransform.Identity, false);

    /// <summary>φ, d, m*/mₑ in that order.</summary>
    public static IReadOnlyList<ParameterDefinition> BarrierHeightThicknessMass { get; } =
        [BarrierHeight, Thickness, MassRatio];
}
