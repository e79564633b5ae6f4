using System.Collections.Immutable;
using System.CommandLine;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Cli.Commands;

/// <summary>Options shared by every command that fits (fit, demo, batch).</summary>
internal sealed class FitOptionSet
{
    public Option<string> Model { get; } = new("--model")
    {
        Description = "barrier model: " + string.Join(", ", ModelResolver.Names),
        DefaultValueFactory = _ => "simmons",
    };

    public Option<string?> Area { get; } = new("--area")
    {
        Description = "fix the effective area (bare number: µm²; suffixes um2, m2, cm2, nm2); without it the area is fitted",
    };

    public Option<double> MassRatio { get; } = new("--mass-ratio")
    {
        Description = "effective mass ratio m*/mₑ (fixed unless --free mass-ratio)",
        DefaultValueFactory = _ => 1.0,
    };

    public Option<string[]> Free { get; } = new("--free")
    {
        Description = "free a parameter that is fixed by default (for example mass-ratio); repeatable",
        AllowMultipleArgumentsPerToken = false,
    };

    public Option<string[]> Fix { get; } = new("--fix")
    {
        Description = "fix a parameter: NAME=VALUE in its display unit (barrier-height=2.1, thickness=1.6, area=100); repeatable",
    };

    public Option<double?> Noise { get; } = new("--noise")
    {
        Description = "known relative current noise r (σ_I = r·|I|); without it the noise level is estimated from the fit",
    };

    public Option<double?> NoiseFloor { get; } = new("--noise-floor")
    {
        Description = "current noise floor in A; points at or below 3× the floor are masked",
    };

    public Option<double?> Compliance { get; } = new("--compliance")
    {
        Description = "current compliance in A; points at compliance are masked (default: the file's, if stated)",
    };

    public Option<bool> AreaFromFile { get; } = new("--area-from-file")
    {
        Description = "fix the area at each file's stated area (its 'area' metadata) where it states one",
    };

    public void AddTo(Command command)
    {
        command.Options.Add(AreaFromFile);
        command.Options.Add(Model);
        command.Options.Add(Area);
        command.Options.Add(MassRatio);
        command.Options.Add(Free);
        command.Options.Add(Fix);
        command.Options.Add(Noise);
        command.Options.Add(NoiseFloor);
        command.Options.Add(Compliance);
    }

