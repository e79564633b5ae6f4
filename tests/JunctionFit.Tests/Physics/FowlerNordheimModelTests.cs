using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class FowlerNordheimModelTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly FowlerNordheimModel Model = FowlerNordheimModel.Instance;

    [Fact]
    public void SlopeConstant_SiliconIntoThermalOxide_NearPublishedValue()
    {
        // Electrons from Si into thermal SiO₂, φ ≈ 3.2 eV, m* ≈ 0.42 mₑ: B near 240–260 MV/cm
        // (M. Lenzlinger, E. H. Snow, J. Appl. Phys. 40, 278, 1969; from memory, a loose check).
        double bMvPerCm = FowlerNordheimModel.SlopeConstant(3.2 * Ev, 0.42) / 1e8;
        Assert.InRange(bMvPerCm, 240, 260);
    }

    [Fact]
    public void Plot_OfModelCurve_SlopeIsMinusBAndBarrierRecovered()
    {
        // ln(J/F²) = ln a − B/F exactly (Lenzlinger & Snow 1969): the plot is a line of slope −B.
        double[] p = [3.2 * Ev, 6e-9, 0.42];
        var v = new double[40];
        var i = new double[40];
        for (int k = 0; k < v.Length; k++)
        {
            v[k] = 4.0 + 0.1 * k;
            i[k] = 1e-8 * Model.CurrentDensity(v[k], p);
        }
        var plot = FowlerNordheimPlot.Create(v, i, 6e-9, minAbsVoltageV: 3.2);
        Assert.NotNull(plot);
        double b = FowlerNordheimModel.SlopeConstant(p[0], p[2]);
        Assert.Equal(1.0, plot.SlopeConstantVPerM / b, 9);
        Assert.Equal(1.0, plot.RSquared, 12);
        Assert.Equal(3.2, plot.BarrierHeightEv(0.42), 8);
    }

    [Fact]
    public void Plot_NegativeBias_UsesNegativeBranch()
    {
        double[] p = [2.5 * Ev, 5e-9, 0.5];
        double[] v = [-3.0, -3.5, -4.0, -4.5, 3.0];
        var i = new double[v.Length];
        for (int k = 0; k < v.Length; k++) i[k] = Model.CurrentDensity(v[k], p);
        var plot = FowlerNordheimPlot.Create(v, i, 5e-9, positiveBias: false);
        Assert.NotNull(plot);
        Assert.Equal(4, plot.InverseFieldMPerV.Count);
        Assert.Equal(2.5, plot.BarrierHeightEv(0.5), 8);
    }

    [Theory]
    [InlineData(3.2, 6.0, 0.42, 4.5)]
    [InlineData(3.2, 6.0, 0.42, -7.0)]
    [InlineData(1.0, 2.0, 1.0, 1.5)]
    [InlineData(2.0, 10.0, 0.3, 12.0)]
    public void CurrentDensityGradient_HighField_MatchesCentralDifferences(double phiEv, double dNm, double r, double v)
    {
        // Central finite differences (common practice, no source).
        GradientAssert.Barrier(Model, v, [phiEv * Ev, dNm * 1e-9, r]);
        double[] p = [phiEv * Ev, dNm * 1e-9, r];
        double h = 1e-6 * Math.Abs(v);
        double fd = (Model.CurrentDensity(v + h, p) - Model.CurrentDensity(v - h, p)) / (2 * h);
        Assert.True(GradientAssert.Relative(((IBiasDerivative)Model).CurrentDensityBiasDerivative(v, p), fd) < 1e-6);
    }

    [Fact]
    public void CheckValidity_BelowBarrierHeight_WarnsDirectTunnelling()
    {
        var warnings = Model.CheckValidity(2.0, [3.2 * Ev, 5e-9, 0.42]);
        Assert.Contains(warnings, w => w.Contains("eV > phi", StringComparison.Ordinal));
    }
}
