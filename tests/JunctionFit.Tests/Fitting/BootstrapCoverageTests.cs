using JunctionFit.Fitting;
using JunctionFit.Results;
using Xunit;
using Xunit.Abstractions;
using static JunctionFit.Tests.Fitting.ProfileLikelihoodAndBootstrapCases;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Coverage of the residual-bootstrap percentile 95 % intervals on simulated junctions with known truth (fixed seeds for
/// the curves and the resampling). Every curve costs B refits, so fewer curves are affordable than for the other methods.
/// Acceptance band: 95 % ± 3 binomial standard deviations (normal approximation; a correct method fails it by chance about
/// 3 times in 1000 runs). For R curves the standard deviation of the covered count is √(R·0.95·0.05):
/// R = 100 curves × B = 100 refits (both configurations): 2.18, band 95 ± 6.5 → at least 89 covered (the upper end, 101.5,
/// cannot be exceeded). The band is wide; the printed Wald coverage of the same curves is the sharper comparison.
/// </summary>
public class BootstrapCoverageTests(ITestOutputHelper output)
{
    public static TheoryData<bool, int, int, int, int> Cases => new()
    {
        { true, 100, 100, 89, 100 },
        { false, 100, 100, 89, 100 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Compute_SimulatedJunctions_CoverTruthAt95Percent(bool areaKnown, int curves, int replicates, int low, int high)
    {
        var options = Options(areaKnown);
        var keys = FreeKeys(areaKnown);
        var wald = new FitResult[curves];
        var bootstrap = new FitResult[curves];
        Parallel.For(0, curves, rep =>
        {
            var curve = Simulate(30_000 + rep);
            wald[rep] = JunctionFitter.Fit(curve, Model, options);
            bootstrap[rep] = BootstrapIntervals.Compute(curve, Model, options, wald[rep], replicates, seed: 1 + rep);
        });

        var covered = new int[keys.Length];
        var waldCovered = new int[keys.Length];
        var widthRatio = new double[keys.Length];
        int failed = 0, droppedReplicates = 0;
        for (int rep = 0; rep < curves; rep++)
        {
            if (wald[rep].Status == FitStatus.Failed) { failed++; continue; }
            Assert.StartsWith("residual bootstrap", bootstrap[rep].Quality!.IntervalMethod, StringComparison.Ordinal);
            if (bootstrap[rep].Warnings.Any(w => w.Contains("bootstrap replicates failed", StringComparison.Ordinal))) droppedReplicates++;
            for (int k = 0; k < keys.Length; k++)
            {
                var b = bootstrap[rep].Find(keys[k].Key)!;
                var w = wald[rep].Find(keys[k].Key)!;
                var (lower, upper) = Bounds(keys[k].Key);
                Assert.True(b.Lower95 > lower && b.Upper95 < upper, $"{keys[k].Key} interval leaves the physical bounds");
                Assert.Equal(w.Value, b.Value);
                Assert.Equal(w.StandardError, b.StandardError);
                if (b.Lower95 <= keys[k].Truth && keys[k].Truth <= b.Upper95) covered[k]++;
                if (w.Lower95 <= keys[k].Truth && keys[k].Truth <= w.Upper95) waldCovered[k]++;
                widthRatio[k] += LogWidth(b) / LogWidth(w);
            }
        }
        int good = curves - failed;
        for (int k = 0; k < keys.Length; k++)
        {
            output.WriteLine($"area {(areaKnown ? "known" : "free")}: {keys[k].Key} bootstrap coverage {covered[k] / (double)good:P1} " +
                             $"(Wald {waldCovered[k] / (double)good:P1}), mean width / Wald width (log space) {widthRatio[k] / good:0.000}");
        }
        output.WriteLine($"failed fits: {failed}, curves with failed replicates: {droppedReplicates}");
        Assert.Equal(0, failed);
        for (int k = 0; k < keys.Length; k++) Assert.InRange(covered[k], low, high);
    }
}
