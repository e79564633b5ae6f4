namespace JunctionFit.Import;

/// <summary>
/// A file that cannot be read as an I–V table. <see cref="Exception.Message"/> is
/// <c>path:line: reason</c> (or <c>path:line:column: reason</c>), ready to print.
/// </summary>
public sealed class IvFormatException : Exception
{
    /// <summary>Creates the exception.</summary>
    /// <param name="path">File path as given.</param>
    /// <param name="line">1-based line number (0 when the whole file is at fault).</param>
    /// <param name="reason">What is wrong, in words a user can act on.</param>
    /// <param name="column">1-based column, if known.</param>
    /// <param name="rawText">The offending text, if any (shortened).</param>
    public IvFormatException(string path, int line, string reason, int? column = null, string? rawText = null)
        : base(Format(path, line, reason, column))
    {
        FilePath = path;
        Line = line;
        Column = column;
        Reason = reason;
        RawText = rawText;
    }

    /// <summary>File path as given.</summary>
    public string FilePath { get; }

    /// <summary>1-based line number; 0 for the file as a whole.</summary>
    public int Line { get; }

    /// <summary>1-based column, if known.</summary>
    public int? Column { get; }

    /// <summary>The reason without location.</summary>
    public string Reason { get; }

    /// <summary>The offending raw text, if any.</summary>
    public string? RawText { get; }

    private static string Format(string path, int line, string reason, int? column)
        => column is int c ? $"{path}:{line}:{c}: {reason}" : $"{path}:{line}: {reason}";
}
