namespace JunctionFit.Storage;

/// <summary>
/// A results table (<c>results.csv</c>) or an ellipsometry table that cannot be read.
/// <see cref="Exception.Message"/> is <c>path:line: reason</c> (or <c>path:line:column: reason</c>), ready to print.
/// </summary>
public sealed class ResultsFormatException : Exception
{
    /// <summary>Creates the exception.</summary>
    /// <param name="path">File path as given.</param>
    /// <param name="line">1-based line number (0 when the whole file is at fault).</param>
    /// <param name="reason">What is wrong, in words a user can act on.</param>
    /// <param name="column">1-based field number, if known.</param>
    /// <param name="rawText">The offending text, if any (shortened to 80 characters).</param>
    public ResultsFormatException(string path, int line, string reason, int? column = null, string? rawText = null)
        : base(column is int c ? $"{path}:{line}:{c}: {reason}" : $"{path}:{line}: {reason}")
    {
        FilePath = path;
        Line = line;
        Column = column;
        Reason = reason;
        RawText = rawText is { Length: > 80 } ? rawText[..80] + "…" : rawText;
    }

    /// <summary>File path as given.</summary>
    public string FilePath { get; }

    /// <summary>1-based line number; 0 for the file as a whole.</summary>
    public int Line { get; }

    /// <summary>1-based field number, if known.</summary>
    public int? Column { get; }

    /// <summary>The reason without location.</summary>
    public string Reason { get; }

    /// <summary>The offending raw text, if any.</summary>
    public string? RawText { get; }
}
