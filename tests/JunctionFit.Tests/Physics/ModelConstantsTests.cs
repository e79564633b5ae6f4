using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Every physical and model constant pinned against a value from outside the project, through the model where the model
/// uses it, tightly enough that a change of 1 % in any of them fails at least one check here (the note of each check says by
/// how much a 1 % change moves it). The outside values are typed in below, never taken from <see cref="PhysicalConstants"/>.
/// </summary>
public class ModelConstantsTests
{
    // CODATA 2018 recommended values (NIST SP 961, 2019): e, h and k exact by the 2019 SI definition; mₑ and ε₀ measured.
    private const double CodataE = Codata2018.ElementaryChargeC;
    private const double CodataH = Codata2018.PlanckJs;
    private const double CodataMe = Codata2018.ElectronMassKg;
    private const double CodataK = Codata2018.BoltzmannJPerK;
    private const double CodataEps0 = Codata2018.VacuumPermittivityFPerM;

    private const double Ev = CodataE;

    [Fact]
    public void PhysicalConstants_AreCodata2018()
    {
        // CODATA 2018 (NIST SP 961): the exact ones equal to the last digit, the measured ones to their printed digits.
        Assert.Equal(CodataE, PhysicalConstants.ElementaryChargeC);
        Assert.Equal(CodataH, PhysicalConstants.PlanckJs);
        Assert.Equal(CodataK, PhysicalConstants.BoltzmannJPerK);
        Assert.Equal(CodataMe, PhysicalConstants.ElectronMassKg);
        Assert.Equal(CodataEps0, PhysicalConstants.VacuumPermittivityFPerM);
        // ħ = 1.054571817…×10⁻³⁴ J s (CODATA 2018, exact but infinitely long; printed to 10 digits).
        Assert.InRange(PhysicalConstants.ReducedPlanckJs / Codata2018.ReducedPlanckJs, 1 - 1e-9, 1 + 1e-9);
        Assert.Equal(CodataE, PhysicalConstants.JoulePerElectronVolt);
    }

    [Theory]
    [InlineData(3.2, 0.42, 6.0, 5.0)]
    [InlineData(3.2, 0.42, 6.0, -8.0)]
    [InlineData(2.0, 1.0, 4.0, 3.0)]
    [InlineData(4.5, 0.5, 10.0, 20.0)]
    public void FowlerNordheimCurrent_EqualsFormWithPublishedFirstAndSecondConstants(double phiEv, double massRatio, double dNm, double v)
    {
        // Published Fowler–Nordheim constants a = e³/(8πh) ≈ 1.541434×10⁻⁶ A eV V⁻² and b = (8π/3)(2mₑ)^½/(e h)
        // ≈ 6.830890 eV^{-3/2} V nm⁻¹ (R. G. Forbes, J. H. B. Deane, Proc. R. Soc. A 463, 2907, 2007; printed to 7 digits).
        // With an oxide mass m* = r mₑ: J = (a/r) F²/φ · exp(−b √r φ^{3/2} / F), F = |V|/d (Lenzlinger & Snow 1969).
        // Tolerance 1e-5 relative: 7 printed digits of b in an exponent of up to ~60. Doubling the prefactor fails by 100 %;
        // mₑ changed by 1 % moves the exponent by 0.5 %, i.e. J by 10–30 %.
        const double a = 1.541434e-6, b = 6.830890;
        double fVPerNm = Math.Abs(v) / dNm;
        double expected = a / massRatio * (fVPerNm * 1e9) * (fVPerNm * 1e9) / phiEv
                          * Math.Exp(-b * Math.Sqrt(massRatio) * Math.Pow(phiEv, 1.5) / fVPerNm);
        double model = FowlerNordheimModel.Instance.CurrentDensity(v, [phiEv * Ev, dNm * 1e-9, massRatio]);
        Assert.Equal(Math.Sign(v), Math.Sign(model));
        Assert.InRange(Math.Abs(model) / expected, 1 - 1e-5, 1 + 1e-5);
    }

