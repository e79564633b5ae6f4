using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>File names of fit plots, unique within one run.</summary>
public static class PlotFileNames
{
    /// <summary>
    /// A plot file name made unique within the run. When the result knows its lot, wafer and die the name is built from
    /// them (lot KM-A01, wafer W01, die (3, 4) → KM-A01_W01_die_3_4.png), wherever the file lies; otherwise from the input
    /// path relative to the working directory, folders joined by '_' (lot/wafer/die_3_4.csv → lot_wafer_die_3_4.png),
    /// or the file name alone for a file outside it. A name already in <paramref name="used"/> gets -2, -3, … .
    /// </summary>
    /// <param name="result">The fit the plot shows.</param>
    /// <param name="used">Names given so far in this run; the new name is added.</param>
    /// <returns>A file name (no folder) ending in .png.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    public static string Unique(FitResult result, HashSet<string> used)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentNullException.ThrowIfNull(used);
        string stem;
        if (result.Lot is not null && result.Wafer is not null && result.DieX is int x && result.DieY is int y)
        {
            stem = FormattableString.Invariant($"{result.Lot.Trim()}_{result.Wafer.Trim()}_die_{x}_{y}");
        }
        else
        {
            string sourcePath = result.SourcePath;
            string relative = Path.GetRelativePath(Directory.GetCurrentDirectory(), sourcePath);
            if (relative.StartsWith("..", StringComparison.Ordinal) || Path.IsPathRooted(relative)) relative = Path.GetFileName(sourcePath);
            string withoutExt = Path.ChangeExtension(relative, null) ?? relative;
            stem = withoutExt.Replace(Path.DirectorySeparatorChar, '_').Replace(Path.AltDirectorySeparatorChar, '_').TrimStart('.', '_');
        }
        if (stem.Length == 0) stem = "fit";
        foreach (char c in Path.GetInvalidFileNameChars()) stem = stem.Replace(c, '_');
        string name = stem + ".png";
        for (int i = 2; !used.Add(name); i++) name = $"{stem}-{i}.png";
        return name;
    }
}
