using System.Globalization;
using System.Net;
using System.Text;
using JunctionFit.Common;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>What the report header says about the run. Every string is shown as text (HTML-escaped).</summary>
/// <param name="ToolVersion">Version string of the tool, as the caller wants it shown.</param>
/// <param name="Time">When the run happened.</param>
/// <param name="Model">Model name used for the run.</param>
/// <param name="OptionsText">The run's options in words or as typed; may span lines.</param>
public sealed record HtmlRunInfo(string ToolVersion, DateTimeOffset Time, string Model, string OptionsText)
{
    /// <summary>Page title and main heading.</summary>
    public string Title { get; init; } = "JunctionFit fit report";

    /// <summary>Sections shown after the header and before the per-die summary (lot summary, wafer maps, drift …).</summary>
    public IReadOnlyList<HtmlReportSection> Sections { get; init; } = [];

    /// <summary>A note under the summary table (for example how many fits have no section of their own).</summary>
    public string? SummaryNote { get; init; }
}

/// <summary>A table for an extra report section. Every cell is shown as text (HTML-escaped); the table sorts on click.</summary>
/// <param name="Caption">Caption above the table.</param>
/// <param name="Header">Column headings.</param>
/// <param name="Rows">Cells, one array per row; a cell that parses as a number sorts numerically.</param>
public sealed record HtmlTable(string Caption, IReadOnlyList<string> Header, IReadOnlyList<IReadOnlyList<string>> Rows)
{
    /// <summary>Row indices to highlight (for example flagged lots).</summary>
    public IReadOnlySet<int> Highlight { get; init; } = new HashSet<int>();
}

/// <summary>An embedded image for an extra report section.</summary>
/// <param name="Caption">Caption (text).</param>
/// <param name="Png">PNG bytes.</param>
public sealed record HtmlImage(string Caption, ReadOnlyMemory<byte> Png);

/// <summary>An extra section: heading, paragraphs, tables and images, all escaped.</summary>
/// <param name="Id">Anchor id (letters, digits and '-').</param>
/// <param name="Title">Heading.</param>
public sealed record HtmlReportSection(string Id, string Title)
{
    /// <summary>Paragraphs of text.</summary>
    public IReadOnlyList<string> Paragraphs { get; init; } = [];

    /// <summary>Tables.</summary>
    public IReadOnlyList<HtmlTable> Tables { get; init; } = [];

    /// <summary>Images, shown in a grid.</summary>
    public IReadOnlyList<HtmlImage> Images { get; init; } = [];
}

/// <summary>One result of the report with its plot, if any.</summary>
/// <param name="Result">The fit.</param>
public sealed record HtmlReportEntry(FitResult Result)
{
    /// <summary>PNG bytes of the fit plot; empty for none. Takes precedence over <see cref="PlotPath"/>.</summary>
    public ReadOnlyMemory<byte> PlotPng { get; init; }

    /// <summary>Path of a PNG file to embed when <see cref="PlotPng"/> is empty; null for none.</summary>
    public string? PlotPath { get; init; }

    /// <summary>False to list the fit in the summary only, without a section of its own (large batches).</summary>
    public bool ShowSection { get; init; } = true;

    /// <summary>An entry whose plot is rendered now with <see cref="FitPlotRenderer"/>.</summary>
    /// <param name="result">The fit.</param>
    /// <returns>The entry with the PNG bytes attached.</returns>
    public static HtmlReportEntry WithRenderedPlot(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return new HtmlReportEntry(result) { PlotPng = FitPlotRenderer.RenderPng(result) };
    }
}

