using System.Globalization;

namespace JunctionFit.Cli.Support;

/// <summary>Parses quantities given on the command line into SI values.</summary>
public static class QuantityParser
{
    /// <summary>
    /// Parses an area: a bare number is µm²; suffixes <c>um2</c> (also µm2, µm²), <c>m2</c>, <c>cm2</c>, <c>nm2</c>, <c>mm2</c>.
    /// Returns m².
    /// </summary>
    /// <param name="text">The text as typed.</param>
    /// <param name="option">The option the user typed, named in the message (for example <c>--area</c> or <c>--fix</c>).</param>
    /// <exception cref="UsageException">The text is not a positive area.</exception>
    public static double ParseAreaM2(string text, string option = "--area")
    {
        ArgumentNullException.ThrowIfNull(text);
        string t = text.Trim().Replace("²", "2", StringComparison.Ordinal).Replace("µ", "u", StringComparison.Ordinal).Replace("μ", "u", StringComparison.Ordinal);
        (string suffix, double factor)[] units = [("um2", 1e-12), ("nm2", 1e-18), ("mm2", 1e-6), ("cm2", 1e-4), ("m2", 1.0)];
        double scale = 1e-12;
        foreach (var (suffix, factor) in units)
        {
            if (t.EndsWith(suffix, StringComparison.OrdinalIgnoreCase))
            {
                t = t[..^suffix.Length].Trim();
                scale = factor;
                break;
            }
        }
        if (!double.TryParse(t, NumberStyles.Float, CultureInfo.InvariantCulture, out double value) || !double.IsFinite(value) || value <= 0)
        {
            throw new UsageException($"{option}: '{text}' is not a positive area (a bare number is µm²; suffixes um2, m2, cm2, nm2)");
        }
        return value * scale;
    }

    /// <summary>Parses a finite number with the invariant culture.</summary>
    /// <exception cref="UsageException">Not a finite number.</exception>
    public static double ParseNumber(string option, string text)
    {
        if (!double.TryParse(text, NumberStyles.Float, CultureInfo.InvariantCulture, out double value) || !double.IsFinite(value))
        {
            throw new UsageException($"{option}: '{text}' is not a number");
        }
        return value;
    }
}
