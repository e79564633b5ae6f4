using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class BrinkmanDynesRowellModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly BrinkmanDynesRowellModel Model = BrinkmanDynesRowellModel.Instance;

    private static double[] P(double phiEv, double dNm, double dphiEv, double r) => [phiEv * Ev, dNm * 1e-9, dphiEv * Ev, r];

    [Theory]
    [InlineData(2.0, 15.0)]
    [InlineData(1.0, 10.0)]
    [InlineData(3.0, 20.0)]
    [InlineData(0.5, 25.0)]
    public void ZeroBiasConductance_FreeElectronMass_MatchesHandbookForm(double phiEv, double dAngstrom)
    {
        // G(0) = 3.16×10¹⁰ √φ̄/d · exp(−1.025 d √φ̄) Ω⁻¹ cm⁻², d in Å, φ̄ in eV (Brinkman, Dynes & Rowell,
        // J. Appl. Phys. 41, 1915, 1970). The printed constants carry 3–4 digits; the exponent's rounding 1.025 vs 1.02462
        // gives up to 0.0004·d√φ̄ ≈ 1 %: tolerance 1.5 %.
        double handbook = 3.16e10 * Math.Sqrt(phiEv) / dAngstrom * Math.Exp(-1.025 * dAngstrom * Math.Sqrt(phiEv));
        var p = P(phiEv, dAngstrom / 10, 0.0, 1.0);
        const double h = 1e-4;
        double g0 = (Model.CurrentDensity(h, p) - Model.CurrentDensity(-h, p)) / (2 * h) * 1e-4; // S/m² → S/cm²
        Assert.InRange(g0 / handbook, 0.985, 1.015);
        Assert.Equal(1.0, BrinkmanDynesRowellModel.ZeroBiasConductance(p) * 1e-4 / g0, 6);
    }

    [Fact]
    public void CurrentDensity_PositiveAsymmetry_LargerCurrentAtNegativeBias()
    {
        // Sign convention of Δφ = φ_top − φ_bottom (this project); BDR 1970: minimum of G at eV = (4/9)Δφ/(A₀√φ̄) > 0.
        var p = P(2.0, 1.5, 0.8, 1.0);
        Assert.True(Math.Abs(Model.CurrentDensity(-0.3, p)) > Math.Abs(Model.CurrentDensity(0.3, p)));
        var bias = (IBiasDerivative)Model;
        double a0 = 4 * 1.5e-9 * Math.Sqrt(2 * PhysicalConstants.ElectronMassKg) / (3 * PhysicalConstants.ReducedPlanckJs);
        double vMin = 4.0 / 9.0 * 0.8 * Ev / (a0 * Math.Sqrt(2.0 * Ev)) / Ev;
        double left = bias.CurrentDensityBiasDerivative(vMin - 1e-3, p), mid = bias.CurrentDensityBiasDerivative(vMin, p), right = bias.CurrentDensityBiasDerivative(vMin + 1e-3, p);
        Assert.True(mid < left && mid < right);
    }

    public static TheoryData<double, double, double, double, double> DerivativeCases()
    {
        var data = new TheoryData<double, double, double, double, double>();
        foreach (var (phi, d, dphi, r) in new[] { (2.0, 1.5, 0.5, 1.0), (1.0, 2.0, -0.3, 0.4), (3.5, 1.0, 1.2, 2.0), (0.8, 3.0, 0.0, 0.3) })
        {
            foreach (double v in new[] { -0.6, -0.1, 0.02, 0.25, 0.7 })
            {
                data.Add(phi, d, dphi, r, v);
            }
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void CurrentDensityGradient_RangeOfParameters_MatchesCentralDifferences(double phiEv, double dNm, double dphiEv, double r, double v)
    {
        // Central finite differences (common practice, no source); Δφ = 0 uses an absolute step of 1 µeV.
        GradientAssert.Barrier(Model, v, P(phiEv, dNm, dphiEv, r), 1e-6, [0, 0, 1e-6 * Ev, 0]);
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void BiasDerivative_RangeOfParameters_MatchesCentralDifference(double phiEv, double dNm, double dphiEv, double r, double v)
    {
        var p = P(phiEv, dNm, dphiEv, r);
        const double h = 1e-5;
        double fd = (Model.CurrentDensity(v + h, p) - Model.CurrentDensity(v - h, p)) / (2 * h);
        Assert.True(GradientAssert.Relative(((IBiasDerivative)Model).CurrentDensityBiasDerivative(v, p), fd) < 1e-7);
    }

    /// <summary>
    /// Independent implementation of BDR 1970: the conductance G(V) = G(0)[1 − (A₀Δφ/(16φ̄^{3/2}))eV + (9/128)(A₀²/φ̄)(eV)²],
    /// A₀ = 4d√(2m)/(3ħ), G(0) = (√(2mφ̄)/d)(e/h)² exp(−2d√(2mφ̄)/ħ), worked in eV and nm, integrated from 0 to V by
    /// Simpson's rule (exact for this quadratic).
    /// </summary>
    private static double IndependentBdr(double v, double phiEv, double dNm, double dphiEv, double massRatio)
    {
        // CODATA 2018 (NIST SP 961): e and h exact, mₑ and ε₀ measured; typed in here, independent of PhysicalConstants.
        const double q = Codata2018.ElementaryChargeC, h = Codata2018.PlanckJs, me = Codata2018.ElectronMassKg;
        double hbar = h / (2 * Math.PI);
        double d = dNm * 1e-9;
        double m = massRatio * me;
        double a0PerRootEv = 4 * d * Math.Sqrt(2 * m * q) / (3 * hbar);
        double g0 = Math.Sqrt(2 * m * phiEv * q) / d * (q / h) * (q / h) * Math.Exp(-2 * d * Math.Sqrt(2 * m * phiEv * q) / hbar);
        double G(double u) => g0 * (1 - a0PerRootEv * dphiEv / (16 * Math.Pow(phiEv, 1.5)) * u + 9.0 / 128.0 * a0PerRootEv * a0PerRootEv / phiEv * u * u);
        return v / 6 * (G(0) + 4 * G(v / 2) + G(v));
    }

    [Fact]
    public void Simulate_RangeOfParametersAndMasses_MatchesIndependentImplementation()
    {
        // BDR 1970, implemented separately above; required agreement 1e-6 relative.
        var junction = new JunctionCurrentModel(Model);
        const double area = 1e-12;
        double worst = 0;
        foreach (double phi in new[] { 0.5, 1.0, 2.0, 4.0 })
        foreach (double d in new[] { 1.0, 1.8, 3.0 })
        foreach (double dphi in new[] { -0.4, 0.0, 0.3 })
        foreach (double r in new[] { 0.2, 0.5, 1.0, 2.0 })
        {
            double[] p = [phi * Ev, d * 1e-9, dphi * phi * Ev, r, area];
            var (vs, iis) = IvSimulator.Simulate(junction, p, new SimulationSpec(-0.5 * phi, 0.5 * phi, 51));
            for (int k = 0; k < vs.Length; k++)
            {
                double expected = area * IndependentBdr(vs[k], phi, d, dphi * phi, r);
                if (expected == 0 && iis[k] == 0) continue;
                worst = Math.Max(worst, GradientAssert.Relative(expected, iis[k]));
            }
        }
        Assert.True(worst < 1e-6, $"worst relative difference {worst}");
    }

    [Fact]
    public void CheckValidity_LargeAsymmetryThinBarrierHighBias_WarnsForEach()
    {
        var warnings = Model.CheckValidity(1.5, P(1.0, 0.8, 1.2, 1.0));
        Assert.Contains(warnings, w => w.Contains("thickness", StringComparison.Ordinal));
        Assert.Contains(warnings, w => w.Contains("asymmetry", StringComparison.Ordinal));
        Assert.Contains(warnings, w => w.Contains("half the mean barrier", StringComparison.Ordinal));
        Assert.Empty(Model.CheckValidity(0.4, P(2.0, 1.5, 0.3, 1.0)));
    }
}
