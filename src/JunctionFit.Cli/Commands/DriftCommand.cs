using System.Collections.Immutable;
using System.CommandLine;
using System.Globalization;
using JunctionFit.Batch;
using JunctionFit.Cli.Support;
using JunctionFit.Import;
using JunctionFit.Results;
using JunctionFit.Lots;
using JunctionFit.Reporting;
using JunctionFit.Storage;

namespace JunctionFit.Cli.Commands;

/// <summary><c>junctionfit drift RESULTS.csv... --reference LOT</c>: lot-to-lot shift of every parameter against a reference lot.</summary>
internal static class DriftCommand
{
    public static Command Create(CliContext context)
    {
        var files = new Argument<string[]>("RESULTS") { Description = "results.csv files written by batch (or --db)", Arity = ArgumentArity.ZeroOrMore };
        var db = new Option<string?>("--db") { Description = "read the results from this database (SQLite file or PostgreSQL connection string) instead of, or as well as, CSV files" };
        var lotFilter = new Option<string[]>("--lot") { Description = "with --db: only these lots (repeatable); default all" };
        var reference = new Option<string[]>("--reference") { Description = "reference lot(s); repeatable", Required = true };
        var json = new Option<bool>("--json") { Description = "one JSON object per lot and parameter, one per line" };
        var outDir = new Option<string?>("--out") { Description = "folder for the trend charts (default: beside the first results file; required with only --db)" };
        var threshold = new Option<string[]>("--threshold") { Description = "practical threshold KEY=VALUE (absolute, in the key's unit) or KEY=N% (relative); repeatable" };
        var alpha = new Option<double>("--alpha") { Description = "family-wise significance level (Holm)", DefaultValueFactory = _ => 0.05 };
        var minDies = new Option<int>("--min-dies") { Description = "good dies a lot needs to be compared", DefaultValueFactory = _ => 3 };
        var optionSet = OptionSetChoice.CreateOption();
        var command = new Command("drift", "Shift of each lot against a reference lot: Welch interval, Holm-corrected p-value, flag, trend charts.");
        command.Arguments.Add(files);
        foreach (var o in new Option[] { reference, json, outDir, threshold, alpha, minDies, db, lotFilter, optionSet }) command.Options.Add(o);
        command.SetAction(parse =>
        {
            var paths = parse.GetValue(files) ?? [];
            string? database = parse.GetValue(db);
            if (paths.Length == 0 && database is null) throw new UsageException("drift: give results.csv files or --db");
            if (paths.Length == 0 && parse.GetValue(outDir) is null)
            {
                throw new UsageException("drift --db: give --out DIR for the trend charts (with only a database there is no results file to put them beside)");
            }
            var rows = ReadResults(context, paths);
            if (rows is null) return ExitCodes.UsageOrInput;
            if (database is not null) rows = rows.Value.AddRange(ReadDatabase(database, parse.GetValue(lotFilter) ?? []));
            var pooled = OptionSetChoice.Pool("drift", rows.Value, parse.GetValue(optionSet));
            var options = new DriftOptions(parse.GetValue(reference) ?? []);
            try
            {
                options = options with { Alpha = parse.GetValue(alpha) };
            }
            catch (ArgumentOutOfRangeException e)
            {
                throw UsageException.ForOption("--alpha", e);
            }
            try
            {
                options = options with { MinimumGoodDies = parse.GetValue(minDies) };
            }
            catch (ArgumentOutOfRangeException e)
            {
                throw UsageException.ForOption("--min-dies", e);
            }
            var thresholds = options.Thresholds;
            foreach (string item in parse.GetValue(threshold) ?? [])
            {
                int eq = item.IndexOf('=', StringComparison.Ordinal);
                if (eq <= 0) throw new UsageException($"--threshold: '{item}' must be KEY=VALUE or KEY=N%");
                string key = item[..eq].Trim(), value = item[(eq + 1)..].Trim();
                bool relative = value.EndsWith('%');
                double x = QuantityParser.ParseNumber("--threshold", relative ? value[..^1] : value);
                if (!(x >= 0)) throw new UsageException($"--threshold: {item}: must not be negative");
                thresholds = thresholds.SetItem(key, relative ? PracticalThreshold.Relative(x / 100.0) : PracticalThreshold.Absolute(x));
            }
            options = options with { Thresholds = thresholds };
            string dir = parse.GetValue(outDir) ?? (paths.Length > 0 ? Path.GetDirectoryName(Path.GetFullPath(paths[0]))! : Directory.GetCurrentDirectory());
            var (result, _, charts) = LotAnalysisRun.Drift(pooled, options, dir);
            if (parse.GetValue(json))
            {
                foreach (var r in result.Rows) context.Out.WriteLine(LotsJsonFormatter.FormatDrift(r));
            }
            else
            {
                context.Out.WriteLine($"{"lot",-12} {"parameter",-22} {"n",4} {"shift",12} {"95 % interval",26} {"p (Holm)",10} {"flag",8}  note");
                foreach (var r in result.Rows)
                {
                    string ci = r.Lower95 is double lo && r.Upper95 is double hi ? $"[{LotAnalyses.Num(lo)}, {LotAnalyses.Num(hi)}]" : "";
                    string p = r.PValueHolm is double pv ? pv.ToString("G3", CultureInfo.InvariantCulture) : "";
                    context.Out.WriteLine($"{r.Lot,-12} {r.Key,-22} {r.N,4} {LotAnalyses.Num(r.Shift),12} {ci,26} {p,10} {(r.Flagged ? "FLAGGED" : "-"),8}  {r.Reason}");
                }
            }
            context.Error.WriteLine($"junctionfit drift: {result.Flagged.Count()} flagged; trend charts: {string.Join(", ", charts)}");
            bool insufficient = result.Rows.Any(r => r.Reason is not null);
            return insufficient ? ExitCodes.SomeFailed : ExitCodes.Success;
        });
        return command;
    }

