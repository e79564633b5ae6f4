using JunctionFit.Physics;
using JunctionFit.Physics.Numerics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class WkbModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private const double Me = PhysicalConstants.ElectronMassKg;
    private const double Hbar = PhysicalConstants.ReducedPlanckJs;
    private static readonly WkbModel Cold = new(new BarrierModelOptions { FermiEnergyEv = 10 });

    private static double[] P(double phiEv, double dNm, double dphiEv = 0, double r = 1, double efEv = 10) => [phiEv * Ev, dNm * 1e-9, dphiEv * Ev, r, efEv * Ev];

    private static double SimmonsExponent(double phiEv, double dNm, double r = 1)
        => SimmonsRectangularModel.DecayPrefactor * dNm * 1e-9 * Math.Sqrt(r * phiEv * Ev);

    private struct Sine : IIntegrand { public readonly double Evaluate(double x) => Math.Sin(x); }

    private struct RootX : IIntegrand { public readonly double Evaluate(double x) => Math.Sqrt(x); }

    private struct Peak : IIntegrand { public readonly double Evaluate(double x) => Math.Exp(-1e4 * (x - 0.3) * (x - 0.3)); }

    [Fact]
    public void AdaptiveQuadrature_KnownIntegrals_MeetsTolerance()
    {
        // ∫₀^π sin = 2; ∫₀¹ √x = 2/3 (end-point singularity); ∫₀¹ e^{−10⁴(x−0.3)²} = √π/100 (closed forms, textbook).
        var s = new Sine();
        Assert.Equal(2.0, AdaptiveQuadrature.Integrate(ref s, 0, Math.PI, 1e-12, 0, out _), 12);
        var r = new RootX();
        Assert.Equal(2.0 / 3.0, AdaptiveQuadrature.Integrate(ref r, 0, 1, 1e-10, 0, out _), 9);
        var p = new Peak();
        Assert.Equal(Math.Sqrt(Math.PI) / 100, AdaptiveQuadrature.Integrate(ref p, 0, 1, 1e-10, 0, out _), 11);
    }

    [Theory]
    [InlineData(0.5, 2.0, 0.5, 1.0)]
    [InlineData(1.0, 3.0, 1.0, 0.4)]
    [InlineData(2.9, 3.0, 0.3, 1.0)]
    [InlineData(0.05, 1.0, 2.0, 0.1)]
    public void TransferMatrix_RectangularBarrier_MatchesExactFormula(double eEv, double u0Ev, double lNm, double r)
    {
        // T = [1 + U₀² sinh²(κL) / (4E(U₀ − E))]⁻¹, κ = √(2m(U₀ − E))/ħ (textbook formula).
        double m = r * Me, e = eEv * Ev, u0 = u0Ev * Ev, l = lNm * 1e-9;
        double kappa = Math.Sqrt(2 * m * (u0 - e)) / Hbar;
        double sinh = Math.Sinh(kappa * l);
        double exact = 1 / (1 + u0 * u0 * sinh * sinh / (4 * e * (u0 - e)));
        double t = TransferMatrix.Transmission(e, [u0], [l], 0, 0, m, out double refl);
        Assert.True(GradientAssert.Relative(exact, t) < 1e-9, $"{t} vs {exact}");
        Assert.Equal(1.0, t + refl, 12); // T + R = 1 (flux conservation, textbook)
    }

    [Fact]
    public void TransferMatrix_RandomMultilayers_TransmissionPlusReflectionIsOne()
    {
        // T + R = 1 for any lossless profile (flux conservation, textbook), including energies above the layers and unequal leads.
        var rng = new Random(3);
        for (int trial = 0; trial < 200; trial++)
        {
            int n = rng.Next(1, 12);
            var u = new double[n];
            var w = new double[n];
            for (int k = 0; k < n; k++) { u[k] = (rng.NextDouble() * 4 - 0.5) * Ev; w[k] = rng.NextDouble() * 0.5e-9; }
            double left = -rng.NextDouble() * Ev, right = -rng.NextDouble() * 2 * Ev;
            double e = rng.NextDouble() * 4 * Ev;
            double t = TransferMatrix.Transmission(e, u, w, left, right, Me * (0.2 + rng.NextDouble()), out double refl);
            Assert.InRange(t, 0, 1);
            Assert.Equal(1.0, t + refl, 10);
        }
    }

    [Theory]
    [InlineData(1.0, 3.0, 2.0)]
    [InlineData(0.5, 1.5, 3.0)]
    [InlineData(2.0, 2.5, 4.0)]
    public void TransferMatrix_ThickBarrier_MatchesAsymptoticAndWkbExponent(double eEv, double u0Ev, double lNm)
    {
        // κL ≫ 1: T ≈ 16 (E/U₀)(1 − E/U₀) e^{−2κL} (textbook asymptotic), whose exponential is the WKB T = e^{−2κL}.
        double e = eEv * Ev, u0 = u0Ev * Ev, l = lNm * 1e-9;
        double kappa = Math.Sqrt(2 * Me * (u0 - e)) / Hbar;
        Assert.True(kappa * l > 9);
        double asymptotic = 16 * (e / u0) * (1 - e / u0) * Math.Exp(-2 * kappa * l);
        double t = TransferMatrix.Transmission(e, [u0], [l], 0, 0, Me, out _);
        Assert.True(GradientAssert.Relative(asymptotic, t) < 1e-6, $"{t} vs {asymptotic}");
        // The wkb model's transmission of the same (unbiased, symmetric) barrier: energies from the Fermi level, E_F = 10 eV.
        double efEv = 10.0;
        double wkbT = Cold.Transmission(0.0, e - efEv * Ev, P(u0Ev - efEv, lNm, 0, 1, efEv));
        Assert.True(GradientAssert.Relative(Math.Exp(-2 * kappa * l), wkbT) < 1e-12);
    }

    [Theory]
    [InlineData(3.0, 2.0, 1.0)]
    [InlineData(2.0, 1.5, 0.5)]
    [InlineData(4.0, 3.0, 1.0)]
    [InlineData(1.0, 2.5, 0.3)]
    public void CurrentDensity_LowBiasRectangular_ExceedsSimmonsByLeadingTermFactor(double phiEv, double dNm, double r)
    {
        // At V → 0, T = 0 the Tsu–Esaki integral with D = e^{−A√(φ − ε)} gives G = (e²/(4πhd²))(1 + A√φ)e^{−A√φ}; Simmons 1963
        // keeps the leading term, G_S = (e²/(4πhd²))(A√φ − 2)e^{−A√φ}; BDR 1970 keep A√φ. Derived here from the same integral.
        double a = SimmonsExponent(phiEv, dNm, r);
        var p = P(phiEv, dNm, 0, r, 10 + 2 * phiEv);
        const double v = 1e-4;
        double wkb = Cold.CurrentDensity(v, p);
        double simmons = SimmonsRectangularModel.Instance.CurrentDensity(v, [phiEv * Ev, dNm * 1e-9, r]);
        double bdr = BrinkmanDynesRowellModel.Instance.CurrentDensity(v, [phiEv * Ev, dNm * 1e-9, 0, r]);
        Assert.True(GradientAssert.Relative(wkb / simmons, (a + 1) / (a - 2)) < 2e-5, $"{wkb / simmons} vs {(a + 1) / (a - 2)}");
        Assert.True(GradientAssert.Relative(bdr / wkb, a / (a + 1)) < 2e-5, $"{bdr / wkb} vs {a / (a + 1)}");
    }

    [Theory]
    [InlineData(3.0, 2.0)]
    [InlineData(4.0, 3.0)]
    [InlineData(2.5, 2.5)]
    public void CurrentDensity_InsideSimmonsRange_AgreesWithSimmonsWithinFifteenPercent(double phiEv, double dNm)
    {
        // Simmons 1963 intermediate form against the numerical Tsu–Esaki/WKB current, e|V| ≤ φ/3 and A√φ ≥ 30 (Simmons's range
        // of validity: thick, high barrier). Stated tolerance: Simmons lies 0–15 % below WKB (measured 5–13 %), from the leading-term
        // factor 3/(A√φ + 1) (5–8 % here) and the β = 1 mean-barrier approximation, which grows with bias.
        Assert.True(SimmonsExponent(phiEv, dNm) >= 30);
        var p = P(phiEv, dNm);
        double[] ps = [phiEv * Ev, dNm * 1e-9, 1.0];
        for (double v = -phiEv / 3; v <= phiEv / 3 + 1e-9; v += phiEv / 15)
        {
            if (Math.Abs(v) < 1e-9) continue;
            double ratio = SimmonsRectangularModel.Instance.CurrentDensity(v, ps) / Cold.CurrentDensity(v, p);
            Assert.InRange(ratio, 0.85, 1.0);
        }
    }

    [Fact]
    public void CurrentDensity_PositiveAsymmetry_AgreesWithBdrSignAndSize()
    {
        // Sign convention Δφ = φ_top − φ_bottom, checked numerically: the WKB trapezoid and BDR 1970 both give |J(−V)| > |J(V)|,
        // with the same relative asymmetry within 25 % at 0.1 V.
        var pw = P(2.5, 2.0, 0.6);
        double[] pb = [2.5 * Ev, 2e-9, 0.6 * Ev, 1.0];
        double Asym(Func<double, double> j) => (Math.Abs(j(-0.1)) - j(0.1)) / j(0.1);
        double wkb = Asym(v => Cold.CurrentDensity(v, pw));
        double bdr = Asym(v => BrinkmanDynesRowellModel.Instance.CurrentDensity(v, pb));
        Assert.True(wkb > 0 && bdr > 0);
        Assert.InRange(bdr / wkb, 0.75, 1.25);
    }

    [Fact]
    public void CurrentDensity_At300K_RatioMatchesThermalFactor()
    {
        // Fermi functions integrated directly (Tsu–Esaki) against πckT/sin(πckT) (Stratton 1962; Simmons 1964) at 300 K,
        // c = d√(2m)/(ħ√φ̄): within 1 % (the factor assumes a transmission exponential in energy).
        var warm = new WkbModel(new BarrierModelOptions { FermiEnergyEv = 10, TemperatureK = 300 });
        var p = P(2.0, 2.0);
        double ratio = warm.CurrentDensity(0.2, p) / Cold.CurrentDensity(0.2, p);
        double factor = ThermalFactor.Evaluate(ThermalFactor.Argument(ThermalFactor.RectangularDecay(2.0 * Ev, 2e-9, 1.0), 300));
        Assert.InRange(ratio / factor, 0.99, 1.01);
        Assert.True(ratio > 1.03);
    }

    [Fact]
    public void CurrentDensity_OddInBiasForSymmetricBarrier()
    {
        var p = P(1.5, 1.5);
        foreach (double v in new[] { 0.05, 0.7, 2.5 })
        {
            Assert.True(GradientAssert.Relative(-Cold.CurrentDensity(v, p), Cold.CurrentDensity(-v, p)) < 1e-8);
        }
    }

    [Theory]
    [InlineData(0.3)]
    [InlineData(-0.8)]
    [InlineData(3.0)]
    public void CurrentDensityGradient_NumericalDerivatives_MatchIndependentDifferences(double v)
    {
        // The model's documented central differences (step 1e-4) against the test's (step 1e-6): agreement 1e-4 relative.
        GradientAssert.Barrier(Cold, v, P(2.0, 1.5, 0.4, 0.8, 6.0), 1e-4);
    }

    [Fact]
    public void CurrentDensity_ImageForce_RaisesCurrentAndShowsSimmonsImageFactorTwo()
    {
        // Classical image potential (exact series) in wkb against Simmons 1963's printed image term: the printed term is about
        // twice the classical one, so simmons-image at 2ε_r lands near wkb at ε_r while simmons-image at ε_r is several times higher
        // (analysis in docs/models.md).
        var image = new WkbModel(new BarrierModelOptions { FermiEnergyEv = 10, IncludeImageForce = true, RelativePermittivity = 4 });
        var p = P(3.0, 2.0);
        double jImage = image.CurrentDensity(0.5, p);
        Assert.True(jImage > 5 * Cold.CurrentDensity(0.5, p));
        double simmonsSame = new SimmonsImageForceModel(4).CurrentDensity(0.5, [3 * Ev, 2e-9, 1.0, 4.0]);
        double simmonsDouble = new SimmonsImageForceModel(8).CurrentDensity(0.5, [3 * Ev, 2e-9, 1.0, 8.0]);
        Assert.True(simmonsSame > 4 * jImage);
        Assert.InRange(simmonsDouble / jImage, 0.5, 1.2);
    }

    [Fact]
    public void CheckValidity_ThinLowBarrier_WarnsWkb()
    {
        Assert.Contains(Cold.CheckValidity(0.1, P(0.1, 0.3)), w => w.Contains("WKB", StringComparison.Ordinal));
        Assert.Empty(Cold.CheckValidity(1.0, P(2.0, 2.0)));
    }
}
