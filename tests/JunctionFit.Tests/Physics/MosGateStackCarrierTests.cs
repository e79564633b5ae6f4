using JunctionFit.Physics;
using MathNet.Numerics.RootFinding;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// <see cref="MosGateStackModel"/>'s current against the Lee–Hu compact form written out here (W.-C. Lee and C. Hu, IEEE Trans.
/// Electron Devices 48, 1366, 2001, in the textbook shape [1 − (1 − x)^{3/2}]/x of the trapezoid exponent) with the oxide voltage
/// and carrier charge of the independent electrostatics in <see cref="MosReference"/>: which carrier tunnels with which barrier,
/// mass and α on every side of every stack, the sign, the series range near flat band, flat band itself; also the defaults, the
/// temperature and doping notes and the validity warnings at their stated limits.
/// </summary>
public class MosGateStackCarrierTests
{
    private const double Q = MosReference.Q, H = Codata2018.PlanckJs, Me = Codata2018.ElectronMassKg; // CODATA 2018 (NIST SP 961)
    private const double Hbar = H / (2 * Math.PI);

    // Fitted-carrier parameters that differ from every default, so that the choice between parameter and default shows.
    private const double PhiP = 3.3, MassP = 0.45, PhiN = 4.2, MassN = 0.30;

    private static GateType? Gate(char gate) => gate switch { 'n' => GateType.NPoly, 'p' => GateType.PPoly, 'm' => GateType.Metal, _ => null };

    private static char Effective(bool n, char gate) => gate == '-' ? (n ? 'p' : 'n') : gate;

    /// <summary>Lee &amp; Hu's J for |V_ox|, |Q_c|, t_ox, φ_b (eV), m_ox/mₑ and α, ε_ox = 3.9 ε₀.</summary>
    private static double LeeHu(double voxAbs, double carrier, double t, double phiEv, double massRatio, double alpha)
    {
        double epsOx = 3.9 * MosReference.Eps0, x = voxAbs / phiEv;
        double shape = x < 1 ? (1 - Math.Pow(1 - x, 1.5)) / x : 1 / x;
        double correction = x < 1 ? Math.Exp(20 / phiEv * Math.Pow(x, alpha) * (1 - x)) : 1;
        double exponent = 4 * Math.Sqrt(2 * massRatio * Me) / (3 * Hbar) * t * Math.Sqrt(Q * phiEv) * shape;
        return Q * Q / (8 * Math.PI * H * phiEv) * (voxAbs / t) * (carrier / epsOx) * correction * Math.Exp(-exponent);
    }

    private static (MosGateStackModel Model, MosReference Reference, double[] Parameters) Setup(bool n, char gate, double t, double doping = 2e23)
    {
        var model = new MosGateStackModel(new MosStackOptions { Substrate = n ? SubstrateType.N : SubstrateType.P, Gate = Gate(gate), DopingM3 = doping, DopingStated = true }, 300);
        var reference = new MosReference(n, Effective(n, gate), doping);
        double[] p = n ? [t, 0.3, PhiN * Q, MassN] : [t, -0.4, PhiP * Q, MassP];
        return (model, reference, p);
    }

    private static double Expected(MosReference reference, double vg, double[] p, double phiEv, double massRatio, double alpha)
    {
        double t = p[0], vfb = p[1];
        double psi = reference.SurfacePotential(vg, vfb, t);
        double qg = -reference.SiliconCharge(psi);
        double vox = qg / reference.Cox(t);
        // J > 0 from the gate into the substrate: along the oxide field, i.e. with the sign of V_ox (model documentation).
        return Math.Sign(vox) * LeeHu(Math.Abs(vox), reference.CarrierCharge(psi, false), t, phiEv, massRatio, alpha);
    }

