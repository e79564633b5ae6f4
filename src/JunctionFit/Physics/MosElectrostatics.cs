using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>Doping type of the silicon under the gate oxide.</summary>
public enum SubstrateType
{
    /// <summary>p-type (acceptors): n-channel devices; inversion at positive gate bias.</summary>
    P,

    /// <summary>n-type (donors): p-channel devices; inversion at negative gate bias.</summary>
    N,
}

/// <summary>Gate electrode of a MOS stack.</summary>
public enum GateType
{
    /// <summary>n⁺ polysilicon (Fermi level at the conduction-band edge; depletes under positive gate charge).</summary>
    NPoly,

    /// <summary>p⁺ polysilicon (Fermi level at the valence-band edge; depletes under negative gate charge).</summary>
    PPoly,

    /// <summary>A metal gate (no depletion), work function <see cref="MosStackOptions.MetalWorkFunctionEv"/>.</summary>
    Metal,
}

/// <summary>
/// The fixed description of a MOS gate stack: substrate type and doping, gate type and doping, permittivities. Immutable;
/// values are validated when set. SI inside (doping in m⁻³).
/// </summary>
public sealed record MosStackOptions
{
    /// <summary>Default substrate doping, 1×10¹⁷ cm⁻³ (a typical channel doping of a 130 nm-generation CMOS process; common practice, no source).</summary>
    public const double DefaultDopingM3 = 1e23;

    /// <summary>Default gate doping of polysilicon gates, 2×10²⁰ cm⁻³ (degenerately doped poly; common practice, no source).</summary>
    public const double DefaultGateDopingM3 = 2e26;

    /// <summary>Defaults for a p substrate: n⁺ poly gate (the usual CMOS pairing).</summary>
    public static MosStackOptions Default { get; } = new();

    /// <summary>Substrate type.</summary>
    public SubstrateType Substrate { get; init; } = SubstrateType.P;

    /// <summary>Gate type; null for the usual CMOS pairing (n⁺ poly on a p substrate, p⁺ poly on an n substrate).</summary>
    public GateType? Gate { get; init; }

    /// <summary>The gate type in use (the stated one or the CMOS pairing).</summary>
    public GateType EffectiveGate => Gate ?? (Substrate == SubstrateType.P ? GateType.NPoly : GateType.PPoly);

    /// <summary>Net substrate doping |N_A − N_D| in m⁻³ (between 10¹⁸ and 10²⁶ m⁻³).</summary>
    public double DopingM3
    {
        get;
        init => field = Guard.InRange(value, 1e18, 1e26, "1e12 and 1e20 cm^-3");
    } = DefaultDopingM3;

    /// <summary>True when <see cref="DopingM3"/> was stated by the user (false: the default is assumed, and a fit says so).</summary>
    public bool DopingStated { get; init; }

    /// <summary>Doping of a polysilicon gate in m⁻³ (sets the poly depletion).</summary>
    public double GateDopingM3
    {
        get;
        init => field = Guard.InRange(value, 1e24, 1e28, "1e18 and 1e22 cm^-3");
    } = DefaultGateDopingM3;

    /// <summary>Work function of a metal gate in eV (default 4.6 eV, near mid-gap like TiN; from memory).</summary>
    public double MetalWorkFunctionEv { get; init => field = Guard.Positive(value); } = 4.6;

    /// <summary>Relative permittivity of the oxide (SiO₂: 3.9, Sze &amp; Ng 3rd ed., appendix).</summary>
    public double OxidePermittivity { get; init => field = Guard.Positive(value); } = 3.9;

    /// <summary>Relative permittivity of silicon (11.7, Sze &amp; Ng 3rd ed., appendix).</summary>
    public double SiliconPermittivity { get; init => field = Guard.Positive(value); } = 11.7;
}

/// <summary>The electrostatic state of a MOS stack at one gate bias.</summary>
/// <param name="SurfacePotentialV">ψ_s, band bending at the silicon surface (positive: bands bent down), in volt.</param>
/// <param name="OxideVoltageV">V_ox, the drop across the oxide (gate minus silicon surface), in volt.</param>
/// <param name="PolyDepletionVoltageV">V_poly, the drop across the depleted gate, in volt (signed like V_ox).</param>
/// <param name="GateChargeCPerM2">Q_g = −Q_s, gate charge per area in C/m².</param>
/// <param name="CarrierChargeCPerM2">|Q_c|, the mobile charge of the inversion or accumulation layer per area in C/m².</param>
public readonly record struct MosState(double SurfacePotentialV, double OxideVoltageV, double PolyDepletionVoltageV,
    double GateChargeCPerM2, double CarrierChargeCPerM2);

