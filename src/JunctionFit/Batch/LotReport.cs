using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Lots;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Batch;

/// <summary>
/// What a lot run writes once every die is fitted: the lot summary table, the wafer maps, the out-of-family dies and the
/// self-contained report. The fitting itself (reading, the parallel pipeline, the results database) and the messages a
/// user reads stay with the caller.
/// </summary>
public static class LotReport
{
    /// <summary>Fits that get a section of their own in the report (failed and poor fits first).</summary>
    public const int SectionLimit = 40;

    /// <summary>Rows of the report's summary table (the full table is results.csv), so the report stays readable and small.</summary>
    public const int SummaryLimit = 2000;

    /// <summary>Folder of the wafer maps inside the output folder.</summary>
    public const string MapDirName = "maps";

    /// <summary>File name of the report inside the output folder.</summary>
    public const string FileName = "report.html";

    /// <summary>Parameters drawn as wafer maps.</summary>
    public static IReadOnlyList<string> MapKeys { get; } =
        [ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name, ParameterKey.Area.Name, ParameterKey.FlatBandVoltage.Name];

    /// <summary>Writes lot-summary.csv, the wafer maps and report.html into <see cref="LotReportRequest.OutDir"/>.</summary>
    /// <param name="request">The fitted lot and how to describe it.</param>
    /// <returns>The lot summaries, the out-of-family dies and the report's path.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="request"/> is null.</exception>
    /// <exception cref="IOException">A file could not be written.</exception>
    public static LotReportOutcome Write(LotReportRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        var rows = request.Rows;
        var results = request.Results;
        if (results.Count != rows.Count || request.Plots.Count != rows.Count)
        {
            throw new ArgumentException("rows, results and plots must be as many", nameof(request));
        }

        // Lot summary and wafer maps.
        var lots = LotSummary.Compute(rows);
        LotSummaryCsv.Write(Path.Combine(request.OutDir, LotSummaryCsv.FileName), lots);
        string mapDir = Path.Combine(request.OutDir, MapDirName);
        var maps = new List<HtmlImage>();
        foreach (var wafer in rows.Where(r => r.DieX is not null && r.DieY is not null)
                     .GroupBy(r => (r.Lot ?? "", r.Wafer ?? "")).OrderBy(g => g.Key.Item1, StringComparer.Ordinal).ThenBy(g => g.Key.Item2, StringComparer.Ordinal))
        {
            var dies = wafer.ToList();
            foreach (string key in MapKeys)
            {
                // A parameter held fixed on every die (the area when given) has nothing to map.
                if (!dies.Any(d => d.Find(key) is { StandardError: not null })) continue;
                byte[] png = WaferMapRenderer.RenderPng(dies, key);
                AtomicFile.WriteAllBytes(Path.Combine(mapDir, WaferMapRenderer.FileName(wafer.Key.Item1, wafer.Key.Item2, key)), png);
                maps.Add(new HtmlImage($"lot {wafer.Key.Item1}, wafer {wafer.Key.Item2}: {key}", png));
            }
        }

        var (outliers, outlierSection) = LotAnalyses.Outliers(rows, request.RefitAdvice);
        var sections = new List<HtmlReportSection> { LotSummarySection(lots), outlierSection };
        if (maps.Count > 0)
        {
            sections.Add(new HtmlReportSection("wafer-maps", "Wafer maps")
            {
                Paragraphs = ["Dies on their grid, coloured by the fitted value (good fits only); a cross marks a failed die, an outline a poor fit."],
                Images = maps,
            });
        }
        if (request.ExtraSections is not null) sections.InsertRange(0, request.ExtraSections(rows));

        // Out-of-family dies get a section of their own too: they are the dies an engineer wants to look at.
        var candidates = request.Candidates.Kept.ToList();
        foreach (var o in outliers)
        {
            int index = IndexOf(rows, o.Row);
            if (index >= 0 && !candidates.Any(c => c.Index == index))
            {
                var asResult = results[index];
                asResult = asResult with
                {
                    Warnings = asResult.Warnings.Add($"out of family in lot {o.Row.Lot}: {o.Key} = {LotAnalyses.Num(o.Value)} against the lot median " +
                                                     $"{LotAnalyses.Num(o.Median)} (robust z {o.Z:0.0}); {request.OutlierRefitAdvice}"),
                };
                candidates.Add((index, asResult, request.Plots[index]));
            }
        }
        var shown = new HashSet<int>(candidates.Select(c => c.Index));
        var entries = new List<HtmlReportEntry>(Math.Min(rows.Count, SummaryLimit));
        var byIndex = candidates.ToDictionary(c => c.Index);
        int okListed = 0, okTotal = rows.Count(r => r.Status == FitStatus.Ok);
        int okBudget = Math.Max(0, SummaryLimit - (rows.Count - okTotal));
        for (int i = 0; i < rows.Count; i++)
        {
            if (byIndex.TryGetValue(i, out var c))
            {
                entries.Add(new HtmlReportEntry(c.Result) { PlotPath = c.Plot, ShowSection = true });
            }
            else if (rows[i].Status != FitStatus.Ok || okListed++ < okBudget)
            {
                entries.Add(new HtmlReportEntry(results[i]) { ShowSection = false });
            }
        }
        string reportPath = Path.Combine(request.OutDir, FileName);
        var run = request.Run with
        {
            Sections = sections,
            SummaryNote = rows.Count > shown.Count
                ? (entries.Count < rows.Count ? $"The table lists {entries.Count} of {rows.Count} fits (every failed and poor fit, then ok fits in order). " : "") +
                  $"{shown.Count} of {rows.Count} fits have a section of their own below (failed and poor fits first); every fit is in {request.ResultsFileName}" +
                  (request.PlotsWritten ? " and has its plot in plots/." : ".")
                : null,
        };
        HtmlReportWriter.Write(reportPath, run, entries);
        return new LotReportOutcome(lots, outliers, reportPath);
    }

