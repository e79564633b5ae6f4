using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// The image-force geometry of Simmons's rounded barrier (J. G. Simmons, J. Appl. Phys. 34, 1793, 1963, image-force
/// section): the turning points s₁, s₂, the width Δs and the mean barrier φ̄ against the published formulas written out
/// here in eV and Å with CODATA 2018 constants typed in; the guards that keep the current finite outside the formula's
/// range (documented: Δs ≥ 1 % of d, s₂ &lt; d, φ̄ &gt; 0); and the warnings, with the tunnelling exponent A√φ̄ computed
/// from the same independent geometry (the 10 is this tool's threshold, common practice, no source).
/// </summary>
public class SimmonsImageGeometryTests
{
    private const double Q = Codata2018.ElementaryChargeC, H = Codata2018.PlanckJs, Me = Codata2018.ElectronMassKg, Eps0 = Codata2018.VacuumPermittivityFPerM; // CODATA 2018
    private static readonly SimmonsImageForceModel Model = new();

    private static double[] P(double phiEv, double dNm, double r, double eps) => [phiEv * Q, dNm * 1e-9, r, eps];

    /// <summary>Simmons 1963 in eV and Å: s₁, s₂, φ̄ at bias |V|.</summary>
    private static (double S1, double S2, double PhiBar) Published(double vAbs, double phi0, double sAngstrom, double k)
    {
        double lambda = Q * Math.Log(2) / (8 * Math.PI * k * Eps0 * sAngstrom * 1e-10); // eV
        double s1 = 1.2 * lambda * sAngstrom / phi0;
        double s2 = vAbs < phi0 ? sAngstrom * (1 - 9.2 * lambda / (3 * phi0 + 4 * lambda - 2 * vAbs)) + s1 : (phi0 - 5.6 * lambda) * sAngstrom / vAbs;
        double phiBar = phi0 - vAbs / (2 * sAngstrom) * (s1 + s2)
                        - 1.15 * lambda * sAngstrom / (s2 - s1) * Math.Log(s2 * (sAngstrom - s1) / (s1 * (sAngstrom - s2)));
        return (s1, s2, phiBar);
    }

    /// <summary>A√φ̄ at 0 V with A = 2Δs√(2m*)/ħ (Simmons 1963), from the published geometry.</summary>
    private static double Exponent(double phi0, double dNm, double r, double k)
    {
        var (s1, s2, phiBar) = Published(0.0, phi0, dNm * 10, k);
        double hbar = H / (2 * Math.PI);
        return 2 * (s2 - s1) * 1e-10 * Math.Sqrt(2 * r * Me) / hbar * Math.Sqrt(phiBar * Q);
    }

    private static bool Has(IReadOnlyList<string> warnings, string text) => warnings.Any(w => w.Contains(text, StringComparison.Ordinal));

    [Theory]
    [InlineData(3.0, 2.0, 3.9, 0.0)]
    [InlineData(3.0, 2.0, 3.9, 1.5)]
    [InlineData(2.0, 3.0, 8.0, 1.2)]
    [InlineData(1.5, 2.5, 3.9, 2.0)] // above φ₀/e: the high-voltage turning point
    [InlineData(4.0, 1.5, 6.0, 4.5)]
    public void Geometry_MatchesPublishedTurningPointsAndMeanBarrier(double phi0, double dNm, double k, double v)
    {
        var (s1, s2, phiBar) = Published(v, phi0, dNm * 10, k);
        var g = Model.Geometry(v, P(phi0, dNm, 1.0, k));
        Assert.True(g.Valid);
        Assert.Equal(s1 * 1e-10, g.S1M, 1e-9 * s1 * 1e-10);
        Assert.Equal(s2 * 1e-10, g.S2M, 1e-9 * s2 * 1e-10);
        Assert.Equal((s2 - s1) * 1e-10, g.WidthM, 1e-9 * s2 * 1e-10);
        Assert.Equal(phiBar * Q, g.MeanBarrierJ, 1e-9 * phiBar * Q);
        // The current is odd in V (a symmetric barrier).
        double j = Model.CurrentDensity(v, P(phi0, dNm, 1.0, k));
        Assert.Equal(-j, Model.CurrentDensity(-v, P(phi0, dNm, 1.0, k)));
    }

