using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// <see cref="MosElectrostatics"/> against textbook electrostatics written out independently in <see cref="MosReference"/>:
/// n_i(T) and E_g(T), the ideal flat-band voltage φ_m − φ_s for every gate and substrate, Sze &amp; Ng's bracket functions and
/// F-function charge and capacitance in every regime (including the series range near flat band), the mobile carrier charge,
/// the bias equation with a depleting poly gate solved by MathNet's Brent method, and the series-capacitance C–V.
/// </summary>
public class MosElectrostaticsTests
{
    private static MosStackOptions Stack(bool n, GateType? gate, double doping = 1e23, double gateDoping = 2e26)
        => new() { Substrate = n ? SubstrateType.N : SubstrateType.P, Gate = gate, DopingM3 = doping, GateDopingM3 = gateDoping };

    private static char GateChar(bool n, GateType? gate) => (gate ?? (n ? GateType.PPoly : GateType.NPoly)) switch
    {
        GateType.NPoly => 'n',
        GateType.PPoly => 'p',
        _ => 'm',
    };

    private static void Relative(double expected, double actual, double tolerance, string what)
        => Assert.True(Math.Abs(actual - expected) <= tolerance * Math.Abs(expected), $"{what}: expected {expected:R}, got {actual:R}");

    [Theory]
    [InlineData(300.0)]
    [InlineData(250.0)]
    [InlineData(400.0)]
    [InlineData(550.0)]
    public void Constructor_Temperature_GivesIntrinsicDensityBandGapAndThermalVoltage(double temperatureK)
    {
        // n_i = 1e16 m⁻³ (T/300)^{3/2} exp(E_g(300)/2kT₃₀₀ − E_g(T)/2kT) (Sze & Ng ch. 1; n_i(300 K) from memory), Varshni E_g(T)
        // with Sze & Ng's silicon values; kT/q from CODATA 2018. Tolerance 1e-12 relative (closed forms).
        var es = new MosElectrostatics(Stack(false, GateType.Metal), temperatureK);
        Relative(MosReference.K * temperatureK / MosReference.Q, es.ThermalVoltageV, 1e-12, "kT/q");
        Relative(MosReference.BandGapEv(temperatureK), es.BandGapEv, 1e-12, "E_g");
        Relative(MosReference.IntrinsicDensity(temperatureK), es.IntrinsicDensityM3, 1e-10, "n_i");
        // Worked numbers (hand calculation): E_g(300 K) = 1.17 − 4.73e-4·9e4/936 = 1.124519 eV (Sze & Ng quote 1.12 eV).
        if (temperatureK == 300.0) Assert.Equal(1.124519, es.BandGapEv, 1e-6);
    }

    [Fact]
    public void Constructor_IntrinsicDensity_RisesAsPublishedBetween300And400K()
    {
        // Worked number: ratio n_i(400)/n_i(300) = (4/3)^{3/2} exp(E_g(300)/2kT₃₀₀ − E_g(400)/2kT₄₀₀), E_g(400) = 1.17 − 4.73e-4·1.6e5/1036
        // = 1.096950 eV: exponent 21.749 − 15.912 (hand calculation) → ratio ≈ 5.3e2 (Sze & Ng's n_i(T) plot shows about 1e12–1e13 cm⁻³
        // at 400 K from memory). Tolerance 1 % on the hand-rounded exponent.
        var es = new MosElectrostatics(Stack(false, GateType.Metal), 400);
        double ratio = es.IntrinsicDensityM3 / 1e16;
        double expected = Math.Pow(4.0 / 3.0, 1.5) * Math.Exp(1.124519 / (2 * 0.0258520) - 1.096950 / (2 * 0.0344693));
        Relative(expected, ratio, 1e-2, "n_i(400)/n_i(300)");
        Assert.InRange(es.IntrinsicDensityM3 / 1e6, 1e12, 1e13);
    }