    /// <summary>The lot summary as a report section: counts, yield, and median and robust spread of the main parameters.</summary>
    /// <param name="lots">Summaries from <see cref="LotSummary.Compute"/>.</param>
    /// <returns>The section.</returns>
    public static HtmlReportSection LotSummarySection(IReadOnlyList<LotSummaryRow> lots)
    {
        ArgumentNullException.ThrowIfNull(lots);
        var header = new List<string> { "Lot", "Dies", "Ok", "Poor fit", "Failed", "Yield" };
        // flatband_voltage_V (the mos model) only when some lot has it, so junction reports keep their columns.
        string[] keys = lots.Any(l => l.Find(ParameterKey.FlatBandVoltage.Name) is { GoodCount: > 0 })
            ? [ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name, ParameterKey.Area.Name, ParameterKey.FlatBandVoltage.Name, ParameterKey.TransitionVoltage.Name]
            : [ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name, ParameterKey.Area.Name, ParameterKey.TransitionVoltage.Name];
        foreach (string k in keys) { header.Add(k + " median"); header.Add(k + " robust spread"); }
        var table = new List<IReadOnlyList<string>>();
        foreach (var lot in lots)
        {
            var cells = new List<string>
            {
                lot.Lot, lot.Total.ToString(CultureInfo.InvariantCulture), lot.Ok.ToString(CultureInfo.InvariantCulture),
                lot.PoorFit.ToString(CultureInfo.InvariantCulture), lot.Failed.ToString(CultureInfo.InvariantCulture),
                lot.Yield.ToString("P1", CultureInfo.InvariantCulture),
            };
            foreach (string k in keys)
            {
                var p = lot.Find(k);
                cells.Add(p?.Median is double m ? m.ToString("G5", CultureInfo.InvariantCulture) : "");
                cells.Add(p?.RobustSpread is double r ? r.ToString("G3", CultureInfo.InvariantCulture) : "");
            }
            table.Add(cells);
        }
        return new HtmlReportSection("lot-summary", "Lot summary")
        {
            Paragraphs = ["Median and robust spread (median absolute deviation × 1.4826) over the dies with status ok; yield is the share of dies fitted ok."],
            Tables = [new HtmlTable("Per lot", header, table)],
        };
    }

    private static int IndexOf(IReadOnlyList<ResultRow> rows, ResultRow row)
    {
        for (int i = 0; i < rows.Count; i++)
        {
            if (EqualityComparer<ResultRow>.Default.Equals(rows[i], row)) return i;
        }
        return -1;
    }
}

