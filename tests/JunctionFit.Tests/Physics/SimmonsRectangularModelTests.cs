using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class SimmonsRectangularModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly SimmonsRectangularModel Model = SimmonsRectangularModel.Instance;

    private static double[] P(double phiEv, double dNm, double r) => [phiEv * Ev, dNm * 1e-9, r];

    [Fact]
    public void DecayPrefactor_InHandbookUnits_Is1025PerAngstromPerRootEv()
    {
        // Handbook constant 2√(2mₑ)/ħ = 1.025 Å⁻¹ eV⁻¹ᐟ² (common practice, no source).
        double perAngstromPerRootEv = SimmonsRectangularModel.DecayPrefactor * 1e-10 * Math.Sqrt(Ev);
        Assert.Equal(1.025, perAngstromPerRootEv, 3);
    }

    [Theory]
    [InlineData(2.0, 15.0, 0.3)]
    [InlineData(1.0, 20.0, 0.8)]
    [InlineData(3.0, 12.0, -0.5)]
    public void CurrentDensity_IntermediateBias_MatchesHandbookForm(double phiEv, double dAngstrom, double v)
    {
        // Handbook form J = 6.2×10¹⁰/d² {(φ−V/2) e^{−1.025 d √(φ−V/2)} − (φ+V/2) e^{−1.025 d √(φ+V/2)}} A/cm², d in Å, φ in eV
        // (Simmons 1963 with the handbook constants; common practice, no source). The constants are rounded to 2–4 digits,
        // and the exponent error 0.0004·d√φ dominates: tolerance 3 %.
        double a = phiEv - v / 2, b = phiEv + v / 2;
        double handbook = 6.2e10 / (dAngstrom * dAngstrom) * (a * Math.Exp(-1.025 * dAngstrom * Math.Sqrt(a)) - b * Math.Exp(-1.025 * dAngstrom * Math.Sqrt(b)));
        double model = Model.CurrentDensity(v, P(phiEv, dAngstrom / 10, 1.0)) * 1e-4;
        Assert.InRange(model / handbook, 0.97, 1.03);
    }

    [Theory]
    [InlineData(1.0, 1.5, 1.0)]
    [InlineData(0.5, 2.0, 0.4)]
    [InlineData(3.2, 4.0, 0.42)]
    public void CurrentDensity_AtBarrierHeight_IsContinuousBetweenRanges(double phiEv, double dNm, double r)
    {
        var p = P(phiEv, dNm, r);
        double below = Model.CurrentDensity(phiEv * (1 - 1e-12), p);
        double above = Model.CurrentDensity(phiEv * (1 + 1e-12), p);
        Assert.True(GradientAssert.Relative(below, above) < 1e-9, $"{below} vs {above}");
    }

    [Theory]
    [InlineData(1.0, 1.5, 1.0)]
    [InlineData(2.0, 2.5, 0.4)]
    public void CurrentDensity_HighVoltage_IsOddAndIncreasing(double phiEv, double dNm, double r)
    {
        var p = P(phiEv, dNm, r);
        double previous = 0;
        for (double v = 0.05; v < 4 * phiEv; v += 0.05)
        {
            double j = Model.CurrentDensity(v, p);
            Assert.Equal(-j, Model.CurrentDensity(-v, p));
            Assert.True(j > previous, $"J not increasing at {v} V");
            previous = j;
        }
    }

    public static TheoryData<double, double, double, double> DerivativeCases()
    {
        var data = new TheoryData<double, double, double, double>();
        foreach (var (phi, d, r) in new[] { (2.0, 1.5, 1.0), (1.0, 2.0, 0.4), (3.5, 1.0, 2.0), (0.6, 3.0, 0.3) })
        {
            foreach (double frac in new[] { -2.5, -0.7, 0.01, 0.3, 0.9, 1.4, 3.0 })
            {
                data.Add(phi, d, r, frac * phi);
            }
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void CurrentDensityGradient_BothRanges_MatchesCentralDifferences(double phiEv, double dNm, double r, double v)
    {
        // Central finite differences (common practice, no source).
        GradientAssert.Barrier(Model, v, P(phiEv, dNm, r));
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void BiasDerivative_BothRanges_MatchesCentralDifference(double phiEv, double dNm, double r, double v)
    {
        var p = P(phiEv, dNm, r);
        double h = 1e-6 * Math.Abs(v);
        double fd = (Model.CurrentDensity(v + h, p) - Model.CurrentDensity(v - h, p)) / (2 * h);
        double analytic = ((IBiasDerivative)Model).CurrentDensityBiasDerivative(v, p);
        Assert.True(GradientAssert.Relative(analytic, fd) < 1e-6, $"{analytic} vs {fd}");
    }

    /// <summary>
    /// Independent implementation of Simmons's general formula (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963):
    /// J = e/(2πh(βΔs)²) {φ̄ e^{−A√φ̄} − (φ̄ + eV) e^{−A√(φ̄+eV)}}, A = 4πβΔs√(2m)/h, β = 1, energies in eV here;
    /// Δs = s, φ̄ = φ₀ − eV/2 for eV &lt; φ₀ and Δs = sφ₀/eV, φ̄ = φ₀/2 for eV &gt; φ₀ (rectangular barrier).
    /// </summary>
    private static double IndependentSimmons(double v, double phi0Ev, double sNm, double massRatio)
    {
        // CODATA 2018 (NIST SP 961): e and h exact, mₑ and ε₀ measured; typed in here, independent of PhysicalConstants.
        const double q = Codata2018.ElementaryChargeC, h = Codata2018.PlanckJs, me = Codata2018.ElectronMassKg;
        double sign = Math.Sign(v);
        double vAbs = Math.Abs(v);
        double deltaS, phiBar;
        if (vAbs < phi0Ev) { deltaS = sNm * 1e-9; phiBar = phi0Ev - vAbs / 2; }
        else { deltaS = sNm * 1e-9 * phi0Ev / vAbs; phiBar = phi0Ev / 2; }
        double j0 = q / (2 * Math.PI * h * deltaS * deltaS);
        double a = 4 * Math.PI * deltaS * Math.Sqrt(2 * massRatio * me) / h;
        double t1 = phiBar * q * Math.Exp(-a * Math.Sqrt(phiBar * q));
        double t2 = (phiBar + vAbs) * q * Math.Exp(-a * Math.Sqrt((phiBar + vAbs) * q));
        return sign * j0 * (t1 - t2);
    }

    [Fact]
    public void Simulate_RangeOfParametersAndMasses_MatchesIndependentImplementation()
    {
        // Simmons 1963 general formula, implemented separately above; required agreement 1e-6 relative.
        var junction = new JunctionCurrentModel(Model);
        const double area = 2.5e-11;
        double worst = 0;
        foreach (double phi in new[] { 0.4, 1.0, 2.0, 3.5 })
        foreach (double d in new[] { 0.8, 1.5, 3.0 })
        foreach (double r in new[] { 0.1, 0.42, 1.0, 2.5 })
        {
            double[] p = [phi * Ev, d * 1e-9, r, area];
            var (vs, iis) = IvSimulator.Simulate(junction, p, new SimulationSpec(-2.5 * phi, 2.5 * phi, 101));
            for (int k = 0; k < vs.Length; k++)
            {
                double expected = area * IndependentSimmons(vs[k], phi, d, r);
                if (expected == 0 && iis[k] == 0) continue;
                worst = Math.Max(worst, GradientAssert.Relative(expected, iis[k]));
            }
        }
        Assert.True(worst < 1e-6, $"worst relative difference {worst}");
    }

    [Fact]
    public void CheckValidity_BeyondBarrierHeight_WarnsInWords()
    {
        var warnings = Model.CheckValidity(2.5, P(2.0, 1.5, 1.0));
        Assert.Contains(warnings, w => w.Contains("high-voltage", StringComparison.Ordinal));
        Assert.Empty(Model.CheckValidity(1.0, P(2.0, 1.5, 1.0)));
    }
}
