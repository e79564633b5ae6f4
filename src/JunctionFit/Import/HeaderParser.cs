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

/// <summary>What a column holds, as far as its header name and unit tell.</summary>
public enum IvColumnKind
{
    /// <summary>Not recognised.</summary>
    Unknown,

    /// <summary>A voltage (bias).</summary>
    Voltage,

    /// <summary>A signed current.</summary>
    Current,

    /// <summary>A signed current density.</summary>
    CurrentDensity,

    /// <summary>The magnitude of the current, |I|.</summary>
    AbsoluteCurrent,

    /// <summary>The magnitude of the current density, |J|.</summary>
    AbsoluteCurrentDensity,

    /// <summary>Time (ignored).</summary>
    Time,

    /// <summary>A point index or counter (ignored).</summary>
    Index,

    /// <summary>A capacitance (a C–V file, not an I–V one).</summary>
    Capacitance,

    /// <summary>Another quantity with a known unit (temperature, resistance …; ignored).</summary>
    Other,
}

/// <summary>One header cell split into name and unit, with what its name or unit suggests.</summary>
/// <param name="Index">0-based column.</param>
/// <param name="Text">The cell as written (trimmed).</param>
/// <param name="Name">The name without its unit.</param>
/// <param name="UnitText">The unit as written, if any.</param>
/// <param name="Unit">The unit, if the importer knows it.</param>
/// <param name="Role">The role the column can take directly (voltage, current, density) or <see cref="IvColumnRole.Ignored"/>.</param>
/// <param name="Rank">Preference among columns of one kind: lower wins; 0–99 exact names, 500 loose names, 1000 by unit.</param>
internal sealed record HeaderField(int Index, string Text, string Name, string? UnitText, UnitScale? Unit, IvColumnRole Role, int Rank)
{
    /// <summary>What the column holds.</summary>
    public IvColumnKind Kind { get; init; }

    /// <summary>How the kind was recognised, in words (for inspect).</summary>
    public string How { get; init; } = string.Empty;

    /// <summary>True when the kind came from a loose rule (a suffix dropped, a name prefix, only the unit).</summary>
    public bool Loose { get; init; }

    /// <summary>The normalised name key (lower-case letters and digits, numeric suffixes dropped).</summary>
    public string Key { get; init; } = string.Empty;
}

/// <summary>
/// Reads header cells: <c>Voltage (V)</c>, <c>I [nA]</c>, <c>V/mV</c>, <c>I_uA</c>, <c>J (A/cm²)</c>, <c>mV</c>,
/// <c>voltage_1_1</c>, <c>absJ_1_2_11</c>, <c>|I|</c>, <c>Time (s)</c>, <c>#</c>.
/// </summary>
internal static class HeaderParser
{
    // Names in order of preference; the first match among the columns wins (lower rank).
    private static readonly string[] VoltageNames =
    [
        "v", "voltage", "bias", "vbias", "biasvoltage", "vapplied", "appliedvoltage", "appliedbias",
        "vforce", "forcevoltage", "vset", "vsource", "sourcevoltage", "vd", "vdrain", "drainvoltage",
        "vds", "vsd", "vtop", "vsweep", "sweepvoltage", "u", "ubias", "vin", "vs", "vmeas",
        "vmeasured", "measuredvoltage", "volt", "volts", "voltagev", "vg", "vgate", "gatevoltage", "vgs", "vgb",
    ];

    private static readonly string[] CurrentNames =
    [
        "i", "current", "imeas", "imeasured", "measuredcurrent", "id", "idrain", "draincurrent",
        "ids", "isd", "itop", "ia", "isense", "junctioncurrent", "currenta", "amps", "ampere",
        "ig", "igate", "gatecurrent", "ib", "ibulk", "bulkcurrent", "is", "isource", "sourcecurrent", "isub",
    ];

    private static readonly string[] DensityNames =
    [
        "j", "currentdensity", "jmeas", "jd", "density",
    ];

    /// <summary>Currents of the four terminals of a MOS transistor.</summary>
    private static readonly string[] TerminalCurrentNames =
    [
        "id", "idrain", "draincurrent", "ig", "igate", "gatecurrent", "ib", "ibulk", "bulkcurrent", "is", "isource", "sourcecurrent", "isub",
    ];

    private static readonly string[] GateCurrentNames = ["ig", "igate", "gatecurrent"];

    private static readonly string[] GateVoltageNames = ["vg", "vgate", "gatevoltage", "vgs", "vgb"];

    private static readonly string[] TimeNames = ["t", "time", "times", "timestamp", "elapsed", "elapsedtime", "sec", "seconds", "timesec"];

