using System.Collections.Immutable;
using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// The lot results table, <c>OUTDIR/results.csv</c>: one row per I–V file, written by <see cref="ResultTableWriter"/>
/// with the columns of <see cref="ResultSchema"/> and the groups <see cref="Groups"/> (<c>option_set</c>, <c>plot</c>);
/// lines end with a line feed.
/// <para>Columns, in order:</para>
/// <list type="number">
/// <item><c>file, lot, wafer, die_x, die_y, model, status</c> (status: <c>ok</c>, <c>poor-fit</c>, <c>failed</c>);</item>
/// <item>for each parameter key K — <c>barrier_height_eV, thickness_nm, area_m2, mass_ratio</c> always, then any
/// other key — the four columns <c>K, K_stderr, K_lo, K_hi</c> (value, standard error, 95 % interval), in the
/// key's unit; a fixed parameter has its value and empty stderr/lo/hi;</item>
/// <item><c>reduced_chi2, transition_voltage_V, warnings, error, option_set, plot</c>; warnings are joined with <c> | </c>,
/// the option set's lines with <c>; </c>, the plot is relative to the output folder (empty when none was written).</item>
/// </list>
/// Reading accepts extra columns (ignored) and any column order; a missing required column, a row with the wrong
/// number of fields or a cell that is not a number throws <see cref="ResultsFormatException"/> naming file and line.
/// </summary>
public static class ResultsCsv
{
    /// <summary>File name inside the output folder.</summary>
    public const string FileName = "results.csv";

    /// <summary>Line ending of the file.</summary>
    public const string NewLine = "\n";

    /// <summary>The optional column groups of results.csv.</summary>
    public const ResultColumnGroups Groups = ResultColumnGroups.OptionSet | ResultColumnGroups.Plot;

    /// <summary>Columns a file must have to be read (<c>error</c>, <c>option_set</c> and <c>plot</c> are optional).</summary>
    public static ImmutableArray<string> RequiredColumns { get; } =
        [.. ResultSchema.LeadingNames, .. ResultSchema.TrailingNames.Where(n => n != "error")];

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The header for <paramref name="parameterKeys"/>.</summary>
    /// <param name="parameterKeys">Parameter keys in column order.</param>
    /// <returns>All column names.</returns>
    public static ImmutableArray<string> Columns(IReadOnlyList<string> parameterKeys)
        => [.. ResultSchema.Columns(parameterKeys, Groups).Select(c => c.Name)];

    /// <summary>The table as text (header and one line per row).</summary>
    /// <param name="rows">Rows in output order.</param>
    /// <returns>CSV text ending with a line feed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> is null.</exception>
    public static string Format(IReadOnlyList<ResultRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        return ResultTableWriter.FormatCsv(ResultSchema.Columns(ResultRow.ParameterKeysOf(rows), Groups), rows, NewLine);
    }

    /// <summary>Starts results.csv on <paramref name="destination"/> for streaming output with fixed parameter keys (the header is written).</summary>
    /// <param name="destination">Where the bytes go; stays open.</param>
    /// <param name="parameterKeys">Parameter keys in column order; a parameter missing from a row is empty cells.</param>
    /// <returns>The table; write rows, then dispose.</returns>
    public static ResultCsvStream Open(Stream destination, IReadOnlyList<string> parameterKeys)
        => new(destination, ResultSchema.Columns(parameterKeys, Groups), NewLine);

