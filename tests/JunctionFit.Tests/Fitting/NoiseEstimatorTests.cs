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
}
