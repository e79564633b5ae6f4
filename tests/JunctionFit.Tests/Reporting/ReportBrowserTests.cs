using System.Diagnostics;
using JunctionFit.Tests.Cli;
using Xunit;

namespace JunctionFit.Tests.Reporting;

/// <summary>
/// Runs only where Debian's chromium is installed (.ci/run installs it); elsewhere it is skipped, saying why — except under
/// CI (<c>JUNCTIONFIT_CI=1</c>), where it runs and fails on the missing browser. The browser is the first <c>chromium</c> on
/// <c>PATH</c>, as .ci/run's <c>command -v chromium</c> finds it.
/// </summary>
public sealed class ChromiumFactAttribute : FactAttribute
{
    public const string ProgramName = "chromium";

    public ChromiumFactAttribute()
    {
        if (ChromiumPath is null)
        {
            Skip = TestEnvironment.SkipUnlessCi($"skipped: no {ProgramName} on PATH (install Debian's chromium package; .ci/run does)");
        }
    }

    /// <summary>The browser found on <c>PATH</c>, or null.</summary>
    public static string? ChromiumPath => TestEnvironment.FindOnPath(ProgramName);
}

/// <summary>The batch report opened in a real headless browser, offline.</summary>
public class ReportBrowserTests
{
    private static (string Stdout, int Code) Chromium(params string[] args)
    {
        string? chromium = ChromiumFactAttribute.ChromiumPath;
        Assert.True(chromium is not null,
            $"no {ChromiumFactAttribute.ProgramName} on PATH, and under {TestEnvironment.CiVariable}=1 no test may skip (install Debian's chromium package)");
        var info = new ProcessStartInfo(chromium) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        // Flags for a root sandbox without network (see the machine notes): no sandbox, no GPU, no background traffic.
        foreach (string a in new[] { "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking",
                     "--disable-component-update", "--disable-sync", "--user-data-dir=" + Path.Combine(Path.GetTempPath(), "jf-chromium-" + Guid.NewGuid().ToString("N")) })
        {
            info.ArgumentList.Add(a);
        }
        foreach (string a in args) info.ArgumentList.Add(a);
        using var p = Process.Start(info)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(120_000))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException("chromium did not finish in 120 s");
        }
        return (stdout.Result, p.ExitCode);
    }

    [ChromiumFact]
    public void BatchReport_InHeadlessBrowser_LoadsOfflineWithAllImagesAndTables()
    {
        using var dir = new TempFolder();
        Directory.CreateDirectory(dir.File("lots/KM-D01/W01"));
        for (int k = 0; k < 4; k++)
        {
            var (code, csv, err) = CliRunner.Run("simulate", "--barrier-height", "2.0", "--thickness", "1.5", "--area", "100", "--from", "-0.8", "--to", "0.8",
                "--points", "81", "--noise", "0.01", "--seed", (k + 1).ToString(System.Globalization.CultureInfo.InvariantCulture),
                "--header", "lot=KM-D01", "--header", "wafer=W01", "--header", $"die={k % 2},{k / 2}", "--header", "area=100 um2");
            Assert.True(code == 0, err);
            File.WriteAllText(dir.File($"lots/KM-D01/W01/die_{k}.csv"), csv);
        }
        File.WriteAllText(dir.File("lots/KM-D01/W01/<b>odd & name.csv"), "not an I-V table\n");
        var (batch, _, batchErr) = CliRunner.Run("batch", dir.File("lots"), "--out", dir.File("out"), "--area-from-file");
        Assert.True(batch == 1, batchErr); // one unreadable file
        string report = dir.File("out/report.html");

        var (dom, domCode) = Chromium("--virtual-time-budget=5000", "--dump-dom", new Uri(report).AbsoluteUri);
        Assert.Equal(0, domCode);
        Assert.Contains("data-broken-images=\"0\"", dom, StringComparison.Ordinal);
        Assert.DoesNotContain("data-images=\"0\"", dom, StringComparison.Ordinal);
        Assert.Contains("<table class=\"summary sortable\">", dom, StringComparison.Ordinal);
        Assert.Contains("&lt;b&gt;odd &amp; name", dom, StringComparison.Ordinal); // escaped, not markup
        Assert.DoesNotContain("<b>odd", dom, StringComparison.Ordinal);

        string shot = dir.File("report.png");
        var (_, shotCode) = Chromium("--window-size=1280,2400", "--screenshot=" + shot, new Uri(report).AbsoluteUri);
        Assert.Equal(0, shotCode);
        Assert.True(new FileInfo(shot).Length > 20_000, "the screenshot should show a rendered page");
        string? keep = Environment.GetEnvironmentVariable("JUNCTIONFIT_SCREENSHOT");
        if (!string.IsNullOrEmpty(keep)) File.Copy(shot, keep, overwrite: true);
    }
}
