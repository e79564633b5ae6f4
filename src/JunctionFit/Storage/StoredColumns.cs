using System.Collections.Immutable;
using System.Data.Common;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>One column of <c>fit_result</c>: its name, its engine kind and its value for a stored result.</summary>
/// <param name="Name">Column name (the only text this project puts into SQL besides its keywords).</param>
/// <param name="Kind">How the value is bound.</param>
/// <param name="Value">The value for a result stored at the given time: a string, int?, double?, bool? or a
/// <see cref="DateTimeOffset"/> for <see cref="ColumnKind.Time"/> (the store converts it to its engine's form).</param>
internal sealed record StoredColumn(string Name, ColumnKind Kind, Func<StoredResult, DateTimeOffset, object?> Value);

/// <summary>
/// The columns of the results database in one list, from which the insert, the upsert and the select of
/// <see cref="SqlResultStore"/> are built and by whose names <see cref="StoredRowReader"/> reads a row back (no column
/// numbers anywhere). The key's three columns come first. The fields of <see cref="ResultSchema"/>'s tables are all here
/// (file_path is the schema's <c>file</c>; the parameters are rows of <c>fit_parameter</c>); a new field of
/// <see cref="FitResult"/> that is to survive the database gets a column here and a migration in <see cref="Migrations"/>.
/// </summary>
internal static class StoredColumns
{
    /// <summary>The columns of <c>fit_result</c> written per result, in insert order.</summary>
    public static ImmutableArray<StoredColumn> Result { get; } =
    [
        new("file_sha256", ColumnKind.Text, (s, _) => s.Key.FileSha256),
        new("model", ColumnKind.Text, (s, _) => s.Key.Model),
        new("options_hash", ColumnKind.Text, (s, _) => s.Key.OptionsHash),
        new("options_text", ColumnKind.Text, (s, _) => s.OptionsText),
        new("file_path", ColumnKind.Text, (s, _) => s.Result.SourcePath),
        new("lot", ColumnKind.Text, (s, _) => s.Result.Lot),
        new("wafer", ColumnKind.Text, (s, _) => s.Result.Wafer),
        new("die_x", ColumnKind.Int, (s, _) => s.Result.DieX),
        new("die_y", ColumnKind.Int, (s, _) => s.Result.DieY),
        new("status", ColumnKind.Text, (s, _) => ResultSchema.StatusText(s.Result.Status)),
        new("error", ColumnKind.Text, (s, _) => s.Result.Error),
        new("points_used", ColumnKind.Int, (s, _) => s.Result.Quality?.PointsUsed),
        new("points_masked", ColumnKind.Int, (s, _) => s.Result.Quality?.PointsMasked),
        new("iterations", ColumnKind.Int, (s, _) => s.Result.Quality?.Iterations),
        new("rss", ColumnKind.Real, (s, _) => StoredColumnCodecs.Finite(s.Result.Quality?.ResidualSumOfSquares)),
        new("reduced_chi2", ColumnKind.Real, (s, _) => StoredColumnCodecs.Finite(s.Result.Quality?.ReducedChiSquare)),
        new("converged", ColumnKind.Bool, (s, _) => s.Result.Quality?.Converged),
        new("stop_reason", ColumnKind.Text, (s, _) => s.Result.Quality?.StopReason),
        new("covariance_scaling", ColumnKind.Text, (s, _) => s.Result.Quality?.CovarianceScaling),
        new("interval_method", ColumnKind.Text, (s, _) => s.Result.Quality?.IntervalMethod),
        new("transition_voltage_v", ColumnKind.Real, (s, _) => StoredColumnCodecs.Finite(s.Result.TransitionVoltageV)),
        new("warnings_json", ColumnKind.Text, (s, _) => StoredColumnCodecs.WarningsJson(s.Result.Warnings)),
        new("correlation_json", ColumnKind.Text, (s, _) => StoredColumnCodecs.CorrelationJson(s.Result)),
        new("parameter_count", ColumnKind.Int, (s, _) => s.Result.Parameters.Length),
        new("run_id", ColumnKind.Text, (s, _) => s.Run.RunId),
        new("run_started_utc", ColumnKind.Time, (s, _) => s.Run.StartedUtc),
        new("tool_version", ColumnKind.Text, (s, _) => s.Run.ToolVersion),
        new("host", ColumnKind.Text, (s, _) => s.Run.Host),
        new("stored_utc", ColumnKind.Time, (_, stored) => stored),
        new("fitted_by", ColumnKind.Text, (s, _) => s.FittedBy ?? s.Run.Host),
        new("fitted_at", ColumnKind.Time, (s, stored) => s.FittedAt ?? stored),
        new("status_reason", ColumnKind.Text, (s, _) => s.Result.StatusReason),
        new("model_validity", ColumnKind.Text, (s, _) => s.Result.ModelValidity),
        new("diagnoses_json", ColumnKind.Text, (s, _) => StoredColumnCodecs.WarningsJson(s.Result.Diagnoses)),
    ];

    /// <summary>The columns of <c>fit_parameter</c> per parameter (after <c>result_id</c>), in insert order.</summary>
    public static ImmutableArray<(string Name, ColumnKind Kind)> Parameter { get; } =
    [
        ("ordinal", ColumnKind.Int), ("param_key", ColumnKind.Text), ("symbol", ColumnKind.Text), ("unit", ColumnKind.Text),
        ("value", ColumnKind.Real), ("stderr", ColumnKind.Real), ("lower95", ColumnKind.Real), ("upper95", ColumnKind.Real),
        ("is_fixed", ColumnKind.Bool),
    ];

    /// <summary>The select list of a read: <c>r.id</c>, every result column, every parameter column (the names are unique).</summary>
    public static string SelectList { get; } =
        string.Join(", ", new[] { "r.id" }.Concat(Result.Select(c => "r." + c.Name)).Concat(Parameter.Select(c => "p." + c.Name)));
}

/// <summary>The ordinals of a reader's columns by name, looked up once per query.</summary>
internal sealed class ColumnOrdinals
{
    private readonly Dictionary<string, int> _at;

    public ColumnOrdinals(DbDataReader reader)
    {
        _at = new Dictionary<string, int>(reader.FieldCount, StringComparer.OrdinalIgnoreCase);
        for (int i = 0; i < reader.FieldCount; i++) _at.TryAdd(reader.GetName(i), i);
    }

    /// <summary>The ordinal of column <paramref name="name"/>.</summary>
    public int this[string name] => _at.TryGetValue(name, out int i) ? i : throw new InvalidOperationException($"no column {name} in the select list");
}
