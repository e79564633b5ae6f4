using System.Collections.Immutable;
using System.Runtime.InteropServices;
using JunctionFit.Common;

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
/// </summary>
internal static class IvTableParser
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

    private sealed class Context(string text, LineTable lines, string path, IvReadOptions options)
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

        // ---------------------------------------------------------------- table detection

        private (int Start, int Count) FindTable()
        {
            ReadOnlySpan<char> candidates = options.Delimiter is char d ? [d] : CandidateDelimiters;
            int firstOneColumn = -1;
            // Pass 0 wants more numbers than words in the first row ("Sweep 1 of 2" is not data);
            // pass 1 accepts as many words as numbers (rows with status and comment columns).
            for (int pass = 0; pass < 2; pass++)
            {
            for (int i = 0; i < lines.Count; i++)
            {
                ReadOnlySpan<char> line = _table.Line(i);
                if (line.IsWhiteSpace() || MetadataParser.IsComment(line))
                {
                    continue;
                }
                int bestScore = int.MinValue;
                char best = '\0';
                int bestCount = 0;
                foreach (char delim in candidates)
                {
                    _table.Classify(line, delim, out int count, out int numeric, out int textual, out int raw);
                    if (numeric < 2 || (pass == 0 && numeric <= textual))
                    {
                        if (numeric == 1 && count == 1 && firstOneColumn < 0)
                        {
                            firstOneColumn = i;
                        }
                        continue;
                    }
                    // The following rows must look like data too (same number of fields, numbers
                    // outnumber text); one of the next three may be a damaged row.
                    int score = numeric - textual;
                    int checkedRows = 0;
                    int bad = 0;
                    for (int j = i + 1; j < lines.Count && checkedRows < SampleRows; j++)
                    {
                        ReadOnlySpan<char> next = _table.Line(j);
                        if (next.IsWhiteSpace() || MetadataParser.IsComment(next))
                        {
                            continue;
                        }
                        _table.Classify(next, delim, out _, out int n2, out int t2, out int raw2);
                        bool valid = raw2 == raw && n2 >= 1 && n2 >= t2;
                        if (!valid)
                        {
                            // A row without digits right after the candidate (a header) means the
                            // candidate is preamble; a row with digits may be a damaged data row.
                            // So does a row of two or more words and no numbers (a header).
                            bool texty = !next.ContainsAnyInRange('0', '9') || (n2 == 0 && t2 >= 2);
                            if ((texty && checkedRows == 0) || ++bad > 1)
                            {
                                bad = int.MaxValue;
                                break;
                            }
                        }
                        score += n2 - t2;
                        checkedRows++;
                    }
                    if (bad <= 1 && score > bestScore)
                    {
                        bestScore = score;
                        best = delim;
                        bestCount = count;
                    }
                }
                if (best != '\0')
                {
                    _delimiter = best;
                    return (i, bestCount);
                }
            }
            }

            if (firstOneColumn >= 0)
            {
                throw new IvFormatException(path, firstOneColumn + 1,
                    "only one column of numbers: an I–V table needs a voltage and a current column" +
                    (options.Delimiter is char od ? $" (delimiter forced to {DelimiterName(od)})" : string.Empty));
            }
            throw new IvFormatException(path, 0,
                "no table of numbers found: expected rows of at least two numbers (voltage and current) separated by commas, tabs, semicolons or spaces");
        }

        // ---------------------------------------------------------------- header

        private List<HeaderField> SplitHeader(ReadOnlySpan<char> line, char delim, out bool anyNumeric)
        {
            var fields = new List<HeaderField>();
            anyNumeric = false;
            var cursor = new FieldCursor(line, delim);
            int index = 0;
            while (cursor.MoveNext(out ReadOnlySpan<char> field, out bool quoted))
            {
                if (!field.IsEmpty && NumberText.TryParse(field, _table.AllowComma(delim, quoted), out _, out _))
                {
                    anyNumeric = true;
                }
                fields.Add(HeaderParser.Parse(index++, HeaderParser.Unescape(field, quoted)));
                if (index > 10_000)
                {
                    break;
                }
            }
            while (fields.Count > 0 && fields[^1].Text.Length == 0)
            {
                fields.RemoveAt(fields.Count - 1);
            }
            if (delim == ' ')
            {
                // "U (V) I (A)": a bracketed unit written after a space belongs to the name before it.
                for (int k = fields.Count - 1; k > 0; k--)
                {
                    string t = fields[k].Text;
                    if (IsBracketed(t) && !IsBracketed(fields[k - 1].Text) && fields[k - 1].Text.Length > 0)
                    {
                        fields[k - 1] = HeaderParser.Parse(k - 1, fields[k - 1].Text + " " + t);
                        fields.RemoveAt(k);
                    }
                }
                for (int k = 0; k < fields.Count; k++)
                {
                    if (fields[k].Index != k)
                    {
                        fields[k] = fields[k] with { Index = k };
                    }
                }
            }
            return fields;
        }

        private static bool IsBracketed(string t) => t.Length > 1 && t[0] is '(' or '[' or '{' && t[^1] is ')' or ']' or '}';

        private bool TryHeader(ReadOnlySpan<char> line, int dataCount, bool requireBoth, out List<HeaderField> fields)
        {
            fields = SplitHeader(line, _delimiter, out bool anyNumeric);
            if (fields.Count < 2 && options.Delimiter is null)
            {
                // A header written with another delimiter than the data (mixed delimiters).
                foreach (char d in CandidateDelimiters)
                {
                    if (d == _delimiter)
                    {
                        continue;
                    }
                    List<HeaderField> other = SplitHeader(line, d, out bool n2);
                    if (other.Count == dataCount)
                    {
                        fields = other;
                        anyNumeric = n2;
                        _warnings.Add($"header is separated by {DelimiterName(d)} but the data by {DelimiterName(_delimiter)}");
                        break;
                    }
                }
            }
            if (anyNumeric || fields.Count < 2)
            {
                return false;
            }
            bool hasV = fields.Exists(f => f.Kind == IvColumnKind.Voltage);
            bool hasI = fields.Exists(f => IsCurrentLike(f.Kind));
            if (requireBoth)
            {
                return hasV && hasI && fields.Count == dataCount;
            }
            return (hasV && hasI) || ((hasV || hasI) && fields.Count == dataCount);
        }

        private bool IsUnitsRow(ReadOnlySpan<char> line, int dataCount, out List<HeaderField> fields)
        {
            fields = SplitHeader(line, _delimiter, out bool anyNumeric);
            if (anyNumeric || fields.Count < 2 || fields.Count > dataCount + 1)
            {
                return false;
            }
            bool any = false;
            foreach (HeaderField f in fields)
            {
                if (f.Text.Length == 0)
                {
                    continue;
                }
                if (f.Name.Length == 0 && f.Unit is UnitScale u)
                {
                    any |= u.Kind is QuantityKind.Voltage or QuantityKind.Current or QuantityKind.CurrentDensity;
                    continue;
                }
                if (UnitParser.TryParse(f.Text, out UnitScale whole))
                {
                    any |= whole.Kind is QuantityKind.Voltage or QuantityKind.Current or QuantityKind.CurrentDensity;
                    continue;
                }
                if (UnitParser.IsOtherUnit(f.Text))
                {
                    continue;
                }
                return false;
            }
            if (any)
            {
                // Re-read every cell as a pure unit so that "V" means volt, not a column named V.
                var units = new List<HeaderField>(fields.Count);
                foreach (HeaderField f in fields)
                {
                    units.Add(HeaderParser.Parse(f.Index, string.Empty, f.Text) with { Text = f.Text });
                }
                fields = units;
            }
            return any;
        }

        private static List<HeaderField> MergeUnits(List<HeaderField> header, List<HeaderField> units)
        {
            var merged = new List<HeaderField>(header.Count);
            foreach (HeaderField f in header)
            {
                HeaderField? u = f.Index < units.Count ? units[f.Index] : null;
                if (u is null || u.Text.Length == 0 || f.UnitText is not null)
                {
                    merged.Add(f);
                    continue;
                }
                merged.Add(HeaderParser.Parse(f.Index, f.Text, u.Text));
            }
            return merged;
        }

        // ---------------------------------------------------------------- columns

        private static bool IsCurrentLike(IvColumnKind k)
            => k is IvColumnKind.Current or IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrent or IvColumnKind.AbsoluteCurrentDensity;

        private static bool IsDensityLike(IvColumnKind k) => k is IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrentDensity;

        private ColumnPlan PlanColumns(List<HeaderField>? header, int? headerLine, int dataCount, MetadataSet meta)
        {
            int line = headerLine is int hl ? hl + 1 : 0;
            int columnCount = Math.Max(dataCount, header?.Count ?? 0);
            int v = options.VoltageColumn is string vc ? Resolve(vc, header, line, columnCount, "voltage") : -1;
            int c = options.CurrentColumn is string cc ? Resolve(cc, header, line, columnCount, "current") : -1;
            bool vForced = v >= 0, cForced = c >= 0;
            double? knownArea = options.AreaM2 ?? meta.AreaM2;
            string currentNote = string.Empty;
            var notes = new List<string>();

            if (header is null)
            {
                if (v < 0)
                {
                    v = c == 0 ? 1 : 0;
                }
                if (c < 0)
                {
                    c = v == 1 ? 0 : 1;
                }
                if (options.VoltageColumn is null || options.CurrentColumn is null)
                {
                    _warnings.Add($"no header row: column {v + 1} read as voltage and column {c + 1} as current (choose others with {Remedy.VoltageColumn} and {Remedy.CurrentColumn})");
                }
            }
            else
            {
                if (c < 0)
                {
                    c = ChooseCurrent(header, v, line, out currentNote, notes);
                }
                if (v < 0)
                {
                    // The gate current goes with the gate voltage when there is one.
                    if (c >= 0 && c < header.Count && HeaderParser.IsGateCurrent(header[c]))
                    {
                        HeaderField? gv = header.Find(f => HeaderParser.IsGateVoltage(f) && f.Index != c);
                        v = gv?.Index ?? -1;
                    }
                    if (v < 0)
                    {
                        v = Best(header, f => f.Kind == IvColumnKind.Voltage, "voltage", except: c, line);
                    }
                }
                if ((v < 0 || c < 0) && header.Count == 2 && (v >= 0 || c >= 0))
                {
                    int other = v < 0 ? 1 - c : 1 - v;
                    if (header[other].Kind == IvColumnKind.Unknown)
                    {
                        if (v < 0)
                        {
                            v = other;
                            _warnings.Add($"column '{header[v].Text}' is not a known voltage name; read as voltage because the other column is the current");
                        }
                        else
                        {
                            c = other;
                            _warnings.Add($"column '{header[c].Text}' is not a known current name; read as current because the other column is the voltage");
                        }
                    }
                }
                if (v < 0)
                {
                    throw new IvFormatException(path, line, $"no voltage column among {ListColumns(header)}; choose it with {Remedy.VoltageColumn} (a header name or a 1-based number)");
                }
                if (c < 0)
                {
                    HeaderField? cap = header.Find(f => f.Kind == IvColumnKind.Capacitance);
                    if (cap is not null)
                    {
                        throw new IvFormatException(path, line,
                            $"no current column among {ListColumns(header)}: this looks like a capacitance–voltage file ({cap.Name} in {cap.UnitText ?? "F"}); use {Remedy.ReadAsCv} to read it as a C–V file, or choose a current column with {Remedy.CurrentColumn}",
                            cap.Index + 1, cap.Text);
                    }
                    throw new IvFormatException(path, line, $"no current column among {ListColumns(header)}; choose it with {Remedy.CurrentColumn} (a header name or a 1-based number)");
                }
            }
            if (v == c)
            {
                throw new IvFormatException(path, line, $"voltage and current would both come from column {v + 1}; choose different columns");
            }

            HeaderField? vf = header is not null && v < header.Count ? header[v] : null;
            HeaderField? cf = header is not null && c < header.Count ? header[c] : null;

            UnitScale vUnit = UnitFor(vf, options.VoltageUnit, line, "voltage", QuantityKind.Voltage, QuantityKind.Voltage, UnitScale.Volt);
            bool densityByName = cf is not null && IsDensityLike(cf.Kind) && cf.Unit is null;
            UnitScale cUnit = UnitFor(cf, options.CurrentUnit, line, "current", QuantityKind.Current, QuantityKind.CurrentDensity,
                densityByName ? UnitScale.AmperePerSquareCentimetre : UnitScale.Ampere);
            if (densityByName && options.CurrentUnit is null)
            {
                _warnings.Add($"current density column '{cf!.Text}' has no unit; read as A/cm² (set {new Remedy(RemedyKind.CurrentUnit)} otherwise)");
            }
            bool absolute = cf is not null && cf.Kind is IvColumnKind.AbsoluteCurrent or IvColumnKind.AbsoluteCurrentDensity;
            if (absolute)
            {
                _warnings.Add($"column '{cf!.Text}' holds {HeaderParser.Describe(cf.Kind)} (no signed column is given); the sign of each point is taken from its bias");
            }

            bool density = cUnit.Kind == QuantityKind.CurrentDensity;
            double area = 0;
            if (density)
            {
                if (knownArea is not double known)
                {
                    throw new IvFormatException(path, line,
                        $"column '{cf?.Text ?? (c + 1).ToString(System.Globalization.CultureInfo.InvariantCulture)}' holds current density but the file states no area; add an 'area' line to the preamble (e.g. '# area: 100 um2'), or choose a current column with {Remedy.CurrentColumn}");
                }
                area = known;
            }

            // A current column and a density column together give the area (I/J).
            int pairI = -1, pairJ = -1;
            UnitScale pairIUnit = UnitScale.Ampere, pairJUnit = UnitScale.AmperePerSquareCentimetre;
            if (header is not null)
            {
                bool IsI(HeaderField f) => f.Kind is IvColumnKind.Current or IvColumnKind.AbsoluteCurrent && f.Index != v && f.Unit?.Kind is null or QuantityKind.Current;
                bool IsJ(HeaderField f) => IsDensityLike(f.Kind) && f.Index != v && f.Unit?.Kind is null or QuantityKind.CurrentDensity;
                if (cf is not null && !density && IsI(cf))
                {
                    pairI = c;
                }
                else
                {
                    HeaderField? fi = header.Find(f => f.Kind == IvColumnKind.Current && IsI(f)) ?? header.Find(IsI);
                    pairI = fi?.Index ?? -1;
                }
                if (cf is not null && density && IsJ(cf))
                {
                    pairJ = c;
                }
                else
                {
                    HeaderField? fj = header.Find(f => f.Kind == IvColumnKind.CurrentDensity && IsJ(f)) ?? header.Find(IsJ);
                    pairJ = fj?.Index ?? -1;
                }
                if (pairI >= 0 && pairJ >= 0 && pairI != pairJ)
                {
                    pairIUnit = pairI == c ? cUnit : header[pairI].Unit ?? UnitScale.Ampere;
                    pairJUnit = pairJ == c ? cUnit : header[pairJ].Unit ?? UnitScale.AmperePerSquareCentimetre;
                }
                else
                {
                    pairI = pairJ = -1;
                }
            }

            var columns = ImmutableArray.CreateBuilder<ImportColumn>(columnCount);
            for (int k = 0; k < columnCount; k++)
            {
                HeaderField? f = header is not null && k < header.Count ? header[k] : null;
                IvColumnRole role = k == v ? IvColumnRole.Voltage
                    : k == c ? (density ? IvColumnRole.CurrentDensity : IvColumnRole.Current)
                    : IvColumnRole.Ignored;
                string? unit = k == v ? vUnit.Symbol : k == c ? cUnit.Symbol : f?.UnitText;
                IvColumnKind kind = f?.Kind ?? (k == v ? IvColumnKind.Voltage : k == c ? IvColumnKind.Current : IvColumnKind.Unknown);
                string reason;
                if (k == v)
                {
                    reason = vForced ? $"chosen with {Remedy.VoltageColumn}" : f is null ? "by position (no header)" : f.How;
                }
                else if (k == c)
                {
                    reason = (cForced ? $"chosen with {Remedy.CurrentColumn}" : f is null ? "by position (no header)" : f.How + currentNote)
                        + (absolute ? "; sign taken from the bias" : string.Empty)
                        + (density ? string.Create(System.Globalization.CultureInfo.InvariantCulture, $"; times the area {area:G5} m²") : string.Empty);
                }
                else if (f is null)
                {
                    reason = header is null ? "no header; not used" : "no header cell; not used";
                }
                else
                {
                    reason = f.Kind switch
                    {
                        IvColumnKind.Time or IvColumnKind.Index => $"{f.How}; ignored",
                        IvColumnKind.Unknown => "name not recognised; ignored",
                        _ when IsCurrentLike(f.Kind) => $"{f.How}; not used: column {c + 1} is the current" + (k == pairI || k == pairJ ? "; used with it for the area from I/J" : string.Empty),
                        IvColumnKind.Voltage => $"{f.How}; not used: column {v + 1} is the bias",
                        _ => $"{f.How}; ignored",
                    };
                }
                if (unit is null && f is not null && IsDensityLike(f.Kind) && k != c)
                {
                    unit = "A/cm²";
                    reason += "; unit not given, A/cm² assumed";
                }
                columns.Add(new ImportColumn(k + 1, f?.Text ?? string.Empty, role, unit) { Kind = kind, Reason = reason });
            }

            // Say what was chosen when the choice was not plain.
            if (header is not null && (!vForced || !cForced))
            {
                int currentLike = header.Count(f => IsCurrentLike(f.Kind));
                int voltages = header.Count(f => f.Kind == IvColumnKind.Voltage);
                bool loose = (vf?.Loose ?? false) || (cf?.Loose ?? false);
                if (loose || currentLike > 1 || voltages > 1 || absolute)
                {
                    var ignored = new List<string>();
                    foreach (HeaderField f in header)
                    {
                        if (f.Index != v && f.Index != c && f.Text.Length > 0)
                        {
                            ignored.Add($"{f.Text} ({ShortKind(f)})");
                        }
                    }
                    _warnings.Add($"columns by name: voltage '{vf?.Text}' ({v + 1}), {(density ? "current density" : "current")} '{cf?.Text}' ({c + 1})"
                        + (ignored.Count > 0 ? "; ignored: " + string.Join(", ", ignored) : string.Empty)
                        + $"; if this is wrong, choose with {Remedy.VoltageColumn} and {Remedy.CurrentColumn}");
                }
            }
            _warnings.AddRange(notes);

            return new ColumnPlan(v, c, vUnit, cUnit, density, area, columns.MoveToImmutable())
            {
                Absolute = absolute,
                PairCurrentIndex = pairI,
                PairDensityIndex = pairJ,
                PairCurrentUnit = pairIUnit,
                PairDensityUnit = pairJUnit,
                PairText = pairI >= 0 ? $"columns '{header![pairI].Text}' ({pairI + 1}) and '{header[pairJ].Text}' ({pairJ + 1})" : string.Empty,
            };
        }

        private static string ShortKind(HeaderField f)
        {
            string unit = f.UnitText ?? f.Kind switch
            {
                IvColumnKind.Current or IvColumnKind.AbsoluteCurrent => "A",
                IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrentDensity => "A/cm²",
                IvColumnKind.Time => "s",
                IvColumnKind.Voltage => "V",
                IvColumnKind.Capacitance => "F",
                _ => string.Empty,
            };
            string what = f.Kind switch
            {
                IvColumnKind.Current => HeaderParser.IsTerminalCurrent(f) ? "terminal current" : "I",
                IvColumnKind.CurrentDensity => "J",
                IvColumnKind.AbsoluteCurrent => "|I|",
                IvColumnKind.AbsoluteCurrentDensity => "|J|",
                IvColumnKind.Voltage => "voltage",
                _ => HeaderParser.Describe(f.Kind),
            };
            return unit.Length > 0 ? $"{what}, {unit}" : what;
        }

        /// <summary>
        /// The current column: the signed current (the gate current among transistor terminal currents),
        /// else |I|, else the signed density when the area is known, else |J| likewise, else any density.
        /// </summary>
        private int ChooseCurrent(List<HeaderField> header, int v, int line, out string note, List<string> notes)
        {
            note = string.Empty;
            var signed = header.FindAll(f => f.Kind == IvColumnKind.Current && f.Index != v);
            if (signed.Count > 0)
            {
                var terminals = signed.FindAll(HeaderParser.IsTerminalCurrent);
                var gates = signed.FindAll(HeaderParser.IsGateCurrent);
                if (gates.Count == 1 && terminals.Count >= 2)
                {
                    HeaderField g = gates[0];
                    note = "; the gate current, preferred among the terminal currents";
                    notes.Add($"several terminal currents ({string.Join(", ", terminals.ConvertAll(t => t.Text))}): the gate current '{g.Text}' (column {g.Index + 1}) is read, the tunnelling current through a gate oxide; choose another with {Remedy.CurrentColumn}");
                    return g.Index;
                }
                int best = Best(header, f => f.Kind == IvColumnKind.Current, "current", v, line);
                if (header.Exists(f => f.Index != best && f.Index != v && IsCurrentLike(f.Kind)))
                {
                    note = "; the signed current, preferred over the other current columns";
                }
                return best;
            }
            int abs = Best(header, f => f.Kind == IvColumnKind.AbsoluteCurrent, "|I|", v, line);
            if (abs >= 0)
            {
                note = "; no signed current column";
                return abs;
            }
            // A density needs the area; without one, reading it fails below with a message that says so.
            int j = Best(header, f => f.Kind == IvColumnKind.CurrentDensity, "current density", v, line);
            if (j >= 0)
            {
                note = "; no current column";
                return j;
            }
            int absJ = Best(header, f => f.Kind == IvColumnKind.AbsoluteCurrentDensity, "|J|", v, line);
            if (absJ >= 0)
            {
                note = "; no current or signed density column";
            }
            return absJ;
        }

        private UnitScale UnitFor(HeaderField? f, string? optionUnit, int line, string what, QuantityKind a, QuantityKind b, UnitScale fallback)
        {
            if (optionUnit is not null)
            {
                _ = UnitParser.TryParse(optionUnit, out UnitScale forced);
                return forced;
            }
            if (f is null || f.UnitText is null)
            {
                return fallback;
            }
            if (f.Unit is not UnitScale u)
            {
                throw new IvFormatException(path, line,
                    $"unknown unit '{MetadataParser.Short(f.UnitText)}' in {what} column '{MetadataParser.Short(f.Text)}'; units read are V with p/n/u/µ/m/k prefixes, A likewise, A/cm², mA/cm², A/m² (or set {new Remedy(a == QuantityKind.Voltage ? RemedyKind.VoltageUnit : RemedyKind.CurrentUnit)})",
                    f.Index + 1, f.Text);
            }
            if (u.Kind != a && u.Kind != b)
            {
                throw new IvFormatException(path, line,
                    $"{what} column '{MetadataParser.Short(f.Text)}' has unit '{f.UnitText}', which is not a {what} unit", f.Index + 1, f.Text);
            }
            return u;
        }

        private int Resolve(string choice, List<HeaderField>? header, int line, int columnCount, string what)
        {
            if (IvReadOptions.IsNumber(choice))
            {
                int n = int.Parse(choice, System.Globalization.CultureInfo.InvariantCulture);
                if (n > columnCount)
                {
                    throw new IvFormatException(path, line, $"{what} column {n} was chosen but the table has {columnCount} columns");
                }
                return n - 1;
            }
            if (header is null)
            {
                throw new IvFormatException(path, 0, $"{what} column '{choice}' was chosen by name but the file has no header row; choose it by number");
            }
            int found = -1;
            string norm = HeaderParser.NormalizeName(choice);
            foreach (HeaderField f in header)
            {
                bool match = f.Text.Equals(choice, StringComparison.OrdinalIgnoreCase)
                    || f.Name.Equals(choice, StringComparison.OrdinalIgnoreCase)
                    || (norm.Length > 0 && HeaderParser.NormalizeName(f.Name) == norm);
                if (match)
                {
                    if (found >= 0)
                    {
                        throw new IvFormatException(path, line, $"{what} column '{choice}' matches columns {found + 1} and {f.Index + 1}; choose it by number");
                    }
                    found = f.Index;
                }
            }
            if (found < 0)
            {
                throw new IvFormatException(path, line, $"no column named '{choice}' for the {what}; columns are {ListColumns(header)}");
            }
            return found;
        }

        private int Best(List<HeaderField> header, Predicate<HeaderField> match, string what, int except, int line)
        {
            int best = -1;
            foreach (HeaderField f in header)
            {
                if (!match(f) || f.Index == except)
                {
                    continue;
                }
                if (best < 0 || f.Rank < header[best].Rank)
                {
                    best = f.Index;
                }
                else if (f.Rank == header[best].Rank)
                {
                    throw new IvFormatException(path, line,
                        $"columns {best + 1} ('{header[best].Text}') and {f.Index + 1} ('{f.Text}') could both be the {what}; choose one with {(what == "voltage" ? Remedy.VoltageColumn : Remedy.CurrentColumn)}",
                        f.Index + 1, f.Text);
                }
            }
            return best;
        }

        private static string ListColumns(List<HeaderField> header)
        {
            var names = new List<string>();
            foreach (HeaderField f in header)
            {
                names.Add($"'{MetadataParser.Short(f.Text)}'");
                if (names.Count == 12)
                {
                    names.Add("…");
                    break;
                }
            }
            return string.Join(", ", names);
        }

        // ---------------------------------------------------------------- rows

        // ---------------------------------------------------------------- path, finish

        private ParseOutcome Finish(TableRows data, ColumnPlan plan, MetadataSet meta, string encodingName, int dataStart,
            int? headerLine, bool headerInComment, int? unitsLine)
        {
            int n = data.Count;
            ReadOnlySpan<double> v = data.V.AsSpan(0, n);
            ReadOnlySpan<double> c = data.I.AsSpan(0, n);
            int[] segments = SweepAnalysis.Segments(v);
            int totalSegments = n == 0 ? 0 : segments[n - 1] + 1;
            _ = SweepAnalysis.Traces(v, out int traceCount);
            double startV = data.V[0]; // before a segment selection compacts the arrays
            (double? areaM2, string? areaSource) = TableArea.Resolve(data, plan, meta, options.AreaM2, _warnings);
            bool[] mask;
            int masked = 0;
            if (options.MaskCompliance)
            {
                mask = SweepAnalysis.ComplianceMask(c, meta.ComplianceA, out masked);
            }
            else
            {
                mask = new bool[n];
            }

            double[] vOut = data.V, cOut = data.I;
            int[] lOut = data.Lines;
            int kept = n;
            if (options.Segments is ImmutableArray<int> wanted)
            {
                foreach (int s in wanted)
                {
                    if (s >= totalSegments)
                    {
                        throw new IvFormatException(path, 0,
                            $"segment {s} was selected but the sweep has {totalSegments} segment{(totalSegments == 1 ? string.Empty : "s")} (numbered from 0)");
                    }
                }
                var keep = new bool[totalSegments];
                foreach (int s in wanted)
                {
                    keep[s] = true;
                }
                kept = 0;
                for (int k = 0; k < n; k++)
                {
                    if (keep[segments[k]])
                    {
                        vOut[kept] = vOut[k];
                        cOut[kept] = cOut[k];
                        lOut[kept] = lOut[k];
                        segments[kept] = segments[k];
                        mask[kept] = mask[k];
                        kept++;
                    }
                }
                if (kept < 2)
                {
                    throw new IvFormatException(path, 0, $"the selected segments hold {kept} point{(kept == 1 ? string.Empty : "s")}; at least two are needed");
                }
                masked = 0;
                for (int k = 0; k < kept; k++)
                {
                    masked += mask[k] ? 1 : 0;
                }
            }

            if (masked > 0)
            {
                _warnings.Add(meta.ComplianceA is double ca
                    ? $"{masked} point{(masked == 1 ? string.Empty : "s")} at the stated compliance of {ca:G4} A masked"
                    : $"{masked} point{(masked == 1 ? string.Empty : "s")} in flat runs at the largest current (compliance) masked");
            }

            ImmutableArray<double> vArr = Exact(vOut, kept);
            ImmutableArray<double> cArr = Exact(cOut, kept);
            var curve = new IvCurve(path, vArr, cArr)
            {
                SourceLines = Exact(lOut, kept),
                Segments = Exact(segments, kept),
                ImportMask = Exact(mask, kept),
                AreaM2 = areaM2,
                TemperatureK = meta.TemperatureK,
                ComplianceA = meta.ComplianceA,
                Lot = meta.Lot,
                Wafer = meta.Wafer,
                DieX = meta.DieX,
                DieY = meta.DieY,
                Metadata = meta.Raw.ToImmutableDictionary(StringComparer.Ordinal),
                Warnings = [.. _warnings],
            };

            int preamble = 0;
            int end = headerLine ?? dataStart;
            for (int i = 0; i < end; i++)
            {
                preamble += _table.IsBlank(i) ? 0 : 1;
            }

            return new ParseOutcome(
                curve,
                encodingName,
                lines.LineEndName(),
                _delimiter,
                _usedComma,
                preamble,
                meta.FreeTextLines,
                headerLine + 1,
                headerInComment,
                unitsLine + 1,
                dataStart + 1,
                data.LastDataLine,
                plan.Columns,
                plan.VoltageIndex + 1,
                plan.CurrentIndex + 1,
                plan.VoltageUnit.Symbol,
                plan.CurrentUnit.Symbol,
                data.Skipped,
                masked,
                totalSegments,
                traceCount,
                areaSource,
                startV);
        }

        private static ImmutableArray<T> Exact<T>(T[] array, int count)
        {
            if (array.Length != count)
            {
                Array.Resize(ref array, count);
            }
            return ImmutableCollectionsMarshal.AsImmutableArray(array);
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
