using System.Globalization;
using System.Text.RegularExpressions;

namespace JunctionFit.Import;

/// <summary>The metadata the importer understood, in SI units, plus every raw key and value.</summary>
internal sealed class MetadataSet
{
    public Dictionary<string, string> Raw { get; } = new(StringComparer.Ordinal);

    public string? Lot { get; set; }

    public string? Wafer { get; set; }

    public int? DieX { get; set; }

    public int? DieY { get; set; }

    public double? AreaM2 { get; set; }

    public double? TemperatureK { get; set; }

    public double? ComplianceA { get; set; }

    public int FreeTextLines { get; set; }

    public int KeyValueLines { get; set; }
}

/// <summary>
/// Reads preamble lines: <c># key: value</c>, <c>key = value</c>, <c>key: value</c>; anything else is
/// free text. Known keys (ignoring case, spaces and punctuation): lot, wafer, die (x,y), die x, die y,
/// site, device, area, temperature, compliance.
/// </summary>
internal static partial class MetadataParser
{
    private static readonly string[] LotKeys = ["lot", "lotid", "lotname", "lotno", "lotnumber"];
    private static readonly string[] WaferKeys = ["wafer", "waferid", "wafername", "waferno", "wafernumber"];
    private static readonly string[] DieKeys = ["die", "dieid", "diexy", "diecoordinates", "diecoord", "diecoords", "dieposition", "diepos"];
    private static readonly string[] DieXKeys = ["diex", "xdie", "diecol", "diecolumn", "column"];
    private static readonly string[] DieYKeys = ["diey", "ydie", "dierow", "row"];
    private static readonly string[] AreaKeys = ["area", "devicearea", "junctionarea", "effectivearea", "padarea", "dotarea"];
    private static readonly string[] TemperatureKeys = ["temperature", "temp", "t", "chucktemperature", "chucktemp", "stagetemperature", "sampletemperature"];
    private static readonly string[] ComplianceKeys = ["compliance", "currentcompliance", "icomp", "icompliance", "compliancecurrent", "currentlimit", "ilimit"];

    [GeneratedRegex(@"^\s*(?<num>[+-]?(?:[0-9]+(?:[.,][0-9]*)?|[.,][0-9]+)(?:[eE][+-]?[0-9]+)?)\s*(?<unit>.*?)\s*$", RegexOptions.CultureInvariant)]
    private static partial Regex QuantityRegex();

    [GeneratedRegex(@"^[\(\[]?\s*(?:x\s*[=:]?\s*)?(?<x>[+-]?[0-9]+)\s*(?:[,;/]\s*|\s+|(?=[yY]))(?:y\s*[=:]?\s*)?(?<y>[+-]?[0-9]+)\s*[\)\]]?$", RegexOptions.CultureInvariant | RegexOptions.IgnoreCase)]
    private static partial Regex DieRegex();

    /// <summary>Strips a comment marker (<c>#</c>, <c>%</c>, <c>!</c>, <c>//</c>) and surrounding blanks.</summary>
    public static ReadOnlySpan<char> StripComment(ReadOnlySpan<char> line)
    {
        ReadOnlySpan<char> t = line.Trim();
        if (t.StartsWith("//"))
        {
            return t[2..].Trim();
        }
        while (t.Length > 0 && t[0] is '#' or '%' or '!')
        {
            t = t[1..];
        }
        return t.Trim();
    }

    /// <summary>True when the line starts with a comment marker.</summary>
    public static bool IsComment(ReadOnlySpan<char> line)
    {
        ReadOnlySpan<char> t = line.TrimStart();
        return t.Length > 0 && (t[0] is '#' or '%' or '!' || t.StartsWith("//"));
    }