    [Theory]
    // Carrier rule of the model documentation; defaults from Lee & Hu 2001 (electrons 3.1 eV, 0.40 mₑ, α 0.6; holes 4.5 eV,
    // 0.32 mₑ, α 0.4): p inversion, electrons (fitted); p accumulation under n⁺ or metal, electrons from the gate (fitted);
    // p accumulation under p⁺, holes from the gate (defaults); n inversion, holes (fitted, α 0.4); n accumulation, electrons
    // (defaults). Last case: |V_ox| > φ_b, the Fowler–Nordheim side (h = 1/x, no correction); the two after it are in depletion (ψ_s ≈ 6 kT/q), where the −1 of both brackets weighs.
    [InlineData(false, 'm', 2.0, 2.0, PhiP, MassP, 0.6)]
    [InlineData(false, '-', 1.5, 1.8, PhiP, MassP, 0.6)]
    [InlineData(false, '-', -2.5, 2.0, PhiP, MassP, 0.6)]
    [InlineData(false, 'm', -1.5, 2.0, PhiP, MassP, 0.6)]
    [InlineData(false, 'p', -2.5, 2.0, 4.5, 0.32, 0.4)]
    [InlineData(true, '-', -2.2, 2.0, PhiN, MassN, 0.4)]
    [InlineData(true, 'm', -1.8, 1.6, PhiN, MassN, 0.4)]
    [InlineData(true, 'n', 2.5, 2.0, 3.1, 0.40, 0.6)]
    [InlineData(true, '-', 2.0, 2.0, 3.1, 0.40, 0.6)]
    [InlineData(false, 'm', 5.5, 3.0, PhiP, MassP, 0.6)]
    [InlineData(false, 'm', -0.2, 2.0, PhiP, MassP, 0.6)]
    [InlineData(true, 'm', 0.1, 2.0, PhiN, MassN, 0.4)]
    public void CurrentDensity_EveryStackAndSide_MatchesLeeHuWithIndependentElectrostatics(bool n, char gate, double vg, double tNm,
        double phiEv, double massRatio, double alpha)
    {
        // Tolerance 1e-7 relative: ψ_s from two root finders agree to 1e-11 V; the exponent is about 20–40.
        var (model, reference, p) = Setup(n, gate, tNm * 1e-9);
        double expected = Expected(reference, vg, p, phiEv, massRatio, alpha);
        double j = model.CurrentDensity(vg, p);
        Assert.True(Math.Abs(j - expected) <= 1e-7 * Math.Abs(expected), $"J {j:R} vs Lee–Hu {expected:R}");
    }

    [Theory]
    [InlineData(2.3e-5)]
    [InlineData(-2.3e-5)]
    [InlineData(8e-6)]
    public void CurrentDensity_WithinThermalMillivoltOfFlatBand_MatchesLeeHu(double psi)
    {
        // |qψ_s/kT| < 1e-3: the model's series branch of M and m. V_g from the reference bias equation at that ψ_s (metal gate).
        // Tolerance 2e-8 relative: the 4th-order series is exact to u³/60 ≈ 1e-11; the trapezoid shape loses ~1e-10 to
        // cancellation at x ≈ 1e-6, times an exponent of about 25.
        var (model, reference, p) = Setup(false, 'm', 2e-9);
        double vg = reference.GateBias(psi, p[1], p[0]);
        double expected = Expected(reference, vg, p, PhiP, MassP, 0.6);
        double j = model.CurrentDensity(vg, p);
        Assert.True(expected != 0);
        Assert.True(Math.Abs(j - expected) <= 2e-8 * Math.Abs(expected), $"J {j:R} vs Lee–Hu {expected:R}");
    }

    [Fact]
    public void CurrentDensity_AtFlatBand_IsZeroWithZeroGradient()
    {
        // At V_g = V_fb there is no carrier charge and no oxide field (Sze & Ng ch. 4), so J = 0 and so are its derivatives.
        var (model, _, p) = Setup(false, 'm', 2e-9);
        double[] gradient = [7, 7, 7, 7];
        Assert.Equal(0.0, model.CurrentDensity(p[1], p, gradient));
        Assert.All(gradient, g => Assert.Equal(0.0, g));
    }

    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void Constructor_Defaults_AreLeeHuValuesAndIdealFlatBand(bool n)
    {
        // Lee & Hu 2001: electrons 3.1 eV, 0.40 mₑ (p substrate, inversion electrons); holes 4.5 eV, 0.32 mₑ (n substrate).
        // V_fb start: φ_m − φ_s of the CMOS pairing (Hu ch. 5), within ±2.5 V. Inversion at V_g > 0 on p, V_g < 0 on n.
        var model = new MosGateStackModel(new MosStackOptions { Substrate = n ? SubstrateType.N : SubstrateType.P }, 300);
        var reference = new MosReference(n, n ? 'p' : 'n', MosStackOptions.DefaultDopingM3);
        Assert.Equal((n ? 4.5 : 3.1) * Q, model.Parameters[2].DefaultSi, 1e-30);
        Assert.Equal(n ? 0.32 : 0.40, model.Parameters[3].DefaultSi, 1e-15);
        Assert.Equal(reference.IdealFlatBand, model.Parameters[1].DefaultSi, 1e-10);
        Assert.Equal(n ? -1 : 1, model.InversionSign);
        Assert.Equal(n ? SubstrateType.N : SubstrateType.P, model.Stack.Substrate);
    }

