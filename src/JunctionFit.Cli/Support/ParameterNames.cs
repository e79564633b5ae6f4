using JunctionFit.Physics;

namespace JunctionFit.Cli.Support;

/// <summary>
/// Command-line names of model parameters: the JSON key without its unit, with hyphens
/// (<c>barrier_height_eV</c> → <c>barrier-height</c>, <c>area_m2</c> → <c>area</c>). JSON keys are accepted too.
/// </summary>
public static class ParameterNames
{
    /// <summary>The command-line name of a parameter.</summary>
    public static string CliName(ParameterDefinition definition)
    {
        ArgumentNullException.ThrowIfNull(definition);
        string[] parts = definition.Key.Split('_');
        bool hasUnit = parts.Length > 1 && (definition.DisplayUnit.Length > 0 || definition.Key.EndsWith("_m2", StringComparison.Ordinal));
        return string.Join('-', hasUnit ? parts[..^1] : parts);
    }

    /// <summary>The parameter of <paramref name="model"/> named <paramref name="name"/> (CLI name or key).</summary>
    /// <exception cref="UsageException">No such parameter.</exception>
    public static ParameterDefinition Find(JunctionCurrentModel model, string name, string option)
    {
        ArgumentNullException.ThrowIfNull(model);
        foreach (var def in model.Parameters)
        {
            if (string.Equals(def.Key, name, StringComparison.OrdinalIgnoreCase) ||
                string.Equals(CliName(def), name, StringComparison.OrdinalIgnoreCase))
            {
                return def;
            }
        }
        var names = model.Parameters.Select(CliName);
        throw new UsageException($"{option}: model '{model.Barrier.Name}' has no parameter '{name}'; it has: {string.Join(", ", names)}");
    }

    /// <summary>
    /// Parses bounds <c>LO:HI</c> given in the parameter's display unit (area: µm² or with a suffix) into SI; an empty end
    /// keeps the physical bound on that side. Each end must lie inside the physical range, LO below HI.
    /// </summary>
    /// <exception cref="UsageException">The text is not LO:HI, an end is not a value of the parameter, or LO ≥ HI.</exception>
    public static ParameterBounds ParseBoundsSi(ParameterDefinition definition, string text, string option)
    {
        ArgumentNullException.ThrowIfNull(definition);
        ArgumentNullException.ThrowIfNull(text);
        string name = CliName(definition);
        int colon = text.IndexOf(':', StringComparison.Ordinal);
        if (colon < 0 || text.IndexOf(':', colon + 1) >= 0)
        {
            throw new UsageException($"{option}: {name}={text} must be LO:HI in {UnitWords(definition)}, either end may be empty (for example {name}=:{Example(definition)})");
        }
        string loText = text[..colon].Trim(), hiText = text[(colon + 1)..].Trim();
        if (loText.Length == 0 && hiText.Length == 0) throw new UsageException($"{option}: {name}={text} gives neither end");
        double lo = loText.Length == 0 ? double.NegativeInfinity : ParseValueSi(definition, loText, option);
        double hi = hiText.Length == 0 ? double.PositiveInfinity : ParseValueSi(definition, hiText, option);
        if (!(lo < hi)) throw new UsageException($"{option}: {name}={text}: LO must be below HI");
        if (double.IsInfinity(lo) && !double.IsFinite(definition.LowerSi) && double.IsFinite(hi))
        {
            throw new UsageException($"{option}: {name} has no lower limit of its own; give both ends, LO:HI");
        }
        return new ParameterBounds(lo, hi);
    }

    private static string UnitWords(ParameterDefinition definition)
        => definition.Id == ParameterKey.Area ? "µm² (or with a suffix um2, m2, cm2, nm2)" : definition.DisplayUnit.Length > 0 ? definition.DisplayUnit : "plain numbers";

    private static string Example(ParameterDefinition definition)
        => definition.ToDisplay(definition.DefaultSi * (definition.Id == ParameterKey.Area ? 1e12 : 1.0) * 2).ToString("G3", System.Globalization.CultureInfo.InvariantCulture);

    /// <summary>Parses a value given in the parameter's display unit (area: µm² or with a suffix) into SI.</summary>
    public static double ParseValueSi(ParameterDefinition definition, string text, string option)
    {
        ArgumentNullException.ThrowIfNull(definition);
        if (definition.Id == ParameterKey.Area) return QuantityParser.ParseAreaM2(text, option);
        double display = QuantityParser.ParseNumber(option, text);
        double si = definition.FromDisplay(display);
        if (!(si > definition.LowerSi) || !(si <= definition.UpperSi))
        {
            throw new UsageException($"{option}: {CliName(definition)} = {text} {definition.DisplayUnit} is outside its physical range");
        }
        return si;
    }
}
