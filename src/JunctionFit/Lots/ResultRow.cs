using System.Collections.Immutable;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Lots;

/// <summary>
/// One parameter of a <see cref="ResultRow"/>, in the unit its key names (eV, nm, m², dimensionless).
/// Any field may be missing: a failed fit has no value, a fixed parameter has no standard error or interval.
/// </summary>
/// <param name="Key">Stable key, for example <c>barrier_height_eV</c>.</param>
/// <param name="Value">Estimate, or the fixed value; null when unknown.</param>
/// <param name="StandardError">Standard error; null when fixed or not estimable.</param>
/// <param name="Lower95">Lower end of the 95 % interval; null when fixed or not estimable.</param>
/// <param name="Upper95">Upper end of the 95 % interval; null when fixed or not estimable.</param>
public sealed record RowParameter(string Key, double? Value, double? StandardError, double? Lower95, double? Upper95);

/// <summary>
/// One line of a lot's results table: where the die is, how its fit went, and the parameters as plain
/// numbers. A flat, immutable snapshot of a <see cref="FitResult"/> that can be written to and read back
/// from <c>results.csv</c> without losing anything the lot statistics need.
/// </summary>
public sealed record ResultRow
{
    /// <summary>The four standard keys in the order every table uses: φ, d, area, m*/mₑ.</summary>
    public static ImmutableArray<string> StandardKeys { get; } =
        [ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name, ParameterKey.Area.Name, ParameterKey.MassRatio.Name];

    /// <summary>Key under which the transition voltage (V) is offered to the lot statistics.</summary>
    public static string TransitionVoltageKey => ParameterKey.TransitionVoltage.Name;

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

    /// <summary>Transition voltage for positive bias in volt; null when not found.</summary>
    public double? TransitionVoltageV { get; init; }

    /// <summary>Warnings in words.</summary>
    public ImmutableArray<string> Warnings { get; init; } = [];

    /// <summary>Why the fit failed; null unless it did.</summary>
    public string? Error { get; init; }

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
    /// <returns>The row.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    public static ResultRow FromFitResult(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        var parameters = result.Parameters
            .Select(p => new RowParameter(p.Key, p.Value, p.StandardError, p.Lower95, p.Upper95))
            .ToList();
        return new ResultRow
        {
            File = result.SourcePath,
            Lot = result.Lot,
            Wafer = result.Wafer,
            DieX = result.DieX,
            DieY = result.DieY,
            Model = result.Model,
            Status = result.Status,
            Parameters = [.. parameters.OrderBy(p => KeyRank(p.Key))],
            ReducedChiSquare = result.Quality?.ReducedChiSquare,
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
        var keys = new List<string>(StandardKeys);
        var seen = new HashSet<string>(StandardKeys, StringComparer.Ordinal);
        foreach (var row in rows)
        {
            foreach (var p in row.Parameters)
            {
                if (seen.Add(p.Key)) keys.Add(p.Key);
            }
        }
        return [.. keys];
    }

    /// <summary>Position of a key in table order: standard keys first, others after (stable sort keeps their order).</summary>
    internal static int KeyRank(string key)
    {
        int i = StandardKeys.IndexOf(key, StringComparer.Ordinal);
        return i >= 0 ? i : StandardKeys.Length;
    }
}
