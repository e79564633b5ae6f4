using JunctionFit.Common;
namespace JunctionFit.Physics;

/// <summary>
/// MOS gate stack (<c>--model mos</c>): the gate current density of a MOS capacitor or transistor against the gate bias V_g
/// (gate against substrate), with the oxide voltage solved from the electrostatics and the tunnelling current of the carriers
/// the bias supplies.
/// <para>
/// Electrostatics (<see cref="MosElectrostatics"/>): V_g = V_fb + ψ_s + V_poly + V_ox from the exact charge relation of a uniformly
/// doped substrate (Sze &amp; Ng, Physics of Semiconductor Devices, 3rd ed., ch. 4). The carriers: the mobile charge |Q_c| of the
/// inversion layer (ψ_s beyond flat band towards inversion) or of the accumulation layer (the other side).
/// </para>
/// <para>
/// Tunnelling, compact form of W.-C. Lee and C. Hu, IEEE Trans. Electron Devices 48, 1366 (2001), written with the exact
/// carrier charge instead of its smoothed compact expression:
/// J = [q²/(8π h φ_b)] · (|V_ox|/t_ox) · (|Q_c|/ε_ox) · C(x) · exp{ −(4√(2 m_ox)/(3ħ)) t_ox (qφ_b)^{1/2} · h(x) },  x = |V_ox|/φ_b,
/// h(x) = [1 − (1 − x)^{3/2}]/x = (1 + w + w²)/(1 + w), w = √(1 − x) for x &lt; 1 (trapezoidal barrier, direct tunnelling), h = 1/x
/// for x ≥ 1 (triangular barrier, Fowler–Nordheim), C(x) = exp[(20/φ_b[V]) x^α (1 − x)] for x &lt; 1 and 1 beyond: Lee and Hu's
/// empirical correction that joins the direct-tunnelling and Fowler–Nordheim limits. The exponent is the WKB integral through the
/// trapezoid at the band edge, the prefactor that of Fowler–Nordheim tunnelling (q²E²/(8πhφ_b)) with one field factor
/// replaced by the field of the carrier charge, |Q_c|/ε_ox. Differences from the paper (deliberate): the oxide field |V_ox|/t_ox
/// where the paper writes V_g/t_ox (the same in strong inversion up to V_fb + ψ_s, and finite through flat band), and
/// φ_b0 = φ_b in the correction (from memory).
/// </para>
/// <para>
/// Carriers and barriers: electrons through the conduction-band barrier from an inversion layer on a p substrate, from an
/// accumulation layer on an n substrate, and from an n⁺ poly or metal gate over an accumulated p substrate; holes through the
/// valence-band barrier from an inversion layer on an n substrate and from a p⁺ poly gate over an accumulated p substrate.
/// The parameters <c>barrier_height_eV</c> and <c>mass_ratio</c> belong to the carriers of the inversion branch (electrons on p,
/// holes on n); the other carrier uses the defaults below. Defaults for SiO₂ (Lee and Hu 2001, their table of fitted values):
/// electrons φ_b = 3.1 eV, m_ox = 0.40 mₑ, α = 0.6; holes φ_b = 4.5 eV, m_ox = 0.32 mₑ, α = 0.4. φ_b and m_ox are the values
/// behind BSIM4's gate-tunnelling constants A = q²/(8πhφ_b) and B = 8π√(2q m_ox)φ_b^{3/2}/(3h) (ngspice/ngspice,
/// src/spicelib/devices/bsim4/b4temp.c: A = 4.97232e-7 A/V², B = 7.45669e11 (g/F s²)^½ for NMOS, 3.42537e-7 and 1.16645e12 for
/// PMOS), which the tests reproduce to 1e-5; α and φ_b0 = φ_b are from memory.
/// </para>
/// <para>
/// Sign convention: V_g is the gate against the substrate (body); J &gt; 0 flows from the gate through the oxide into the
/// substrate. n-channel inversion: V_g &gt; 0, J &gt; 0; p-channel inversion: V_g &lt; 0, J &lt; 0.
/// Parameters: t_ox (<c>thickness_nm</c>, the physical oxide thickness), V_fb (<c>flatband_voltage_V</c>), φ_b and m_ox/mₑ
/// (fixed by default). Derivatives: ∂ψ_s/∂θ by implicit differentiation of the bias equation, then forward-mode dual numbers
/// (<see cref="Dual4"/>) through the charge relation and the current, so they are analytic to rounding.
/// </para>
/// </summary>
public sealed class MosGateStackModel : IBarrierModel
{
    /// <summary>Index of t_ox.</summary>
    public const int ThicknessIndex = 0;

