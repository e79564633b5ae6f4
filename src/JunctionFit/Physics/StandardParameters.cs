namespace JunctionFit.Physics;

/// <summary>Definitions shared by several models, so that keys and bounds agree everywhere.</summary>
public static class StandardParameters
{
    /// <summary>Barrier height φ: key <c>barrier_height_eV</c>, SI joule, bounds 0 &lt; φ ≤ 20 eV.</summary>
    public static ParameterDefinition BarrierHeight { get; } = new(
        "barrier_height_eV", "φ", "barrier height", "eV", 1.0 / PhysicalConstants.JoulePerElectronVolt,
        0.0, 20.0 * PhysicalConstants.JoulePerElectronVolt, 2.0 * PhysicalConstants.JoulePerElectronVolt,
        ParameterTransform.Log, false);

    /// <summary>Barrier thickness d: key <c>thickness_nm</c>, SI metre, bounds 0 &lt; d ≤ 100 nm.</summary>
    public static ParameterDefinition Thickness { get; } = new(
        "thickness_nm", "d", "barrier thickness", "nm", 1e9,
        0.0, 100e-9, 1.5e-9, ParameterTransform.Log, false);

    /// <summary>Effective mass ratio m*/mₑ: key <c>mass_ratio</c>, fixed at 1 unless freed.</summary>
    public static ParameterDefinition MassRatio { get; } = new(
        "mass_ratio", "m*/mₑ", "effective mass ratio", "", 1.0,
        0.0, 10.0, 1.0, ParameterTransform.Log, true);

    /// <summary>Effective conducting area: key <c>area_m2</c>, SI m², 0 &lt; area.</summary>
    public static ParameterDefinition Area { get; } = new(
        "area_m2", "A", "effective area", "m²", 1.0,
        0.0, double.PositiveInfinity, 1e-10, ParameterTransform.Log, false);

    /// <summary>φ, d, m*/mₑ in that order.</summary>
    public static IReadOnlyList<ParameterDefinition> BarrierHeightThicknessMass { get; } =
        [BarrierHeight, Thickness, MassRatio];
}