    private static readonly string[] IndexNames = ["index", "idx", "n", "no", "nr", "num", "number", "point", "points", "pt", "pnt", "step", "sample", "count", "row", "pointno", "pointnumber"];

    private static readonly string[] CapacitanceNames = ["c", "cox", "cap", "capacitance", "cg", "cgate", "cgg", "cmeas", "cp", "ctot", "cpar"];

    /// <summary>True when the column's name is a terminal current of a transistor (<c>id</c>, <c>ig</c>, <c>ib</c>, <c>is</c> …).</summary>
    public static bool IsTerminalCurrent(HeaderField f) => f.Kind == IvColumnKind.Current && Array.IndexOf(TerminalCurrentNames, f.Key) >= 0;

    /// <summary>True when the column's name is the gate current (<c>ig</c>, <c>Igate</c>, <c>gate current</c>).</summary>
    public static bool IsGateCurrent(HeaderField f) => f.Kind == IvColumnKind.Current && Array.IndexOf(GateCurrentNames, f.Key) >= 0;

    /// <summary>True when the column's name is the gate voltage (<c>vg</c>, <c>Vgate</c>, <c>Vgs</c> …).</summary>
    public static bool IsGateVoltage(HeaderField f) => f.Kind == IvColumnKind.Voltage && Array.IndexOf(GateVoltageNames, f.Key) >= 0;

    /// <summary>Splits one header cell and guesses what it holds.</summary>
    /// <param name="index">0-based column.</param>
    /// <param name="rawText">The cell.</param>
    /// <param name="unitRowText">The cell of a separate units row below, if there is one.</param>
    public static HeaderField Parse(int index, string rawText, string? unitRowText = null)
    {
        string text = rawText.Trim();
        (string name, string? unitText) = SplitNameUnit(text);
        if (unitText is not null && NormalizeName(name) is "abs" or "absolute" or "mag" or "magnitude")
        {
            // "abs(I)", "mag[J]": the bracket holds the quantity, not a unit.
            name = text;
            unitText = null;
        }
        string? fromRow = unitRowText?.Trim();
        if (unitText is null && !string.IsNullOrEmpty(fromRow))
        {
            unitText = StripBrackets(fromRow);
        }
        UnitScale? unit = null;
        if (unitText is not null && UnitParser.TryParse(unitText, out UnitScale u))
        {
            unit = u;
        }

        (IvColumnKind kind, int rank, string how, bool loose, string key) = KindFromName(name);
        if (kind == IvColumnKind.Unknown && unitText is null && UnitParser.TryParse(text, out UnitScale whole))
        {
            // The cell is only a unit, e.g. "mV" or "[nA]".
            unit = whole;
            unitText = StripBrackets(text);
            name = string.Empty;
        }

        // The unit refines or supplies the kind.
        IvColumnKind byUnit = unit is UnitScale us ? KindFromUnit(us.Kind)
            : unitText is not null ? KindFromOtherUnit(unitText) : IvColumnKind.Unknown;
        if (kind == IvColumnKind.Unknown)
        {
            if (byUnit != IvColumnKind.Unknown)
            {
                kind = byUnit;
                rank = 1000;
                how = $"by its unit '{unitText}'";
                loose = true;
            }
        }
        else if (byUnit != IvColumnKind.Unknown)
        {
            IvColumnKind refined = (kind, byUnit) switch
            {
                (IvColumnKind.Current, IvColumnKind.CurrentDensity) => IvColumnKind.CurrentDensity,
                (IvColumnKind.CurrentDensity, IvColumnKind.Current) => IvColumnKind.Current,
                (IvColumnKind.AbsoluteCurrent, IvColumnKind.CurrentDensity) => IvColumnKind.AbsoluteCurrentDensity,
                (IvColumnKind.AbsoluteCurrentDensity, IvColumnKind.Current) => IvColumnKind.AbsoluteCurrent,
                (IvColumnKind.Time or IvColumnKind.Index or IvColumnKind.Capacitance, _) when byUnit != kind => byUnit,
                _ => kind,
            };
            if (refined != kind)
            {
                how += $"; its unit '{unitText}' makes it {Describe(refined)}";
                kind = refined;
            }
        }

        IvColumnRole role = kind switch
        {
            IvColumnKind.Voltage => IvColumnRole.Voltage,
            IvColumnKind.Current => IvColumnRole.Current,
            IvColumnKind.CurrentDensity => IvColumnRole.CurrentDensity,
            _ => IvColumnRole.Ignored,
        };
        return new HeaderField(index, text, name, unitText, unit, role, rank) { Kind = kind, How = how, Loose = loose, Key = key };
    }

