using System.Globalization;

namespace JunctionFit.Import;

/// <summary>
/// Walks the fields of one line without allocating. The delimiter <c>' '</c> stands for runs of
/// spaces and tabs. A field may be enclosed in double quotes; a doubled quote inside stays doubled
/// in the returned span (numbers never contain quotes; header text is unescaped by the caller).
/// Fields are trimmed of surrounding spaces and tabs.
/// </summary>
internal ref struct FieldCursor
{
    private readonly ReadOnlySpan<char> _line;
    private readonly char _delimiter;
    private int _pos;
    private bool _done;

    public FieldCursor(ReadOnlySpan<char> line, char delimiter)
    {
        _line = line;
        _delimiter = delimiter;
        _pos = 0;
        _done = false;
    }

    /// <summary>Moves to the next field; false at the end of the line.</summary>
    public bool MoveNext(out ReadOnlySpan<char> field, out bool quoted)
    {
        field = default;
        quoted = false;
        if (_done)
        {
            return false;
        }

        ReadOnlySpan<char> rest = _line[_pos..];
        int skip = 0;
        while (skip < rest.Length && (rest[skip] == ' ' || (rest[skip] == '\t' && _delimiter != '\t')))
        {
            skip++;
        }

        if (_delimiter == ' ' && skip == rest.Length)
        {
            _done = true;
            return false;
        }

        rest = rest[skip..];
        int start = _pos + skip;

        if (rest.Length > 0 && rest[0] == '"')
        {
            quoted = true;
            int close = ClosingQuote(rest);
            if (close < 0)
            {
                // Unterminated quote: the rest of the line is the field.
                field = rest[1..];
                _done = true;
                return true;
            }
            field = rest[1..close];
            int after = close + 1;
            int next = NextDelimiter(rest[after..]);
            if (next < 0)
            {
                _done = true;
            }
            else
            {
                _pos = start + after + next + 1;
            }
            return true;
        }

        int end = NextDelimiter(rest);
        if (end < 0)
        {
            field = TrimBlanks(rest);
            _done = true;
        }
        else
        {
            field = TrimBlanks(rest[..end]);
            _pos = start + end + 1;
        }
        return true;
    }

    private readonly int NextDelimiter(ReadOnlySpan<char> s)
        => _delimiter == ' ' ? s.IndexOfAny(' ', '\t') : s.IndexOf(_delimiter);

    private static int ClosingQuote(ReadOnlySpan<char> s)
    {
        int i = 1;
        while (i < s.Length)
        {
            int q = s[i..].IndexOf('"');
            if (q < 0)
            {
                return -1;
            }
            i += q;
            if (i + 1 < s.Length && s[i + 1] == '"')
            {
                i += 2;
                continue;
            }
            return i;
        }
        return -1;
    }

    private static ReadOnlySpan<char> TrimBlanks(ReadOnlySpan<char> s) => s.Trim(" \t");
}

/// <summary>Number parsing on spans with the invariant culture; optional decimal comma.</summary>
internal static class NumberText
{
    private const NumberStyles Style = NumberStyles.Float;

    /// <summary>
    /// Parses a number written with a decimal point (or, when <paramref name="decimalComma"/>, a
    /// single decimal comma). NaN and infinities parse (the caller decides what to do with them).
    /// </summary>
    public static bool TryParse(ReadOnlySpan<char> s, bool decimalComma, out double value, out bool usedComma)
    {
        usedComma = false;
        s = s.Trim();
        if (s.IsEmpty)
        {
            value = 0;
            return false;
        }
        int comma = s.IndexOf(',');
        if (comma >= 0)
        {
            if (!decimalComma || s.Length > 64 || s.Contains('.') || s[(comma + 1)..].Contains(','))
            {
                value = 0;
                return false;
            }
            Span<char> buffer = stackalloc char[s.Length];
            s.CopyTo(buffer);
            buffer[comma] = '.';
            usedComma = true;
            return double.TryParse(buffer, Style, CultureInfo.InvariantCulture, out value);
        }
        return double.TryParse(s, Style, CultureInfo.InvariantCulture, out value);
    }
}