    /// <summary>Rows stored in a results database (all lots, or the given ones).</summary>
    internal static IEnumerable<ResultRow> ReadDatabase(string database, IReadOnlyList<string> lots)
    {
        using var store = ResultDatabases.OpenExisting(database);
        var stored = lots.Count == 0 ? store.Query() : lots.SelectMany(l => store.Query(lot: l)).ToList();
        return stored.Select(r => r.ToRow()).ToList();
    }

    /// <summary>Reads results files; prints <c>path:line: reason</c> and returns null when one cannot be read.</summary>
    internal static ImmutableArray<ResultRow>? ReadResults(CliContext context, IReadOnlyList<string> paths)
    {
        var all = ImmutableArray.CreateBuilder<ResultRow>();
        bool ok = true;
        foreach (string path in paths)
        {
            try
            {
                all.AddRange(ResultsCsv.Read(path));
            }
            catch (ResultsFormatException e)
            {
                context.Error.WriteLine(e.Message);
                ok = false;
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                context.Error.WriteLine($"{path}:0: cannot read: {e.Message}");
                ok = false;
            }
        }
        return ok ? all.ToImmutable() : null;
    }
}

/// <summary><c>junctionfit thickness RESULTS.csv ELLIPSOMETRY.csv</c>: electrical against ellipsometric thickness.</summary>
internal static class ThicknessCommand
{
    public static Command Create(CliContext context)
    {
        var inputs = new Argument<string[]>("RESULTS_AND_ELLIPSOMETRY")
        {
            Description = "results.csv written by batch (omit with --db), then the ellipsometry table: lot,wafer,thickness_nm (per wafer) or with die_x,die_y (per site)",
            Arity = new ArgumentArity(1, 2),
        };
        var db = new Option<string?>("--db") { Description = "read the results from this database instead of a results.csv" };
        var json = new Option<bool>("--json") { Description = "print the comparison as one JSON object" };
        var outDir = new Option<string?>("--out") { Description = "folder for the Bland–Altman plot (default: beside the results file; required with --db)" };
        var jobs = new Option<int?>("--jobs") { Description = "parallel refits (default: the number of cores)" };
        var tolerance = new Option<double>("--tolerance") { Description = "practical tolerance in nm on |electrical - ellipsometric| for flagging a wafer", DefaultValueFactory = _ => LotAnalyses.DefaultThicknessToleranceNm };
        var cv = new Option<string[]>("--cv")
        {
            Description = "C-V files (or folders of them) of the wafers' capacitor test structures: adds CET = eps_ox*A/C_max per wafer beside t_ox and ellipsometry; " +
                          "each file is placed by its '# lot:' / '# wafer:' lines or --path-pattern; repeatable",
        };
        var cvArea = new Option<string?>("--cv-area") { Description = "with --cv: area of the C-V capacitors (bare number: µm²; suffixes um2, m2, cm2, nm2); default: each file's 'area' metadata" };
        var cetRange = new Option<string?>("--cet-range")
        {
            Description = $"with --cv: plausible CET - t_ox in nm, LO:HI; a wafer outside it is flagged (default {CetCrossCheck.DefaultLowerNm.ToString(CultureInfo.InvariantCulture)}:{CetCrossCheck.DefaultUpperNm.ToString(CultureInfo.InvariantCulture)})",
        };
        var optionSet = OptionSetChoice.CreateOption();
        var fitOptions = new FitOptionSet();
        var read = new ReadOptionSet();
        var command = new Command("thickness", "Electrical minus ellipsometric thickness: bias, limits of agreement, per-wafer refit with d fixed (F-test). Give the batch's fit options.");
        command.Arguments.Add(inputs);
        command.Options.Add(db);
        command.Options.Add(json);
        command.Options.Add(outDir);
        command.Options.Add(jobs);
        command.Options.Add(tolerance);
        command.Options.Add(cv);
        command.Options.Add(cvArea);
        command.Options.Add(cetRange);
        command.Options.Add(optionSet);
        fitOptions.AddTo(command);
        read.AddTo(command);
        command.SetAction(parse =>
        {
            var given = parse.GetValue(inputs) ?? [];
            string? database = parse.GetValue(db);
            if ((database is null && given.Length != 2) || (database is not null && given.Length != 1))
            {
                throw new UsageException("thickness: give RESULTS.csv ELLIPSOMETRY.csv, or --db DB ELLIPSOMETRY.csv");
            }
            string ellipsometryPath = given[^1];
            if (database is not null && parse.GetValue(outDir) is null)
            {
                throw new UsageException("thickness --db: give --out DIR for the Bland–Altman plot (with only a database there is no results file to put it beside)");
            }
            string resultsPath = database is null ? given[0] : Path.Combine(Directory.GetCurrentDirectory(), "results.csv");
            var read0 = database is null
                ? DriftCommand.ReadResults(context, [resultsPath])
                : [.. DriftCommand.ReadDatabase(database, [])];
            if (read0 is null) return ExitCodes.UsageOrInput;
            ImmutableArray<ResultRow>? rows = [.. OptionSetChoice.Pool("thickness", read0.Value, parse.GetValue(optionSet))];
            ImmutableArray<EllipsometryRow> ell;
            try
            {
                ell = EllipsometryCsv.Read(ellipsometryPath);
            }
            catch (ResultsFormatException e)
            {
                context.Error.WriteLine(e.Message);
                return ExitCodes.UsageOrInput;
            }
            catch (Exception e) when (e is IOException or UnauthorizedAccessException)
            {
                context.Error.WriteLine($"{ellipsometryPath}:0: cannot read: {e.Message}");
                return ExitCodes.UsageOrInput;
            }
            var (plan, _) = fitOptions.Build(parse);
            var readOptions = read.Build(parse);
            var cvPaths = parse.GetValue(cv) ?? [];
            if (cvPaths.Length == 0 && (parse.GetValue(cvArea) is not null || parse.GetValue(cetRange) is not null))
            {
                throw new UsageException("--cv-area and --cet-range need --cv FILE");
            }
            var (cetLow, cetHigh) = ParseCetRange(parse.GetValue(cetRange));
            List<CetMeasurement>? cetMeasurements = null;
            if (cvPaths.Length > 0)
            {
                double? area = parse.GetValue(cvArea) is string areaText ? QuantityParser.ParseAreaM2(areaText, "--cv-area") : null;
                cetMeasurements = LotAnalysisRun.ReadCet(context, cvPaths, readOptions.PathPattern, area, plan.ModelOptions.Mos.OxidePermittivity);
                if (cetMeasurements is null) return ExitCodes.UsageOrInput;
            }
            string dir = parse.GetValue(outDir) ?? Path.GetDirectoryName(Path.GetFullPath(resultsPath))!;
            var (comparison, wafers, _, plot, refitFailures) = LotAnalyses.Thickness(rows.Value, ell, plan, readOptions, dir, parse.GetValue(jobs) ?? Environment.ProcessorCount, parse.GetValue(tolerance));
            CetCrossCheckResult? cetCheck = null;
            string? cetCsv = null;
            if (cetMeasurements is not null)
            {
                (cetCheck, _) = LotAnalysisRun.CetCheck(rows.Value, ell, cetMeasurements, wafers, cetLow, cetHigh, plan.ModelOptions.Mos.OxidePermittivity);
                cetCsv = Path.Combine(dir, WaferThicknessCsv.FileName);
                WaferThicknessCsv.Write(cetCsv, cetCheck, LotAnalyses.EllipsometryFlags(wafers));
            }
            if (parse.GetValue(json))
            {
                var node = System.Text.Json.Nodes.JsonNode.Parse(LotsJsonFormatter.FormatThickness(comparison))!.AsObject();
                var array = new System.Text.Json.Nodes.JsonArray();
                foreach (var w in wafers)
                {
                    array.Add(new System.Text.Json.Nodes.JsonObject
                    {
                        ["lot"] = w.Lot,
                        ["wafer"] = w.Wafer,
                        ["ellipsometry_nm"] = w.EllipsometricNm,
                        ["electrical_median_nm"] = w.ElectricalMedianNm,
                        ["dies_refitted"] = w.Dies,
                        ["f"] = w.Test?.F,
                        ["p_value"] = w.Test?.PValue,
                        ["flagged"] = w.Flagged,
                        ["verdict"] = w.Note,
                    });
                }
                node["wafers"] = array;
                if (cetCheck is not null) node["wafer_thickness"] = CetJson(cetCheck, LotAnalyses.EllipsometryFlags(wafers));
                context.Out.WriteLine(node.ToJsonString());
            }
            else if (comparison.Agreement is { } a)
            {
                context.Out.WriteLine($"pairs: {a.N} ({comparison.Level.ToString().ToLowerInvariant()})");
                context.Out.WriteLine($"bias (electrical - ellipsometry): {LotAnalyses.Num(a.BiasNm)} nm, 95 % interval [{LotAnalyses.Num(a.BiasLower95Nm)}, {LotAnalyses.Num(a.BiasUpper95Nm)}] nm");
                context.Out.WriteLine($"limits of agreement: {LotAnalyses.Num(a.LowerLimitNm)} to {LotAnalyses.Num(a.UpperLimitNm)} nm");
            }
            else
            {
                context.Out.WriteLine($"no agreement statistics: {comparison.Reason}");
            }
            foreach (var w in parse.GetValue(json) ? [] : wafers)
            {
                string verdict = w.Test is { } t ? $"F = {t.F:G4}, p {(t.PValue < 1e-16 ? "< 1e-16" : "= " + t.PValue.ToString("G3", CultureInfo.InvariantCulture))}: {w.Note}" : w.Note;
                context.Out.WriteLine($"wafer {w.Lot}/{w.Wafer} (ellipsometry {LotAnalyses.Num(w.EllipsometricNm)} nm, {w.Dies} dies refitted with d fixed): {verdict}");
            }
            if (cetCheck is not null && !parse.GetValue(json)) WriteCetText(context, cetCheck, LotAnalyses.EllipsometryFlags(wafers));
            foreach (var u in comparison.UnmatchedResults) context.Error.WriteLine($"{u.File}:0: not matched: {u.Reason}");
            foreach (var u in comparison.UnmatchedEllipsometry) context.Error.WriteLine($"{ellipsometryPath}:{u.Row.SourceLine}: not matched: {u.Reason}");
            foreach (var u in cetCheck?.UnmatchedCet ?? []) context.Error.WriteLine($"{u.Measurement.Source}:0: not matched: {u.Reason}");
            if (plot is not null) context.Error.WriteLine($"junctionfit thickness: Bland–Altman plot {plot}");
            if (cetCheck is not null)
            {
                context.Error.WriteLine($"junctionfit thickness: CET - t_ox: {cetCheck.Flagged.Count()} wafer(s) flagged; per-wafer table {cetCsv}");
            }
            bool cetIncomplete = cetCheck is not null && cetCheck.UnmatchedCet.Length > 0;
            return comparison.Agreement is null || refitFailures > 0 || cetIncomplete ? ExitCodes.SomeFailed : ExitCodes.Success;
        });
        return command;
    }

