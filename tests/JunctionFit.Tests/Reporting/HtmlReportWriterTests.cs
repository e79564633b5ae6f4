using System.Text.RegularExpressions;
using JunctionFit.Reporting;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Reporting;

public class HtmlReportWriterTests
{
    private static readonly HtmlRunInfo Run = new(
        "junctionfit 0.1.0-test", new DateTimeOffset(2025, 3, 14, 9, 26, 53, TimeSpan.FromHours(1)), "simmons",
        "--model simmons --area-free --out <out> & \"quoted\"");

    private static List<HtmlReportEntry> Entries()
    {
        var ok = ReportingFixtures.OkResult();
        return
        [
            HtmlReportEntry.WithRenderedPlot(ok),
            HtmlReportEntry.WithRenderedPlot(ReportingFixtures.PoorResult() with { SourcePath = ReportingFixtures.HostileName, Lot = "KM-<A01>" }),
            new HtmlReportEntry(ReportingFixtures.FailedResult()),
        ];
    }

    [Fact]
    public void Render_AnyInput_HasNoExternalReferences()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        Assert.DoesNotContain("src=\"http", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("href=\"http", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("<link", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("@import", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotContain("url(", html, StringComparison.OrdinalIgnoreCase);
        Assert.DoesNotMatch(new Regex("<script[^>]+src", RegexOptions.IgnoreCase), html);
        foreach (Match m in Regex.Matches(html, "(?:src|href)=\"([^\"]*)\"")) Assert.Matches("^(#|data:image/png;base64,)", m.Groups[1].Value);
    }

    [Fact]
    public void Render_HostileFileName_IsEscaped()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        Assert.DoesNotContain(ReportingFixtures.HostileName, html, StringComparison.Ordinal);
        Assert.DoesNotContain("<script>alert", html, StringComparison.Ordinal);
        Assert.Contains("&lt;script&gt;alert(1)&lt;/script&gt;&amp;&quot;", html, StringComparison.Ordinal);
        Assert.Contains("KM-&lt;A01&gt;", html, StringComparison.Ordinal);
        Assert.Contains("&lt;out&gt; &amp; &quot;quoted&quot;", html, StringComparison.Ordinal);
        // Exactly one script element: the sort script.
        Assert.Single(Regex.Matches(html, "<script", RegexOptions.IgnoreCase));
    }

    [Fact]
    public void Render_TwoPlots_EmbedsOneDataUriPerPlot()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        Assert.Equal(2, Regex.Count(html, Regex.Escape("<img src=\"data:image/png;base64,")));
        Assert.Contains("no plot for this result", html, StringComparison.Ordinal);
    }

    [Fact]
    public void Render_PlotPath_EmbedsTheFile()
    {
        string dir = Path.Combine(Path.GetTempPath(), "jf-html-" + Guid.NewGuid().ToString("N"));
        try
        {
            string png = Path.Combine(dir, "a.png");
            var result = ReportingFixtures.OkResult();
            FitPlotRenderer.WritePng(result, png);
            string html = HtmlReportWriter.Render(Run, [new HtmlReportEntry(result) { PlotPath = png }]);
            string base64 = Convert.ToBase64String(File.ReadAllBytes(png));
            Assert.Contains("data:image/png;base64," + base64 + "\"", html, StringComparison.Ordinal);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Render_ThreeResults_SummaryHasOneRowEach()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        var body = Regex.Match(html, "<table class=\"summary sortable\">.*?<tbody>(.*?)</tbody>", RegexOptions.Singleline);
        Assert.True(body.Success);
        Assert.Equal(3, Regex.Count(body.Groups[1].Value, "<tr>"));
        Assert.Contains("die_03_05.csv", body.Groups[1].Value, StringComparison.Ordinal);
        Assert.Contains(">2.0041 <span class=\"ci\">[1.9957, 2.0126]</span>", body.Groups[1].Value, StringComparison.Ordinal);
        Assert.Contains(">101.0 <span class=\"ci\">[97.5, 104.6]</span>", body.Groups[1].Value, StringComparison.Ordinal);
        Assert.Contains(">poor-fit<", body.Groups[1].Value, StringComparison.Ordinal);
        Assert.Contains("every point is below the noise floor", body.Groups[1].Value, StringComparison.Ordinal);
    }

    [Fact]
    public void Render_Header_ShowsRunInformationAndCaution()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        Assert.Contains("junctionfit 0.1.0-test", html, StringComparison.Ordinal);
        Assert.Contains("2025-03-14 09:26:53 +01:00", html, StringComparison.Ordinal);
        Assert.Contains("not a qualification", html, StringComparison.Ordinal);
        Assert.Contains("safety rules", html, StringComparison.Ordinal);
        Assert.Contains("3: <span class=\"st-ok\">1 ok</span>", html, StringComparison.Ordinal);
    }

    [Fact]
    public void Render_Section_HasParametersStatisticsCorrelationAndWarnings()
    {
        string html = HtmlReportWriter.Render(Run, Entries());
        var section = Regex.Match(html, "<section class=\"fit\" id=\"fit-1\">(.*?)</section>", RegexOptions.Singleline).Groups[1].Value;
        Assert.Contains("<h3>Parameters</h3>", section, StringComparison.Ordinal);
        Assert.Contains("µm²", System.Net.WebUtility.HtmlDecode(section), StringComparison.Ordinal);
        Assert.Contains("<td>fixed</td>", section, StringComparison.Ordinal);
        Assert.Contains("relative step below tolerance", section, StringComparison.Ordinal);
        Assert.Contains("scaled by reduced chi-square", section, StringComparison.Ordinal);
        Assert.Contains("Wald, log-transformed", section, StringComparison.Ordinal);
        Assert.Contains("-0.930", section, StringComparison.Ordinal);
        Assert.Contains("11 points at or below the noise floor were masked", section, StringComparison.Ordinal);
    }

    [Fact]
    public void Render_AreaRow_NamesTheAreaInTheUnitShown()
    {
        // The result keeps the area in m² (key area_m2); the report shows µm², so the row must not carry the m² key.
        string html = System.Net.WebUtility.HtmlDecode(HtmlReportWriter.Render(Run, Entries()));
        Assert.Contains("A <span class=\"key\">effective area</span>", html, StringComparison.Ordinal);
        Assert.DoesNotContain("<span class=\"key\">area_m2</span>", html, StringComparison.Ordinal);
        Assert.Matches("effective area</span></th><td class=\"num\">101[^<]*</td>.*?<td>µm²</td>", html); // 1.01e-10 m² = 101 µm²
    }

    [Fact]
    public void Write_ExistingFile_IsReplacedWithoutTempFiles()
    {
        string dir = Path.Combine(Path.GetTempPath(), "jf-html-" + Guid.NewGuid().ToString("N"));
        try
        {
            string path = Path.Combine(dir, "report.html");
            Directory.CreateDirectory(dir);
            File.WriteAllText(path, "old");
            HtmlReportWriter.Write(path, Run, Entries());
            Assert.StartsWith("<!DOCTYPE html>", File.ReadAllText(path), StringComparison.Ordinal);
            Assert.Single(Directory.GetFiles(dir));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Render_NoResults_StillRendersHeader()
    {
        string html = HtmlReportWriter.Render(Run, Array.Empty<HtmlReportEntry>());
        Assert.Contains("<h1>JunctionFit fit report</h1>", html, StringComparison.Ordinal);
        Assert.DoesNotContain("<img", html, StringComparison.Ordinal);
    }
}
