using System.Collections.Immutable;
using System.Globalization;
using System.Text.Json;
using CsvHelper;

namespace JunctionFit.Results;

/// <summary>
/// The one writer of result tables: CSV (CsvHelper, RFC 4180, UTF-8 without a byte-order mark; a cell with a comma, a
/// quote, a line break or an edge space is quoted) and the fields of a JSON object, both from the columns of
/// <see cref="ResultSchema"/>. In CSV numbers are invariant shortest round-trip text, an unknown value is an empty cell,
/// line breaks inside a cell become spaces, warnings are joined with <c>" | "</c> (a <c>" | "</c> inside a warning becomes
/// <c>" / "</c>). In JSON numbers are numbers (not finite: null), unknown values null, warnings an array.
/// </summary>
public static class ResultTableWriter
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The CSV options of the result tables with line ending <paramref name="newLine"/>.</summary>
    /// <param name="newLine"><c>"\n"</c> or <c>"\r\n"</c>.</param>
    /// <returns>The options.</returns>
    public static CsvWriterOptions CsvOptions(string newLine) => CsvWriterOptions.Default with
    {
        NewLine = newLine,
        Quoting = CsvQuoting.WhenNeededOrWhitespace,
        FormatProvider = Inv,
    };

    /// <summary>Writes a header and one record per row as CSV to <paramref name="destination"/>, which stays open.</summary>
    /// <param name="destination">Where the UTF-8 bytes go.</param>
    /// <param name="columns">Columns from <see cref="ResultSchema.Columns"/>.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <param name="newLine">Line ending: <c>"\n"</c> or <c>"\r\n"</c>.</param>
    /// <exception cref="ArgumentNullException">An argument or a row is null.</exception>
    public static void WriteCsv(Stream destination, IReadOnlyList<ResultColumn> columns, IEnumerable<ResultRow> rows, string newLine)
    {
        ArgumentNullException.ThrowIfNull(destination);
        ArgumentNullException.ThrowIfNull(rows);
        using var table = new ResultCsvStream(destination, columns, newLine);
        foreach (var row in rows) table.Write(row);
    }

    /// <summary>The table as CSV text (see <see cref="WriteCsv(Stream, IReadOnlyList{ResultColumn}, IEnumerable{ResultRow}, string)"/>).</summary>
    /// <param name="columns">Columns.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <param name="newLine">Line ending.</param>
    /// <returns>The text.</returns>
    public static string FormatCsv(IReadOnlyList<ResultColumn> columns, IEnumerable<ResultRow> rows, string newLine)
    {
        using var buffer = new MemoryStream();
        WriteCsv(buffer, columns, rows, newLine);
        return new System.Text.UTF8Encoding(false).GetString(buffer.GetBuffer(), 0, (int)buffer.Length);
    }

    /// <summary>The text of one cell as the CSV tables write it.</summary>
    /// <param name="column">The column.</param>
    /// <param name="row">The row.</param>
    /// <returns>The cell text (empty for an unknown value).</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public static string CellText(ResultColumn column, ResultRow row)
    {
        ArgumentNullException.ThrowIfNull(column);
        ArgumentNullException.ThrowIfNull(row);
        return column.Value(row) switch
        {
            null => "",
            string s => OneLine(s),
            int i => i.ToString(Inv),
            double d => d.ToString("R", Inv),
            bool b => b ? "true" : "false",
            ImmutableArray<string> list => string.Join(ResultSchema.WarningSeparator,
                list.Select(w => OneLine(w).Replace(ResultSchema.WarningSeparator, " / ", StringComparison.Ordinal))),
            var other => Convert.ToString(other, Inv) ?? "",
        };
    }

    /// <summary>Writes the columns of <paramref name="row"/> as properties of the JSON object being written.</summary>
    /// <param name="writer">A writer inside an object.</param>
    /// <param name="columns">Columns from <see cref="ResultSchema.Columns"/>.</param>
    /// <param name="row">The row.</param>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public static void WriteJsonFields(Utf8JsonWriter writer, IReadOnlyList<ResultColumn> columns, ResultRow row)
    {
        ArgumentNullException.ThrowIfNull(writer);
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(row);
        foreach (var column in columns)
        {
            switch (column.Value(row))
            {
                case string s: writer.WriteString(column.Name, s); break;
                case int i: writer.WriteNumber(column.Name, i); break;
                case double d when double.IsFinite(d): writer.WriteNumber(column.Name, d); break;
                case bool b: writer.WriteBoolean(column.Name, b); break;
                case ImmutableArray<string> list:
                    writer.WriteStartArray(column.Name);
                    foreach (string item in list) writer.WriteStringValue(item);
                    writer.WriteEndArray();
                    break;
                default: writer.WriteNull(column.Name); break;
            }
        }
    }

    /// <summary>Line breaks become spaces, so every record stays on one line of the file.</summary>
    internal static string OneLine(string s) => s.Contains('\n', StringComparison.Ordinal) || s.Contains('\r', StringComparison.Ordinal)
        ? s.Replace("\r\n", " ", StringComparison.Ordinal).Replace('\n', ' ').Replace('\r', ' ')
        : s;
}

/// <summary>
/// A result table written row by row (batch streams results.csv in input order): the header on creation, then a
/// record per <see cref="Write"/>. Disposing flushes; the destination stays open.
/// </summary>
[System.Diagnostics.CodeAnalysis.SuppressMessage("Naming", "CA1711", Justification = "A stream of result rows; the name is public API used by batch.")]
public sealed class ResultCsvStream : IDisposable
{
    private readonly CsvWriter _csv;
    private readonly ImmutableArray<ResultColumn> _columns;
    private readonly string[] _fields;

    /// <summary>Starts the table and writes its header.</summary>
    /// <param name="destination">Where the UTF-8 bytes go; stays open.</param>
    /// <param name="columns">Columns from <see cref="ResultSchema.Columns"/>.</param>
    /// <param name="newLine">Line ending: <c>"\n"</c> or <c>"\r\n"</c>.</param>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public ResultCsvStream(Stream destination, IReadOnlyList<ResultColumn> columns, string newLine)
    {
        ArgumentNullException.ThrowIfNull(destination);
        ArgumentNullException.ThrowIfNull(columns);
        ArgumentNullException.ThrowIfNull(newLine);
        _columns = [.. columns];
        _fields = new string[_columns.Length];
        _csv = CsvWriter.Create(destination, ResultTableWriter.CsvOptions(newLine), leaveOpen: true);
        _csv.WriteHeader([.. _columns.Select(c => c.Name)]);
    }

    /// <summary>Writes one row.</summary>
    /// <param name="row">The row.</param>
    /// <exception cref="ArgumentNullException"><paramref name="row"/> is null.</exception>
    public void Write(ResultRow row)
    {
        ArgumentNullException.ThrowIfNull(row);
        for (int i = 0; i < _columns.Length; i++) _fields[i] = ResultTableWriter.CellText(_columns[i], row);
        _csv.WriteRecord(_fields);
    }

    /// <summary>Pushes what is written to the destination.</summary>
    public void Flush() => _csv.Flush();

    /// <summary>Flushes and releases the writer (not the destination).</summary>
    public void Dispose()
    {
        _csv.Flush();
        _csv.Dispose();
    }
}
