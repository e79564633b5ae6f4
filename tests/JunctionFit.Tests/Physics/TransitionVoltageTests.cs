using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

public class TransitionVoltageTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;

    /// <summary>Minimum of ln(J/V²) of the model by golden-section search (the definition of Beebe et al., PRL 97, 026801, 2006).</summary>
    private static double ModelMinimum(IBarrierModel model, double[] p, double lo, double hi)
    {
        double F(double v) => Math.Log(model.CurrentDensity(v, p) / (v * v));
        double g = (Math.Sqrt(5) - 1) / 2;
        double a = lo, b = hi;
        for (int k = 0; k < 200; k++)
        {
            double c = b - g * (b - a), d = a + g * (b - a);
            if (F(c) < F(d)) b = d; else a = c;
        }
        return 0.5 * (a + b);
    }

    private static (double[] V, double[] I) Curve(double[] p, double maxV, int n, double noise)
    {
        var junction = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        var spec = new SimulationSpec(-maxV, maxV, n) { RelativeNoise = noise, Seed = 7 };
        var (v, i) = IvSimulator.Simulate(junction, [.. p, 1e-10], spec);
        return (v.ToArray(), i.ToArray());
    }

    [Theory]
    [InlineData(1.0, 1.5)]
    [InlineData(2.0, 1.2)]
    public void Compute_NoiseFreeSimmons_MatchesModelMinimum(double phiEv, double dNm)
    {
        double[] p = [phiEv * Ev, dNm * 1e-9, 1.0];
        double expected = ModelMinimum(SimmonsRectangularModel.Instance, p, 0.05, 2 * phiEv);
        var (v, i) = Curve(p, 2 * phiEv, 201, 0);
        var vt = TransitionVoltage.Compute(v, i);
        Assert.NotNull(vt.PositiveV);
        Assert.NotNull(vt.NegativeV);
        Assert.InRange(vt.PositiveV.Value / expected, 0.99, 1.01);
        Assert.InRange(-vt.NegativeV.Value / expected, 0.99, 1.01);
    }

    [Fact]
    public void Compute_TwoPercentNoise_StaysWithinFivePercent()
    {
        double[] p = [1.0 * Ev, 1.5e-9, 1.0];
        double expected = ModelMinimum(SimmonsRectangularModel.Instance, p, 0.05, 2.0);
        var (v, i) = Curve(p, 2.0, 301, 0.02);
        double? vt = TransitionVoltage.Compute(v, i, positiveBias: true);
        Assert.NotNull(vt);
        Assert.InRange(vt.Value / expected, 0.95, 1.05);
    }

    [Fact]
    public void Compute_LowBiasOnly_ReturnsNull()
    {
        // Below V_t ln(I/V²) only falls with |V|: no minimum inside the range.
        var (v, i) = Curve([2.0 * Ev, 1.5e-9, 1.0], 0.3, 101, 0.01);
        var vt = TransitionVoltage.Compute(v, i);
        Assert.Null(vt.PositiveV);
        Assert.Null(vt.NegativeV);
    }

    [Fact]
    public void Compute_TooFewPoints_ReturnsNull()
    {
        Assert.Null(TransitionVoltage.Compute([0.1, 0.2, 0.3], [1e-9, 2e-9, 4e-9], true));
    }

    [Fact]
    public void SweepVoltages_Loop_GoesZeroUpDownZero()
    {
        var v = IvSimulator.SweepVoltages(new SimulationSpec(-1, 1, 9) { Shape = SweepShape.Loop });
        Assert.Equal([0, 0.5, 1, 0.5, 0, -0.5, -1, -0.5, 0], v);
    }

    [Fact]
    public void SweepVoltages_PositiveOnly_FromZeroToTop()
    {
        var v = IvSimulator.SweepVoltages(new SimulationSpec(-1, 2, 5) { Shape = SweepShape.PositiveOnly });
        Assert.Equal([0, 0.5, 1, 1.5, 2], v);
        Assert.Throws<ArgumentException>(() => IvSimulator.SweepVoltages(new SimulationSpec(-1, -0.5, 5) { Shape = SweepShape.PositiveOnly }));
    }

    [Fact]
    public void SweepVoltages_Linear_UnchangedEvenSpacing()
    {
        var v = IvSimulator.SweepVoltages(new SimulationSpec(-1, 1, 5));
        Assert.Equal([-1, -0.5, 0, 0.5, 1], v);
    }
}
