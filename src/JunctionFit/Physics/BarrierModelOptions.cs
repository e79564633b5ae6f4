using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>
/// Options fixed when a barrier model is built by <see cref="BarrierModelCatalog.Create"/>. Immutable; every value is
/// validated when it is set.
/// </summary>
public sealed record BarrierModelOptions
{
    /// <summary>The defaults: no temperature (0 K forms), ε_r = 3.9, E_F = 5.5 eV, no image force in <c>wkb</c>.</summary>
    public static BarrierModelOptions Default { get; } = new();

    /// <summary>
    /// Sample temperature in kelvin, or null for the zero-temperature forms. For the analytic models a positive temperature
    /// applies the thermal factor πckT / sin(πckT); <c>wkb</c> uses it in its Fermi functions.
    /// </summary>
    public double? TemperatureK
    {
        get;
        init => field = value is { } t ? Guard.NonNegative(t, nameof(TemperatureK)) : null;
    }

    /// <summary>Relative permittivity ε_r for the image force (start or fixed value of <c>relative_permittivity</c>, and the <c>wkb</c> image force); at least 1.</summary>
    public double RelativePermittivity
    {
        get;
        init => field = Guard.AtLeast(value, 1.0);
    } = 3.9;

    /// <summary>Fermi energy of the electrodes in eV above their conduction-band bottom (start or fixed value of <c>fermi_energy_eV</c> in <c>wkb</c>).</summary>
    public double FermiEnergyEv
    {
        get;
        init => field = Guard.Positive(value);
    } = 5.5;

    /// <summary>The gate stack of the <c>mos</c> model (substrate, gate, doping); the defaults: p substrate, n⁺ poly gate.</summary>
    public MosStackOptions Mos { get; init => field = value ?? throw new ArgumentNullException(nameof(Mos)); } = MosStackOptions.Default;

    /// <summary>True to add the classical image potential to the <c>wkb</c> barrier profile.</summary>
    public bool IncludeImageForce { get; init; }

    /// <summary>Relative error target of the adaptive quadrature in <c>wkb</c>, between 1e-12 and 1e-3.</summary>
    public double QuadratureRelativeTolerance
    {
        get;
        init => field = Guard.InRange(value, 1e-12, 1e-3);
    } = 1e-9;
}
