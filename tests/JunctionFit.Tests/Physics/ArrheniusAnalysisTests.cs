using JunctionFit.Physics;
using MathNet.Numerics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// Checks <see cref="ArrheniusAnalysis"/>: ln|I| against 1/kT fitted by least squares, E_a = −slope (Arrhenius law
/// I = I₀ exp(−E_a/kT)), against MathNet's <see cref="Fit.Line"/> and <see cref="GoodnessOfFit.RSquared"/>, k = 8.617333262e-5 eV/K
/// (CODATA 2018), and the verdicts with the documented thresholds (E_a above 50 meV: activated; a fall by more than 2 %: metallic).
/// </summary>
public class ArrheniusAnalysisTests
{
    private const double KEv = 8.617333262e-5; // eV/K, CODATA 2018

    [Fact]
    public void Analyze_ExactArrheniusCurrent_GivesActivationEnergy()
    {
        // I = I₀ exp(−E_a/kT), E_a = 0.23 eV: a straight line, R² = 1, verdict thermally activated; unsorted temperatures,
        // ratio = I(T_max)/I(T_min) from the law.
        double[] t = [250.0, 150.0, 300.0, 200.0];
        var i = t.Select(x => -4e-3 * Math.Exp(-0.23 / (KEv * x))).ToArray();
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(0.23, result.ActivationEnergyEv, 1e-9);
        Assert.Equal(1.0, result.RSquared, 12);
        Assert.Equal(Math.Exp(-0.23 / (KEv * 300) + 0.23 / (KEv * 150)), result.CurrentRatio, 1e-6);
        Assert.Equal(TemperatureDependence.ThermallyActivated, result.Verdict);
        Assert.False(result.IsDirectTunnelling);
    }

    [Fact]
    public void Analyze_ScatteredCurrent_SlopeAndRSquaredMatchMathNet()
    {
        double[] t = [80.0, 120.0, 160.0, 200.0, 240.0, 300.0];
        double[] i = [1.00e-6, 1.04e-6, 1.01e-6, 1.09e-6, 1.05e-6, 1.08e-6];
        var x = t.Select(u => 1 / (KEv * u)).ToArray();
        var y = i.Select(u => Math.Log(u)).ToArray();
        var (intercept, slope) = Fit.Line(x, y);
        double r2 = GoodnessOfFit.RSquared(x.Select(u => intercept + slope * u), y);
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(-slope, result.ActivationEnergyEv, Math.Abs(slope) * 1e-7);
        Assert.Equal(r2, result.RSquared, 1e-7);
        Assert.True(r2 is > 0.1 and < 0.99);
        Assert.Equal(1.08, result.CurrentRatio, 1e-12);
        Assert.Equal(TemperatureDependence.WeakDirectTunnelling, result.Verdict);
        Assert.True(result.IsDirectTunnelling);
    }

    [Theory]
    [InlineData(1.01, TemperatureDependence.WeakDirectTunnelling)]
    [InlineData(0.99, TemperatureDependence.WeakDirectTunnelling)]
    [InlineData(0.97, TemperatureDependence.Metallic)]
    public void Analyze_TwoTemperatures_RatioDecidesMetallic(double ratio, TemperatureDependence verdict)
    {
        // Two points are enough; the current falling by more than 2 % from 100 K to 300 K is metallic.
        var result = ArrheniusAnalysis.Analyze([100.0, 300.0], [1e-6, ratio * 1e-6]);
        Assert.Equal(verdict, result.Verdict);
        Assert.Equal(verdict == TemperatureDependence.WeakDirectTunnelling, result.IsDirectTunnelling);
        Assert.Equal(ratio, result.CurrentRatio, 1e-12);
        // Two points: ln(ratio) = −E_a (1/kT₂ − 1/kT₁).
        Assert.Equal(-Math.Log(ratio) / (1 / (KEv * 300) - 1 / (KEv * 100)), result.ActivationEnergyEv, 1e-9);
    }

    [Fact]
    public void Analyze_InvalidInput_Throws()
    {
        Assert.ThrowsAny<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0], [1e-6]));
        Assert.ThrowsAny<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6]));
        Assert.ThrowsAny<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6, 2e-6], 0.0));
        Assert.ThrowsAny<ArgumentException>(() => ArrheniusAnalysis.Analyze([-100.0, 200.0], [1e-6, 2e-6]));
        Assert.ThrowsAny<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 100.0], [1e-6, 2e-6]));
        Assert.Throws<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6, -2e-6]));
        Assert.Throws<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6, 0.0]));
        Assert.Throws<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6, double.NaN]));
        Assert.Throws<ArgumentException>(() => ArrheniusAnalysis.Analyze([100.0, 200.0], [1e-6, double.PositiveInfinity]));
    }

    [Fact]
    public void Analyze_TemperatureIndependentCurrent_ZeroActivationExactFit()
    {
        // A current that does not change with temperature is the direct-tunnelling signature: E_a = 0, and the flat line
        // fits every point exactly, so R² is 1 by this tool's convention (SS_tot = 0 leaves R² = 1 − 0/0 undefined).
        double[] t = [100.0, 200.0, 300.0];
        double[] i = [2e-7, 2e-7, 2e-7];
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(0.0, result.ActivationEnergyEv);
        Assert.Equal(1.0, result.RSquared);
        Assert.Equal(1.0, result.CurrentRatio);
        Assert.True(result.IsDirectTunnelling);
    }
}
