using System.Reflection;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>Which run stored a result: an id shared by all results of one batch, when it started, and what wrote it.</summary>
/// <param name="RunId">Identifier of the batch run (free text, at most 200 characters).</param>
/// <param name="StartedUtc">When the run started.</param>
/// <param name="ToolVersion">Version of the program that fitted the results.</param>
/// <param name="Host">Machine (probe station) the run was on; null when unknown.</param>
public sealed record RunInfo(string RunId, DateTimeOffset StartedUtc, string ToolVersion, string? Host)
{
    /// <summary>The id of the run.</summary>
    public string RunId { get; init; } = CheckText(RunId, nameof(RunId));

    /// <summary>The version of the program.</summary>
    public string ToolVersion { get; init; } = CheckText(ToolVersion, nameof(ToolVersion));

    /// <summary>
    /// A new run starting now on this machine: the id is the UTC start time and 8 random hexadecimal digits
    /// (<c>20250314T101500Z-3f9c2a1b</c>), unique across stations without coordination.
    /// </summary>
    /// <param name="toolVersion">Version of the program; null: the informational version of this library.</param>
    /// <returns>The run.</returns>
    public static RunInfo StartNew(string? toolVersion = null)
    {
        var now = DateTimeOffset.UtcNow;
        string id = $"{now:yyyyMMdd'T'HHmmss'Z'}-{Guid.NewGuid():N}"[..25];
        return new RunInfo(id, now, toolVersion ?? LibraryVersion, Environment.MachineName);
    }

    /// <summary>The informational version of the JunctionFit.Core assembly, without build metadata.</summary>
    public static string LibraryVersion { get; } =
        typeof(RunInfo).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion.Split('+')[0] ?? "0.0.0";

    private static string CheckText(string value, string name)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(value, name);
        if (value.Length > 200) throw new ArgumentException("at most 200 characters", name);
        return value;
    }
}

/// <summary>
/// One row of the results database: the key (file hash, model, options hash), the canonical options text the hash was
/// taken of, the run that stored it, and the fit itself. The stored fit keeps everything of a <see cref="FitResult"/>
/// except the curve snapshot (<see cref="FitResult.Curve"/> is null), so it can go to every writer that takes results.
/// </summary>
public sealed record StoredResult
{
    /// <summary>Creates a row, checking that the key and the result agree on the model.</summary>
    /// <param name="key">The identity.</param>
    /// <param name="optionsText">The canonical options text whose hash is <see cref="ResultKey.OptionsHash"/>.</param>
    /// <param name="run">The run that stores it.</param>
    /// <param name="result">The fit; its curve snapshot is dropped.</param>
    /// <param name="storedUtc">When it was written; null until it is.</param>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException">The model of <paramref name="key"/> differs from the result's, or
    /// <paramref name="optionsText"/> does not hash to the key's options hash.</exception>
    public StoredResult(ResultKey key, string optionsText, RunInfo run, FitResult result, DateTimeOffset? storedUtc = null)
    {
        ArgumentNullException.ThrowIfNull(optionsText);
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(result);
        if (key.Model is null) throw new ArgumentException("the key is empty (default)", nameof(key));
        if (!string.Equals(key.Model, result.Model, StringComparison.Ordinal))
        {
            throw new ArgumentException($"the key names model '{key.Model}' but the result is of model '{result.Model}'", nameof(key));
        }
        if (!string.Equals(ResultIdentity.OptionsHash(optionsText), key.OptionsHash, StringComparison.Ordinal))
        {
            throw new ArgumentException("the options text does not hash to the key's options hash", nameof(optionsText));
        }
        Key = key;
        OptionsText = optionsText;
        Run = run;
        Result = result.Curve is null ? result : result with { Curve = null };
        StoredUtc = storedUtc;
    }

    /// <summary>A row for <paramref name="result"/> of data with hash <paramref name="fileSha256"/>, fitted under <paramref name="canonicalOptions"/>.</summary>
    /// <param name="result">The fit (its model is the key's model).</param>
    /// <param name="fileSha256">From <see cref="ResultIdentity.FileSha256(string)"/>.</param>
    /// <param name="canonicalOptions">From <see cref="JunctionFit.Fitting.FitOptionsText.Canonical"/>.</param>
    /// <param name="run">The run.</param>
    /// <returns>The row.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException">The hash is malformed.</exception>
    public static StoredResult Create(FitResult result, string fileSha256, string canonicalOptions, RunInfo run)
    {
        ArgumentNullException.ThrowIfNull(result);
        return new StoredResult(ResultIdentity.Key(fileSha256, result.Model, canonicalOptions), canonicalOptions, run, result);
    }

    /// <summary>The identity.</summary>
    public ResultKey Key { get; }

    /// <summary>The stored result as a table row: the fit, who fitted it and when, and its option set (<see cref="OptionsText"/>).</summary>
    /// <returns>The row.</returns>
    public ResultRow ToRow() => ResultRow.FromFitResult(Result) with { FittedBy = FittedBy, FittedAt = FittedAt, OptionSet = OptionsText };

    /// <summary>The canonical options text.</summary>
    public string OptionsText { get; }

    /// <summary>The run that stored the row.</summary>
    public RunInfo Run { get; }

    /// <summary>The fit, without its curve snapshot.</summary>
    public FitResult Result { get; }

    /// <summary>When the row was last written (by this run or a <c>--force</c> rerun); null before it is stored.</summary>
    public DateTimeOffset? StoredUtc { get; }

    /// <summary>
    /// The worker that fitted the result (<see cref="WorkerIdentity.FittedBy"/>: <c>host:pid</c> or <c>NAME@host:pid</c>,
    /// at most 300 characters). Null when writing: the store then records the run's <see cref="RunInfo.Host"/>. Read back as
    /// stored (the host alone for rows stored before schema version 2).
    /// </summary>
    public string? FittedBy
    {
        get;
        init => field = value is null || value.Length is > 0 and <= 300
            ? value
            : throw new ArgumentException("fitted_by must be 1 to 300 characters", nameof(FittedBy));
    }

    /// <summary>When the fit was made (UTC). Null when writing: the store then records the time of the write.</summary>
    public DateTimeOffset? FittedAt { get; init; }
}
