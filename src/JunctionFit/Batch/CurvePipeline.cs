using JunctionFit.Common;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Results;

namespace JunctionFit.Batch;

/// <summary>What became of one input file.</summary>
/// <param name="Path">The file as given.</param>
/// <param name="Result">The fit (status failed when the file could not be read).</param>
/// <param name="ReadError">The importer's <c>path:line: reason</c>, or null when the file was read.</param>
public readonly record struct CurveOutcome(string Path, FitResult Result, string? ReadError)
{
    /// <summary>True when the result was taken from the results database instead of being fitted now.</summary>
    public bool FromStore { get; init; }

    /// <summary>The fit plot, rendered on the worker thread; null when none was asked for.</summary>
    public byte[]? PlotPng { get; init; }

    /// <summary>The result's JSON line, formatted on the worker thread; null when none was asked for.</summary>
    public string? JsonLine { get; init; }
}

/// <summary>
/// Read → fit for many files: files are processed in parallel in ordered chunks, and each outcome is handed to the
/// caller in input order on the calling thread, then dropped — results appear deterministically and memory stays flat.
/// Whoever shows the results words their remedies (<see cref="Remedy"/>); given the words, every text of a result and the
/// importer's messages are worded here, on the worker thread, before anything is stored or written.
/// </summary>
public static class CurvePipeline
{
    private const int ChunkSize = 64;

    /// <summary>Runs <paramref name="process"/> for indices 0 … count − 1 in parallel chunks, consuming in order.</summary>
    /// <param name="fileCount">Number of inputs.</param>
    /// <param name="process">Produces the outcome of input k (called in parallel).</param>
    /// <param name="jobs">Parallel calls of <paramref name="process"/> at most.</param>
    /// <param name="consume">Takes input k's outcome, in input order, on the calling thread.</param>
    /// <param name="cancel">Stops before the next chunk's outcomes are made.</param>
    public static void Run(int fileCount, Func<int, CurveOutcome> process, int jobs, Action<int, CurveOutcome> consume, CancellationToken cancel = default)
    {
        var outcomes = new CurveOutcome[Math.Min(ChunkSize, Math.Max(fileCount, 1))];
        var parallel = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, jobs), CancellationToken = cancel };
        for (int start = 0; start < fileCount; start += ChunkSize)
        {
            int count = Math.Min(ChunkSize, fileCount - start);
            Parallel.For(0, count, parallel, k => outcomes[k] = process(start + k));
            for (int k = 0; k < count; k++)
            {
                consume(start + k, outcomes[k]);
                outcomes[k] = default;
            }
        }
    }

    /// <summary>Reads and fits one file; with <paramref name="progress"/>, a large file that takes over a second says so there.</summary>
    /// <param name="path">The I–V file.</param>
    /// <param name="readOptions">How to read it.</param>
    /// <param name="plan">How to fit it.</param>
    /// <param name="progress">Where a slow large file says how far it got; null for nowhere.</param>
    /// <param name="words">Words of the remedies in the result and the read error; null leaves them as placeholders.</param>
    /// <returns>The fit, or a failed result with the importer's <c>path:line: reason</c>.</returns>
    public static CurveOutcome Process(string path, IvReadOptions readOptions, FitPlan plan, TextWriter? progress = null, Func<Remedy, string>? words = null)
    {
        ArgumentNullException.ThrowIfNull(plan);
        using var watch = FileProgress.Start(progress, path, "reading");
        IvCurve curve;
        try
        {
            curve = IvFileReader.ReadFile(path, readOptions);
        }
        catch (IvFormatException e)
        {
            return new CurveOutcome(path, FitResult.Failed(path, plan.DisplayName, Word(e.Reason, words)), Word(e.Message, words));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return new CurveOutcome(path, FitResult.Failed(path, plan.DisplayName, e.Message), $"{path}:0: cannot read: {e.Message}");
        }
        watch?.Stage($"fitting {curve.Count} points ({plan.DisplayName})");
        var fitted = plan.Fit(curve);
        return new CurveOutcome(path, words is null ? fitted : fitted.WithRemediesWorded(words), null);
    }

    private static string Word(string text, Func<Remedy, string>? words) => words is null ? text : Remedy.Word(text, words)!;
}