    /// <summary>Writes the table to <paramref name="path"/> atomically (<see cref="AtomicFile"/>).</summary>
    /// <param name="path">Target file, usually <c>OUTDIR/results.csv</c>; its directory is created when missing.</param>
    /// <param name="rows">Rows in output order.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void Write(string path, IReadOnlyList<ResultRow> rows)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var columns = ResultSchema.Columns(ResultRow.ParameterKeysOf(rows), Groups);
        AtomicFile.Write(path, stream => ResultTableWriter.WriteCsv(stream, columns, rows, NewLine));
    }

    /// <summary>Reads a results file.</summary>
    /// <param name="path">The file.</param>
    /// <returns>Rows in file order.</returns>
    /// <exception cref="ResultsFormatException">The file is empty, lacks a column, or holds a bad cell.</exception>
    /// <exception cref="IOException">The file cannot be opened.</exception>
    public static ImmutableArray<ResultRow> Read(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        using var reader = new StreamReader(path, AtomicFile.Utf8NoBom, detectEncodingFromByteOrderMarks: true);
        return Read(reader, path);
    }

    /// <summary>Reads several results files (for drift over lots kept in separate files), rows in file order.</summary>
    /// <param name="paths">The files.</param>
    /// <returns>All rows.</returns>
    /// <exception cref="ResultsFormatException">A file is empty, lacks a column, or holds a bad cell.</exception>
    /// <exception cref="IOException">A file cannot be opened.</exception>
    public static ImmutableArray<ResultRow> ReadAll(IEnumerable<string> paths)
    {
        ArgumentNullException.ThrowIfNull(paths);
        var all = ImmutableArray.CreateBuilder<ResultRow>();
        foreach (string path in paths) all.AddRange(Read(path));
        return all.ToImmutable();
    }

    /// <summary>Reads a results table from <paramref name="reader"/>.</summary>
    /// <param name="reader">The text.</param>
    /// <param name="path">Name used in error messages.</param>
    /// <returns>Rows in file order.</returns>
    /// <exception cref="ResultsFormatException">The text is empty, lacks a column, or holds a bad cell.</exception>
    public static ImmutableArray<ResultRow> Read(TextReader reader, string path)
    {
        ArgumentNullException.ThrowIfNull(reader);
        ArgumentNullException.ThrowIfNull(path);
        using var records = CsvText.Read(reader, path, ',').GetEnumerator();
        if (!records.MoveNext())
        {
            throw new ResultsFormatException(path, 1, "the file is empty; a results table starts with a header line (file,lot,wafer,…)");
        }
        var header = records.Current;
        var index = HeaderIndex(header, path);
        var missing = RequiredColumns.Where(c => !index.ContainsKey(c)).ToList();
        if (missing.Count > 0)
        {
            string list = string.Join(", ", missing.Select(m => $"'{m}'"));
            throw new ResultsFormatException(path, header.Line,
                $"missing column{(missing.Count == 1 ? "" : "s")} {list}; a results table needs {string.Join(",", RequiredColumns)} and K,K_stderr,K_lo,K_hi per parameter",
                rawText: header.Raw);
        }
        var keys = ParameterKeysOf(header, index, path);
        int? errorColumn = index.TryGetValue("error", out int ec) ? ec : null;

        var rows = ImmutableArray.CreateBuilder<ResultRow>();
        while (records.MoveNext())
        {
            var record = records.Current;
            if (record.Fields.Length != header.Fields.Length)
            {
                throw new ResultsFormatException(path, record.Line,
                    string.Create(Inv, $"{record.Fields.Length} fields, but the header has {header.Fields.Length}"), rawText: record.Raw);
            }
            rows.Add(ParseRow(record, index, keys, errorColumn, path));
        }
        return rows.ToImmutable();
    }

    private static Dictionary<string, int> HeaderIndex(CsvText.Record header, string path)
    {
        var index = new Dictionary<string, int>(StringComparer.Ordinal);
        for (int i = 0; i < header.Fields.Length; i++)
        {
            string name = header.Fields[i].Trim();
            if (name.Length == 0) continue;
            if (!index.TryAdd(name, i))
            {
                throw new ResultsFormatException(path, header.Line, $"column '{name}' appears twice", i + 1, header.Raw);
            }
        }
        return index;
    }

    /// <summary>Parameter keys: every K with a K_stderr column, in header order; K, K_lo and K_hi must exist too.</summary>
    private static List<string> ParameterKeysOf(CsvText.Record header, Dictionary<string, int> index, string path)
    {
        var keys = new List<string>();
        foreach (var (name, _) in index.OrderBy(kv => kv.Value))
        {
            string? key = null;
            foreach (string suffix in ResultSchema.ParameterSuffixes.AsSpan()[1..])
            {
                if (name.EndsWith(suffix, StringComparison.Ordinal) && name.Length > suffix.Length) key = name[..^suffix.Length];
            }
            if (key is null || keys.Contains(key)) continue;
            if (!index.ContainsKey(key + "_stderr") && !index.ContainsKey(key)) continue; // e.g. a "..._hi" column of something else
            var absent = ResultSchema.ParameterSuffixes.Select(s => key + s).Where(c => !index.ContainsKey(c)).ToList();
            if (absent.Count > 0)
            {
                throw new ResultsFormatException(path, header.Line,
                    $"parameter '{key}' lacks column{(absent.Count == 1 ? "" : "s")} {string.Join(", ", absent.Select(a => $"'{a}'"))}; each parameter needs K,K_stderr,K_lo,K_hi",
                    rawText: header.Raw);
            }
            keys.Add(key);
        }
        return [.. keys.OrderBy(ResultSchema.KeyRank)];
    }

    private static ResultRow ParseRow(CsvText.Record record, Dictionary<string, int> index, List<string> keys, int? errorColumn, string path)
    {
        string Cell(string column) => record.Fields[index[column]].Trim();

        string file = Cell("file");
        if (file.Length == 0) throw new ResultsFormatException(path, record.Line, "the 'file' cell is empty", index["file"] + 1, record.Raw);
        var parameters = new List<RowParameter>(keys.Count);
        foreach (string key in keys)
        {
            double? value = Number(record, index, key, path);
            double? se = Number(record, index, key + "_stderr", path);
            double? lo = Number(record, index, key + "_lo", path);
            double? hi = Number(record, index, key + "_hi", path);
            bool? isFixed = index.TryGetValue(key + ResultSchema.FixedSuffix, out int fc) ? Boolean(record, fc, key + ResultSchema.FixedSuffix, path) : null;
            if (value is not null || se is not null || lo is not null || hi is not null) parameters.Add(new RowParameter(key, value, se, lo, hi) { IsFixed = isFixed });
        }
        string warnings = Cell("warnings");
        string? error = errorColumn is int ec ? record.Fields[ec].Trim() : null;
        return new ResultRow
        {
            File = file,
            Lot = NullIfEmpty(Cell("lot")),
            Wafer = NullIfEmpty(Cell("wafer")),
            DieX = Integer(record, index, "die_x", path),
            DieY = Integer(record, index, "die_y", path),
            Model = Cell("model"),
            Status = Status(record, index, path),
            Parameters = [.. parameters],
            ReducedChiSquare = Number(record, index, "reduced_chi2", path),
            TransitionVoltageV = Number(record, index, "transition_voltage_V", path),
            Warnings = warnings.Length == 0 ? [] : [.. warnings.Split(ResultSchema.WarningSeparator, StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries)],
            Error = string.IsNullOrEmpty(error) ? null : error,
            OptionSet = index.TryGetValue("option_set", out int oc) ? ResultSchema.OptionSetFromCell(record.Fields[oc]) : null,
            Plot = index.TryGetValue("plot", out int pc) ? NullIfEmpty(record.Fields[pc].Trim()) : null,
            PointsUsed = index.ContainsKey("points_used") ? Integer(record, index, "points_used", path) : null,
            PointsMasked = index.ContainsKey("points_masked") ? Integer(record, index, "points_masked", path) : null,
        };
    }

    private static FitStatus Status(CsvText.Record record, Dictionary<string, int> index, string path)
    {
        int col = index["status"];
        string text = record.Fields[col].Trim();
        return ResultSchema.TryParseStatus(text, out var status)
            ? status
            : throw new ResultsFormatException(path, record.Line, $"status '{text}' is not ok, poor-fit or failed", col + 1, record.Raw);
    }

    private static bool? Boolean(CsvText.Record record, int col, string column, string path)
    {
        string text = record.Fields[col].Trim();
        if (text.Length == 0) return null;
        if (bool.TryParse(text, out bool b)) return b;
        throw new ResultsFormatException(path, record.Line, $"'{text}' in column {column} is not true or false", col + 1, record.Raw);
    }

    private static double? Number(CsvText.Record record, Dictionary<string, int> index, string column, string path)
    {
        int col = index[column];
        string text = record.Fields[col].Trim();
        if (text.Length == 0) return null;
        if (double.TryParse(text, NumberStyles.Float, Inv, out double v)) return v;
        throw new ResultsFormatException(path, record.Line, $"'{text}' in column {column} is not a number", col + 1, record.Raw);
    }

    private static int? Integer(CsvText.Record record, Dictionary<string, int> index, string column, string path)
    {
        int col = index[column];
        string text = record.Fields[col].Trim();
        if (text.Length == 0) return null;
        if (int.TryParse(text, NumberStyles.Integer, Inv, out int v)) return v;
        throw new ResultsFormatException(path, record.Line, $"'{text}' in column {column} is not a whole number", col + 1, record.Raw);
    }

    private static string? NullIfEmpty(string s) => s.Length == 0 ? null : s;
}
