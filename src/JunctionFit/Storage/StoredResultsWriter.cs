using System.Buffers;
using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using System.Text.Json;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// Stored results as the <c>results</c> command prints them: CSV with the columns of a batch's <c>results.csv</c> followed
/// by <c>fitted_by, fitted_at</c>, or one JSON object per line.
/// <para>
/// CSV columns, in order: <c>file, lot, wafer, die_x, die_y, model, status</c>; for each parameter key K —
/// <c>barrier_height_eV, thickness_nm, area_m2, mass_ratio</c> always, then any other key in order of first appearance —
/// <c>K, K_stderr, K_lo, K_hi</c> in the key's unit; then <c>reduced_chi2, transition_voltage_V, warnings, error</c>; then
/// <see cref="WorkColumns"/>: <c>fitted_by</c> (the worker, <c>host:pid</c> or <c>NAME@host:pid</c>) and <c>fitted_at</c>
/// (ISO 8601 UTC). Numbers are invariant shortest round-trip text, an unknown value is an empty cell, warnings are joined with
/// <c>" | "</c> (a <c>" | "</c> inside a warning becomes <c>" / "</c>), line breaks inside a cell become spaces. Quoting
/// follows RFC 4180 (a cell with a comma, a quote, a line break or an edge space is quoted, quotes doubled); lines end
/// with a line feed.
/// </para>
/// <para>
/// A JSON line has the same keys in the same order (numbers as numbers, unknown as <c>null</c>, <c>warnings</c> as an
/// array, <c>error</c> null unless failed), followed by <c>points_used, points_masked, file_sha256, options_hash, run_id,
/// run_started_utc, tool_version, host, stored_utc, fitted_by, fitted_at</c>.
/// </para>
/// </summary>
public static class StoredResultsWriter
{
    /// <summary>The four parameter keys every table has, in this order.</summary>
    public static ImmutableArray<string> StandardKeys { get; } = [ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name, ParameterKey.Area.Name, ParameterKey.MassRatio.Name];

    /// <summary>Separator of the warnings inside their cell.</summary>
    public const string WarningSeparator = " | ";

    private static readonly string[] Leading = ["file", "lot", "wafer", "die_x", "die_y", "model", "status"];
    private static readonly string[] Trailing = ["reduced_chi2", "transition_voltage_V", "warnings", "error"];

    /// <summary>Columns after those of results.csv: who fitted the result and when.</summary>
    public static ImmutableArray<string> WorkColumns { get; } = ["fitted_by", "fitted_at"];
    private static readonly string[] Suffixes = ["", "_stderr", "_lo", "_hi"];
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Parameter keys in column order: the standard four, then others in order of first appearance.</summary>
    /// <param name="rows">The rows.</param>
    /// <returns>The keys.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> is null.</exception>
    public static ImmutableArray<string> ParameterKeys(IReadOnlyList<StoredResult> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var keys = new List<string>(StandardKeys);
        var seen = new HashSet<string>(StandardKeys, StringComparer.Ordinal);
        foreach (var row in rows)
        {
            ArgumentNullException.ThrowIfNull(row, nameof(rows));
            foreach (var p in row.Result.Parameters)
            {
                if (seen.Add(p.Key)) keys.Add(p.Key);
            }
        }
        return [.. keys];
    }

    /// <summary>The columns of results.csv for <paramref name="parameterKeys"/> (the CSV output adds <see cref="WorkColumns"/>).</summary>
    /// <param name="parameterKeys">Keys from <see cref="ParameterKeys"/>.</param>
    /// <returns>Column names in order.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="parameterKeys"/> is null.</exception>
    public static ImmutableArray<string> Columns(IReadOnlyList<string> parameterKeys)
    {
        ArgumentNullException.ThrowIfNull(parameterKeys);
        var columns = new List<string>(Leading);
        foreach (string key in parameterKeys)
        {
            foreach (string suffix in Suffixes) columns.Add(key + suffix);
        }
        columns.AddRange(Trailing);
        return [.. columns];
    }

    /// <summary>The rows as CSV text, header first.</summary>
    /// <param name="rows">Rows in output order.</param>
    /// <returns>The text, every line ending with a line feed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> or a row is null.</exception>
    public static string FormatCsv(IReadOnlyList<StoredResult> rows)
    {
        using var w = new StringWriter(Inv);
        WriteCsv(w, rows);
        return w.ToString();
    }

    /// <summary>Writes the rows as CSV to <paramref name="output"/>.</summary>
    /// <param name="output">Where the text goes (standard output or a file); not closed.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <exception cref="ArgumentNullException">An argument or a row is null.</exception>
    public static void WriteCsv(TextWriter output, IReadOnlyList<StoredResult> rows)
    {
        // One writer for results.csv everywhere: the rows go through the same formatter as batch's file.
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(rows);
        output.Write(ResultsCsv.Format([.. rows.Select(r => Lots.ResultRow.FromFitResult(r.Result))], WorkColumns,
            i => [rows[i].FittedBy ?? "", rows[i].FittedAt is DateTimeOffset t ? Time(t) : ""]));
    }

