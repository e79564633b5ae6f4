using JunctionFit.Fitting;
using JunctionFit.Results;
using Xunit;
using Xunit.Abstractions;
using static JunctionFit.Tests.Fitting.ProfileLikelihoodAndBootstrapCases;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Coverage of the profile-likelihood 95 % intervals on simulated junctions with known truth (fixed seeds).
/// Acceptance band: 95 % ± 3 binomial standard deviations (normal approximation; a correct method fails it by chance about
/// 3 times in 1000 runs). For R replicates the standard deviation of the covered count is √(R·0.95·0.05):
/// area known, R = 1000: 6.89, band 950 ± 20.7 → 930…970 covered;
/// area free (three refitted profiles per curve, about three times the cost), R = 400: 4.36, band 380 ± 13.1 → 367…393.
/// </summary>
public class ProfileLikelihoodCoverageTests(ITestOutputHelper output)
{
    public static TheoryData<bool, int, int, int> Cases => new()
    {
        { true, 1000, 930, 970 },
        { false, 400, 367, 393 },
    };

    [Theory]
    [MemberData(nameof(Cases))]
    public void Compute_SimulatedJunctions_CoverTruthAt95Percent(bool areaKnown, int replicates, int low, int high)
    {
        var options = Options(areaKnown);
        var keys = FreeKeys(areaKnown);
        var wald = new FitResult[replicates];
        var profile = new FitResult[replicates];
        Parallel.For(0, replicates, rep =>
        {
            var curve = Simulate(20_000 + rep);
            wald[rep] = JunctionFitter.Fit(curve, Model, options);
            profile[rep] = ProfileLikelihoodIntervals.Compute(curve, Model, options, wald[rep]);
        });

        var covered = new int[keys.Length];
        var waldCovered = new int[keys.Length];
        var widthRatio = new double[keys.Length];
        int failed = 0, openEnded = 0;
        for (int rep = 0; rep < replicates; rep++)
        {
            if (wald[rep].Status == FitStatus.Failed) { failed++; continue; }
            Assert.StartsWith("profile likelihood", profile[rep].Quality!.IntervalMethod, StringComparison.Ordinal);
            if (profile[rep].Warnings.Any(w => w.Contains("open-ended", StringComparison.Ordinal))) openEnded++;
            for (int k = 0; k < keys.Length; k++)
            {
                var p = profile[rep].Find(keys[k].Key)!;
                var w = wald[rep].Find(keys[k].Key)!;
                var (lower, upper) = Bounds(keys[k].Key);
                Assert.True(p.Lower95 >= lower && p.Upper95 <= upper, $"{keys[k].Key} interval leaves the physical bounds");
                Assert.InRange(p.Value, p.Lower95!.Value, p.Upper95!.Value);
                Assert.Equal(w.Value, p.Value);
                Assert.Equal(w.StandardError, p.StandardError);
                if (p.Lower95 <= keys[k].Truth && keys[k].Truth <= p.Upper95) covered[k]++;
                if (w.Lower95 <= keys[k].Truth && keys[k].Truth <= w.Upper95) waldCovered[k]++;
                widthRatio[k] += LogWidth(p) / LogWidth(w);
            }
        }
        int good = replicates - failed;
        for (int k = 0; k < keys.Length; k++)
        {
            output.WriteLine($"area {(areaKnown ? "known" : "free")}: {keys[k].Key} profile coverage {covered[k] / (double)good:P1} " +
                             $"(Wald {waldCovered[k] / (double)good:P1}), mean width / Wald width (log space) {widthRatio[k] / good:0.000}");
        }
        output.WriteLine($"failed fits: {failed}, open-ended profiles: {openEnded}");
        Assert.Equal(0, failed);
        for (int k = 0; k < keys.Length; k++) Assert.InRange(covered[k], low, high);
    }
}
