using System.Text;

namespace JunctionFit.Import;

/// <summary>Turns file bytes into text: BOM detection, UTF-16 without BOM, UTF-8 with a Latin-1 fallback.</summary>
internal static class TextDecoder
{
    private static readonly UTF8Encoding StrictUtf8 = new(encoderShouldEmitUTF8Identifier: false, throwOnInvalidBytes: true);

    /// <summary>Decodes <paramref name="bytes"/>; <paramref name="encodingName"/> says which decoding was used.</summary>
    public static string Decode(ReadOnlySpan<byte> bytes, out string encodingName)
    {
        if (bytes.Length >= 4 && bytes[0] == 0xFF && bytes[1] == 0xFE && bytes[2] == 0 && bytes[3] == 0)
        {
            encodingName = "UTF-32 LE (BOM)";
            return new UTF32Encoding(bigEndian: false, byteOrderMark: true).GetString(bytes[4..]);
        }
        if (bytes.Length >= 3 && bytes[0] == 0xEF && bytes[1] == 0xBB && bytes[2] == 0xBF)
        {
            encodingName = "UTF-8 (BOM)";
            return DecodeUtf8OrLatin1(bytes[3..], ref encodingName);
        }
        if (bytes.Length >= 2 && bytes[0] == 0xFF && bytes[1] == 0xFE)
        {
            encodingName = "UTF-16 LE (BOM)";
            return Encoding.Unicode.GetString(bytes[2..]);
        }
        if (bytes.Length >= 2 && bytes[0] == 0xFE && bytes[1] == 0xFF)
        {
            encodingName = "UTF-16 BE (BOM)";
            return Encoding.BigEndianUnicode.GetString(bytes[2..]);
        }
        if (LooksUtf16(bytes, out bool bigEndian))
        {
            encodingName = bigEndian ? "UTF-16 BE" : "UTF-16 LE";
            return (bigEndian ? Encoding.BigEndianUnicode : Encoding.Unicode).GetString(bytes);
        }
        encodingName = "UTF-8";
        return DecodeUtf8OrLatin1(bytes, ref encodingName);
    }

    private static string DecodeUtf8OrLatin1(ReadOnlySpan<byte> bytes, ref string encodingName)
    {
        try
        {
            return StrictUtf8.GetString(bytes);
        }
        catch (DecoderFallbackException)
        {
            encodingName = "Latin-1 (not valid UTF-8)";
            return Encoding.Latin1.GetString(bytes);
        }
    }

    /// <summary>
    /// Text in UTF-16 without a BOM shows as a zero byte in every other position for ASCII content
    /// (common practice, no source): at least 40 % of one parity zero and almost none of the other.
    /// </summary>
    private static bool LooksUtf16(ReadOnlySpan<byte> bytes, out bool bigEndian)
    {
        bigEndian = false;
        int n = Math.Min(bytes.Length, 4096) & ~1;
        if (n < 4 || !bytes[..n].Contains((byte)0))
        {
            return false; // no zero byte: neither parity has any
        }
        int evenZeros = 0, oddZeros = 0;
        for (int i = 0; i < n; i += 2)
        {
            if (bytes[i] == 0)
            {
                evenZeros++;
            }
            if (bytes[i + 1] == 0)
            {
                oddZeros++;
            }
        }
        int pairs = n / 2;
        if (oddZeros >= 0.4 * pairs && evenZeros <= 0.02 * pairs)
        {
            return true;
        }
        if (evenZeros >= 0.4 * pairs && oddZeros <= 0.02 * pairs)
        {
            bigEndian = true;
            return true;
        }
        return false;
    }

    /// <summary>
    /// Longest run of bytes without CR or LF. Used to refuse an over-long line before decoding;
    /// meaningful for single-byte and UTF-8 text only.
    /// </summary>
    public static int LongestByteRun(ReadOnlySpan<byte> bytes)
    {
        int longest = 0;
        while (true)
        {
            int i = bytes.IndexOfAny((byte)'\n', (byte)'\r');
            if (i < 0)
            {
                return Math.Max(longest, bytes.Length);
            }
            longest = Math.Max(longest, i);
            bytes = bytes[(i + 1)..];
        }
    }
}

/// <summary>Start and length of every line of a text; CR, LF and CRLF all end a line.</summary>
internal sealed class LineTable
{
    private int[] _starts;
    private int[] _lengths;

    private LineTable(int capacity)
    {
        _starts = new int[capacity];
        _lengths = new int[capacity];
    }

    /// <summary>Number of lines (a final line end does not start another line).</summary>
    public int Count { get; private set; }

    /// <summary>Lines ended by LF alone.</summary>
    public int LfCount { get; private set; }

    /// <summary>Lines ended by CR LF.</summary>
    public int CrLfCount { get; private set; }

    /// <summary>Lines ended by CR alone.</summary>
    public int CrCount { get; private set; }

    /// <summary>The 0-based line that is longer than the limit, or -1.</summary>
    public int TooLongLine { get; private set; } = -1;

    /// <summary>Length of <see cref="TooLongLine"/>.</summary>
    public int TooLongLength { get; private set; }

    /// <summary>Start offset of line <paramref name="i"/> (0-based).</summary>
    public int Start(int i) => _starts[i];

    /// <summary>Length of line <paramref name="i"/> without its line end.</summary>
    public int Length(int i) => _lengths[i];

    /// <summary>Splits <paramref name="text"/>; stops early at the first line longer than <paramref name="maxLineLength"/>.</summary>
    public static LineTable Build(string text, int maxLineLength)
    {
        var table = new LineTable(Math.Max(16, Math.Min(text.Length / 16, 1 << 22)));
        ReadOnlySpan<char> all = text;
        int pos = 0;
        while (pos < all.Length)
        {
            int rel = all[pos..].IndexOfAny('\r', '\n');
            int len = rel < 0 ? all.Length - pos : rel;
            if (len > maxLineLength)
            {
                table.TooLongLine = table.Count;
                table.TooLongLength = len;
                table.Add(pos, len);
                return table;
            }
            table.Add(pos, len);
            if (rel < 0)
            {
                break;
            }
            int end = pos + rel;
            if (all[end] == '\r')
            {
                if (end + 1 < all.Length && all[end + 1] == '\n')
                {
                    table.CrLfCount++;
                    pos = end + 2;
                }
                else
                {
                    table.CrCount++;
                    pos = end + 1;
                }
            }
            else
            {
                table.LfCount++;
                pos = end + 1;
            }
        }
        return table;
    }

    private void Add(int start, int length)
    {
        if (Count == _starts.Length)
        {
            Array.Resize(ref _starts, _starts.Length * 2);
            Array.Resize(ref _lengths, _lengths.Length * 2);
        }
        _starts[Count] = start;
        _lengths[Count] = length;
        Count++;
    }

    /// <summary>A name for the line ends seen: LF, CRLF, CR, mixed or none.</summary>
    public string LineEndName()
    {
        int kinds = (LfCount > 0 ? 1 : 0) + (CrLfCount > 0 ? 1 : 0) + (CrCount > 0 ? 1 : 0);
        if (kinds > 1)
        {
            return "mixed";
        }
        return LfCount > 0 ? "LF" : CrLfCount > 0 ? "CRLF" : CrCount > 0 ? "CR" : "none";
    }
}
