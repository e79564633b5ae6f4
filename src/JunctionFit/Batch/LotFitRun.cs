using JunctionFit.Common;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;
using JunctionFit.Storage;

namespace JunctionFit.Batch;

/// <summary>What a lot fit is given: the files, where to write, how to read and fit them, and how to share a database.</summary>
/// <param name="Files">The I–V files, in the order their rows are written.</param>
/// <param name="OutDir">Output folder (created): results.csv and the plots folder go here.</param>
/// <param name="ReadOptions">How to read each file.</param>
/// <param name="Plan">How to fit each curve.</param>
/// <param name="Jobs">Parallel fits (at least 1).</param>
public sealed record LotFitRequest(IReadOnlyList<string> Files, string OutDir, IvReadOptions ReadOptions, FitPlan Plan, int Jobs)
{
    /// <summary>Render a fit plot per file into <see cref="LotFitRun.PlotDirName"/>.</summary>
    public bool Plots { get; init; } = true;

    /// <summary>Refit files whose result is already stored for the same content, model and options.</summary>
    public bool Force { get; init; }

    /// <summary>How long a claim holds without renewal (several workers on one database).</summary>
    public TimeSpan Lease { get; init; } = SharedWork.DefaultLease;

    /// <summary>Name of this worker in <c>fitted_by</c>; null for <c>host:pid</c> alone.</summary>
    public string? WorkerName { get; init; }

    /// <summary>Settings beyond <see cref="FitOptions"/> that change a fit, for the result identity and the option set.</summary>
    public IReadOnlyList<KeyValuePair<string, string>> IdentityExtras { get; init; } = [];

    /// <summary>The tool's version, recorded with the stored run (default: the library's assembly version).</summary>
    public string ToolVersion { get; init; } = "JunctionFit " + (typeof(LotFitRequest).Assembly.GetName().Version?.ToString() ?? "0");

    /// <summary>Words of the remedies in results and read errors (the command line: its options); null keeps the placeholders.</summary>
    public Func<Remedy, string>? Words { get; init; }
}

/// <summary>What a lot fit produced, in input order.</summary>
/// <param name="Rows">One results.csv row per file.</param>
/// <param name="Results">One result per file, without its curve.</param>
/// <param name="PlotByIndex">The plot file of each file; null where none was written.</param>
/// <param name="Candidates">The fits the report gives a section of their own.</param>
/// <param name="ResultsPath">The results.csv written.</param>
/// <param name="Unreadable">Files that could not be read.</param>
/// <param name="NotOk">Files whose status is not ok (unreadable ones included).</param>
public sealed record LotFitOutcome(
    IReadOnlyList<ResultRow> Rows, IReadOnlyList<FitResult> Results, IReadOnlyList<string?> PlotByIndex, ReportCandidates Candidates, string ResultsPath,
    int Unreadable, int NotOk);

/// <summary>
/// Fits a lot: every file read and fitted in ordered parallel chunks (<see cref="CurvePipeline"/>), a plot per file,
/// results.csv streamed in input order and renamed into place at the end, and — with a results database — the results
/// stored, files already stored for the same content, model and options taken from it, and the lot shared with other
/// workers on the same database (<see cref="SharedWork"/>). Messages (read errors, fits that are not ok, database notes)
/// go to the writer given, as <c>path:line: reason</c> or <c>junctionfit batch: …</c> lines with remedy placeholders.
/// What comes after the fits (summary, maps, report) is <see cref="LotReport"/>.
/// </summary>
public static class LotFitRun
{
    /// <summary>Folder of the fit plots inside the output folder (results.csv names plots relative to the output folder).</summary>
    public const string PlotDirName = "plots";