    /// <summary>Parses <c>--cet-range LO:HI</c> in nm (default 0:1.2).</summary>
    internal static (double Low, double High) ParseCetRange(string? text)
    {
        if (text is null) return (CetCrossCheck.DefaultLowerNm, CetCrossCheck.DefaultUpperNm);
        int colon = text.IndexOf(':', StringComparison.Ordinal);
        if (colon <= 0 || colon == text.Length - 1) throw new UsageException($"--cet-range: '{text}' must be LO:HI in nm, for example 0:1.2");
        double low = QuantityParser.ParseNumber("--cet-range", text[..colon].Trim());
        double high = QuantityParser.ParseNumber("--cet-range", text[(colon + 1)..].Trim());
        if (!double.IsFinite(low) || !double.IsFinite(high) || !(high > low)) throw new UsageException($"--cet-range: '{text}': HI must be above LO");
        return (low, high);
    }

    private static System.Text.Json.Nodes.JsonObject CetJson(CetCrossCheckResult r, Func<string, string, bool?> ellipsometryFlagged)
    {
        var array = new System.Text.Json.Nodes.JsonArray();
        foreach (var w in r.Wafers)
        {
            array.Add(new System.Text.Json.Nodes.JsonObject
            {
                ["lot"] = w.Lot,
                ["wafer"] = w.Wafer,
                ["dies"] = w.Dies,
                ["thickness_nm_median"] = w.ElectricalMedianNm,
                ["thickness_nm_spread"] = w.ElectricalSpreadNm,
                ["ellipsometry_nm"] = w.EllipsometricNm,
                ["cet_nm"] = w.CetNm,
                ["cet_files"] = w.CetFiles,
                ["cet_upper_bound"] = w.CetIsUpperBound,
                ["thickness_minus_ellipsometry_nm"] = w.ElectricalMinusEllipsometryNm,
                ["cet_minus_thickness_nm"] = w.CetMinusElectricalNm,
                ["ellipsometry_flagged"] = ellipsometryFlagged(w.Lot, w.Wafer),
                ["cet_flagged"] = w.CetFlagged,
                ["note"] = w.Note,
            });
        }
        var unmatched = new System.Text.Json.Nodes.JsonArray();
        foreach (var u in r.UnmatchedCet) unmatched.Add(new System.Text.Json.Nodes.JsonObject { ["file"] = u.Measurement.Source, ["reason"] = u.Reason });
        return new System.Text.Json.Nodes.JsonObject
        {
            ["cet_minus_thickness_range_nm"] = new System.Text.Json.Nodes.JsonArray(r.LowerNm, r.UpperNm),
            ["explanation"] = ThicknessBesideCet.Explanation,
            ["wafers"] = array,
            ["unmatched_cv"] = unmatched,
        };
    }

