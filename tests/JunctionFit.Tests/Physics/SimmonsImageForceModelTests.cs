using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class SimmonsImageForceModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly SimmonsImageForceModel Model = new();

    private static double[] P(double phiEv, double dNm, double r, double eps) => [phiEv * Ev, dNm * 1e-9, r, eps];

    /// <summary>
    /// Independent implementation of Simmons 1963, image-force section, in eV and Å: λ = e² ln2/(8πKε₀s),
    /// s₁ = 1.2λs/φ₀, s₂ = s[1 − 9.2λ/(3φ₀ + 4λ − 2V)] + s₁ (V &lt; φ₀) or (φ₀ − 5.6λ)s/V (V &gt; φ₀),
    /// φ̄ = φ₀ − (V/2s)(s₁+s₂) − [1.15λs/(s₂−s₁)] ln[s₂(s−s₁)/(s₁(s−s₂))], J = e/(2πhΔs²){φ̄e^{−A√φ̄} − (φ̄+V)e^{−A√(φ̄+V)}}.
    /// </summary>
    private static double Independent(double v, double phi0, double sAngstrom, double r, double k)
    {
        // CODATA 2018 (NIST SP 961): e and h exact, mₑ and ε₀ measured; typed in here, independent of PhysicalConstants.
        const double q = Codata2018.ElementaryChargeC, h = Codata2018.PlanckJs, me = Codata2018.ElectronMassKg, eps0 = Codata2018.VacuumPermittivityFPerM;
        double vAbs = Math.Abs(v);
        double lambda = q * Math.Log(2) / (8 * Math.PI * k * eps0 * sAngstrom * 1e-10); // eV
        double s1 = 1.2 * lambda * sAngstrom / phi0;
        double s2 = vAbs < phi0 ? sAngstrom * (1 - 9.2 * lambda / (3 * phi0 + 4 * lambda - 2 * vAbs)) + s1 : (phi0 - 5.6 * lambda) * sAngstrom / vAbs;
        double ds = s2 - s1;
        double phiBar = phi0 - vAbs / (2 * sAngstrom) * (s1 + s2) - 1.15 * lambda * sAngstrom / ds * Math.Log(s2 * (sAngstrom - s1) / (s1 * (sAngstrom - s2)));
        double dsM = ds * 1e-10;
        double a = 4 * Math.PI * dsM * Math.Sqrt(2 * r * me * q) / h; // per √eV
        double j = q * q / (2 * Math.PI * h * dsM * dsM) * (phiBar * Math.Exp(-a * Math.Sqrt(phiBar)) - (phiBar + vAbs) * Math.Exp(-a * Math.Sqrt(phiBar + vAbs)));
        return Math.Sign(v) * j;
    }

    [Fact]
    public void CurrentDensity_RangeOfParameters_MatchesIndependentImplementation()
    {
        // Simmons 1963 image-force formulas, implemented separately above; required agreement 1e-6 relative.
        double worst = 0;
        int compared = 0;
        foreach (double phi in new[] { 1.0, 2.0, 3.0 })
        foreach (double d in new[] { 1.5, 2.5, 4.0 })
        foreach (double r in new[] { 0.4, 1.0 })
        foreach (double k in new[] { 2.0, 4.0, 9.0 })
        foreach (double frac in new[] { -1.5, -0.6, 0.05, 0.4, 0.9, 1.3 })
        {
            double v = frac * phi;
            var p = P(phi, d, r, k);
            if (!Model.Geometry(v, p).Valid) continue;
            worst = Math.Max(worst, GradientAssert.Relative(Independent(v, phi, d * 10, r, k), Model.CurrentDensity(v, p)));
            compared++;
        }
        Assert.True(compared > 250, $"only {compared} valid points");
        Assert.True(worst < 1e-6, $"worst relative difference {worst}");
    }

    [Fact]
    public void CurrentDensity_VeryLargePermittivity_ApproachesRectangularBarrier()
    {
        // λ → 0 removes the image force: Simmons's rectangular intermediate-bias formula (Simmons 1963).
        double[] rect = [2.0 * Ev, 2.0e-9, 1.0];
        var p = P(2.0, 2.0, 1.0, 1e6);
        foreach (double v in new[] { 0.1, 0.5, 1.2 })
        {
            Assert.True(GradientAssert.Relative(SimmonsRectangularModel.Instance.CurrentDensity(v, rect), Model.CurrentDensity(v, p)) < 1e-3);
        }
    }

    [Fact]
    public void CurrentDensity_ImageForce_RaisesCurrentAboveRectangular()
    {
        double[] rect = [2.0 * Ev, 2.0e-9, 1.0];
        Assert.True(Model.CurrentDensity(0.5, P(2.0, 2.0, 1.0, 4.0)) > 2 * SimmonsRectangularModel.Instance.CurrentDensity(0.5, rect));
        var g = Model.Geometry(0.5, P(2.0, 2.0, 1.0, 4.0));
        Assert.True(g.Valid && g.S1M > 0 && g.S2M < 2e-9 && g.MeanBarrierJ < 2.0 * Ev);
    }

    public static TheoryData<double, double, double, double, double> DerivativeCases()
    {
        var data = new TheoryData<double, double, double, double, double>();
        foreach (var (phi, d, r, k) in new[] { (2.0, 2.0, 1.0, 4.0), (1.5, 3.0, 0.5, 2.5), (3.0, 1.5, 1.0, 8.0) })
        foreach (double frac in new[] { -0.8, 0.02, 0.5, 1.4 })
        {
            data.Add(phi, d, r, k, frac * phi);
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void CurrentDensityGradient_BothRanges_MatchesCentralDifferences(double phiEv, double dNm, double r, double eps, double v)
    {
        // Central finite differences (common practice, no source).
        GradientAssert.Barrier(Model, v, P(phiEv, dNm, r, eps), 1e-6);
    }

    [Fact]
    public void ThermallyCorrectedGradient_At300K_MatchesCentralDifferences()
    {
        var warm = BarrierModelCatalog.Create("simmons-image", new BarrierModelOptions { TemperatureK = 300, RelativePermittivity = 4.0 });
        GradientAssert.Barrier(warm, 0.4, P(2.0, 2.0, 1.0, 4.0), 1e-6);
        Assert.Equal(4.0, warm.Parameters[3].DefaultSi);
    }

    [Fact]
    public void CheckValidity_ThinLowBarrier_WarnsBarrierClosed()
    {
        Assert.Contains(Model.CheckValidity(0.2, P(0.3, 0.6, 1.0, 2.0)), w => w.Contains("closes the barrier", StringComparison.Ordinal));
        Assert.Contains(Model.CheckValidity(2.5, P(2.0, 2.0, 1.0, 4.0)), w => w.Contains("do not join", StringComparison.Ordinal));
    }
}
