using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Where the analytic models say they stop being valid, at the boundaries their sources give: the Simmons forms need a
/// tunnelling exponent A√φ well above 1 (Simmons's leading-term expansion, J. G. Simmons, J. Appl. Phys. 34, 1793, 1963;
/// this tool warns below 10, common practice, no source) and switch to the high-voltage form at e|V| = φ; Fowler–Nordheim
/// needs e|V| &gt; φ (triangular barrier; M. Lenzlinger, E. H. Snow, J. Appl. Phys. 40, 278, 1969). The exponent is
/// computed here from CODATA 2018 constants typed in (NIST SP 961), independent of the model's own constants.
/// </summary>
public class ValidityWarningTests
{
    private const double Q = Codata2018.ElementaryChargeC, H = Codata2018.PlanckJs, Me = Codata2018.ElectronMassKg;
    private const double Hbar = H / (2 * Math.PI);
    private static readonly SimmonsRectangularModel Simmons = SimmonsRectangularModel.Instance;
    private static readonly FowlerNordheimModel Fn = FowlerNordheimModel.Instance;

    /// <summary>Simmons's A√φ for β = 1: A = 4πΔs√(2m)/h = 2Δs√(2m*)/ħ, φ in joules.</summary>
    private static double Exponent(double phiEv, double dM, double r) => 2 * dM * Math.Sqrt(2 * r * Me) / Hbar * Math.Sqrt(phiEv * Q);

    /// <summary>The thickness at which A√φ equals <paramref name="exponent"/>.</summary>
    private static double ThicknessFor(double exponent, double phiEv, double r) => exponent / Exponent(phiEv, 1.0, r);

    private static bool Has(IReadOnlyList<string> warnings, string text) => warnings.Any(w => w.Contains(text, StringComparison.Ordinal));

    [Theory]
    [InlineData(1.0, 1.0)]
    [InlineData(2.5, 0.4)]
    [InlineData(0.6, 0.8)]
    public void SimmonsCheckValidity_ExponentJustBelowAndAboveTen_WarnsOnlyBelow(double phiEv, double r)
    {
        double below = ThicknessFor(9.8, phiEv, r), above = ThicknessFor(10.2, phiEv, r);
        Assert.True(below > 0.6e-9, "the thickness warning stays out of this check");
        var thin = Simmons.CheckValidity(0.1, [phiEv * Q, below, r]);
        var thick = Simmons.CheckValidity(0.1, [phiEv * Q, above, r]);
        Assert.True(Has(thin, "tunnelling exponent"), string.Join("\n", thin));
        Assert.Contains(thin, w => w.Contains("= 9.8 ", StringComparison.Ordinal)); // the exponent the warning quotes
        Assert.False(Has(thick, "tunnelling exponent"), string.Join("\n", thick));
    }

    [Fact]
    public void SimmonsCheckValidity_ThicknessBelowHalfNanometre_Warns()
    {
        Assert.True(Has(Simmons.CheckValidity(0.1, [3.0 * Q, 0.49e-9, 1.0]), "atomic layers"));
        Assert.False(Has(Simmons.CheckValidity(0.1, [3.0 * Q, 0.51e-9, 1.0]), "atomic layers"));
    }

    [Fact]
    public void SimmonsCheckValidity_SweepReachesTheBarrierHeight_WarnsFromEqualityOn()
    {
        // e|V| = φ is where Simmons's intermediate form ends: the high-voltage form is used from there on.
        double phiJ = 1.0 * Q;
        var at = Simmons.CheckValidity(1.0, [phiJ, 2e-9, 1.0]);
        Assert.True(Has(at, "at or above the fitted barrier height of 1 eV"), string.Join("\n", at));
        Assert.False(Has(Simmons.CheckValidity(0.99, [phiJ, 2e-9, 1.0]), "at or above"));
    }

    [Fact]
    public void FowlerNordheimCheckValidity_AboveTheBarrierHeight_SaysWhichPointsItDescribes()
    {
        var above = Fn.CheckValidity(4.0, [3.2 * Q, 5e-9, 0.42]);
        Assert.True(Has(above, "only the points with |V| > 3.2 V"), string.Join("\n", above));
        Assert.False(Has(above, "stays below"));
        // At e|V| = φ exactly there is no Fowler–Nordheim range at all.
        var at = Fn.CheckValidity(3.2, [3.2 * Q, 5e-9, 0.42]);
        Assert.True(Has(at, "stays below |V| = 3.2 V while the fitted barrier height is 3.2 eV"), string.Join("\n", at));
    }
}
