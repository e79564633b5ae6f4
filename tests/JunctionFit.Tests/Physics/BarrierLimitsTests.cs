using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// The edges of three models. Brinkman–Dynes–Rowell (W. F. Brinkman, R. C. Dynes, J. M. Rowell, J. Appl. Phys. 41, 1915,
/// 1970): its warnings at d = 1 nm, |Δφ| = φ̄ and e|V| = φ̄/2, and the dip of its conductance parabola
/// G(V)/G(0) = 1 − (A₀Δφ/16φ̄^{3/2}) eV + (9A₀²/128φ̄)(eV)², which reaches zero exactly when Δφ² = 72 φ̄² (the discriminant;
/// A₀ cancels). Fowler–Nordheim: zero current, and a zero gradient, once the exponent b/F passes 700 (near the double
/// range, e⁻⁷⁰⁹ ≈ the smallest normal; common practice, no source). Transfer matrix: a potential step of no width has
/// T = 4k₁k₂/(k₁ + k₂)² and T + R = 1 (textbook step, e.g. Griffiths, Introduction to Quantum Mechanics, §2.5, from
/// memory), and no lead state below the lead potential means T = 0, R = 1.
/// </summary>
public class BarrierLimitsTests
{
    private const double Q = Codata2018.ElementaryChargeC, H = Codata2018.PlanckJs, Me = Codata2018.ElectronMassKg; // CODATA 2018
    private const double Hbar = H / (2 * Math.PI);
    private static readonly BrinkmanDynesRowellModel Bdr = BrinkmanDynesRowellModel.Instance;

    private static bool Has(IReadOnlyList<string> warnings, string text) => warnings.Any(w => w.Contains(text, StringComparison.Ordinal));

    private static double[] BdrParameters(double phiEv, double dNm, double dphiEv) => [phiEv * Q, dNm * 1e-9, dphiEv * Q, 1.0];

    [Fact]
    public void Bdr_Thickness_WarnsBelowOneNanometreOnly()
    {
        Assert.True(Has(Bdr.CheckValidity(0.2, BdrParameters(2.0, 0.95, 0.0)), "0.95 nm is below about 1 nm"));
        Assert.False(Has(Bdr.CheckValidity(0.2, BdrParameters(2.0, 1.0, 0.0)), "below about 1 nm"));
    }

    [Fact]
    public void Bdr_Asymmetry_WarnsFromTheMeanHeightOn()
    {
        var atHeight = Bdr.CheckValidity(0.2, BdrParameters(2.0, 1.5, -2.0));
        Assert.True(Has(atHeight, "asymmetry -2 eV is not smaller than the mean barrier height 2 eV"), string.Join("\n", atHeight));
        Assert.False(Has(Bdr.CheckValidity(0.2, BdrParameters(2.0, 1.5, 1.99)), "not smaller than the mean barrier height"));
    }

    [Fact]
    public void Bdr_Bias_WarnsAboveHalfTheMeanHeightOnly()
    {
        Assert.False(Has(Bdr.CheckValidity(1.0, BdrParameters(2.0, 1.5, 0.0)), "more than half the mean barrier height"));
        Assert.True(Has(Bdr.CheckValidity(1.001, BdrParameters(2.0, 1.5, 0.0)), "more than half the mean barrier height (2 eV)"));
    }

    [Theory]
    [InlineData(1.0, 8.4, false)]  // Δφ² = 70.6 φ̄² < 72 φ̄²: the parabola stays above zero
    [InlineData(1.0, 8.6, true)]   // Δφ² = 74.0 φ̄²: it dips below zero
    [InlineData(1.1, -9.4, true)]  // (9.4 / 1.1)² = 73.0
    [InlineData(1.1, -9.2, false)] // (9.2 / 1.1)² = 69.9
    public void Bdr_ConductanceParabola_DipsExactlyWhenAsymmetrySquaredExceeds72MeanHeightSquared(double phiEv, double dphiEv, bool dips)
    {
        // Independent check of the discriminant with A₀ = 4d√(2m)/(3ħ) written out (BDR 1970, eq. 8): 1 − c₁²/(4c₂) < 0.
        double a0 = 4.0 * 1.5e-9 * Math.Sqrt(2.0 * Me) / (3.0 * Hbar);
        double phi = phiEv * Q, dphi = dphiEv * Q;
        double c1 = a0 * dphi / (16.0 * Math.Pow(phi, 1.5)), c2 = 9.0 / 128.0 * a0 * a0 / phi;
        Assert.Equal(dips, 1.0 - c1 * c1 / (4.0 * c2) < 0.0);
        Assert.Equal(dips, Has(Bdr.CheckValidity(0.1, BdrParameters(phiEv, 1.5, dphiEv)), "dips below zero"));
    }

