using JunctionFit.Cli.Support;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Results;

namespace JunctionFit.Cli.Commands;

/// <summary>What became of one input file.</summary>
/// <param name="Path">The file as given.</param>
/// <param name="Result">The fit (status failed when the file could not be read).</param>
/// <param name="ReadError">The importer's <c>path:line: reason</c>, or null when the file was read.</param>
internal readonly record struct CurveOutcome(string Path, FitResult Result, string? ReadError)
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
/// </summary>
internal static class CurvePipeline
{
    private const int ChunkSize = 64;

    public static void Run(IReadOnlyList<string> files, IvReadOptions readOptions, FitPlan plan, int jobs, Action<int, CurveOutcome> consume,
        TextWriter? progress = null, CancellationToken cancel = default)
        => Run(files.Count, k => Process(files[k], readOptions, plan, progress), jobs, consume, cancel);

    /// <summary>Runs <paramref name="process"/> for indices 0 … count − 1 in parallel chunks, consuming in order.</summary>
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
    public static CurveOutcome Process(string path, IvReadOptions readOptions, FitPlan plan, TextWriter? progress = null)
    {
        using var watch = FileProgress.Start(progress, path, "reading");
        IvCurve curve;
        try
        {
            curve = IvFileReader.ReadFile(path, readOptions);
        }
        catch (IvFormatException e)
        {
            return new CurveOutcome(path, FitResult.Failed(path, plan.DisplayName, OptionWords.Word(e.Reason)!), OptionWords.Word(e.Message));
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            return new CurveOutcome(path, FitResult.Failed(path, plan.DisplayName, e.Message), $"{path}:0: cannot read: {e.Message}");
        }
        watch?.Stage($"fitting {curve.Count} points ({plan.DisplayName})");
        return new CurveOutcome(path, OptionWords.Word(plan.Fit(curve)), null);
    }
}
