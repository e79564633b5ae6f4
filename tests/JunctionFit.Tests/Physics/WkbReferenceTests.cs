using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Checks <see cref="WkbModel"/> against independent evaluations: the Tsu–Esaki current at T = 0 (R. Tsu, L. Esaki, Appl. Phys.
/// Lett. 22, 562 (1973)) with the WKB transmission exp(−2∫κ dx), κ = √(2m(U − ε))/ħ, of the biased trapezoid, the energy integral
/// done by MathNet's double-exponential rule; the default Fermi energy; the validity warnings (κd at the largest bias, one interface
/// barrier φ̄ − |Δφ|/2 ≤ 0). CODATA 2018 constants typed in.
/// </summary>
public class WkbReferenceTests
{
    private const double CodataE = Codata2018.ElementaryChargeC;      // C, CODATA 2018 (exact)
    private const double CodataH = Codata2018.PlanckJs;       // J s, CODATA 2018 (exact)
    private const double CodataHbar = Codata2018.ReducedPlanckJs;   // J s, CODATA 2018
    private const double CodataMe = Codata2018.ElectronMassKg;    // kg, CODATA 2018

    [Theory]
    [InlineData(1.0)]
    [InlineData(-1.0)]
    [InlineData(0.3)]
    public void CurrentDensity_LowFermiEnergy_MatchesTsuEsakiIntegralFromTheBandBottom(double v)
    {
        // E_F = 0.5 eV < e|V|: the supply N(ε) = max(−ε, 0) − max(−ε − eV, 0) (T = 0) is cut at the higher band bottom
        // max(−E_F, −E_F − eV). J = (4π m e/h³) ∫ D(ε) N(ε) dε, D = exp(−2√(2m)/ħ · ∫√(U − ε)₊ dx), U linear from φ to φ − eV;
        // ∫₀^d √(a + (b − a)x/d)₊ dx = (2d/3)(b₊^{3/2} − a₊^{3/2})/(b − a) (elementary calculus). φ = 1 eV, d = 1 nm, m = mₑ.
        const double phi = 1.0, dNm = 1.0, ef = 0.5;
        var model = new WkbModel(new BarrierModelOptions { FermiEnergyEv = ef });
        double kappa = 2 * Math.Sqrt(2 * CodataMe * CodataE) / CodataHbar * 1e-9; // per nm per √eV
        double D(double e)
        {
            double a = phi - e, b = phi - v - e;
            double ap = Math.Max(a, 0), bp = Math.Max(b, 0);
            double integral = Math.Abs(b - a) < 1e-12 ? dNm * Math.Sqrt(ap) : 2 * dNm / 3 * (bp * Math.Sqrt(bp) - ap * Math.Sqrt(ap)) / (b - a);
            return Math.Exp(-kappa * integral);
        }
        double N(double e) => Math.Max(-e, 0) - Math.Max(-e - v, 0);
        double lower = Math.Max(-ef, -ef - v);
        double lo = Math.Min(0, -v), hi = Math.Max(0, -v);
        double s = 0;
        if (lo > lower) s += MathNet.Numerics.Integrate.DoubleExponential(e => D(e) * N(e), lower, lo, 1e-13);
        s += MathNet.Numerics.Integrate.DoubleExponential(e => D(e) * N(e), Math.Max(lo, lower), hi, 1e-13);
        double expected = 4 * Math.PI * CodataMe * CodataE / (CodataH * CodataH * CodataH) * CodataE * CodataE * s;
        double j = model.CurrentDensity(v, [phi * CodataE, dNm * 1e-9, 0.0, 1.0, ef * CodataE]);
        Assert.True(GradientAssert.Relative(expected, j) < 1e-7, $"{j:R} vs Tsu-Esaki {expected:R}");
    }

    [Fact]
    public void Parameters_FermiEnergyDefault_IsOptionInJoule()
    {
        Assert.Equal(7.25 * CodataE, new WkbModel(new BarrierModelOptions { FermiEnergyEv = 7.25 }).Parameters[WkbModel.FermiEnergyIndex].DefaultSi, 1e-30);
    }

    [Fact]
    public void CurrentDensityGradient_SymmetricBarrier_AsymmetryDerivativeIsFinite()
    {
        // Δφ = 0: the model steps Δφ by 1e-4·φ̄; against the test's central difference with an absolute step of 1e-3 eV
        // (common practice, no source). By symmetry J(V) at ±Δφ differ only through the bias sign, so ∂J/∂Δφ ≠ 0 at V ≠ 0.
        var model = new WkbModel(new BarrierModelOptions { FermiEnergyEv = 6 });
        double[] p = [2.0 * CodataE, 1.5e-9, 0.0, 0.8, 6.0 * CodataE];
        GradientAssert.Barrier(model, 0.4, p, 1e-4, [0, 0, 1e-3 * CodataE, 0, 0]);
    }

    [Theory]
    [InlineData(2.5, true)]
    [InlineData(2.0, true)]
    [InlineData(-2.2, true)]
    [InlineData(1.9, false)]
    public void CheckValidity_AsymmetryAtLeastTwiceMeanBarrier_Warns(double dphiOverPhi, bool warns)
    {
        // φ_bottom, φ_top = φ̄ ∓ Δφ/2: |Δφ| ≥ 2φ̄ leaves one interface barrier at or below zero (the model's definition).
        var model = new WkbModel();
        double phi = 2.0 * CodataE;
        var w = model.CheckValidity(0.1, [phi, 3e-9, dphiOverPhi * phi, 1.0, 5.5 * CodataE]);
        Assert.Equal(warns, w.Any(x => x.Contains("asymmetry", StringComparison.Ordinal)));
    }

    [Theory]
    [InlineData(2.9, true)]
    [InlineData(3.1, false)]
    public void CheckValidity_KappaDAtLargestBias_WarnsBelowThree(double kappaD, bool warns)
    {
        // κ = √(2 m* (φ̄ − e|V|/2))/ħ at the largest bias, threshold κd = 3 (the model's documented limit, common practice, no
        // source). φ̄ = 3 eV, |V| = 2 V, m* = 0.5 mₑ: d chosen so that κd is 2.9 or 3.1.
        double phi = 3.0 * CodataE, r = 0.5, vMax = 2.0;
        double kappa = Math.Sqrt(2 * r * CodataMe * (phi - 0.5 * CodataE * vMax)) / CodataHbar;
        var w = new WkbModel().CheckValidity(vMax, [phi, kappaD / kappa, 0.0, r, 5.5 * CodataE]);
        Assert.Equal(warns, w.Any(x => x.Contains("kappa*d", StringComparison.Ordinal)));
    }
}
