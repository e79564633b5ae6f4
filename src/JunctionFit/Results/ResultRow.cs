using System.Collections.Immutable;

namespace JunctionFit.Results;

/// <summary>
/// One parameter of a <see cref="ResultRow"/>, in the unit its key names (eV, nm, m², dimensionless).
/// Any field may be missing: a failed fit has no value, a fixed parameter has no standard error or interval.
/// </summary>
/// <param name="Key">Stable key, for example <c>barrier_height_eV</c>.</param>
/// <param name="Value">Estimate, or the fixed value; null when unknown.</param>
/// <param name="StandardError">Standard error; null when fixed or not estimable.</param>
/// <param name="Lower95">Lower end of the 95 % interval; null when fixed or not estimable.</param>
/// <param name="Upper95">Upper end of the 95 % interval; null when fixed or not estimable.</param>
public sealed record RowParameter(string Key, double? Value, double? StandardError, double? Lower95, double? Upper95)
{
    /// <summary>True when the parameter was held fixed; null when not known (a table without the column).</summary>
    public bool? IsFixed { get; init; }
}

/// <summary>
/// One line of a results table: where the die is, how its fit went, and the parameters as plain numbers. A flat,
/// immutable snapshot of a <see cref="FitResult"/>; every table of results (results.csv, summary.csv, the stored
/// results as CSV or JSON) is written from rows through the columns of <see cref="ResultSchema"/>.
/// </summary>
public sealed record ResultRow
{
    /// <summary>The four standard keys in the order every table uses: φ, d, area, m*/mₑ.</summary>
    public static ImmutableArray<string> StandardKeys => ResultSchema.StandardKeys;

    /// <summary>Key under which the transition voltage (V) is offered to the lot statistics.</summary>
    public const string TransitionVoltageKey = ResultSchema.TransitionVoltageKey;

    /// <summary>The I–V file as given.</summary>
    public required string File { get; init; }

    /// <summary>Lot; null when unknown.</summary>
    public string? Lot { get; init; }

    /// <summary>Wafer; null when unknown.</summary>
    public string? Wafer { get; init; }

    /// <summary>Die column; null when unknown.</summary>
    public int? DieX { get; init; }

    /// <summary>Die row; null when unknown.</summary>
    public int? DieY { get; init; }

    /// <summary>Model name (as for <c>--model</c>).</summary>
    public required string Model { get; init; }

    /// <summary>Outcome of the fit.</summary>
    public required FitStatus Status { get; init; }

    /// <summary>Parameters in table order (see <see cref="StandardKeys"/>, then any others).</summary>
    public ImmutableArray<RowParameter> Parameters { get; init; } = [];

    /// <summary>Reduced χ² of the fit; null when unknown.</summary>
    public double? ReducedChiSquare { get; init; }

    /// <summary>Points that entered the fit; null when unknown.</summary>
    public int? PointsUsed { get; init; }

    /// <summary>Points left out of the fit; null when unknown.</summary>
    public int? PointsMasked { get; init; }

    /// <summary>Transition voltage for positive bias in volt; null when not found.</summary>
    public double? TransitionVoltageV { get; init; }

    /// <summary>Warnings in words.</summary>
    public ImmutableArray<string> Warnings { get; init; } = [];

    /// <summary>Why the fit failed; null unless it did.</summary>
    public string? Error { get; init; }

    /// <summary>
    /// The option set that made the row: the canonical options text of the result identity (sorted <c>name=value</c>
    /// lines after a format line, separated by line feeds); null when not known (a table written before the column existed).
    /// </summary>
    public string? OptionSet { get; init; }

    /// <summary>The row's fit plot, relative to the output folder (<c>plots/…png</c>); null when none was written.</summary>
    public string? Plot { get; init; }

    /// <summary>The worker that fitted the row (<c>host:pid</c> or <c>NAME@host:pid</c>); null when not known.</summary>
    public string? FittedBy { get; init; }

    /// <summary>When the row was fitted (UTC); null when not known.</summary>
    public DateTimeOffset? FittedAt { get; init; }

    /// <summary>True when the fit's status is <see cref="FitStatus.Ok"/>: the only rows the lot statistics use.</summary>
    public bool IsGood => Status == FitStatus.Ok;

    /// <summary>The parameter with <paramref name="key"/>, or null.</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>The parameter, or null when the row has none with that key.</returns>
    public RowParameter? Find(string key)
    {
        foreach (var p in Parameters)
        {
            if (string.Equals(p.Key, key, StringComparison.Ordinal)) return p;
        }
        return null;
    }

    /// <summary>
    /// The value under <paramref name="key"/> when it is a finite number, else null. Besides the parameter
    /// keys, <see cref="TransitionVoltageKey"/> gives <see cref="TransitionVoltageV"/>.
    /// </summary>
    /// <param name="key">Parameter key or <see cref="TransitionVoltageKey"/>.</param>
    /// <returns>The finite value, or null.</returns>
    public double? ValueOf(string key)
    {
        double? v = string.Equals(key, TransitionVoltageKey, StringComparison.Ordinal) ? TransitionVoltageV : Find(key)?.Value;
        return v is double x && double.IsFinite(x) ? x : null;
    }

    /// <summary>Flattens a fit result into a row; parameters are put into table order.</summary>
    /// <param name="result">The fit.</param>
    /// <returns>The row (without option set, plot or worker: set them with <c>with</c>).</returns>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    public static ResultRow FromFitResult(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var parameters = result.Parameters
            .Select(p => new RowParameter(p.Key, p.Value, p.StandardError, p.Lower95, p.Upper95) { IsFixed = p.IsFixed });
        return new ResultRow
        {
            File = result.SourcePath,
            Lot = result.Lot,
            Wafer = result.Wafer,
            DieX = result.DieX,
            DieY = result.DieY,
            Model = result.Model,
            Status = result.Status,
            Parameters = [.. parameters.OrderBy(p => ResultSchema.KeyRank(p.Key))],
            ReducedChiSquare = result.Quality?.ReducedChiSquare,
            PointsUsed = result.Quality?.PointsUsed,
            PointsMasked = result.Quality?.PointsMasked,
            TransitionVoltageV = result.TransitionVoltageV,
            Warnings = result.Warnings,
            Error = result.Error,
        };
    }

    /// <summary>
    /// The parameter keys of <paramref name="rows"/> in table order: the four <see cref="StandardKeys"/>
    /// (always, so that an all-failed lot still has the full layout), then other keys in order of first appearance.
    /// </summary>
    /// <param name="rows">Rows.</param>
    /// <returns>Keys in column order.</returns>
    public static ImmutableArray<string> ParameterKeysOf(IEnumerable<ResultRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        return ResultSchema.ParameterKeys(rows.Select(r => r.Parameters.Select(p => p.Key)), withStandard: true);
    }
}
