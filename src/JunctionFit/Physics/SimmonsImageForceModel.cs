using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>
/// Simmons image-force rounded barrier: the rectangular barrier lowered by the image potential, treated with Simmons's mean-barrier
/// formula.
/// <para>
/// Barrier (energy above the Fermi level of the injecting electrode): φ(x) = φ₀ − e|V| x/s − 1.15 λ s² / (x (s − x)),
/// λ = e² ln 2 / (8π ε_r ε₀ s). Turning points and mean height (Simmons 1963, image-force section):
/// e|V| &lt; φ₀: s₁ = 1.2 λ s / φ₀, s₂ = s [1 − 9.2 λ / (3φ₀ + 4λ − 2e|V|)] + s₁;
/// e|V| ≥ φ₀: s₁ = 1.2 λ s / φ₀, s₂ = (φ₀ − 5.6 λ) s / (e|V|);
/// Δs = s₂ − s₁, φ̄ = φ₀ − (e|V| / 2s)(s₁ + s₂) − [1.15 λ s / Δs] ln[ s₂ (s − s₁) / (s₁ (s − s₂)) ].
/// Current: J = e / (2π h Δs²) · [ φ̄ e^{−A√φ̄} − (φ̄ + e|V|) e^{−A√(φ̄ + e|V|)} ], A = 2 Δs √(2m*) / ħ (β = 1), sign of V.
/// </para>
/// <para>
/// Symbols: φ₀ barrier height without image force (J), s = d thickness (m), ε_r relative permittivity (the high-frequency value
/// is the appropriate one for a tunnelling electron), r = m*/mₑ, V bias (V), J in A/m². Source: J. G. Simmons, J. Appl. Phys. 34,
/// 1793 (1963). Two cautions, both stated in docs/models.md: (1) the printed image term is about twice the classical image energy
/// of a charge between two metal plates (at mid-gap the classical value is −2λ, the approximation gives −4.6λ; later authors,
/// e.g. Miskovsky, Cutler, Feuchtwang and Lucas, warn against the uncorrected form), so the fitted ε_r is an effective value;
/// (2) the printed turning points of the two bias ranges do not join at e|V| = φ₀, so J jumps there.
/// The model is implemented as published so that its numbers compare with the literature.
/// </para>
/// <para>
/// Derivatives: forward-mode dual numbers (<see cref="Dual4"/>) carry ∂/∂φ₀, ∂/∂s, ∂/∂r, ∂/∂ε_r through every step of the
/// closed form above; they are exact derivatives of the formula (checked against central differences).
/// </para>
/// </summary>
public sealed class SimmonsImageForceModel : IBarrierModel, IThermalDecay
{
    /// <summary>Index of φ₀ in the parameter vector.</summary>
    public const int BarrierHeightIndex = 0;

    /// <summary>Index of d in the parameter vector.</summary>
    public const int ThicknessIndex = 1;

    /// <summary>Index of m*/mₑ in the parameter vector.</summary>
    public const int MassRatioIndex = 2;

    /// <summary>Index of ε_r in the parameter vector.</summary>
    public const int PermittivityIndex = 3;

    private const double E = PhysicalConstants.ElementaryChargeC;
    private const double K = E / (2.0 * Math.PI * PhysicalConstants.PlanckJs);

    /// <summary>e² ln 2 / (8π ε₀) in J m: λ = this / (ε_r s).</summary>
    internal static readonly double ImageConstant = E * E * Math.Log(2.0) / (8.0 * Math.PI * PhysicalConstants.VacuumPermittivityFPerM);

    /// <summary>Creates the model with <paramref name="relativePermittivity"/> as the start (and default fixed) value of ε_r.</summary>
    /// <param name="relativePermittivity">ε_r, at least 1.</param>
    /// <exception cref="ArgumentOutOfRangeException">ε_r below 1 or not finite.</exception>
    public SimmonsImageForceModel(double relativePermittivity = 3.9)
    {
        Guard.AtLeast(relativePermittivity, 1.0);
        Parameters = [StandardParameters.BarrierHeight, StandardParameters.Thickness, StandardParameters.MassRatio,
                      StandardParameters.RelativePermittivity with { DefaultSi = relativePermittivity }];
    }

    /// <inheritdoc />
    public string Name => "simmons-image";

    /// <inheritdoc />
    public string Description => "Simmons barrier with image-force rounding, mean-barrier approximation (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963)";

