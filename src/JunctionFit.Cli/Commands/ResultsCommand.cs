using System.CommandLine;
using JunctionFit.Cli.Support;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary><c>junctionfit results --db DB [--lot L] [--csv|--json]</c>: export stored results.</summary>
internal static class ResultsCommand
{
    public static Command Create(CliContext context)
    {
        var db = new Option<string>("--db") { Description = "results database: a SQLite file or a PostgreSQL connection string", Required = true };
        var lot = new Option<string?>("--lot") { Description = "only this lot" };
        var wafer = new Option<string?>("--wafer") { Description = "only this wafer" };
        var model = new Option<string?>("--model") { Description = "only results of this model (as stored: simmons, …, or auto)" };
        var csv = new Option<bool>("--csv") { Description = "CSV with the columns of results.csv (the default)" };
        var json = new Option<bool>("--json") { Description = "one JSON object per result and line" };
        var command = new Command("results", "Export stored results (the columns of results.csv, or JSON lines).");
        foreach (var o in new Option[] { db, lot, wafer, model, csv, json }) command.Options.Add(o);
        command.SetAction(parse =>
        {
            if (parse.GetValue(csv) && parse.GetValue(json)) throw new UsageException("results: choose --csv or --json, not both");
            using var store = ResultDatabases.OpenExisting(parse.GetValue(db)!);
            var rows = store.Query(lot: parse.GetValue(lot), wafer: parse.GetValue(wafer), model: parse.GetValue(model));
            if (parse.GetValue(json)) StoredResultsWriter.WriteJsonLines(context.Out, rows);
            else StoredResultsWriter.WriteCsv(context.Out, rows);
            var sets = OptionSets.Of(rows.Select(r => r.ToRow()));
            context.Error.WriteLine($"junctionfit results: {rows.Count} result(s) from {store.Description}" +
                                    (sets.Length > 1 ? $" in {sets.Length} option sets (column option_set):{OptionSetChoice.List(sets)}" : ""));
            return ExitCodes.Success;
        });
        return command;
    }
}
