namespace JunctionFit.Import;

/// <summary>
/// Reads current–voltage tables written by probe stations and parameter analyzers into an
/// <see cref="IvCurve"/> in SI units. The layout is detected (delimiter, decimal comma, preamble,
/// header, units, column roles); <see cref="IvReadOptions"/> overrides the detection. Anything that
/// is not an I–V table is refused with an <see cref="IvFormatException"/> whose message reads
/// <c>path:line: reason</c>. Input files are only read, never written. See docs/file-formats.md.
/// </summary>
public static class IvFileReader
{
    /// <summary>Reads one file.</summary>
    /// <param name="path">The file path; kept as given in <see cref="IvCurve.SourcePath"/> and in messages.</param>
    /// <param name="options">Overrides; null detects everything.</param>
    /// <returns>The curve.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="path"/> is null.</exception>
    /// <exception cref="IvFormatException">The file cannot be read or is not an I–V table.</exception>
    public static IvCurve ReadFile(string path, IvReadOptions? options = null) => Load(path, options).Curve;

    /// <summary>Reads an I–V table from text that is already in memory.</summary>
    /// <param name="text">The file's text.</param>
    /// <param name="sourcePath">The path to report in messages and in <see cref="IvCurve.SourcePath"/>.</param>
    /// <param name="options">Overrides; null detects everything.</param>
    /// <returns>The curve.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="IvFormatException">The text is not an I–V table.</exception>
    public static IvCurve Parse(string text, string sourcePath, IvReadOptions? options = null)
        => ParseText(text, sourcePath, options).Curve;

    /// <summary>Reads one file and says what was understood about it.</summary>
    /// <param name="path">The file path.</param>
    /// <param name="options">Overrides; null detects everything.</param>
    /// <returns>The description, including the curve.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="path"/> is null.</exception>
    /// <exception cref="IvFormatException">The file cannot be read or is not an I–V table.</exception>
    public static ImportDescription Describe(string path, IvReadOptions? options = null) => new(Load(path, options));

    /// <summary>Says what was understood about text already in memory.</summary>
    /// <param name="text">The file's text.</param>
    /// <param name="sourcePath">The path to report.</param>
    /// <param name="options">Overrides; null detects everything.</param>
    /// <returns>The description, including the curve.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="IvFormatException">The text is not an I–V table.</exception>
    public static ImportDescription DescribeText(string text, string sourcePath, IvReadOptions? options = null)
        => new(ParseText(text, sourcePath, options));

    private static ParseOutcome ParseText(string text, string sourcePath, IvReadOptions? options)
    {
        ArgumentNullException.ThrowIfNull(text);
        ArgumentNullException.ThrowIfNull(sourcePath);
        return IvTableParser.Parse(text, sourcePath, sourcePath, options ?? IvReadOptions.Default, "text");
    }

    private static ParseOutcome Load(string path, IvReadOptions? options)
    {
        ArgumentNullException.ThrowIfNull(path);
        IvReadOptions o = options ?? IvReadOptions.Default;
        byte[] bytes;
        string fullPath;
        try
        {
            fullPath = Path.GetFullPath(path);
            var info = new FileInfo(fullPath);
            if (Directory.Exists(fullPath))
            {
                throw new IvFormatException(path, 0, "is a folder, not a file");
            }
            if (!info.Exists)
            {
                throw new IvFormatException(path, 0, "file not found");
            }
            if (info.Length > o.MaxFileBytes)
            {
                throw new IvFormatException(path, 0, $"file is {info.Length} bytes; files of up to {o.MaxFileBytes} bytes are read (option MaxFileBytes)");
            }
            bytes = File.ReadAllBytes(fullPath);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException or System.Security.SecurityException)
        {
            throw new IvFormatException(path, 0, $"cannot read the file: {e.Message}");
        }

        return ParseBytes(bytes, path, fullPath, o);
    }

    /// <summary>The byte-level part of <see cref="ReadFile"/>: line-length guard, decoding, parsing.</summary>
    internal static ParseOutcome ParseBytes(byte[] bytes, string path, string matchPath, IvReadOptions o)
    {
        if (bytes.Length >= 2 && !(bytes[0] is 0xFF or 0xFE) && TextDecoder.LongestByteRun(bytes) is int run && run > 4L * o.MaxLineLength)
        {
            // Refuse an over-long line before decoding it (UTF-8 takes at most four bytes a character).
            throw new IvFormatException(path, LineOfLongRun(bytes, o.MaxLineLength),
                $"line is about {run} bytes long; lines of up to {o.MaxLineLength} characters are read (option MaxLineLength)");
        }

        string text = TextDecoder.Decode(bytes, out string encoding);
        return IvTableParser.Parse(text, path, matchPath, o, encoding);
    }

    private static int LineOfLongRun(ReadOnlySpan<byte> bytes, int maxLineLength)
    {
        int line = 1;
        int runStart = 0;
        for (int i = 0; i < bytes.Length; i++)
        {
            byte b = bytes[i];
            if (b == (byte)'\n' || b == (byte)'\r')
            {
                if (i - runStart > 4L * maxLineLength)
                {
                    return line;
                }
                if (!(b == (byte)'\r' && i + 1 < bytes.Length && bytes[i + 1] == (byte)'\n'))
                {
                    line++;
                }
                runStart = i + 1;
            }
        }
        return line;
    }
}
