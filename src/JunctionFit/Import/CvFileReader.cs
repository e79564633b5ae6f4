using System.Collections.Immutable;
using System.Globalization;

namespace JunctionFit.Import;

/// <summary>One measured capacitance–voltage sweep in SI units. Immutable.</summary>
/// <param name="SourcePath">The path as given.</param>
/// <param name="VoltageV">Gate bias in volt, in file order.</param>
/// <param name="CapacitanceF">Capacitance in farad.</param>
/// <param name="AreaM2">Capacitor area from the file's metadata, in m², if stated.</param>
/// <param name="TemperatureK">Temperature from the metadata, in kelvin, if stated.</param>
public sealed record CvCurve(string SourcePath, ImmutableArray<double> VoltageV, ImmutableArray<double> CapacitanceF, double? AreaM2, double? TemperatureK);

/// <summary>
/// Reads a capacitance–voltage file: optional <c># key: value</c> preamble lines (<c>area: 120000 um2</c>, <c>temperature: 300 K</c>),
/// an optional header row, then delimited rows (comma, semicolon, tab or spaces) with a bias and a capacitance column. The bias column is
/// the one whose header starts with v (vg, v, voltage, bias), else the first; the capacitance column the one whose header starts with c
/// (c, cox, cap, capacitance, cgg), else the second. A unit in the capacitance header (<c>C (pF)</c>, <c>cox[nF]</c>) scales the values
/// (F, mF, uF/µF, nF, pF, fF); without one, farad. Bad input raises <see cref="IvFormatException"/> with the file and line.
/// </summary>
public static class CvFileReader
{
    /// <summary>Reads <paramref name="path"/>.</summary>
    /// <exception cref="IvFormatException">Unreadable file, no numeric rows, or a bad value.</exception>
    public static CvCurve Read(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        string[] lines;
        try { lines = File.ReadAllLines(path); }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new IvFormatException(path, 0, $"cannot read the C-V file: {e.Message}");
        }
        return Parse(path, lines);
    }

    /// <summary>Parses the lines of a C–V file (see the class summary).</summary>
    /// <exception cref="IvFormatException">No numeric rows or a bad value.</exception>
    public static CvCurve Parse(string path, IReadOnlyList<string> lines)
    {
        ArgumentNullException.ThrowIfNull(lines);
        double? area = null, temperature = null;
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
        return new CvCurve(path, v.ToImmutable(), c.ToImmutable(), area, temperature);
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
