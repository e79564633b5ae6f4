using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// One run of <c>fit</c>: read → fit → write, file by file, in input order. Files are processed in parallel in
/// small ordered chunks, so results appear in a deterministic order and memory does not grow with the file count
/// (curves are dropped once their plot is written).
/// </summary>
internal sealed class FitRun(CliContext context, FitPlan plan, IvReadOptions readOptions, string optionSummary,
    bool json, string? outDir, string? plotSubfolder, int jobs)
{
    /// <summary>The C–V summary of <c>--cv</c>, attached to every result; null without a C–V file.</summary>
    public CvSummary? CapacitanceVoltage { get; init; }

    public int Execute(IReadOnlyList<string> paths)
    {
        var (files, missing) = InputFiles.Expand(paths);
        int unreadable = 0;
        var missingResults = new List<FitResult>();
        foreach (string m in missing)
        {
            context.Error.WriteLine($"{m}:0: no such file or folder");
            unreadable++;
            var failedResult = FitResult.Failed(m, plan.DisplayName, "no such file or folder");
            if (json) context.Out.WriteLine(FitJsonFormatter.Format(failedResult));
            missingResults.Add(failedResult);
        }
        if (files.Count == 0 && missing.Count == 0)
        {
            context.Error.WriteLine("junctionfit: no I–V files found in the given folder(s) (looked for " + string.Join(", ", InputFiles.Extensions) + ")");
            return ExitCodes.UsageOrInput;
        }
        string? plotDir = outDir is null ? null : plotSubfolder is null ? outDir : Path.Combine(outDir, plotSubfolder);
        if (plotDir is not null) Directory.CreateDirectory(plotDir);

        var summaries = new List<FitResult>(files.Count);
        var plotFiles = new List<string?>(files.Count);
        int fitted = 0, notOk = 0, failed = missingResults.Count;
        if (!json || outDir is not null)
        {
            summaries.AddRange(missingResults);
            plotFiles.AddRange(missingResults.Select(_ => (string?)null));
        }
        var usedPlotNames = new HashSet<string>(StringComparer.Ordinal);
        // Read, fit and (with --json) format on the workers; write in input order on this thread.
        CurvePipeline.Run(files.Count, k =>
        {
            var outcome = CurvePipeline.Process(files[k], readOptions, plan, context.Error, OptionWords.Flag);
            return json ? outcome with { JsonLine = FitJsonFormatter.Format(WithCv(outcome.Result)) } : outcome;
        }, jobs, (_, outcome) =>
        {
            if (outcome.ReadError is not null)
            {
                context.Error.WriteLine(outcome.ReadError);
                unreadable++;
            }
            else
            {
                fitted++;
            }
            var result = WithCv(outcome.Result);
            if (result.Status != FitStatus.Ok) notOk++;
            if (result.Status == FitStatus.Failed) failed++;
            if (result.Status == FitStatus.Failed && outcome.ReadError is null)
            {
                context.Error.WriteLine($"{result.SourcePath}:0: fit failed: {result.Error}");
            }
            if (json) context.Out.WriteLine(outcome.JsonLine ?? FitJsonFormatter.Format(result));
            string? plot = null;
            if (plotDir is not null && result.Curve is not null)
            {
                plot = Path.Combine(plotDir, PlotFileNames.Unique(result, usedPlotNames));
                FitPlotRenderer.WritePng(result, plot);
            }
            if (!json || outDir is not null)
            {
                // The console table and the report need every result; JSON-only runs keep nothing (flat memory).
                summaries.Add(result with { Curve = null });
                plotFiles.Add(plot);
            }
        });
        FailedCount = failed;

        if (!json)
        {
            context.Out.Write(SummaryTableWriter.FormatConsoleTable(summaries));
            if (CapacitanceVoltage is { } cv)
            {
                context.Out.WriteLine();
                foreach (string line in ThicknessBesideCet.Lines(summaries, cv)) context.Out.WriteLine(line);
            }
            foreach (var r in summaries)
            {
                if (r.ModelComparison.Length == 0) continue;
                context.Out.WriteLine();
                context.Out.WriteLine($"model selection for {r.SourcePath} (AICc, lower is better; ok fits preferred):");
                context.Out.WriteLine($"  {"model",-16} {"status",-9} {"k",2} {"points",6} {"AICc",12}");
                foreach (var row in r.ModelComparison)
                {
                    string aicc = row.Aicc is double a ? a.ToString("0.00", System.Globalization.CultureInfo.InvariantCulture) : "-";
                    context.Out.WriteLine($"  {row.Model,-16} {ResultSchema.StatusText(row.Status),-9} {row.FreeParameters,2} {row.PointsUsed,6} {aicc,12}{(row.Chosen ? "  <- chosen" : "")}");
                }
            }
        }
        if (outDir is not null)
        {
            string csv = Path.Combine(outDir, "summary.csv");
            string html = Path.Combine(outDir, "report.html");
            SummaryTableWriter.WriteCsv(csv, summaries);
            var entries = new List<HtmlReportEntry>(summaries.Count);
            for (int k = 0; k < summaries.Count; k++) entries.Add(new HtmlReportEntry(summaries[k]) { PlotPath = plotFiles[k] });
            HtmlReportWriter.Write(html, new HtmlRunInfo(VersionInfo.Text, DateTimeOffset.Now, plan.DisplayName, optionSummary), entries);
            context.Error.WriteLine($"junctionfit: wrote {plotFiles.Count(p => p is not null)} plot(s), {csv} and {html}");
        }
        if (fitted == 0) return ExitCodes.UsageOrInput;
        return notOk == 0 && unreadable == 0 ? ExitCodes.Success : ExitCodes.SomeFailed;
    }

    private FitResult WithCv(FitResult result) => CapacitanceVoltage is null ? result : result with { CapacitanceVoltage = CapacitanceVoltage };

    /// <summary>Number of results with status failed in the last run.</summary>
    public int FailedCount { get; private set; }

}
