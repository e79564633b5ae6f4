using Xunit;
using Xunit.Abstractions;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Coverage of the 95 % intervals of every method on simulated junctions with known truth, through
/// <see cref="CoverageHarness"/>: 1000 curves per truth point and configuration, fixed seeds, two-sided band 93–97 %
/// (the binomial reasoning is on <see cref="CoverageHarness"/>). Truth points: <see cref="TruthPoint.All"/>.
/// </summary>
public class CoverageTests(ITestOutputHelper output)
{
    /// <summary>Every truth point, with the area known and free.</summary>
    public static TheoryData<string, bool> AllPoints
    {
        get
        {
            var data = new TheoryData<string, bool>();
            foreach (string name in TruthPoint.All.Keys)
            {
                data.Add(name, true);
                data.Add(name, false);
            }
            return data;
        }
    }

    [Theory]
    [MemberData(nameof(AllPoints))]
    public void WaldAndProfile_TruthPoint_Cover93To97Percent(string point, bool areaKnown)
    {
        var outcome = CoverageHarness.Run(TruthPoint.All[point], areaKnown, [IntervalKind.Wald, IntervalKind.Profile], SeedBase(point, areaKnown));
        AssertInBand(outcome);
    }

    private void AssertInBand(CoverageOutcome outcome)
    {
        output.WriteLine(outcome.Describe());
        foreach (string problem in outcome.Problems.Take(20)) output.WriteLine(problem);
        Assert.Empty(outcome.Problems);
        Assert.Equal(0, outcome.Failed);
        foreach (var (kind, rows) in outcome.Coverage)
        {
            foreach (var row in rows)
            {
                // Binomial band of CoverageHarness: 930…970 of 1000 (95 % ± 2.9 SD).
                Assert.True(row.Covered is >= CoverageHarness.LowestCovered and <= CoverageHarness.HighestCovered,
                    $"{outcome.Point.Name} {kind} {row.Key}: {row.Covered} of {outcome.Curves} covered");
            }
        }
    }

    /// <summary>A seed range of its own for every point and configuration (curves never shared between points).</summary>
    private static int SeedBase(string point, bool areaKnown)
    {
        int index = TruthPoint.All.Keys.ToList().IndexOf(point);
        return 1_000_000 + index * 10_000 + (areaKnown ? 0 : 5_000);
    }
}
