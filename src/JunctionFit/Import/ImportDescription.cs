using System.Collections.Immutable;
using System.Globalization;
using System.Text;

namespace JunctionFit.Import;

/// <summary>One column of the table as the importer understood it.</summary>
/// <param name="Number">1-based column number.</param>
/// <param name="Header">Header text as written (empty without a header row).</param>
/// <param name="Role">What the importer does with the column.</param>
/// <param name="Unit">The unit used (for the voltage and current columns) or found (others); null if none.</param>
public sealed record ImportColumn(int Number, string Header, IvColumnRole Role, string? Unit)
{
    /// <summary>What the column holds, as far as its header tells (time, |J|, a terminal current …).</summary>
    public IvColumnKind Kind { get; init; }

    /// <summary>Why the column has its role, in words (e.g. <c>voltage by its name 'voltage' (suffix '_1_1' dropped)</c>).</summary>
    public string Reason { get; init; } = string.Empty;
}

/// <summary>One monotonic part of the sweep.</summary>
/// <param name="Number">0-based segment number, as in <see cref="IvCurve.Segments"/>.</param>
/// <param name="Points">Points kept in the segment.</param>
/// <param name="FromV">First voltage, in volt.</param>
/// <param name="ToV">Last voltage, in volt.</param>
/// <param name="FirstLine">1-based line of the first point.</param>
/// <param name="LastLine">1-based line of the last point.</param>
public sealed record ImportSegment(int Number, int Points, double FromV, double ToV, int FirstLine, int LastLine)
{
    /// <summary><c>up</c>, <c>down</c> or <c>flat</c>.</summary>
    public string Direction => ToV > FromV ? "up" : ToV < FromV ? "down" : "flat";
}

/// <summary>
/// What the importer understood about one file: layout, columns and roles, units, segments,
/// masked points, metadata and warnings, together with the curve itself. Immutable.
/// </summary>
public sealed record ImportDescription
{
    internal ImportDescription(ParseOutcome o)
    {
        Curve = o.Curve;
        Encoding = o.Encoding;
        LineEnd = o.LineEnd;
        Delimiter = o.Delimiter;
        DecimalSeparator = o.DecimalComma ? ',' : '.';
        PreambleLines = o.PreambleLines;
        FreeTextLines = o.FreeTextLines;
        HeaderLine = o.HeaderLine;
        HeaderInComment = o.HeaderInComment;
        UnitsLine = o.UnitsLine;
        FirstDataLine = o.FirstDataLine;
        LastDataLine = o.LastDataLine;
        Columns = o.Columns;
        VoltageColumn = o.VoltageColumn;
        CurrentColumn = o.CurrentColumn;
        VoltageUnit = o.VoltageUnit;
        CurrentUnit = o.CurrentUnit;
        SkippedLines = o.SkippedLines;
        MaskedPoints = o.MaskedPoints;
        TotalSegments = o.TotalSegments;
        TraceCount = o.TraceCount;
        AreaSource = o.AreaSource;
        StartVoltageV = o.StartVoltageV;
        Segments = BuildSegments(o.Curve);
    }

    /// <summary>The curve that was read.</summary>
    public IvCurve Curve { get; }

    /// <summary>The text encoding used to decode the file (e.g. <c>UTF-8 (BOM)</c>).</summary>
    public string Encoding { get; }

    /// <summary>Line ends found: <c>LF</c>, <c>CRLF</c>, <c>CR</c>, <c>mixed</c> or <c>none</c>.</summary>
    public string LineEnd { get; }

    /// <summary>Field delimiter; <c>' '</c> means runs of spaces and tabs.</summary>
    public char Delimiter { get; }

    /// <summary>Decimal separator seen in the numbers: <c>'.'</c> or <c>','</c>.</summary>
    public char DecimalSeparator { get; }

    /// <summary>Non-blank lines before the header (or before the data when there is no header).</summary>
    public int PreambleLines { get; }

