using System.CommandLine;
using System.Globalization;
using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Common;
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
    /// <summary>Folder of the fit plots inside the output folder (results.csv names plots relative to the output folder).</summary>
    public const string PlotDirName = "plots";

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
        string plotDir = Path.Combine(s.OutDir, PlotDirName);
        string mapDir = Path.Combine(s.OutDir, LotReport.MapDirName);
        if (s.Plots) Directory.CreateDirectory(plotDir);
        Directory.CreateDirectory(mapDir);

        var keys = ParameterKeys(s.Plan);
        string resultsPath = Path.Combine(s.OutDir, ResultsCsv.FileName);
        string partial = resultsPath + ".partial";
        var rows = new List<ResultRow>(files.Count);
        var results = new List<FitResult>(files.Count);
        var plotByIndex = new string?[files.Count];
        var reportCandidates = new ReportCandidates();
        var plotNames = new HashSet<string>(StringComparer.Ordinal);
        int unreadable = 0, notOk = 0, done = 0;
        var progress = new Progress(context.Error, files.Count);
        using var store = s.Database is null ? null : OpenStore(s.Database);
        string optionsText = FitOptionsText.Canonical(s.Plan.Options, s.IdentityExtras);
        string optionsHash = ResultIdentity.OptionsHash(optionsText);
        var fileKeys = new ResultKey?[files.Count];
        var stored = new Dictionary<ResultKey, StoredResult>();
        if (store is not null)
        {
            Parallel.For(0, files.Count, new ParallelOptions { MaxDegreeOfParallelism = s.Jobs }, k =>
            {
                try { fileKeys[k] = new ResultKey(ResultIdentity.FileSha256(files[k]), s.Plan.DisplayName, optionsHash); }
                catch (Exception e) when (e is IOException or UnauthorizedAccessException) { fileKeys[k] = null; }
            });
            if (!s.Force)
            {
                var existing = store.ExistingKeys(fileKeys.OfType<ResultKey>());
                if (existing.Count > 0)
                {
                    foreach (var r in store.QueryKeys(existing)) stored[r.Key] = r;
                    context.Error.WriteLine($"junctionfit batch: {stored.Count} of {files.Count} files are already stored with the same content, model and options; " +
                                            "they are not refitted (--force refits them)");
                }
            }
        }
        var storeRun = RunInfo.StartNew(VersionInfo.Text);
        var worker = WorkerIdentity.Current(s.WorkerName);
        var work = store is null ? null : new SharedWork(store, worker, s.Lease, s.Force, files, fileKeys, context.Error);
        var dbWriter = store is null ? null : new ChunkedResultWriter(store, chunkSize: SharedWork.MaxBlock, claimsOf: worker);
        using (var file = new FileStream(partial, FileMode.Create, FileAccess.Write, FileShare.Read))
        using (var table = ResultsCsv.Open(file, keys))
        {
            // Rows go out in input order: one that arrives early (another worker's file came later) waits for its predecessors.
            var waiting = new (ResultRow Row, FitResult Result)?[files.Count];
            int nextRow = 0;
            void Emit(int index, ResultRow row, FitResult result)
            {
                waiting[index] = (row, result);
                while (nextRow < files.Count && waiting[nextRow] is { } ready)
                {
                    table.Write(ready.Row);
                    rows.Add(ready.Row);
                    results.Add(ready.Result);
                    waiting[nextRow++] = null;
                }
            }
            CurveOutcome Process(int k)
            {
                if (fileKeys[k] is ResultKey key && stored.TryGetValue(key, out var previous))
                {
                    return new CurveOutcome(files[k], previous.Result with { SourcePath = files[k] }, null) { FromStore = true };
                }
                var fitted = CurvePipeline.Process(files[k], s.ReadOptions, s.Plan, context.Error);
                // Render on the worker thread; the ordered consumer only writes the bytes.
                return s.Plots && fitted.Result.Curve is not null ? fitted with { PlotPng = FitPlotRenderer.RenderPng(fitted.Result) } : fitted;
            }
            void Consume(int index, CurveOutcome outcome)
            {
                if (dbWriter is not null && work!.Claimed[index] && !outcome.FromStore && fileKeys[index] is ResultKey newKey)
                {
                    dbWriter.Add(new StoredResult(newKey, optionsText, storeRun, outcome.Result with { Curve = null })
                    {
                        FittedBy = worker.FittedBy,
                        FittedAt = DateTimeOffset.UtcNow,
                    });
                }
                if (outcome.ReadError is not null)
                {
                    context.Error.WriteLine(outcome.ReadError);
                    unreadable++;
                }
                var result = outcome.Result;
                if (result.Status != FitStatus.Ok) notOk++;
                if (result.Status != FitStatus.Ok && outcome.ReadError is null)
                {
                    context.Error.WriteLine($"{result.SourcePath}:0: {ResultSchema.StatusText(result.Status)}: {result.StatusReason ?? result.Error}");
                }
                string? plot = null;
                if (outcome.PlotPng is { } png)
                {
                    plot = Path.Combine(plotDir, FitRun.UniquePlotName(result, plotNames));
                    AtomicFile.WriteAllBytes(plot, png);
                }
                plotByIndex[index] = plot;
                var row = ResultRow.FromFitResult(result) with
                {
                    OptionSet = optionsText,
                    Plot = plot is null ? null : PlotDirName + "/" + Path.GetFileName(plot),
                };
                Emit(index, row, result with { Curve = null });
                reportCandidates.Offer(index, result with { Curve = null }, plot);
                progress.Report(++done);
            }
            if (work is null)
            {
                CurvePipeline.Run(files.Count, Process, s.Jobs, Consume);
            }
            else
            {
                work.Run(k => fileKeys[k] is ResultKey key && stored.ContainsKey(key), Process, s.Jobs, Consume, dbWriter!.Flush,
                    () => OpenStore(s.Database!));
                if (work.FromOthers > 0 || work.TakenOver > 0)
                {
                    context.Error.WriteLine($"junctionfit batch: worker {worker.FittedBy}: {work.Claimed.Count(c => c)} files fitted here, " +
                                            $"{work.FromOthers} taken from other workers' results, {work.TakenOver} taken over from workers whose lease lapsed");
                }
                if (dbWriter.Dropped > 0)
                {
                    context.Error.WriteLine($"junctionfit batch: warning: {dbWriter.Dropped} results not stored: their claim lapsed and another worker took the file over " +
                                            "(a longer --lease avoids this)");
                }
            }
            table.Flush();
            file.Flush(flushToDisk: true);
        }
        dbWriter?.Flush();
        File.Move(partial, resultsPath, overwrite: true);
        if (store is not null) context.Error.WriteLine($"junctionfit batch: database {store.Description} holds {store.Count()} results");
        progress.Finish();

        // Lot summary, wafer maps and report (JunctionFit.Batch); the words that name options are given here.
        var report = LotReport.Write(new LotReportRequest(s.OutDir, rows, results, plotByIndex, reportCandidates,
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
        int code = unreadable == files.Count ? ExitCodes.UsageOrInput : notOk == 0 ? ExitCodes.Success : ExitCodes.SomeFailed;
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

    /// <summary>
    /// Opens a database for a command that only reads it (results, drift, thickness): a SQLite file that does not exist is
    /// a usage error naming the path, and nothing is created (a mistyped path must not leave an empty database behind).
    /// </summary>
    internal static IResultStore OpenExistingStore(string database)
    {
        if (!string.IsNullOrWhiteSpace(database) && ResultStore.KindOf(database) == ResultStoreKind.Sqlite && !File.Exists(database))
        {
            throw new UsageException(Directory.Exists(database)
                ? $"--db: {database} is a folder, not a results database file"
                : $"--db: no results database at {Path.GetFullPath(database)} (reading commands never create one; give the file that batch wrote)");
        }
        return OpenStore(database);
    }

    internal static IResultStore OpenStore(string database)
    {
        try
        {
            return ResultStore.Open(database);
        }
        catch (ResultStoreException e)
        {
            throw new UsageException($"--db: {e.Message}");
        }
        catch (ArgumentException e)
        {
            throw new UsageException($"--db: {ConnectionStrings.Redact(database)}: {e.Message}");
        }
    }

    /// <summary>Keys of every parameter any model of the plan can report, in the standard order.</summary>
    internal static List<string> ParameterKeys(FitPlan plan)
    {
        var perModel = plan.ModelNames.Select(name =>
            new Physics.JunctionCurrentModel(Physics.BarrierModelCatalog.Create(name, plan.ModelOptions), plan.Parasitics).Parameters.Select(d => d.Key));
        return [.. ResultSchema.ParameterKeys(perModel, withStandard: true)];
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
