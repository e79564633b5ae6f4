using System.CommandLine;
using System.Text.Json.Nodes;
using JunctionFit.Cli.Support;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Cli.Commands;

/// <summary>
/// <c>junctionfit temperature-series FILE...</c>: curves of one device at several temperatures, fitted jointly with shared
/// barrier parameters and each curve's thermal factor, plus the Arrhenius check of the conduction mechanism.
/// </summary>
internal static class TemperatureSeriesCommand
{
    public static Command Create(CliContext context)
    {
        var files = new Argument<string[]>("FILE") { Description = "I–V files of one device, each stating its temperature", Arity = ArgumentArity.OneOrMore };
        var json = new Option<bool>("--json") { Description = "print the joint fit as one JSON line (with an 'arrhenius' object)" };
        var fitOptions = new FitOptionSet();
        var read = new ReadOptionSet();
        var command = new Command("temperature-series", "Fit curves of one device at several temperatures jointly and check the temperature dependence.");
        command.Arguments.Add(files);
        command.Options.Add(json);
        fitOptions.AddTo(command);
        read.AddTo(command);
        command.SetAction(parse =>
        {
            var (plan, _) = fitOptions.Build(parse);
            if (plan.ModelNames.Count != 1) throw new UsageException("temperature-series: choose one --model (not auto)");
            var readOptions = read.Build(parse);
            if (plan.ModelOptions.TemperatureK is not null)
            {
                throw new UsageException("temperature-series: each file states its own temperature; --temperature would give them all the same one");
            }
            var curves = new List<IvCurve>();
            bool bad = false;
            foreach (string f in parse.GetValue(files) ?? [])
            {
                try
                {
                    var c = IvFileReader.ReadFile(f, readOptions);
                    if (c.TemperatureK is null)
                    {
                        context.Error.WriteLine($"{f}:0: the file states no temperature (add a 'temperature: 300 K' line)");
                        bad = true;
                        continue;
                    }
                    curves.Add(c);
                }
                catch (IvFormatException e)
                {
                    context.Error.WriteLine(e.Message);
                    bad = true;
                }
            }
            if (bad) return ExitCodes.UsageOrInput;
            if (curves.Select(c => c.TemperatureK).Distinct().Count() < 2)
            {
                context.Error.WriteLine("junctionfit temperature-series: the files need at least two different temperatures");
                return ExitCodes.UsageOrInput;
            }
            var series = JointTemperatureFit.Fit(curves, plan);
            if (parse.GetValue(json))
            {
                var node = JsonNode.Parse(FitJsonFormatter.Format(series.Joint))!.AsObject();
                node["temperatures_K"] = new JsonArray([.. series.TemperaturesK.Select(t => (JsonNode?)JsonValue.Create(t))]);
                if (series.Arrhenius is { } a)
                {
                    node["arrhenius"] = new JsonObject
                    {
                        ["reference_bias_V"] = series.ReferenceBiasV,
                        ["activation_energy_eV"] = a.ActivationEnergyEv,
                        ["r_squared"] = a.RSquared,
                        ["current_ratio"] = a.CurrentRatio,
                        ["direct_tunnelling"] = a.IsDirectTunnelling,
                        ["verdict"] = a.Message,
                    };
                }
                context.Out.WriteLine(node.ToJsonString());
            }
            else
            {
                context.Out.WriteLine("each curve alone:");
                context.Out.Write(SummaryTableWriter.FormatConsoleTable(series.PerCurve));
                context.Out.WriteLine();
                context.Out.WriteLine($"joint fit over {series.TemperaturesK.Length} temperatures ({string.Join(", ", series.TemperaturesK.Select(t => $"{t:0.#} K"))}): status {ResultSchema.StatusText(series.Joint.Status)}");
                foreach (var p in series.Joint.Parameters)
                {
                    string ci = p.Lower95 is double lo && p.Upper95 is double hi ? $" [{lo:G5}, {hi:G5}]" : p.IsFixed ? " (fixed)" : "";
                    context.Out.WriteLine($"  {p.Key,-22} {p.Value:G6}{ci}");
                }
                foreach (string w in series.Joint.Warnings) context.Out.WriteLine($"  warning: {w}");
                if (series.Arrhenius is { } a)
                {
                    context.Out.WriteLine($"Arrhenius at {series.ReferenceBiasV:0.###} V: E_a = {a.ActivationEnergyEv * 1000:0.#} meV, current ratio {a.CurrentRatio:0.###}: {a.Message}");
                }
            }
            return series.Joint.Status == FitStatus.Ok ? ExitCodes.Success : ExitCodes.SomeFailed;
        });
        return command;
    }
}