/// <summary>
/// Electrostatics of a MOS stack with a uniformly doped substrate, from the exact charge relation.
/// <para>
/// Written for a p substrate; an n substrate is the mirror image (all potentials and charges change sign), which is how it is
/// computed. With u = qψ_s/kT and r = n_i²/N_A² = n_p0/p_p0 the silicon charge is (Sze &amp; Ng, Physics of Semiconductor
/// Devices, 3rd ed., ch. 4, the F function):
/// Q_s = −sgn(ψ_s) √(2 ε_s kT N_A) · F,  F² = (e^{−u} + u − 1) + r (e^{u} − u − 1).
/// The first bracket belongs to the majority carriers and ionised dopants, the second to the minority carriers; the mobile charge
/// of an inversion layer is the part of |Q_s| the second bracket adds, |Q_inv| = √(2ε_s kT N_A)·(F − √M) = √(2ε_s kT N_A)·rm/(F + √M),
/// M = e^{−u} + u − 1, m = e^{u} − u − 1 (written without the cancellation), and that of an accumulation layer (u &lt; 0) likewise
/// |Q_acc| = √(2ε_s kT N_A)·M/(F + √(rm)).
/// Gate bias: V_g = V_fb + ψ_s + V_poly + V_ox with V_ox = Q_g/C_ox, Q_g = −Q_s, C_ox = ε_ox/t_ox; a poly gate whose charge has the
/// sign that depletes it (positive for n⁺ poly, negative for p⁺ poly) drops V_poly = sgn(Q_g)·Q_g²/(2 q ε_s N_gate)
/// (depletion approximation in the gate). The left side increases monotonically with ψ_s, so ψ_s is found by Newton steps
/// safeguarded by bisection.
/// </para>
/// <para>
/// Constants: n_i = 1.0×10¹⁰ cm⁻³ at 300 K (Sze &amp; Ng give 9.65×10⁹; 1.0×10¹⁰ is the later consensus value — from memory),
/// scaled with T as T^{3/2} exp(−E_g(T)/2kT); E_g(T) = 1.17 − 4.73×10⁻⁴ T²/(T + 636) eV (Varshni form with Sze &amp; Ng's silicon
/// values); electron affinity χ = 4.05 eV. Flat-band voltage without oxide charge: V_fb = φ_m − φ_s with φ_m = χ (n⁺ poly),
/// χ + E_g (p⁺ poly) or the metal's work function, and φ_s = χ + E_g/2 ± ψ_B, ψ_B = (kT/q) ln(N/n_i) (+ for p, − for n).
/// </para>
/// Pure computation; immutable and thread-safe.
/// </summary>
public sealed class MosElectrostatics
{
    private const double Q = PhysicalConstants.ElementaryChargeC;
    private const double Eps0 = PhysicalConstants.VacuumPermittivityFPerM;

    /// <summary>Electron affinity of silicon in eV (Sze &amp; Ng 3rd ed.).</summary>
    public const double SiliconElectronAffinityEv = 4.05;

    /// <summary>Creates the electrostatics of <paramref name="stack"/> at <paramref name="temperatureK"/>.</summary>
    /// <param name="stack">The gate stack.</param>
    /// <param name="temperatureK">Temperature in kelvin (at least 50 K).</param>
    public MosElectrostatics(MosStackOptions stack, double temperatureK)
    {
        ArgumentNullException.ThrowIfNull(stack);
        Guard.InRange(temperatureK, 50.0, 800.0, "50 and 800 K");
        Stack = stack;
        TemperatureK = temperatureK;
        ThermalVoltageV = PhysicalConstants.BoltzmannJPerK * temperatureK / Q;
        BandGapEv = BandGap(temperatureK);
        IntrinsicDensityM3 = 1.0e16 * Math.Pow(temperatureK / 300.0, 1.5)
            * Math.Exp(-(BandGapEv / (2 * ThermalVoltageV)) + BandGap(300.0) / (2 * PhysicalConstants.BoltzmannJPerK * 300.0 / Q));
        SiliconPermittivityFPerM = stack.SiliconPermittivity * Eps0;
        OxidePermittivityFPerM = stack.OxidePermittivity * Eps0;
        double n = stack.DopingM3;
        Ratio = IntrinsicDensityM3 / n * (IntrinsicDensityM3 / n);
        ChargeScale = Math.Sqrt(2.0 * SiliconPermittivityFPerM * PhysicalConstants.BoltzmannJPerK * temperatureK * n);
        BulkPotentialV = ThermalVoltageV * Math.Log(n / IntrinsicDensityM3);
        var gate = stack.EffectiveGate;
        double phiM = gate switch
        {
            GateType.NPoly => SiliconElectronAffinityEv,
            GateType.PPoly => SiliconElectronAffinityEv + BandGapEv,
            _ => stack.MetalWorkFunctionEv,
        };
        double phiS = SiliconElectronAffinityEv + 0.5 * BandGapEv + (stack.Substrate == SubstrateType.P ? BulkPotentialV : -BulkPotentialV);
        IdealFlatBandVoltageV = phiM - phiS;
        // In the mirrored (p-type) frame a gate depletes when its charge is positive if it is the CMOS pairing
        // (n+ on p, p+ on n), negative if it is the other poly, never for metal.
        _polyDepletionSign = gate == GateType.Metal ? 0
            : (gate == GateType.NPoly) == (stack.Substrate == SubstrateType.P) ? 1 : -1;
        _polyCoefficient = gate == GateType.Metal ? 0.0 : 1.0 / (2.0 * Q * SiliconPermittivityFPerM * stack.GateDopingM3);
    }

