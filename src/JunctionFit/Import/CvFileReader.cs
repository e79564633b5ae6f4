using System.Collections.Immutable;
using System.Globalization;

namespace JunctionFit.Import;

/// <summary>One measured capacitance–voltage sweep in SI units. Immutable.</summary>
/// <param name="SourcePath">The path as given.</param>
/// <param name="VoltageV">Gate bias in volt, in file order.</param>
/// <param name="CapacitanceF">Capacitance in farad.</param>
/// <param name="AreaM2">Capacitor area from the file's metadata, in m², if stated.</param>
/// <param name="TemperatureK">Temperature from the metadata, in kelvin, if stated.</param>
public sealed record CvCurve(string SourcePath, ImmutableArray<double> VoltageV, ImmutableArray<double> CapacitanceF, double? AreaM2, double? TemperatureK)
{
    /// <summary>Lot from the <c># lot:</c> line or the path pattern; null when unknown.</summary>
    public string? Lot { get; init; }

    /// <summary>Wafer from the <c># wafer:</c> line or the path pattern; null when unknown.</summary>
    public string? Wafer { get; init; }

    /// <summary>What the reader noticed (a lot or wafer that differs between file and path, a path that does not match the pattern).</summary>
    public ImmutableArray<string> Notes { get; init; } = [];
}

/// <summary>
/// Reads a capacitance–voltage file: optional <c># key: value</c> preamble lines (<c>area: 120000 um2</c>, <c>temperature: 300 K</c>),
/// an optional header row, then delimited rows (comma, semicolon, tab or spaces) with a bias and a capacitance column. The bias column is
/// the one whose header starts with v (vg, v, voltage, bias), else the first; the capacitance column the one whose header starts with c
/// (c, cox, cap, capacitance, cgg), else the second. A unit in the capacitance header (<c>C (pF)</c>, <c>cox[nF]</c>) scales the values
/// (F, mF, uF/µF, nF, pF, fF); without one, farad. <c># lot:</c> and <c># wafer:</c> lines (also <c>lot id</c>, <c>wafer id</c>) place
/// the capacitor on a wafer; a path pattern such as <c>{lot}/{wafer}/*.csv</c> (as for I–V files) does too and wins over the lines.
/// Bad input raises <see cref="IvFormatException"/> with the file and line.
/// </summary>
public static class CvFileReader
{
    /// <summary>Reads <paramref name="path"/>.</summary>
    /// <exception cref="IvFormatException">Unreadable file, no numeric rows, or a bad value.</exception>
    public static CvCurve Read(string path) => Read(path, null);

    /// <summary>Reads <paramref name="path"/>; lot and wafer from <paramref name="pathPattern"/> where it matches (see the class summary).</summary>
    /// <param name="path">The file.</param>
    /// <param name="pathPattern">A pattern such as <c>{lot}/{wafer}/*.csv</c>, matched against the end of the full path; null for none.</param>
    /// <exception cref="IvFormatException">Unreadable file, no numeric rows, or a bad value.</exception>
    /// <exception cref="ArgumentException">The pattern is malformed.</exception>
    public static CvCurve Read(string path, string? pathPattern)
    {
        ArgumentNullException.ThrowIfNull(path);
        var pattern = pathPattern is null ? null : PathPattern.Create(pathPattern);
        string[] lines;
        try
        {
            if (Directory.Exists(path)) throw new IvFormatException(path, 0, "is a folder, not a C-V file");
            lines = File.ReadAllLines(path);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new IvFormatException(path, 0, $"cannot read the C-V file: {e.Message}");
        }
        var curve = Parse(path, lines);
        return pattern is null ? curve : ApplyPattern(curve, pattern, pathPattern!, Path.GetFullPath(path));
    }

    private static CvCurve ApplyPattern(CvCurve curve, PathPattern pattern, string text, string fullPath)
    {
        var values = pattern.Match(fullPath);
        var notes = curve.Notes.ToBuilder();
        if (values is null)
        {
            notes.Add($"path does not match the pattern '{text}'; lot and wafer from the file's lines");
            return curve with { Notes = notes.ToImmutable() };
        }
        string? lot = curve.Lot, wafer = curve.Wafer;
        if (values.TryGetValue("lot", out string? l))
        {
            if (lot is not null && !lot.Equals(l, StringComparison.OrdinalIgnoreCase)) notes.Add($"lot is '{lot}' in the file but '{l}' in the path; the path is used");
            lot = l;
        }
        if (values.TryGetValue("wafer", out string? w))
        {
            if (wafer is not null && !wafer.Equals(w, StringComparison.OrdinalIgnoreCase)) notes.Add($"wafer is '{wafer}' in the file but '{w}' in the path; the path is used");
            wafer = w;
        }
        return curve with { Lot = lot, Wafer = wafer, Notes = notes.ToImmutable() };
    }

