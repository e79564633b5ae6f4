using JunctionFit.Fitting;
using JunctionFit.Results;
using Xunit;
using static JunctionFit.Tests.Fitting.TruthPoint;

namespace JunctionFit.Tests.Fitting;

public class BootstrapIntervalsTests
{
    [Fact]
    public void Compute_SameSeed_GivesIdenticalIntervals()
    {
        // Parallel refits write into fixed slots with per-replicate seeds drawn up front: the result must not depend on
        // thread scheduling, so two runs agree bit for bit.
        var curve = Baseline.Simulate(51);
        var options = Baseline.Options(areaKnown: false);
        var fit = JunctionFitter.Fit(curve, Model, options);
        var first = BootstrapIntervals.Compute(curve, Model, options, fit, replicates: 40, seed: 7);
        var second = BootstrapIntervals.Compute(curve, Model, options, fit, replicates: 40, seed: 7);
        for (int k = 0; k < first.Parameters.Length; k++)
        {
            Assert.Equal(first.Parameters[k].Lower95, second.Parameters[k].Lower95);
            Assert.Equal(first.Parameters[k].Upper95, second.Parameters[k].Upper95);
        }
        Assert.Equal(first.Quality!.IntervalMethod, second.Quality!.IntervalMethod);
        Assert.Contains("seed 7", first.Quality.IntervalMethod, StringComparison.Ordinal);
        Assert.Contains("B = 40", first.Quality.IntervalMethod, StringComparison.Ordinal);
    }

    [Fact]
    public void Compute_OtherSeed_GivesOtherIntervals()
    {
        var curve = Baseline.Simulate(52);
        var options = Baseline.Options(areaKnown: true);
        var fit = JunctionFitter.Fit(curve, Model, options);
        var a = BootstrapIntervals.Compute(curve, Model, options, fit, replicates: 40, seed: 1);
        var b = BootstrapIntervals.Compute(curve, Model, options, fit, replicates: 40, seed: 2);
        Assert.NotEqual(a.Find("barrier_height_eV")!.Lower95, b.Find("barrier_height_eV")!.Lower95);
    }

    [Fact]
    public void Compute_AreaKnown_KeepsValuesAndGivesIntervalsNearWald()
    {
        // With the area known the estimator is close to normal in (ln φ, ln d), so percentile and Wald intervals should
        // be about equally wide (common practice, no source: within 30 % for B = 200).
        var curve = Baseline.Simulate(53);
        var options = Baseline.Options(areaKnown: true);
        var fit = JunctionFitter.Fit(curve, Model, options);
        var boot = BootstrapIntervals.Compute(curve, Model, options, fit);
        Assert.Contains("B = 200", boot.Quality!.IntervalMethod, StringComparison.Ordinal);
        foreach (var (key, _) in Baseline.FreeKeys(areaKnown: true))
        {
            var w = fit.Find(key)!;
            var p = boot.Find(key)!;
            Assert.Equal(w.Value, p.Value);
            Assert.Equal(w.StandardError, p.StandardError);
            Assert.InRange(LogWidth(p) / LogWidth(w), 0.7, 1.3);
        }
        Assert.True(boot.Find("area_m2")!.IsFixed);
        Assert.Null(boot.Find("area_m2")!.Lower95);
    }

    [Fact]
    public void Compute_WithNoiseFloor_StaysInsideBounds()
    {
        // Exercises the standardisation by the noise model: with σ_floor set, residuals are divided by
        // sᵢ = √(r² + (σ_floor/|Iᵢ|)²) before resampling and multiplied by the target point's sᵢ after.
        var curve = Baseline.Simulate(54);
        var options = Baseline.Options(areaKnown: true) with { NoiseFloorA = 1e-12 };
        var fit = JunctionFitter.Fit(curve, Model, options);
        var boot = BootstrapIntervals.Compute(curve, Model, options, fit, replicates: 40);
        foreach (var (key, _) in Baseline.FreeKeys(areaKnown: true))
        {
            var p = boot.Find(key)!;
            var (lower, upper) = Bounds(key);
            Assert.True(p.Lower95 > lower && p.Upper95 < upper && p.Lower95 < p.Upper95);
            Assert.InRange(p.Value, 0.9 * p.Lower95!.Value, 1.1 * p.Upper95!.Value);
        }
    }

    [Fact]
    public void Compute_FailedFit_ReturnsFitWithWarning()
    {
        var curve = Baseline.Simulate(55);
        var failed = FitResult.Failed(curve.SourcePath, "simmons", "no usable points");
        var result = BootstrapIntervals.Compute(curve, Model, FitOptions.Default, failed);
        Assert.Equal(FitStatus.Failed, result.Status);
        Assert.Contains(result.Warnings, w => w.StartsWith("bootstrap intervals not computed", StringComparison.Ordinal));
    }

    [Fact]
    public void Compute_TooFewReplicates_Throws()
    {
        var curve = Baseline.Simulate(56);
        var fit = JunctionFitter.Fit(curve, Model, FitOptions.Default);
        Assert.Throws<ArgumentOutOfRangeException>(() => BootstrapIntervals.Compute(curve, Model, FitOptions.Default, fit, replicates: 5));
    }

    [Theory]
    // Hyndman & Fan (Am. Stat. 50, 361, 1996) definition 6, position (n + 1)·q, as R's quantile(type = 6); values worked
    // by hand for the sample 1…9: q = 0.25 → position 2.5 → 2.5; q = 0.025 → 0.25 → clamped to 1; q = 0.975 → 9.75 → 9.
    [InlineData(0.25, 2.5)]
    [InlineData(0.5, 5.0)]
    [InlineData(0.025, 1.0)]
    [InlineData(0.975, 9.0)]
    [InlineData(0.85, 8.5)]
    public void Quantile_SortedSample_FollowsDefinitionSix(double q, double expected)
    {
        double[] sample = [1, 2, 3, 4, 5, 6, 7, 8, 9];
        Assert.Equal(expected, BootstrapIntervals.Quantile(sample, q), 12);
    }
}