    [Theory]
    [InlineData(false, null)]
    [InlineData(false, GateType.NPoly)]
    [InlineData(false, GateType.PPoly)]
    [InlineData(false, GateType.Metal)]
    [InlineData(true, null)]
    [InlineData(true, GateType.NPoly)]
    [InlineData(true, GateType.Metal)]
    public void IdealFlatBand_EveryGateAndSubstrate_IsWorkFunctionDifference(bool n, GateType? gate)
    {
        // V_fb = φ_m − φ_s, φ_s = χ + E_g/2 ± ψ_B (+ p, − n), φ_m = χ (n⁺), χ + E_g (p⁺), 4.6 eV (metal default) (Hu, Modern
        // Semiconductor Devices, ch. 5; Sze & Ng ch. 4). Without a gate type the CMOS pairing: n⁺ on p, p⁺ on n. Tolerance 1e-10 V.
        var es = new MosElectrostatics(Stack(n, gate, 3e23), 300);
        var reference = new MosReference(n, GateChar(n, gate), 3e23);
        Assert.Equal(reference.IdealFlatBand, es.IdealFlatBandVoltageV, 1e-10);
        Assert.Equal(reference.BulkPotential, es.BulkPotentialV, 1e-10);
        Assert.Equal(GateChar(n, gate), GateChar(n, es.Stack.EffectiveGate));
    }

    [Fact]
    public void IdealFlatBand_NPolyOnP_WorkedExample()
    {
        // Worked example: n⁺ poly on p-type 1e17 cm⁻³ at 300 K: V_fb = −E_g/2 − ψ_B = −0.5623 − 0.0258520·ln(1e7) = −0.5623 − 0.4167
        // = −0.979 V (hand calculation; Hu ch. 5 quotes about −0.98 V for this pairing, from memory). Tolerance 1 mV.
        var es = new MosElectrostatics(MosStackOptions.Default, 300);
        Assert.Equal(-0.979, es.IdealFlatBandVoltageV, 1e-3);
    }

    [Theory]
    [InlineData(9e-4)]
    [InlineData(-9e-4)]
    [InlineData(3e-4)]
    [InlineData(-5e-5)]
    [InlineData(1e-6)]
    [InlineData(-1e-6)]
    [InlineData(0.01)]
    [InlineData(-0.3)]
    [InlineData(2.0)]
    [InlineData(-7.0)]
    [InlineData(35.0)]
    public void Terms_AnyReducedPotential_MatchExponentialBrackets(double u)
    {
        // Sze & Ng's brackets M = e^{−u} + u − 1, m = e^{u} − u − 1 and their derivatives 1 − e^{−u}, e^{u} − 1, from a 40-term Taylor
        // series (|u| < 0.5) or the exponentials. Tolerance 1e-10 relative (the code's 4th-order series is exact to u³/60 there).
        MosElectrostatics.Terms(u, out double major, out double minor, out double dMajor, out double dMinor);
        Relative(MosReference.ExpMinusOneMinusX(-u), major, 1e-10, "M");
        Relative(MosReference.ExpMinusOneMinusX(u), minor, 1e-10, "m");
        Relative(-MosReference.ExpMinusOne(-u), dMajor, 1e-10, "dM/du");
        Relative(MosReference.ExpMinusOne(u), dMinor, 1e-10, "dm/du");
    }

    [Theory]
    [InlineData(1e23, 0.02)]
    [InlineData(1e23, -0.02)]
    [InlineData(1e23, 0.4)]
    [InlineData(1e23, 1.0)]
    [InlineData(1e23, -0.25)]
    [InlineData(1e18, 0.1)]
    [InlineData(1e18, 0.5)]
    [InlineData(1e18, -0.1)]
    [InlineData(1e18, 3e-5)]
    public void GateCharge_AnyRegime_MatchesSzeFFunction(double doping, double psi)
    {
        // Q_g = −Q_s = sgn(ψ_s) √(2ε_s kT N_A) F and C_s = (ε_s/(√2 L_D))[1 − e^{−u} + r(e^{u} − 1)]/F (Sze & Ng 3rd ed., ch. 4).
        // 1e18 m⁻³ makes r = n_i²/N² = 1e-4, so the minority bracket weighs. Tolerance 1e-9 relative.
        var es = new MosElectrostatics(Stack(false, GateType.Metal, doping), 300);
        var reference = new MosReference(false, 'm', doping);
        double qg = es.GateCharge(psi, out double cs);
        Relative(-reference.SiliconCharge(psi), qg, 1e-9, "Q_g");
        Relative(reference.SurfaceCapacitance(psi), cs, 1e-9, "C_s");
    }

