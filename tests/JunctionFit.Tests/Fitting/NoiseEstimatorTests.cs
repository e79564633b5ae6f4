using JunctionFit.Fitting;
using Xunit;

namespace JunctionFit.Tests.Fitting;

public class NoiseEstimatorTests
{
    [Theory]
    [InlineData(0.005)]
    [InlineData(0.01)]
    [InlineData(0.02)]
    public void RelativeNoise_SimulatedCurve_RecoversNoiseLevel(double noise)
    {
        // 201-point Simmons sweep with Gaussian relative noise: the estimate must be within ±15 %, about
        // 2.5 standard errors of a median-based estimate from ~200 triples (asymptotic efficiency 37 %, Hampel 1974).
        var curve = JunctionFitterTests.Simulate(2.0, 1.5, 100, noise, seed: 5);
        var v = new List<double>();
        var y = new List<double>();
        for (int i = 0; i < curve.Count; i++)
        {
            if (curve.VoltageV[i] == 0) continue;
            v.Add(curve.VoltageV[i]);
            y.Add(Math.Log(Math.Abs(curve.CurrentA[i])));
        }
        double? estimate = NoiseEstimator.RelativeNoise(v.ToArray(), y.ToArray());
        Assert.NotNull(estimate);
        Assert.InRange(estimate.Value, 0.85 * noise, 1.15 * noise);
    }

    [Fact]
    public void RelativeNoise_TooFewPoints_IsNull()
    {
        Assert.Null(NoiseEstimator.RelativeNoise([0.1, 0.2, 0.3], [1.0, 2.0, 3.0]));
    }

    [Fact]
    public void RelativeNoise_StraightLineWithoutNoise_IsTheFloorValue()
    {
        var v = Enumerable.Range(1, 20).Select(i => i * 0.05).ToArray();
        var y = v.Select(x => 3 * x - 20).ToArray();
        Assert.Equal(NoiseEstimator.SmallestEstimate, NoiseEstimator.RelativeNoise(v, y));
    }

    [Fact]
    public void RelativeNoise_AlternatingScatter_IsTheNormalisedMedianOfTheScaledSecondDifferences()
    {
        // Even spacing, yᵢ = ±a alternating: every second difference is ±2a with wₗ = wᵣ = 1/2, scaled by √(1 + 1/4 + 1/4),
        // so the estimate is 1.4826 · 2a/√1.5 (hand calculation from the documented formula; 1.4826 = 1/Φ⁻¹(3/4), Hampel 1974).
        const double a = 0.01;
        double[] v = Enumerable.Range(1, 12).Select(i => 0.1 * i).ToArray();
        double[] y = v.Select((_, i) => i % 2 == 0 ? a : -a).ToArray();
        Assert.Equal(1.4826 * 2 * a / Math.Sqrt(1.5), NoiseEstimator.RelativeNoise(v, y)!.Value, 1e-15);

        // Uneven spacing: a straight line has zero second differences whatever the weights, so only the floor is left.
        double[] uneven = [0.1, 0.15, 0.3, 0.32, 0.5, 0.61, 0.7, 0.9, 0.93, 1.2, 1.4];
        Assert.Equal(NoiseEstimator.SmallestEstimate, NoiseEstimator.RelativeNoise(uneven, uneven.Select(x => (4 * x) + 1).ToArray()));
    }

    [Fact]
    public void RelativeNoise_TriplesAcrossZeroBias_AreLeftOut()
    {
        // Two straight branches ln|I| = ±5V − 20 meet in a kink at V = 0 (as ln|I| of any junction does): the triples
        // that straddle zero would see the kink; without them the noise-free branches give the floor.
        double[] v = Enumerable.Range(-6, 13).Where(i => i != 0).Select(i => 0.1 * i).ToArray();
        double[] y = v.Select(x => (5 * Math.Abs(x)) - 20).ToArray();
        Assert.Equal(NoiseEstimator.SmallestEstimate, NoiseEstimator.RelativeNoise(v, y));
    }

    [Fact]
    public void RelativeNoise_Groups_KeepAnOffsetBetweenSweepDirectionsOutOfTheNoise()
    {
        // A rising and a falling sweep on interleaved biases, the falling one 0.3 higher in ln|I| (hysteresis), both
        // noise-free: within each group the branch is straight (the floor); mixed, the offset shows as scatter of
        // 1.4826 · 0.3/√1.5 (every triple alternates between the branches: e = ±0.3, hand calculation).
        double[] v = Enumerable.Range(1, 20).Select(i => 0.05 * i).ToArray();
        sbyte[] groups = v.Select((_, i) => (sbyte)(i % 2 == 0 ? 1 : -1)).ToArray();
        double[] y = v.Select((x, i) => (3 * x) - 20 + (groups[i] < 0 ? 0.3 : 0.0)).ToArray();

        Assert.Equal(NoiseEstimator.SmallestEstimate, NoiseEstimator.RelativeNoise(v, y, groups));
        Assert.Equal(1.4826 * 0.3 / Math.Sqrt(1.5), NoiseEstimator.RelativeNoise(v, y)!.Value, 1e-12);
    }

    [Fact]
    public void RelativeNoise_AGroupOfThreePoints_AddsItsOneTriple()
    {
        // Group 1: nine points on a line (seven zero triples); group 0: three points, one triple. 7 + 1 = 8 triples is
        // the minimum; without the three-point group there are too few.
        double[] v = [.. Enumerable.Range(1, 9).Select(i => 0.1 * i), 0.15, 0.25, 0.35];
        double[] y = [.. Enumerable.Range(1, 9).Select(i => 0.2 * i), 0.0, 1.0, 0.0];
        sbyte[] groups = [1, 1, 1, 1, 1, 1, 1, 1, 1, 0, 0, 0];

        Assert.Equal(8, NoiseEstimator.MinimumTriples);
        Assert.Equal(NoiseEstimator.SmallestEstimate, NoiseEstimator.RelativeNoise(v, y, groups));   // median of 7 zeros and one
        groups[^1] = -1;   // now groups of 2 and 1 points: no triple of their own
        Assert.Null(NoiseEstimator.RelativeNoise(v, y, groups));
    }

    [Fact]
    public void RelativeNoise_MismatchedLengths_Throw()
    {
        double[] v = Enumerable.Range(1, 12).Select(i => 0.1 * i).ToArray();
        Assert.Throws<ArgumentException>(() => NoiseEstimator.RelativeNoise(v, v.AsSpan(0, 11)));
        Assert.Throws<ArgumentException>(() => NoiseEstimator.RelativeNoise(v, v, new sbyte[11]));
    }
}