    /// <summary>Preamble lines that were free text rather than <c>key: value</c>.</summary>
    public int FreeTextLines { get; }

    /// <summary>1-based line of the header row, if there is one.</summary>
    public int? HeaderLine { get; }

    /// <summary>Whether the header row was written as a comment (<c># V (V), I (A)</c>).</summary>
    public bool HeaderInComment { get; }

    /// <summary>1-based line of a separate units row, if there is one.</summary>
    public int? UnitsLine { get; }

    /// <summary>1-based line of the first data row.</summary>
    public int FirstDataLine { get; }

    /// <summary>1-based line of the last data row that was read.</summary>
    public int LastDataLine { get; }

    /// <summary>Every column with its role and unit.</summary>
    public ImmutableArray<ImportColumn> Columns { get; }

    /// <summary>1-based number of the voltage column.</summary>
    public int VoltageColumn { get; }

    /// <summary>1-based number of the current (or current-density) column.</summary>
    public int CurrentColumn { get; }

    /// <summary>Unit the voltage column was read in.</summary>
    public string VoltageUnit { get; }

    /// <summary>Unit the current column was read in.</summary>
    public string CurrentUnit { get; }

    /// <summary>Non-blank lines inside the table that were skipped.</summary>
    public int SkippedLines { get; }

    /// <summary>Points flagged in <see cref="IvCurve.ImportMask"/>.</summary>
    public int MaskedPoints { get; }

    /// <summary>Segments in the whole sweep (before any selection).</summary>
    public int TotalSegments { get; }

    /// <summary>
    /// Traces in the whole sweep: how often the same sweep was run one after the other (a new trace
    /// begins when the bias has come back to its start value and leaves it again the way it first did).
    /// </summary>
    public int TraceCount { get; }

    /// <summary>The first bias of the whole sweep (before any segment selection), in volt.</summary>
    public double StartVoltageV { get; }

    /// <summary>Where <see cref="IvCurve.AreaM2"/> came from (the option, the file's area line, I/J of two columns), or null.</summary>
    public string? AreaSource { get; }

    /// <summary>The segments kept in <see cref="Curve"/>.</summary>
    public ImmutableArray<ImportSegment> Segments { get; }

    /// <summary>A short name of the layout, e.g. <c>delimited (semicolon, decimal comma), header + units row</c>.</summary>
    public string Layout
    {
        get
        {
            var sb = new StringBuilder();
            sb.Append(Delimiter == ' ' ? "whitespace columns" : $"delimited ({IvTableParser.DelimiterName(Delimiter)}");
            if (Delimiter != ' ')
            {
                sb.Append(DecimalSeparator == ',' ? ", decimal comma)" : ")");
            }
            else if (DecimalSeparator == ',')
            {
                sb.Append(" (decimal comma)");
            }
            sb.Append(HeaderLine is null ? ", no header" : HeaderInComment ? ", header in a comment" : ", header");
            if (UnitsLine is not null)
            {
                sb.Append(" + units row");
            }
            if (PreambleLines > 0)
            {
                sb.Append(CultureInfo.InvariantCulture, $", {PreambleLines}-line preamble");
            }
            return sb.ToString();
        }
    }