    [Fact]
    public void FowlerNordheim_ExponentPast700_ZeroCurrentAndZeroGradient()
    {
        // b = 4√(2m)φ^{3/2}/(3eħ) (Lenzlinger & Snow 1969); at F = b/710 the current would be e⁻⁷¹⁰ times the prefactor.
        double phi = 3.0 * Q, d = 5e-9;
        double b = 4.0 * Math.Sqrt(2.0 * Me) * Math.Pow(phi, 1.5) / (3.0 * Q * Hbar);
        double farV = b / 710.0 * d, nearV = b / 690.0 * d;
        Span<double> gradient = [double.NaN, double.NaN, double.NaN];
        Assert.Equal(0.0, FowlerNordheimModel.Instance.CurrentDensity(farV, [phi, d, 1.0], gradient));
        Assert.Equal([0.0, 0.0, 0.0], gradient.ToArray());
        Assert.Equal(0.0, FowlerNordheimModel.Instance.CurrentDensity(-farV, [phi, d, 1.0]));
        Assert.Equal(0.0, FowlerNordheimModel.Instance.CurrentDensity(0.0, [phi, d, 1.0]));
        double near = FowlerNordheimModel.Instance.CurrentDensity(nearV, [phi, d, 1.0]);
        Assert.True(near > 0);
        Assert.Equal(-near, FowlerNordheimModel.Instance.CurrentDensity(-nearV, [phi, d, 1.0])); // odd in V
    }

    [Theory]
    [InlineData(1.0, 0.3)]
    [InlineData(1.0, -0.5)]
    [InlineData(0.2, 0.15)]
    public void TransferMatrix_BareStep_MatchesTextbookStep(double energyEv, double rightEv)
    {
        double e = energyEv * Q;
        double k1 = Math.Sqrt(2 * Me * e) / Hbar, k2 = Math.Sqrt(2 * Me * (e - rightEv * Q)) / Hbar;
        double t = TransferMatrix.Transmission(e, [], [], 0.0, rightEv * Q, Me, out double r);
        Assert.Equal(4 * k1 * k2 / ((k1 + k2) * (k1 + k2)), t, 12);
        Assert.Equal(1.0, t + r, 12);
        // Reversed: the same transmission from the other side (reciprocity).
        double back = TransferMatrix.Transmission(e, [], [], rightEv * Q, 0.0, Me, out _);
        Assert.Equal(t, back, 12);
    }

    [Fact]
    public void TransferMatrix_NoLeadStateOrBadLayers()
    {
        double e = 1.0 * Q;
        Assert.Equal(0.0, TransferMatrix.Transmission(e, [3 * Q], [1e-9], 1.2 * Q, 0.0, Me, out double r1));
        Assert.Equal(1.0, r1);
        Assert.Equal(0.0, TransferMatrix.Transmission(e, [3 * Q], [1e-9], 0.0, 1.2 * Q, Me, out double r2));
        Assert.Equal(1.0, r2);
        Assert.Equal(0.0, TransferMatrix.Transmission(e, [3 * Q], [1e-9], e, 0.0, Me, out _)); // at the lead edge: no state
        Assert.Throws<ArgumentOutOfRangeException>(() => TransferMatrix.Transmission(e, [3 * Q], [-1e-9], 0.0, 0.0, Me, out _));
        Assert.Throws<ArgumentException>(() => TransferMatrix.Transmission(e, [3 * Q, 2 * Q], [1e-9], 0.0, 0.0, Me, out _));
    }
}
