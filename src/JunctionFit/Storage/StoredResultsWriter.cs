using System.Buffers;
using System.Collections.Immutable;
using System.Globalization;
using System.Text;
using System.Text.Json;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// Stored results as the <c>results</c> command prints them, through the columns of <see cref="ResultSchema"/>: CSV with
/// the columns of a batch's <c>results.csv</c> without <c>plot</c> (the database keeps no plot) and with
/// <c>fitted_by, fitted_at</c> before <c>option_set</c>, or one JSON object per line.
/// <para>
/// CSV columns, in order: <c>file, lot, wafer, die_x, die_y, model, status</c>; for each parameter key K —
/// <c>barrier_height_eV, thickness_nm, area_m2, mass_ratio</c> always, then any other key in order of first appearance —
/// <c>K, K_stderr, K_lo, K_hi</c> in the key's unit; then <c>reduced_chi2, transition_voltage_V, warnings, error</c>; then
/// <c>fitted_by</c> (the worker, <c>host:pid</c> or <c>NAME@host:pid</c>), <c>fitted_at</c> (ISO 8601 UTC) and
/// <c>option_set</c> (the canonical options text, lines joined with <c>"; "</c>). Cells are written by
/// <see cref="ResultTableWriter"/>; lines end with a line feed.
/// </para>
/// <para>
/// A JSON line has the same keys with <c>points_used, points_masked</c> after <c>reduced_chi2</c> (numbers as numbers,
/// unknown as <c>null</c>, <c>warnings</c> as an array, <c>error</c> null unless failed), followed by <c>file_sha256,
/// options_hash, run_id, run_started_utc, tool_version, host, stored_utc</c>.
/// </para>
/// </summary>
public static class StoredResultsWriter
{
    /// <summary>The optional column groups of the CSV output.</summary>
    public const ResultColumnGroups CsvGroups = ResultColumnGroups.Work | ResultColumnGroups.OptionSet;

    /// <summary>The optional column groups of the JSON output.</summary>
    public const ResultColumnGroups JsonGroups = ResultColumnGroups.Points | ResultColumnGroups.Work | ResultColumnGroups.OptionSet;

    /// <summary>Parameter keys in column order: the standard four, then others in order of first appearance.</summary>
    /// <param name="rows">The rows.</param>
    /// <returns>The keys.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> or a row is null.</exception>
    public static ImmutableArray<string> ParameterKeys(IReadOnlyList<StoredResult> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        foreach (var row in rows) ArgumentNullException.ThrowIfNull(row, nameof(rows));
        return ResultSchema.ParameterKeys(rows.Select(r => r.Result.Parameters.Select(p => p.Key)), withStandard: true);
    }

    /// <summary>The CSV column names for <paramref name="parameterKeys"/>.</summary>
    /// <param name="parameterKeys">Keys from <see cref="ParameterKeys"/>.</param>
    /// <returns>Column names in order.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="parameterKeys"/> is null.</exception>
    public static ImmutableArray<string> Columns(IReadOnlyList<string> parameterKeys)
        => [.. ResultSchema.Columns(parameterKeys, CsvGroups).Select(c => c.Name)];

    /// <summary>The rows as CSV text, header first.</summary>
    /// <param name="rows">Rows in output order.</param>
    /// <returns>The text, every line ending with a line feed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> or a row is null.</exception>
    public static string FormatCsv(IReadOnlyList<StoredResult> rows)
    {
        using var w = new StringWriter(CultureInfo.InvariantCulture);
        WriteCsv(w, rows);
        return w.ToString();
    }

    /// <summary>Writes the rows as CSV to <paramref name="output"/>.</summary>
    /// <param name="output">Where the text goes (standard output or a file); not closed.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <exception cref="ArgumentNullException">An argument or a row is null.</exception>
    public static void WriteCsv(TextWriter output, IReadOnlyList<StoredResult> rows)
    {
        ArgumentNullException.ThrowIfNull(output);
        var columns = ResultSchema.Columns(ParameterKeys(rows), CsvGroups);
        using var buffer = new MemoryStream();
        ResultTableWriter.WriteCsv(buffer, columns, rows.Select(r => r.ToRow()), ResultsCsv.NewLine);
        output.Write(new UTF8Encoding(false).GetString(buffer.GetBuffer(), 0, (int)buffer.Length));
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
        var buffer = new ArrayBufferWriter<byte>(1024);
        using (var w = new Utf8JsonWriter(buffer))
        {
            w.WriteStartObject();
            ResultTableWriter.WriteJsonFields(w, ResultSchema.Columns(parameterKeys, JsonGroups), row.ToRow());
            w.WriteString("file_sha256", row.Key.FileSha256);
            w.WriteString("options_hash", row.Key.OptionsHash);
            w.WriteString("run_id", row.Run.RunId);
            w.WriteString("run_started_utc", ResultSchema.TimeText(row.Run.StartedUtc));
            w.WriteString("tool_version", row.Run.ToolVersion);
            if (row.Run.Host is null) w.WriteNull("host"); else w.WriteString("host", row.Run.Host);
            if (row.StoredUtc is DateTimeOffset t) w.WriteString("stored_utc", ResultSchema.TimeText(t)); else w.WriteNull("stored_utc");
            w.WriteEndObject();
        }
        return Encoding.UTF8.GetString(buffer.WrittenSpan);
    }
}