    [Theory]
    [InlineData(1e23)]
    [InlineData(1e18)]
    public void GateCharge_AtFlatBand_IsZeroWithFlatBandCapacitance(double doping)
    {
        // At ψ_s = 0: Q_s = 0 and C_s = (ε_s/L_D)√(1 + n_p0/p_p0), the u → 0 limit of Sze & Ng's C_D (ch. 4); with 1e18 m⁻³ the
        // minority term is 1e-4, ten thousand times the tolerance (1e-9 relative).
        var es = new MosElectrostatics(Stack(false, GateType.Metal, doping), 300);
        var reference = new MosReference(false, 'm', doping);
        Assert.Equal(0.0, es.GateCharge(0.0, out double cs));
        Relative(reference.SurfaceCapacitance(0.0), cs, 1e-9, "C_FB");
        // Just off flat band the linear form holds to |u|/6 (Taylor series of F): 2e-9 V is u ≈ 8e-8.
        double small = es.GateCharge(2e-9, out _);
        Relative(reference.SurfaceCapacitance(0.0) * 2e-9, small, 2e-8, "Q_g near flat band");
    }

    [Theory]
    [InlineData(1.0, true)]
    [InlineData(0.9, true)]
    [InlineData(-0.3, true)]
    [InlineData(-0.15, true)]
    [InlineData(0.5, false)]
    [InlineData(0.2, false)]
    [InlineData(2e-4, false)]
    [InlineData(-2e-4, false)]
    [InlineData(-0.05, false)]
    public void CarrierCharge_InversionAndAccumulation_IsPartOfChargeFromMobileCarriers(double psi, bool direct)
    {
        // |Q_inv| = √(2ε_s kT N)(F − √M) and |Q_acc| = √(2ε_s kT N)(F − √(r m)) (Sze & Ng ch. 4: the silicon charge with minus
        // without the mobile carriers' bracket); where F and √M nearly cancel (depletion, weak inversion) through the identity
        // F − √a = b/(F + √a). Tolerance 1e-9 relative.
        var es = new MosElectrostatics(Stack(false, GateType.Metal), 300);
        var reference = new MosReference(false, 'm', 1e23);
        Relative(reference.CarrierCharge(psi, direct), es.CarrierCharge(psi), 1e-9, "|Q_c|");
        Assert.Equal(0.0, es.CarrierCharge(0.0));
    }