    [Theory]
    [InlineData(2.0, 1.5, 1.0)]
    [InlineData(1.0, 2.0, 0.42)]
    [InlineData(3.2, 3.0, 0.3)]
    public void SimmonsCurrent_LowBias_EqualsSimmonsLowVoltageFormWithItsExactCorrection(double phiEv, double dNm, double massRatio)
    {
        // Simmons 1963 (J. Appl. Phys. 34, 1793), low-voltage range: J = (e/h)² √(2m*φ)/d · V · exp(−A√φ),
        // A = 4πd√(2m*)/h (from memory). Expanding the model's intermediate form to first order in V gives the same
        // leading term times (1 − 2/(A√φ)) exactly (f(u) = u e^{−A√u}, J ≈ −K f′(φ) eV / d²). Constants typed in (CODATA 2018).
        // At V = 1 mV the next order is (eV/φ)² ≈ 1e-6: tolerance 1e-5. A 1 % change of e or h moves J by 2–3 %, of mₑ by 5–15 %.
        double m = massRatio * CodataMe, d = dNm * 1e-9, phi = phiEv * Ev;
        double aSqrtPhi = 4 * Math.PI * d * Math.Sqrt(2 * m * phi) / CodataH;
        const double v = 1e-3;
        double leading = (CodataE / CodataH) * (CodataE / CodataH) * Math.Sqrt(2 * m * phi) / d * v * Math.Exp(-aSqrtPhi);
        double expected = leading * (1 - 2 / aSqrtPhi);
        double model = SimmonsRectangularModel.Instance.CurrentDensity(v, [phi, d, massRatio]);
        Assert.InRange(model / expected, 1 - 1e-5, 1 + 1e-5);
    }

    [Fact]
    public void SimmonsCurrent_LowBias_InHandbookUnitsMatchesPrintedConstants()
    {
        // The handbook constants of the same form: e²/(2πh) = 6.2×10¹⁰ A cm⁻² V⁻¹ Å² and 2√(2mₑ)/ħ = 1.025 Å⁻¹ eV^{-1/2}
        // (common practice, no source), here through the model: the slope of ln J against d at fixed small bias is
        // −1.025 √φ per Å, to the 4 printed digits (tolerance 5e-4; a 1 % change of mₑ moves it by 0.5 %).
        double[] p1 = [2.0 * Ev, 1.0e-9, 1.0], p2 = [2.0 * Ev, 1.1e-9, 1.0];
        const double v = 1e-3;
        double j1 = SimmonsRectangularModel.Instance.CurrentDensity(v, p1);
        double j2 = SimmonsRectangularModel.Instance.CurrentDensity(v, p2);
        // ln J = const − A√φ − 2 ln d + ln(A√φ/2 − 1): remove the two slowly varying terms before taking the slope.
        double Exponent(double dA, double j)
        {
            double aSqrtPhi = 1.0246 * dA * Math.Sqrt(2.0);
            return Math.Log(j) + 2 * Math.Log(dA) - Math.Log(aSqrtPhi / 2 - 1);
        }
        double slopePerAngstrom = (Exponent(11.0, j2) - Exponent(10.0, j1)) / 1.0;
        Assert.InRange(-slopePerAngstrom / Math.Sqrt(2.0), 1.025 - 5e-4, 1.025 + 5e-4);
    }

    [Theory]
    [InlineData(1.0, 2.0)]
    [InlineData(3.9, 1.5)]
    [InlineData(9.0, 3.0)]
    public void ImageForceStrength_EqualsCoulombConstantInElectronvoltNanometres(double relativePermittivity, double dNm)
    {
        // e²/(4πε₀) = 1.439964 eV nm (Forbes & Deane 2007, from CODATA); Simmons's image strength λ = e² ln 2/(8π ε_r ε₀ s)
        // = 1.439964 eV nm · ln 2 / (2 ε_r s) (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963), read through the model's first
        // turning point s₁ = 1.2 λ s / φ₀ at zero bias. Tolerance 2e-6 (7 printed digits); a 1 % change of e or ε₀ moves s₁ 1–2 %.
        const double phi0Ev = 3.0;
        var model = new SimmonsImageForceModel(relativePermittivity);
        var g = model.Geometry(0.0, [phi0Ev * Ev, dNm * 1e-9, 1.0, relativePermittivity]);
        double lambdaEv = 1.439964 * Math.Log(2.0) / (2.0 * relativePermittivity * dNm);
        double expectedS1Nm = 1.2 * lambdaEv * dNm / phi0Ev;
        Assert.InRange(g.S1M * 1e9 / expectedS1Nm, 1 - 2e-6, 1 + 2e-6);
    }

    /// <summary>Classical image potential between two metal plates, energy in eV at x (nm) for a gap d (nm):
    /// U(x) = φ + (e²/(16π ε_r ε₀ d)) [ψ(x/d) + ψ(1 − x/d) + 2γ], with e²/(4πε₀) = 1.439964 eV nm (Forbes & Deane 2007) and
    /// Math.NET's digamma (a reference library); the sum of the image series in closed form (J. G. Simmons, J. Appl. Phys.
    /// 34, 1793, 1963; from memory for the digamma form).</summary>
    private static double ImagePotentialEv(double xNm, double dNm, double phiEv, double eps)
    {
        double t = xNm / dNm;
        double strength = 1.439964 / (4.0 * eps * dNm);
        return phiEv + strength * (MathNet.Numerics.SpecialFunctions.DiGamma(t) + MathNet.Numerics.SpecialFunctions.DiGamma(1 - t) + 2 * MathNet.Numerics.Constants.EulerMascheroni);
    }

