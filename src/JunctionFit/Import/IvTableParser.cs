using System.Collections.Immutable;
using System.Runtime.InteropServices;

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
    int TotalSegments);

/// <summary>
/// The importer's pipeline: decode → split lines → find the table (delimiter, first data row) →
/// header and units → preamble metadata → data rows → segments and compliance → <see cref="IvCurve"/>.
/// </summary>
internal static class IvTableParser
{
    private static readonly char[] CandidateDelimiters = ['\t', ';', ',', '|', ' '];
    private const int SampleRows = 3;
    private const int DetailedSkipWarnings = 10;

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
        for (int i = 0; i < sample; i++)
        {
            char c = text[i];
            if ((c < ' ' && c is not ('\t' or '\n' or '\r' or '\f' or '\v' or '\u001A')) || c == '\u007F' || c == '\uFFFD')
            {
                controls++;
                if (first < 0)
                {
                    first = i;
                }
            }
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
        private bool? _decimalCommaOption = options.DecimalComma;
        private bool _usedComma;

        private ReadOnlySpan<char> Line(int i) => text.AsSpan(lines.Start(i), lines.Length(i));

        private bool IsBlank(int i) => Line(i).IsWhiteSpace();

        private bool AllowComma(char delimiter, bool quoted) => _decimalCommaOption ?? (delimiter != ',' || quoted);

        public ParseOutcome Run(string matchPath, string encodingName)
        {
            (int dataStart, int dataCount) = FindTable();

            // Header and units row.
            int? headerLine = null;
            int? unitsLine = null;
            bool headerInComment = false;
            List<HeaderField>? header = null;
            int h = PreviousNonBlank(dataStart - 1);
            if (h >= 0)
            {
                ReadOnlySpan<char> hl = Line(h);
                bool comment = MetadataParser.IsComment(hl);
                // A units row may start with '#' (the unit of an index column), so it is tried first.
                if (IsUnitsRow(hl, dataCount, out List<HeaderField>? unitsFields))
                {
                    int h2 = PreviousNonBlank(h - 1);
                    if (h2 >= 0 && !MetadataParser.IsComment(Line(h2)) && TryHeader(Line(h2), dataCount, requireBoth: false, out List<HeaderField>? above))
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
                if (!IsBlank(i))
                {
                    MetadataParser.ReadLine(Line(i), i + 1, metaComma, meta, _warnings);
                }
            }

            // Columns, roles, units.
            ColumnPlan plan = PlanColumns(header, headerLine, dataCount, meta);

            // Data rows.
            var data = ReadRows(dataStart, plan);

            // Path pattern.
            ApplyPathPattern(matchPath, meta);

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
                ReadOnlySpan<char> line = Line(i);
                if (line.IsWhiteSpace() || MetadataParser.IsComment(line))
                {
                    continue;
                }
                int bestScore = int.MinValue;
                char best = '\0';
                int bestCount = 0;
                foreach (char delim in candidates)
                {
                    Classify(line, delim, out int count, out int numeric, out int textual, out int raw);
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
                        ReadOnlySpan<char> next = Line(j);
                        if (next.IsWhiteSpace() || MetadataParser.IsComment(next))
                        {
                            continue;
                        }
                        Classify(next, delim, out _, out int n2, out int t2, out int raw2);
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

        private void Classify(ReadOnlySpan<char> line, char delim, out int count, out int numeric, out int textual)
            => Classify(line, delim, out count, out numeric, out textual, out _);

        private void Classify(ReadOnlySpan<char> line, char delim, out int count, out int numeric, out int textual, out int raw)
        {
            count = 0;
            numeric = 0;
            textual = 0;
            int lastNonEmpty = 0;
            var cursor = new FieldCursor(line, delim);
            while (cursor.MoveNext(out ReadOnlySpan<char> field, out bool quoted))
            {
                count++;
                if (field.IsEmpty)
                {
                    continue;
                }
                lastNonEmpty = count;
                if (NumberText.TryParse(field, AllowComma(delim, quoted), out _, out _))
                {
                    numeric++;
                }
                else
                {
                    textual++;
                }
                if (count > 100_000)
                {
                    break;
                }
            }
            raw = count;
            count = lastNonEmpty;
        }

        private int PreviousNonBlank(int i)
        {
            while (i >= 0 && IsBlank(i))
            {
                i--;
            }
            return i;
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
                if (!field.IsEmpty && NumberText.TryParse(field, AllowComma(delim, quoted), out _, out _))
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
                    if (t.Length > 1 && t[0] is '(' or '[' or '{' && t[^1] is ')' or ']' or '}')
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
            bool hasV = fields.Exists(f => f.Role == IvColumnRole.Voltage);
            bool hasI = fields.Exists(f => f.Role is IvColumnRole.Current or IvColumnRole.CurrentDensity);
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
                    UnitScale? u = UnitParser.TryParse(f.Text, out UnitScale parsed) ? parsed : null;
                    units.Add(new HeaderField(f.Index, f.Text, string.Empty, f.Text.Length == 0 ? null : f.Text, u,
                        u is UnitScale k ? HeaderParser.RoleFromUnit(k.Kind) : IvColumnRole.Ignored, u is null ? int.MaxValue : 1000));
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
                if (u?.Unit is not UnitScale unit || f.UnitText is not null)
                {
                    merged.Add(f);
                    continue;
                }
                IvColumnRole role = f.Role;
                int rank = f.Rank;
                if (role == IvColumnRole.Ignored)
                {
                    role = HeaderParser.RoleFromUnit(unit.Kind);
                    rank = 1000;
                }
                else if (role == IvColumnRole.Current && unit.Kind == QuantityKind.CurrentDensity)
                {
                    role = IvColumnRole.CurrentDensity;
                }
                merged.Add(f with { UnitText = u.Text, Unit = unit, Role = role, Rank = rank });
            }
            return merged;
        }

        // ---------------------------------------------------------------- columns

        private sealed record ColumnPlan(
            int VoltageIndex,
            int CurrentIndex,
            UnitScale VoltageUnit,
            UnitScale CurrentUnit,
            bool Density,
            double AreaM2,
            ImmutableArray<ImportColumn> Columns);

        private ColumnPlan PlanColumns(List<HeaderField>? header, int? headerLine, int dataCount, MetadataSet meta)
        {
            int line = headerLine is int hl ? hl + 1 : 0;
            int columnCount = Math.Max(dataCount, header?.Count ?? 0);
            int v = options.VoltageColumn is string vc ? Resolve(vc, header, line, columnCount, "voltage") : -1;
            int c = options.CurrentColumn is string cc ? Resolve(cc, header, line, columnCount, "current") : -1;

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
                    _warnings.Add($"no header row: column {v + 1} read as voltage and column {c + 1} as current");
                }
            }
            else
            {
                if (v < 0)
                {
                    v = Best(header, IvColumnRole.Voltage, except: c, line);
                }
                if (c < 0)
                {
                    c = Best(header, IvColumnRole.Current, except: v, line);
                    if (c < 0)
                    {
                        c = Best(header, IvColumnRole.CurrentDensity, except: v, line);
                    }
                }
                if ((v < 0 || c < 0) && header.Count == 2 && (v >= 0 || c >= 0))
                {
                    if (v < 0)
                    {
                        v = 1 - c;
                        _warnings.Add($"column '{header[v].Text}' is not a known voltage name; read as voltage because the other column is the current");
                    }
                    else
                    {
                        c = 1 - v;
                        _warnings.Add($"column '{header[c].Text}' is not a known current name; read as current because the other column is the voltage");
                    }
                }
                if (v < 0)
                {
                    throw new IvFormatException(path, line, $"no voltage column among {ListColumns(header)}; name it with the VoltageColumn option");
                }
                if (c < 0)
                {
                    throw new IvFormatException(path, line, $"no current column among {ListColumns(header)}; name it with the CurrentColumn option");
                }
            }
            if (v == c)
            {
                throw new IvFormatException(path, line, $"voltage and current would both come from column {v + 1}; choose different columns");
            }

            HeaderField? vf = header is not null && v < header.Count ? header[v] : null;
            HeaderField? cf = header is not null && c < header.Count ? header[c] : null;

            UnitScale vUnit = UnitFor(vf, options.VoltageUnit, line, "voltage", QuantityKind.Voltage, QuantityKind.Voltage, UnitScale.Volt);
            bool densityByName = cf?.Role == IvColumnRole.CurrentDensity && cf.Unit is null;
            UnitScale cUnit = UnitFor(cf, options.CurrentUnit, line, "current", QuantityKind.Current, QuantityKind.CurrentDensity,
                densityByName ? UnitScale.AmperePerSquareMetre : UnitScale.Ampere);
            if (densityByName && options.CurrentUnit is null)
            {
                _warnings.Add($"current density column '{cf!.Text}' has no unit; read as A/m²");
            }

            bool density = cUnit.Kind == QuantityKind.CurrentDensity;
            double area = 0;
            if (density)
            {
                double? a = options.AreaM2 ?? meta.AreaM2;
                if (a is not double known)
                {
                    throw new IvFormatException(path, line,
                        $"column '{cf?.Text ?? (c + 1).ToString(System.Globalization.CultureInfo.InvariantCulture)}' holds current density but the file states no area; add an 'area' line (e.g. '# area: 100 um2') or set the AreaM2 option");
                }
                area = known;
            }

            var columns = ImmutableArray.CreateBuilder<ImportColumn>(columnCount);
            for (int k = 0; k < columnCount; k++)
            {
                HeaderField? f = header is not null && k < header.Count ? header[k] : null;
                IvColumnRole role = k == v ? IvColumnRole.Voltage
                    : k == c ? (density ? IvColumnRole.CurrentDensity : IvColumnRole.Current)
                    : IvColumnRole.Ignored;
                string? unit = k == v ? vUnit.Symbol : k == c ? cUnit.Symbol : f?.UnitText;
                columns.Add(new ImportColumn(k + 1, f?.Text ?? string.Empty, role, unit));
            }
            return new ColumnPlan(v, c, vUnit, cUnit, density, area, columns.MoveToImmutable());
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
                    $"unknown unit '{MetadataParser.Short(f.UnitText)}' in {what} column '{MetadataParser.Short(f.Text)}'; units read are V with p/n/u/µ/m/k prefixes, A likewise, A/cm², mA/cm², A/m² (or set the {(a == QuantityKind.Voltage ? "VoltageUnit" : "CurrentUnit")} option)",
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

        private int Best(List<HeaderField> header, IvColumnRole role, int except, int line)
        {
            int best = -1;
            foreach (HeaderField f in header)
            {
                if (f.Role != role || f.Index == except)
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
                        $"columns {best + 1} ('{header[best].Text}') and {f.Index + 1} ('{f.Text}') could both be the {RoleName(role)}; choose one with the {(role == IvColumnRole.Voltage ? "VoltageColumn" : "CurrentColumn")} option",
                        f.Index + 1, f.Text);
                }
            }
            return best;
        }