    /// <summary>Builds the model and fit options from the parsed values.</summary>
    public (JunctionCurrentModel Model, FitOptions Options, string Summary) Build(ParseResult parse)
    {
        var barrier = ModelResolver.Resolve(parse.GetValue(Model) ?? "simmons");
        var model = new JunctionCurrentModel(barrier);
        var fixedValues = ImmutableDictionary.CreateBuilder<string, double>();
        var freed = ImmutableHashSet.CreateBuilder<string>();
        double massRatio = parse.GetValue(MassRatio);
        if (!(massRatio > 0) || !double.IsFinite(massRatio)) throw new UsageException($"--mass-ratio: {massRatio} must be a positive number");
        var summary = new List<string> { $"model {barrier.Name}" };

        foreach (string name in parse.GetValue(Free) ?? [])
        {
            var def = ParameterNames.Find(model, name, "--free");
            freed.Add(def.Key);
            summary.Add($"free {ParameterNames.CliName(def)}");
        }
        var massDef = model.Parameters.FirstOrDefault(d => d.Key == StandardParameters.MassRatio.Key);
        var starts = ImmutableDictionary.CreateBuilder<string, double>();
        if (massDef is not null)
        {
            if (freed.Contains(massDef.Key)) starts[massDef.Key] = massRatio;
            else fixedValues[massDef.Key] = massRatio;
            summary.Add(freed.Contains(massDef.Key) ? $"mass ratio free (start {massRatio})" : $"mass ratio fixed at {massRatio}");
        }
        if (parse.GetValue(Area) is string areaText)
        {
            double area = QuantityParser.ParseAreaM2(areaText);
            fixedValues[StandardParameters.Area.Key] = area;
            summary.Add($"area fixed at {area * 1e12:G6} µm²");
        }
        else if (parse.GetValue(AreaFromFile))
        {
            summary.Add("area fixed at each file's stated area");
        }
        else
        {
            summary.Add("area free");
        }
        foreach (string item in parse.GetValue(Fix) ?? [])
        {
            int eq = item.IndexOf('=', StringComparison.Ordinal);
            if (eq <= 0 || eq == item.Length - 1) throw new UsageException($"--fix: '{item}' must be NAME=VALUE, for example thickness=1.6");
            var def = ParameterNames.Find(model, item[..eq].Trim(), "--fix");
            fixedValues[def.Key] = ParameterNames.ParseValueSi(def, item[(eq + 1)..].Trim(), "--fix");
            freed.Remove(def.Key);
            summary.Add($"{ParameterNames.CliName(def)} fixed at {item[(eq + 1)..].Trim()} {def.DisplayUnit}".TrimEnd());
        }
        double? noise = parse.GetValue(Noise);
        if (noise is double r && (!(r > 0) || !double.IsFinite(r))) throw new UsageException($"--noise: {r} must be a positive number");
        double? floor = parse.GetValue(NoiseFloor);
        if (floor is double f && (!(f >= 0) || !double.IsFinite(f))) throw new UsageException($"--noise-floor: {f} must be zero or positive");
        double? compliance = parse.GetValue(Compliance);
        if (compliance is double c && (!(c > 0) || !double.IsFinite(c))) throw new UsageException($"--compliance: {c} must be a positive number");
        if (noise is not null) summary.Add($"relative noise {noise}");
        if (floor is not null) summary.Add($"noise floor {floor} A");

        var options = new FitOptions
        {
            FixedValues = fixedValues.ToImmutable(),
            FreedKeys = freed.ToImmutable(),
            StartValues = starts.ToImmutable(),
            RelativeNoise = noise,
            NoiseFloorA = floor,
            ComplianceA = compliance,
            FixAreaFromMetadata = parse.GetValue(AreaFromFile) && parse.GetValue(Area) is null,
        };
        return (model, options, string.Join("; ", summary));
    }
}

/// <summary><c>junctionfit fit PATH... [options]</c>: fit each file, print a table or JSON lines, optionally write plots and a report.</summary>
internal static class FitCommand
{
    public static Command Create(CliContext context)
    {
        var paths = new Argument<string[]>("PATH")
        {
            Description = "I–V files, or folders (every .csv, .tsv, .txt, .dat, .iv file below them)",
            Arity = ArgumentArity.OneOrMore,
        };
        var fitOptions = new FitOptionSet();
        var json = new Option<bool>("--json") { Description = "print one JSON object per input file, one per line, and nothing else on standard output" };
        var outDir = new Option<string?>("--out") { Description = "write each file's fit plot (PNG), summary.csv and report.html into this folder" };
        var jobs = new Option<int?>("--jobs") { Description = "parallel fits (default: the number of cores)" };
        var command = new Command("fit", "Fit a barrier model to I–V files and report barrier height, thickness and area with 95 % intervals.");
        command.Arguments.Add(paths);
        fitOptions.AddTo(command);
        command.Options.Add(json);
        command.Options.Add(outDir);
        command.Options.Add(jobs);
        command.SetAction(parse =>
        {
            var (model, options, summary) = fitOptions.Build(parse);
            int jobCount = parse.GetValue(jobs) ?? Environment.ProcessorCount;
            if (jobCount < 1) throw new UsageException($"--jobs: {jobCount} must be at least 1");
            var run = new FitRun(context, model, options, summary, parse.GetValue(json), parse.GetValue(outDir), null, jobCount);
            return run.Execute(parse.GetValue(paths) ?? []);
        });
        return command;
    }
}
