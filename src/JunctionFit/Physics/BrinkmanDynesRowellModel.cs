namespace JunctionFit.Physics;

/// <summary>
/// Brinkman–Dynes–Rowell asymmetric trapezoidal barrier: the WKB conductance expanded to second order in the bias,
/// integrated analytically to the current.
/// <para>
/// G(V)/G(0) = 1 − (A₀ Δφ / (16 φ̄^{3/2})) eV + (9/128) (A₀² / φ̄) (eV)²,  A₀ = 4 d √(2m*) / (3ħ),
/// G(0) = (√(2m* φ̄) / d) (e/h)² exp(−2 d √(2m* φ̄) / ħ)  (conductance per area, S/m²),
/// J(V) = ∫₀^V G dV′ = G(0) [ V − (A₀ Δφ / (16 φ̄^{3/2})) e V²/2 + (9/128)(A₀²/φ̄) e² V³/3 ].
/// </para>
/// <para>
/// Symbols: φ̄ mean barrier height (J), d thickness (m), Δφ = φ_top − φ_bottom asymmetry (J), r = m*/mₑ, V bias of the
/// top electrode against the bottom one (V), J in A/m². Sign convention: φ_top is the barrier height at the interface
/// with the top (biased) electrode. With Δφ &gt; 0 the conductance minimum lies at positive bias,
/// eV_min = (4/9) Δφ / (A₀ √φ̄), and |J(−V)| &gt; |J(+V)|: the current is larger when electrons enter from the
/// high-barrier side (checked against the numerical WKB trapezoid in the tests).
/// Handbook form of G(0): 3.16×10¹⁰ √φ̄ / d · exp(−1.025 d √φ̄) Ω⁻¹ cm⁻² with d in Å and φ̄ in eV.
/// Source: W. F. Brinkman, R. C. Dynes, J. M. Rowell, J. Appl. Phys. 41, 1915 (1970). Valid for d ≳ 1 nm,
/// |Δφ| &lt; φ̄ and a bias small enough for the second-order expansion (e|V| ≲ φ̄/2).
/// </para>
/// <para>
/// Derivatives: with q = √(2 r mₑ), ln G(0) = ln q + ½ ln φ̄ − ln d − 2 d q √φ̄ / ħ + const,
/// ∂lnG₀/∂φ̄ = 1/(2φ̄) − d q /(ħ √φ̄), ∂lnG₀/∂d = −1/d − 2 q √φ̄ / ħ, ∂lnG₀/∂r = (1 − 2 d q √φ̄ / ħ)/(2r);
/// c₁ = A₀ Δφ / (16 φ̄^{3/2}) and c₂ = (9/128) A₀²/φ̄ scale as c₁ ∝ Δφ d √r φ̄^{−3/2}, c₂ ∝ d² r φ̄^{−1};
/// ∂J/∂θ = J ∂lnG₀/∂θ + G₀ (−e V²/2 · ∂c₁/∂θ + e² V³/3 · ∂c₂/∂θ).
/// </para>
/// </summary>
public sealed class BrinkmanDynesRowellModel : IBarrierModel, IBiasDerivative, IThermalDecay
{
    /// <summary>Index of φ̄ in the parameter vector.</summary>
    public const int BarrierHeightIndex = 0;

    /// <summary>Index of d in the parameter vector.</summary>
    public const int ThicknessIndex = 1;

    /// <summary>Index of Δφ in the parameter vector.</summary>
    public const int AsymmetryIndex = 2;

    /// <summary>Index of m*/mₑ in the parameter vector.</summary>
    public const int MassRatioIndex = 3;

    private const double E = PhysicalConstants.ElementaryChargeC;
    private const double Hbar = PhysicalConstants.ReducedPlanckJs;
    private const double EOverHSquared = E / PhysicalConstants.PlanckJs * (E / PhysicalConstants.PlanckJs);

    /// <summary>The shared instance (the model holds no state).</summary>
    public static BrinkmanDynesRowellModel Instance { get; } = new();

    /// <inheritdoc />
    public string Name => "bdr";

    /// <inheritdoc />
    public string Description => "Brinkman-Dynes-Rowell asymmetric trapezoidal barrier (W. F. Brinkman, R. C. Dynes, J. M. Rowell, J. Appl. Phys. 41, 1915, 1970)";

