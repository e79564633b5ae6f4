using JunctionFit.Physics;
using MathNet.Numerics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Checks <see cref="FowlerNordheimPlot"/>: ln(I/F²) against 1/F, F = |V|/d, fitted by least squares. References: the
/// Fowler–Nordheim law J ∝ F² exp(−B/F) with B = 4√(2m*)φ^{3/2}/(3ħe) (Lenzlinger &amp; Snow, J. Appl. Phys. 40, 278 (1969)),
/// MathNet's <see cref="Fit.Line"/> and <see cref="GoodnessOfFit.RSquared"/>, CODATA 2018 constants typed in.
/// </summary>
public class FowlerNordheimPlotTests
{
    private const double CodataE = Codata2018.ElementaryChargeC;      // C, CODATA 2018 (exact)
    private const double CodataMe = Codata2018.ElectronMassKg;    // kg, CODATA 2018
    private const double CodataHbar = Codata2018.ReducedPlanckJs;   // J s, CODATA 2018
    private const double D = 3e-9;

    private static (double[] X, double[] Y) Reference(double[] v, double[] i)
    {
        var x = v.Select(u => D / Math.Abs(u)).ToArray();
        var y = v.Select((u, k) => Math.Log(Math.Abs(i[k]) / (u / D * (u / D)))).ToArray();
        return (x, y);
    }

    [Fact]
    public void Create_CurvedData_SlopeInterceptAndRSquaredMatchMathNet()
    {
        // FN law with B = 2.5e10 V/m, scattered by factors 3 and 0.3, so R² < 1: slope, intercept and R² against MathNet's least squares.
        double[] v = [2.0, 2.5, 3.0, 3.5, 4.0, 5.0, 6.0];
        var i = v.Select((u, k) => { double f = u / D; return 1e-12 * f * f * Math.Exp(-2.5e10 / f) * (k % 2 == 0 ? 3.0 : 0.3); }).ToArray();
        var plot = FowlerNordheimPlot.Create(v, i, D);
        Assert.NotNull(plot);
        var (x, y) = Reference(v, i);
        var (intercept, slope) = Fit.Line(x, y);
        double r2 = GoodnessOfFit.RSquared(x.Select(t => intercept + slope * t), y);
        Assert.True(r2 < 0.999);
        Assert.Equal(slope, plot.SlopeVPerM, Math.Abs(slope) * 1e-10);
        Assert.Equal(intercept, plot.Intercept, Math.Abs(intercept) * 1e-10);
        Assert.Equal(r2, plot.RSquared, 1e-10);
        Assert.Equal(-slope, plot.SlopeConstantVPerM, Math.Abs(slope) * 1e-10);
    }

    [Fact]
    public void Create_ExactFowlerNordheimCurve_GivesBarrierHeightOfLenzlingerSnow()
    {
        // J = C F² exp(−B/F) is a straight line of slope −B and intercept ln C, R² = 1; the barrier back from B:
        // φ = (3ħeB / (4√(2m*)))^{2/3} (Lenzlinger & Snow 1969), here for φ = 3.2 eV, m* = 0.42 mₑ.
        double phi = 3.2 * CodataE, r = 0.42;
        double b = 4 * Math.Sqrt(2 * r * CodataMe) * Math.Pow(phi, 1.5) / (3 * CodataHbar * CodataE);
        double[] v = [3.0, 3.5, 4.0, 4.5, 5.0];
        var i = v.Select(u => { double f = u / D; return 2e-9 * f * f * Math.Exp(-b / f); }).ToArray();
        var plot = FowlerNordheimPlot.Create(v, i, D)!;
        Assert.Equal(-b, plot.SlopeVPerM, b * 1e-9);
        Assert.Equal(Math.Log(2e-9), plot.Intercept, 1e-6);
        Assert.Equal(1.0, plot.RSquared, 12);
        Assert.Equal(3.2, plot.BarrierHeightEv(r), 1e-8);
    }

    [Fact]
    public void BarrierHeight_SlopeZeroOrPositive_IsNaN()
    {
        // A plot that does not fall with 1/F has no Fowler–Nordheim barrier (B = −slope must be > 0).
        Assert.True(double.IsNaN(new FowlerNordheimPlot([1.0, 2.0, 3.0], [1.0, 1.0, 1.0], 0.0, 1.0, 1.0).BarrierHeightEv(1.0)));
        double[] v = [1.0, 2.0, 3.0, 4.0];
        var rising = FowlerNordheimPlot.Create(v, v.Select(u => 1e-9 * Math.Exp(-u)).ToArray(), D)!;
        Assert.True(rising.SlopeVPerM > 0);
        Assert.True(double.IsNaN(rising.BarrierHeightEv(1.0)));
    }

    [Fact]
    public void Create_KeepsOnlyPointsOfTheChosenSignAndAboveTheMinimumBias()
    {
        double[] v = [-3.0, -2.0, -1.0, 0.0, 1.0, 2.0, 3.0, 4.0, 2.5, -2.5, 0.0, 0.0, 1.5, -1.5];
        double[] i = [-3e-6, -2e-6, -1e-7, 0.0, 1e-7, 2e-6, 3e-6, double.NaN, -1e-6, 1e-6, 1e-9, -1e-9, 0.0, 0.0];
        // Positive branch: V > 0 and I > 0, finite I: 1, 2, 3 V (4 V has NaN, 2.5 V a negative current, 1.5 V none, 0 V no field).
        var pos = FowlerNordheimPlot.Create(v, i, D)!;
        Assert.Equal([D / 1.0, D / 2.0, D / 3.0], pos.InverseFieldMPerV);
        // Negative branch: V < 0 and I < 0: −3, −2, −1 V (−2.5 V has a positive current).
        var neg = FowlerNordheimPlot.Create(v, i, D, positiveBias: false)!;
        Assert.Equal([D / 3.0, D / 2.0, D / 1.0], neg.InverseFieldMPerV);
        var (x, y) = Reference([-3.0, -2.0, -1.0], [-3e-6, -2e-6, -1e-7]);
        Assert.Equal(y, neg.LogCurrentOverFieldSquared);
        Assert.Equal(x, neg.InverseFieldMPerV);
        // |V| = the minimum is kept, below it dropped: with minimum 2 V only 2 and 3 V remain (fewer than 3 points: null).
        Assert.Null(FowlerNordheimPlot.Create(v, i, D, minAbsVoltageV: 2.0));
        var three = FowlerNordheimPlot.Create([1.0, 2.0, 3.0, 0.5], [1e-7, 2e-6, 3e-6, 1e-9], D, minAbsVoltageV: 1.0)!;
        Assert.Equal([D / 1.0, D / 2.0, D / 3.0], three.InverseFieldMPerV);
    }

    [Fact]
    public void Create_ThreePointsIsTheMinimum()
    {
        Assert.NotNull(FowlerNordheimPlot.Create([1.0, 2.0, 3.0], [1e-9, 1e-8, 1e-7], D));
        Assert.Null(FowlerNordheimPlot.Create([1.0, 2.0], [1e-9, 1e-8], D));
        Assert.ThrowsAny<ArgumentException>(() => FowlerNordheimPlot.Create([1.0, 2.0, 3.0], [1e-9, 1e-8, 1e-7], 0.0));
        Assert.ThrowsAny<ArgumentException>(() => FowlerNordheimPlot.Create([1.0, 2.0, 3.0], [1e-9, 1e-8], D));
    }
}