    /// <summary>Runs the fits of a lot.</summary>
    /// <param name="request">The files and how to fit them.</param>
    /// <param name="store">The results database, opened by the caller; null for none.</param>
    /// <param name="openAnother">Opens a second connection to the same database (for the claim heartbeat); needed with a store.</param>
    /// <param name="messages">Where messages go.</param>
    /// <param name="progress">Called with (files done, files in all) after each file, on the calling thread; null for none.</param>
    /// <returns>The rows, results and plots, in input order.</returns>
    /// <exception cref="ArgumentNullException">The request, the messages or, with a store, <paramref name="openAnother"/> is null.</exception>
    /// <exception cref="IOException">An output file could not be written.</exception>
    /// <exception cref="ResultStoreException">The database failed.</exception>
    public static LotFitOutcome Run(LotFitRequest request, IResultStore? store, Func<IResultStore>? openAnother, TextWriter messages,
        Action<int, int>? progress = null)
    {
        ArgumentNullException.ThrowIfNull(request);
        ArgumentNullException.ThrowIfNull(messages);
        if (store is not null) ArgumentNullException.ThrowIfNull(openAnother);
        Guard.AtLeast(request.Jobs, 1);
        var files = request.Files;
        var plan = request.Plan;
        Directory.CreateDirectory(request.OutDir);
        string plotDir = Path.Combine(request.OutDir, PlotDirName);
        if (request.Plots) Directory.CreateDirectory(plotDir);

        string resultsPath = Path.Combine(request.OutDir, ResultsCsv.FileName);
        string partial = resultsPath + ".partial";
        var rows = new List<ResultRow>(files.Count);
        var results = new List<FitResult>(files.Count);
        var plotByIndex = new string?[files.Count];
        var candidates = new ReportCandidates();
        var plotNames = new HashSet<string>(StringComparer.Ordinal);
        int unreadable = 0, notOk = 0, done = 0;
        string optionsText = FitOptionsText.Canonical(plan.Options, request.IdentityExtras);
        string optionsHash = ResultIdentity.OptionsHash(optionsText);
        var fileKeys = new ResultKey?[files.Count];
        var stored = new Dictionary<ResultKey, StoredResult>();
        if (store is not null)
        {
            Parallel.For(0, files.Count, new ParallelOptions { MaxDegreeOfParallelism = request.Jobs }, k =>
            {
                try { fileKeys[k] = new ResultKey(ResultIdentity.FileSha256(files[k]), plan.DisplayName, optionsHash); }
                catch (Exception e) when (e is IOException or UnauthorizedAccessException) { fileKeys[k] = null; }
            });
            if (!request.Force)
            {
                var existing = store.ExistingKeys(fileKeys.OfType<ResultKey>());
                if (existing.Count > 0)
                {
                    foreach (var r in store.QueryKeys(existing)) stored[r.Key] = r;
                    messages.WriteLine($"junctionfit batch: {stored.Count} of {files.Count} files are already stored with the same content, model and options; " +
                                       $"they are not refitted ({new Remedy(RemedyKind.Refit)} refits them)");
                }
            }
        }
        var storeRun = RunInfo.StartNew(request.ToolVersion);
        var worker = WorkerIdentity.Current(request.WorkerName);
        var work = store is null ? null : new SharedWork(store, worker, request.Lease, request.Force, files, fileKeys, messages);
        var dbWriter = store is null ? null : new ChunkedResultWriter(store, chunkSize: SharedWork.MaxBlock, claimsOf: worker);
        using (var file = new FileStream(partial, FileMode.Create, FileAccess.Write, FileShare.Read))
        using (var table = ResultsCsv.Open(file, ParameterKeys(plan)))
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
                var fitted = CurvePipeline.Process(files[k], request.ReadOptions, plan, messages, request.Words);
                // Render on the worker thread; the ordered consumer only writes the bytes.
                return request.Plots && fitted.Result.Curve is not null ? fitted with { PlotPng = FitPlotRenderer.RenderPng(fitted.Result) } : fitted;
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
                    messages.WriteLine(outcome.ReadError);
                    unreadable++;
                }
                var result = outcome.Result;
                if (result.Status != FitStatus.Ok) notOk++;
                if (result.Status != FitStatus.Ok && outcome.ReadError is null)
                {
                    messages.WriteLine($"{result.SourcePath}:0: {ResultSchema.StatusText(result.Status)}: {result.StatusReason ?? result.Error}");
                }
                string? plot = null;
                if (outcome.PlotPng is { } png)
                {
                    plot = Path.Combine(plotDir, PlotFileNames.Unique(result, plotNames));
                    AtomicFile.WriteAllBytes(plot, png);
                }
                plotByIndex[index] = plot;
                var row = ResultRow.FromFitResult(result) with
                {
                    OptionSet = optionsText,
                    Plot = plot is null ? null : PlotDirName + "/" + Path.GetFileName(plot),
                };
                Emit(index, row, result with { Curve = null });
                candidates.Offer(index, result with { Curve = null }, plot);
                progress?.Invoke(++done, files.Count);
            }
            if (work is null)
            {
                CurvePipeline.Run(files.Count, Process, request.Jobs, Consume);
            }
            else
            {
                work.Run(k => fileKeys[k] is ResultKey key && stored.ContainsKey(key), Process, request.Jobs, Consume, dbWriter!.Flush, openAnother!);
                if (work.FromOthers > 0 || work.TakenOver > 0)
                {
                    messages.WriteLine($"junctionfit batch: worker {worker.FittedBy}: {work.Claimed.Count(c => c)} files fitted here, " +
                                       $"{work.FromOthers} taken from other workers' results, {work.TakenOver} taken over from workers whose lease lapsed");
                }
                if (dbWriter.Dropped > 0)
                {
                    messages.WriteLine($"junctionfit batch: warning: {dbWriter.Dropped} results not stored: their claim lapsed and another worker took the file over " +
                                       $"(a longer {new Remedy(RemedyKind.Lease)} avoids this)");
                }
            }
            table.Flush();
            file.Flush(flushToDisk: true);
        }
        dbWriter?.Flush();
        File.Move(partial, resultsPath, overwrite: true);
        if (store is not null) messages.WriteLine($"junctionfit batch: database {store.Description} holds {store.Count()} results");
        return new LotFitOutcome(rows, results, plotByIndex, candidates, resultsPath, unreadable, notOk);
    }

    /// <summary>Keys of every parameter any model of the plan can report, in the standard order (the results.csv columns).</summary>
    /// <param name="plan">The fit plan.</param>
    /// <returns>The parameter keys.</returns>
    public static IReadOnlyList<string> ParameterKeys(FitPlan plan)
    {
        ArgumentNullException.ThrowIfNull(plan);
        var perModel = plan.ModelNames.Select(name =>
            new JunctionCurrentModel(BarrierModelCatalog.Create(name, plan.ModelOptions), plan.Parasitics).Parameters.Select(d => d.Key));
        return ResultSchema.ParameterKeys(perModel, withStandard: true);
    }
}