    /// <inheritdoc />
    public string ValidityRange => "direct tunnelling through a trapezoidal barrier at low bias: d of about 1 nm or more, |asymmetry| < mean barrier height, " +
                                   "e|V| up to about half the mean barrier height (second-order expansion of the conductance)";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; } =
        [StandardParameters.MeanBarrierHeight, StandardParameters.Thickness, StandardParameters.Asymmetry, StandardParameters.MassRatio];

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters) => Evaluate(voltageV, parameters, default);

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient) => Evaluate(voltageV, parameters, gradient);

    private static double Evaluate(double voltageV, ReadOnlySpan<double> p, Span<double> gradient)
    {
        double phi = p[BarrierHeightIndex], d = p[ThicknessIndex], dphi = p[AsymmetryIndex], r = p[MassRatioIndex];
        double q = Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg);
        double sphi = Math.Sqrt(phi);
        double expo = 2.0 * d * q * sphi / Hbar;
        double g0 = q * sphi / d * EOverHSquared * Math.Exp(-expo);
        double a0 = 4.0 * d * q / (3.0 * Hbar);
        double c1 = a0 * dphi / (16.0 * phi * sphi);
        double c2 = 9.0 / 128.0 * a0 * a0 / phi;
        double v = voltageV;
        double p1 = -0.5 * E * v * v;         // ∂P/∂c₁
        double p2 = E * E * v * v * v / 3.0;  // ∂P/∂c₂
        double poly = v + c1 * p1 + c2 * p2;
        double j = g0 * poly;
        if (!gradient.IsEmpty)
        {
            double dlnPhi = 0.5 / phi - d * q / (Hbar * sphi);
            double dlnD = -1.0 / d - 2.0 * q * sphi / Hbar;
            double dlnR = (1.0 - expo) / (2.0 * r);
            gradient[BarrierHeightIndex] = j * dlnPhi + g0 * (p1 * (-1.5 * c1 / phi) + p2 * (-c2 / phi));
            gradient[ThicknessIndex] = j * dlnD + g0 * (p1 * (c1 / d) + p2 * (2.0 * c2 / d));
            gradient[AsymmetryIndex] = g0 * p1 * (a0 / (16.0 * phi * sphi));
            gradient[MassRatioIndex] = j * dlnR + g0 * (p1 * (c1 / (2.0 * r)) + p2 * (c2 / r));
        }
        return j;
    }

    /// <summary>G(0) in S/m² for the given parameters (BDR zero-bias conductance per area).</summary>
    /// <param name="parameters">SI parameters in <see cref="Parameters"/> order.</param>
    public static double ZeroBiasConductance(ReadOnlySpan<double> parameters)
    {
        double phi = parameters[BarrierHeightIndex], d = parameters[ThicknessIndex], r = parameters[MassRatioIndex];
        double q = Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg);
        return q * Math.Sqrt(phi) / d * EOverHSquared * Math.Exp(-2.0 * d * q * Math.Sqrt(phi) / Hbar);
    }

    /// <inheritdoc />
    double IBiasDerivative.CurrentDensityBiasDerivative(double voltageV, ReadOnlySpan<double> p)
    {
        double phi = p[BarrierHeightIndex], d = p[ThicknessIndex], dphi = p[AsymmetryIndex], r = p[MassRatioIndex];
        double q = Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg);
        double a0 = 4.0 * d * q / (3.0 * Hbar);
        double c1 = a0 * dphi / (16.0 * phi * Math.Sqrt(phi));
        double c2 = 9.0 / 128.0 * a0 * a0 / phi;
        double ev = E * voltageV;
        return ZeroBiasConductance(p) * (1.0 - c1 * ev + c2 * ev * ev);
    }

    /// <summary>c = d √(2m*) / (ħ √(φ̄ − e|V|/2)): the rectangular-barrier decay constant at the bias-dependent mean height.</summary>
    double IThermalDecay.EnergyDecay(double voltageV, ReadOnlySpan<double> p, Span<double> gradient)
    {
        double phi = p[BarrierHeightIndex], d = p[ThicknessIndex], r = p[MassRatioIndex];
        double phiBar = Math.Max(phi - 0.5 * E * Math.Abs(voltageV), 0.05 * phi);
        bool clamped = phiBar == 0.05 * phi;
        double c = d * Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg) / (Hbar * Math.Sqrt(phiBar));
        gradient[BarrierHeightIndex] = clamped ? -c / (2.0 * phi) : -c / (2.0 * phiBar);
        gradient[ThicknessIndex] = c / d;
        gradient[AsymmetryIndex] = 0.0;
        gradient[MassRatioIndex] = c / (2.0 * r);
        return c;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phi = parameters[BarrierHeightIndex], d = parameters[ThicknessIndex], dphi = parameters[AsymmetryIndex], r = parameters[MassRatioIndex];
        double phiEv = phi / PhysicalConstants.JoulePerElectronVolt;
        double dphiEv = dphi / PhysicalConstants.JoulePerElectronVolt;
        if (d < 1e-9)
        {
            warnings.Add($"the fitted thickness {d * 1e9:0.###} nm is below about 1 nm, where Brinkman, Dynes and Rowell's WKB expansion is no longer reliable");
        }
        if (Math.Abs(dphi) >= phi)
        {
            warnings.Add($"the fitted asymmetry {dphiEv:0.###} eV is not smaller than the mean barrier height {phiEv:0.###} eV: " +
                         "one interface would have no barrier, outside the BDR model's range");
        }
        if (maxAbsVoltageV > 0.5 * phiEv)
        {
            warnings.Add($"the sweep reaches |V| = {maxAbsVoltageV:0.###} V, more than half the mean barrier height ({phiEv:0.###} eV): " +
                         "the second-order conductance expansion is inaccurate there; restrict the bias range or use the wkb model");
        }
        double q = Math.Sqrt(2.0 * r * PhysicalConstants.ElectronMassKg);
        double a0 = 4.0 * d * q / (3.0 * Hbar);
        double c1 = a0 * dphi / (16.0 * phi * Math.Sqrt(phi));
        double c2 = 9.0 / 128.0 * a0 * a0 / phi;
        if (1.0 - c1 * c1 / (4.0 * c2) <= 0.0)
        {
            warnings.Add("the fitted conductance parabola G(V)/G(0) dips below zero: the asymmetry is too large for the expansion");
        }
        return warnings;
    }
}