    /// <summary>Writes one JSON object per row, each on its own line.</summary>
    /// <param name="output">Where the text goes; not closed.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <exception cref="ArgumentNullException">An argument or a row is null.</exception>
    public static void WriteJsonLines(TextWriter output, IReadOnlyList<StoredResult> rows)
    {
        ArgumentNullException.ThrowIfNull(output);
        var keys = ParameterKeys(rows);
        foreach (var row in rows)
        {
            output.Write(FormatJsonLine(row, keys));
            output.Write('\n');
        }
    }

    /// <summary>One row as a JSON object on one line (no line feed).</summary>
    /// <param name="row">The row.</param>
    /// <param name="parameterKeys">Parameter keys to write (a missing parameter gives nulls); null: the standard four and the row's own.</param>
    /// <returns>The JSON text.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="row"/> is null.</exception>
    public static string FormatJsonLine(StoredResult row, IReadOnlyList<string>? parameterKeys = null)
    {
        ArgumentNullException.ThrowIfNull(row);
        parameterKeys ??= ParameterKeys([row]);
        var r = row.Result;
        var buffer = new ArrayBufferWriter<byte>(1024);
        using (var w = new Utf8JsonWriter(buffer))
        {
            w.WriteStartObject();
            w.WriteString("file", r.SourcePath);
            StringOrNull(w, "lot", r.Lot);
            StringOrNull(w, "wafer", r.Wafer);
            IntOrNull(w, "die_x", r.DieX);
            IntOrNull(w, "die_y", r.DieY);
            w.WriteString("model", r.Model);
            w.WriteString("status", FitJsonFormatter.StatusText(r.Status));
            foreach (string key in parameterKeys)
            {
                var p = r.Find(key);
                NumberOrNull(w, key, p?.Value);
                NumberOrNull(w, key + "_stderr", p?.StandardError);
                NumberOrNull(w, key + "_lo", p?.Lower95);
                NumberOrNull(w, key + "_hi", p?.Upper95);
            }
            NumberOrNull(w, "reduced_chi2", r.Quality?.ReducedChiSquare);
            NumberOrNull(w, "transition_voltage_V", r.TransitionVoltageV);
            w.WriteStartArray("warnings");
            foreach (string warning in r.Warnings) w.WriteStringValue(warning);
            w.WriteEndArray();
            StringOrNull(w, "error", r.Error);
            IntOrNull(w, "points_used", r.Quality?.PointsUsed);
            IntOrNull(w, "points_masked", r.Quality?.PointsMasked);
            w.WriteString("file_sha256", row.Key.FileSha256);
            w.WriteString("options_hash", row.Key.OptionsHash);
            w.WriteString("run_id", row.Run.RunId);
            w.WriteString("run_started_utc", row.Run.StartedUtc.ToUniversalTime().ToString("O", Inv));
            w.WriteString("tool_version", row.Run.ToolVersion);
            StringOrNull(w, "host", row.Run.Host);
            StringOrNull(w, "stored_utc", row.StoredUtc?.ToUniversalTime().ToString("O", Inv));
            StringOrNull(w, "fitted_by", row.FittedBy);
            StringOrNull(w, "fitted_at", row.FittedAt is DateTimeOffset t ? Time(t) : null);
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }

    private static void AppendRecord(StringBuilder sb, IReadOnlyList<string> fields)
    {
        for (int i = 0; i < fields.Count; i++)
        {
            if (i > 0) sb.Append(',');
            string f = fields[i];
            bool quote = f.Length > 0 && (f.AsSpan().IndexOfAny(",\"\r\n") >= 0 || f[0] == ' ' || f[^1] == ' ');
            if (quote) sb.Append('"').Append(f.Replace("\"", "\"\"", StringComparison.Ordinal)).Append('"');
            else sb.Append(f);
        }
        sb.Append('\n');
    }

    private static string CellWarning(string warning) => OneLine(warning).Replace(WarningSeparator, " / ", StringComparison.Ordinal);

    private static string OneLine(string s) => s.Contains('\n', StringComparison.Ordinal) || s.Contains('\r', StringComparison.Ordinal)
        ? s.Replace("\r\n", " ", StringComparison.Ordinal).Replace('\n', ' ').Replace('\r', ' ')
        : s;

    private static string Time(DateTimeOffset t) => t.ToUniversalTime().ToString("O", Inv);

    private static string Number(double? x) => x is double v ? v.ToString("R", Inv) : "";

    private static string Integer(int? x) => x is int v ? v.ToString(Inv) : "";

    private static void NumberOrNull(Utf8JsonWriter w, string name, double? value)
    {
        if (value is double v && double.IsFinite(v)) w.WriteNumber(name, v); else w.WriteNull(name);
    }

    private static void IntOrNull(Utf8JsonWriter w, string name, int? value)
    {
        if (value is int v) w.WriteNumber(name, v); else w.WriteNull(name);
    }

    private static void StringOrNull(Utf8JsonWriter w, string name, string? value)
    {
        if (value is null) w.WriteNull(name); else w.WriteString(name, value);
    }
}
