using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class JunctionCurrentModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly ParasiticOptions All = new() { SeriesResistance = true, LeakageConductance = true, VoltageOffset = true, CurrentOffset = true };

    [Fact]
    public void Constructor_NoParasitics_SameParametersAndCurrentAsBefore()
    {
        var plain = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        Assert.Equal(["barrier_height_eV", "thickness_nm", "mass_ratio", "area_m2"], plain.Parameters.Select(p => p.Key));
        Assert.Equal(3, plain.AreaIndex);
        Assert.Null(plain.SeriesResistanceIndex);
        double[] p = [2 * Ev, 1.5e-9, 1.0, 1e-10];
        Assert.Equal(1e-10 * SimmonsRectangularModel.Instance.CurrentDensity(0.7, p.AsSpan(0, 3)), plain.Current(0.7, p));
    }

    [Fact]
    public void Constructor_AllParasitics_AppendsKeysInOrder()
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance, All);
        Assert.Equal(["barrier_height_eV", "thickness_nm", "mass_ratio", "area_m2", "series_resistance_ohm", "leakage_conductance_S", "voltage_offset_V", "current_offset_A"],
                     model.Parameters.Select(p => p.Key));
        Assert.Equal(4, model.SeriesResistanceIndex);
        Assert.Equal(7, model.IndexOf("current_offset_A"));
        var leakOnly = new JunctionCurrentModel(SimmonsRectangularModel.Instance, new ParasiticOptions { LeakageConductance = true });
        Assert.Equal(4, leakOnly.LeakageConductanceIndex);
        Assert.Null(leakOnly.SeriesResistanceIndex);
    }

    [Theory]
    [InlineData(0.9, 100.0)]
    [InlineData(-1.3, 2000.0)]
    [InlineData(0.05, 1e4)]
    [InlineData(2.5, 5e5)]
    public void Current_SeriesResistance_SatisfiesImplicitEquation(double v, double rs)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance, All);
        double[] p = [1.5 * Ev, 1.2e-9, 1.0, 1e-10, rs, 1e-7, 0.01, 0];
        double i = model.Current(v, p);
        double vj = v - 0.01 - i * rs;
        double expected = 1e-10 * SimmonsRectangularModel.Instance.CurrentDensity(vj, p.AsSpan(0, 3)) + 1e-7 * vj;
        Assert.True(GradientAssert.Relative(expected, i) < 1e-12, $"{expected} vs {i}");
    }

    [Fact]
    public void Current_HugeSeriesResistance_LimitedByResistor()
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance, new ParasiticOptions { SeriesResistance = true });
        double[] p = [1.0 * Ev, 1.0e-9, 1.0, 1e-8, 1e9];
        Assert.Equal(1.0, model.Current(2.0, p) / (2.0 / 1e9), 2);
    }

    public static TheoryData<string, double> DerivativeCases()
    {
        var data = new TheoryData<string, double>();
        foreach (string m in new[] { "simmons", "bdr", "fowler-nordheim" })
        {
            foreach (double v in new[] { -1.2, -0.2, 0.1, 0.6, 2.8 })
            {
                data.Add(m, v);
            }
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(DerivativeCases))]
    public void CurrentGradient_AllParasitics_MatchesCentralDifferences(string name, double v)
    {
        // Implicit derivatives against central finite differences (common practice, no source).
        var barrier = BarrierModelCatalog.Create(name, BarrierModelOptions.Default);
        var model = new JunctionCurrentModel(barrier, All);
        double[] b = name == "bdr" ? [1.2 * Ev, 1.3e-9, 0.2 * Ev, 0.8] : [1.2 * Ev, 1.3e-9, 0.8];
        double rs = 300.0, g = 2e-8, v0 = 0.015, i0 = 3e-10;
        double[] p = [.. b, 2e-10, rs, g, v0, i0];
        GradientAssert.Junction(model, v, p, 1e-6);
    }

    [Fact]
    public void CurrentGradient_SeriesResistanceWithFallbackBiasDerivative_MatchesCentralDifferences()
    {
        // A thermally corrected model has no analytic ∂J/∂V: the central-difference fallback is used.
        var barrier = BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = 300 });
        var model = new JunctionCurrentModel(barrier, new ParasiticOptions { SeriesResistance = true });
        GradientAssert.Junction(model, 0.8, [1.0 * Ev, 1.5e-9, 1.0, 1e-9, 500.0], 1e-6);
    }

    [Fact]
    public void CheckValidity_SeriesResistanceDominates_Warns()
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance, new ParasiticOptions { SeriesResistance = true });
        var warnings = model.CheckValidity(1.0, [1.0 * Ev, 0.8e-9, 1.0, 1e-8, 1e6]);
        Assert.Contains(warnings, w => w.Contains("series resistance", StringComparison.Ordinal));
    }
}
