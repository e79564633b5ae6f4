using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>
/// The simulator that makes the coverage and demo curves: its normal deviates against the standard normal distribution
/// (probabilities of ±1σ and ±2σ from the standard normal table, Abramowitz &amp; Stegun 26.2; fourth moment 3), its noise
/// model I = I₀ + N(0, (r·I₀)² + σ_floor²) as documented, and the sweep shapes point by point.
/// </summary>
public class IvSimulatorTests
{
    private static readonly JunctionCurrentModel Junction = new(SimmonsRectangularModel.Instance);
    private static readonly double[] Theta = [2.0 * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 1e-10];

    [Fact]
    public void StandardNormal_Moments_AndTableProbabilities()
    {
        var rng = new Random(20261203);
        const int n = 200_000;
        double sum = 0, sum2 = 0, sum4 = 0;
        int within1 = 0, within2 = 0;
        for (int k = 0; k < n; k++)
        {
            double z = IvSimulator.StandardNormal(rng);
            sum += z;
            sum2 += z * z;
            sum4 += z * z * z * z;
            if (Math.Abs(z) < 1) within1++;
            if (Math.Abs(z) < 2) within2++;
        }
        double mean = sum / n, variance = sum2 / n - mean * mean;
        Assert.InRange(mean, -4.0 / Math.Sqrt(n), 4.0 / Math.Sqrt(n));                 // 4 standard errors
        Assert.InRange(variance, 1 - 4 * Math.Sqrt(2.0 / n), 1 + 4 * Math.Sqrt(2.0 / n)); // var of s² is 2/n
        Assert.InRange(sum4 / n, 3 - 4 * Math.Sqrt(96.0 / n), 3 + 4 * Math.Sqrt(96.0 / n)); // E z⁴ = 3, var z⁴ = 96
        Assert.InRange(within1 / (double)n, 0.682689 - 0.005, 0.682689 + 0.005);       // P(|z| < 1), A&S 26.2
        Assert.InRange(within2 / (double)n, 0.954500 - 0.003, 0.954500 + 0.003);       // P(|z| < 2), A&S 26.2
    }

    [Fact]
    public void Simulate_NoNoise_IsTheModelCurrent()
    {
        var (v, i) = IvSimulator.Simulate(Junction, Theta, new SimulationSpec(-1.0, 1.0, 41));
        for (int k = 0; k < v.Length; k++) Assert.Equal(Junction.Current(v[k], Theta), i[k]);
    }

    [Theory]
    [InlineData(0.01, 0.0)]
    [InlineData(0.0, 1e-9)]
    [InlineData(0.02, 1e-9)]
    public void Simulate_Noise_HasTheDocumentedSpread(double relative, double floorA)
    {
        // z = (I − I₀) / √((r I₀)² + σ_floor²) must be standard normal: mean 0, variance 1 (4 standard errors).
        var clean = IvSimulator.Simulate(Junction, Theta, new SimulationSpec(0.05, 1.0, 20_001));
        var noisy = IvSimulator.Simulate(Junction, Theta,
            new SimulationSpec(0.05, 1.0, 20_001) { RelativeNoise = relative, NoiseFloorA = floorA, Seed = 5 });
        int n = clean.CurrentA.Length;
        double sum = 0, sum2 = 0;
        for (int k = 0; k < n; k++)
        {
            double i0 = clean.CurrentA[k];
            double z = (noisy.CurrentA[k] - i0) / Math.Sqrt(relative * relative * i0 * i0 + floorA * floorA);
            sum += z;
            sum2 += z * z;
        }
        double mean = sum / n, variance = sum2 / n - mean * mean;
        Assert.InRange(mean, -4.0 / Math.Sqrt(n), 4.0 / Math.Sqrt(n));
        Assert.InRange(variance, 1 - 4 * Math.Sqrt(2.0 / n), 1 + 4 * Math.Sqrt(2.0 / n));
    }

    [Fact]
    public void Simulate_SameSeedSameCurve_OtherSeedOther()
    {
        var spec = new SimulationSpec(-1.0, 1.0, 21) { RelativeNoise = 0.01, Seed = 3 };
        var a = IvSimulator.Simulate(Junction, Theta, spec);
        var b = IvSimulator.Simulate(Junction, Theta, spec);
        var c = IvSimulator.Simulate(Junction, Theta, spec with { Seed = 4 });
        Assert.Equal(a.CurrentA.ToArray(), b.CurrentA.ToArray());
        Assert.NotEqual(a.CurrentA.ToArray(), c.CurrentA.ToArray());
    }

    [Fact]
    public void Simulate_BadArguments_Throw()
    {
        var spec = new SimulationSpec(-1.0, 1.0, 5);
        Assert.Throws<ArgumentNullException>(() => IvSimulator.Simulate(null!, Theta, spec));
        Assert.Throws<ArgumentNullException>(() => IvSimulator.Simulate(Junction, Theta, null!));
        Assert.Throws<ArgumentException>(() => IvSimulator.Simulate(Junction, Theta.AsSpan(0, 3), spec));
        Assert.Throws<ArgumentNullException>(() => IvSimulator.SweepVoltages(null!));
    }

    [Fact]
    public void SweepVoltages_LoopOfUnevenRange_UsesTheLargerEnd()
    {
        // Amplitude max(|−0.5|, |2|) = 2 V: 0 → 2 → −2 → 0 in nine even steps of 1 V.
        var v = IvSimulator.SweepVoltages(new SimulationSpec(-0.5, 2.0, 9) { Shape = SweepShape.Loop });
        Assert.Equal([0.0, 1.0, 2.0, 1.0, 0.0, -1.0, -2.0, -1.0, 0.0], v);
        var w = IvSimulator.SweepVoltages(new SimulationSpec(-3.0, 1.0, 13) { Shape = SweepShape.Loop });
        Assert.Equal([0.0, 1.0, 2.0, 3.0, 2.0, 1.0, 0.0, -1.0, -2.0, -3.0, -2.0, -1.0, 0.0], w);
        Assert.Throws<ArgumentException>(() => IvSimulator.SweepVoltages(new SimulationSpec(0.0, 0.0, 9) { Shape = SweepShape.Loop }));
    }

    [Fact]
    public void SweepVoltages_PositiveOnly_StartsAtTheLowerPositiveEnd()
    {
        Assert.Equal([0.5, 1.0, 1.5, 2.0], IvSimulator.SweepVoltages(new SimulationSpec(2.0, 0.5, 4) { Shape = SweepShape.PositiveOnly }));
        Assert.Equal([0.0, 0.5, 1.0], IvSimulator.SweepVoltages(new SimulationSpec(-2.0, 1.0, 3) { Shape = SweepShape.PositiveOnly }));
        Assert.Throws<ArgumentException>(() => IvSimulator.SweepVoltages(new SimulationSpec(-1.0, 0.0, 5) { Shape = SweepShape.PositiveOnly }));
        Assert.Throws<ArgumentException>(() => IvSimulator.SweepVoltages(new SimulationSpec(-1.0, 1.0, 5) { Shape = (SweepShape)99 }));
    }
}