    private static void WriteCetText(CliContext context, CetCrossCheckResult r, Func<string, string, bool?> ellipsometryFlagged)
    {
        context.Out.WriteLine($"{"lot/wafer",-16} {"dies",4} {"t_ox (nm)",18} {"ellips. (nm)",12} {"CET (nm)",10} {"t_ox-ell.",10} {"CET-t_ox",10} {"ell. flag",9} {"CET flag",9}  note");
        foreach (var w in r.Wafers)
        {
            string tox = w.ElectricalMedianNm is null ? "" : $"{LotAnalyses.Num(w.ElectricalMedianNm)} ± {LotAnalyses.Num(w.ElectricalSpreadNm)}";
            string cet = w.CetNm is null ? "" : LotAnalyses.Num(w.CetNm) + (w.CetIsUpperBound ? "+" : "");
            string ell = ellipsometryFlagged(w.Lot, w.Wafer) switch { true => "FLAGGED", false => "-", null => "" };
            string flag = w.CetFlagged ? "FLAGGED" : w.CetMinusElectricalNm is null ? "" : "-";
            context.Out.WriteLine($"{w.Lot + "/" + w.Wafer,-16} {w.Dies,4} {tox,18} {LotAnalyses.Num(w.EllipsometricNm),12} {cet,10} {LotAnalyses.Num(w.ElectricalMinusEllipsometryNm),10} " +
                                  $"{LotAnalyses.Num(w.CetMinusElectricalNm),10} {ell,9} {flag,9}  {w.Note}");
        }
        context.Out.WriteLine(string.Create(CultureInfo.InvariantCulture, $"t_ox: median of the good die fits ± robust spread; CET + marks an upper bound; CET - t_ox plausible from {r.LowerNm:0.###} to {r.UpperNm:0.###} nm."));
        context.Out.WriteLine(ThicknessBesideCet.Explanation + ".");
    }
}