    [Fact]
    public void Constructor_TemperatureMissingOrZero_Assumes300KAndSaysSo()
    {
        // A missing or non-positive temperature is "not stated": 300 K is used and the warnings say so (model documentation).
        var none = new MosGateStackModel(MosStackOptions.Default);
        var zero = new MosGateStackModel(MosStackOptions.Default, 0);
        var hot = new MosGateStackModel(MosStackOptions.Default, 350);
        Assert.False(none.TemperatureStated);
        Assert.False(zero.TemperatureStated);
        Assert.True(hot.TemperatureStated);
        Assert.Equal(300, zero.Electrostatics.TemperatureK);
        Assert.Equal(350, hot.Electrostatics.TemperatureK);
        double[] p = [2e-9, -0.9, 3.1 * Q, 0.4];
        Assert.Contains(none.CheckValidity(1.0, p), w => w.Contains("temperature not stated", StringComparison.Ordinal));
        Assert.DoesNotContain(hot.CheckValidity(1.0, p), w => w.Contains("temperature not stated", StringComparison.Ordinal));
        Assert.Equal(MosStackOptions.Default, new MosGateStackModel().Stack);
    }

    [Fact]
    public void CheckValidity_DopingNotStated_SaysSo()
    {
        double[] p = [2e-9, -0.9, 3.1 * Q, 0.4];
        var assumed = new MosGateStackModel(MosStackOptions.Default, 300).CheckValidity(1.0, p);
        var stated = new MosGateStackModel(MosStackOptions.Default with { DopingStated = true }, 300).CheckValidity(1.0, p);
        Assert.Contains(assumed, w => w.Contains("substrate doping not given", StringComparison.Ordinal));
        Assert.DoesNotContain(stated, w => w.Contains("substrate doping not given", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData(0.7, true)]
    [InlineData(0.85, false)]
    [InlineData(5.9, false)]
    [InlineData(6.2, true)]
    public void CheckValidity_Thickness_WarnsOutside08To6Nm(double tNm, bool warns)
    {
        // The documented window of direct tunnelling through a continuum SiO₂ (about 0.8–6 nm; common practice, no source).
        var model = new MosGateStackModel(MosStackOptions.Default with { DopingStated = true }, 300);
        var w = model.CheckValidity(0.5, [tNm * 1e-9, -0.9, 3.1 * Q, 0.4]);
        Assert.Equal(warns, w.Any(s => s.Contains("0.8-6 nm", StringComparison.Ordinal)));
    }

    [Theory]
    [InlineData(1.05e9, true)]
    [InlineData(0.95e9, false)]
    public void CheckValidity_OxideFieldOnNegativeSide_WarnsAbove10MvPerCm(double field, bool warns)
    {
        // 10 MV/cm is about the breakdown field of SiO₂ (Sze & Ng appendix, dielectric strength of order 1e7 V/cm; from memory).
        // Metal gate on p, V_fb = +0.9 V, 3 nm: the bias of that field in accumulation comes from the reference charge relation
        // (Brent on Q_g(ψ_s) = C_ox·V_ox); the same bias on the positive side gives well under 10 MV/cm (inversion holds V_ox down).
        double t = 3e-9, vfb = 0.9;
        var reference = new MosReference(false, 'm', 1e23);
        double qg = -field * t * reference.Cox(t);
        double psi = Brent.FindRoot(x => -reference.SiliconCharge(x) - qg, -1.5, 0.0, 1e-14, 300);
        double vg = reference.GateBias(psi, vfb, t);
        double psiPositive = reference.SurfacePotential(-vg, vfb, t);
        Assert.True(-reference.SiliconCharge(psiPositive) / reference.Cox(t) / t < 0.5e9);
        var model = new MosGateStackModel(new MosStackOptions { Gate = GateType.Metal, DopingStated = true }, 300);
        var w = model.CheckValidity(Math.Abs(vg), [t, vfb, 3.1 * Q, 0.4]);
        Assert.Equal(warns, w.Any(s => s.Contains("MV/cm", StringComparison.Ordinal)));
        if (warns) Assert.Contains(w, s => s.Contains(FormattableString.Invariant($"{field / 1e8:0.#} MV/cm"), StringComparison.Ordinal));
    }
}