    /// <summary>Index of V_fb.</summary>
    public const int FlatBandIndex = 1;

    /// <summary>Index of φ_b of the inversion carriers.</summary>
    public const int BarrierHeightIndex = 2;

    /// <summary>Index of m_ox/mₑ of the inversion carriers.</summary>
    public const int MassRatioIndex = 3;

    /// <summary>Electron barrier Si/SiO₂ conduction band, eV (Lee and Hu 2001; behind BSIM4's NMOS constant A = q²/(8πhφ_b), ngspice b4temp.c).</summary>
    public const double ElectronBarrierEv = 3.1;

    /// <summary>Electron tunnelling mass in SiO₂, mₑ (Lee and Hu 2001; behind BSIM4's NMOS constant B, ngspice b4temp.c).</summary>
    public const double ElectronMassRatio = 0.40;

    /// <summary>Exponent α of the correction for electrons (Lee and Hu 2001; from memory).</summary>
    public const double ElectronAlpha = 0.6;

    /// <summary>Hole barrier Si/SiO₂ valence band, eV (Lee and Hu 2001; behind BSIM4's PMOS constant A, ngspice b4temp.c).</summary>
    public const double HoleBarrierEv = 4.5;

    /// <summary>Hole tunnelling mass in SiO₂, mₑ (Lee and Hu 2001; behind BSIM4's PMOS constant B, ngspice b4temp.c).</summary>
    public const double HoleMassRatio = 0.32;

    /// <summary>Exponent α of the correction for holes (Lee and Hu 2001; from memory).</summary>
    public const double HoleAlpha = 0.4;

    /// <summary>Temperature used when none is stated, in kelvin.</summary>
    public const double DefaultTemperatureK = 300.0;

    private const double Q = PhysicalConstants.ElementaryChargeC;

    /// <summary>Flat-band voltage: key <c>flatband_voltage_V</c>, SI volt, −3 V &lt; V_fb &lt; 3 V.</summary>
    public static ParameterDefinition FlatBandVoltage { get; } = new(
        ParameterKey.FlatBandVoltage, "V_fb", "flat-band voltage", -0.9, ParameterTransform.Logistic, false);

    /// <summary>Creates the model for a gate stack.</summary>
    /// <param name="stack">Substrate, gate and doping; null for <see cref="MosStackOptions.Default"/>.</param>
    /// <param name="temperatureK">Temperature in kelvin; null for 300 K (noted in the fit's warnings).</param>
    public MosGateStackModel(MosStackOptions? stack = null, double? temperatureK = null)
    {
        Stack = stack ?? MosStackOptions.Default;
        TemperatureStated = temperatureK is > 0;
        Electrostatics = new MosElectrostatics(Stack, temperatureK is double t && t > 0 ? t : DefaultTemperatureK);
        bool holes = Stack.Substrate == SubstrateType.N;
        _alpha = holes ? HoleAlpha : ElectronAlpha;
        Parameters =
        [
            StandardParameters.Thickness with { Description = "physical oxide thickness", DefaultSi = 2.0e-9 },
            FlatBandVoltage with { DefaultSi = Math.Clamp(Electrostatics.IdealFlatBandVoltageV, -2.5, 2.5) },
            StandardParameters.BarrierHeight with
            {
                Description = holes ? "valence-band barrier for holes at the Si/oxide interface" : "conduction-band barrier for electrons at the Si/oxide interface",
                DefaultSi = (holes ? HoleBarrierEv : ElectronBarrierEv) * PhysicalConstants.JoulePerElectronVolt,
                FixedByDefault = true,
            },
            StandardParameters.MassRatio with
            {
                Description = holes ? "hole tunnelling mass in the oxide" : "electron tunnelling mass in the oxide",
                DefaultSi = holes ? HoleMassRatio : ElectronMassRatio,
            },
        ];
    }