/// <summary>
/// Writes a self-contained HTML report: plots embedded as <c>data:image/png;base64</c> URIs, the style sheet
/// inline, one small inline script that sorts the summary table; no external scripts, fonts, style sheets,
/// images or links. Every piece of text from a result or the caller (file names, lot names, warnings, options)
/// is HTML-escaped.
/// <para>
/// Layout: a header with the run information (tool version, time, model, options, status counts) and a
/// caution note; a summary table (file, lot, wafer, die, status, φ, d, area with 95 % intervals, reduced χ²,
/// transition voltage, warnings) that sorts when a column heading is clicked; then one section per fit with
/// its plot, parameter table (value, standard error, 95 % interval, fixed), fit statistics, correlation matrix
/// and warnings.
/// </para>
/// </summary>
public static class HtmlReportWriter
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>|ρ| from which a correlation cell is highlighted as strong.</summary>
    public const double StrongCorrelation = 0.95;

    /// <summary>The caution note printed under the header.</summary>
    public const string CautionText =
        "The figures in this report are model estimates meant to support engineering judgement. " +
        "They are not a qualification or a reliability statement for the devices measured. " +
        "Any high-voltage stress measurement follows the lab's safety rules.";

    /// <summary>Builds the report as one HTML string.</summary>
    /// <param name="run">Run information for the header.</param>
    /// <param name="entries">The results, in the order they are listed.</param>
    /// <returns>The complete HTML document.</returns>
    /// <exception cref="ArgumentNullException">An argument or an entry is null.</exception>
    public static string Render(HtmlRunInfo run, IReadOnlyList<HtmlReportEntry> entries)
    {
        ArgumentNullException.ThrowIfNull(run);
        ArgumentNullException.ThrowIfNull(entries);
        foreach (var e in entries)
        {
            ArgumentNullException.ThrowIfNull(e, nameof(entries));
            ArgumentNullException.ThrowIfNull(e.Result, nameof(entries));
        }

        var sb = new StringBuilder(64 * 1024);
        sb.Append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
          .Append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\">\n")
          .Append("<title>").Append(E(run.Title)).Append("</title>\n")
          .Append("<style>\n").Append(Css).Append("</style>\n</head>\n<body>\n");

        AppendHeader(sb, run, entries);
        foreach (var section in run.Sections) AppendExtraSection(sb, section);
        AppendSummary(sb, entries);
        if (run.SummaryNote is not null) sb.Append("<p class=\"hint\">").Append(E(run.SummaryNote)).Append("</p>\n");
        for (int i = 0; i < entries.Count; i++)
        {
            if (entries[i].ShowSection) AppendSection(sb, entries[i], i + 1);
        }

        sb.Append("<footer>").Append(E(run.Title)).Append(" · ").Append(E(run.ToolVersion)).Append("</footer>\n");
        sb.Append("<script>\n").Append(SortScript).Append("</script>\n</body>\n</html>\n");
        return sb.ToString();
    }

    /// <summary>Builds the report and writes it to <paramref name="path"/> atomically (see <see cref="AtomicFile"/>).</summary>
    /// <param name="path">Target file; its directory is created when missing.</param>
    /// <param name="run">Run information for the header.</param>
    /// <param name="entries">The results.</param>
    /// <exception cref="ArgumentNullException">An argument or an entry is null.</exception>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void Write(string path, HtmlRunInfo run, IReadOnlyList<HtmlReportEntry> entries)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        AtomicFile.WriteAllText(path, Render(run, entries));
    }

    // ---- header -------------------------------------------------------------------------------

    private static void AppendHeader(StringBuilder sb, HtmlRunInfo run, IReadOnlyList<HtmlReportEntry> entries)
    {
        int ok = 0, poor = 0, failed = 0;
        foreach (var e in entries)
        {
            switch (e.Result.Status)
            {
                case FitStatus.Ok: ok++; break;
                case FitStatus.PoorFit: poor++; break;
                default: failed++; break;
            }
        }
        sb.Append("<header>\n<h1>").Append(E(run.Title)).Append("</h1>\n<table class=\"run\">\n");
        Row(sb, "Tool", E(run.ToolVersion));
        Row(sb, "Time", E(run.Time.ToString("yyyy-MM-dd HH:mm:ss zzz", Inv)));
        Row(sb, "Model", E(run.Model));
        Row(sb, "Options", string.IsNullOrEmpty(run.OptionsText) ? "—" : "<pre>" + E(run.OptionsText) + "</pre>");
        Row(sb, "Files", string.Create(Inv,
            $"{entries.Count}: <span class=\"st-ok\">{ok} ok</span>, <span class=\"st-poor-fit\">{poor} poor fit</span>, <span class=\"st-failed\">{failed} failed</span>"));
        sb.Append("</table>\n<p class=\"caution\"><strong>Caution.</strong> ").Append(E(CautionText)).Append("</p>\n</header>\n");

        static void Row(StringBuilder sb, string name, string html)
            => sb.Append("<tr><th scope=\"row\">").Append(name).Append("</th><td>").Append(html).Append("</td></tr>\n");
    }

    // ---- summary ------------------------------------------------------------------------------

    private static void AppendSummary(StringBuilder sb, IReadOnlyList<HtmlReportEntry> entries)
    {
        sb.Append("<section id=\"summary\">\n<h2>Summary</h2>\n")
          .Append("<p class=\"hint\">Click a column heading to sort; click again to reverse. Intervals are 95 %.</p>\n")
          .Append("<div class=\"scroll\"><table class=\"summary sortable\">\n<thead><tr>");
        foreach (string h in (string[])["File", "Lot", "Wafer", "Die", "Status", "φ (eV)", "d (nm)", "Area (µm²)", "Reduced χ²", "V<sub>t</sub> (V)", "Warnings"])
        {
            sb.Append("<th scope=\"col\" tabindex=\"0\">").Append(h).Append("</th>");
        }
        sb.Append("</tr></thead>\n<tbody>\n");
        for (int i = 0; i < entries.Count; i++)
        {
            var r = entries[i].Result;
            string status = ResultSchema.StatusText(r.Status);
            sb.Append("<tr>");
            if (entries[i].ShowSection)
            {
                sb.Append("<td class=\"file\"><a href=\"#fit-").Append((i + 1).ToString(Inv)).Append("\">").Append(E(r.SourcePath)).Append("</a></td>");
            }
            else
            {
                sb.Append("<td class=\"file\">").Append(E(r.SourcePath)).Append("</td>");
            }
            sb.Append("<td>").Append(E(r.Lot ?? "")).Append("</td>");
            sb.Append("<td>").Append(E(r.Wafer ?? "")).Append("</td>");
            sb.Append("<td data-sort=\"").Append(DieSortKey(r)).Append("\">").Append(E(SummaryRow.DieText(r))).Append("</td>");
            sb.Append("<td class=\"st-").Append(status).Append("\" data-sort=\"").Append(((int)r.Status).ToString(Inv)).Append("\">")
              .Append(status).Append("</td>");
            QuantityCell(sb, r, SummaryRow.BarrierHeightKey);
            QuantityCell(sb, r, SummaryRow.ThicknessKey);
            QuantityCell(sb, r, SummaryRow.AreaKey);
            NumberCell(sb, r.Quality?.ReducedChiSquare, SummaryRow.ChiText(r));
            NumberCell(sb, r.TransitionVoltageV, SummaryRow.TransitionText(r));
            sb.Append("<td class=\"warn\" data-sort=\"").Append(r.Warnings.Length.ToString(Inv)).Append("\">");
            if (r.Status == FitStatus.Failed && r.Error is not null) sb.Append("<div class=\"error\">error: ").Append(E(r.Error)).Append("</div>");
            foreach (string w in r.Warnings) sb.Append("<div>").Append(E(w)).Append("</div>");
            sb.Append("</td></tr>\n");
        }
        sb.Append("</tbody>\n</table></div>\n</section>\n");
    }

    private static string DieSortKey(FitResult r)
        => r.DieX is null && r.DieY is null ? "" : ((r.DieX ?? 0) * 100000.0 + (r.DieY ?? 0)).ToString("R", Inv);

    private static void QuantityCell(StringBuilder sb, FitResult r, string key)
    {
        if (SummaryRow.Quantity(r, key) is not { } q || r.Status == FitStatus.Failed)
        {
            sb.Append("<td class=\"num\" data-sort=\"\">—</td>");
            return;
        }
        sb.Append("<td class=\"num\" data-sort=\"").Append(SortNumber(q.Value)).Append("\">").Append(E(q.ValueText));
        if (q.IsFixed) sb.Append(" <span class=\"ci\">fixed</span>");
        else if (q.HasInterval) sb.Append(" <span class=\"ci\">[").Append(E(q.Format(q.Lower95!.Value))).Append(", ").Append(E(q.Format(q.Upper95!.Value))).Append("]</span>");
        sb.Append("</td>");
    }

    private static void NumberCell(StringBuilder sb, double? value, string text)
        => sb.Append("<td class=\"num\" data-sort=\"").Append(SortNumber(value)).Append("\">").Append(E(text)).Append("</td>");

    private static string SortNumber(double? x) => x is double v && double.IsFinite(v) ? v.ToString("R", Inv) : "";

    // ---- one fit ------------------------------------------------------------------------------

    private static void AppendExtraSection(StringBuilder sb, HtmlReportSection section)
    {
        string id = new string(section.Id.Where(c => char.IsAsciiLetterOrDigit(c) || c == '-').ToArray());
        sb.Append("<section class=\"extra\" id=\"").Append(id).Append("\">\n<h2>").Append(E(section.Title)).Append("</h2>\n");
        foreach (string p in section.Paragraphs) sb.Append("<p>").Append(E(p)).Append("</p>\n");
        foreach (var table in section.Tables)
        {
            sb.Append("<h3>").Append(E(table.Caption)).Append("</h3>\n<div class=\"scroll\"><table class=\"summary sortable\">\n<thead><tr>");
            foreach (string h in table.Header) sb.Append("<th scope=\"col\" tabindex=\"0\">").Append(E(h)).Append("</th>");
            sb.Append("</tr></thead>\n<tbody>\n");
            for (int r = 0; r < table.Rows.Count; r++)
            {
                sb.Append(table.Highlight.Contains(r) ? "<tr class=\"flagged\">" : "<tr>");
                foreach (string cell in table.Rows[r])
                {
                    bool numeric = double.TryParse(cell, NumberStyles.Float, Inv, out double v) && double.IsFinite(v);
                    sb.Append(numeric ? "<td data-sort=\"" + v.ToString("R", Inv) + "\">" : "<td>").Append(E(cell)).Append("</td>");
                }
                sb.Append("</tr>\n");
            }
            sb.Append("</tbody>\n</table></div>\n");
        }
        if (section.Images.Count > 0)
        {
            sb.Append("<div class=\"gallery\">\n");
            foreach (var image in section.Images)
            {
                sb.Append("<figure><img alt=\"").Append(E(image.Caption)).Append("\" src=\"data:image/png;base64,")
                  .Append(Convert.ToBase64String(image.Png.Span)).Append("\"><figcaption>").Append(E(image.Caption)).Append("</figcaption></figure>\n");
            }
            sb.Append("</div>\n");
        }
        sb.Append("</section>\n");
    }

    private static void AppendSection(StringBuilder sb, HtmlReportEntry entry, int number)
    {
        var r = entry.Result;
        string status = ResultSchema.StatusText(r.Status);
        sb.Append("<section class=\"fit\" id=\"fit-").Append(number.ToString(Inv)).Append("\">\n<h2>")
          .Append(number.ToString(Inv)).Append(". ").Append(E(FitPlotRenderer.FileNameOf(r.SourcePath))).Append("</h2>\n");
        sb.Append("<p class=\"meta\">").Append(E(r.SourcePath)).Append(" · model ").Append(E(r.Model));
        string sub = SummaryRow.DieText(r);
        if (!string.IsNullOrEmpty(r.Lot)) sb.Append(" · lot ").Append(E(r.Lot));
        if (!string.IsNullOrEmpty(r.Wafer)) sb.Append(" · wafer ").Append(E(r.Wafer));
        if (sub.Length > 0) sb.Append(" · die ").Append(E(sub));
        sb.Append(" · <span class=\"badge st-").Append(status).Append("\">").Append(status).Append("</span></p>\n");
        if (r.Error is not null) sb.Append("<p class=\"error\">").Append(E(r.Error)).Append("</p>\n");

        AppendPlot(sb, entry);
        sb.Append("<div class=\"cols\">\n");
        AppendParameters(sb, r);
        AppendQuality(sb, r);
        sb.Append("</div>\n");
        AppendCorrelation(sb, r);
        if (r.ModelValidity is { Length: > 0 } validity)
        {
            sb.Append("<p class=\"validity\"><strong>Model validity:</strong> ").Append(E(validity))
              .Append(r.Warnings.Any(w => w.Contains("range", StringComparison.OrdinalIgnoreCase) || w.Contains("valid", StringComparison.OrdinalIgnoreCase))
                  ? " — the fitted range is outside it in places; see the warnings."
                  : " — the fitted range is inside it.")
              .Append("</p>\n");
        }
        if (r.Warnings.Length > 0)
        {
            sb.Append("<h3>Warnings</h3>\n<ul class=\"warnings\">\n");
            foreach (string w in r.Warnings) sb.Append("<li>").Append(E(w)).Append("</li>\n");
            sb.Append("</ul>\n");
        }
        sb.Append("<p class=\"top\"><a href=\"#summary\">back to the summary</a></p>\n</section>\n");
    }

    private static void AppendPlot(StringBuilder sb, HtmlReportEntry entry)
    {
        ReadOnlyMemory<byte> png = entry.PlotPng;
        string? problem = null;
        if (png.IsEmpty && entry.PlotPath is { Length: > 0 } path)
        {
            try
            {
                png = File.ReadAllBytes(path);
            }
            catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
            {
                problem = $"the plot file {path} could not be read: {ex.Message}";
            }
        }
        if (png.IsEmpty)
        {
            sb.Append("<p class=\"noplot\">").Append(E(problem ?? "no plot for this result")).Append("</p>\n");
            return;
        }
        string alt = $"fit plot of {FitPlotRenderer.FileNameOf(entry.Result.SourcePath)}";
        sb.Append("<figure><img src=\"data:image/png;base64,").Append(Convert.ToBase64String(png.Span))
          .Append("\" alt=\"").Append(E(alt)).Append("\"></figure>\n");
    }

    private static void AppendParameters(StringBuilder sb, FitResult r)
    {
        sb.Append("<div>\n<h3>Parameters</h3>\n");
        if (r.Parameters.Length == 0)
        {
            sb.Append("<p class=\"hint\">no parameters were estimated</p>\n</div>\n");
            return;
        }
        sb.Append("<table class=\"params\">\n<thead><tr><th>Parameter</th><th>Value</th><th>Std. error</th><th>95 % interval</th><th>Unit</th><th>Fixed</th></tr></thead>\n<tbody>\n");
        foreach (var p in r.Parameters)
        {
            var q = DisplayQuantity.From(p);
            sb.Append("<tr><th scope=\"row\">").Append(E(q.Symbol)).Append(" <span class=\"key\">").Append(E(q.Label)).Append("</span></th>")
              .Append("<td class=\"num\">").Append(E(q.IsFixed ? DisplayQuantity.FormatGeneral(q.Value) : q.ValueText)).Append("</td>")
              .Append("<td class=\"num\">").Append(E(q.StandardError is double se ? DisplayQuantity.FormatGeneral(se) : "—")).Append("</td>")
              .Append("<td class=\"num\">").Append(E(q.IntervalText)).Append("</td>")
              .Append("<td>").Append(E(q.Unit)).Append("</td>")
              .Append("<td>").Append(q.IsFixed ? "fixed" : "free").Append("</td></tr>\n");
        }
        sb.Append("</tbody>\n</table>\n</div>\n");
    }

    private static void AppendQuality(StringBuilder sb, FitResult r)
    {
        sb.Append("<div>\n<h3>Fit statistics</h3>\n");
        if (r.Quality is not { } q)
        {
            sb.Append("<p class=\"hint\">the fit stopped before solving, so there are no statistics</p>\n</div>\n");
            return;
        }
        sb.Append("<table class=\"stats\">\n");
        Stat(sb, "Points used", q.PointsUsed.ToString(Inv));
        Stat(sb, "Points masked", q.PointsMasked.ToString(Inv));
        Stat(sb, "Iterations", q.Iterations.ToString(Inv));
        Stat(sb, "Residual sum of squares", DisplayQuantity.FormatGeneral(q.ResidualSumOfSquares));
        Stat(sb, "Reduced χ²", q.ReducedChiSquare is double c ? DisplayQuantity.FormatGeneral(c) : "— (no degrees of freedom)");
        Stat(sb, "Converged", q.Converged ? "yes" : "no");
        Stat(sb, "Stop reason", q.StopReason);
        Stat(sb, "Covariance scaling", q.CovarianceScaling);
        Stat(sb, "Interval method", q.IntervalMethod);
        Stat(sb, "Transition voltage", r.TransitionVoltageV is double vt && double.IsFinite(vt) ? vt.ToString("0.####", Inv) + " V" : "—");
        sb.Append("</table>\n</div>\n");

        static void Stat(StringBuilder sb, string name, string value)
            => sb.Append("<tr><th scope=\"row\">").Append(E(name)).Append("</th><td>").Append(E(value)).Append("</td></tr>\n");
    }

    private static void AppendCorrelation(StringBuilder sb, FitResult r)
    {
        int n = r.CorrelationKeys.Length;
        if (n == 0 || r.CorrelationRowMajor.Length != n * n) return;
        sb.Append("<h3>Correlation of the free parameters</h3>\n<table class=\"corr\">\n<thead><tr><th></th>");
        foreach (string k in r.CorrelationKeys) sb.Append("<th scope=\"col\">").Append(E(SymbolOf(r, k))).Append("</th>");
        sb.Append("</tr></thead>\n<tbody>\n");
        for (int i = 0; i < n; i++)
        {
            sb.Append("<tr><th scope=\"row\">").Append(E(SymbolOf(r, r.CorrelationKeys[i]))).Append("</th>");
            for (int j = 0; j < n; j++)
            {
                double rho = r.CorrelationRowMajor[i * n + j];
                string cls = i == j ? "diag" : Math.Abs(rho) >= StrongCorrelation ? "strong" : Math.Abs(rho) >= 0.7 ? "marked" : "";
                sb.Append("<td class=\"num ").Append(cls).Append("\">").Append(E(double.IsFinite(rho) ? rho.ToString("0.000", Inv) : "—")).Append("</td>");
            }
            sb.Append("</tr>\n");
        }
        sb.Append("</tbody>\n</table>\n")
          .Append("<p class=\"hint\">|ρ| ≥ ").Append(StrongCorrelation.ToString("0.00", Inv))
          .Append(" is shaded dark: those parameters are hard to tell apart with this data.</p>\n");
    }

    private static string SymbolOf(FitResult r, string key) => r.Find(key) is { } p ? p.Symbol : key;

    /// <summary>
    /// HTML-escapes text for element content and quoted attributes with <see cref="WebUtility.HtmlEncode(string)"/>
    /// (&amp; &lt; &gt; " ' and the Latin-1 letters µ ² ± ° as character references, other text as UTF-8, which the
    /// document declares); NUL becomes U+FFFD first.
    /// </summary>
    internal static string E(string? text)
        => string.IsNullOrEmpty(text) ? "" : WebUtility.HtmlEncode(text.Replace('\0', '\uFFFD'));

    // ---- inline assets ------------------------------------------------------------------------

    private const string Css = """
        :root { --ink:#22262b; --muted:#5c636b; --rule:#d5dae0; --panel:#f4f6f9; --blue:#1f5a96; --amber:#b06a00; --red:#b02e2e; --green:#2e7d5b; }
        * { box-sizing: border-box; }
        .gallery { display: flex; flex-wrap: wrap; gap: 12px; }
        .gallery figure { margin: 0; max-width: 48%; }
        .gallery img { max-width: 100%; border: 1px solid var(--rule); }
        .gallery figcaption { color: var(--muted); font-size: 12px; }
        tr.flagged td { background: #fdecec; font-weight: 600; }
        body { margin: 0 auto; max-width: 1180px; padding: 24px 28px 48px; color: var(--ink); background: #fff;
               font: 14px/1.45 system-ui, -apple-system, "Segoe UI", "DejaVu Sans", sans-serif; }
        h1 { font-size: 24px; margin: 0 0 12px; }
        h2 { font-size: 19px; margin: 32px 0 6px; padding-top: 10px; border-top: 2px solid var(--rule); }
        h3 { font-size: 15px; margin: 18px 0 6px; }
        table { border-collapse: collapse; }
        th, td { padding: 4px 9px; border-bottom: 1px solid var(--rule); text-align: left; vertical-align: top; }
        thead th { background: var(--panel); border-bottom: 2px solid var(--rule); }
        td.num { text-align: right; font-variant-numeric: tabular-nums; white-space: nowrap; }
        table.run th { color: var(--muted); font-weight: normal; width: 7em; }
        table.run pre { margin: 0; white-space: pre-wrap; font-size: 13px; }
        .caution { background: #fbf6ea; border-left: 4px solid var(--amber); padding: 8px 12px; max-width: 900px; }
        .hint, .meta, .key, .ci, footer { color: var(--muted); }
        .key { font-size: 12px; }
        .ci { font-size: 12px; }
        .scroll { overflow-x: auto; }
        table.sortable thead th { cursor: pointer; user-select: none; white-space: nowrap; }
        table.sortable thead th[aria-sort="ascending"]::after { content: " ▲"; font-size: 10px; }
        table.sortable thead th[aria-sort="descending"]::after { content: " ▼"; font-size: 10px; }
        table.summary tbody tr:hover { background: #f7f9fb; }
        td.file { word-break: break-all; min-width: 12em; }
        td.warn { font-size: 12.5px; max-width: 26em; }
        .st-ok { color: var(--green); font-weight: 600; }
        .st-poor-fit { color: var(--amber); font-weight: 600; }
        .st-failed { color: var(--red); font-weight: 600; }
        .badge { border: 1px solid currentColor; border-radius: 3px; padding: 0 5px; }
        .error { color: var(--red); font-weight: 600; }
        figure { margin: 10px 0; }
        figure img { max-width: 100%; height: auto; border: 1px solid var(--rule); }
        .cols { display: flex; flex-wrap: wrap; gap: 28px; }
        table.corr td.diag { color: var(--muted); }
        table.corr td.marked { background: #e3ecf6; }
        table.corr td.strong { background: #9fbcd9; font-weight: 600; }
        ul.warnings li { margin: 2px 0; }
        .noplot { color: var(--muted); font-style: italic; }
        p.top { font-size: 12.5px; }
        a { color: var(--blue); }
        footer { margin-top: 40px; font-size: 12px; }
        @media print { .hint, p.top { display: none; } h2 { break-before: auto; } section.fit { break-inside: avoid-page; } }

        """;

    /// <summary>Sorts a table body by the clicked column: numbers from data-sort when present (empty last), otherwise text.</summary>
    private const string SortScript = """
        window.addEventListener('load', function () {
          var imgs = document.images, broken = 0;
          for (var i = 0; i < imgs.length; i++) { if (!imgs[i].complete || imgs[i].naturalWidth === 0) broken++; }
          document.documentElement.setAttribute('data-images', String(imgs.length));
          document.documentElement.setAttribute('data-broken-images', String(broken));
        });
        (function () {
          function key(cell) {
            var s = cell.getAttribute('data-sort');
            if (s === null) return { t: cell.textContent.trim().toLowerCase() };
            return s === '' ? { e: true } : { n: parseFloat(s) };
          }
          function cmp(a, b) {
            if (a.e || b.e) return a.e && b.e ? 0 : a.e ? 1 : -1;
            if (a.n !== undefined && b.n !== undefined) return a.n - b.n;
            return String(a.t).localeCompare(String(b.t));
          }
          document.querySelectorAll('table.sortable').forEach(function (table) {
            var heads = table.tHead.rows[0].cells;
            Array.prototype.forEach.call(heads, function (th, col) {
              function sort() {
                var asc = th.getAttribute('aria-sort') !== 'ascending';
                Array.prototype.forEach.call(heads, function (h) { h.removeAttribute('aria-sort'); });
                th.setAttribute('aria-sort', asc ? 'ascending' : 'descending');
                var body = table.tBodies[0];
                var rows = Array.prototype.slice.call(body.rows).map(function (r, i) { return { r: r, i: i, k: key(r.cells[col]) }; });
                rows.sort(function (x, y) {
                  var c = cmp(x.k, y.k);
                  if (x.k.e || y.k.e) return c || x.i - y.i;
                  return (asc ? c : -c) || x.i - y.i;
                });
                rows.forEach(function (x) { body.appendChild(x.r); });
              }
              th.addEventListener('click', sort);
              th.addEventListener('keydown', function (ev) { if (ev.key === 'Enter' || ev.key === ' ') { ev.preventDefault(); sort(); } });
            });
          });
        })();

        """;
}
