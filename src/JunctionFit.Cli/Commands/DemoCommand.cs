using System.CommandLine;
using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Reporting;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// <c>junctionfit demo</c>: the whole flow on the bundled invented data (sample-data/): batch over three lots, lot drift
/// against the reference lot KM-A01 and the thickness cross-check against the ellipsometry table, all in one report under
/// ./junctionfit-demo/ (or <c>--out</c>); then prints where everything is.
/// </summary>
internal static class DemoCommand
{
    /// <summary>The demo's reference lot.</summary>
    public const string ReferenceLot = "KM-A01";

    public static Command Create(CliContext context)
    {
        var outDir = new Option<string>("--out") { Description = "output folder", DefaultValueFactory = _ => "junctionfit-demo" };
        var data = new Option<string?>("--data") { Description = "sample-data folder (default: the one installed beside the program)" };
        var fitOptions = new FitOptionSet();
        var command = new Command("demo", "Run the whole flow on the bundled sample lots: fits, wafer maps, drift, thickness cross-check, report.");
        command.Options.Add(outDir);
        command.Options.Add(data);
        fitOptions.AddTo(command);
        command.SetAction(parse =>
        {
            string folder = parse.GetValue(data) ?? FindSampleData()
                ?? throw new UsageException($"demo: the sample data are missing beside the program ({Path.Combine(AppContext.BaseDirectory, "sample-data")}); reinstall it or give --data PATH");
            if (!Directory.Exists(folder)) throw new UsageException($"demo: --data {folder}: no such folder");
            string relative = Path.GetRelativePath(Directory.GetCurrentDirectory(), folder);
            if (!relative.StartsWith("..", StringComparison.Ordinal) && !Path.IsPathRooted(relative)) folder = relative;
            string lotsDir = Path.Combine(folder, "lots");
            string ellipsometryPath = Path.Combine(folder, "ellipsometry.csv");
            if (!Directory.Exists(lotsDir)) throw new UsageException($"demo: {lotsDir}: no such folder");

            var (plan, summary) = fitOptions.Build(parse);
            if (parse.GetValue(fitOptions.Area) is null && !parse.GetValue(fitOptions.AreaFromFile))
            {
                // The demo lots state each die's drawn area; fitting with the area known is how the lab works.
                plan = plan.WithOptions(plan.Options with { FixAreaFromMetadata = true });
                summary = summary.Replace("area free", "area fixed at each file's stated area", StringComparison.Ordinal);
            }
            string outPath = parse.GetValue(outDir) ?? "junctionfit-demo";
            context.Error.WriteLine($"junctionfit demo: the invented Kestrel Microsystems lots in {lotsDir} ({summary})");
            string? trendCharts = null, blandAltman = null;
            int flaggedLots = 0, flaggedWafers = 0;
            var settings = new BatchCommand.BatchSettings(lotsDir, outPath, true, Environment.ProcessorCount, IvReadOptions.Default, plan, summary)
            {
                ExtraSections = rows =>
                {
                    var sections = new List<HtmlReportSection>();
                    var (drift, driftSection, charts) = LotAnalysisRun.Drift(rows, new DriftOptions(ReferenceLot), outPath);
                    flaggedLots = drift.Flagged.Count();
                    trendCharts = string.Join(", ", charts.Select(Path.GetFileName));
                    sections.Add(driftSection);
                    if (File.Exists(ellipsometryPath))
                    {
                        var ellipsometry = EllipsometryCsv.Read(ellipsometryPath);
                        var (_, wafers, thicknessSection, plot, _) = LotAnalyses.Thickness(rows, ellipsometry, plan, IvReadOptions.Default, outPath, Environment.ProcessorCount);
                        flaggedWafers = wafers.Count(w => w.Flagged);
                        blandAltman = plot is null ? null : Path.GetFileName(plot);
                        sections.Add(thicknessSection);
                    }
                    return sections;
                },
            };
            var outcome = BatchCommand.Run(context, settings);
            string full = Path.GetFullPath(outPath);
            context.Error.WriteLine($"junctionfit demo: drift against {ReferenceLot}: {flaggedLots} lot parameter(s) flagged; thickness: {flaggedWafers} wafer(s) flagged");
            context.Error.WriteLine($"junctionfit demo: report       {Path.Combine(full, "report.html")}");
            context.Error.WriteLine($"junctionfit demo: results      {Path.Combine(full, ResultsCsv.FileName)} and {Path.Combine(full, LotSummaryCsv.FileName)}");
            context.Error.WriteLine($"junctionfit demo: plots        {Path.Combine(full, "plots")}{Path.DirectorySeparatorChar} and wafer maps in {Path.Combine(full, "maps")}{Path.DirectorySeparatorChar}");
            context.Error.WriteLine($"junctionfit demo: trend charts {trendCharts}; Bland–Altman {blandAltman ?? "none"} (in {full})");
            return outcome.ExitCode;
        });
        return command;
    }

    /// <summary>
    /// The sample-data folder shipped beside the program (copied there by the build and packed into the tool package), so
    /// that demo runs the same from the project, from a copied build output and from an installed tool, in any folder.
    /// </summary>
    internal static string? FindSampleData()
    {
        string candidate = Path.Combine(AppContext.BaseDirectory, "sample-data");
        return Directory.Exists(Path.Combine(candidate, "lots")) ? candidate : null;
    }
}
