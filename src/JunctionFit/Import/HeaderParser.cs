using System.Text;

namespace JunctionFit.Import;

/// <summary>What the importer does with a column.</summary>
public enum IvColumnRole
{
    /// <summary>Not used (time, index, status, a second voltage …).</summary>
    Ignored,

    /// <summary>The bias voltage.</summary>
    Voltage,

    /// <summary>The measured current.</summary>
    Current,

    /// <summary>Current density, turned into current with the junction area.</summary>
    CurrentDensity,
}

/// <summary>One header cell split into name and unit, with the role its name or unit suggests.</summary>
internal sealed record HeaderField(int Index, string Text, string Name, string? UnitText, UnitScale? Unit, IvColumnRole Role, int Rank);

/// <summary>Reads header cells: <c>Voltage (V)</c>, <c>I [nA]</c>, <c>V/mV</c>, <c>I_uA</c>, <c>J (A/cm²)</c>, <c>mV</c>.</summary>
internal static class HeaderParser
{
    // Names in order of preference; the first match among the columns wins (lower rank).
    private static readonly string[] VoltageNames =
    [
        "v", "voltage", "bias", "vbias", "biasvoltage", "vapplied", "appliedvoltage", "appliedbias",
        "vforce", "forcevoltage", "vset", "vsource", "sourcevoltage", "vd", "vdrain", "drainvoltage",
        "vds", "vsd", "vtop", "vsweep", "sweepvoltage", "u", "ubias", "vin", "vs", "vmeas",
        "vmeasured", "measuredvoltage", "volt", "volts", "voltagev",
    ];

    private static readonly string[] CurrentNames =
    [
        "i", "current", "imeas", "imeasured", "measuredcurrent", "id", "idrain", "draincurrent",
        "ids", "isd", "itop", "ia", "isense", "junctioncurrent", "currenta", "amps", "ampere",
    ];

    private static readonly string[] DensityNames =
    [
        "j", "currentdensity", "jmeas", "jd", "density",
    ];

    /// <summary>Splits one header cell and guesses its role.</summary>
    public static HeaderField Parse(int index, string rawText)
    {
        string text = rawText.Trim();
        (string name, string? unitText) = SplitNameUnit(text);
        UnitScale? unit = null;
        if (unitText is not null && UnitParser.TryParse(unitText, out UnitScale u))
        {
            unit = u;
        }

        string key = NormalizeName(name);
        (IvColumnRole role, int rank) = RoleFromName(key);
        if (role == IvColumnRole.Ignored && unitText is null && UnitParser.TryParse(text, out UnitScale whole))
        {
            // The cell is only a unit, e.g. "mV" or "[nA]".
            unit = whole;
            unitText = text;
            name = string.Empty;
        }
        if (role == IvColumnRole.Ignored && unit is UnitScale byUnit)
        {
            role = RoleFromUnit(byUnit.Kind);
            rank = 1000;
        }
        return new HeaderField(index, text, name, unitText, unit, role, rank);
    }

    /// <summary>Lower-case letters and digits only.</summary>
    public static string NormalizeName(string name)
    {
        var sb = new StringBuilder(name.Length);
        foreach (char c in name)
        {
            if (char.IsAsciiLetterOrDigit(c))
            {
                sb.Append(char.ToLowerInvariant(c));
            }
        }
        return sb.ToString();
    }

    /// <summary>The role a unit implies.</summary>
    public static IvColumnRole RoleFromUnit(QuantityKind kind) => kind switch
    {
        QuantityKind.Voltage => IvColumnRole.Voltage,
        QuantityKind.Current => IvColumnRole.Current,
        QuantityKind.CurrentDensity => IvColumnRole.CurrentDensity,
        _ => IvColumnRole.Ignored,
    };

    private static (IvColumnRole, int) RoleFromName(string key)
    {
        if (key.Length == 0)
        {
            return (IvColumnRole.Ignored, int.MaxValue);
        }
        int r = Array.IndexOf(VoltageNames, key);
        if (r >= 0)
        {
            return (IvColumnRole.Voltage, r);
        }
        r = Array.IndexOf(CurrentNames, key);
        if (r >= 0)
        {
            return (IvColumnRole.Current, r);
        }
        r = Array.IndexOf(DensityNames, key);
        if (r >= 0)
        {
            return (IvColumnRole.CurrentDensity, r);
        }
        return (IvColumnRole.Ignored, int.MaxValue);
    }

    /// <summary>Separates a trailing unit: <c>(V)</c>, <c>[V]</c>, <c>{V}</c>, <c>/V</c>, <c>_mV</c> or a last word that is a unit.</summary>
    public static (string Name, string? Unit) SplitNameUnit(string text)
    {
        if (text.Length >= 2)
        {
            char last = text[^1];
            char open = last switch { ')' => '(', ']' => '[', '}' => '{', _ => '\0' };
            if (open != '\0')
            {
                int o = text.LastIndexOf(open);
                if (o >= 0)
                {
                    return (text[..o].Trim(), text[(o + 1)..^1].Trim());
                }
            }
        }

        int sp = text.LastIndexOf(' ');
        if (sp > 0 && IsColumnUnit(text.AsSpan(sp + 1)))
        {
            return (text[..sp].Trim(), text[(sp + 1)..]);
        }

        for (int i = text.IndexOf('/'); i > 0; i = text.IndexOf('/', i + 1))
        {
            string rest = text[(i + 1)..];
            if (IsColumnUnit(rest))
            {
                return (text[..i].Trim(), rest.Trim());
            }
        }

        int us = text.LastIndexOf('_');
        if (us > 0 && us < text.Length - 1 && IsColumnUnit(text.AsSpan(us + 1)))
        {
            return (text[..us].Trim(), text[(us + 1)..]);
        }

        return (text, null);
    }

    private static bool IsColumnUnit(ReadOnlySpan<char> text)
        => UnitParser.TryParse(text, out UnitScale u) && u.Kind is QuantityKind.Voltage or QuantityKind.Current or QuantityKind.CurrentDensity;

    /// <summary>Header text with a surrounding quote pair's doubled quotes undone.</summary>
    public static string Unescape(ReadOnlySpan<char> field, bool quoted)
        => quoted ? field.ToString().Replace("\"\"", "\"", StringComparison.Ordinal) : field.ToString();
}
