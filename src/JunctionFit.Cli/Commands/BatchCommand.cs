using System.CommandLine;
using System.Globalization;
using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Reporting;
using JunctionFit.Results;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// <c>junctionfit batch DIR --out OUTDIR</c>: fit every I–V file under DIR and write results.csv (streamed in input
/// order, renamed into place at the end), a fit plot per die, wafer maps, a per-lot summary and a self-contained report.
/// </summary>
internal static class BatchCommand
{
    public static Command Create(CliContext context)
    {
        var dir = new Argument<string>("DIR") { Description = "folder with the I–V files of a lot (searched recursively)" };
        var outDir = new Option<string>("--out") { Description = "output folder", Required = true };
        var noPlots = new Option<bool>("--no-plots") { Description = "skip the per-die fit plots" };
        var jobs = new Option<int?>("--jobs") { Description = "parallel fits (default: the number of cores)" };
        var db = new Option<string?>("--db") { Description = "results database: a SQLite file (default OUTDIR/junctionfit.db) or a PostgreSQL connection string" };
        var noDb = new Option<bool>("--no-db") { Description = "do not store results in a database" };
        var force = new Option<bool>("--force") { Description = "refit files whose result is already stored for the same content, model and options" };
        var lease = new Option<string?>("--lease")
        {
            Description = "with --db: how long a file claimed by this worker stays claimed without renewal before another worker may take it over (30s, 2m, 1500ms or seconds; 1 s to 1 h; default 30s)",
        };
        var workerName = new Option<string?>("--worker-name") { Description = "with --db: a name for this worker, recorded in fitted_by as NAME@host:pid" };
        var fitOptions = new FitOptionSet();
        var read = new ReadOptionSet();
        var command = new Command("batch", "Fit a whole lot: results.csv, fit plots, wafer maps, lot summary and report.html.");
        command.Arguments.Add(dir);
        command.Options.Add(outDir);
        command.Options.Add(noPlots);
        command.Options.Add(jobs);
        command.Options.Add(db);
        command.Options.Add(noDb);
        command.Options.Add(force);
        command.Options.Add(lease);
        command.Options.Add(workerName);
        fitOptions.AddTo(command);
        read.AddTo(command);
        command.SetAction(parse =>
        {
            var (plan, summary) = fitOptions.Build(parse);
            int jobCount = parse.GetValue(jobs) ?? Environment.ProcessorCount;
            if (jobCount < 1) throw new UsageException($"--jobs: {jobCount} must be at least 1");
            var readOptions = read.Build(parse);
            var settings = new BatchSettings(parse.GetValue(dir)!, parse.GetValue(outDir)!, !parse.GetValue(noPlots), jobCount, readOptions, plan, summary)
            {
                Database = parse.GetValue(noDb) ? null : parse.GetValue(db) ?? Path.Combine(parse.GetValue(outDir)!, ResultStore.DefaultFileName),
                Force = parse.GetValue(force),
                Lease = parse.GetValue(lease) is string l ? ParseLease(l) : SharedWork.DefaultLease,
                WorkerName = parse.GetValue(workerName) is string w ? CheckWorkerName(w) : null,
                IdentityExtras = [.. FitOptionSet.IdentityExtras(plan), .. ReadOptionSet.IdentityExtras(readOptions)],
            };
            return Run(context, settings).ExitCode;
        });
        return command;
    }

    internal sealed record BatchSettings(string InputDir, string OutDir, bool Plots, int Jobs, IvReadOptions ReadOptions, FitPlan Plan, string Summary)
    {
        /// <summary>Results database (path or connection string); null for none.</summary>
        public string? Database { get; init; }

        /// <summary>Refit what is already stored.</summary>
        public bool Force { get; init; }

        /// <summary>How long a claim holds without renewal (several workers on one database).</summary>
        public TimeSpan Lease { get; init; } = SharedWork.DefaultLease;

        /// <summary>Name of this worker in <c>fitted_by</c>; null for <c>host:pid</c> alone.</summary>
        public string? WorkerName { get; init; }

        /// <summary>Settings beyond <see cref="FitOptions"/> that change a fit, for the result identity.</summary>
        public IReadOnlyList<KeyValuePair<string, string>> IdentityExtras { get; init; } = [];

        /// <summary>Builds further report sections from the batch's rows (the demo adds drift and thickness).</summary>
        public Func<IReadOnlyList<ResultRow>, IReadOnlyList<HtmlReportSection>>? ExtraSections { get; init; }
    }

    internal sealed record BatchOutcome(int ExitCode, IReadOnlyList<ResultRow> Rows, string ResultsPath, string ReportPath);

