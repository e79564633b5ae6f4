using System.CommandLine;
using System.Globalization;
using System.Text;
using JunctionFit.Cli.Support;
using JunctionFit.Physics;

namespace JunctionFit.Cli.Commands;

/// <summary><c>junctionfit simulate</c>: write a synthetic I–V sweep as CSV <c>Voltage (V),Current (A)</c> to standard output.</summary>
internal static class SimulateCommand
{
    public static Command Create(CliContext context)
    {
        var model = new Option<string>("--model") { Description = "barrier model: " + string.Join(", ", ModelResolver.Names), DefaultValueFactory = _ => "simmons" };
        var barrierHeight = new Option<double?>("--barrier-height") { Description = "barrier height φ in eV", Required = true };
        var thickness = new Option<double?>("--thickness") { Description = "barrier thickness d in nm", Required = true };
        var area = new Option<string>("--area") { Description = "effective area (bare number: µm²; suffixes um2, m2, cm2, nm2)", Required = true };
        var asymmetry = new Option<double?>("--asymmetry") { Description = "barrier asymmetry Δφ in eV (models with an asymmetry parameter)" };
        var massRatio = new Option<double>("--mass-ratio") { Description = "effective mass ratio m*/mₑ (--model mos: the model's oxide mass, 0.40 for electrons, unless given)", DefaultValueFactory = _ => 1.0 };
        var set = new Option<string[]>("--set") { Description = "any other model parameter: NAME=VALUE in its display unit; repeatable" };
        var from = new Option<double>("--from") { Description = "first bias in V", Required = true };
        var to = new Option<double>("--to") { Description = "last bias in V", Required = true };
        var points = new Option<int>("--points") { Description = "number of points (at least 2)", Required = true };
        var noise = new Option<double>("--noise") { Description = "relative Gaussian current noise r (σ = r·|I|); default 0 (noise-free)", DefaultValueFactory = _ => 0.0 };
        var noiseFloor = new Option<double>("--noise-floor") { Description = "absolute Gaussian current noise in A; default 0", DefaultValueFactory = _ => 0.0 };
        var seed = new Option<int>("--seed") { Description = "seed of the noise generator", DefaultValueFactory = _ => 1 };
        var temperature = new Option<double?>("--temperature") { Description = "sample temperature in K: applies the thermal factor (default: none, the zero-temperature form)" };
        var permittivity = new Option<double?>("--permittivity") { Description = "relative permittivity for image-force models (default 3.9)" };
        var shape = new Option<string>("--sweep") { Description = "sweep shape: linear (from → to), positive (from → to, both at or above 0), loop (0 → +V → −V → 0 with V = max(|from|, |to|))", DefaultValueFactory = _ => "linear" };
        var header = new Option<string[]>("--header") { Description = "write a '# key: value' line before the table (for example lot=KM-A01); repeatable" };

        var command = new Command("simulate", "Write a simulated I–V sweep (CSV: Voltage (V),Current (A)) to standard output.");
        foreach (var o in new Option[] { model, barrierHeight, thickness, area, asymmetry, massRatio, set, from, to, points, noise, noiseFloor, seed, header, temperature, permittivity, shape })
        {
            command.Options.Add(o);
        }
        command.SetAction(parse =>
        {
            double? t = parse.GetValue(temperature);
            if (t is double tk && (!(tk >= 0) || !double.IsFinite(tk))) throw new UsageException($"--temperature: {tk} must be zero or positive");
            double? er = parse.GetValue(permittivity);
            if (er is double e && (!(e >= 1) || !double.IsFinite(e))) throw new UsageException($"--permittivity: {e} must be at least 1");
            var modelOptions = BarrierModelOptions.Default with { TemperatureK = t };
            if (er is double eps) modelOptions = modelOptions with { RelativePermittivity = eps };
            var parasitics = ParasiticOptions.None;
            foreach (string item in parse.GetValue(set) ?? [])
            {
                string name = item.Split('=')[0].Trim();
                foreach (var (def, enable) in FitOptionSet.ParasiticSwitches)
                {
                    if (string.Equals(name, def.Key, StringComparison.OrdinalIgnoreCase) ||
                        string.Equals(name, ParameterNames.CliName(def), StringComparison.OrdinalIgnoreCase)) parasitics = enable(parasitics);
                }
            }
            var junction = new JunctionCurrentModel(ModelResolver.Resolve(parse.GetValue(model) ?? "simmons", modelOptions), parasitics);
            var theta = new double[junction.Parameters.Count];
            for (int k = 0; k < theta.Length; k++) theta[k] = junction.Parameters[k].DefaultSi;
            // Parasitic elements named with --set start from "absent", not from their fit start values.
            foreach (int? idx in new[] { junction.SeriesResistanceIndex, junction.LeakageConductanceIndex, junction.VoltageOffsetIndex, junction.CurrentOffsetIndex })
            {
                if (idx is int k) theta[k] = 0.0;
            }
            void Set(ParameterKey key, double si, string option)
            {
                int k = junction.IndexOf(ParameterNames.Find(junction, key.Name, option).Id);
                theta[k] = si;
            }
            Set(ParameterKey.BarrierHeight, ParameterKey.BarrierHeight.FromDisplay(Positive(parse.GetValue(barrierHeight), "--barrier-height")), "--barrier-height");
            Set(ParameterKey.Thickness, ParameterKey.Thickness.FromDisplay(Positive(parse.GetValue(thickness), "--thickness")), "--thickness");
            Set(ParameterKey.Area, QuantityParser.ParseAreaM2(parse.GetValue(area) ?? "", "--area"), "--area");
            double mr = parse.GetValue(massRatio);
            // The mos model has its own oxide masses (electrons 0.40, holes 0.32), as in fit: --mass-ratio applies only when given.
            bool massGiven = !junction.Barrier.Name.Equals("mos", StringComparison.OrdinalIgnoreCase) || parse.GetResult(massRatio) is { Implicit: false };
            if (junction.IndexOf(ParameterKey.MassRatio) >= 0 && massGiven) Set(ParameterKey.MassRatio, Positive(mr, "--mass-ratio"), "--mass-ratio");
            if (parse.GetValue(asymmetry) is double asym)
            {
                var def = ParameterNames.Find(junction, "asymmetry", "--asymmetry");
                theta[junction.IndexOf(def.Key)] = def.FromDisplay(asym);
            }
            foreach (string item in parse.GetValue(set) ?? [])
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                if (eq <= 0) throw new UsageException($"--set: '{item}' must be NAME=VALUE");
                var def = ParameterNames.Find(junction, item[..eq].Trim(), "--set");
                theta[junction.IndexOf(def.Key)] = ParameterNames.ParseValueSi(def, item[(eq + 1)..].Trim(), "--set");
            }
            int n = parse.GetValue(points);
            if (n < 2 || n > 10_000_000) throw new UsageException($"--points: {n} must be between 2 and 10000000");
            double r = parse.GetValue(noise), floor = parse.GetValue(noiseFloor);
            if (!(r >= 0) || !double.IsFinite(r)) throw new UsageException($"--noise: {r} must be zero or positive");
            if (!(floor >= 0) || !double.IsFinite(floor)) throw new UsageException($"--noise-floor: {floor} must be zero or positive");
            var spec = new SimulationSpec(parse.GetValue(from), parse.GetValue(to), n)
            {
                RelativeNoise = r,
                NoiseFloorA = floor,
                Seed = parse.GetValue(seed),
                Shape = (parse.GetValue(shape) ?? "linear").ToLowerInvariant() switch
                {
                    "linear" => SweepShape.Linear,
                    "positive" => SweepShape.PositiveOnly,
                    "loop" => SweepShape.Loop,
                    var other => throw new UsageException($"--sweep: unknown shape '{other}'; choose linear, positive or loop"),
                },
            };
            (System.Collections.Immutable.ImmutableArray<double> v, System.Collections.Immutable.ImmutableArray<double> i) sweep;
            try
            {
                sweep = IvSimulator.Simulate(junction, theta, spec);
            }
            catch (ArgumentException ex)
            {
                throw new UsageException($"simulate: {UsageException.WithoutParameterName(ex.Message)}");
            }
            var (v, i) = sweep;
            for (int k = 0; k < junction.Parameters.Count; k++)
            {
                var def = junction.Parameters[k];
                if (theta[k] > def.UpperSi || theta[k] < def.LowerSi)
                {
                    context.Error.WriteLine($"junctionfit simulate: warning: {ParameterNames.CliName(def)} = {def.ToDisplay(theta[k]):G4} {def.DisplayUnit} is outside the range the fitter accepts");
                }
            }
            var text = new StringBuilder(64 * n);
            foreach (string item in parse.GetValue(header) ?? [])
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                if (eq <= 0) throw new UsageException($"--header: '{item}' must be KEY=VALUE");
                text.Append("# ").Append(item[..eq].Trim()).Append(": ").Append(item[(eq + 1)..].Trim()).Append('\n');
            }
            text.Append("Voltage (V),Current (A)\n");
            for (int k = 0; k < n; k++)
            {
                // Voltages at 12 significant digits: the sweep's own floating-point steps (0.6000000000000001) are noise.
                text.Append(v[k].ToString("G12", CultureInfo.InvariantCulture)).Append(',')
                    .Append(i[k].ToString("R", CultureInfo.InvariantCulture)).Append('\n');
            }
            context.Out.Write(text.ToString());
            return ExitCodes.Success;
        });
        return command;
    }

    private static double Positive(double? value, string option)
    {
        if (value is not double v || !(v > 0) || !double.IsFinite(v)) throw new UsageException($"{option}: must be a positive number");
        return v;
    }
}
