using JunctionFit.Physics;

namespace JunctionFit.Cli;

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

    /// <summary>Parses a value given in the parameter's display unit (area: µm² or with a suffix) into SI.</summary>
    public static double ParseValueSi(ParameterDefinition definition, string text, string option)
    {
        ArgumentNullException.ThrowIfNull(definition);
        if (definition.Key == StandardParameters.Area.Key) return QuantityParser.ParseAreaM2(text);
        double display = QuantityParser.ParseNumber(option, text);
        double si = definition.FromDisplay(display);
        if (!(si > definition.LowerSi) || !(si <= definition.UpperSi))
        {
            throw new UsageException($"{option}: {CliName(definition)} = {text} {definition.DisplayUnit} is outside its physical range");
        }
        return si;
    }
}