    internal static BatchOutcome Run(CliContext context, BatchSettings s)
    {
        if (!Directory.Exists(s.InputDir)) throw new UsageException($"batch: {s.InputDir}: no such folder");
        var (files, _) = InputFiles.Expand([s.InputDir]);
        if (files.Count == 0)
        {
            context.Error.WriteLine($"{s.InputDir}:0: no I–V files in this folder (looked for {string.Join(", ", InputFiles.Extensions)})");
            return new BatchOutcome(ExitCodes.UsageOrInput, [], "", "");
        }
        Directory.CreateDirectory(s.OutDir);
        Directory.CreateDirectory(Path.Combine(s.OutDir, LotReport.MapDirName));
        var progress = new Progress(context.Error, files.Count);
        LotFitOutcome fit;
        using (var store = s.Database is null ? null : ResultDatabases.Open(s.Database))
        {
            var request = new LotFitRequest(files, s.OutDir, s.ReadOptions, s.Plan, s.Jobs)
            {
                Plots = s.Plots,
                Force = s.Force,
                Lease = s.Lease,
                WorkerName = s.WorkerName,
                IdentityExtras = s.IdentityExtras,
                ToolVersion = VersionInfo.Text,
                Words = OptionWords.Flag,
            };
            fit = LotFitRun.Run(request, store, s.Database is null ? null : () => ResultStore.Open(s.Database), context.Error, (done, _) => progress.Report(done));
        }
        progress.Finish();
        var rows = fit.Rows;
        string resultsPath = fit.ResultsPath;

        // Lot summary, wafer maps and report (JunctionFit.Batch); the words that name options are given here.
        var report = LotReport.Write(new LotReportRequest(s.OutDir, rows, fit.Results, fit.PlotByIndex, fit.Candidates,
            new HtmlRunInfo(VersionInfo.Text, DateTimeOffset.Now, s.Plan.DisplayName, $"batch {s.InputDir}; {s.Summary}") { Title = "JunctionFit lot report" })
        {
            PlotsWritten = s.Plots,
            ResultsFileName = ResultsCsv.FileName,
            RefitAdvice = "fit them with --free leakage-conductance or --free series-resistance",
            OutlierRefitAdvice = "refit with --free leakage-conductance or --free series-resistance",
            ExtraSections = s.ExtraSections is { } extra ? batchRows => [.. extra(batchRows).Select(OptionWords.Word)] : null,
        });
        foreach (var o in report.Outliers)
        {
            context.Error.WriteLine($"junctionfit batch: out of family: {o.Row.File} in lot {o.Row.Lot}: {o.Key} = {LotAnalyses.Num(o.Value)} against the lot median {LotAnalyses.Num(o.Median)} (robust z {o.Z:0.0})");
        }
        string reportPath = report.ReportPath;

        context.Error.WriteLine($"junctionfit batch: {rows.Count} files, {rows.Count(r => r.Status == FitStatus.Ok)} ok, " +
                                $"{rows.Count(r => r.Status == FitStatus.PoorFit)} poor fits, {rows.Count(r => r.Status == FitStatus.Failed)} failed");
        context.Error.WriteLine($"junctionfit batch: results {resultsPath}");
        context.Error.WriteLine($"junctionfit batch: report  {reportPath}");
        int code = fit.Unreadable == files.Count ? ExitCodes.UsageOrInput : fit.NotOk == 0 ? ExitCodes.Success : ExitCodes.SomeFailed;
        return new BatchOutcome(code, rows, resultsPath, reportPath);
    }

    /// <summary>Parses a <c>--lease</c> value: a number with <c>ms</c>, <c>s</c>, <c>m</c> or <c>h</c> (no unit: seconds), 1 s to 1 h.</summary>
    internal static TimeSpan ParseLease(string text)
    {
        string t = text.Trim();
        (string unit, double scale) = t.EndsWith("ms", StringComparison.OrdinalIgnoreCase) ? ("ms", 0.001)
            : t.EndsWith('s') || t.EndsWith('S') ? ("s", 1.0)
            : t.EndsWith('m') || t.EndsWith('M') ? ("m", 60.0)
            : t.EndsWith('h') || t.EndsWith('H') ? ("h", 3600.0)
            : ("", 1.0);
        string number = t[..^unit.Length].Trim();
        if (!double.TryParse(number, NumberStyles.Float, CultureInfo.InvariantCulture, out double value) || !double.IsFinite(value))
        {
            throw new UsageException($"--lease: '{text}' is not a duration (write 30s, 2m, 1500ms or a number of seconds)");
        }
        double seconds = value * scale;
        if (seconds < 1 || seconds > 3600) throw new UsageException($"--lease: {text} is outside 1 s to 1 h");
        return TimeSpan.FromSeconds(seconds);
    }

    private static string CheckWorkerName(string name)
    {
        try
        {
            WorkerIdentity.CheckName(name);
            return name;
        }
        catch (ArgumentException e)
        {
            throw new UsageException($"--worker-name: {e.Message.Split(" (Parameter", 2)[0]}");
        }
    }

    /// <summary>A progress bar on a terminal, plain lines every 10 % otherwise (standard error).</summary>
    private sealed class Progress(TextWriter error, int total)
    {
        private readonly bool _terminal = !Console.IsErrorRedirected && ReferenceEquals(error is OptionWords.Writer w ? w.Inner : error, Console.Error);
        private int _lastDecile = -1;

        public void Report(int done)
        {
            if (_terminal)
            {
                if (done % 16 != 0 && done != total) return;
                int width = 40, filled = (int)((long)width * done / total);
                error.Write($"\r[{new string('#', filled)}{new string('.', width - filled)}] {done}/{total}");
                return;
            }
            int decile = (int)(10L * done / total);
            if (decile != _lastDecile)
            {
                _lastDecile = decile;
                error.WriteLine($"junctionfit batch: {done}/{total} files");
            }
        }

        public void Finish()
        {
            if (_terminal) error.WriteLine();
        }
    }
}
