namespace JunctionFit.Import;

/// <summary>Lot, wafer and die taken from a file's path by a <see cref="PathPattern"/> (<c>--path-pattern</c>).</summary>
internal static class PathMetadata
{
    /// <summary>Applies <paramref name="pattern"/> to <paramref name="matchPath"/>; values differing from the file's are replaced, with a warning.</summary>
    /// <param name="pattern">The path pattern (null: nothing to do).</param>
    /// <param name="matchPath">The path matched against the pattern.</param>
    /// <param name="meta">The file's metadata, updated.</param>
    /// <param name="warnings">Where the differences are told.</param>
    public static void Apply(string? pattern, string matchPath, MetadataSet meta, List<string> warnings)
    {
        if (pattern is null)
        {
            return;
        }
        IReadOnlyDictionary<string, string>? values = PathPattern.Create(pattern).Match(matchPath);
        if (values is null)
        {
            warnings.Add($"path does not match the pattern '{pattern}'; lot, wafer and die not taken from it");
            return;
        }
        foreach ((string key, string value) in values)
        {
            switch (key)
            {
                case "lot":
                    Override(meta.Lot, value, "lot", warnings);
                    meta.Lot = value;
                    break;
                case "wafer":
                    Override(meta.Wafer, value, "wafer", warnings);
                    meta.Wafer = value;
                    break;
                case "x" or "y":
                    if (int.TryParse(value, System.Globalization.NumberStyles.AllowLeadingSign, System.Globalization.CultureInfo.InvariantCulture, out int n))
                    {
                        int? old = key == "x" ? meta.DieX : meta.DieY;
                        if (old is int o && o != n)
                        {
                            warnings.Add($"die {key} is {o} in the file but {n} in the path; the path is used");
                        }
                        if (key == "x")
                        {
                            meta.DieX = n;
                        }
                        else
                        {
                            meta.DieY = n;
                        }
                    }
                    break;
                default:
                    break;
            }
            meta.Raw[key] = value;
        }
    }

    private static void Override(string? old, string value, string what, List<string> warnings)
    {
        if (old is not null && !old.Equals(value, StringComparison.OrdinalIgnoreCase))
        {
            warnings.Add($"{what} is '{old}' in the file but '{value}' in the path; the path is used");
        }
    }
}
