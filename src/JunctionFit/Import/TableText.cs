namespace JunctionFit.Import;

/// <summary>
/// The text of one table file, line by line, and how its fields read: the view the table locator, the header reader and the
/// row reader share.
/// </summary>
/// <param name="text">The whole file.</param>
/// <param name="lines">Where each line starts and ends.</param>
/// <param name="path">The file, for messages.</param>
/// <param name="decimalCommaOption">The user's choice of decimal separator (null: decide per delimiter).</param>
internal sealed class TableText(string text, LineTable lines, string path, bool? decimalCommaOption)
{
    /// <summary>The file, for messages.</summary>
    public string Path => path;

    /// <summary>Number of lines.</summary>
    public int Count => lines.Count;

    /// <summary>Line <paramref name="i"/> (0-based) without its line break.</summary>
    public ReadOnlySpan<char> Line(int i) => text.AsSpan(lines.Start(i), lines.Length(i));

    /// <summary>True when line <paramref name="i"/> holds only white space.</summary>
    public bool IsBlank(int i) => Line(i).IsWhiteSpace();

    /// <summary>Whether a decimal comma may be read in a field: as the option says, else unless commas separate the fields (a quoted field may hold one).</summary>
    public bool AllowComma(char delimiter, bool quoted) => decimalCommaOption ?? (delimiter != ',' || quoted);

    /// <summary>Fields of a line (up to the last non-empty one), how many read as numbers and how many as text.</summary>
    public void Classify(ReadOnlySpan<char> line, char delim, out int count, out int numeric, out int textual)
        => Classify(line, delim, out count, out numeric, out textual, out _);

    /// <summary>As the other overload; <paramref name="raw"/> counts trailing empty fields too.</summary>
    public void Classify(ReadOnlySpan<char> line, char delim, out int count, out int numeric, out int textual, out int raw)
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

    /// <summary>The nearest line at or above <paramref name="i"/> that is not blank, or −1.</summary>
    public int PreviousNonBlank(int i)
    {
        while (i >= 0 && IsBlank(i))
        {
            i--;
        }
        return i;
    }

    /// <summary>True when the line has text fields and no numbers (a header or a note inside the data).</summary>
    public bool LooksLikeText(ReadOnlySpan<char> line, char delim)
    {
        Classify(line, delim, out _, out int numeric, out int textual);
        return numeric == 0 && textual > 0;
    }
}
