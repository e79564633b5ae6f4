using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class TemperatureTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private const double KT300 = PhysicalConstants.BoltzmannJPerK * 300.0;

    /// <summary>Composite Simpson rule with n (even) intervals: a plain, independent integrator for the checks.</summary>
    private static double Simpson(Func<double, double> f, double a, double b, int n)
    {
        double h = (b - a) / n, s = f(a) + f(b);
        for (int k = 1; k < n; k++) s += f(a + k * h) * (k % 2 == 1 ? 4 : 2);
        return s * h / 3;
    }

    [Theory]
    [InlineData(2.0, 2.0, 1.0)]
    [InlineData(1.0, 1.5, 0.5)]
    [InlineData(0.8, 1.5, 1.0)]
    public void ThermalFactor_At300K_MatchesIntegralOverFermiFunctionDerivative(double phiEv, double dNm, double r)
    {
        // ∫ e^{cε} (−∂f/∂ε) dε = πckT / sin(πckT) (Stratton 1962; Simmons 1964), integrated numerically at 300 K.
        double c = ThermalFactor.RectangularDecay(phiEv * Ev, dNm * 1e-9, r);
        double x = ThermalFactor.Argument(c, 300);
        Assert.True(x < 1, $"pi c k T = {x}");
        double Kernel(double e) { double t = e / (2 * KT300); double ch = Math.Cosh(t); return Math.Exp(c * e) / (4 * KT300 * ch * ch); }
        double numeric = Simpson(Kernel, -60 * KT300, 60 * KT300, 20000);
        Assert.True(GradientAssert.Relative(numeric, ThermalFactor.Evaluate(x)) < 1e-7, $"{numeric} vs {ThermalFactor.Evaluate(x)}");
    }

    [Fact]
    public void ThermalFactor_At300K_MatchesTsuEsakiSupplyFunctionRatio()
    {
        // Tsu–Esaki supply N_T(ε) = kT ln[(1 + e^{−ε/kT}) / (1 + e^{−(ε+eV)/kT})] with a transmission e^{cε}: the ratio
        // ∫ e^{cε} N_T dε / ∫ e^{cε} N_0 dε equals πckT / sin(πckT) (Stratton 1962), checked by direct integration at 300 K.
        double c = ThermalFactor.RectangularDecay(1.5 * Ev, 2.0e-9, 1.0);
        double ev = 0.3 * Ev;
        double Nt(double e) => KT300 * (Math.Log(1 + Math.Exp(-e / KT300)) - Math.Log(1 + Math.Exp(-(e + ev) / KT300)));
        double N0(double e) => Math.Max(-e, 0) - Math.Max(-e - ev, 0);
        double lo = -ev - 80 * KT300, hi = 60 * KT300;
        double thermal = Simpson(e => Math.Exp(c * e) * Nt(e), lo, hi, 40000) + Simpson(e => Math.Exp(c * e) * ev, lo - 2 * Ev, lo, 4000);
        double cold = Simpson(e => Math.Exp(c * e) * N0(e), -ev, 0, 4000) + Simpson(e => Math.Exp(c * e) * ev, lo - 2 * Ev, -ev, 4000);
        double expected = ThermalFactor.Evaluate(ThermalFactor.Argument(c, 300));
        Assert.True(GradientAssert.Relative(thermal / cold, expected) < 1e-6, $"{thermal / cold} vs {expected}");
    }

    public static TheoryData<string, double> Cases()
    {
        var data = new TheoryData<string, double>();
        foreach (string m in new[] { "simmons", "bdr", "fowler-nordheim" })
        foreach (double v in new[] { -0.4, 0.15, 0.9, 3.1 })
        {
            data.Add(m, v);
        }
        return data;
    }

    [Theory]
    [MemberData(nameof(Cases))]
    public void ThermallyCorrectedGradient_At300K_MatchesCentralDifferences(string name, double v)
    {
        // Central finite differences (common practice, no source).
        var model = BarrierModelCatalog.Create(name, new BarrierModelOptions { TemperatureK = 300 });
        double[] p = name == "bdr" ? [1.5 * Ev, 1.6e-9, 0.3 * Ev, 0.9] : [1.5 * Ev, 1.6e-9, 0.9];
        GradientAssert.Barrier(model, v, p, 1e-6);
    }

    [Fact]
    public void ThermallyCorrected_At300K_SlightlyAboveZeroTemperature()
    {
        var cold = SimmonsRectangularModel.Instance;
        var warm = BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = 300 });
        double[] p = [2.0 * Ev, 2.0e-9, 1.0];
        double ratio = warm.CurrentDensity(0.2, p) / cold.CurrentDensity(0.2, p);
        Assert.InRange(ratio, 1.01, 1.2);
    }

    [Fact]
    public void CheckValidity_ThickLowBarrierAt300K_WarnsThermalArgument()
    {
        var warm = BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = 300 });
        Assert.Contains(warm.CheckValidity(0.1, [0.3 * Ev, 5e-9, 1.0]), w => w.Contains("pi*c*kT", StringComparison.Ordinal));
        Assert.DoesNotContain(warm.CheckValidity(0.1, [2.0 * Ev, 1.5e-9, 1.0]), w => w.Contains("pi*c*kT", StringComparison.Ordinal));
    }

    [Fact]
    public void Arrhenius_StronglyActivated_ReportsNotDirectTunnelling()
    {
        // I ∝ exp(−E_a/kT) with E_a = 0.3 eV: thermally activated (hopping-like), not direct tunnelling (common practice, no source).
        double[] t = [200, 250, 300, 350, 400];
        var i = t.Select(x => 1e-3 * Math.Exp(-0.3 * Ev / (PhysicalConstants.BoltzmannJPerK * x))).ToArray();
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(TemperatureDependence.ThermallyActivated, result.Verdict);
        Assert.False(result.IsDirectTunnelling);
        Assert.Contains("not direct tunneling", result.Message, StringComparison.Ordinal);
        Assert.Equal(0.3, result.ActivationEnergyEv, 9);
    }

    [Fact]
    public void Arrhenius_ThermalFactorOfTunnelling_ReportsDirectTunnelling()
    {
        // Currents from the simmons model with the thermal factor (Simmons 1964): weak dependence.
        double[] t = [80, 150, 220, 300, 350];
        double[] p = [2.0 * Ev, 1.8e-9, 1.0];
        var i = t.Select(x => BarrierModelCatalog.Create("simmons", new BarrierModelOptions { TemperatureK = x }).CurrentDensity(0.3, p)).ToArray();
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(TemperatureDependence.WeakDirectTunnelling, result.Verdict);
        Assert.True(result.ActivationEnergyEv < 0.01);
    }

    [Fact]
    public void Arrhenius_CurrentFallsWithTemperature_ReportsMetallic()
    {
        double[] t = [100, 200, 300];
        double[] i = [1e-3, 0.7e-3, 0.55e-3];
        var result = ArrheniusAnalysis.Analyze(t, i);
        Assert.Equal(TemperatureDependence.Metallic, result.Verdict);
        Assert.Contains("not direct tunneling", result.Message, StringComparison.Ordinal);
    }
}
