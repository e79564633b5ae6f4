using System.Security.Cryptography;
using System.Text;

namespace JunctionFit.Storage;

/// <summary>
/// The identity rule of the results database: a result is the fit of one file's bytes with one model and one set of
/// options. <see cref="FileSha256(string)"/> hashes the bytes (so a renamed or copied file is still the same data, and an
/// edited file is new data); <see cref="JunctionFit.Fitting.FitOptionsText.Canonical"/> (Fitting) writes every option that changes the outcome
/// of a fit as sorted <c>name=value</c> lines with numbers in invariant round-trip form, and <see cref="OptionsHash"/> hashes
/// that text; Storage takes the text and never the options themselves. Equal text means equal options, whatever order or culture they were given in.
/// </summary>
public static class ResultIdentity
{
    /// <summary>SHA-256 of a file's bytes, read as a stream (memory does not grow with the file).</summary>
    /// <param name="path">The file.</param>
    /// <returns>64 lowercase hexadecimal digits.</returns>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty.</exception>
    /// <exception cref="IOException">The file cannot be read.</exception>
    /// <exception cref="UnauthorizedAccessException">The file may not be read.</exception>
    public static string FileSha256(string path)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        using var stream = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 16, FileOptions.SequentialScan);
        return Convert.ToHexStringLower(SHA256.HashData(stream));
    }

    /// <summary>SHA-256 of bytes already in memory.</summary>
    /// <param name="bytes">The file's content.</param>
    /// <returns>64 lowercase hexadecimal digits.</returns>
    public static string Sha256(ReadOnlySpan<byte> bytes) => Convert.ToHexStringLower(SHA256.HashData(bytes));

    /// <summary>SHA-256 of the UTF-8 bytes of a canonical options text.</summary>
    /// <param name="canonicalOptions">Text from <see cref="JunctionFit.Fitting.FitOptionsText.Canonical"/>.</param>
    /// <returns>64 lowercase hexadecimal digits.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="canonicalOptions"/> is null.</exception>
    public static string OptionsHash(string canonicalOptions)
    {
        ArgumentNullException.ThrowIfNull(canonicalOptions);
        return Sha256(Encoding.UTF8.GetBytes(canonicalOptions));
    }

    /// <summary>The key of a fit of data with SHA-256 <paramref name="fileSha256"/> by <paramref name="model"/> under <paramref name="canonicalOptions"/>.</summary>
    /// <param name="fileSha256">From <see cref="FileSha256(string)"/>.</param>
    /// <param name="model">Model name.</param>
    /// <param name="canonicalOptions">From <see cref="JunctionFit.Fitting.FitOptionsText.Canonical"/>.</param>
    /// <returns>The key.</returns>
    /// <exception cref="ArgumentException">A part is empty or malformed.</exception>
    public static ResultKey Key(string fileSha256, string model, string canonicalOptions)
        => new(fileSha256, model, OptionsHash(canonicalOptions));

}
