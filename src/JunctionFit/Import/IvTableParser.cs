using System.Collections.Immutable;

namespace JunctionFit.Import;

/// <summary>Everything the parser found out about one file, for the reader and for <see cref="ImportDescription"/>.</summary>
internal sealed record ParseOutcome(
    IvCurve Curve,
    string Encoding,
    string LineEnd,
    char Delimiter,
    bool DecimalComma,
    int PreambleLines,
    int FreeTextLines,
    int? HeaderLine,
    bool HeaderInComment,
    int? UnitsLine,
    int FirstDataLine,
    int LastDataLine,
    ImmutableArray<ImportColumn> Columns,
    int VoltageColumn,
    int CurrentColumn,
    string VoltageUnit,
    string CurrentUnit,
    int SkippedLines,
    int MaskedPoints,
    int TotalSegments,
    int TraceCount,
    string? AreaSource,
    double StartVoltageV);

/// <summary>
/// The importer's pipeline: decode → split lines → find the table (delimiter, first data row) →
/// header and units → preamble metadata → data rows → segments and compliance → <see cref="IvCurve"/>.
/// One parse is one <c>Context</c>, whose steps live in files of their own: IvTableParser.TableLocation.cs (delimiter
/// and data block), IvTableParser.Header.cs (header and units rows), IvTableParser.Columns.cs (the column plan: roles,
/// units, the remedies when a choice is unclear), IvTableParser.Finish.cs (segments, compliance, area, the curve); the
/// rows themselves are read by <see cref="TableRowReader"/>, the preamble by <see cref="MetadataParser"/>.
/// </summary>
internal static partial class IvTableParser
{
    private static readonly char[] CandidateDelimiters = ['\t', ';', ',', '|', ' '];

    /// <summary>Characters that do not belong in a text table: C0 controls other than tab, LF, CR, FF, VT and SUB; DEL; U+FFFD.</summary>
    private static readonly System.Buffers.SearchValues<char> ControlCharacters = System.Buffers.SearchValues.Create(
        "\u0000\u0001\u0002\u0003\u0004\u0005\u0006\u0007\u0008\u000E\u000F\u0010\u0011\u0012\u0013\u0014\u0015\u0016\u0017\u0018\u0019\u001B\u001C\u001D\u001E\u001F\u007F\uFFFD");
    private const int SampleRows = 3;
    internal const int DetailedSkipWarnings = 10;

    /// <summary>
    /// Largest relative deviation of I/J from its median for the ratio to count as one area; instruments
    /// print 4–7 digits, so a true common area agrees far better (common practice, no source).
    /// </summary>
    public const double AreaRatioTolerance = 0.01;

    public static ParseOutcome Parse(string text, string sourcePath, string matchPath, IvReadOptions options, string encodingName)
    {
        if (text.Length > 0 && text[0] == '\uFEFF')
        {
            text = text[1..];
            if (encodingName == "text")
            {
                encodingName = "text (BOM)";
            }
        }
        if (text.AsSpan().IsWhiteSpace())
        {
            throw new IvFormatException(sourcePath, 0, text.Length == 0 ? "file is empty" : "file holds only blank lines");
        }
        CheckNotBinary(text, sourcePath);

        LineTable lines = LineTable.Build(text, options.MaxLineLength);
        if (lines.TooLongLine >= 0)
        {
            throw new IvFormatException(sourcePath, lines.TooLongLine + 1,
                $"line is {lines.TooLongLength} characters long; lines of up to {options.MaxLineLength} characters are read (option MaxLineLength)");
        }

        var ctx = new Context(text, lines, sourcePath, options);
        return ctx.Run(matchPath, encodingName);
    }

