namespace JunctionFit.Cli.Support;

/// <summary>Expands the PATH arguments of a command into the list of files to process.</summary>
public static class InputFiles
{
    /// <summary>File extensions taken from a folder (case-insensitive).</summary>
    public static readonly string[] Extensions = [".csv", ".tsv", ".txt", ".dat", ".iv"];

    /// <summary>
    /// Files are taken as given; a folder contributes every file below it with an I–V extension, in ordinal
    /// path order (deterministic). Returns the files and the paths that do not exist.
    /// </summary>
    public static (List<string> Files, List<string> Missing) Expand(IEnumerable<string> paths)
    {
        ArgumentNullException.ThrowIfNull(paths);
        var files = new List<string>();
        var missing = new List<string>();
        foreach (string path in paths)
        {
            if (File.Exists(path))
            {
                files.Add(path);
            }
            else if (Directory.Exists(path))
            {
                var found = new List<string>();
                foreach (string f in Directory.EnumerateFiles(path, "*", SearchOption.AllDirectories))
                {
                    string ext = Path.GetExtension(f);
                    foreach (string e in Extensions)
                    {
                        if (string.Equals(ext, e, StringComparison.OrdinalIgnoreCase)) { found.Add(f); break; }
                    }
                }
                found.Sort(StringComparer.Ordinal);
                files.AddRange(found);
            }
            else if (path.StartsWith('-'))
            {
                throw new UsageException($"unknown option '{path}' (run with --help for the options)");
            }
            else
            {
                missing.Add(path);
            }
        }
        return (files, missing);
    }
}