    /// <summary>The description as plain text lines, for a terminal or a log.</summary>
    /// <returns>Lines without line ends.</returns>
    public ImmutableArray<string> ToTextLines()
    {
        CultureInfo inv = CultureInfo.InvariantCulture;
        var lines = ImmutableArray.CreateBuilder<string>();
        IvCurve c = Curve;
        lines.Add($"file: {c.SourcePath}");
        lines.Add($"layout: {Layout}");
        lines.Add($"encoding: {Encoding}; line ends: {LineEnd}");
        lines.Add($"delimiter: {IvTableParser.DelimiterName(Delimiter)}; decimal separator: '{DecimalSeparator}'");
        lines.Add(HeaderLine is int h ? string.Create(inv, $"header: line {h}{(UnitsLine is int u ? $"; units row: line {u}" : string.Empty)}") : "header: none (columns taken by position)");
        lines.Add(string.Create(inv, $"data: lines {FirstDataLine} to {LastDataLine}; {c.Count} points; {SkippedLines} lines skipped"));
        lines.Add("columns:");
        foreach (ImportColumn col in Columns)
        {
            string role = col.Role switch
            {
                IvColumnRole.Voltage => "voltage",
                IvColumnRole.Current => "current",
                IvColumnRole.CurrentDensity => "current density",
                _ => "ignored",
            };
            string header = col.Header.Length == 0 ? "(no header)" : $"'{col.Header}'";
            string why = col.Reason.Length == 0 ? string.Empty : $" — {col.Reason}";
            lines.Add(string.Create(inv, $"  {col.Number}: {header} -> {role}{(col.Unit is null ? string.Empty : $" [{col.Unit}]")}{why}"));
        }
        lines.Add(TraceCount > 1
            ? string.Create(inv, $"traces: {TraceCount} (the sweep returns to its start bias {StartVoltageV:G6} V and repeats)")
            : "traces: 1");
        lines.Add(string.Create(inv, $"segments: {Segments.Length} kept of {TotalSegments}"));
        foreach (ImportSegment s in Segments)
        {
            lines.Add(string.Create(inv, $"  {s.Number}: {s.Direction} {s.FromV:G6} V to {s.ToV:G6} V, {s.Points} points, lines {s.FirstLine}-{s.LastLine}"));
        }
        lines.Add(string.Create(inv, $"masked points: {MaskedPoints}"));
        if (c.AreaM2 is double a)
        {
            lines.Add(string.Create(inv, $"area: {a:G6} m²{(AreaSource is null ? string.Empty : $" (from {AreaSource})")}"));
        }
        if (c.TemperatureK is double t)
        {
            lines.Add(string.Create(inv, $"temperature: {t:G6} K"));
        }
        if (c.ComplianceA is double ca)
        {
            lines.Add(string.Create(inv, $"compliance: {ca:G6} A"));
        }
        if (c.Lot is not null || c.Wafer is not null || c.DieX is not null || c.DieY is not null)
        {
            lines.Add(string.Create(inv, $"lot: {c.Lot ?? "?"}; wafer: {c.Wafer ?? "?"}; die: {(c.DieX?.ToString(inv) ?? "?")},{(c.DieY?.ToString(inv) ?? "?")}"));
        }
        lines.Add(string.Create(inv, $"metadata: {c.Metadata.Count} keys"));
        var keys = new List<string>(c.Metadata.Keys);
        keys.Sort(StringComparer.Ordinal);
        foreach (string k in keys)
        {
            lines.Add($"  {k} = {c.Metadata[k]}");
        }
        lines.Add(string.Create(inv, $"warnings: {c.Warnings.Length}"));
        foreach (string w in c.Warnings)
        {
            lines.Add($"  {w}");
        }
        return lines.ToImmutable();
    }

    private static ImmutableArray<ImportSegment> BuildSegments(IvCurve c)
    {
        var list = ImmutableArray.CreateBuilder<ImportSegment>();
        int start = 0;
        for (int i = 1; i <= c.Count; i++)
        {
            if (i == c.Count || c.Segments[i] != c.Segments[start])
            {
                int line0 = c.SourceLines.IsDefaultOrEmpty ? 0 : c.SourceLines[start];
                int line1 = c.SourceLines.IsDefaultOrEmpty ? 0 : c.SourceLines[i - 1];
                list.Add(new ImportSegment(c.Segments[start], i - start, c.VoltageV[start], c.VoltageV[i - 1], line0, line1));
                start = i;
            }
        }
        return list.ToImmutable();
    }
}