    /// <summary>Parses the lines of a C–V file (see the class summary).</summary>
    /// <exception cref="IvFormatException">No numeric rows or a bad value.</exception>
    public static CvCurve Parse(string path, IReadOnlyList<string> lines)
    {
        ArgumentNullException.ThrowIfNull(lines);
        double? area = null, temperature = null;
        string? lot = null, wafer = null;
        string[]? header = null;
        int vColumn = 0, cColumn = 1;
        double cScale = 1.0;
        var v = ImmutableArray.CreateBuilder<double>();
        var c = ImmutableArray.CreateBuilder<double>();
        for (int i = 0; i < lines.Count; i++)
        {
            string line = lines[i].Trim();
            int lineNumber = i + 1;
            if (line.Length == 0) continue;
            if (line[0] == '#')
            {
                string body = line.TrimStart('#').Trim();
                int colon = body.IndexOfAny([':', '=']);
                if (colon <= 0) continue;
                string key = body[..colon].Trim().ToLowerInvariant(), value = body[(colon + 1)..].Trim();
                if (key == "area") area = ParseArea(value) ?? throw new IvFormatException(path, lineNumber, $"area '{value}' is not a positive number with an area unit (m2, cm2, mm2, um2, nm2)");
                else if (key == "temperature" && TryNumber(value.Replace("K", "", StringComparison.OrdinalIgnoreCase), out double t) && t > 0) temperature = t;
                else if (key.Replace(" ", "", StringComparison.Ordinal).Replace("_", "", StringComparison.Ordinal) is "lot" or "lotid" && value.Length > 0) lot = value;
                else if (key.Replace(" ", "", StringComparison.Ordinal).Replace("_", "", StringComparison.Ordinal) is "wafer" or "waferid" && value.Length > 0) wafer = value;
                continue;
            }
            string[] fields = Split(line);
            if (header is null && v.Count == 0 && !TryNumber(fields[0], out _))
            {
                header = fields;
                int vi = Array.FindIndex(fields, f => f.TrimStart().StartsWith('v') || f.TrimStart().StartsWith('V') || f.Contains("bias", StringComparison.OrdinalIgnoreCase));
                int ci = Array.FindIndex(fields, f => f.TrimStart().StartsWith('c') || f.TrimStart().StartsWith('C'));
                if (vi >= 0) vColumn = vi;
                if (ci >= 0) cColumn = ci; else cColumn = vColumn == 0 ? 1 : 0;
                cScale = CapacitanceScale(fields[cColumn]) ?? throw new IvFormatException(path, lineNumber, $"unknown capacitance unit in the header '{fields[cColumn]}' (use F, uF, nF, pF or fF)", cColumn + 1, line);
                continue;
            }
            if (fields.Length <= Math.Max(vColumn, cColumn))
            {
                throw new IvFormatException(path, lineNumber, $"expected at least {Math.Max(vColumn, cColumn) + 1} columns (bias and capacitance), found {fields.Length}", null, line);
            }
            if (!TryNumber(fields[vColumn], out double vv)) throw new IvFormatException(path, lineNumber, $"bias '{fields[vColumn]}' is not a number", vColumn + 1, line);
            if (!TryNumber(fields[cColumn], out double cc)) throw new IvFormatException(path, lineNumber, $"capacitance '{fields[cColumn]}' is not a number", cColumn + 1, line);
            v.Add(vv);
            c.Add(cc * cScale);
        }
        if (v.Count < 2) throw new IvFormatException(path, lines.Count, "a C-V file needs at least two rows of bias and capacitance");
        return new CvCurve(path, v.ToImmutable(), c.ToImmutable(), area, temperature) { Lot = lot, Wafer = wafer };
    }

    /// <summary>An area text such as <c>120000 um2</c>, <c>1.2e-3 cm2</c>; a bare number is µm². Null when not understood.</summary>
    public static double? ParseArea(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        string t = text.Trim().Replace("µ", "u", StringComparison.Ordinal).Replace("^", "", StringComparison.Ordinal).Replace("²", "2", StringComparison.Ordinal);
        (string Suffix, double Factor)[] units = [("nm2", 1e-18), ("um2", 1e-12), ("mm2", 1e-6), ("cm2", 1e-4), ("m2", 1.0)];
        double factor = 1e-12;
        foreach (var (suffix, f) in units)
        {
            if (t.EndsWith(suffix, StringComparison.OrdinalIgnoreCase)) { t = t[..^suffix.Length].Trim(); factor = f; break; }
        }
        return TryNumber(t, out double a) && a > 0 ? a * factor : null;
    }

    private static double? CapacitanceScale(string header)
    {
        int open = header.IndexOfAny(['(', '[']);
        string unit = open >= 0 ? header[(open + 1)..].TrimEnd(')', ']').Trim() : "";
        if (unit.Length == 0)
        {
            int underscore = header.LastIndexOf('_');
            unit = underscore > 0 ? header[(underscore + 1)..] : "F";
        }
        return unit.Replace("µ", "u", StringComparison.Ordinal) switch
        {
            "F" or "f" => 1.0,
            "mF" => 1e-3,
            "uF" => 1e-6,
            "nF" or "nf" => 1e-9,
            "pF" or "pf" => 1e-12,
            "fF" or "ff" => 1e-15,
            _ => open >= 0 ? null : 1.0,
        };
    }

    private static string[] Split(string line)
    {
        char[] separators = line.Contains(',', StringComparison.Ordinal) ? [','] : line.Contains(';', StringComparison.Ordinal) ? [';'] : [' ', '\t'];
        return line.Split(separators, StringSplitOptions.TrimEntries | StringSplitOptions.RemoveEmptyEntries);
    }

    private static bool TryNumber(string text, out double value)
        => double.TryParse(text.Trim(), NumberStyles.Float, CultureInfo.InvariantCulture, out value) && double.IsFinite(value);
}
