using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Parameter keys, bounds and the shared definitions: unit factors against the SI definitions (CODATA 2018 e for the
/// electronvolt, the SI prefix nano = 10⁻⁹ from the SI Brochure, 9th ed., BIPM 2019), the open/closed ends of the physical
/// range, equality by name, the narrowing of fit bounds with its choice of transform and start value, and the defaults
/// reports rely on (fixed or free, symbols, typical values with their handbook source).
/// </summary>
public class ParameterCatalogTests
{
    private const double CodataE = Codata2018.ElementaryChargeC; // CODATA 2018, exact: 1 eV = 1.602176634e-19 J

    private static void Rel(double expected, double actual)
        => Assert.True(Math.Abs(actual - expected) <= 1e-12 * Math.Abs(expected), $"expected {expected:R}, got {actual:R}");

    [Fact]
    public void Keys_DisplayFactors_AreTheSiDefinitions()
    {
        Rel(1.0 / CodataE, ParameterKey.BarrierHeight.DisplayPerSi);
        Rel(1.0, ParameterKey.BarrierHeight.DisplayPerSi * CodataE);
        Assert.Equal(1e9, ParameterKey.Thickness.DisplayPerSi);             // nm per m (SI prefix nano)
        Rel(2.0, ParameterKey.BarrierHeight.ToDisplay(2.0 * CodataE));
        Rel(3.0 * CodataE, ParameterKey.Asymmetry.FromDisplay(3.0));
        Rel(1.5, ParameterKey.Thickness.ToDisplay(1.5e-9));
        Rel(1.5e-9, ParameterKey.Thickness.FromDisplay(1.5));
        Assert.Equal("J", ParameterKey.BarrierHeight.SiUnit);
        Assert.Equal("eV", ParameterKey.BarrierHeight.DisplayUnit);
        Assert.Equal("m", ParameterKey.Thickness.SiUnit);
        Assert.Equal("nm", ParameterKey.Thickness.DisplayUnit);
    }

    [Fact]
    public void Definitions_ConvertLikeTheirKeys()
    {
        var d = StandardParameters.Thickness;
        Assert.Equal("thickness_nm", d.Key);
        Assert.Equal("nm", d.DisplayUnit);
        Rel(2.5, d.ToDisplay(2.5e-9));
        Rel(2.5e-9, d.FromDisplay(2.5));
        Rel(4.0, StandardParameters.BarrierHeight.ToDisplay(4.0 * CodataE));
        Rel(4.0 * CodataE, StandardParameters.BarrierHeight.FromDisplay(4.0));
    }

    [Fact]
    public void Admits_LowerEndOpen_UpperEndClosed()
    {
        var d = ParameterKey.Thickness; // 0 < d ≤ 100 nm
        Assert.False(d.Admits(0.0));
        Assert.False(d.Admits(-1e-9));
        Assert.True(d.Admits(1e-15));
        Assert.True(d.Admits(100e-9));
        Assert.False(d.Admits(100.001e-9));
        Assert.False(d.Admits(double.NaN));
        Assert.True(ParameterKey.VoltageOffset.Admits(-1e6));
        Assert.True(ParameterKey.Area.Admits(1.0));
        Assert.False(ParameterKey.RelativePermittivity.Admits(1.0)); // 1 < ε_r: vacuum itself is no barrier
        Assert.True(ParameterKey.RelativePermittivity.Admits(100.0));
    }

    [Fact]
    public void Keys_PhysicalRanges_AsDocumented()
    {
        // The documented ranges (common practice, no source): 0 < φ ≤ 20 eV, 0 < d ≤ 100 nm, −10 eV < Δφ < 10 eV,
        // 0 < E_F ≤ 30 eV, 1 < ε_r ≤ 100, 0 < m*/mₑ ≤ 10, −3 V < V_fb < 3 V.
        Rel(20.0 * CodataE, ParameterKey.BarrierHeight.UpperSi);
        Rel(100e-9, ParameterKey.Thickness.UpperSi);
        Rel(-10.0 * CodataE, ParameterKey.Asymmetry.LowerSi);
        Rel(10.0 * CodataE, ParameterKey.Asymmetry.UpperSi);
        Rel(30.0 * CodataE, ParameterKey.FermiEnergy.UpperSi);
        Rel(1.0 / CodataE, ParameterKey.FermiEnergy.DisplayPerSi);
        Assert.Equal(100.0, ParameterKey.RelativePermittivity.UpperSi);
        Assert.Equal(10.0, ParameterKey.MassRatio.UpperSi);
        Assert.Equal(-3.0, ParameterKey.FlatBandVoltage.LowerSi);
        Assert.Equal(3.0, ParameterKey.FlatBandVoltage.UpperSi);
        Assert.Equal(double.PositiveInfinity, ParameterKey.SeriesResistance.UpperSi);
        Assert.Equal(double.NegativeInfinity, ParameterKey.CurrentOffset.LowerSi);
    }

    [Fact]
    public void Describe_WritesDisplayValueAndUnit()
    {
        Assert.Equal("1.5 nm", ParameterKey.Thickness.Describe(1.5e-9));
        Assert.Equal("2 eV", ParameterKey.BarrierHeight.Describe(2.0 * CodataE));
        Assert.Equal("3.9", ParameterKey.RelativePermittivity.Describe(3.9)); // a pure number has no trailing space
    }

    [Theory]
    [InlineData("", 1.0, 0.0, 1.0)]
    [InlineData(" ", 1.0, 0.0, 1.0)]
    [InlineData("x", 0.0, 0.0, 1.0)]
    [InlineData("x", -1.0, 0.0, 1.0)]
    [InlineData("x", double.NaN, 0.0, 1.0)]
    [InlineData("x", 1.0, 1.0, 1.0)]
    [InlineData("x", 1.0, 2.0, 1.0)]
    [InlineData("x", 1.0, double.NaN, 1.0)]
    [InlineData("x", 1.0, 0.0, double.NaN)]
    public void Key_InvalidArguments_Throw(string name, double factor, double lower, double upper)
        => Assert.ThrowsAny<ArgumentException>(() => new ParameterKey(name, "", "", factor, lower, upper));

    [Fact]
    public void Key_NullUnits_Throw()
    {
        Assert.Throws<ArgumentNullException>(() => new ParameterKey("x", null!, "", 1.0, 0.0, 1.0));
        Assert.Throws<ArgumentNullException>(() => new ParameterKey("x", "", null!, 1.0, 0.0, 1.0));
    }

    [Fact]
    public void Keys_EqualByNameOnly()
    {
        var a = new ParameterKey("thickness_nm", "m", "nm", 1e9, 0.0, 1e-6);
        var other = new ParameterKey("barrier_height_eV", "J", "eV", 1.0, 0.0, 1.0);
        ParameterKey? none = null;
        Assert.True(a == ParameterKey.Thickness);
        Assert.False(a != ParameterKey.Thickness);
        Assert.True(a.Equals(ParameterKey.Thickness));
        Assert.True(a.Equals((object)ParameterKey.Thickness));
        Assert.Equal(ParameterKey.Thickness.GetHashCode(), a.GetHashCode());
        Assert.False(a == other);
        Assert.True(a != other);
        Assert.False(a.Equals(null));
        Assert.False(a.Equals((object?)"thickness_nm"));
        Assert.False(a == none);
        Assert.False(none == a);
        Assert.True(none == null);
        Assert.True(a != none);
        Assert.Equal("thickness_nm", a.ToString());
        var lookup = new Dictionary<ParameterKey, int> { [ParameterKey.Thickness] = 1 };
        Assert.Equal(1, lookup[a]);
    }

    [Theory]
    [InlineData(double.NaN, 1.0)]
    [InlineData(0.0, double.NaN)]
    [InlineData(double.NaN, double.NaN)]
    [InlineData(1.0, 1.0)]
    [InlineData(2.0, 1.0)]
    public void Bounds_InvalidEnds_Throw(double lower, double upper)
        => Assert.Throws<ArgumentException>(() => new ParameterBounds(lower, upper));

    [Fact]
    public void WithBounds_BothEnds_IntersectedLogisticDefaultKept()
    {
        var d = StandardParameters.Thickness.WithBounds(new ParameterBounds(1e-9, 500e-9)); // upper beyond the physical 100 nm
        Assert.Equal(1e-9, d.LowerSi);
        Assert.Equal(100e-9, d.UpperSi);
        Assert.Equal(ParameterTransform.Logistic, d.Transform);
        Assert.Equal(1.5e-9, d.DefaultSi);
        Assert.Equal(ParameterKey.Thickness, d.Id);
    }

    [Fact]
    public void WithBounds_DefaultOutside_StartsAtTheMiddle()
    {
        var d = StandardParameters.Thickness.WithBounds(new ParameterBounds(2e-9, 4e-9));
        Rel(3e-9, d.DefaultSi);
        var onEdge = StandardParameters.Thickness.WithBounds(new ParameterBounds(1.5e-9, 2.5e-9)); // default on the lower end
        Rel(2e-9, onEdge.DefaultSi);
        var phi = StandardParameters.BarrierHeight.WithBounds(new ParameterBounds(0.5 * CodataE, 2.0 * CodataE)); // default on the upper end
        Rel(1.25 * CodataE, phi.DefaultSi);
        Assert.Equal(ParameterTransform.Logistic, phi.Transform);
    }

    [Fact]
    public void WithBounds_LowerEndOnly_LogTransformAndStartAboveIt()
    {
        var area = StandardParameters.Area.WithBounds(new ParameterBounds(1e-8, double.PositiveInfinity));
        Assert.Equal(ParameterTransform.Log, area.Transform);
        Assert.Equal(1e-8, area.LowerSi);
        Assert.Equal(double.PositiveInfinity, area.UpperSi);
        Assert.Equal(2e-8, area.DefaultSi); // default 1e-10 clamped onto the lower end, then moved to twice it
        var inside = StandardParameters.Area.WithBounds(new ParameterBounds(1e-12, double.PositiveInfinity));
        Assert.Equal(1e-10, inside.DefaultSi);
        var offset = StandardParameters.VoltageOffset.WithBounds(new ParameterBounds(0.0, double.PositiveInfinity));
        Assert.Equal(ParameterTransform.Log, offset.Transform);
        Assert.Equal(1.0, offset.DefaultSi); // default 0 on a non-positive lower end: one unit above it
        var positive = StandardParameters.VoltageOffset.WithBounds(new ParameterBounds(0.75, double.PositiveInfinity));
        Assert.Equal(1.5, positive.DefaultSi); // default 0 clamped onto a positive lower end: twice it
        var below = StandardParameters.VoltageOffset.WithBounds(new ParameterBounds(-2.0, double.PositiveInfinity));
        Assert.Equal(0.0, below.DefaultSi);    // default inside: kept
    }

    [Fact]
    public void WithBounds_NoEnds_KeepsTheParameterTransform()
    {
        var offset = StandardParameters.CurrentOffset.WithBounds(new ParameterBounds(double.NegativeInfinity, double.PositiveInfinity));
        Assert.Equal(ParameterTransform.Identity, offset.Transform);
        Assert.Equal(0.0, offset.DefaultSi);
    }

    [Fact]
    public void WithBounds_UpperEndOnlyOnUnboundedParameter_Throws()
    {
        var error = Assert.Throws<ArgumentException>(() =>
            StandardParameters.VoltageOffset.WithBounds(new ParameterBounds(double.NegativeInfinity, 1.0)));
        Assert.Contains("voltage_offset_V", error.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void WithBounds_NothingLeftOfTheRange_Throws()
    {
        Assert.Throws<ArgumentException>(() => StandardParameters.Thickness.WithBounds(new ParameterBounds(200e-9, 300e-9)));
        Assert.Throws<ArgumentException>(() => StandardParameters.Thickness.WithBounds(new ParameterBounds(-2e-9, 0.0)));
        Assert.Throws<ArgumentNullException>(() => StandardParameters.Thickness.WithBounds(null!));
    }

    [Fact]
    public void WithBounds_UpperEndOnlyOnPositiveParameter_KeepsPhysicalLowerEnd()
    {
        var d = StandardParameters.Thickness.WithBounds(new ParameterBounds(double.NegativeInfinity, 5e-9));
        Assert.Equal(0.0, d.LowerSi);
        Assert.Equal(5e-9, d.UpperSi);
        Assert.Equal(ParameterTransform.Logistic, d.Transform);
    }

    [Fact]
    public void Standard_FreeAndFixedByDefault_AsReportsExpect()
    {
        // Fitted by default: φ, d, A, Δφ, R_s, G_leak and the offsets; held fixed unless freed: m*/mₑ, ε_r, E_F.
        Assert.False(StandardParameters.BarrierHeight.FixedByDefault);
        Assert.False(StandardParameters.Thickness.FixedByDefault);
        Assert.False(StandardParameters.Area.FixedByDefault);
        Assert.False(StandardParameters.Asymmetry.FixedByDefault);
        Assert.False(StandardParameters.SeriesResistance.FixedByDefault);
        Assert.False(StandardParameters.LeakageConductance.FixedByDefault);
        Assert.False(StandardParameters.VoltageOffset.FixedByDefault);
        Assert.False(StandardParameters.CurrentOffset.FixedByDefault);
        Assert.True(StandardParameters.MassRatio.FixedByDefault);
        Assert.True(StandardParameters.RelativePermittivity.FixedByDefault);
        Assert.True(StandardParameters.FermiEnergy.FixedByDefault);
    }

    [Fact]
    public void Standard_DefaultValues_WithTheirSources()
    {
        Assert.Equal(1.0, StandardParameters.MassRatio.DefaultSi);                       // free-electron mass
        Assert.Equal(3.9, StandardParameters.RelativePermittivity.DefaultSi);            // SiO₂ (Sze & Ng, 3rd ed., Appendix)
        Assert.InRange(StandardParameters.FermiEnergy.DefaultSi / CodataE, 5.49, 5.53);  // Ag 5.49 eV, Au 5.53 eV (Ashcroft & Mermin, Table 2.1)
        Assert.Equal(0.0, StandardParameters.Asymmetry.DefaultSi);                       // a symmetric barrier until told otherwise
        Rel(2.0, StandardParameters.BarrierHeight.DefaultSi / CodataE);     // a start only (common practice, no source)
        Assert.Equal(1.5e-9, StandardParameters.Thickness.DefaultSi);                    // a start only (common practice, no source)
        Assert.Equal(ParameterTransform.Log, StandardParameters.BarrierHeight.Transform);
        Assert.Equal(ParameterTransform.Log, StandardParameters.Thickness.Transform);
        Assert.Equal(ParameterTransform.Log, StandardParameters.Area.Transform);
        Assert.Equal(ParameterTransform.Logistic, StandardParameters.Asymmetry.Transform);
        Assert.Equal(ParameterTransform.Logistic, StandardParameters.RelativePermittivity.Transform);
        Assert.Equal(ParameterTransform.Identity, StandardParameters.VoltageOffset.Transform);
    }

    [Fact]
    public void Standard_SymbolsAndWords_PresentAndDistinct()
    {
        ParameterDefinition[] all =
        [
            StandardParameters.BarrierHeight, StandardParameters.Thickness, StandardParameters.MassRatio, StandardParameters.Area,
            StandardParameters.Asymmetry, StandardParameters.RelativePermittivity, StandardParameters.FermiEnergy,
            StandardParameters.SeriesResistance, StandardParameters.LeakageConductance, StandardParameters.VoltageOffset,
            StandardParameters.CurrentOffset,
        ];
        Assert.All(all, p => Assert.False(string.IsNullOrWhiteSpace(p.Symbol), p.Key));
        Assert.All(all, p => Assert.False(string.IsNullOrWhiteSpace(p.Description), p.Key));
        Assert.Equal(all.Length, all.Select(p => p.Symbol).Distinct(StringComparer.Ordinal).Count());
        Assert.Equal(all.Length, all.Select(p => p.Key).Distinct(StringComparer.Ordinal).Count());
        Assert.Equal("φ", StandardParameters.BarrierHeight.Symbol);
        Assert.Equal("d", StandardParameters.Thickness.Symbol);
        // The mean barrier height shares the key (results of all models line up) but not the symbol or words.
        Assert.Equal(StandardParameters.BarrierHeight.Key, StandardParameters.MeanBarrierHeight.Key);
        Assert.NotEqual(StandardParameters.BarrierHeight.Symbol, StandardParameters.MeanBarrierHeight.Symbol);
        Assert.NotEqual(StandardParameters.BarrierHeight.Description, StandardParameters.MeanBarrierHeight.Description);
        Assert.False(string.IsNullOrWhiteSpace(StandardParameters.MeanBarrierHeight.Symbol));
        Assert.Equal(
            ["barrier_height_eV", "thickness_nm", "mass_ratio"],
            StandardParameters.BarrierHeightThicknessMass.Select(p => p.Key));
    }
}