    private static void CheckNotBinary(string text, string path)
    {
        int nul = text.IndexOf('\0');
        if (nul >= 0)
        {
            throw new IvFormatException(path, LineOf(text, nul), "binary content (a NUL character): this is not a text file");
        }
        int sample = Math.Min(text.Length, 65536);
        int controls = 0;
        int first = -1;
        // One vectorised scan when the text is clean; each hit is counted.
        ReadOnlySpan<char> rest = text.AsSpan(0, sample);
        int offset = 0;
        while (true)
        {
            int hit = rest.IndexOfAny(ControlCharacters);
            if (hit < 0)
            {
                break;
            }
            controls++;
            if (first < 0)
            {
                first = offset + hit;
            }
            offset += hit + 1;
            rest = rest[(hit + 1)..];
        }
        // More than 32 control characters, or at least 4 making up more than 1 %, is not a table
        // of text (common practice, no source). SUB (0x1A, an old end-of-file mark) is allowed.
        if (controls > 32 || (controls >= 4 && controls * 100 > sample))
        {
            throw new IvFormatException(path, LineOf(text, first), $"binary content ({controls} control characters in the first {sample} characters): this is not a text file");
        }
    }

    private static int LineOf(string text, int index)
    {
        int line = 1;
        ReadOnlySpan<char> s = text.AsSpan(0, index);
        for (int i = 0; i < s.Length; i++)
        {
            if (s[i] == '\n' || (s[i] == '\r' && (i + 1 >= s.Length || s[i + 1] != '\n')))
            {
                line++;
            }
        }
        return line;
    }

    private sealed partial class Context(string text, LineTable lines, string path, IvReadOptions options)
    {
        private readonly List<string> _warnings = [];
        private char _delimiter;
        private readonly bool? _decimalCommaOption = options.DecimalComma;
        private readonly TableText _table = new(text, lines, path, options.DecimalComma);
        private bool _usedComma;

        public ParseOutcome Run(string matchPath, string encodingName)
        {
            (int dataStart, int dataCount) = FindTable();

            // Header and units row.
            int? headerLine = null;
            int? unitsLine = null;
            bool headerInComment = false;
            List<HeaderField>? header = null;
            int h = _table.PreviousNonBlank(dataStart - 1);
            if (h >= 0)
            {
                ReadOnlySpan<char> hl = _table.Line(h);
                bool comment = MetadataParser.IsComment(hl);
                // A units row may start with '#' (the unit of an index column), so it is tried first.
                if (IsUnitsRow(hl, dataCount, out List<HeaderField>? unitsFields))
                {
                    int h2 = _table.PreviousNonBlank(h - 1);
                    if (h2 >= 0 && !MetadataParser.IsComment(_table.Line(h2)) && TryHeader(_table.Line(h2), dataCount, requireBoth: false, out List<HeaderField>? above))
                    {
                        header = MergeUnits(above, unitsFields);
                        headerLine = h2;
                        unitsLine = h;
                    }
                    else
                    {
                        header = unitsFields;
                        headerLine = h;
                    }
                }
                else if (TryHeader(comment ? MetadataParser.StripComment(hl) : hl, dataCount, requireBoth: comment, out List<HeaderField>? fields))
                {
                    header = fields;
                    headerLine = h;
                    headerInComment = comment;
                }
            }

            // Preamble metadata.
            int preambleEnd = headerLine ?? dataStart;
            var meta = new MetadataSet();
            bool metaComma = _decimalCommaOption ?? _delimiter != ',';
            for (int i = 0; i < preambleEnd; i++)
            {
                if (!_table.IsBlank(i))
                {
                    MetadataParser.ReadLine(_table.Line(i), i + 1, metaComma, meta, _warnings);
                }
            }

            // Columns, roles, units.
            ColumnPlan plan = PlanColumns(header, headerLine, dataCount, meta);

            // Data rows.
            var rowReader = new TableRowReader(_table, _delimiter, _warnings);
            var data = rowReader.Read(dataStart, plan);
            _usedComma |= rowReader.UsedComma;

            // Path pattern.
            PathMetadata.Apply(options.PathPattern, matchPath, meta, _warnings);

            return Finish(data, plan, meta, encodingName, dataStart, headerLine, headerInComment, unitsLine);
        }
    }

    /// <summary>A readable name for a delimiter.</summary>
    public static string DelimiterName(char d) => d switch
    {
        ',' => "comma",
        ';' => "semicolon",
        '\t' => "tab",
        '|' => "vertical bar",
        ' ' => "spaces",
        _ => $"'{d}'",
    };
}