        private static string RoleName(IvColumnRole role) => role switch
        {
            IvColumnRole.Voltage => "voltage",
            IvColumnRole.Current => "current",
            IvColumnRole.CurrentDensity => "current density",
            _ => "column",
        };

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

        private sealed record RowData(double[] V, double[] I, int[] Lines, int Count, int Skipped, int LastDataLine);

        private RowData ReadRows(int dataStart, ColumnPlan plan)
        {
            int capacity = lines.Count - dataStart;
            var vs = new double[capacity];
            var cs = new double[capacity];
            var ls = new int[capacity];
            int n = 0;
            int skipped = 0;
            int firstSkip = 0, lastSkip = 0;
            int lastData = dataStart + 1;
            int vIdx = plan.VoltageIndex, cIdx = plan.CurrentIndex;
            int maxIdx = Math.Max(vIdx, cIdx);
            char delim = _delimiter;
            UnitScale vu = plan.VoltageUnit, cu = plan.CurrentUnit;
            bool density = plan.Density;
            double area = plan.AreaM2;

            for (int i = dataStart; i < lines.Count; i++)
            {
                ReadOnlySpan<char> line = Line(i);
                if (line.IsWhiteSpace())
                {
                    continue;
                }

                ReadOnlySpan<char> vText = default, cText = default;
                bool vQuoted = false, cQuoted = false;
                int fields = 0;
                var cursor = new FieldCursor(line, delim);
                while (fields <= maxIdx && cursor.MoveNext(out ReadOnlySpan<char> f, out bool q))
                {
                    if (fields == vIdx)
                    {
                        vText = f;
                        vQuoted = q;
                    }
                    else if (fields == cIdx)
                    {
                        cText = f;
                        cQuoted = q;
                    }
                    fields++;
                }

                string? problem = null;
                double v = 0, c = 0;
                if (MetadataParser.IsComment(line))
                {
                    problem = "comment line";
                }
                else if (fields <= maxIdx)
                {
                    problem = LooksLikeText(line, delim)
                        ? $"text line '{MetadataParser.Short(line.Trim())}'"
                        : $"{fields} field{(fields == 1 ? string.Empty : "s")}, the {(fields <= vIdx ? "voltage" : "current")} column {(fields <= vIdx ? vIdx : cIdx) + 1} is missing";
                }
                else if (!ParseCell(vText, vQuoted, delim, out v, out problem, "voltage")
                    || !ParseCell(cText, cQuoted, delim, out c, out problem, "current"))
                {
                    if (LooksLikeText(line, delim))
                    {
                        problem = $"text line '{MetadataParser.Short(line.Trim())}'";
                    }
                }

                if (problem is not null)
                {
                    skipped++;
                    if (skipped == 1)
                    {
                        firstSkip = i + 1;
                    }
                    lastSkip = i + 1;
                    if (skipped <= DetailedSkipWarnings)
                    {
                        _warnings.Add($"line {i + 1}: skipped: {problem}");
                    }
                    continue;
                }

                double vSi = vu.ToSi(v);
                double cSi = cu.ToSi(c);
                if (density)
                {
                    cSi *= area;
                }
                vs[n] = vSi;
                cs[n] = cSi;
                ls[n] = i + 1;
                n++;
                lastData = i + 1;
            }

            if (skipped > DetailedSkipWarnings)
            {
                _warnings.Add($"{skipped} lines skipped in all (lines {firstSkip} to {lastSkip}); the first {DetailedSkipWarnings} are listed above");
            }
            if (n == 0)
            {
                throw new IvFormatException(path, firstSkip > 0 ? firstSkip : dataStart + 1,
                    $"no usable data rows: all {skipped} rows were skipped (first: {(_warnings.Find(w => w.StartsWith("line ", StringComparison.Ordinal)) ?? "?")})");
            }
            if (n == 1)
            {
                throw new IvFormatException(path, ls[0], "only one usable data row; an I–V curve needs at least two points");
            }
            return new RowData(vs, cs, ls, n, skipped, lastData);
        }