    private readonly double _alpha;

    /// <summary>The gate stack.</summary>
    public MosStackOptions Stack { get; }

    /// <summary>The electrostatics at the model's temperature.</summary>
    public MosElectrostatics Electrostatics { get; }

    /// <summary>False when the temperature was not given and 300 K is assumed.</summary>
    public bool TemperatureStated { get; }

    /// <summary>Sign of the gate bias that inverts the substrate: +1 for p, −1 for n.</summary>
    public int InversionSign => Stack.Substrate == SubstrateType.P ? 1 : -1;

    /// <inheritdoc />
    public string Name => BarrierModelCatalog.Mos;

    /// <inheritdoc />
    public string Description => $"MOS gate stack ({(Stack.Substrate == SubstrateType.P ? "p" : "n")} substrate, {GateText(Stack.EffectiveGate)} gate): " +
        "exact MOS electrostatics (Sze & Ng, ch. 4) and the direct-tunnelling compact form of Lee & Hu (IEEE TED 48, 1366, 2001)";

    /// <inheritdoc />
    public string ValidityRange => "gate current of a thin SiO2-like gate oxide (about 1-4 nm) by direct or Fowler-Nordheim tunnelling of the carriers of " +
        "an inversion or accumulation layer; classical charge (no quantum confinement of the inversion layer), uniform substrate doping, " +
        "depletion approximation in a poly gate, no trap-assisted or edge (overlap) current";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters { get; }

    /// <summary>Text for a gate type.</summary>
    public static string GateText(GateType gate) => gate switch
    {
        GateType.NPoly => "n+ poly",
        GateType.PPoly => "p+ poly",
        _ => "metal",
    };

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        Span<double> unused = stackalloc double[4];
        return CurrentDensity(voltageV, parameters, unused);
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        var es = Electrostatics;
        double t = parameters[ThicknessIndex], vfb = parameters[FlatBandIndex];
        double s = es.Mirror;
        double psi = es.SolveMirrored(s * (voltageV - vfb), t, out double qg, out _, out double cs);
        double epsOx = es.OxidePermittivityFPerM;
        double dG = 1.0 + cs * (t / epsOx + es.PolySlope(qg));
        // Implicit derivatives of G(ψ; t, V_fb) = ψ + Q_g t/ε_ox + V_poly + s V_fb − s V_g = 0.
        var psiD = new Dual4(psi, -(qg / epsOx) / dG, -s / dG, 0, 0);
        var tD = Dual4.Variable(t, 0);

        double vt = es.ThermalVoltageV, r = es.Ratio, c = es.ChargeScale;
        Dual4 u = psiD / vt;
        bool inversion = psi > 0;
        Dual4 major, minor;
        if (Math.Abs(u.V) < 1e-3)
        {
            Dual4 u2 = u * u, u3 = u2 * u, u4 = u3 * u;
            major = 0.5 * u2 - u3 / 6.0 + u4 / 24.0;
            minor = 0.5 * u2 + u3 / 6.0 + u4 / 24.0;
        }
        else
        {
            major = Dual4.Exp(-u) + u - 1.0;
            minor = Dual4.Exp(u) - u - 1.0;
        }
        Dual4 f = Dual4.Sqrt(major + r * minor);
        if (!(f.V > 0))
        {
            gradient[..4].Clear();
            return 0.0;
        }
        Dual4 carrier = inversion ? c * r * minor / (f + Dual4.Sqrt(major)) : c * major / (f + Dual4.Sqrt(r * minor));
        Dual4 gateCharge = c * f; // |Q_g|
        Dual4 voxAbs = gateCharge * tD / epsOx;

