namespace JunctionFit.Physics;

/// <summary>
/// Simmons rectangular barrier at intermediate bias, β = 1.
/// <para>
/// J(V) = e / (2π h d²) · [ (φ − eV/2) exp(−A √(φ − eV/2)) − (φ + eV/2) exp(−A √(φ + eV/2)) ],
/// A = 4π d √(2 m*) / h = 2 d √(2 m*) / ħ, m* = r·mₑ.
/// </para>
/// <para>
/// Symbols: φ barrier height (J), d thickness (m), r = m*/mₑ (dimensionless), V bias (V), J in A/m².
/// The expression is odd in V. Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963), intermediate-voltage
/// range 0 ≤ eV &lt; φ. Beyond eV = 2φ the first square root would be imaginary; there the argument is
/// clamped at zero (continuous) and a validity warning is raised by <see cref="CheckValidity"/>.
/// </para>
/// <para>
/// Derivatives, with f(u) = u e^{−A√u}: ∂f/∂u = e^{−A√u}(1 − A√u/2), ∂f/∂A = −u^{3/2} e^{−A√u};
/// ∂J/∂φ = K/d² [f_u(a) − f_u(b)]; ∂J/∂d = −2J/d + K/d² (A/d)[f_A(a) − f_A(b)];
/// ∂J/∂r = K/d² (A/(2r))[f_A(a) − f_A(b)], with a = φ − eV/2, b = φ + eV/2, K = e/(2πh).
/// </para>
/// </summary>
public sealed class SimmonsRectangularModel : IBarrierModel
{
    /// <summary>Index of φ in the parameter vector.</summary>
    public const int BarrierHeightIndex = 0;

    /// <summary>Index of d in the parameter vector.</summary>
    public const int ThicknessIndex = 1;

    /// <summary>Index of m*/mₑ in the parameter vector.</summary>
    public const int MassRatioIndex = 2;

    private const double K = PhysicalConstants.ElementaryChargeC / (2.0 * Math.PI * PhysicalConstants.PlanckJs);

    /// <summary>2√(2mₑ)/ħ in m⁻¹ J^{-1/2}; A = this · d · √r.</summary>
    internal static readonly double DecayPrefactor = 2.0 * Math.Sqrt(2.0 * PhysicalConstants.ElectronMassKg) / PhysicalConstants.ReducedPlanckJs;

    /// <summary>The shared instance (the model holds no state).</summary>
    public static SimmonsRectangularModel Instance { get; } = new();

    /// <inheritdoc />
    public string Name => "simmons";

    /// <inheritdoc />
    public string Description => "Simmons rectangular barrier, intermediate bias, beta = 1 (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963)";

    /// <inheritdoc />
    public string ValidityRange => "direct tunnelling through a rectangular barrier for e|V| < phi (intermediate-voltage range)";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; } = StandardParameters.BarrierHeightThicknessMass;

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        double phi = parameters[BarrierHeightIndex];
        double d = parameters[ThicknessIndex];
        double r = parameters[MassRatioIndex];
        double aCoef = DecayPrefactor * d * Math.Sqrt(r);
        double half = 0.5 * PhysicalConstants.ElementaryChargeC * voltageV;
        double a = Math.Max(phi - half, 0.0);
        double b = Math.Max(phi + half, 0.0);
        double fa = a * Math.Exp(-aCoef * Math.Sqrt(a));
        double fb = b * Math.Exp(-aCoef * Math.Sqrt(b));
        return K / (d * d) * (fa - fb);
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        double phi = parameters[BarrierHeightIndex];
        double d = parameters[ThicknessIndex];
        double r = parameters[MassRatioIndex];
        double aCoef = DecayPrefactor * d * Math.Sqrt(r);
        double half = 0.5 * PhysicalConstants.ElementaryChargeC * voltageV;
        double a = phi - half;
        double b = phi + half;
        double dA = 1.0, dB = 1.0; // ∂a/∂φ, ∂b/∂φ (zero once clamped)
        if (a < 0) { a = 0; dA = 0; }
        if (b < 0) { b = 0; dB = 0; }
        double sa = Math.Sqrt(a), sb = Math.Sqrt(b);
        double ea = Math.Exp(-aCoef * sa), eb = Math.Exp(-aCoef * sb);
        double fa = a * ea, fb = b * eb;
        double pre = K / (d * d);
        double j = pre * (fa - fb);

        double fuA = ea * (1.0 - 0.5 * aCoef * sa) * dA;
        double fuB = eb * (1.0 - 0.5 * aCoef * sb) * dB;
        double fAa = -a * sa * ea;
        double fAb = -b * sb * eb;
        gradient[BarrierHeightIndex] = pre * (fuA - fuB);
        gradient[ThicknessIndex] = -2.0 * j / d + pre * (aCoef / d) * (fAa - fAb);
        gradient[MassRatioIndex] = pre * (aCoef / (2.0 * r)) * (fAa - fAb);
        return j;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phiEv = parameters[BarrierHeightIndex] / PhysicalConstants.JoulePerElectronVolt;
        if (maxAbsVoltageV >= phiEv)
        {
            warnings.Add($"the sweep reaches |V| = {maxAbsVoltageV:0.###} V, at or above the fitted barrier height of {phiEv:0.###} eV: " +
                         "the intermediate-bias Simmons formula is outside its range there; restrict the bias range or use a high-field model");
        }
        double dNm = parameters[ThicknessIndex] * 1e9;
        if (dNm < 0.5)
        {
            warnings.Add($"the fitted thickness {dNm:0.###} nm is below about two atomic layers; a continuum barrier model is doubtful there");
        }
        return warnings;
    }
}