    [Theory]
    [InlineData(false, GateType.Metal, -3.0)]
    [InlineData(false, GateType.Metal, -0.5)]
    [InlineData(false, GateType.Metal, 0.4)]
    [InlineData(false, GateType.Metal, 3.5)]
    [InlineData(false, null, 2.5)]
    [InlineData(false, null, -2.5)]
    [InlineData(false, GateType.PPoly, -3.0)]
    [InlineData(false, GateType.PPoly, 2.0)]
    [InlineData(true, null, -3.0)]
    [InlineData(true, null, 2.5)]
    [InlineData(true, GateType.NPoly, 3.0)]
    [InlineData(true, GateType.NPoly, -2.0)]
    [InlineData(true, GateType.Metal, -0.2)]
    public void Solve_AnyBias_MatchesBrentRootOfBiasEquation(bool n, GateType? gate, double gateV)
    {
        // V_g = V_fb + ψ_s + Q_g/C_ox + V_poly with Sze & Ng's charge and the depletion approximation in the gate, solved in the
        // real frame by MathNet's Brent method (MosReference). Gate doping 1e26 m⁻³ so that the poly drop is tenths of a volt.
        // Tolerances: ψ_s 1e-11 V; charges and voltages 1e-8 relative (plus 1e-13 V / C m⁻² absolute for the zeros).
        double vfb = n ? 0.3 : -0.4, t = 2e-9;
        var es = new MosElectrostatics(Stack(n, gate, 2e23, 1e26), 300);
        var reference = new MosReference(n, GateChar(n, gate), 2e23, gateDopingM3: 1e26);
        double psi = reference.SurfacePotential(gateV, vfb, t);
        double qg = -reference.SiliconCharge(psi);
        var state = es.Solve(gateV, vfb, t);
        Assert.Equal(psi, state.SurfacePotentialV, 1e-11);
        Assert.Equal(qg, state.GateChargeCPerM2, Math.Abs(qg) * 1e-8 + 1e-13);
        Assert.Equal(qg / reference.Cox(t), state.OxideVoltageV, Math.Abs(qg / reference.Cox(t)) * 1e-8 + 1e-13);
        double vpoly = reference.PolyVoltage(qg);
        Assert.Equal(vpoly, state.PolyDepletionVoltageV, Math.Abs(vpoly) * 1e-8 + 1e-13);
        double carrier = reference.CarrierCharge(psi, false);
        Assert.Equal(carrier, state.CarrierChargeCPerM2, carrier * 1e-8 + 1e-13);
        // The poly cases above are chosen so that half of them deplete (n⁺ with Q_g > 0, p⁺ with Q_g < 0) and half do not.
        if (gate != GateType.Metal && Math.Abs(gateV) > 1.5)
        {
            bool depletes = GateChar(n, gate) == 'n' ? qg > 0 : qg < 0;
            Assert.Equal(depletes, Math.Abs(state.PolyDepletionVoltageV) > 0.01);
        }
    }

    [Theory]
    [InlineData(false, null, 2.0)]
    [InlineData(false, null, -2.0)]
    [InlineData(false, null, 0.2)]
    [InlineData(true, null, -2.0)]
    [InlineData(true, GateType.NPoly, 2.0)]
    [InlineData(false, GateType.Metal, 1.0)]
    public void QuasiStaticCapacitance_WithPolyGate_IsSeriesOfOxideSiliconAndPolyCapacitances(bool n, GateType? gate, double gateV)
    {
        // C = [1/C_ox + 1/C_s + 1/C_poly]⁻¹, C_poly = ε_s/W_poly, W_poly = |Q_g|/(q N_gate) in the depletion approximation
        // (Sze & Ng ch. 4; Hu ch. 5, poly depletion), C_s from Sze & Ng's C_D at the Brent-solved ψ_s. Tolerance 1e-8 relative.
        double vfb = n ? 0.3 : -0.4, t = 1.5e-9;
        var es = new MosElectrostatics(Stack(n, gate, 2e23, 1e26), 300);
        var reference = new MosReference(n, GateChar(n, gate), 2e23, gateDopingM3: 1e26);
        Relative(reference.QuasiStaticCapacitance(gateV, vfb, t), es.QuasiStaticCapacitance(gateV, vfb, t), 1e-8, "C_LF");
    }

    [Fact]
    public void Constructor_NullStackOrTemperatureOutside50To800K_Throws()
    {
        // The documented range of the electrostatics (the n_i(T) and E_g(T) fits are for about 50–800 K; common practice, no source).
        Assert.Throws<ArgumentNullException>(() => new MosElectrostatics(null!, 300));
        Assert.Throws<ArgumentOutOfRangeException>(() => new MosElectrostatics(MosStackOptions.Default, 40));
        Assert.Throws<ArgumentOutOfRangeException>(() => new MosElectrostatics(MosStackOptions.Default, 900));
    }
}
