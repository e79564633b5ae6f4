namespace JunctionFit.Storage;

/// <summary>
/// Identity of a stored result: the SHA-256 of the input file's bytes, the model name and the hash of the canonical
/// fit-options text (see <see cref="ResultIdentity"/>). Two fits with equal keys are the same fit of the same data,
/// so the database holds at most one row per key (a unique constraint enforces it).
/// </summary>
public readonly record struct ResultKey
{
    /// <summary>Creates a key, checking each part.</summary>
    /// <param name="fileSha256">SHA-256 of the file's bytes as 64 lowercase hexadecimal digits.</param>
    /// <param name="model">Model name (as for <c>--model</c>).</param>
    /// <param name="optionsHash">Hash of the canonical options text as 64 lowercase hexadecimal digits.</param>
    /// <exception cref="ArgumentException">A part is empty or a hash is not 64 lowercase hexadecimal digits.</exception>
    public ResultKey(string fileSha256, string model, string optionsHash)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(model);
        FileSha256 = CheckHash(fileSha256, nameof(fileSha256));
        Model = model;
        OptionsHash = CheckHash(optionsHash, nameof(optionsHash));
    }

    /// <summary>SHA-256 of the input file's bytes, 64 lowercase hexadecimal digits.</summary>
    public string FileSha256 { get; }

    /// <summary>Model name.</summary>
    public string Model { get; }

    /// <summary>SHA-256 of the canonical fit-options text, 64 lowercase hexadecimal digits.</summary>
    public string OptionsHash { get; }

    /// <inheritdoc />
    public override string ToString() => $"{FileSha256[..12]}/{Model}/{OptionsHash[..12]}";

    private static string CheckHash(string value, string name)
    {
        ArgumentNullException.ThrowIfNull(value, name);
        if (value.Length != 64) throw new ArgumentException($"expected 64 hexadecimal digits, got {value.Length} characters", name);
        foreach (char c in value)
        {
            if (c is not (>= '0' and <= '9' or >= 'a' and <= 'f'))
            {
                throw new ArgumentException($"'{c}' is not a lowercase hexadecimal digit", name);
            }
        }
        return value;
    }
}
