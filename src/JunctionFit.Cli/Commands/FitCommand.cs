using System.Collections.Immutable;
using System.CommandLine;
using JunctionFit.Cli.Support;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Cli.Commands;

/// <summary>Options shared by every command that fits (fit, demo, batch).</summary>
internal sealed class FitOptionSet
{
    public Option<string> Model { get; } = new("--model")
    {
        Description = "barrier model: " + string.Join(", ", ModelResolver.Names) + ", or auto (fit " +
                      string.Join(", ", FitPlan.AutoCandidates) + " and choose by AICc)",
        DefaultValueFactory = _ => "simmons",
    };

    public Option<double?> Temperature { get; } = new("--temperature")
    {
        Description = "sample temperature in K for the thermal factor (default: each file's stated temperature, else none)",
    };

    public Option<bool> IgnoreFileTemperature { get; } = new("--ignore-file-temperature")
    {
        Description = "do not apply the temperature stated in the files (zero-temperature forms unless --temperature)",
    };

    public Option<double?> Permittivity { get; } = new("--permittivity")
    {
        Description = "relative permittivity of the barrier for image-force models (default 3.9)",
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

    public Option<string[]> Start { get; } = new("--start")
    {
        Description = "start value of a free parameter: NAME=VALUE in its display unit (barrier-height=1.8, thickness=2); tried first, before the start grid; repeatable",
    };

    public Option<string[]> Bound { get; } = new("--bound")
    {
        Description = "bounds of a free parameter: NAME=LO:HI in its display unit, either end may be left empty (barrier-height=1.5:2.5, thickness=:3); repeatable",
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

    public Option<string> Interval { get; } = new("--interval")
    {
        Description = "95 % intervals: wald (default; in transformed parameters), profile (profile likelihood) or bootstrap (residual bootstrap, fixed seed)",
        DefaultValueFactory = _ => "wald",
    };

    public Option<int> BootstrapReplicates { get; } = new("--bootstrap-replicates")
    {
        Description = "replicates for --interval bootstrap (at least 20)",
        DefaultValueFactory = _ => BootstrapIntervals.DefaultReplicates,
    };

    public Option<int> Seed { get; } = new("--seed")
    {
        Description = "seed of the bootstrap (same seed, same intervals)",
        DefaultValueFactory = _ => 1,
    };

    public Option<string?> BiasWindow { get; } = new("--bias-window")
    {
        Description = "fit only the points with LO ≤ V ≤ HI, in volt, written LO:HI (either end may be left empty: 0.2: or :-0.2)",
    };

    public Option<string?> Polarity { get; } = new("--polarity")
    {
        Description = "fit only one polarity: positive (V > 0) or negative (V < 0); combines with --bias-window",
    };

    public Option<string?> SweepDirection { get; } = new("--sweep-direction")
    {
        Description = "fit only the points of one sweep direction: rising or falling bias (default both; see the hysteresis diagnosis)",
    };

    public Option<double?> MisfitTolerance { get; } = new("--misfit-tolerance")
    {
        Description = "largest systematic misfit (RMS of ln I residuals beyond the point-to-point noise) of an ok fit (default 0.05, about 5 % in current)",
    };

    public Option<bool> KeepSettling { get; } = new("--keep-settling")
    {
        Description = "keep the first point of a trace even when it looks like a settling artefact (by default it is left out, with a warning)",
    };

    public Option<string?> Substrate { get; } = new("--substrate")
    {
        Description = "mos model: substrate type p (n-channel devices, inversion at positive gate bias; the default) or n (p-channel devices)",
    };

    public Option<string?> Doping { get; } = new("--doping")
    {
        Description = "mos model: substrate doping in cm^-3 (for example 3e17; suffix m-3 for SI); default 1e17 cm^-3, noted in the warnings",
    };

    public Option<string?> Gate { get; } = new("--gate")
    {
        Description = "mos model: gate n+poly, p+poly or metal (default: n+poly on a p substrate, p+poly on an n substrate)",
    };

    public Option<string?> GateDoping { get; } = new("--gate-doping")
    {
        Description = "mos model: doping of a poly gate in cm^-3, sets the poly depletion (default 2e20)",
    };

    public Option<bool> AreaFromFile { get; } = new("--area-from-file")
    {
        Description = "fix the area at each file's stated area (its 'area' metadata) where it states one",
    };

    public void AddTo(Command command)
    {
        command.Options.Add(Temperature);
        command.Options.Add(IgnoreFileTemperature);
        command.Options.Add(Permittivity);
        command.Options.Add(AreaFromFile);
        command.Options.Add(Interval);
        command.Options.Add(BootstrapReplicates);
        command.Options.Add(Seed);
        command.Options.Add(Model);
        command.Options.Add(Area);
        command.Options.Add(MassRatio);
        command.Options.Add(Free);
        command.Options.Add(Fix);
        command.Options.Add(Start);
        command.Options.Add(Bound);
        command.Options.Add(Noise);
        command.Options.Add(NoiseFloor);
        command.Options.Add(Compliance);
        command.Options.Add(BiasWindow);
        command.Options.Add(Polarity);
        command.Options.Add(SweepDirection);
        command.Options.Add(MisfitTolerance);
        command.Options.Add(KeepSettling);
        command.Options.Add(Substrate);
        command.Options.Add(Doping);
        command.Options.Add(Gate);
        command.Options.Add(GateDoping);
    }

    /// <summary>Parses --bias-window LO:HI and --polarity into the window ends in volt (null: open).</summary>
    internal static (double? Low, double? High, string? Summary) ParseWindow(string? window, string? polarity)
    {
        double? low = null, high = null;
        var parts = new List<string>();
        if (window is not null)
        {
            int colon = window.IndexOf(':', StringComparison.Ordinal);
            if (colon < 0) throw new UsageException($"--bias-window: '{window}' must be LO:HI in volt, for example -0.5:0.5 or 0.2:");
            static double? End(string text, string whole)
            {
                text = text.Trim();
                if (text.Length == 0) return null;
                if (!double.TryParse(text, System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double v) || !double.IsFinite(v))
                {
                    throw new UsageException($"--bias-window: '{text}' in '{whole}' is not a number of volts");
                }
                return v;
            }
            low = End(window[..colon], window);
            high = End(window[(colon + 1)..], window);
            if (low is double lo && high is double hi && !(lo < hi)) throw new UsageException($"--bias-window: LO must be below HI in '{window}'");
            parts.Add($"bias window {low?.ToString("G6", System.Globalization.CultureInfo.InvariantCulture) ?? ""}:{high?.ToString("G6", System.Globalization.CultureInfo.InvariantCulture) ?? ""} V");
        }
        if (polarity is not null)
        {
            switch (polarity.Trim().ToLowerInvariant())
            {
                case "positive" or "pos" or "+":
                    low = Math.Max(low ?? double.Epsilon, double.Epsilon);
                    parts.Add("positive bias only");
                    break;
                case "negative" or "neg" or "-":
                    high = Math.Min(high ?? -double.Epsilon, -double.Epsilon);
                    parts.Add("negative bias only");
                    break;
                case "both":
                    break;
                default:
                    throw new UsageException($"--polarity: unknown value '{polarity}'; choose positive, negative or both");
            }
            if (low is double l2 && high is double h2 && !(l2 < h2)) throw new UsageException("--polarity: no bias is left inside --bias-window with this polarity");
        }
        return (low, high, parts.Count > 0 ? string.Join(", ", parts) : null);
    }

    /// <summary>The gate stack of the mos model from --substrate, --doping, --gate and --gate-doping.</summary>
    public MosStackOptions BuildMosStack(ParseResult parse)
    {
        var stack = MosStackOptions.Default;
        if (parse.GetValue(Substrate) is string sub)
        {
            stack = stack with
            {
                Substrate = sub.Trim().ToLowerInvariant() switch
                {
                    "p" or "p-type" => SubstrateType.P,
                    "n" or "n-type" => SubstrateType.N,
                    _ => throw new UsageException($"--substrate: '{sub}' must be p or n"),
                },
            };
        }
        if (parse.GetValue(Gate) is string gate)
        {
            stack = stack with
            {
                Gate = gate.Trim().ToLowerInvariant().Replace(" ", "", StringComparison.Ordinal) switch
                {
                    "n+poly" or "npoly" or "n+" or "n" => GateType.NPoly,
                    "p+poly" or "ppoly" or "p+" or "p" => GateType.PPoly,
                    "metal" => GateType.Metal,
                    _ => throw new UsageException($"--gate: '{gate}' must be n+poly, p+poly or metal"),
                },
            };
        }
        if (parse.GetValue(Doping) is string doping)
        {
            double n = ParseDensityM3(doping, "--doping");
            if (!(n >= 1e18 && n <= 1e26)) throw new UsageException($"--doping: {doping} must lie between 1e12 and 1e20 cm^-3");
            stack = stack with { DopingM3 = n, DopingStated = true };
        }
        if (parse.GetValue(GateDoping) is string gateDoping)
        {
            double n = ParseDensityM3(gateDoping, "--gate-doping");
            if (!(n >= 1e24 && n <= 1e28)) throw new UsageException($"--gate-doping: {gateDoping} must lie between 1e18 and 1e22 cm^-3");
            stack = stack with { GateDopingM3 = n };
        }
        return stack;
    }

    /// <summary>A density: a bare number is cm⁻³; suffixes cm-3 and m-3.</summary>
    private static double ParseDensityM3(string text, string option)
    {
        string t = text.Trim();
        double factor = 1e6;
        if (t.EndsWith("cm-3", StringComparison.OrdinalIgnoreCase)) t = t[..^4];
        else if (t.EndsWith("m-3", StringComparison.OrdinalIgnoreCase)) { t = t[..^3]; factor = 1.0; }
        if (!double.TryParse(t.Trim(), System.Globalization.NumberStyles.Float, System.Globalization.CultureInfo.InvariantCulture, out double v) || !(v > 0) || !double.IsFinite(v))
        {
            throw new UsageException($"{option}: '{text}' is not a positive number (cm^-3, or with the suffix m-3)");
        }
        return v * factor;
    }

    /// <summary>Parasitic parameters that <c>--free</c> or <c>--fix</c> switch on by naming them.</summary>
    internal static readonly (ParameterDefinition Def, Func<ParasiticOptions, ParasiticOptions> Enable)[] ParasiticSwitches =
    [
        (StandardParameters.SeriesResistance, o => o with { SeriesResistance = true }),
        (StandardParameters.LeakageConductance, o => o with { LeakageConductance = true }),
        (StandardParameters.VoltageOffset, o => o with { VoltageOffset = true }),
        (StandardParameters.CurrentOffset, o => o with { CurrentOffset = true }),
    ];

    /// <summary>Builds the fit plan from the parsed values.</summary>
    public (FitPlan Plan, string Summary) Build(ParseResult parse)
    {
        string modelText = (parse.GetValue(Model) ?? "simmons").Trim();
        IReadOnlyList<string> names = string.Equals(modelText, "auto", StringComparison.OrdinalIgnoreCase)
            ? FitPlan.AutoCandidates
            : [ResolveName(modelText)];
        double? temperature = parse.GetValue(Temperature);
        if (temperature is double t && (!(t >= 0) || !double.IsFinite(t))) throw new UsageException($"--temperature: {t} must be zero or a positive number of kelvin");
        double? permittivity = parse.GetValue(Permittivity);
        if (permittivity is double er && (!(er >= 1) || !double.IsFinite(er))) throw new UsageException($"--permittivity: {er} must be at least 1");
        var modelOptions = BarrierModelOptions.Default with { TemperatureK = temperature };
        if (permittivity is double eps) modelOptions = modelOptions with { RelativePermittivity = eps };
        bool mos = names.Contains(BarrierModelCatalog.Mos);
        var mosStack = BuildMosStack(parse);
        if (!mos && (parse.GetValue(Substrate) ?? parse.GetValue(Doping) ?? parse.GetValue(Gate) ?? parse.GetValue(GateDoping)) is not null)
        {
            throw new UsageException("--substrate, --doping, --gate and --gate-doping apply to --model mos only");
        }
        modelOptions = modelOptions with { Mos = mosStack };

        // Parasitic elements are switched on by naming them in --free, --fix, --start or --bound.
        string[] freeNames = parse.GetValue(Free) ?? [];
        string[] fixItems = parse.GetValue(Fix) ?? [];
        var parasitics = ParasiticOptions.None;
        var named = fixItems.Concat(parse.GetValue(Start) ?? []).Concat(parse.GetValue(Bound) ?? []).Select(f => f.Split('=')[0].Trim());
        foreach (string name in freeNames.Concat(named))
        {
            foreach (var (def, enable) in ParasiticSwitches)
            {
                if (string.Equals(name, def.Key, StringComparison.OrdinalIgnoreCase) ||
                    string.Equals(name, ParameterNames.CliName(def), StringComparison.OrdinalIgnoreCase))
                {
                    parasitics = enable(parasitics);
                }
            }
        }

        var fixedValues = ImmutableDictionary.CreateBuilder<ParameterKey, double>();
        var freed = ImmutableHashSet.CreateBuilder<ParameterKey>();
        var starts = ImmutableDictionary.CreateBuilder<ParameterKey, double>();
        double massRatio = parse.GetValue(MassRatio);
        if (!(massRatio > 0) || !double.IsFinite(massRatio)) throw new UsageException($"--mass-ratio: {massRatio} must be a positive number");
        var summary = new List<string> { names.Count == 1 ? $"model {names[0]}" : $"model auto ({string.Join(", ", names)}, by AICc)" };
        var models = names.Select(n => new JunctionCurrentModel(BarrierModelCatalog.Create(n, modelOptions), parasitics)).ToArray();

        ParameterDefinition FindInAny(string name, string option)
        {
            UsageException? first = null;
            foreach (var m in models)
            {
                try { return ParameterNames.Find(m, name, option); }
                catch (UsageException e) { first ??= e; }
            }
            throw first!;
        }

        foreach (string name in freeNames)
        {
            var def = FindInAny(name, "--free");
            freed.Add(def.Id);
            summary.Add($"free {ParameterNames.CliName(def)}");
        }
        // The mos model has its own oxide masses (electrons 0.40, holes 0.32): --mass-ratio applies only when given.
        bool massGiven = !mos || parse.GetResult(MassRatio) is { Implicit: false };
        if (!massGiven)
        {
            var mosModel = (MosGateStackModel)models.First(m => m.Barrier is MosGateStackModel).Barrier;
            massRatio = mosModel.Parameters[MosGateStackModel.MassRatioIndex].DefaultSi;
            var gate = mosStack.EffectiveGate;
            summary.Add($"{(mosStack.Substrate == SubstrateType.P ? "p" : "n")} substrate, {MosGateStackModel.GateText(gate)} gate, doping " +
                        $"{mosStack.DopingM3 / 1e6:0.##e+0} cm^-3{(mosStack.DopingStated ? "" : " (assumed)")}");
        }
        if (freed.Contains(ParameterKey.MassRatio)) starts[ParameterKey.MassRatio] = massRatio;
        else if (massGiven) fixedValues[ParameterKey.MassRatio] = massRatio;
        summary.Add(freed.Contains(ParameterKey.MassRatio) ? $"mass ratio free (start {massRatio})" : $"mass ratio fixed at {massRatio}");
        if (parse.GetValue(Area) is string areaText)
        {
            double area = QuantityParser.ParseAreaM2(areaText);
            fixedValues[ParameterKey.Area] = area;
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
        foreach (string item in fixItems)
        {
            int eq = item.IndexOf('=', StringComparison.Ordinal);
            if (eq <= 0 || eq == item.Length - 1) throw new UsageException($"--fix: '{item}' must be NAME=VALUE, for example thickness=1.6");
            var def = FindInAny(item[..eq].Trim(), "--fix");
            if (fixedValues.ContainsKey(def.Id) && (def.Id != ParameterKey.MassRatio))
            {
                throw new UsageException($"--fix: {ParameterNames.CliName(def)} is given twice (also by --area or another --fix)");
            }
            fixedValues[def.Id] = ParameterNames.ParseValueSi(def, item[(eq + 1)..].Trim(), "--fix");
            freed.Remove(def.Id);
            summary.Add($"{ParameterNames.CliName(def)} fixed at {item[(eq + 1)..].Trim()} {def.DisplayUnit}".TrimEnd());
        }
        var bounds = ImmutableDictionary.CreateBuilder<ParameterKey, ParameterBounds>();
        foreach (string item in parse.GetValue(Bound) ?? [])
        {
            var (def, value) = SplitItem(item, "--bound", "barrier-height=1.5:2.5", FindInAny);
            CheckAdjustable(def, "--bound", fixedValues, freed);
            if (bounds.ContainsKey(def.Id)) throw new UsageException($"--bound: {ParameterNames.CliName(def)} is given twice");
            bounds[def.Id] = ParameterNames.ParseBoundsSi(def, value, "--bound");
            summary.Add($"{ParameterNames.CliName(def)} bounded to {value} {def.DisplayUnit}".TrimEnd());
        }
        foreach (string item in parse.GetValue(Start) ?? [])
        {
            var (def, value) = SplitItem(item, "--start", "thickness=2", FindInAny);
            CheckAdjustable(def, "--start", fixedValues, freed);
            if (starts.ContainsKey(def.Id) && def.Id != ParameterKey.MassRatio) throw new UsageException($"--start: {ParameterNames.CliName(def)} is given twice");
            double start = ParameterNames.ParseValueSi(def, value, "--start");
            if (bounds.TryGetValue(def.Id, out var b) && !(start > b.LowerSi && start < b.UpperSi))
            {
                throw new UsageException($"--start: {ParameterNames.CliName(def)} = {value} {def.DisplayUnit} lies outside its --bound".Replace("  ", " ", StringComparison.Ordinal));
            }
            starts[def.Id] = start;
            summary.Add($"{ParameterNames.CliName(def)} starting at {value} {def.DisplayUnit}".TrimEnd());
        }
        double? noise = parse.GetValue(Noise);
        if (noise is double r && (!(r > 0) || !double.IsFinite(r))) throw new UsageException($"--noise: {r} must be a positive number");
        double? floor = parse.GetValue(NoiseFloor);
        if (floor is double f && (!(f >= 0) || !double.IsFinite(f))) throw new UsageException($"--noise-floor: {f} must be zero or positive");
        double? compliance = parse.GetValue(Compliance);
        if (compliance is double c && (!(c > 0) || !double.IsFinite(c))) throw new UsageException($"--compliance: {c} must be a positive number");
        if (noise is not null) summary.Add($"relative noise {noise}");
        if (floor is not null) summary.Add($"noise floor {floor} A");
        bool fileTemperature = !parse.GetValue(IgnoreFileTemperature);
        summary.Add(temperature is double tk ? $"temperature {tk} K" : fileTemperature ? "temperature from each file where stated" : "zero-temperature forms");

        var (windowLow, windowHigh, windowSummary) = ParseWindow(parse.GetValue(BiasWindow), parse.GetValue(Polarity));
        if (windowSummary is not null) summary.Add(windowSummary);
        int direction = (parse.GetValue(SweepDirection)?.Trim().ToLowerInvariant()) switch
        {
            null or "both" => 0,
            "rising" or "up" or "forward" => 1,
            "falling" or "down" or "reverse" => -1,
            var other => throw new UsageException($"--sweep-direction: unknown value '{other}'; choose rising, falling or both"),
        };
        if (direction != 0) summary.Add(direction > 0 ? "rising sweep only" : "falling sweep only");
        double misfit = parse.GetValue(MisfitTolerance) ?? FitOptions.DefaultMisfitTolerance;
        if (!(misfit > 0) || !double.IsFinite(misfit)) throw new UsageException($"--misfit-tolerance: {misfit} must be a positive number (0.05 is 5 %)");
        if (parse.GetValue(MisfitTolerance) is not null) summary.Add($"misfit tolerance {misfit}");
        bool keepSettling = parse.GetValue(KeepSettling);
        if (keepSettling) summary.Add("settling artefacts kept");

        var options = new FitOptions
        {
            BiasWindowLowV = windowLow,
            BiasWindowHighV = windowHigh,
            SweepDirection = direction,
            MisfitTolerance = misfit,
            KeepSettling = keepSettling,
            FixedValues = fixedValues.ToImmutable(),
            FreedKeys = freed.ToImmutable(),
            StartValues = starts.ToImmutable(),
            Bounds = bounds.ToImmutable(),
            RelativeNoise = noise,
            NoiseFloorA = floor,
            ComplianceA = compliance,
            FixAreaFromMetadata = parse.GetValue(AreaFromFile) && parse.GetValue(Area) is null,
        };
        var intervals = (parse.GetValue(Interval) ?? "wald").ToLowerInvariant() switch
        {
            "wald" => IntervalMethod.Wald,
            "profile" => IntervalMethod.Profile,
            "bootstrap" => IntervalMethod.Bootstrap,
            var other => throw new UsageException($"--interval: unknown method '{other}'; choose wald, profile or bootstrap"),
        };
        int replicates = parse.GetValue(BootstrapReplicates);
        if (replicates < 20) throw new UsageException($"--bootstrap-replicates: {replicates} must be at least 20");
        if (intervals != IntervalMethod.Wald) summary.Add($"{intervals.ToString().ToLowerInvariant()} intervals");
        var plan = new FitPlan(names, modelOptions, parasitics, options, fileTemperature)
        {
            Intervals = intervals,
            BootstrapReplicates = replicates,
            BootstrapSeed = parse.GetValue(Seed),
        };
        return (plan, string.Join("; ", summary));
    }

    /// <summary>NAME=VALUE of <paramref name="option"/> split, with the parameter found.</summary>
    private static (ParameterDefinition Def, string Value) SplitItem(string item, string option, string example, Func<string, string, ParameterDefinition> find)
    {
        int eq = item.IndexOf('=', StringComparison.Ordinal);
        if (eq <= 0 || eq == item.Length - 1) throw new UsageException($"{option}: '{item}' must be NAME=VALUE, for example {example}");
        return (find(item[..eq].Trim(), option), item[(eq + 1)..].Trim());
    }

    /// <summary>A start value or bound applies to a parameter the fit adjusts: not fixed, and freed when fixed by default.</summary>
    private static void CheckAdjustable(ParameterDefinition def, string option, ImmutableDictionary<ParameterKey, double>.Builder fixedValues,
        ImmutableHashSet<ParameterKey>.Builder freed)
    {
        string name = ParameterNames.CliName(def);
        if (def.FixedByDefault && !freed.Contains(def.Id))
        {
            throw new UsageException($"{option}: {name} is fixed unless freed; add --free {name}");
        }
        if (fixedValues.ContainsKey(def.Id))
        {
            throw new UsageException($"{option}: {name} is fixed (by --fix or --area); a fixed parameter has no start value or bounds");
        }
    }

    /// <summary>Settings outside <see cref="FitOptions"/> that change a fit, for the results database's identity.</summary>
    public static IEnumerable<KeyValuePair<string, string>> IdentityExtras(FitPlan plan)
    {
        ArgumentNullException.ThrowIfNull(plan);
        yield return new("models", string.Join(",", plan.ModelNames));
        yield return new("temperature_K", plan.ModelOptions.TemperatureK?.ToString("R", System.Globalization.CultureInfo.InvariantCulture) ?? "");
        yield return new("temperature_from_file", plan.TemperatureFromFile ? "true" : "false");
        yield return new("relative_permittivity", plan.ModelOptions.RelativePermittivity.ToString("R", System.Globalization.CultureInfo.InvariantCulture));
        yield return new("intervals", $"{plan.Intervals}:{plan.BootstrapReplicates}:{plan.BootstrapSeed}");
        if (plan.ModelNames.Contains(BarrierModelCatalog.Mos))
        {
            var m = plan.ModelOptions.Mos;
            yield return new("mos_stack", string.Create(System.Globalization.CultureInfo.InvariantCulture,
                $"{m.Substrate}:{m.EffectiveGate}:{m.DopingM3:R}:{m.GateDopingM3:R}"));
        }
        yield return new("parasitics", $"{plan.Parasitics.SeriesResistance},{plan.Parasitics.LeakageConductance},{plan.Parasitics.VoltageOffset},{plan.Parasitics.CurrentOffset}");
    }

    private static string ResolveName(string name)
    {
        foreach (string known in ModelResolver.Names)
        {
            if (string.Equals(known, name, StringComparison.OrdinalIgnoreCase)) return known;
        }
        throw new UsageException($"--model: unknown model '{name}'; choose one of: {string.Join(", ", ModelResolver.Names)}, auto");
    }
}

/// <summary>Reads a C–V file for <c>--cv</c> and analyses it.</summary>
internal static class CapacitanceVoltageInput
{
    /// <summary>Reads and analyses; the area is <paramref name="areaM2"/> or the file's metadata.</summary>
    /// <exception cref="IvFormatException">Unreadable file, or no area.</exception>
    public static CvSummary Read(string path, double? areaM2, double oxidePermittivity)
    {
        var curve = CvFileReader.Read(path);
        double area = areaM2 ?? curve.AreaM2
            ?? throw new IvFormatException(path, 0, "the C-V file states no area ('# area: 120000 um2'); give --cv-area");
        return CvAnalysis.Analyse(curve.VoltageV.AsSpan(), curve.CapacitanceF.AsSpan(), area, oxidePermittivity, curve.TemperatureK ?? 300.0);
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
        var cv = new Option<string?>("--cv") { Description = "a capacitance-voltage file of the same gate stack: reports CET = eps_ox*A/C_max beside the fitted oxide thickness (JSON key cet_nm)" };
        var cvArea = new Option<string?>("--cv-area") { Description = "area of the C-V capacitor (bare number: µm²; suffixes um2, m2, cm2, nm2); default: the C-V file's 'area' metadata" };
        var command = new Command("fit", "Fit a barrier model to I–V files and report barrier height, thickness and area with 95 % intervals.");
        command.Arguments.Add(paths);
        fitOptions.AddTo(command);
        command.Options.Add(json);
        command.Options.Add(outDir);
        command.Options.Add(jobs);
        command.Options.Add(cv);
        command.Options.Add(cvArea);
        var read = new ReadOptionSet();
        read.AddTo(command);
        command.SetAction(parse =>
        {
            var (plan, summary) = fitOptions.Build(parse);
            int jobCount = parse.GetValue(jobs) ?? Environment.ProcessorCount;
            if (jobCount < 1) throw new UsageException($"--jobs: {jobCount} must be at least 1");
            CvSummary? cvSummary = null;
            if (parse.GetValue(cv) is string cvPath)
            {
                double? area = parse.GetValue(cvArea) is string areaText ? QuantityParser.ParseAreaM2(areaText, "--cv-area") : null;
                try
                {
                    cvSummary = CapacitanceVoltageInput.Read(cvPath, area, plan.ModelOptions.Mos.OxidePermittivity);
                }
                catch (IvFormatException e)
                {
                    context.Error.WriteLine(e.Message);
                    return ExitCodes.UsageOrInput;
                }
            }
            else if (parse.GetValue(cvArea) is not null)
            {
                throw new UsageException("--cv-area needs --cv FILE");
            }
            var run = new FitRun(context, plan, read.Build(parse), summary, parse.GetValue(json), parse.GetValue(outDir), null, jobCount)
            {
                CapacitanceVoltage = cvSummary,
            };
            return run.Execute(parse.GetValue(paths) ?? []);
        });
        return command;
    }
}
