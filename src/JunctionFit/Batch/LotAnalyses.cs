using System.Globalization;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Physics;
using JunctionFit.Reporting;
using JunctionFit.Results;

namespace JunctionFit.Batch;

/// <summary>
/// The lot analyses as the commands and the demo run them: compute (Lots), write the PNGs (Reporting), describe in a report
/// section; the thickness analysis reads each die's file again for its consistency refit. Messages name no command-line
/// option: the caller words them.
/// </summary>
public static class LotAnalyses
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Runs the drift analysis, writes one trend chart per parameter into <paramref name="outDir"/>, returns the result and a report section.</summary>
    /// <param name="rows">Result rows of every lot.</param>
    /// <param name="options">Reference lot(s) and thresholds.</param>
    /// <param name="outDir">Folder of the trend charts (created when missing).</param>
    /// <returns>The drift result, its report section and the paths of the charts written.</returns>
    /// <exception cref="ArgumentException">The options do not fit the rows (for example an unknown reference lot).</exception>
    /// <exception cref="IOException">A chart could not be written.</exception>
    public static (DriftResult Result, HtmlReportSection Section, List<string> Charts) Drift(IReadOnlyList<ResultRow> rows, DriftOptions options, string outDir)
    {
        var result = DriftAnalysis.Compute(rows, options);
        Directory.CreateDirectory(outDir);
        var images = new List<HtmlImage>();
        var charts = new List<string>();
        foreach (var chart in result.Charts)
        {
            byte[] png = TrendChartRenderer.RenderPng(chart);
            string path = Path.Combine(outDir, TrendChartRenderer.FileName(chart.Key));
            Common.AtomicFile.WriteAllBytes(path, png);
            charts.Add(path);
            images.Add(new HtmlImage($"{chart.Key}: lot medians with control limits from the reference lot(s)", png));
        }
        var header = new[] { "Lot", "Parameter", "n", "Shift", "95 % interval", "p (Holm)", "Threshold", "Flagged", "Note" };
        var cells = new List<IReadOnlyList<string>>();
        var highlight = new HashSet<int>();
        foreach (var r in result.Rows)
        {
            if (r.Flagged) highlight.Add(cells.Count);
            cells.Add([
                r.Lot, r.Key, r.N.ToString(Inv), Num(r.Shift), r.Lower95 is double lo && r.Upper95 is double hi ? $"[{Num(lo)}, {Num(hi)}]" : "",
                r.PValueHolm is double p ? p.ToString("G3", Inv) : "", Num(r.Threshold), r.Flagged ? "FLAGGED" : "no", r.Reason ?? "",
            ]);
        }
        var flagged = result.Flagged.ToList();
        var section = new HtmlReportSection("drift", "Lot-to-lot drift")
        {
            Paragraphs =
            [
                $"Reference lot(s): {string.Join(", ", result.ReferenceLots)}. Shift of each lot's mean against the reference, 95 % Welch interval, " +
                $"p-value corrected over lots × parameters (Holm); flagged when significant at {result.Alpha} and larger than the practical threshold.",
                flagged.Count == 0 ? "Nothing is flagged." : "Flagged: " + string.Join("; ", flagged.Select(f => $"{f.Lot} {f.Key} shift {Num(f.Shift)}")),
            ],
            Tables = [new HtmlTable("Shifts against the reference", header, cells) { Highlight = highlight }],
            Images = images,
        };
        return (result, section, charts);
    }

    /// <summary>
    /// Compares electrical and ellipsometric thickness, writes the Bland–Altman PNG, and for each wafer refits its good dies
    /// with d fixed at the ellipsometric value to test (F-test) whether the fits get significantly worse.
    /// </summary>
    /// <param name="rows">Result rows; their file paths are read again for the refit.</param>
    /// <param name="ellipsometry">Ellipsometric thicknesses per wafer or site.</param>
    /// <param name="plan">The fit plan the rows were fitted with.</param>
    /// <param name="readOptions">How the files are read.</param>
    /// <param name="outDir">Folder of the Bland–Altman plot (created when missing).</param>
    /// <param name="jobs">Parallel refits.</param>
    /// <param name="toleranceNm">Practical tolerance on the thickness difference, nm.</param>
    /// <returns>The comparison, the per-wafer refit tests, the report section, the plot path (null without agreement
    /// statistics) and the number of dies whose file could not be read for the refit.</returns>
    /// <exception cref="IOException">The plot could not be written.</exception>
    public static (ThicknessComparisonResult Result, List<WaferConsistency> Wafers, HtmlReportSection Section, string? Plot, int RefitFailures) Thickness(
        IReadOnlyList<ResultRow> rows, IReadOnlyList<EllipsometryRow> ellipsometry, FitPlan plan, IvReadOptions readOptions, string outDir, int jobs,
        double toleranceNm = DefaultThicknessToleranceNm)
    {
        var comparison = ThicknessComparison.Compare(rows, ellipsometry);
        Directory.CreateDirectory(outDir);
        string? plotPath = null;
        byte[]? png = null;
        if (comparison.Agreement is not null)
        {
            png = BlandAltmanRenderer.RenderPng(comparison);
            plotPath = Path.Combine(outDir, BlandAltmanRenderer.DefaultFileName);
            Common.AtomicFile.WriteAllBytes(plotPath, png);
        }
        var (wafers, refitFailures) = WaferConsistencyTests(rows, ellipsometry, plan, readOptions, jobs, toleranceNm);
        var paragraphs = new List<string>();
        if (comparison.Agreement is { } a)
        {
            paragraphs.Add($"Electrical minus ellipsometric thickness over {a.N} {(comparison.Level == ThicknessMatchLevel.Site ? "sites" : "wafers")}: " +
                           $"bias {Num(a.BiasNm)} nm, 95 % interval [{Num(a.BiasLower95Nm)}, {Num(a.BiasUpper95Nm)}] nm; " +
                           $"limits of agreement {Num(a.LowerLimitNm)} to {Num(a.UpperLimitNm)} nm (Bland & Altman 1986).");
        }
        else
        {
            paragraphs.Add($"No agreement statistics: {comparison.Reason}");
        }
        var flaggedWafers = wafers.Where(w => w.Flagged).ToList();
        paragraphs.Add(flaggedWafers.Count == 0
            ? "No wafer is flagged by the consistency refit."
            : "Flagged wafers: " + string.Join("; ", flaggedWafers.Select(w => $"{w.Lot}/{w.Wafer} (electrical {Num(w.ElectricalMedianNm)} nm, ellipsometry {Num(w.EllipsometricNm)} nm)")));
        paragraphs.Add($"{comparison.UnmatchedResults.Length} result rows and {comparison.UnmatchedEllipsometry.Length} ellipsometry rows were not matched (listed below).");
        var waferCells = wafers.Select(w => (IReadOnlyList<string>)[w.Lot, w.Wafer, Num(w.EllipsometricNm), Num(w.ElectricalMedianNm), w.Dies.ToString(Inv),
            w.Test is { } t ? t.F.ToString("G4", Inv) : "", w.Test is { } t2 ? PValueText(t2.PValue) : "", w.Flagged ? "FLAGGED" : w.Test is null ? "" : "no", w.Note]).ToList();
        var highlight = new HashSet<int>(wafers.Select((w, i) => (w, i)).Where(x => x.w.Flagged).Select(x => x.i));
        var unmatched = comparison.UnmatchedResults.Select(u => (IReadOnlyList<string>)["result", u.File, u.Lot ?? "", u.Wafer ?? "", u.Reason])
            .Concat(comparison.UnmatchedEllipsometry.Select(u => (IReadOnlyList<string>)["ellipsometry", $"line {u.Row.SourceLine}", u.Row.Lot, u.Row.Wafer, u.Reason]))
            .ToList();
        var section = new HtmlReportSection("thickness", "Electrical thickness against ellipsometry")
        {
            Paragraphs = paragraphs,
            Tables =
            [
                new HtmlTable("Pairs", ["Lot", "Wafer", "Die x", "Die y", "Electrical (nm)", "Ellipsometry (nm)", "Difference (nm)"],
                    comparison.Pairs.Select(p => (IReadOnlyList<string>)[p.Lot, p.Wafer, p.DieX?.ToString(Inv) ?? "", p.DieY?.ToString(Inv) ?? "",
                        Num(p.ElectricalNm), Num(p.EllipsometricNm), Num(p.DifferenceNm)]).ToList()),
                new HtmlTable("Per wafer: refit with d fixed at the ellipsometric value (F-test)",
                    ["Lot", "Wafer", "Ellipsometry (nm)", "Electrical median (nm)", "Dies refitted", "F", "p", "Flagged", "Verdict"], waferCells) { Highlight = highlight },
                new HtmlTable("Not matched", ["Side", "Row", "Lot", "Wafer", "Reason"], unmatched),
            ],
            Images = png is null ? [] : [new HtmlImage("Bland–Altman: difference against mean, with bias and 95 % limits of agreement", png)],
        };
        return (comparison, wafers, section, plotPath, refitFailures);
    }

    /// <summary>
    /// The per-wafer table of electrical t_ox, ellipsometry and CET with the CET flag beside the ellipsometry refit flag of
    /// <paramref name="wafers"/>; returns the result and a report section.
    /// </summary>
    /// <param name="rows">Result rows.</param>
    /// <param name="ellipsometry">Ellipsometric thicknesses.</param>
    /// <param name="cet">CET of the wafers' C–V capacitors.</param>
    /// <param name="wafers">The ellipsometry refit tests of <see cref="Thickness"/>.</param>
    /// <param name="lowerNm">Lowest expected CET − t_ox, nm.</param>
    /// <param name="upperNm">Highest expected CET − t_ox, nm.</param>
    /// <param name="oxidePermittivity">Relative permittivity of the oxide used for CET.</param>
    /// <returns>The cross-check and its report section.</returns>
    /// <exception cref="ArgumentOutOfRangeException">The expected range is empty or not finite.</exception>
    public static (CetCrossCheckResult Result, HtmlReportSection Section) CetCheck(IReadOnlyList<ResultRow> rows, IReadOnlyList<EllipsometryRow> ellipsometry,
        IReadOnlyList<CetMeasurement> cet, IReadOnlyList<WaferConsistency> wafers, double lowerNm, double upperNm, double oxidePermittivity = 3.9)
    {
        var result = CetCrossCheck.Compare(rows, ellipsometry, cet, lowerNm, upperNm);
        var flags = EllipsometryFlags(wafers);
        var cells = result.Wafers.Select(w => (IReadOnlyList<string>)[
            w.Lot, w.Wafer, w.Dies.ToString(Inv), Num(w.ElectricalMedianNm), Num(w.ElectricalSpreadNm), Num(w.EllipsometricNm),
            w.CetNm is null ? "" : Num(w.CetNm) + (w.CetIsUpperBound ? " (upper bound)" : ""), Num(w.ElectricalMinusEllipsometryNm), Num(w.CetMinusElectricalNm),
            flags(w.Lot, w.Wafer) switch { true => "FLAGGED", false => "no", null => "" }, w.CetFlagged ? "FLAGGED" : w.CetMinusElectricalNm is null ? "" : "no", w.Note]).ToList();
        var highlight = new HashSet<int>(result.Wafers.Select((w, i) => (w, i)).Where(x => x.w.CetFlagged || flags(x.w.Lot, x.w.Wafer) == true).Select(x => x.i));
        var flagged = result.Flagged.ToList();
        var section = new HtmlReportSection("thickness-cet", "Oxide thickness: die fits, ellipsometry and CET")
        {
            Paragraphs =
            [
                "Per wafer: electrical t_ox is the median of the good die fits (spread: 1.4826 × MAD), CET = eps_ox eps0 A / C_max of the wafer's C-V " +
                string.Create(Inv, $"capacitors (eps_ox = {oxidePermittivity:0.###}, eps0 CODATA). CET - t_ox is expected between {result.LowerNm:0.###} and {result.UpperNm:0.###} nm."),
                ThicknessBesideCet.Explanation + ".",
                flagged.Count == 0
                    ? "No wafer is flagged by CET - t_ox."
                    : "Flagged by CET - t_ox: " + string.Join("; ", flagged.Select(w => $"{w.Lot}/{w.Wafer} ({Num(w.CetMinusElectricalNm)} nm)")),
            ],
            Tables =
            [
                new HtmlTable("Per wafer",
                    ["Lot", "Wafer", "Dies", "t_ox median (nm)", "t_ox spread (nm)", "Ellipsometry (nm)", "CET (nm)", "t_ox - ellipsometry (nm)", "CET - t_ox (nm)",
                     "Ellipsometry flag", "CET flag", "Note"], cells) { Highlight = highlight },
            ],
        };
        return (result, section);
    }

    /// <summary>The ellipsometry refit flag of a wafer (null when the wafer was not tested).</summary>
    /// <param name="wafers">The refit tests.</param>
    /// <returns>A lookup from (lot, wafer) to the flag.</returns>
    public static Func<string, string, bool?> EllipsometryFlags(IReadOnlyList<WaferConsistency> wafers)
    {
        var map = new Dictionary<(string, string), bool>();
        foreach (var w in wafers) if (w.Test is not null) map.TryAdd((w.Lot, w.Wafer), w.Flagged);
        return (lot, wafer) => map.TryGetValue((lot, wafer), out bool f) ? f : null;
    }

    /// <summary>The ellipsometry consistency refit of one wafer.</summary>
    /// <param name="Lot">Lot.</param>
    /// <param name="Wafer">Wafer.</param>
    /// <param name="EllipsometricNm">The wafer's ellipsometric thickness, nm.</param>
    /// <param name="Dies">Dies refitted.</param>
    /// <param name="Test">The F-test; null when no die could be refitted.</param>
    /// <param name="Note">The verdict in words, with any die that could not be read.</param>
    public sealed record WaferConsistency(string Lot, string Wafer, double EllipsometricNm, int Dies, ConsistencyTest? Test, string Note)
    {
        /// <summary>Median electrical thickness of the wafer's good dies, nm.</summary>
        public double? ElectricalMedianNm { get; init; }

        /// <summary>True when the F-test rejects and the thicknesses differ by more than the practical tolerance.</summary>
        public bool Flagged { get; init; }
    }

    /// <summary>
    /// Default practical tolerance on |electrical − ellipsometric| thickness below which a significant F-test is not flagged
    /// (about one atomic layer of the oxide; common practice, no source).
    /// </summary>
    public const double DefaultThicknessToleranceNm = 0.1;

    private static (List<WaferConsistency> Wafers, int RefitFailures) WaferConsistencyTests(IReadOnlyList<ResultRow> rows, IReadOnlyList<EllipsometryRow> ellipsometry,
        FitPlan plan, IvReadOptions readOptions, int jobs, double toleranceNm)
    {
        var list = new List<WaferConsistency>();
        int refitFailures = 0;
        foreach (var wafer in ellipsometry.GroupBy(e => (e.Lot, e.Wafer)))
        {
            var perWafer = wafer.Where(e => !e.IsSite).ToList();
            var dies = rows.Where(r => r.IsGood && r.Lot == wafer.Key.Lot && r.Wafer == wafer.Key.Wafer).ToList();
            if (dies.Count == 0)
            {
                bool present = rows.Any(r => r.Lot == wafer.Key.Lot && r.Wafer == wafer.Key.Wafer);
                list.Add(new WaferConsistency(wafer.Key.Lot, wafer.Key.Wafer, wafer.First().ThicknessNm, 0, null,
                    present ? "no good dies of this wafer in the results" : "this wafer is not in the results"));
                continue;
            }
            double rssFree = 0, rssFixed = 0;
            int dfFree = 0, refitted = 0;
            var notes = new List<string>();
            var sync = new object();
            Parallel.ForEach(dies, new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, jobs) }, die =>
            {
                var site = wafer.FirstOrDefault(e => e.IsSite && e.DieX == die.DieX && e.DieY == die.DieY);
                double? dNm = site?.ThicknessNm ?? (perWafer.Count > 0 ? perWafer[0].ThicknessNm : null);
                if (dNm is null) return;
                IvCurve curve;
                try { curve = IvFileReader.ReadFile(die.File, readOptions); }
                catch (Exception e) when (e is IvFormatException or IOException or UnauthorizedAccessException)
                {
                    lock (sync)
                    {
                        notes.Add($"{die.File}: not refitted ({e.Message}); paths in results are as batch was given them — run thickness from the folder batch ran in");
                        refitFailures++;
                    }
                    return;
                }
                var free = plan.Fit(curve);
                var fixedPlan = plan.WithOptions(plan.Options with { FixedValues = plan.Options.FixedValues.SetItem(ParameterKey.Thickness, ParameterKey.Thickness.FromDisplay(dNm.Value)) });
                var pinned = fixedPlan.Fit(curve);
                if (free.Quality is not { } qf || pinned.Quality is not { } qp || free.Status == FitStatus.Failed || pinned.Status == FitStatus.Failed) return;
                int k = free.Parameters.Count(p => !p.IsFixed);
                lock (sync)
                {
                    rssFree += qf.ResidualSumOfSquares;
                    rssFixed += qp.ResidualSumOfSquares;
                    dfFree += qf.PointsUsed - k;
                    refitted++;
                }
            });
            double ellipsometric = perWafer.Count > 0 ? perWafer[0].ThicknessNm : wafer.Average(e => e.ThicknessNm);
            if (refitted == 0 || dfFree <= 0)
            {
                list.Add(new WaferConsistency(wafer.Key.Lot, wafer.Key.Wafer, ellipsometric, 0, null, "no die could be refitted" + (notes.Count > 0 ? ": " + notes[0] : "")));
                continue;
            }
            var test = ThicknessComparison.ConsistencyFTest(rssFree, dfFree, rssFixed, refitted);
            double? median = LotStatistics.Median(dies.Select(r => r.ValueOf(ParameterKey.Thickness.Name)).OfType<double>().ToList());
            bool large = median is double m && Math.Abs(m - ellipsometric) > toleranceNm;
            bool flagged = !test.Consistent && large;
            string verdict = flagged
                ? $"INCONSISTENT: fixing d at the ellipsometric value makes the fits significantly worse (p {(test.PValue < 1e-16 ? "< 1e-16" : "= " + test.PValue.ToString("G2", Inv))}) and the electrical median differs by {median!.Value - ellipsometric:+0.###;-0.###} nm (tolerance {toleranceNm} nm)"
                : !test.Consistent
                    ? $"consistent within the tolerance: the refit is significantly worse (p {(test.PValue < 1e-16 ? "< 1e-16" : "= " + test.PValue.ToString("G2", Inv))}, die-to-die thickness spread), but the electrical median is within {toleranceNm} nm"
                    : "consistent: fixing d at the ellipsometric value does not make the fits significantly worse";
            list.Add(new WaferConsistency(wafer.Key.Lot, wafer.Key.Wafer, ellipsometric, refitted, test, notes.Count > 0 ? verdict + "; " + string.Join("; ", notes) : verdict)
            {
                ElectricalMedianNm = median,
                Flagged = flagged,
            });
        }
        return (list, refitFailures);
    }

    /// <summary>Robust z above which a good die is listed as out of family in its lot (common practice, no source).</summary>
    public const double OutlierRobustZ = 5.0;

    /// <summary>
    /// Good dies whose barrier height or thickness lies more than <see cref="OutlierRobustZ"/> robust standard deviations
    /// (scaled MAD) from their lot's median. A parallel leak or a series resistance can be absorbed by a thinner, higher
    /// barrier with a fit that looks perfect; against its lot such a die stands out.
    /// </summary>
    /// <param name="rows">Result rows of one or more lots.</param>
    /// <param name="refitAdvice">How to refit such a die, worded by the caller (the options that free a leak or a series
    /// resistance), shown in the section.</param>
    /// <returns>The out-of-family dies with parameter, value, lot median and robust z; and the report section.</returns>
    public static (List<(ResultRow Row, string Key, double Value, double Median, double Z)> Outliers, HtmlReportSection Section) Outliers(IReadOnlyList<ResultRow> rows, string refitAdvice)
    {
        var found = new List<(ResultRow Row, string Key, double Value, double Median, double Z)>();
        foreach (var lot in rows.Where(r => r.IsGood && r.Lot is not null).GroupBy(r => r.Lot!))
        {
            foreach (string key in (string[])[ParameterKey.BarrierHeight.Name, ParameterKey.Thickness.Name])
            {
                var values = lot.Select(r => r.ValueOf(key)).OfType<double>().ToList();
                if (values.Count < 5) continue;
                double? median = LotStatistics.Median(values);
                double? spread = LotStatistics.ScaledMad(values);
                if (median is not double m || spread is not double sd || !(sd > 0)) continue;
                foreach (var r in lot)
                {
                    if (r.ValueOf(key) is double v && Math.Abs(v - m) / sd > OutlierRobustZ) found.Add((r, key, v, m, (v - m) / sd));
                }
            }
        }
        var cells = found.Select(o => (IReadOnlyList<string>)[o.Row.File, o.Row.Lot ?? "", o.Row.Wafer ?? "", $"{o.Row.DieX},{o.Row.DieY}", o.Key, Num(o.Value), Num(o.Median), o.Z.ToString("0.0", Inv)]).ToList();
        var section = new HtmlReportSection("outliers", "Dies out of family")
        {
            Paragraphs =
            [
                $"Good fits whose barrier height or thickness lies more than {OutlierRobustZ} robust standard deviations (scaled MAD) from their lot's median. " +
                "A parallel leak path or a series resistance can be absorbed by a thinner, higher barrier with residuals that look clean; check these dies " +
                $"({refitAdvice}, or look at the device).",
                found.Count == 0 ? "No die is out of family." : $"{found.Select(o => o.Row.File).Distinct().Count()} die(s) out of family.",
            ],
            Tables = found.Count == 0 ? [] : [new HtmlTable("Out of family", ["File", "Lot", "Wafer", "Die", "Parameter", "Value", "Lot median", "Robust z"], cells)],
        };
        return (found, section);
    }

    /// <summary>A number for people: at most four decimals, no "-0", empty when unknown or not finite.</summary>
    /// <param name="v">The value.</param>
    /// <returns>Invariant text.</returns>
    public static string Num(double? v) => v is double x && double.IsFinite(x) ? (x == 0 ? 0.0 : Math.Round(x, 4) == 0 ? 0.0 : x).ToString("0.####", Inv) : "";

    /// <summary>A p-value for people: "&lt; 1e-16" below double resolution, else three significant digits.</summary>
    /// <param name="p">The p-value.</param>
    /// <returns>Invariant text.</returns>
    public static string PValueText(double p) => p < 1e-16 ? "< 1e-16" : p.ToString("G3", Inv);
}
