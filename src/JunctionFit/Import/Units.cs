namespace JunctionFit.Import;

/// <summary>What a unit measures.</summary>
internal enum QuantityKind
{
    Voltage,
    Current,
    CurrentDensity,
    Area,
    Temperature,
}

/// <summary>
/// A unit understood by the importer: what it measures and how to reach SI from it.
/// The factor is kept as an exact power of ten applied by one multiplication or one division,
/// so that a decimal value written in a prefixed unit is converted with a single rounding.
/// </summary>
internal readonly record struct UnitScale(QuantityKind Kind, string Symbol, int PowerOfTen, double OffsetK = 0)
{
    private static readonly double[] Powers =
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11,
        1e12, 1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];

    /// <summary>Converts a value in this unit to SI (V, A, A/m², m², K).</summary>
    public double ToSi(double value)
    {
        double scaled = PowerOfTen >= 0 ? value * Powers[PowerOfTen] : value / Powers[-PowerOfTen];
        return scaled + OffsetK;
    }

    /// <summary>Converts an SI value to this unit (inverse of <see cref="ToSi"/>).</summary>
    public double FromSi(double value)
    {
        double shifted = value - OffsetK;
        return PowerOfTen >= 0 ? shifted / Powers[PowerOfTen] : shifted * Powers[-PowerOfTen];
    }

    /// <summary>Volt.</summary>
    public static UnitScale Volt => new(QuantityKind.Voltage, "V", 0);

    /// <summary>Ampere.</summary>
    public static UnitScale Ampere => new(QuantityKind.Current, "A", 0);

    /// <summary>Ampere per square metre.</summary>
    public static UnitScale AmperePerSquareMetre => new(QuantityKind.CurrentDensity, "A/m²", 0);

    /// <summary>Ampere per square centimetre (10⁴ A/m²).</summary>
    public static UnitScale AmperePerSquareCentimetre => new(QuantityKind.CurrentDensity, "A/cm²", 4);
}

/// <summary>Parses unit text such as <c>mV</c>, <c>[µA]</c>, <c>A/cm^2</c>, <c>um²</c>, <c>°C</c>.</summary>
internal static class UnitParser
{
    /// <summary>Tries to read <paramref name="text"/> as a unit the importer knows.</summary>
    public static bool TryParse(ReadOnlySpan<char> text, out UnitScale unit)
    {
        unit = default;
        string s = Normalize(text);
        if (s.Length == 0 || s.Length > 24)
        {
            return false;
        }

        if (TryTemperature(s, out unit))
        {
            return true;
        }

        int slash = s.IndexOf('/');
        if (slash > 0)
        {
            // Current density: prefixed ampere over a squared length.
            if (!TryPrefixed(s[..slash], ["A", "amp", "amps", "ampere", "amperes"], out int currentPower)
                || !TryLength(s[(slash + 1)..], squared: true, out int lengthPower))
            {
                return false;
            }
            unit = new UnitScale(QuantityKind.CurrentDensity, Pretty(text), currentPower - (2 * lengthPower));
            return true;
        }

        if (TryPrefixed(s, ["V", "volt", "volts"], out int p))
        {
            unit = new UnitScale(QuantityKind.Voltage, Pretty(text), p);
            return true;
        }
        if (TryPrefixed(s, ["A", "amp", "amps", "ampere", "amperes"], out p))
        {
            unit = new UnitScale(QuantityKind.Current, Pretty(text), p);
            return true;
        }
        if (TryLength(s, squared: true, out int lp))
        {
            unit = new UnitScale(QuantityKind.Area, Pretty(text), 2 * lp);
            return true;
        }
        return false;
    }

    /// <summary>True when the text looks like a unit of a column the importer ignores (time, resistance …).</summary>
    public static bool IsOtherUnit(ReadOnlySpan<char> text)
    {
        string s = Normalize(text);
        return s is "s" or "ms" or "us" or "ns" or "sec" or "min" or "h" or "ohm" or "Ω" or "kohm" or "S" or "%"
            or "#" or "-" or "1" or "a.u." or "au" or "index" or "n" or "W" or "F" or "Hz" or "V/V" or "A/V";
    }

    private static string Normalize(ReadOnlySpan<char> text)
    {
        ReadOnlySpan<char> t = text.Trim();
        while (t.Length >= 2 && ((t[0] == '(' && t[^1] == ')') || (t[0] == '[' && t[^1] == ']') || (t[0] == '{' && t[^1] == '}')))
        {
            t = t[1..^1].Trim();
        }
        var sb = new System.Text.StringBuilder(t.Length);
        for (int i = 0; i < t.Length; i++)
        {
            char c = t[i];
            switch (c)
            {
                case ' ':
                case '\t':
                    break;
                case '\u00B5': // micro sign
                case '\u03BC': // Greek small mu
                    sb.Append('u');
                    break;
                case '\u00B2':
                    sb.Append('2');
                    break;
                case '^':
                    break;
                case '*' when i + 1 < t.Length && t[i + 1] == '*':
                    i++;
                    break;
                default:
                    sb.Append(c);
                    break;
            }
        }
        return sb.ToString();
    }

    private static string Pretty(ReadOnlySpan<char> text)
    {
        ReadOnlySpan<char> t = text.Trim();
        while (t.Length >= 2 && ((t[0] == '(' && t[^1] == ')') || (t[0] == '[' && t[^1] == ']') || (t[0] == '{' && t[^1] == '}')))
        {
            t = t[1..^1].Trim();
        }
        return t.ToString();
    }

    private static bool TryPrefixed(string s, string[] bases, out int power)
    {
        foreach (string b in bases)
        {
            if (s.Equals(b, StringComparison.OrdinalIgnoreCase))
            {
                power = 0;
                return true;
            }
        }
        if (s.Length >= 2 && PrefixPower(s[0]) is int pp)
        {
            string rest = s[1..];
            foreach (string b in bases)
            {
                if (rest.Equals(b, StringComparison.OrdinalIgnoreCase))
                {
                    power = pp;
                    return true;
                }
            }
        }
        power = 0;
        return false;
    }

    private static int? PrefixPower(char c) => c switch
    {
        'p' => -12,
        'n' => -9,
        'u' => -6,
        'm' => -3,
        'k' => 3,
        _ => null,
    };

    private static bool TryLength(string s, bool squared, out int power)
    {
        power = 0;
        if (squared)
        {
            if (!s.EndsWith('2'))
            {
                return false;
            }
            s = s[..^1];
        }
        (bool ok, power) = s switch
        {
            "m" => (true, 0),
            "cm" => (true, -2),
            "mm" => (true, -3),
            "um" => (true, -6),
            "nm" => (true, -9),
            _ => (false, 0),
        };
        return ok;
    }

    private static bool TryTemperature(string s, out UnitScale unit)
    {
        switch (s)
        {
            case "K":
            case "kelvin":
            case "Kelvin":
                unit = new UnitScale(QuantityKind.Temperature, "K", 0);
                return true;
            case "°C":
            case "C":
            case "degC":
            case "deg.C":
            case "\u2103":
            case "celsius":
            case "Celsius":
            case "degreesC":
            case "°":
                unit = new UnitScale(QuantityKind.Temperature, "°C", 0, 273.15);
                return true;
            default:
                unit = default;
                return false;
        }
    }
}