    /// <summary>A short name of a kind: <c>voltage</c>, <c>|J|</c>, <c>time</c> ….</summary>
    public static string Describe(IvColumnKind kind) => kind switch
    {
        IvColumnKind.Voltage => "voltage",
        IvColumnKind.Current => "current",
        IvColumnKind.CurrentDensity => "current density",
        IvColumnKind.AbsoluteCurrent => "|I|",
        IvColumnKind.AbsoluteCurrentDensity => "|J|",
        IvColumnKind.Time => "time",
        IvColumnKind.Index => "index",
        IvColumnKind.Capacitance => "capacitance",
        IvColumnKind.Other => "another quantity",
        _ => "not recognised",
    };

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

    /// <summary>
    /// The normalised name with trailing numeric parts dropped (<c>voltage_1_2_11</c> → <c>voltage</c>,
    /// <c>V 2</c> → <c>v</c>), and the suffix that was dropped (empty if none). A name that is only digits keeps them.
    /// </summary>
    public static (string Key, string Suffix) KeyOf(string name)
    {
        ReadOnlySpan<char> t = name.AsSpan().Trim();
        int end = t.Length;
        // Drop "_1", " 2", "-11", ".3" groups from the end while letters remain before them.
        while (true)
        {
            int k = end;
            while (k > 0 && char.IsAsciiDigit(t[k - 1]))
            {
                k--;
            }
            if (k == end || k == 0)
            {
                break;
            }
            int sep = k;
            while (sep > 0 && t[sep - 1] is '_' or ' ' or '-' or '.')
            {
                sep--;
            }
            if (sep == k || sep == 0 || !HasLetter(t[..sep]))
            {
                break;
            }
            end = sep;
        }
        return (NormalizeName(t[..end].ToString()), t[end..].ToString());
    }

    private static bool HasLetter(ReadOnlySpan<char> s)
    {
        foreach (char c in s)
        {
            if (char.IsAsciiLetter(c))
            {
                return true;
            }
        }
        return false;
    }

    /// <summary>The kind a unit implies.</summary>
    public static IvColumnRole RoleFromUnit(QuantityKind kind) => kind switch
    {
        QuantityKind.Voltage => IvColumnRole.Voltage,
        QuantityKind.Current => IvColumnRole.Current,
        QuantityKind.CurrentDensity => IvColumnRole.CurrentDensity,
        _ => IvColumnRole.Ignored,
    };

    private static IvColumnKind KindFromUnit(QuantityKind kind) => kind switch
    {
        QuantityKind.Voltage => IvColumnKind.Voltage,
        QuantityKind.Current => IvColumnKind.Current,
        QuantityKind.CurrentDensity => IvColumnKind.CurrentDensity,
        _ => IvColumnKind.Other,
    };

    private static IvColumnKind KindFromOtherUnit(string unitText)
    {
        string s = StripBrackets(unitText).Replace(" ", string.Empty, StringComparison.Ordinal);
        if (s is "s" or "ms" or "us" or "µs" or "ns" or "sec" or "min" or "h")
        {
            return IvColumnKind.Time;
        }
        if (s is "F" or "pF" or "nF" or "fF" or "uF" or "µF" or "F/cm2" or "F/cm²" or "F/m2" or "F/m²" or "fF/um2" or "fF/µm²")
        {
            return IvColumnKind.Capacitance;
        }
        if (s is "#" or "index")
        {
            return IvColumnKind.Index;
        }
        return UnitParser.IsOtherUnit(s) ? IvColumnKind.Other : IvColumnKind.Unknown;
    }