    /// <inheritdoc />
    public string ValidityRange => "direct tunnelling through an image-force rounded barrier, thick enough that the turning points stay apart " +
                                   "(0 < s1 < s2 < d) and the mean barrier stays positive; the published turning points jump at eV = phi0";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; }

    /// <summary>The image-force geometry at a bias: turning points s₁, s₂ (m), width Δs (m), mean barrier φ̄ (J), and whether it is physical.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="parameters">SI parameters.</param>
    [System.Diagnostics.CodeAnalysis.SuppressMessage("Performance", "CA1822", Justification = "Part of the model's instance API: callers hold the model.")]
    public (double S1M, double S2M, double WidthM, double MeanBarrierJ, bool Valid) Geometry(double voltageV, ReadOnlySpan<double> parameters)
    {
        var g = Evaluate(voltageV, parameters, out bool valid);
        return (g.S1.V, g.S2.V, g.Width.V, g.PhiBar.V, valid);
    }

    private readonly record struct Shape(Dual4 S1, Dual4 S2, Dual4 Width, Dual4 PhiBar, Dual4 Decay, Dual4 U);

    private static Shape Evaluate(double voltageV, ReadOnlySpan<double> p, out bool valid)
    {
        var phi0 = Dual4.Variable(p[BarrierHeightIndex], 0);
        var s = Dual4.Variable(p[ThicknessIndex], 1);
        var r = Dual4.Variable(p[MassRatioIndex], 2);
        var eps = Dual4.Variable(p[PermittivityIndex], 3);
        double u = E * Math.Abs(voltageV);
        Dual4 lambda = ImageConstant / (eps * s);
        Dual4 s1 = 1.2 * lambda * s / phi0;
        Dual4 s2 = u < phi0.V
            ? s * (1.0 - 9.2 * lambda / (3.0 * phi0 + 4.0 * lambda - 2.0 * u)) + s1
            : (phi0 - 5.6 * lambda) * s / u;
        valid = s1.V > 0 && s2.V > s1.V && s2.V < s.V;
        // Keep the formula finite outside its range (CheckValidity reports it): Δs ≥ 1 % of d, s₂ < d.
        Dual4 width = Dual4.AtLeast(s2 - s1, 0.01 * s.V);
        if (!valid) s2 = s1 + width;
        if (s2.V >= s.V) { s2 = new Dual4(0.999 * s.V); width = Dual4.AtLeast(s2 - s1, 0.01 * s.V); }
        Dual4 logArg = s2 * (s - s1) / (s1 * (s - s2));
        Dual4 phiBar = phi0 - u / (2.0 * s) * (s1 + s2) - 1.15 * lambda * s / width * Dual4.Log(logArg);
        // Not positive, or NaN when s₁ ≥ d makes the logarithm's argument negative: the floor, flagged invalid.
        if (!(phiBar.V > 0)) { valid = false; phiBar = Dual4.AtLeast(phiBar, 1e-3 * phi0.V); }
        Dual4 decay = SimmonsRectangularModel.DecayPrefactor * Dual4.Sqrt(r) * width; // A
        return new Shape(s1, s2, width, phiBar, decay, new Dual4(u));
    }

    private static Dual4 Current(in Shape g)
    {
        Dual4 a = g.PhiBar, b = g.PhiBar + g.U;
        Dual4 t = a * Dual4.Exp(-(g.Decay * Dual4.Sqrt(a))) - b * Dual4.Exp(-(g.Decay * Dual4.Sqrt(b)));
        return K / (g.Width * g.Width) * t;
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        var g = Evaluate(voltageV, parameters, out _);
        double j = Current(g).V;
        return voltageV < 0 ? -j : j;
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        var g = Evaluate(voltageV, parameters, out _);
        var j = Current(g);
        double sign = voltageV < 0 ? -1.0 : 1.0;
        for (int k = 0; k < 4; k++) gradient[k] = sign * j.Partial(k);
        return sign * j.V;
    }

    /// <summary>c = A / (2√φ̄) = Δs √(2m*) / (ħ √φ̄) with the image-force Δs and φ̄ (Simmons 1964).</summary>
    double IThermalDecay.EnergyDecay(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        var g = Evaluate(voltageV, parameters, out _);
        var c = g.Decay / (2.0 * Dual4.Sqrt(g.PhiBar));
        for (int k = 0; k < 4; k++) gradient[k] = c.Partial(k);
        return c.V;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double phiEv = parameters[BarrierHeightIndex] / PhysicalConstants.JoulePerElectronVolt;
        if (!Geometry(0.0, parameters).Valid || !Geometry(maxAbsVoltageV, parameters).Valid)
        {
            warnings.Add("the image force closes the barrier for the fitted parameters (turning points cross or the mean barrier is not positive): " +
                         "the barrier is too thin or too low for Simmons's image-force formula; use the wkb model with image force or the rectangular model");
        }
        if (maxAbsVoltageV >= phiEv)
        {
            warnings.Add($"the sweep crosses |V| = {phiEv:0.###} V = phi0/e, where Simmons's published turning points of the two bias ranges do not join " +
                         "and the current jumps; restrict the bias range below phi0/e for this model");
        }
        var g = Geometry(0.0, parameters);
        double exponent = SimmonsRectangularModel.DecayPrefactor * Math.Sqrt(parameters[MassRatioIndex]) * g.WidthM * Math.Sqrt(Math.Max(g.MeanBarrierJ, 0));
        if (exponent < 10.0)
        {
            warnings.Add($"the tunnelling exponent A*sqrt(mean barrier) = {exponent:0.#} is small (below 10): the mean-barrier approximation is poor; prefer the wkb model");
        }
        return warnings;
    }
}