    [Theory]
    [InlineData(0.3, 0.5, 1.0, 0.0)]  // thin and low: s₁ = 1.2λd/φ₀ lies beyond d
    [InlineData(0.5, 0.6, 2.0, 0.2)]
    [InlineData(1.0, 1.0, 3.9, 3.5)]  // far above φ₀/e: s₂ falls below s₁
    [InlineData(0.2, 2.0, 1.0, 0.1)]  // low barrier, small permittivity: the mean barrier is not positive
    public void Geometry_OutsideTheFormula_FlaggedAndKeptFinite(double phi0, double dNm, double k, double v)
    {
        var p = P(phi0, dNm, 1.0, k);
        var g = Model.Geometry(v, p);
        Assert.False(g.Valid);
        Assert.True(g.S2M < dNm * 1e-9, $"s2 {g.S2M} s1 {g.S1M} w {g.WidthM} phibar {g.MeanBarrierJ}");
        Assert.True(g.WidthM >= 0.01 * dNm * 1e-9 * (1 - 1e-12));
        Assert.True(g.MeanBarrierJ > 0, $"mean barrier {g.MeanBarrierJ} J"); // was NaN when s₁ ≥ d (found here)
        Assert.True(double.IsFinite(Model.CurrentDensity(v, p)));
        Span<double> gradient = stackalloc double[4];
        Assert.True(double.IsFinite(Model.CurrentDensity(v, p, gradient)));
        foreach (double partial in gradient) Assert.True(double.IsFinite(partial));
        Assert.True(Has(Model.CheckValidity(Math.Max(v, 0.1), p), "closes the barrier"));
    }

    [Fact]
    public void CheckValidity_BarrierClosedOnlyAtTheTopOfTheSweep_Warns()
    {
        // Valid at 0 V, but far above φ₀/e the high-voltage s₂ = (φ₀ − 5.6λ)s/eV falls below s₁.
        var p = P(1.0, 1.0, 1.0, 3.9);
        Assert.True(Model.Geometry(0.0, p).Valid);
        Assert.False(Model.Geometry(3.5, p).Valid);
        Assert.True(Has(Model.CheckValidity(3.5, p), "closes the barrier"));
        Assert.False(Has(Model.CheckValidity(0.5, p), "closes the barrier"));
    }

    [Fact]
    public void CheckValidity_SweepReachingPhi0_Warns()
    {
        var p = P(2.0, 3.0, 1.0, 3.9);
        Assert.True(Has(Model.CheckValidity(2.0, p), "crosses |V| = 2 V = phi0/e"));
        Assert.False(Has(Model.CheckValidity(1.99, p), "phi0/e"));
    }

    [Theory]
    [InlineData(3.0, 1.0, 3.9)]
    [InlineData(2.0, 0.5, 6.0)]
    public void CheckValidity_ExponentBelowTen_WarnsOnlyBelow(double phi0, double r, double k)
    {
        // Find the thickness at which the independent A√φ̄ is 9.8 and 10.2 (bisection; A√φ̄ rises with d).
        double ThicknessFor(double target)
        {
            double lo = 0.6, hi = 3.0;
            for (int i = 0; i < 80; i++)
            {
                double mid = 0.5 * (lo + hi);
                if (Exponent(phi0, mid, r, k) < target) lo = mid; else hi = mid;
            }
            return 0.5 * (lo + hi);
        }
        var below = P(phi0, ThicknessFor(9.8), r, k);
        var above = P(phi0, ThicknessFor(10.2), r, k);
        Assert.True(Model.Geometry(0.0, below).Valid);
        var thin = Model.CheckValidity(0.1, below);
        Assert.True(Has(thin, "A*sqrt(mean barrier) = 9.8 is small"), string.Join("\n", thin));
        Assert.False(Has(Model.CheckValidity(0.1, above), "A*sqrt(mean barrier)"));
    }

    [Fact]
    public void Constructor_PermittivityBelowOne_Throws()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => new SimmonsImageForceModel(0.9));
        Assert.Equal(6.0, new SimmonsImageForceModel(6.0).Parameters[3].DefaultSi);
    }
}
