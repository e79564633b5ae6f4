namespace JunctionFit.Physics;

/// <summary>
/// Fowler–Nordheim tunnelling through a triangular barrier at high field.
/// <para>
/// J = a F² exp(−B / F),  F = |V| / d,  a = e³ mₑ / (8π h φ m*),  B = 8π √(2m*) φ^{3/2} / (3 h e) = 4 √(2m*) φ^{3/2} / (3 ħ e),
/// with the sign of V. The Fowler–Nordheim plot ln(J/F²) against 1/F is a straight line of slope −B.
/// </para>
/// <para>
/// Symbols: φ barrier height at the injecting interface (J), d thickness (m), r = m*/mₑ, F field (V/m), J in A/m², B in V/m.
/// Source: M. Lenzlinger, E. H. Snow, J. Appl. Phys. 40, 278 (1969) (image-force lowering and temperature neglected).
/// Valid for e|V| &gt; φ (the far barrier edge lies below the Fermi level of the injecting electrode).
/// </para>
/// <para>
/// Derivatives: ln J = ln a + 2 ln F − B/F with a ∝ 1/(rφ), B ∝ √r φ^{3/2}, F ∝ 1/d:
/// ∂J/∂φ = J (−1/φ − 3B/(2φF)), ∂J/∂d = J (−2/d − B/(F d)), ∂J/∂r = J (−1/r − B/(2rF)), ∂J/∂V = J (2 + B/F) / |V|·sign.
/// </para>
/// </summary>
public sealed class FowlerNordheimModel : IBarrierModel, IBiasDerivative, IThermalDecay
{
    /// <summary>Index of φ in the parameter vector.</summary>
    public const int BarrierHeightIndex = 0;

    /// <summary>Index of d in the parameter vector.</summary>
    public const int ThicknessIndex = 1;

    /// <summary>Index of m*/mₑ in the parameter vector.</summary>
    public const int MassRatioIndex = 2;

    private const double E = PhysicalConstants.ElementaryChargeC;

    /// <summary>e³ / (8π h) in A J V⁻² (times mₑ/(m* φ) gives a).</summary>
    private const double PrefactorConstant = E * E * E / (8.0 * Math.PI * PhysicalConstants.PlanckJs);

    /// <summary>The shared instance (the model holds no state).</summary>
    public static FowlerNordheimModel Instance { get; } = new();

    /// <inheritdoc />
    public string Name => "fowler-nordheim";

    /// <inheritdoc />
    public string Description => "Fowler-Nordheim tunnelling through a triangular barrier (M. Lenzlinger, E. H. Snow, J. Appl. Phys. 40, 278, 1969)";

    /// <inheritdoc />
    public string ValidityRange => "high-field (Fowler-Nordheim) tunnelling for e|V| > phi; the points below eV = phi follow direct tunnelling instead";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; } = StandardParameters.BarrierHeightThicknessMass;

    /// <summary>The Fowler–Nordheim slope constant B in V/m: B = 4 √(2 r mₑ) φ^{3/2} / (3 ħ e).</summary>
    /// <param name="barrierHeightJ">φ in joule.</param>
    /// <param name="massRatio">m*/mₑ.</param>
    public static double SlopeConstant(double barrierHeightJ, double massRatio)
        => 4.0 * Math.Sqrt(2.0 * massRatio * PhysicalConstants.ElectronMassKg) * barrierHeightJ * Math.Sqrt(barrierHeightJ)
           / (3.0 * PhysicalConstants.ReducedPlanckJs * E);

    /// <summary>The barrier height in joule that gives the Fowler–Nordheim slope constant <paramref name="slopeConstantVPerM"/> (inverse of <see cref="SlopeConstant"/>).</summary>
    /// <param name="slopeConstantVPerM">B in V/m (the negative of the plot's slope).</param>
    /// <param name="massRatio">m*/mₑ.</param>
    public static double BarrierHeightFromSlopeConstant(double slopeConstantVPerM, double massRatio)
        => Math.Pow(slopeConstantVPerM * 3.0 * PhysicalConstants.ReducedPlanckJs * E
                    / (4.0 * Math.Sqrt(2.0 * massRatio * PhysicalConstants.ElectronMassKg)), 2.0 / 3.0);

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters) => Evaluate(voltageV, parameters, default);

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient) => Evaluate(voltageV, parameters, gradient);

    private static double Evaluate(double voltageV, ReadOnlySpan<double> p, Span<double> gradient)
    {
        double phi = p[BarrierHeightIndex], d = p[ThicknessIndex], r = p[MassRatioIndex];
        double f = Math.Abs(voltageV) / d;
        double b = SlopeConstant(phi, r);
        if (f == 0 || b / f > 700.0)
        {
            if (!gradient.IsEmpty) gradient[..3].Clear();
            return 0.0;
        }
        double j = PrefactorConstant / (r * phi) * f * f * Math.Exp(-b / f);
        if (voltageV < 0) j = -j;
        if (!gradient.IsEmpty)
        {
            gradient[BarrierHeightIndex] = j * (-1.0 / phi - 1.5 * b / (phi * f));
            gradient[ThicknessIndex] = j * (-2.0 / d - b / (f * d));
            gradient[MassRatioIndex] = j * (-1.0 / r - 0.5 * b / (r * f));
        }
        return j;
    }

    /// <inheritdoc />
    double IBiasDerivative.CurrentDensityBiasDerivative(double voltageV, ReadOnlySpan<double> p)
    {
        if (voltageV == 0) return 0.0;
        double j = Evaluate(voltageV, p, default);
        double f = Math.Abs(voltageV) / p[ThicknessIndex];
        double b = SlopeConstant(p[BarrierHeightIndex], p[MassRatioIndex]);
        return j * (2.0 + b / f) / voltageV;
    }

    /// <summary>
    /// c = 2 √(2m* φ) / (ħ e F): the energy derivative of the triangular-barrier exponent at the Fermi level
    /// (E. L. Murphy, R. H. Good, Phys. Rev. 102, 1464, 1956; used by Lenzlinger and Snow for the temperature dependence).
    /// </summary>
    double IThermalDecay.EnergyDecay(double voltageV, ReadOnlySpan<double> p, Span<double> gradient)
    {
        double phi = p[BarrierHeightIndex], d = p[ThicknessIndex], r = p[MassRatioIndex];
        double f = Math.Max(Math.Abs(voltageV), 1e-6) / d;
        double c = 2.0 * Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg * phi) / (PhysicalConstants.ReducedPlanckJs * E * f);
        gradient[BarrierHeightIndex] = c / (2.0 * phi);
        gradient[ThicknessIndex] = c / d;
        gradient[MassRatioIndex] = c / (2.0 * r);
        return c;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phiEv = parameters[BarrierHeightIndex] / PhysicalConstants.JoulePerElectronVolt;
        if (maxAbsVoltageV <= phiEv)
        {
            warnings.Add($"the sweep stays below |V| = {maxAbsVoltageV:0.###} V while the fitted barrier height is {phiEv:0.###} eV: " +
                         "Fowler-Nordheim tunnelling needs eV > phi, so the whole fitted range is direct tunnelling; use simmons, bdr or wkb");
        }
        else
        {
            warnings.Add($"Fowler-Nordheim describes only the points with |V| > {phiEv:0.###} V (eV > phi); mask the lower-bias points or expect a poor fit there");
        }
        return warnings;
    }
}
