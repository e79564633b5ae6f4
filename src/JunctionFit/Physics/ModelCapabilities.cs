namespace JunctionFit.Physics;

/// <summary>
/// A barrier model that knows its bias derivative ∂J/∂V analytically. Used by <see cref="JunctionCurrentModel"/> for the
/// series-resistance solve and its implicit derivatives; models without it get a central difference.
/// </summary>
internal interface IBiasDerivative
{
    /// <summary>∂J/∂V in A m⁻² V⁻¹ at <paramref name="voltageV"/>.</summary>
    double CurrentDensityBiasDerivative(double voltageV, ReadOnlySpan<double> parameters);
}

/// <summary>
/// A barrier model that can state the energy decay constant c of its transmission at the Fermi level,
/// D(E_F − ε) ≈ D(E_F) e^{−c ε}, which sets the thermal factor πckT / sin(πckT) (Simmons 1964; Stratton 1962).
/// </summary>
internal interface IThermalDecay
{
    /// <summary>c in J⁻¹ at the bias, and ∂c/∂θₖ in <paramref name="gradient"/> (length ≥ parameter count).</summary>
    double EnergyDecay(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient);
}