    [Theory]
    [InlineData(3.0, 2.0, 4.0)]
    [InlineData(1.5, 3.0, 2.0)]
    public void WkbImageBarrier_TopAtMidGap_IsLoweredByLn2TimesCoulombConstantOverEpsD(double phiEv, double dNm, double eps)
    {
        // At mid-gap ψ(½) = −γ − 2 ln 2 (Abramowitz & Stegun 6.3.3), so the classical image barrier's top lies at
        // φ − ln 2 · e²/(4π ε₀ ε_r d), with e²/(4πε₀) = 1.439964 eV nm (Forbes & Deane 2007).
        // Read through the WKB model: the transmission is 1 exactly from the barrier top up. Bisection to 1e-7 eV; a 1 %
        // change in the image constant moves the top by 1 % of the lowering (≥ 1.6 meV here).
        var model = new WkbModel(BarrierModelOptions.Default with { IncludeImageForce = true, RelativePermittivity = eps });
        double[] p = [phiEv * Ev, dNm * 1e-9, 0.0, 1.0, 5.0 * Ev];
        double lo = phiEv - 1.0, hi = phiEv;
        for (int k = 0; k < 60; k++)
        {
            double mid = 0.5 * (lo + hi);
            if (model.Transmission(0.0, mid * Ev, p) < 1.0) lo = mid; else hi = mid;
        }
        double expectedTop = phiEv - Math.Log(2.0) * 1.439964 / (eps * dNm);
        Assert.InRange(hi, expectedTop - 1e-6, expectedTop + 1e-6);
        Assert.InRange(ImagePotentialEv(dNm / 2, dNm, phiEv, eps), expectedTop - 1e-6, expectedTop + 1e-6);
    }

    [Fact]
    public void WkbImageTransmission_BelowTheTop_MatchesIndependentWkbIntegral()
    {
        // D(ε) = exp(−2 ∫ √(2 mₑ (U − ε)) / ħ dx) between the turning points of the image potential above, integrated by
        // Math.NET's double-exponential rule with the CODATA 2018 constants typed in. Tolerance 1e-6 relative in ln D.
        const double phiEv = 3.0, dNm = 2.0, eps = 4.0, energyEv = 2.0;
        var model = new WkbModel(BarrierModelOptions.Default with { IncludeImageForce = true, RelativePermittivity = eps });
        double[] p = [phiEv * Ev, dNm * 1e-9, 0.0, 1.0, 5.0 * Ev];
        double Turning(double outside, double inside)
        {
            for (int k = 0; k < 200; k++)
            {
                double mid = 0.5 * (outside + inside);
                if (ImagePotentialEv(mid, dNm, phiEv, eps) > energyEv) inside = mid; else outside = mid;
            }
            return 0.5 * (outside + inside);
        }
        double x1 = Turning(1e-9, dNm / 2), x2 = Turning(dNm - 1e-9, dNm / 2);
        double integralEvNm = MathNet.Numerics.Integrate.DoubleExponential(
            x => Math.Sqrt(Math.Max(ImagePotentialEv(x, dNm, phiEv, eps) - energyEv, 0.0)), x1, x2, 1e-12);
        double kappaPerNmPerRootEv = Math.Sqrt(2 * CodataMe * CodataE) / (CodataH / (2 * Math.PI)) * 1e-9;
        double expectedLnD = -2 * kappaPerNmPerRootEv * integralEvNm;
        double lnD = Math.Log(model.Transmission(0.0, energyEv * Ev, p));
        Assert.InRange(lnD / expectedLnD, 1 - 1e-6, 1 + 1e-6);
    }

    [Fact]
    public void ThermalFactorArgument_UsesBoltzmannConstant()
    {
        // kT at 300 K = 25.852 meV (k = 8.617333262×10⁻⁵ eV/K, CODATA 2018); the argument πckT for c = 1/eV is π·0.025852.
        // Tolerance 2e-5 (5 printed digits); a 1 % change of k fails by 1 %.
        double x = ThermalFactor.Argument(1.0 / Ev, 300.0);
        Assert.InRange(x / (Math.PI * 0.025852), 1 - 2e-5, 1 + 2e-5);
    }