    private static (IvColumnKind Kind, int Rank, string How, bool Loose, string Key) KindFromName(string name)
    {
        string trimmed = name.Trim();
        if (trimmed.Length > 0 && trimmed.Replace(" ", string.Empty, StringComparison.Ordinal) is "#" or "No." or "no.")
        {
            return (IvColumnKind.Index, int.MaxValue, "index by its name", false, "#");
        }
        bool bars = trimmed.Length > 2 && trimmed[0] == '|' && trimmed[^1] == '|';
        if (bars)
        {
            trimmed = trimmed[1..^1];
        }
        (string key, string suffix) = KeyOf(trimmed);
        if (key.Length == 0)
        {
            return (IvColumnKind.Unknown, int.MaxValue, "no name", false, key);
        }
        string suffixNote = suffix.Length > 0 ? $", suffix '{suffix}' dropped" : string.Empty;
        bool loose = suffix.Length > 0;

        bool abs = bars;
        string inner = key;
        if (!abs)
        {
            foreach (string prefix in (string[])["absolute", "abs", "magnitude", "mag"])
            {
                if (key.Length > prefix.Length && key.StartsWith(prefix, StringComparison.Ordinal))
                {
                    (IvColumnKind k, int _, bool _) = Basic(key[prefix.Length..]);
                    if (k is IvColumnKind.Current or IvColumnKind.CurrentDensity)
                    {
                        abs = true;
                        inner = key[prefix.Length..];
                        break;
                    }
                }
            }
        }

        (IvColumnKind kind, int rank, bool prefixRule) = Basic(inner);
        if (kind == IvColumnKind.Unknown && trimmed.Length > 2 && trimmed[1] is '_' or ' ' or '-' or '.' && char.IsAsciiLetterOrDigit(trimmed[2]))
        {
            // "V_sense", "I_leak", "J_top": a one-letter quantity symbol with a qualifier.
            (kind, rank) = char.ToLowerInvariant(trimmed[0]) switch
            {
                'v' => (IvColumnKind.Voltage, 501),
                'i' => (IvColumnKind.Current, 501),
                'j' => (IvColumnKind.CurrentDensity, 501),
                _ => (IvColumnKind.Unknown, int.MaxValue),
            };
            prefixRule = kind != IvColumnKind.Unknown;
        }
        if (kind == IvColumnKind.Unknown)
        {
            return (kind, int.MaxValue, "name not recognised", false, key);
        }
        loose |= prefixRule;
        if (abs)
        {
            kind = kind switch
            {
                IvColumnKind.Current => IvColumnKind.AbsoluteCurrent,
                IvColumnKind.CurrentDensity => IvColumnKind.AbsoluteCurrentDensity,
                _ => kind,
            };
        }
        string how = $"{Describe(kind)} by its name '{key}'{suffixNote}{(prefixRule ? ", by the start of the name" : string.Empty)}";
        return (kind, rank, how, loose, key);
    }

    /// <summary>The kind of a normalised key: exact names first, then name prefixes (loose).</summary>
    private static (IvColumnKind Kind, int Rank, bool Prefix) Basic(string key)
    {
        int r = Array.IndexOf(VoltageNames, key);
        if (r >= 0)
        {
            return (IvColumnKind.Voltage, r, false);
        }
        r = Array.IndexOf(CurrentNames, key);
        if (r >= 0)
        {
            return (IvColumnKind.Current, r, false);
        }
        r = Array.IndexOf(DensityNames, key);
        if (r >= 0)
        {
            return (IvColumnKind.CurrentDensity, r, false);
        }
        if (Array.IndexOf(TimeNames, key) >= 0)
        {
            return (IvColumnKind.Time, int.MaxValue, false);
        }
        if (Array.IndexOf(IndexNames, key) >= 0)
        {
            return (IvColumnKind.Index, int.MaxValue, false);
        }
        if (Array.IndexOf(CapacitanceNames, key) >= 0)
        {
            return (IvColumnKind.Capacitance, int.MaxValue, false);
        }
        if (key.StartsWith("currentdensity", StringComparison.Ordinal) || key.StartsWith("density", StringComparison.Ordinal))
        {
            return (IvColumnKind.CurrentDensity, 500, true);
        }
        if (key.StartsWith("voltage", StringComparison.Ordinal) || key.StartsWith("bias", StringComparison.Ordinal))
        {
            return (IvColumnKind.Voltage, 500, true);
        }
        if (key.StartsWith("current", StringComparison.Ordinal))
        {
            return (IvColumnKind.Current, 500, true);
        }
        if (key.StartsWith("time", StringComparison.Ordinal))
        {
            return (IvColumnKind.Time, int.MaxValue, true);
        }
        if (key.StartsWith("capacitance", StringComparison.Ordinal))
        {
            return (IvColumnKind.Capacitance, int.MaxValue, true);
        }
        if (key.StartsWith("index", StringComparison.Ordinal))
        {
            return (IvColumnKind.Index, int.MaxValue, true);
        }
        return (IvColumnKind.Unknown, int.MaxValue, false);
    }

    /// <summary>Removes one or more surrounding bracket pairs.</summary>
    public static string StripBrackets(string text)
    {
        ReadOnlySpan<char> t = text.AsSpan().Trim();
        while (t.Length >= 2 && ((t[0] == '(' && t[^1] == ')') || (t[0] == '[' && t[^1] == ']') || (t[0] == '{' && t[^1] == '}')))
        {
            t = t[1..^1].Trim();
        }
        return t.ToString();
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
