using System.Collections.Immutable;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using Xunit;
using Xunit.Abstractions;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Coverage of the default 95 % intervals on simulated junctions with known truth (fixed seeds).
/// Acceptance band 93–97 % over 1000 replicates: ±2.9 binomial standard deviations around 95 %
/// (√(0.95·0.05/1000) = 0.69 %); a correct method fails this by chance about 4 times in 1000 runs.
/// </summary>
public class IntervalCoverageTests(ITestOutputHelper output)
{
    private const int Replicates = 1000;
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    public static TheoryData<bool> AreaKnown => new() { true, false };

    [Theory]
    [MemberData(nameof(AreaKnown))]
    public void DefaultIntervals_1000Replicates_CoverTruthAt95Percent(bool areaKnown)
    {
        // Truth and sweep as in the solver issue: 1 % current noise, sweep to ±0.6 φ.
        const double phiEv = 2.0, dNm = 1.5, areaUm2 = 100.0, noise = 0.01;
        double vMax = 0.6 * phiEv;
        double[] truth = [phiEv * PhysicalConstants.JoulePerElectronVolt, dNm * 1e-9, 1.0, areaUm2 * 1e-12];
        var options = areaKnown
            ? FitOptions.Default with { FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, areaUm2 * 1e-12) }
            : FitOptions.Default;
        string[] keys = areaKnown ? ["barrier_height_eV", "thickness_nm"] : ["barrier_height_eV", "thickness_nm", "area_m2"];
        double[] truthDisplay = [phiEv, dNm, areaUm2 * 1e-12];
        var covered = new int[keys.Length];
        int failed = 0;
        var results = new FitResult[Replicates];
        Parallel.For(0, Replicates, rep =>
        {
            var (v, i) = IvSimulator.Simulate(Model, truth, new SimulationSpec(-vMax, vMax, 201) { RelativeNoise = noise, Seed = 10_000 + rep });
            results[rep] = JunctionFitter.Fit(new IvCurve($"rep{rep}", v, i), Model, options);
        });
        foreach (var result in results)
        {
            if (result.Status == FitStatus.Failed) { failed++; continue; }
            for (int k = 0; k < keys.Length; k++)
            {
                var p = result.Find(keys[k])!;
                Assert.NotNull(p.Lower95);
                Assert.True(p.Lower95 > 0, "interval crosses the physical bound 0");
                if (p.Lower95 <= truthDisplay[k] && truthDisplay[k] <= p.Upper95) covered[k]++;
            }
        }
        for (int k = 0; k < keys.Length; k++)
        {
            output.WriteLine($"area {(areaKnown ? "known" : "free")}: {keys[k]} coverage {covered[k] / (double)Replicates:P1}");
        }
        output.WriteLine($"failed fits: {failed}");
        Assert.Equal(0, failed);
        for (int k = 0; k < keys.Length; k++)
        {
            Assert.InRange(covered[k], 930, 970);
        }
    }
}
