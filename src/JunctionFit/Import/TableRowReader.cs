namespace JunctionFit.Import;

/// <summary>Reads the data rows of a located table into numbers in SI, skipping (with a warning) rows that cannot be read.</summary>
/// <param name="table">The file's lines.</param>
/// <param name="delimiter">The field delimiter found for the data.</param>
/// <param name="warnings">Where skipped rows are told.</param>
internal sealed class TableRowReader(TableText table, char delimiter, List<string> warnings)
{
    private readonly TableText _table = table;
    private readonly char _delimiter = delimiter;
    private readonly List<string> _warnings = warnings;

    /// <summary>True once a number with a decimal comma was read.</summary>
    public bool UsedComma { get; private set; }

    /// <summary>Reads the rows from <paramref name="dataStart"/> as <paramref name="plan"/> says; a row that cannot be read is skipped with a warning naming its line.</summary>
    /// <exception cref="IvFormatException">Fewer than two usable rows.</exception>
    public TableRows Read(int dataStart, ColumnPlan plan)
    {
        int capacity = _table.Count - dataStart;
        var vs = new double[capacity];
        var cs = new double[capacity];
        var ls = new int[capacity];
        int n = 0;
        int skipped = 0;
        int firstSkip = 0, lastSkip = 0;
        int lastData = dataStart + 1;
        int vIdx = plan.VoltageIndex, cIdx = plan.CurrentIndex;
        int maxIdx = Math.Max(vIdx, cIdx);
        int piIdx = plan.PairCurrentIndex, pjIdx = plan.PairDensityIndex;
        bool pair = piIdx >= 0 && pjIdx >= 0;
        double[]? pis = pair ? new double[capacity] : null;
        double[]? pjs = pair ? new double[capacity] : null;
        int readTo = pair ? Math.Max(maxIdx, Math.Max(piIdx, pjIdx)) : maxIdx;
        bool absolute = plan.Absolute;
        char delim = _delimiter;
        UnitScale vu = plan.VoltageUnit, cu = plan.CurrentUnit;
        bool density = plan.Density;
        double area = plan.AreaM2;

        for (int i = dataStart; i < _table.Count; i++)
        {
            ReadOnlySpan<char> line = _table.Line(i);
            if (line.IsWhiteSpace())
            {
                continue;
            }

            ReadOnlySpan<char> vText = default, cText = default, piText = default, pjText = default;
            bool vQuoted = false, cQuoted = false, piQuoted = false, pjQuoted = false;
            int fields = 0;
            var cursor = new FieldCursor(line, delim);
            while (fields <= readTo && cursor.MoveNext(out ReadOnlySpan<char> f, out bool q))
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
                if (pair && fields == piIdx)
                {
                    piText = f;
                    piQuoted = q;
                }
                if (pair && fields == pjIdx)
                {
                    pjText = f;
                    pjQuoted = q;
                }
                fields++;
            }
            if (fields > maxIdx + 1)
            {
                fields = maxIdx + 1;
            }

            string? problem = null;
            double v = 0, c = 0;
            if (MetadataParser.IsComment(line))
            {
                problem = "comment line";
            }
            else if (fields <= maxIdx)
            {
                problem = _table.LooksLikeText(line, delim)
                    ? $"text line '{MetadataParser.Short(line.Trim())}'"
                    : $"{fields} field{(fields == 1 ? string.Empty : "s")}, the {(fields <= vIdx ? "voltage" : "current")} column {(fields <= vIdx ? vIdx : cIdx) + 1} is missing";
            }
            else if (!ParseCell(vText, vQuoted, delim, out v, out problem, "voltage")
                || !ParseCell(cText, cQuoted, delim, out c, out problem, "current"))
            {
                if (_table.LooksLikeText(line, delim))
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
                if (skipped <= IvTableParser.DetailedSkipWarnings)
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
            if (absolute)
            {
                // |I| or |J| only: the current flows the way the bias drives it.
                cSi = vSi < 0 ? -Math.Abs(cSi) : Math.Abs(cSi);
            }
            if (pair)
            {
                pis![n] = LenientCell(piText, piQuoted, delim, plan.PairCurrentUnit);
                pjs![n] = LenientCell(pjText, pjQuoted, delim, plan.PairDensityUnit);
            }
            vs[n] = vSi;
            cs[n] = cSi;
            ls[n] = i + 1;
            n++;
            lastData = i + 1;
        }

        if (skipped > IvTableParser.DetailedSkipWarnings)
        {
            _warnings.Add($"{skipped} lines skipped in all (lines {firstSkip} to {lastSkip}); the first {IvTableParser.DetailedSkipWarnings} are listed above");
        }
        if (n == 0)
        {
            throw new IvFormatException(_table.Path, firstSkip > 0 ? firstSkip : dataStart + 1,
                $"no usable data rows: all {skipped} rows were skipped (first: {(_warnings.Find(w => w.StartsWith("line ", StringComparison.Ordinal)) ?? "?")})");
        }
        if (n == 1)
        {
            throw new IvFormatException(_table.Path, ls[0], "only one usable data row; an I–V curve needs at least two points");
        }
        return new TableRows(vs, cs, ls, n, skipped, lastData) { PairI = pis, PairJ = pjs };
    }

    private double LenientCell(ReadOnlySpan<char> cell, bool quoted, char delim, UnitScale unit)
        => !cell.IsEmpty && NumberText.TryParse(cell, _table.AllowComma(delim, quoted), out double x, out _) && double.IsFinite(x) ? unit.ToSi(x) : double.NaN;

    private bool ParseCell(ReadOnlySpan<char> cell, bool quoted, char delim, out double value, out string? problem, string what)
    {
        if (cell.IsEmpty)
        {
            value = 0;
            problem = $"{what} cell is empty";
            return false;
        }
        if (!NumberText.TryParse(cell, _table.AllowComma(delim, quoted), out value, out bool comma))
        {
            problem = $"{what} '{MetadataParser.Short(cell)}' is not a number";
            return false;
        }
        if (!double.IsFinite(value))
        {
            problem = $"{what} '{MetadataParser.Short(cell)}' is not a finite number";
            return false;
        }
        UsedComma |= comma;
        problem = null;
        return true;
    }
}