    private readonly int _polyDepletionSign;
    private readonly double _polyCoefficient;

    /// <summary>The gate stack.</summary>
    public MosStackOptions Stack { get; }

    /// <summary>Temperature in kelvin.</summary>
    public double TemperatureK { get; }

    /// <summary>kT/q in volt.</summary>
    public double ThermalVoltageV { get; }

    /// <summary>Silicon band gap at the temperature, in eV.</summary>
    public double BandGapEv { get; }

    /// <summary>Intrinsic carrier density n_i in m⁻³.</summary>
    public double IntrinsicDensityM3 { get; }

    /// <summary>ε_s in F/m.</summary>
    public double SiliconPermittivityFPerM { get; }

    /// <summary>ε_ox in F/m.</summary>
    public double OxidePermittivityFPerM { get; }

    /// <summary>r = n_i²/N², the minority-to-majority density ratio in the bulk.</summary>
    public double Ratio { get; }

    /// <summary>√(2 ε_s kT N) in C/m².</summary>
    public double ChargeScale { get; }

    /// <summary>ψ_B = (kT/q) ln(N/n_i) in volt.</summary>
    public double BulkPotentialV { get; }

    /// <summary>Flat-band voltage of the stack without oxide or interface charge, in volt (the start of a fitted V_fb).</summary>
    public double IdealFlatBandVoltageV { get; }

    /// <summary>+1 for a p substrate, −1 for an n substrate: the mirror between the real and the p-type frame.</summary>
    public double Mirror => Stack.Substrate == SubstrateType.P ? 1.0 : -1.0;

    /// <summary>Oxide capacitance ε_ox/t_ox in F/m².</summary>
    public double OxideCapacitance(double thicknessM) => OxidePermittivityFPerM / thicknessM;

    /// <summary>E_g(T) = 1.17 − 4.73×10⁻⁴ T²/(T + 636) eV (Sze &amp; Ng 3rd ed., silicon).</summary>
    public static double BandGap(double temperatureK) => 1.17 - 4.73e-4 * temperatureK * temperatureK / (temperatureK + 636.0);

    /// <summary>
    /// Threshold voltage of the textbook (depletion-approximation) form, V_t = V_fb + 2ψ_B + √(2 q ε_s N · 2ψ_B)/C_ox
    /// for a p substrate (mirrored for n), without poly depletion.
    /// </summary>
    public double ThresholdVoltage(double flatBandV, double thicknessM)
    {
        double twoPsiB = 2.0 * BulkPotentialV;
        double qd = Math.Sqrt(2.0 * Q * SiliconPermittivityFPerM * Stack.DopingM3 * twoPsiB);
        return flatBandV + Mirror * (twoPsiB + qd / OxideCapacitance(thicknessM));
    }

    /// <summary>The state at gate bias <paramref name="gateV"/> (real frame).</summary>
    /// <param name="gateV">Gate bias against the substrate, in volt.</param>
    /// <param name="flatBandV">Flat-band voltage in volt.</param>
    /// <param name="thicknessM">Physical oxide thickness in metre.</param>
    public MosState Solve(double gateV, double flatBandV, double thicknessM)
    {
        double s = Mirror;
        double psi = SolveMirrored(s * (gateV - flatBandV), thicknessM, out double qg, out double vpoly, out _);
        double vox = qg * thicknessM / OxidePermittivityFPerM;
        return new MosState(s * psi, s * vox, s * vpoly, s * qg, CarrierCharge(psi));
    }

    /// <summary>
    /// Small-signal low-frequency (quasi-static) gate capacitance per area, dQ_g/dV_g = [1/C_ox + 1/C_s + dV_poly/dQ_g]⁻¹,
    /// C_s = dQ_g/dψ_s, in F/m².
    /// </summary>
    public double QuasiStaticCapacitance(double gateV, double flatBandV, double thicknessM)
    {
        double psi = SolveMirrored(Mirror * (gateV - flatBandV), thicknessM, out double qg, out _, out double cs);
        _ = psi;
        double dPoly = PolySlope(qg);
        return 1.0 / (thicknessM / OxidePermittivityFPerM + 1.0 / cs + dPoly);
    }

