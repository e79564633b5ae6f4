using JunctionFit.Fitting;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>The runs test reaches users in words: never as "-Infinity".</summary>
public class RunsTextTests
{
    [Fact]
    public void RunsText_AllResidualsOneSign_SaysSoWithoutInfinity()
    {
        // One run of equal signs: the z statistic of the Wald–Wolfowitz runs test is undefined (zero variance).
        double z = JunctionFitter.RunsTestZ([0.1, 0.2, 0.3, 0.1, 0.2, 0.3, 0.1, 0.2]);
        string text = JunctionFitter.RunsText(z);
        Assert.DoesNotContain("Infinity", text, StringComparison.Ordinal);
        Assert.DoesNotContain("NaN", text, StringComparison.Ordinal);
        Assert.Equal("runs test z = -2.5", JunctionFitter.RunsText(-2.5));
    }
}