    [Fact]
    public void SiliconBandGap_IsVarshniWithThurmondParameters()
    {
        // E_g(T) = 1.17 − 4.73×10⁻⁴ T²/(T + 636) eV (Varshni form, parameters of C. D. Thurmond, J. Electrochem. Soc. 122,
        // 1133, 1975, as tabulated in Sze & Ng, Physics of Semiconductor Devices, 3rd ed., 2007; from memory). E_g(300 K) ≈
        // 1.1245 eV, the handbook 1.12 eV. Checked at 0, 300 and 600 K to 1e-9 eV, which pins each of the three numbers.
        foreach (double t in new[] { 0.0, 300.0, 600.0 })
        {
            double expected = 1.17 - 4.73e-4 * t * t / (t + 636.0);
            Assert.Equal(expected, MosElectrostatics.BandGap(t), 9);
        }
        Assert.InRange(MosElectrostatics.BandGap(300.0), 1.11, 1.13);
    }

    [Fact]
    public void MosMaterialDefaults_AreHandbookValues()
    {
        // Sze & Ng, Physics of Semiconductor Devices, 3rd ed. (2007), appendix tables (from memory): ε(Si) = 11.7,
        // ε(SiO₂) = 3.9, electron affinity of Si χ = 4.05 eV. Equality: these are the defaults the docs name.
        var stack = new MosStackOptions();
        Assert.Equal(11.7, stack.SiliconPermittivity);
        Assert.Equal(3.9, stack.OxidePermittivity);
        Assert.Equal(4.05, MosElectrostatics.SiliconElectronAffinityEv);
        // Metal gate default 4.6 eV: a mid-gap metal such as TiN, 4.5-4.7 eV (from memory); docs/models.md names it.
        Assert.Equal(4.6, stack.MetalWorkFunctionEv);
    }

    [Fact]
    public void SiliconIntrinsicDensity_At300K_IsSproulGreenValue()
    {
        // n_i(300 K) = 1.00×10¹⁰ cm⁻³ (A. B. Sproul, M. A. Green, J. Appl. Phys. 70, 846, 1991; from memory), read through the
        // model's bulk potential ψ_B = (kT/q) ln(N_A/n_i): at N_A = 10¹⁷ cm⁻³, ψ_B = 0.025852 V · ln 10⁷ = 0.41668 V.
        // Tolerance 1e-4 V; a 1 % change of n_i moves ψ_B by 0.26 mV, of k by 4 mV.
        var es = new MosElectrostatics(new MosStackOptions { DopingM3 = 1e23 }, 300.0);
        double expected = CodataK * 300.0 / CodataE * Math.Log(1e23 / 1e16);
        Assert.InRange(es.BulkPotentialV, expected - 1e-4, expected + 1e-4);
    }

    [Fact]
    public void MosTunnelBarrierDefaults_AreLeeHuValues()
    {
        // W.-C. Lee, C. Hu, IEEE Trans. Electron Devices 48, 1366 (2001), table of fitted constants (from memory; the same
        // numbers stand in BSIM4, checked through the current in MosGateStackModelTests): electrons from the conduction band
        // φ_b = 3.1 eV, m_ox = 0.40 mₑ, α = 0.6; holes from the valence band φ_b = 4.5 eV, m_ox = 0.32 mₑ, α = 0.4.
        Assert.Equal(3.1, MosGateStackModel.ElectronBarrierEv);
        Assert.Equal(0.40, MosGateStackModel.ElectronMassRatio);
        Assert.Equal(0.6, MosGateStackModel.ElectronAlpha);
        Assert.Equal(4.5, MosGateStackModel.HoleBarrierEv);
        Assert.Equal(0.32, MosGateStackModel.HoleMassRatio);
        Assert.Equal(0.4, MosGateStackModel.HoleAlpha);
    }

    [Theory]
    [InlineData(1.0)]
    [InlineData(0.6)]
    public void TransitionVoltage_SingleLevelLorentzianCurve_IsTwoOverRootThreeOfLevel(double levelEv)
    {
        // Off-resonant single-level model I ∝ V / (ε₀² − (eV/2)²): the minimum of ln(I/V²) against 1/V lies at
        // V_t = 2ε₀/(√3 e) (I. Bâldea, Phys. Rev. B 85, 035442, 2012; from memory; it follows from d ln(I/V²)/dV = 0).
        // A curve that is not the project's own model; tolerance 0.5 % (the smoothing window of the finder).
        const int n = 401;
        double vMax = 1.9 * levelEv;
        var v = new double[n];
        var i = new double[n];
        for (int k = 0; k < n; k++)
        {
            v[k] = -vMax + 2 * vMax * k / (n - 1);
            i[k] = 1e-9 * v[k] / (levelEv * levelEv - v[k] * v[k] / 4);
        }
        var vt = TransitionVoltage.Compute(v, i);
        double expected = 2 * levelEv / Math.Sqrt(3);
        Assert.NotNull(vt.PositiveV);
        Assert.NotNull(vt.NegativeV);
        Assert.InRange(vt.PositiveV.Value / expected, 0.995, 1.005);
        Assert.InRange(-vt.NegativeV.Value / expected, 0.995, 1.005);
    }
}