        private bool ParseCell(ReadOnlySpan<char> cell, bool quoted, char delim, out double value, out string? problem, string what)
        {
            if (cell.IsEmpty)
            {
                value = 0;
                problem = $"{what} cell is empty";
                return false;
            }
            if (!NumberText.TryParse(cell, AllowComma(delim, quoted), out value, out bool comma))
            {
                problem = $"{what} '{MetadataParser.Short(cell)}' is not a number";
                return false;
            }
            if (!double.IsFinite(value))
            {
                problem = $"{what} '{MetadataParser.Short(cell)}' is not a finite number";
                return false;
            }
            _usedComma |= comma;
            problem = null;
            return true;
        }

        private bool LooksLikeText(ReadOnlySpan<char> line, char delim)
        {
            Classify(line, delim, out _, out int numeric, out int textual);
            return numeric == 0 && textual > 0;
        }

        // ---------------------------------------------------------------- path, finish

        private void ApplyPathPattern(string matchPath, MetadataSet meta)
        {
            if (options.PathPattern is not string pattern)
            {
                return;
            }
            IReadOnlyDictionary<string, string>? values = PathPattern.Create(pattern).Match(matchPath);
            if (values is null)
            {
                _warnings.Add($"path does not match the pattern '{pattern}'; lot, wafer and die not taken from it");
                return;
            }
            foreach ((string key, string value) in values)
            {
                switch (key)
                {
                    case "lot":
                        Override(meta.Lot, value, "lot");
                        meta.Lot = value;
                        break;
                    case "wafer":
                        Override(meta.Wafer, value, "wafer");
                        meta.Wafer = value;
                        break;
                    case "x" or "y":
                        if (int.TryParse(value, System.Globalization.NumberStyles.AllowLeadingSign, System.Globalization.CultureInfo.InvariantCulture, out int n))
                        {
                            int? old = key == "x" ? meta.DieX : meta.DieY;
                            if (old is int o && o != n)
                            {
                                _warnings.Add($"die {key} is {o} in the file but {n} in the path; the path is used");
                            }
                            if (key == "x")
                            {
                                meta.DieX = n;
                            }
                            else
                            {
                                meta.DieY = n;
                            }
                        }
                        break;
                    default:
                        break;
                }
                meta.Raw[key] = value;
            }
        }

        private void Override(string? old, string value, string what)
        {
            if (old is not null && !old.Equals(value, StringComparison.OrdinalIgnoreCase))
            {
                _warnings.Add($"{what} is '{old}' in the file but '{value}' in the path; the path is used");
            }
        }

        private ParseOutcome Finish(RowData data, ColumnPlan plan, MetadataSet meta, string encodingName, int dataStart,
            int? headerLine, bool headerInComment, int? unitsLine)
        {
            int n = data.Count;
            ReadOnlySpan<double> v = data.V.AsSpan(0, n);
            ReadOnlySpan<double> c = data.I.AsSpan(0, n);
            int[] segments = SweepAnalysis.Segments(v);
            int totalSegments = n == 0 ? 0 : segments[n - 1] + 1;
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
                AreaM2 = options.AreaM2 ?? meta.AreaM2,
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
                preamble += IsBlank(i) ? 0 : 1;
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
                totalSegments);
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
