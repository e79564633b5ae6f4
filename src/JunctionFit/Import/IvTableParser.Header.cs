namespace JunctionFit.Import;

/// <summary>The importer's pipeline, part: the header and units rows: column names, units and kinds.</summary>
internal static partial class IvTableParser
{
    private sealed partial class Context
    {
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
    }
}
