using JunctionFit.Fitting;
using JunctionFit.Physics;
using Xunit;
using Xunit.Abstractions;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Coverage of the 95 % intervals of every method on simulated junctions with known truth, through
/// <see cref="CoverageHarness"/>: 1000 curves per truth point and configuration, fixed seeds, two-sided band 93–97 % (the
/// binomial reasoning is on <see cref="CoverageHarness"/>). Truth points: <see cref="TruthPoint.All"/>; every figure measured
/// is in docs/fitting.md, "Coverage".
/// <para>
/// Identified and weakly identified: with the area free, some sweeps do not bound φ, d and the area inside their physical
/// range on a fair share of curves (the profile-likelihood interval is open-ended). There the quadratic approximation behind
/// the Wald interval cannot hold, and it is not asserted (measured 89–99 %; docs/fitting.md); the profile interval, which
/// follows the real shape of S, is. The split is checked, not declared: a point is identified when at most
/// <see cref="MostOpenEnded"/> of its 1000 curves have an open-ended profile, and each theory asserts which side it is on.
/// </para>
/// </summary>
public class CoverageTests(ITestOutputHelper output)
{
    /// <summary>Most curves of 1000 with an open-ended profile for a point to count as identified (2 %; common practice, no source).</summary>
    private const int MostOpenEnded = 20;

    /// <summary>Area-free points the data do not bound on many curves (open-ended profiles on 10–45 % of them, measured).</summary>
    private static readonly string[] WeaklyIdentifiedAreaFree = ["p1-d1-r0.3", "p1-d1.5-r1", "p1-d2.5-r3", "p2-d1-r1", "p2-d1.5-r3"];

    /// <summary>
    /// Left out with the area free: 70 % of the profiles open-ended and 10 % of the fits undetermined (φ run to its bound);
    /// three parameters are not identified by a 1 nm, 3 eV junction swept to ±1.8 V with 3 % noise (docs/fitting.md).
    /// </summary>
    private static readonly string[] NotIdentifiedAreaFree = ["p3-d1-r3"];

    /// <summary>Every truth point with the area known; the identified ones with the area free.</summary>
    public static TheoryData<string, bool> IdentifiedPoints
    {
        get
        {
            var data = new TheoryData<string, bool>();
            foreach (string name in TruthPoint.Names)
            {
                data.Add(name, true);
                if (!WeaklyIdentifiedAreaFree.Contains(name) && !NotIdentifiedAreaFree.Contains(name)) data.Add(name, false);
            }
            return data;
        }
    }

    /// <summary>The weakly identified area-free points.</summary>
    public static TheoryData<string> WeaklyIdentifiedPoints => [.. WeaklyIdentifiedAreaFree];

    /// <summary>
    /// Bootstrap points (each costs 1000 × B refits): the baseline junction with the area known and free, and the noise-floor
    /// junction with the area known.
    /// </summary>
    public static TheoryData<string, bool> BootstrapPoints => new()
    {
        { TruthPoint.Baseline.Name, true },
        { TruthPoint.Baseline.Name, false },
        { "p2-d1.5-r1-floor-given", true },
    };

    [Theory]
    [MemberData(nameof(IdentifiedPoints))]
    public void WaldAndProfile_IdentifiedPoint_Cover93To97Percent(string point, bool areaKnown)
    {
        var outcome = CoverageHarness.Run(TruthPoint.All[point], areaKnown, [IntervalKind.Wald, IntervalKind.Profile], SeedBase(point, areaKnown));
        Report(outcome);
        Assert.True(outcome.OpenEndedProfiles <= MostOpenEnded, $"{outcome.OpenEndedProfiles} open-ended profiles: not identified");
        AssertInBand(outcome, IntervalKind.Wald);
        AssertInBand(outcome, IntervalKind.Profile);
    }

    [Theory]
    [MemberData(nameof(WeaklyIdentifiedPoints))]
    public void Profile_WeaklyIdentifiedAreaFree_Covers93To97Percent(string point)
    {
        var outcome = CoverageHarness.Run(TruthPoint.All[point], areaKnown: false, [IntervalKind.Wald, IntervalKind.Profile], SeedBase(point, false));
        Report(outcome);
        // The reason the Wald figure printed above is not asserted here.
        Assert.True(outcome.OpenEndedProfiles > MostOpenEnded, $"only {outcome.OpenEndedProfiles} open-ended profiles: identified, assert Wald too");
        AssertInBand(outcome, IntervalKind.Profile);
    }

    [Theory]
    [MemberData(nameof(BootstrapPoints))]
    public void Bootstrap_DefaultReplicates_Covers93To97Percent(string point, bool areaKnown)
    {
        var outcome = CoverageHarness.Run(TruthPoint.All[point], areaKnown, [IntervalKind.Bootstrap], SeedBase(point, areaKnown));
        Report(outcome);
        AssertInBand(outcome, IntervalKind.Bootstrap);
    }

    [Fact]
    public void WaldInterval_EndBeyondTheUpperBound_ClippedToTheBound()
    {
        // docs/fitting.md, "Intervals": no interval leaves the physical bounds (0 < φ ≤ 20 eV). The log transform keeps the
        // lower end above 0 by itself; an upper end past 20 eV (seen on weakly identified area-free fits) is clipped.
        var def = StandardParameters.BarrierHeight;
        var (_, lower, upper) = ParameterTransforms.WaldInterval(def, 2.0 * PhysicalConstants.JoulePerElectronVolt, seX: 3.0, t: 1.97);
        var (boundLow, boundHigh) = TruthPoint.Bounds("barrier_height_eV");
        Assert.Equal(boundHigh, upper);
        Assert.InRange(lower, boundLow, 2.0);
        Assert.True(lower > 0);
    }

    private void Report(CoverageOutcome outcome)
    {
        output.WriteLine(outcome.Describe());
        foreach (string problem in outcome.Problems.Take(20)) output.WriteLine(problem);
        Assert.Empty(outcome.Problems);
        Assert.Equal(0, outcome.Failed);
    }

    private static void AssertInBand(CoverageOutcome outcome, IntervalKind kind)
    {
        foreach (var row in outcome.Coverage[kind])
        {
            // Binomial band of CoverageHarness: 930…970 of 1000 (95 % ± 2.9 SD).
            Assert.True(row.Covered is >= CoverageHarness.LowestCovered and <= CoverageHarness.HighestCovered,
                $"{outcome.Point.Name} {(outcome.AreaKnown ? "area known" : "area free")} {kind} {row.Key}: {row.Covered} of {outcome.Curves} covered");
        }
    }

    /// <summary>A seed range of its own for every point and configuration (curves never shared between points).</summary>
    private static int SeedBase(string point, bool areaKnown)
    {
        int index = TruthPoint.Names.IndexOf(point);
        Assert.True(index >= 0, point);
        return 1_000_000 + index * 10_000 + (areaKnown ? 0 : 5_000);
    }
}
