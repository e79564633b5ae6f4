namespace JunctionFit.Physics;

/// <summary>
/// Simmons rectangular barrier, β = 1: intermediate-bias form for e|V| &lt; φ, high-voltage form for e|V| ≥ φ.
/// <para>
/// General form (Simmons 1963, eq. for a barrier of mean height φ̄ over the width Δs at the Fermi level of the
/// injecting electrode): J = e / (2π h Δs²) · [ φ̄ exp(−A √φ̄) − (φ̄ + e|V|) exp(−A √(φ̄ + e|V|)) ],
/// A = 4π Δs √(2 m*) / h = 2 Δs √(2 m*) / ħ, m* = r·mₑ, with the sign of V (the expression is odd in V).
/// </para>
/// <para>
/// Intermediate range, e|V| &lt; φ: Δs = d, φ̄ = φ − e|V|/2, which gives
/// J(V) = e / (2π h d²) · [ (φ − eV/2) exp(−A √(φ − eV/2)) − (φ + eV/2) exp(−A √(φ + eV/2)) ], A = 2 d √(2 m*) / ħ.
/// High-voltage range, e|V| ≥ φ (triangular barrier; the Fermi level of the collector lies below the far band edge):
/// Δs = d φ / (e|V|), φ̄ = φ/2. With β = 1 the two forms join continuously at e|V| = φ (Δs = d, φ̄ = φ/2 on both sides).
/// Simmons's printed high-voltage formula carries the factors 2.2 and 2.96 that come from β = 23/24 for the triangular
/// barrier; this class keeps β = 1 in both ranges so that J(V) is continuous for fitting (the difference is a factor
/// (24/23)² ≈ 1.09 in the prefactor and 24/23 in the exponent).
/// </para>
/// <para>
/// Symbols: φ barrier height (J), d thickness (m), r = m*/mₑ (dimensionless), V bias (V), J in A/m².
/// Source: J. G. Simmons, J. Appl. Phys. 34, 1793 (1963).
/// </para>
/// <para>
/// Derivatives, with f(u) = u e^{−A√u}: ∂f/∂u = e^{−A√u}(1 − A√u/2), ∂f/∂A = −u^{3/2} e^{−A√u}.
/// Intermediate: ∂J/∂φ = K/d² [f_u(a) − f_u(b)]; ∂J/∂d = −2J/d + K/d² (A/d)[f_A(a) − f_A(b)];
/// ∂J/∂r = K/d² (A/(2r))[f_A(a) − f_A(b)], with a = φ − eV/2, b = φ + eV/2, K = e/(2πh).
/// High voltage, in terms of (Δs, φ̄): ∂J/∂φ̄ = K/Δs² [f_u(φ̄) − f_u(φ̄ + e|V|)], ∂J/∂Δs = −2J/Δs + K/Δs² (A/Δs)[f_A(φ̄) − f_A(φ̄ + e|V|)],
/// then ∂J/∂φ = ½ ∂J/∂φ̄ + (Δs/φ) ∂J/∂Δs and ∂J/∂d = (Δs/d) ∂J/∂Δs; ∂J/∂r as above with Δs for d.
/// </para>
/// </summary>
public sealed class SimmonsRectangularModel : IBarrierModel, IBiasDerivative, IThermalDecay
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
    public string Description => "Simmons rectangular barrier, intermediate and high-voltage forms, beta = 1 (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963)";

    /// <inheritdoc />
    public string ValidityRange => "direct tunnelling through a rectangular barrier: intermediate form for e|V| < phi, high-voltage (triangular, Fowler-Nordheim-like) form for e|V| >= phi; " +
        "needs A*sqrt(phi) >> 1 (thick, high barrier) and a thickness of more than a few atomic layers";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; } = StandardParameters.BarrierHeightThicknessMass;

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        double phi = parameters[BarrierHeightIndex];
        double d = parameters[ThicknessIndex];
        double r = parameters[MassRatioIndex];
        if (Math.Abs(PhysicalConstants.ElementaryChargeC * voltageV) >= phi)
        {
            return HighVoltage(voltageV, phi, d, r, default, out _);
        }
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
        if (Math.Abs(PhysicalConstants.ElementaryChargeC * voltageV) >= phi)
        {
            return HighVoltage(voltageV, phi, d, r, gradient, out _);
        }
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

    /// <summary>
    /// High-voltage range e|V| ≥ φ: Δs = dφ/(e|V|), φ̄ = φ/2 (β = 1). Fills <paramref name="gradient"/> when it is not empty
    /// and returns ∂J/∂V in <paramref name="biasDerivative"/>.
    /// </summary>
    private static double HighVoltage(double voltageV, double phi, double d, double r, Span<double> gradient, out double biasDerivative)
    {
        double sign = voltageV < 0 ? -1.0 : 1.0;
        double u = PhysicalConstants.ElementaryChargeC * Math.Abs(voltageV);
        double ds = d * phi / u;
        double aCoef = DecayPrefactor * ds * Math.Sqrt(r);
        double a = 0.5 * phi, b = 0.5 * phi + u;
        double sa = Math.Sqrt(a), sb = Math.Sqrt(b);
        double ea = Math.Exp(-aCoef * sa), eb = Math.Exp(-aCoef * sb);
        double pre = K / (ds * ds);
        double j = pre * (a * ea - b * eb);
        double fuA = ea * (1.0 - 0.5 * aCoef * sa);
        double fuB = eb * (1.0 - 0.5 * aCoef * sb);
        double fAdiff = -a * sa * ea + b * sb * eb;
        double dJdDs = -2.0 * j / ds + pre * (aCoef / ds) * fAdiff;
        double dJdPhiBar = pre * (fuA - fuB);
        // ∂J/∂u at fixed φ, d: Δs = dφ/u, φ̄ + u moves with u.
        double dJdu = -(ds / u) * dJdDs - pre * fuB;
        biasDerivative = PhysicalConstants.ElementaryChargeC * dJdu;
        if (!gradient.IsEmpty)
        {
            gradient[BarrierHeightIndex] = sign * (0.5 * dJdPhiBar + (ds / phi) * dJdDs);
            gradient[ThicknessIndex] = sign * (ds / d) * dJdDs;
            gradient[MassRatioIndex] = sign * pre * (aCoef / (2.0 * r)) * fAdiff;
        }
        return sign * j;
    }

    /// <inheritdoc />
    double IBiasDerivative.CurrentDensityBiasDerivative(double voltageV, ReadOnlySpan<double> parameters)
    {
        double phi = parameters[BarrierHeightIndex];
        double d = parameters[ThicknessIndex];
        double r = parameters[MassRatioIndex];
        double e = PhysicalConstants.ElementaryChargeC;
        if (Math.Abs(e * voltageV) >= phi)
        {
            HighVoltage(voltageV, phi, d, r, default, out double dv);
            return dv;
        }
        // ∂J/∂V = −(eK/(2d²)) [f_u(a) + f_u(b)], a = φ − eV/2, b = φ + eV/2.
        double aCoef = DecayPrefactor * d * Math.Sqrt(r);
        double half = 0.5 * e * voltageV;
        double sa = Math.Sqrt(phi - half), sb = Math.Sqrt(phi + half);
        double fuA = Math.Exp(-aCoef * sa) * (1.0 - 0.5 * aCoef * sa);
        double fuB = Math.Exp(-aCoef * sb) * (1.0 - 0.5 * aCoef * sb);
        return -0.5 * e * K / (d * d) * (fuA + fuB);
    }

    /// <summary>
    /// c = A / (2√φ̄) = Δs √(2m*) / (ħ √φ̄) with the bias-dependent Δs and φ̄ of the range in use (Simmons 1964).
    /// </summary>
    double IThermalDecay.EnergyDecay(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        double phi = parameters[BarrierHeightIndex];
        double d = parameters[ThicknessIndex];
        double r = parameters[MassRatioIndex];
        double u = PhysicalConstants.ElementaryChargeC * Math.Abs(voltageV);
        double c;
        if (u < phi)
        {
            double phiBar = phi - 0.5 * u;
            c = DecayPrefactor * d * Math.Sqrt(r) / (2.0 * Math.Sqrt(phiBar));
            gradient[BarrierHeightIndex] = -c / (2.0 * phiBar);
        }
        else
        {
            double ds = d * phi / u;
            c = DecayPrefactor * ds * Math.Sqrt(r) / (2.0 * Math.Sqrt(0.5 * phi));
            gradient[BarrierHeightIndex] = c / (2.0 * phi);
        }
        gradient[ThicknessIndex] = c / d;
        gradient[MassRatioIndex] = c / (2.0 * r);
        return c;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phiEv = parameters[BarrierHeightIndex] / PhysicalConstants.JoulePerElectronVolt;
        if (maxAbsVoltageV >= phiEv)
        {
            warnings.Add($"the sweep reaches |V| = {maxAbsVoltageV:0.###} V, at or above the fitted barrier height of {phiEv:0.###} eV: " +
                         "those points use Simmons's high-voltage (triangular barrier) form, which is continuous with the intermediate form " +
                         "but less accurate near eV = phi; compare with the fowler-nordheim or wkb model");
        }
        double exponent = DecayPrefactor * parameters[ThicknessIndex] * Math.Sqrt(parameters[MassRatioIndex] * parameters[BarrierHeightIndex]);
        if (exponent < 10.0)
        {
            warnings.Add($"the tunnelling exponent A*sqrt(phi) = {exponent:0.#} is small (below 10): the barrier is so thin or low that the " +
                         "Simmons approximations (leading term only) are off by tens of percent; prefer the wkb model");
        }
        double dNm = parameters[ThicknessIndex] * 1e9;
        if (dNm < 0.5)
        {
            warnings.Add($"the fitted thickness {dNm:0.###} nm is below about two atomic layers; a continuum barrier model is doubtful there");
        }
        return warnings;
    }
}