/// <summary>A fitted lot for <see cref="LotReport.Write"/>.</summary>
/// <param name="OutDir">Output folder (exists).</param>
/// <param name="Rows">One row per file, in input order.</param>
/// <param name="Results">The fit of each row, without its curve.</param>
/// <param name="Plots">The fit plot of each row (null for none).</param>
/// <param name="Candidates">The fits kept for a section of their own.</param>
/// <param name="Run">Tool version, time, model and options for the report header; its sections and note are filled in.</param>
public sealed record LotReportRequest(string OutDir, IReadOnlyList<ResultRow> Rows, IReadOnlyList<FitResult> Results, IReadOnlyList<string?> Plots,
    ReportCandidates Candidates, HtmlRunInfo Run)
{
    /// <summary>Whether fit plots were written (the report's note says where they are).</summary>
    public bool PlotsWritten { get; init; }

    /// <summary>Name of the full results table the note points to.</summary>
    public string ResultsFileName { get; init; } = "results.csv";

    /// <summary>How to refit an out-of-family die, for the outlier section (worded by the caller: it names options).</summary>
    public string RefitAdvice { get; init; } = "fit them with a leak or a series resistance free";

    /// <summary>The same advice as a clause of an out-of-family die's warning.</summary>
    public string OutlierRefitAdvice { get; init; } = "refit with a leak or a series resistance free";

    /// <summary>Further report sections built from the rows, shown first (the demo adds drift and thickness).</summary>
    public Func<IReadOnlyList<ResultRow>, IReadOnlyList<HtmlReportSection>>? ExtraSections { get; init; }
}

/// <summary>What <see cref="LotReport.Write"/> computed and wrote.</summary>
/// <param name="Lots">Per-lot summaries (also in lot-summary.csv).</param>
/// <param name="Outliers">Good dies out of family in their lot: row, parameter key, value, lot median, robust z.</param>
/// <param name="ReportPath">Path of report.html.</param>
public sealed record LotReportOutcome(IReadOnlyList<LotSummaryRow> Lots, IReadOnlyList<(ResultRow Row, string Key, double Value, double Median, double Z)> Outliers,
    string ReportPath);

/// <summary>
/// The fits of a lot that get a section of their own in the report: at most <see cref="LotReport.SectionLimit"/>, failed
/// fits first, then poor fits, then ok fits, earlier files before later ones. The kept set does not depend on the order
/// results are offered in. Not thread-safe.
/// </summary>
public sealed class ReportCandidates
{
    private readonly List<(int Index, FitResult Result, string? Plot)> _kept = [];

    /// <summary>The kept fits: input index, result and plot path.</summary>
    public IReadOnlyList<(int Index, FitResult Result, string? Plot)> Kept => _kept;

    /// <summary>Offers the fit of input file <paramref name="index"/>.</summary>
    /// <param name="index">Position of the file in the input.</param>
    /// <param name="result">The fit.</param>
    /// <param name="plot">Its plot path, if any.</param>
    public void Offer(int index, FitResult result, string? plot)
    {
        ArgumentNullException.ThrowIfNull(result);
        static int Rank(FitStatus s) => s switch { FitStatus.Failed => 0, FitStatus.PoorFit => 1, _ => 2 };
        if (_kept.Count < LotReport.SectionLimit)
        {
            _kept.Add((index, result, plot));
            return;
        }
        int worst = 0;
        for (int i = 1; i < _kept.Count; i++)
        {
            if (Rank(_kept[i].Result.Status) > Rank(_kept[worst].Result.Status) ||
                (Rank(_kept[i].Result.Status) == Rank(_kept[worst].Result.Status) && _kept[i].Index > _kept[worst].Index)) worst = i;
        }
        // Better rank, or equal rank and earlier in the input: the kept set does not depend on the order results arrive in.
        if (Rank(result.Status) < Rank(_kept[worst].Result.Status) ||
            (Rank(result.Status) == Rank(_kept[worst].Result.Status) && index < _kept[worst].Index)) _kept[worst] = (index, result, plot);
    }
}
