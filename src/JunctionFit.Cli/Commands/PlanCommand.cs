using System.Collections.Immutable;
using System.CommandLine;
using System.Globalization;
using JunctionFit.Cli.Support;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Planning;
using JunctionFit.Reporting;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// <c>junctionfit plan</c>: predicted standard errors, 95 % half-widths and correlations of a fit before the sweep is measured,
/// and a recommended sweep under bias, field and compliance limits. Reads → computes (Planning) → writes (Reporting).
/// </summary>
internal static class PlanCommand
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static Command Create(CliContext context)
    {
        var model = new Option<string>("--model") { Description = "barrier model: " + string.Join(", ", ModelResolver.Names.Where(n => n != BarrierModelCatalog.Mos)), DefaultValueFactory = _ => "simmons" };
        var barrierHeight = new Option<string?>("--barrier-height") { Description = "nominal barrier height φ in eV, or a range LO:HI (the worst case over it is reported)" };
        var thickness = new Option<string?>("--thickness") { Description = "nominal barrier thickness d in nm, or a range LO:HI (the worst case over it is reported)" };
        var area = new Option<string?>("--area") { Description = "effective area (bare number: µm²; suffixes um2, m2, cm2, nm2); held fixed, as in fit, unless --free area" };
        var asymmetry = new Option<double?>("--asymmetry") { Description = "nominal barrier asymmetry Δφ in eV (models with an asymmetry parameter)" };
        var massRatio = new Option<double?>("--mass-ratio") { Description = "effective mass ratio m*/mₑ (default 1; fixed unless --free mass-ratio)" };
        var set = new Option<string[]>("--set") { Description = "any other nominal parameter: NAME=VALUE in its display unit (a parasitic element named here is added); repeatable" };
        var result = new Option<string?>("--result") { Description = "start from a fitted result: a file of 'fit --json' lines (the first that did not fail gives model, values, fixed parameters and noise)" };
        var free = new Option<string[]>("--free") { Description = "leave a parameter free in the planned fit (for example area, mass-ratio); repeatable" };
        var fix = new Option<string[]>("--fix") { Description = "hold a parameter fixed in the planned fit: NAME, or NAME=VALUE to set its nominal value too; repeatable" };
        var noise = new Option<double?>("--noise") { Description = "relative current noise r of the instrument (σ_I = r·|I|, for example 0.01); required unless --result gives it" };
        var noiseFloor = new Option<double?>("--noise-floor") { Description = "current noise floor in A (σ_I² = (r·I)² + floor²; points at or below 3× the floor are left out); default 0 or the result's" };
        var compliance = new Option<double?>("--compliance") { Description = "current compliance in A: points at compliance are left out, and no recommended sweep reaches it" };
        var from = new Option<double?>("--from") { Description = "proposed sweep: first bias in V (with --to and --points)" };
        var to = new Option<double?>("--to") { Description = "proposed sweep: last bias in V" };
        var points = new Option<int?>("--points") { Description = "proposed sweep: number of points (at least 5)" };
        var shape = new Option<string>("--sweep") { Description = "sweep shape of the proposed and the recommended sweeps: linear, positive or loop (as in simulate)", DefaultValueFactory = _ => "linear" };
        var biases = new Option<string?>("--biases") { Description = "proposed sweep as a list of biases in V, comma-separated (instead of --from/--to/--points)" };
        var maxBias = new Option<double?>("--max-bias") { Description = "largest |bias| in V a recommended sweep may reach" };
        var maxField = new Option<double?>("--max-field") { Description = "largest oxide field |V|/d in MV/cm a recommended sweep may reach (at the thinnest nominal thickness)" };
        var maxPoints = new Option<int?>("--max-points") { Description = "point budget of a recommended sweep (default: the proposed sweep's points, else 201)" };
        var target = new Option<string[]>("--target") { Description = "precision target: NAME=HALFWIDTH in the display unit, or NAME=P% relative (95 % half-width); repeatable. Without: best precision for the budget" };
        var rangePoints = new Option<int>("--range-points") { Description = "grid points per range of --barrier-height/--thickness LO:HI (2 … 9)", DefaultValueFactory = _ => 3 };
        var temperature = new Option<double?>("--temperature") { Description = "sample temperature in K: applies the thermal factor (default: none)" };
        var permittivity = new Option<double?>("--permittivity") { Description = "relative permittivity for image-force models (default 3.9)" };
        var plot = new Option<string?>("--plot") { Description = "write the predicted half-width against the largest bias, with the limits marked, as a PNG to this file" };
        var json = new Option<bool>("--json") { Description = "print one JSON object (predicted, recommended_sweep, …) and nothing else on standard output" };

        var command = new Command("plan", "Predict the uncertainties of a fit before measuring, and recommend a sweep within bias, field and compliance limits. Never drives an instrument.");
        foreach (var o in new Option[]
                 {
                     model, barrierHeight, thickness, area, asymmetry, massRatio, set, result, free, fix, noise, noiseFloor, compliance,
                     from, to, points, shape, biases, maxBias, maxField, maxPoints, target, rangePoints, temperature, permittivity, plot, json,
                 })
        {
            command.Options.Add(o);
        }

        command.SetAction(parse =>
        {
            FittedResultLine? fitted = null;
            if (parse.GetValue(result) is string resultPath)
            {
                try
                {
                    fitted = FitJsonLineReader.ReadFirst(resultPath);
                }
                catch (IvFormatException e)
                {
                    throw new UsageException($"--result: {e.Message}");
                }
            }
            string modelName = parse.GetResult(model) is { Implicit: false } || fitted is null ? parse.GetValue(model) ?? "simmons" : fitted.Model;
            if (string.Equals(modelName.Trim(), BarrierModelCatalog.Mos, StringComparison.OrdinalIgnoreCase) || string.Equals(modelName.Trim(), "auto", StringComparison.OrdinalIgnoreCase))
            {
                throw new UsageException($"--model: plan works with one barrier model ({string.Join(", ", ModelResolver.Names.Where(n => n != BarrierModelCatalog.Mos))}); '{modelName}' is not supported");
            }
            double? t = parse.GetValue(temperature);
            if (t is double tk && (!(tk >= 0) || !double.IsFinite(tk))) throw new UsageException($"--temperature: {tk} must be zero or positive");
            double? er = parse.GetValue(permittivity);
            if (er is double e1 && (!(e1 >= 1) || !double.IsFinite(e1))) throw new UsageException($"--permittivity: {e1} must be at least 1");
            var modelOptions = BarrierModelOptions.Default with { TemperatureK = t };
            if (er is double eps) modelOptions = modelOptions with { RelativePermittivity = eps };

            // Parasitic elements: named in --set, --free or --fix, or present in the fitted result.
            string[] setItems = parse.GetValue(set) ?? [];
            string[] freeNames = parse.GetValue(free) ?? [];
            string[] fixItems = parse.GetValue(fix) ?? [];
            var parasitics = ParasiticOptions.None;
            var named = setItems.Concat(fixItems).Select(s => s.Split('=')[0].Trim()).Concat(freeNames).Concat(fitted?.Parameters.Keys ?? []);
            foreach (string name in named)
            {
                foreach (var (def, enable) in FitOptionSet.ParasiticSwitches)
                {
                    if (string.Equals(name, def.Key, StringComparison.OrdinalIgnoreCase) || string.Equals(name, ParameterNames.CliName(def), StringComparison.OrdinalIgnoreCase))
                    {
                        parasitics = enable(parasitics);
                    }
                }
            }
            var junction = new JunctionCurrentModel(ModelResolver.Resolve(modelName, modelOptions), parasitics);
            var defs = junction.Parameters;
            var theta = new double[defs.Count];
            var isFree = new bool[defs.Count];
            for (int k = 0; k < defs.Count; k++)
            {
                theta[k] = defs[k].DefaultSi;
                isFree[k] = !defs[k].FixedByDefault;
            }
            foreach (int? idx in new[] { junction.VoltageOffsetIndex, junction.CurrentOffsetIndex }) if (idx is int k) theta[k] = 0.0;
            bool haveHeight = false, haveThickness = false, haveArea = false;
            if (fitted is not null)
            {
                foreach (var (key, value) in fitted.Parameters)
                {
                    int k = junction.IndexOf(key);
                    if (k < 0) continue;
                    theta[k] = defs[k].FromDisplay(value.Value);
                    isFree[k] = !value.Fixed;
                }
                haveHeight = fitted.Parameters.ContainsKey(StandardParameters.BarrierHeight.Key);
                haveThickness = fitted.Parameters.ContainsKey(StandardParameters.Thickness.Key);
                haveArea = fitted.Parameters.ContainsKey(StandardParameters.Area.Key);
            }
            var ranges = ImmutableDictionary.CreateBuilder<string, (double, double)>(StringComparer.Ordinal);
            void ValueOrRange(string? text, ParameterDefinition standard, string option, double siPerUnit, ref bool have)
            {
                if (text is null) return;
                var def = ParameterNames.Find(junction, standard.Key, option);
                int k = junction.IndexOf(def.Key);
                int colon = text.IndexOf(':', StringComparison.Ordinal);
                if (colon < 0)
                {
                    theta[k] = PositiveNumber(text, option) * siPerUnit;
                }
                else
                {
                    double lo = PositiveNumber(text[..colon], option) * siPerUnit, hi = PositiveNumber(text[(colon + 1)..], option) * siPerUnit;
                    if (!(lo < hi)) throw new UsageException($"{option}: LO must be below HI in '{text}'");
                    theta[k] = 0.5 * (lo + hi);
                    ranges[def.Key] = (lo, hi);
                }
                if (!(theta[k] > def.LowerSi && theta[k] <= def.UpperSi)) throw new UsageException($"{option}: '{text}' is outside the physical range of {ParameterNames.CliName(def)}");
                have = true;
            }
            ValueOrRange(parse.GetValue(barrierHeight), StandardParameters.BarrierHeight, "--barrier-height", PhysicalConstants.JoulePerElectronVolt, ref haveHeight);
            ValueOrRange(parse.GetValue(thickness), StandardParameters.Thickness, "--thickness", 1e-9, ref haveThickness);
            if (parse.GetValue(area) is string areaText)
            {
                theta[junction.AreaIndex] = QuantityParser.ParseAreaM2(areaText);
                isFree[junction.AreaIndex] = false; // as in fit: --area fixes the area
                haveArea = true;
            }
            if (!haveHeight && junction.IndexOf(StandardParameters.BarrierHeight.Key) >= 0) throw new UsageException("--barrier-height: the nominal barrier height is needed (or --result)");
            if (!haveThickness) throw new UsageException("--thickness: the nominal thickness is needed (or --result)");
            if (!haveArea) throw new UsageException("--area: the nominal area is needed (or --result); it is held fixed unless --free area");
            if (parse.GetValue(massRatio) is double mr)
            {
                if (!(mr > 0) || !double.IsFinite(mr)) throw new UsageException($"--mass-ratio: {mr} must be a positive number");
                theta[junction.IndexOf(ParameterNames.Find(junction, "mass_ratio", "--mass-ratio").Key)] = mr;
            }
            if (parse.GetValue(asymmetry) is double asym)
            {
                var def = ParameterNames.Find(junction, "asymmetry", "--asymmetry");
                theta[junction.IndexOf(def.Key)] = def.FromDisplay(asym);
            }
            foreach (string item in setItems)
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                if (eq <= 0) throw new UsageException($"--set: '{item}' must be NAME=VALUE");
                var def = ParameterNames.Find(junction, item[..eq].Trim(), "--set");
                theta[junction.IndexOf(def.Key)] = ParameterNames.ParseValueSi(def, item[(eq + 1)..].Trim(), "--set");
            }
            foreach (string item in fixItems)
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                var def = ParameterNames.Find(junction, (eq > 0 ? item[..eq] : item).Trim(), "--fix");
                int k = junction.IndexOf(def.Key);
                if (eq > 0) theta[k] = ParameterNames.ParseValueSi(def, item[(eq + 1)..].Trim(), "--fix");
                isFree[k] = false;
            }
            foreach (string name in freeNames) isFree[junction.IndexOf(ParameterNames.Find(junction, name.Trim(), "--free").Key)] = true;
            foreach (var key in ranges.Keys)
            {
                if (!isFree[junction.IndexOf(key)]) throw new UsageException($"--{ParameterNames.CliName(defs[junction.IndexOf(key)])}: a range needs the parameter free in the planned fit");
            }

            double r = parse.GetValue(noise) ?? fitted?.RelativeNoise
                       ?? throw new UsageException("--noise: the relative current noise is needed (for example 0.01 for 1 %), or a --result that states it");
            if (!(r > 0) || !double.IsFinite(r)) throw new UsageException($"--noise: {r} must be a positive number");
            double floor = parse.GetValue(noiseFloor) ?? fitted?.NoiseFloorA ?? 0.0;
            if (!(floor >= 0) || !double.IsFinite(floor)) throw new UsageException($"--noise-floor: {floor} must be zero or positive");
            double? comp = parse.GetValue(compliance);
            if (comp is double cp && (!(cp > 0) || !double.IsFinite(cp))) throw new UsageException($"--compliance: {cp} must be a positive number of ampere");

            var freeKeys = new List<string>();
            for (int k = 0; k < defs.Count; k++) if (isFree[k]) freeKeys.Add(defs[k].Key);
            if (freeKeys.Count == 0) throw new UsageException("--fix: every parameter is fixed; leave at least one free");
            PlanningSetup setup;
            try
            {
                setup = new PlanningSetup(junction, theta, freeKeys, r) { NoiseFloorA = floor, ComplianceA = comp };
            }
            catch (ArgumentException ex)
            {
                throw new UsageException($"plan: {UsageException.WithoutParameterName(ex.Message)}");
            }

            // The proposed sweep and the family of the recommended sweeps.
            string shapeText = (parse.GetValue(shape) ?? "linear").Trim().ToLowerInvariant();
            var simShape = shapeText switch
            {
                "linear" => SweepShape.Linear,
                "positive" => SweepShape.PositiveOnly,
                "loop" => SweepShape.Loop,
                _ => throw new UsageException($"--sweep: unknown shape '{shapeText}'; choose linear, positive or loop"),
            };
            double[]? proposedV = null;
            ProposedSweepInfo? proposedInfo = null;
            double? f0 = parse.GetValue(from), t0 = parse.GetValue(to);
            int? n0 = parse.GetValue(points);
            string? list = parse.GetValue(biases);
            if (list is not null)
            {
                if (f0 is not null || t0 is not null || n0 is not null) throw new UsageException("--biases: give either a list of biases or --from/--to/--points, not both");
                proposedV = [.. list.Split(',', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries).Select(s => QuantityParser.ParseNumber("--biases", s))];
                if (proposedV.Length < 5) throw new UsageException($"--biases: {proposedV.Length} biases given; at least 5 are needed");
                proposedInfo = new ProposedSweepInfo(proposedV[0], proposedV[^1], proposedV.Length, "list");
            }
            else if (f0 is not null || t0 is not null || n0 is not null)
            {
                if (f0 is not double fv || t0 is not double tv || n0 is not int nv) throw new UsageException("--from, --to and --points: give all three for a proposed sweep");
                if (nv < 5 || nv > 100_000) throw new UsageException($"--points: {nv} must be between 5 and 100000");
                if (!double.IsFinite(fv) || !double.IsFinite(tv) || fv == tv) throw new UsageException("--from/--to: the sweep needs two different finite biases");
                try
                {
                    proposedV = IvSimulator.SweepVoltages(new SimulationSpec(fv, tv, nv) { Shape = simShape });
                }
                catch (ArgumentException ex)
                {
                    throw new UsageException($"--sweep: {UsageException.WithoutParameterName(ex.Message)}");
                }
                proposedInfo = new ProposedSweepInfo(fv, tv, nv, shapeText);
            }
            SweepFamily family = simShape switch
            {
                SweepShape.Loop => SweepFamily.Loop,
                SweepShape.PositiveOnly => SweepFamily.PositiveOnly,
                _ when proposedV is not null && proposedV.All(v => v >= 0) => SweepFamily.PositiveOnly,
                _ when proposedV is not null && proposedV.All(v => v <= 0) => SweepFamily.NegativeOnly,
                _ => SweepFamily.BothPolarities,
            };

            double? mb = parse.GetValue(maxBias), mf = parse.GetValue(maxField);
            if (mb is double b && (!(b > 0) || !double.IsFinite(b))) throw new UsageException($"--max-bias: {b} must be a positive number of volts");
            if (mf is double f && (!(f > 0) || !double.IsFinite(f))) throw new UsageException($"--max-field: {f} must be a positive number of MV/cm");
            if (proposedV is null && mb is null && mf is null) throw new UsageException("plan: give a proposed sweep (--from/--to/--points or --biases), a limit for a recommendation (--max-bias, --max-field), or both");
            int budget = parse.GetValue(maxPoints) ?? proposedV?.Length ?? 201;
            if (budget < 5 || budget > 100_000) throw new UsageException($"--max-points: {budget} must be between 5 and 100000");
            int perRange = parse.GetValue(rangePoints);
            if (perRange < 2 || perRange > 9) throw new UsageException($"--range-points: {perRange} must be between 2 and 9");

            var targets = ImmutableArray.CreateBuilder<PrecisionTarget>();
            foreach (string item in parse.GetValue(target) ?? [])
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                if (eq <= 0) throw new UsageException($"--target: '{item}' must be NAME=HALFWIDTH or NAME=P%");
                var def = ParameterNames.Find(junction, item[..eq].Trim(), "--target");
                if (!isFree[junction.IndexOf(def.Key)]) throw new UsageException($"--target: {ParameterNames.CliName(def)} is fixed in the planned fit; a target needs it free");
                string valueText = item[(eq + 1)..].Trim();
                bool relative = valueText.EndsWith('%');
                double value = relative
                    ? QuantityParser.ParseNumber("--target", valueText[..^1]) / 100.0
                    : def.Key == StandardParameters.Area.Key ? QuantityParser.ParseAreaM2(valueText) : QuantityParser.ParseNumber("--target", valueText);
                if (!(value > 0)) throw new UsageException($"--target: '{item}' must be a positive half-width");
                targets.Add(new PrecisionTarget(def.Key, value, relative));
            }
            string? plotPath = parse.GetValue(plot);
            if (plotPath is not null && mb is null && mf is null) throw new UsageException("--plot: the plot shows the recommendation's bias scan; give --max-bias or --max-field");

            var request = new PlanRequest(setup)
            {
                Ranges = ranges.ToImmutable(),
                RangePoints = perRange,
                ProposedVoltagesV = proposedV is null ? null : ImmutableArray.Create(proposedV),
                Family = family,
                MaxBiasV = mb,
                MaxFieldVPerM = mf is double mfv ? mfv * 1e8 : null, // 1 MV/cm = 10⁶ V / 10⁻² m = 10⁸ V/m
                MaxPoints = budget,
                Targets = targets.ToImmutable(),
            };
            MeasurementPlan plan;
            try
            {
                plan = MeasurementPlanner.Plan(request);
            }
            catch (ArgumentException ex)
            {
                throw new UsageException($"plan: {UsageException.WithoutParameterName(ex.Message)}");
            }
            if (plotPath is not null && !plan.Scan.IsDefaultOrEmpty) PlanPlotRenderer.WritePng(plan, request, plotPath);
            context.Out.Write(parse.GetValue(json) ? PlanFormatter.Json(plan, request, proposedInfo) + "\n" : PlanFormatter.Text(plan, request, proposedInfo));
            if (fitted is not null && !parse.GetValue(json))
            {
                context.Error.WriteLine($"junctionfit plan: started from {fitted.Path}:{fitted.Line.ToString(Inv)}{(fitted.SourceFile is string sf ? $" ({sf})" : "")}");
            }
            if (plotPath is not null && plan.Scan.IsDefaultOrEmpty) context.Error.WriteLine("junctionfit plan: no plot written: the limits leave no bias to scan");

            // 0: the planned sweep identifies the parameters (and meets every target); 1: it does not, or nothing fits the limits.
            bool proposedOk = plan.Proposed is not { } pp || pp.IsIdentifiable;
            bool recommendationOk = (mb is null && mf is null) || plan.Recommendation is { MeetsTargets: true, Prediction.IsIdentifiable: true };
            return proposedOk && recommendationOk ? ExitCodes.Success : ExitCodes.SomeFailed;
        });
        return command;
    }

    private static double PositiveNumber(string text, string option)
    {
        double v = QuantityParser.ParseNumber(option, text.Trim());
        if (!(v > 0)) throw new UsageException($"{option}: '{text}' must be a positive number");
        return v;
    }
}
