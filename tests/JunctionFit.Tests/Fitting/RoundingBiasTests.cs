using System.Collections.Immutable;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>A float-stepped sweep's "0 V" (a bias like 1e-16 V read at the instrument's current floor) must not move the fit.</summary>
public class RoundingBiasTests
{
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    private static readonly FitOptions AreaKnown = FitOptions.Default with
    {
        FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, 100e-12),
    };

    [Theory]
    [InlineData(2.16, 1.55, 11)]
    [InlineData(1.82, 1.95, 13)]
    public void FloorLevelPointAtRoundingBias_IsMaskedAndLeavesTheOptimum(double phiEv, double dNm, int seed)
    {
        // Invented data (project simulator). The 0 V row becomes (1e-16 V, 1e-13 A): same sign as the bias, at a typical
        // probe-station floor (common practice, no source). Before the rounding-bias rule this point dragged the fit to
        // φ ≈ 0.67 eV, d ≈ 3 nm (thousands of standard errors away).
        var clean = JunctionFitterTests.Simulate(phiEv, dNm, 100, 0.01, seed, fromV: -1.2, toV: 1.2);
        var v = clean.VoltageV.ToArray();
        var i = clean.CurrentA.ToArray();
        int zero = Array.IndexOf(v, 0.0);
        Assert.True(zero > 0);
        v[zero] = 1e-16;
        i[zero] = 1e-13;
        var withFloorPoint = new IvCurve("floor.csv", [.. v], [.. i]);

        var reference = JunctionFitter.Fit(clean, Model, AreaKnown);
        var result = JunctionFitter.Fit(withFloorPoint, Model, AreaKnown);

        Assert.Equal(FitStatus.Ok, result.Status);
        Assert.Equal(reference.Quality!.PointsUsed, result.Quality!.PointsUsed);
        Assert.Equal(1, result.Quality.PointsMasked);
        foreach (string key in new[] { "barrier_height_eV", "thickness_nm" })
        {
            var a = reference.Find(key)!;
            var b = result.Find(key)!;
            // The floor reading also sets σ_floor (its own current), which re-weights the few points near 1e-13 A a little:
            // the optimum moves by far less than its standard error.
            Assert.Equal(a.Value, b.Value, 0.01 * a.StandardError!.Value);
            Assert.Equal(a.StandardError!.Value, b.StandardError!.Value, 0.01 * a.StandardError.Value);
        }
    }

    [Fact]
    public void SmallButRealBias_IsKept()
    {
        // 1 mV out of 1.2 V is far above rounding: it stays in the fit.
        var clean = JunctionFitterTests.Simulate(2.0, 1.5, 100, 0.0, 3, fromV: -1.2, toV: 1.2);
        var v = clean.VoltageV.ToArray();
        var i = clean.CurrentA.ToArray();
        int zero = Array.IndexOf(v, 0.0);
        v[zero] = 1e-3;
        i[zero] = i[zero + 1] * (1e-3 / v[zero + 1]);
        var result = JunctionFitter.Fit(new IvCurve("small.csv", [.. v], [.. i]), Model, AreaKnown);
        Assert.Equal(201, result.Quality!.PointsUsed);
    }
}