    /// <summary>
    /// ψ_s in the p-type frame for the drive w = V_g − V_fb (mirrored); also Q_g, V_poly and C_s = dQ_g/dψ_s there.
    /// </summary>
    internal double SolveMirrored(double drive, double thicknessM, out double gateCharge, out double polyV, out double surfaceCapacitance)
    {
        double inverseCox = thicknessM / OxidePermittivityFPerM;
        double lo = -1.5, hi = 1.5;
        double psi = Math.Clamp(drive, -0.2, 1.0);
        for (int iteration = 0; iteration < 200; iteration++)
        {
            double qg = GateCharge(psi, out double cs);
            double vp = PolyVoltage(qg);
            double g = psi + qg * inverseCox + vp - drive;
            double dg = 1.0 + cs * (inverseCox + PolySlope(qg));
            if (g > 0) hi = psi; else lo = psi;
            double next = psi - g / dg;
            if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
            if (Math.Abs(next - psi) < 1e-14 || hi - lo < 1e-14) { psi = next; break; }
            psi = next;
        }
        gateCharge = GateCharge(psi, out surfaceCapacitance);
        polyV = PolyVoltage(gateCharge);
        return psi;
    }

    /// <summary>Q_g = sgn(ψ)·C·F (p-type frame) and C_s = dQ_g/dψ.</summary>
    internal double GateCharge(double psi, out double surfaceCapacitance)
    {
        double vt = ThermalVoltageV, u = psi / vt;
        Terms(u, out double major, out double minor, out double dMajor, out double dMinor);
        double f2 = major + Ratio * minor;
        if (f2 <= 0 || Math.Abs(u) < 1e-7)
        {
            double c0 = ChargeScale * Math.Sqrt(0.5 * (1.0 + Ratio)) / vt;
            surfaceCapacitance = c0;
            return c0 * psi;
        }
        double f = Math.Sqrt(f2);
        double sign = u > 0 ? 1.0 : -1.0;
        surfaceCapacitance = sign * ChargeScale * (dMajor + Ratio * dMinor) / (2.0 * f) / vt; // dQ_g/dψ > 0 on both sides
        return sign * ChargeScale * f;
    }

    /// <summary>Mobile charge |Q_inv| (ψ &gt; 0) or |Q_acc| (ψ &lt; 0) in the p-type frame, C/m².</summary>
    internal double CarrierCharge(double psi)
    {
        double u = psi / ThermalVoltageV;
        Terms(u, out double major, out double minor, out _, out _);
        double f = Math.Sqrt(Math.Max(major + Ratio * minor, 0.0));
        if (f == 0) return 0.0;
        return u > 0
            ? ChargeScale * Ratio * minor / (f + Math.Sqrt(major))
            : ChargeScale * major / (f + Math.Sqrt(Ratio * minor));
    }

    /// <summary>M = e^{−u} + u − 1, m = e^{u} − u − 1 and their u-derivatives, by series near u = 0.</summary>
    internal static void Terms(double u, out double major, out double minor, out double dMajor, out double dMinor)
    {
        if (Math.Abs(u) < 1e-3)
        {
            double u2 = u * u, u3 = u2 * u, u4 = u3 * u;
            major = 0.5 * u2 - u3 / 6.0 + u4 / 24.0;
            minor = 0.5 * u2 + u3 / 6.0 + u4 / 24.0;
            dMajor = u - 0.5 * u2 + u3 / 6.0;
            dMinor = u + 0.5 * u2 + u3 / 6.0;
            return;
        }
        double em = Math.Exp(-u), ep = Math.Exp(u);
        major = em + u - 1.0;
        minor = ep - u - 1.0;
        dMajor = 1.0 - em;
        dMinor = ep - 1.0;
    }

    /// <summary>V_poly(Q_g) in the p-type frame.</summary>
    internal double PolyVoltage(double gateCharge)
        => _polyDepletionSign != 0 && gateCharge * _polyDepletionSign > 0 ? _polyDepletionSign * gateCharge * gateCharge * _polyCoefficient : 0.0;

    /// <summary>dV_poly/dQ_g in the p-type frame.</summary>
    internal double PolySlope(double gateCharge)
        => _polyDepletionSign != 0 && gateCharge * _polyDepletionSign > 0 ? 2.0 * Math.Abs(gateCharge) * _polyCoefficient : 0.0;

    /// <summary>+1 when a positive (p-frame) gate charge depletes the gate, −1 when a negative one does, 0 for metal.</summary>
    internal int PolyDepletionSign => _polyDepletionSign;

    /// <summary>1/(2 q ε_s N_gate) in V m⁴/C², 0 for metal.</summary>
    internal double PolyCoefficient => _polyCoefficient;
}