    /// <summary>Reads one preamble line into <paramref name="set"/>; problems go to <paramref name="warnings"/>.</summary>
    public static void ReadLine(ReadOnlySpan<char> line, int lineNumber, bool decimalComma, MetadataSet set, List<string> warnings)
    {
        ReadOnlySpan<char> content = StripComment(line);
        if (content.IsEmpty)
        {
            return;
        }
        int colon = content.IndexOf(':');
        int equals = content.IndexOf('=');
        int sep = colon < 0 ? equals : equals < 0 ? colon : Math.Min(colon, equals);
        if (sep <= 0 || sep > 80 || !char.IsLetter(content[0]))
        {
            set.FreeTextLines++;
            return;
        }
        string rawKey = content[..sep].Trim().ToString();
        string value = content[(sep + 1)..].Trim().ToString();
        (string keyName, string? keyUnit) = HeaderParser.SplitNameUnit(rawKey);
        string key = HeaderParser.NormalizeName(keyName);
        if (key.Length == 0)
        {
            set.FreeTextLines++;
            return;
        }
        set.KeyValueLines++;
        string storedKey = CollapseSpaces(rawKey.ToLowerInvariant());
        set.Raw[storedKey] = value;

        if (Array.IndexOf(LotKeys, key) >= 0)
        {
            set.Lot = NonEmpty(value);
        }
        else if (Array.IndexOf(WaferKeys, key) >= 0)
        {
            set.Wafer = NonEmpty(value);
        }
        else if (Array.IndexOf(DieKeys, key) >= 0)
        {
            Match m = DieRegex().Match(value);
            if (m.Success && int.TryParse(m.Groups["x"].Value, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int x)
                && int.TryParse(m.Groups["y"].Value, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int y))
            {
                set.DieX = x;
                set.DieY = y;
            }
            else
            {
                warnings.Add($"line {lineNumber}: die '{Short(value)}' is not two integers such as '3,4'; kept as metadata only");
            }
        }
        else if (Array.IndexOf(DieXKeys, key) >= 0 || Array.IndexOf(DieYKeys, key) >= 0)
        {
            bool isX = Array.IndexOf(DieXKeys, key) >= 0;
            if (int.TryParse(value, NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture, out int n))
            {
                if (isX)
                {
                    set.DieX = n;
                }
                else
                {
                    set.DieY = n;
                }
            }
            else
            {
                warnings.Add($"line {lineNumber}: die {(isX ? "x" : "y")} '{Short(value)}' is not an integer; kept as metadata only");
            }
        }
        else if (Array.IndexOf(AreaKeys, key) >= 0)
        {
            if (TryQuantity(value, keyUnit, decimalComma, QuantityKind.Area, "um2", out double a, out bool assumed) && a > 0)
            {
                set.AreaM2 = a;
                if (assumed)
                {
                    warnings.Add($"line {lineNumber}: area '{Short(value)}' has no unit; read as µm²");
                }
            }
            else
            {
                warnings.Add($"line {lineNumber}: area '{Short(value)}' is not a positive number with an area unit (m2, cm2, mm2, um2, nm2); ignored");
            }
        }
        else if (Array.IndexOf(TemperatureKeys, key) >= 0)
        {
            if (TryQuantity(value, keyUnit, decimalComma, QuantityKind.Temperature, "K", out double t, out bool assumed) && t > 0)
            {
                set.TemperatureK = t;
                if (assumed)
                {
                    warnings.Add($"line {lineNumber}: temperature '{Short(value)}' has no unit; read as kelvin");
                }
            }
            else
            {
                warnings.Add($"line {lineNumber}: temperature '{Short(value)}' is not a number in K or °C above absolute zero; ignored");
            }
        }
        else if (Array.IndexOf(ComplianceKeys, key) >= 0)
        {
            if (TryQuantity(value, keyUnit, decimalComma, QuantityKind.Current, "A", out double c, out _) && c != 0)
            {
                set.ComplianceA = Math.Abs(c);
            }
            else
            {
                warnings.Add($"line {lineNumber}: compliance '{Short(value)}' is not a current such as '1 mA'; ignored");
            }
        }
    }

    /// <summary>Reads <c>number unit</c>; the unit may instead come from the key (<c>area (cm2) = 1e-6</c>).</summary>
    private static bool TryQuantity(string value, string? keyUnit, bool decimalComma, QuantityKind kind, string defaultUnit, out double si, out bool assumed)
    {
        si = 0;
        assumed = false;
        Match m = QuantityRegex().Match(value);
        if (!m.Success)
        {
            return false;
        }
        if (!NumberText.TryParse(m.Groups["num"].ValueSpan, decimalComma || !m.Groups["num"].Value.Contains('.'), out double number, out _)
            || !double.IsFinite(number))
        {
            return false;
        }
        string unitText = m.Groups["unit"].Value;
        if (unitText.Length == 0)
        {
            unitText = keyUnit ?? string.Empty;
        }
        if (unitText.Length == 0)
        {
            unitText = defaultUnit;
            assumed = true;
        }
        if (!UnitParser.TryParse(unitText, out UnitScale unit) || unit.Kind != kind)
        {
            return false;
        }
        si = unit.ToSi(number);
        return double.IsFinite(si);
    }

    private static string? NonEmpty(string s) => s.Length == 0 ? null : s;

    private static string CollapseSpaces(string s) => string.Join(' ', s.Split([' ', '\t'], StringSplitOptions.RemoveEmptyEntries));

    /// <summary>Shortens text for a message.</summary>
    public static string Short(ReadOnlySpan<char> s) => s.Length <= 60 ? s.ToString() : string.Concat(s[..57], "...");
}
