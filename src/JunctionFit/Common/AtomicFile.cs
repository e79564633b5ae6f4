using System.Text;

namespace JunctionFit.Common;

/// <summary>
/// Writes whole files so that a reader (or a crash) never sees half of one: the content goes to a
/// temporary file in the target's own directory, is flushed to disk, and is then renamed over the
/// target in one step. A rename inside one directory stays on one file system, so it is atomic on
/// POSIX systems and on NTFS. The directory is created when missing.
/// </summary>
public static class AtomicFile
{
    /// <summary>UTF-8 without a byte-order mark, the encoding of every text file the project writes.</summary>
    public static Encoding Utf8NoBom { get; } = new UTF8Encoding(encoderShouldEmitUTF8Identifier: false);

    /// <summary>Replaces (or creates) <paramref name="path"/> with <paramref name="bytes"/>.</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="bytes">The complete new content.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written or renamed; the target is left as it was.</exception>
    /// <exception cref="UnauthorizedAccessException">The directory or target may not be written.</exception>
    public static void WriteAllBytes(string path, ReadOnlySpan<byte> bytes)
    {
        string target = PrepareTarget(path);
        string temp = TempPathFor(target);
        try
        {
            using (var stream = OpenTemp(temp))
            {
                stream.Write(bytes);
                stream.Flush(flushToDisk: true);
            }
            File.Move(temp, target, overwrite: true);
        }
        catch
        {
            TryDelete(temp);
            throw;
        }
    }

    /// <summary>Replaces (or creates) <paramref name="path"/> with <paramref name="text"/> in UTF-8 without a byte-order mark.</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="text">The complete new content.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written or renamed; the target is left as it was.</exception>
    /// <exception cref="UnauthorizedAccessException">The directory or target may not be written.</exception>
    public static void WriteAllText(string path, string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        WriteAllBytes(path, Utf8NoBom.GetBytes(text));
    }

    /// <summary>
    /// Replaces (or creates) <paramref name="path"/> with whatever <paramref name="write"/> puts into the stream it is given.
    /// If <paramref name="write"/> throws, the target is left as it was and the temporary file is removed.
    /// </summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="write">Writes the complete content; must not keep the stream.</param>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written or renamed; the target is left as it was.</exception>
    /// <exception cref="UnauthorizedAccessException">The directory or target may not be written.</exception>
    public static void Write(string path, Action<Stream> write)
    {
        ArgumentNullException.ThrowIfNull(write);
        string target = PrepareTarget(path);
        string temp = TempPathFor(target);
        try
        {
            using (var stream = OpenTemp(temp))
            {
                write(stream);
                stream.Flush(flushToDisk: true);
            }
            File.Move(temp, target, overwrite: true);
        }
        catch
        {
            TryDelete(temp);
            throw;
        }
    }

    private static string PrepareTarget(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        string full = Path.GetFullPath(path);
        if (Directory.Exists(full))
        {
            throw new ArgumentException($"'{path}' is a directory, not a file", nameof(path));
        }
        string? directory = Path.GetDirectoryName(full);
        if (string.IsNullOrEmpty(directory) || string.IsNullOrEmpty(Path.GetFileName(full)))
        {
            throw new ArgumentException($"'{path}' does not name a file", nameof(path));
        }
        Directory.CreateDirectory(directory);
        return full;
    }

    /// <summary>A hidden, unique sibling of the target: same directory, so the final rename never crosses file systems.</summary>
    internal static string TempPathFor(string fullTarget)
    {
        string directory = Path.GetDirectoryName(fullTarget)!;
        string name = Path.GetFileName(fullTarget);
        return Path.Combine(directory, $".{name}.{Guid.NewGuid():N}.tmp");
    }

    private static FileStream OpenTemp(string temp)
        => new(temp, FileMode.CreateNew, FileAccess.Write, FileShare.None, bufferSize: 64 * 1024, FileOptions.None);

    private static void TryDelete(string temp)
    {
        try
        {
            File.Delete(temp);
        }
        catch (IOException)
        {
            // Best effort: the original exception is the one that matters.
        }
        catch (UnauthorizedAccessException)
        {
            // Same.
        }
    }
}
