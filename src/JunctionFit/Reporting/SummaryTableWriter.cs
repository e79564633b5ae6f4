using System.Globalization;
using System.Text;
using JunctionFit.Common;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>
/// The one-row-per-file summary as CSV (for spreadsheets and scripts) and as a fixed-width text table
/// (for the console).
/// <para>
/// CSV columns (<see cref="ResultSchema"/> with <see cref="Groups"/>), in order: <c>file, lot, wafer, die_x, die_y, model,
/// status</c>; then for every parameter key K that occurs in any result (the standard keys first, then others in order of
/// first appearance): <c>K, K_stderr, K_lo, K_hi, K_fixed</c>; then <c>reduced_chi2, points_used, points_masked,
/// transition_voltage_V, warnings, error</c>. Values are in the unit their key names (area in m²), written by
/// <see cref="ResultTableWriter"/>; <c>K_fixed</c> is <c>true</c>/<c>false</c>; lines end with CRLF.
/// </para>
/// </summary>
public static class SummaryTableWriter
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>The optional column groups of summary.csv.</summary>
    public const ResultColumnGroups Groups = ResultColumnGroups.Fixed | ResultColumnGroups.Points;

    /// <summary>Line ending of summary.csv.</summary>
    public const string NewLine = "\r\n";

    /// <summary>The CSV columns for <paramref name="results"/>.</summary>
    /// <param name="results">The results that will be written.</param>
    /// <returns>Columns in order.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> is null.</exception>
    public static IReadOnlyList<ResultColumn> CsvColumns(IReadOnlyList<FitResult> results)
    {
        ArgumentNullException.ThrowIfNull(results);
        foreach (var r in results) ArgumentNullException.ThrowIfNull(r, nameof(results));
        return ResultSchema.Columns(ResultSchema.ParameterKeys(results.Select(r => r.Parameters.Select(p => p.Key)), withStandard: false), Groups);
    }

    /// <summary>The CSV header for <paramref name="results"/>.</summary>
    /// <param name="results">The results that will be written.</param>
    /// <returns>Column names in order.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> is null.</exception>
    public static IReadOnlyList<string> CsvHeader(IReadOnlyList<FitResult> results) => [.. CsvColumns(results).Select(c => c.Name)];

    /// <summary>The summary of <paramref name="results"/> as CSV text.</summary>
    /// <param name="results">One row per result, in the given order.</param>
    /// <returns>The CSV text including the header line.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> or one of its items is null.</exception>
    public static string ToCsv(IReadOnlyList<FitResult> results)
    {
        using var buffer = new MemoryStream();
        WriteCsv(buffer, results);
        return AtomicFile.Utf8NoBom.GetString(buffer.GetBuffer(), 0, (int)buffer.Length);
    }

    /// <summary>Writes the CSV summary as UTF-8 to <paramref name="destination"/>, which stays open.</summary>
    /// <param name="destination">Where the bytes go, from its current position.</param>
    /// <param name="results">One row per result, in the given order.</param>
    /// <exception cref="ArgumentNullException">An argument or one of the results is null.</exception>
    public static void WriteCsv(Stream destination, IReadOnlyList<FitResult> results)
    {
        ArgumentNullException.ThrowIfNull(destination);
        var columns = CsvColumns(results);
        ResultTableWriter.WriteCsv(destination, columns, results.Select(ResultRow.FromFitResult), NewLine);
    }

    /// <summary>Writes the CSV summary to <paramref name="path"/> atomically (see <see cref="AtomicFile"/>).</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="results">One row per result.</param>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> is null.</exception>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WriteCsv(string path, IReadOnlyList<FitResult> results)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        ArgumentNullException.ThrowIfNull(results);
        AtomicFile.Write(path, stream => WriteCsv(stream, results));
    }

    /// <summary>
    /// A plain-text table for the console: file, status, φ (eV), d (nm), area (µm²) each with its 95 % interval
    /// in brackets or "(fixed)", then one column for every other parameter that is free in at least one result (Δφ, R_s,
    /// G_leak, …, headed by its key with the unit in brackets, in order of first appearance), reduced χ², transition
    /// voltage and the number of warnings; a failed row shows its error in the last column. Columns are padded with spaces, numbers right-aligned; long file names are
    /// shortened from the left (the end of a path names the die). Lines end with "\n".
    /// </summary>
    /// <param name="results">One row per result.</param>
    /// <returns>The table, header and rule first; "(no results)" for an empty list.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> or one of its items is null.</exception>
    public static string FormatConsoleTable(IReadOnlyList<FitResult> results)
    {
        ArgumentNullException.ThrowIfNull(results);
        if (results.Count == 0) return "(no results)\n";
        const int maxFileWidth = 40;
        foreach (var r in results) ArgumentNullException.ThrowIfNull(r, nameof(results));
        var extra = ExtraFreeParameters(results);
        string[] header = ["file", "status", "phi (eV)", "d (nm)", "area (um2)", .. extra.Select(ConsoleHeader), "red.chi2", "Vt (V)", "warn", "note"];
        bool[] right = [false, false, true, true, true, .. extra.Select(_ => true), true, true, true, false];
        var rows = new List<string[]>(results.Count);
        foreach (var r in results)
        {
            rows.Add(
            [
                ShortenLeft(OneLine(r.SourcePath), maxFileWidth),
                ResultSchema.StatusText(r.Status),
                ConsoleQuantity(r, SummaryRow.BarrierHeightKey),
                ConsoleQuantity(r, SummaryRow.ThicknessKey),
                ConsoleQuantity(r, SummaryRow.AreaKey),
                .. extra.Select(p => ConsoleQuantity(r, p.Key)),
                SummaryRow.ChiText(r).Replace("—", "-", StringComparison.Ordinal),
                SummaryRow.TransitionText(r).Replace("—", "-", StringComparison.Ordinal),
                r.Warnings.Length.ToString(Inv),
                r.Status == FitStatus.Ok ? "" : OneLine(r.StatusReason ?? r.Error ?? ResultSchema.StatusText(r.Status)),
            ]);
        }
        var width = new int[header.Length];
        for (int c = 0; c < header.Length; c++)
        {
            width[c] = header[c].Length;
            foreach (var row in rows) width[c] = Math.Max(width[c], row[c].Length);
        }
        var sb = new StringBuilder();
        AppendRow(sb, header, width, right);
        for (int c = 0; c < header.Length; c++)
        {
            if (c > 0) sb.Append("  ");
            sb.Append('-', c == header.Length - 1 ? Math.Max(4, header[c].Length) : width[c]);
        }
        sb.Append('\n');
        foreach (var row in rows) AppendRow(sb, row, width, right);
        return sb.ToString();
    }

    /// <summary>Parameters beyond φ, d and A that are free in at least one result, in order of first appearance.</summary>
    private static List<ParameterEstimate> ExtraFreeParameters(IReadOnlyList<FitResult> results)
    {
        var found = new List<ParameterEstimate>();
        foreach (var r in results)
        {
            foreach (var p in r.Parameters)
            {
                if (p.IsFixed || p.Key == SummaryRow.BarrierHeightKey || p.Key == SummaryRow.ThicknessKey || p.Key == SummaryRow.AreaKey) continue;
                if (!found.Exists(q => q.Key == p.Key)) found.Add(p);
            }
        }
        return found;
    }

    /// <summary>
    /// ASCII header of a parameter column: a key names its unit in its last part when it has one
    /// (<c>series_resistance_ohm</c> → "series_resistance (ohm)"); a pure number keeps its key.
    /// </summary>
    private static string ConsoleHeader(ParameterEstimate p)
    {
        int last = p.Key.LastIndexOf('_');
        return p.Unit.Length > 0 && last > 0 ? $"{p.Key[..last]} ({p.Key[(last + 1)..]})" : p.Key;
    }

    private static void AppendRow(StringBuilder sb, string[] cells, int[] width, bool[] right)
    {
        var line = new StringBuilder();
        for (int c = 0; c < cells.Length; c++)
        {
            if (c > 0) line.Append("  ");
            bool last = c == cells.Length - 1;
            if (right[c]) line.Append(cells[c].PadLeft(width[c]));
            else line.Append(last ? cells[c] : cells[c].PadRight(width[c]));
        }
        sb.Append(line.ToString().TrimEnd()).Append('\n');
    }

    /// <summary>ASCII-only form, so that any console shows it: "2.0041 [1.9957, 2.0126]", "1 (fixed)" or "-".</summary>
    private static string ConsoleQuantity(FitResult r, string key)
    {
        if (r.Status == FitStatus.Failed) return "-";
        return SummaryRow.Quantity(r, key) is { } q ? q.Compact.Replace("−", "-", StringComparison.Ordinal).Replace("∞", "inf", StringComparison.Ordinal)
            .Replace("≥", ">=", StringComparison.Ordinal).Replace("≤", "<=", StringComparison.Ordinal) : "-";
    }

    private static string ShortenLeft(string text, int max)
        => text.Length <= max ? text : "..." + text[^(max - 3)..];

    private static string OneLine(string text) => text.ReplaceLineEndings(" ");
}