        // Which carrier tunnels, and with which barrier.
        bool holesSubstrate = Stack.Substrate == SubstrateType.N;
        bool holes = inversion ? holesSubstrate : !holesSubstrate && Stack.EffectiveGate == GateType.PPoly;
        Dual4 phiEv, mass;
        double alpha;
        if (holes == holesSubstrate)
        {
            // φ is a parameter in joule; the formula takes it in eV (= volt): ∂φ_eV/∂φ_J = 1/e.
            phiEv = new Dual4(parameters[BarrierHeightIndex] / PhysicalConstants.JoulePerElectronVolt, 0, 0, 1.0 / PhysicalConstants.JoulePerElectronVolt, 0);
            mass = Dual4.Variable(parameters[MassRatioIndex], 3);
            alpha = _alpha;
        }
        else
        {
            phiEv = holes ? HoleBarrierEv : ElectronBarrierEv;
            mass = holes ? HoleMassRatio : ElectronMassRatio;
            alpha = holes ? HoleAlpha : ElectronAlpha;
        }

        Dual4 j = TunnelCurrent(voxAbs, carrier, tD, phiEv, mass, alpha, epsOx);
        double sign = s * (inversion ? 1.0 : -1.0);
        for (int k = 0; k < 4; k++) gradient[k] = sign * j.Partial(k);
        return sign * j.V;
    }

    /// <summary>
    /// |J| of the Lee–Hu compact form for an oxide voltage |V_ox|, carrier charge |Q_c|, thickness t, barrier φ_b (in eV, i.e. volt)
    /// and tunnelling mass ratio, all as dual numbers.
    /// </summary>
    internal static Dual4 TunnelCurrent(Dual4 voxAbs, Dual4 carrier, Dual4 t, Dual4 phiV, Dual4 mass, double alpha, double epsOx)
    {
        const double h = PhysicalConstants.PlanckJs, hbar = PhysicalConstants.ReducedPlanckJs;
        Dual4 x = voxAbs / phiV;
        if (!(x.V > 1e-12)) return new Dual4(0);
        Dual4 shape, correction;
        if (x.V < 1.0)
        {
            Dual4 w = Dual4.Sqrt(1.0 - x);
            shape = (1.0 + w + w * w) / (1.0 + w);
            correction = Dual4.Exp(20.0 / phiV * Dual4.Exp(alpha * Dual4.Log(x)) * (1.0 - x));
        }
        else
        {
            shape = 1.0 / x;
            correction = 1.0;
        }
        Dual4 exponent = 4.0 * Dual4.Sqrt(2.0 * mass * PhysicalConstants.ElectronMassKg) / (3.0 * hbar) * t * Dual4.Sqrt(Q * phiV) * shape;
        Dual4 prefactor = Q * Q / (8.0 * Math.PI * h) / phiV * (voxAbs / t) * (carrier / epsOx);
        return prefactor * correction * Dual4.Exp(-exponent);
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>();
        double t = parameters[ThicknessIndex], vfb = parameters[FlatBandIndex];
        double tNm = t * 1e9;
        if (tNm < 0.8 || tNm > 6.0)
        {
            warnings.Add($"the fitted oxide thickness {tNm:0.###} nm lies outside about 0.8-6 nm, where direct tunnelling through SiO2 dominates " +
                         "and a continuum oxide is meaningful; check the bias window, the area and the substrate type");
        }
        double maxField = 0;
        foreach (double v in (ReadOnlySpan<double>)[maxAbsVoltageV, -maxAbsVoltageV])
        {
            var state = Electrostatics.Solve(v, vfb, t);
            maxField = Math.Max(maxField, Math.Abs(state.OxideVoltageV) / t);
        }
        if (maxField > 1e9)
        {
            warnings.Add($"the oxide field reaches {maxField / 1e8:0.#} MV/cm at the largest bias: close to breakdown of SiO2 (about 10-15 MV/cm); " +
                         "such stress damages the oxide — follow the lab's rules for gate-oxide stress");
        }
        if (!Stack.DopingStated)
        {
            warnings.Add($"substrate doping not given: {Stack.DopingM3 / 1e6:0.##e+0} cm^-3 assumed (give {new Remedy(RemedyKind.Doping)}; it sets the threshold shape, " +
                         "and a C-V file's 1/C^2 slope gives it)");
        }
        if (!TemperatureStated)
        {
            warnings.Add($"temperature not stated: {DefaultTemperatureK:0} K assumed for the electrostatics");
        }
        return warnings;
    }
}
