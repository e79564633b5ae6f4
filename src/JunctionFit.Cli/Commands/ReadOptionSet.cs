using System.Collections.Immutable;
using System.CommandLine;
using System.Globalization;
using JunctionFit.Cli.Support;
using JunctionFit.Import;

namespace JunctionFit.Cli.Commands;

/// <summary>Importer overrides shared by every command that reads I–V files (for when detection is wrong).</summary>
internal sealed class ReadOptionSet
{
    public Option<string?> VoltageColumn { get; } = new("--voltage-column") { Description = "take the bias from this column (header name or 1-based number)" };

    public Option<string?> CurrentColumn { get; } = new("--current-column") { Description = "take the current (or current density) from this column (header name or 1-based number)" };

    public Option<string?> VoltageUnit { get; } = new("--voltage-unit") { Description = "unit of the bias column, overriding the file (V, mV, ...)" };

    public Option<string?> CurrentUnit { get; } = new("--current-unit") { Description = "unit of the current column, overriding the file (A, mA, uA, nA, pA, A/cm2, ...)" };

    public Option<string?> Delimiter { get; } = new("--delimiter") { Description = "field delimiter: comma, semicolon, tab, space (runs of blanks) or pipe" };

    public Option<string?> Decimal { get; } = new("--decimal") { Description = "decimal separator: point, comma or auto (default auto)" };

    public Option<string?> PathPattern { get; } = new("--path-pattern") { Description = "lot, wafer and die from the file path, for example {lot}/{wafer}/die_{x}_{y}.csv" };

    public Option<string?> Segments { get; } = new("--segments") { Description = "keep only these sweep segments (0-based, comma-separated, for example 0,2)" };

    public Option<bool> KeepCompliance { get; } = new("--keep-compliance") { Description = "do not mask points at the current compliance" };

    public void AddTo(Command command)
    {
        foreach (var o in new Option[] { VoltageColumn, CurrentColumn, VoltageUnit, CurrentUnit, Delimiter, Decimal, PathPattern, Segments, KeepCompliance })
        {
            command.Options.Add(o);
        }
    }

    /// <summary>Import overrides, for the results database's identity.</summary>
    public static IEnumerable<KeyValuePair<string, string>> IdentityExtras(IvReadOptions o)
    {
        ArgumentNullException.ThrowIfNull(o);
        yield return new("read", $"v={o.VoltageColumn};i={o.CurrentColumn};vu={o.VoltageUnit};iu={o.CurrentUnit};delim={(o.Delimiter is char c ? ((int)c).ToString(CultureInfo.InvariantCulture) : "")};" +
                                 $"dec={o.DecimalComma};seg={(o.Segments is { } s ? string.Join(",", s) : "")};compliance={o.MaskCompliance};pattern={o.PathPattern}");
    }

    /// <summary>The import options the user gave; a value the importer refuses is a usage error naming its option.</summary>
    /// <exception cref="UsageException">A value is not usable.</exception>
    public IvReadOptions Build(ParseResult parse)
    {
        var options = IvReadOptions.Default with { MaskCompliance = !parse.GetValue(KeepCompliance) };
        options = Set(options, VoltageColumn, parse, (o, v) => o with { VoltageColumn = v });
        options = Set(options, CurrentColumn, parse, (o, v) => o with { CurrentColumn = v });
        options = Set(options, VoltageUnit, parse, (o, v) => o with { VoltageUnit = v });
        options = Set(options, CurrentUnit, parse, (o, v) => o with { CurrentUnit = v });
        options = Set(options, PathPattern, parse, (o, v) => o with { PathPattern = v });
        if (parse.GetValue(Delimiter) is string d)
        {
            char c = d.ToLowerInvariant() switch
            {
                "comma" or "," => ',',
                "semicolon" or ";" => ';',
                "tab" or "\\t" or "\t" => '\t',
                "space" or " " => ' ',
                "pipe" or "|" => '|',
                _ => throw new UsageException($"--delimiter: '{d}' is not one of comma, semicolon, tab, space, pipe"),
            };
            options = options with { Delimiter = c };
        }
        if (parse.GetValue(Decimal) is string dec)
        {
            bool? comma = dec.ToLowerInvariant() switch
            {
                "comma" or "," => true,
                "point" or "." or "dot" => false,
                "auto" => null,
                _ => throw new UsageException($"--decimal: '{dec}' is not one of point, comma, auto"),
            };
            options = options with { DecimalComma = comma };
        }
        if (parse.GetValue(Segments) is string seg)
        {
            var list = ImmutableArray.CreateBuilder<int>();
            foreach (string part in seg.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries))
            {
                if (!int.TryParse(part, NumberStyles.None, CultureInfo.InvariantCulture, out int k)) throw new UsageException($"--segments: '{part}' is not a segment number");
                list.Add(k);
            }
            options = options with { Segments = list.ToImmutable() };
        }
        return options;
    }

    /// <summary>Applies one option's value; the importer's refusal becomes a message that starts with the option's name.</summary>
    private static IvReadOptions Set(IvReadOptions options, Option<string?> option, ParseResult parse, Func<IvReadOptions, string, IvReadOptions> apply)
    {
        if (parse.GetValue(option) is not string value) return options;
        try
        {
            return apply(options, value);
        }
        catch (ArgumentException e)
        {
            throw UsageException.ForOption(option.Name, e);
        }
    }
}

/// <summary><c>junctionfit inspect FILE...</c>: print what the importer understood of each file.</summary>
internal static class InspectCommand
{
    public static Command Create(CliContext context)
    {
        var files = new Argument<string[]>("FILE") { Description = "I–V files to describe", Arity = ArgumentArity.OneOrMore };
        var read = new ReadOptionSet();
        var command = new Command("inspect", "Show how a file is read: layout, columns and roles, units, segments, masked points, metadata.");
        command.Arguments.Add(files);
        read.AddTo(command);
        command.SetAction(parse =>
        {
            var options = read.Build(parse);
            int failed = 0, ok = 0;
            foreach (string file in parse.GetValue(files) ?? [])
            {
                try
                {
                    var description = IvFileReader.Describe(file, options);
                    foreach (string line in description.ToTextLines()) context.Out.WriteLine(line);
                    context.Out.WriteLine();
                    ok++;
                }
                catch (IvFormatException e)
                {
                    context.Error.WriteLine(e.Message);
                    failed++;
                }
            }
            return failed == 0 ? ExitCodes.Success : ok > 0 ? ExitCodes.SomeFailed : ExitCodes.UsageOrInput;
        });
        return command;
    }
}
