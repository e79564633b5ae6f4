using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Lots;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Legends;
using OxyPlot.Series;

namespace JunctionFit.Reporting;

/// <summary>
/// Individuals control chart of lot medians (a <see cref="ControlChart"/>) as a PNG: the medians in lot order joined
/// by a line, reference lots as open squares, the centre line and the ±3σ control limits as labelled horizontal
/// lines, and medians outside the limits as large red diamonds. Without limits the subtitle gives the reason.
/// Thread safety: every call builds its own plot model.
/// </summary>
public static class TrendChartRenderer
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>A file name for the chart of <paramref name="key"/>: <c>trend-KEY.png</c>.</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>The file name.</returns>
    public static string FileName(string key) => $"trend-{LotPlotSupport.Safe(key)}.png";

    /// <summary>Renders the chart and returns the PNG bytes.</summary>
    /// <param name="chart">The chart numbers from <see cref="DriftAnalysis"/>.</param>
    /// <param name="widthPx">Image width, 160 … 8000 px.</param>
    /// <param name="heightPx">Image height, 160 … 8000 px.</param>
    /// <returns>PNG bytes.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="chart"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A size is out of range.</exception>
    public static byte[] RenderPng(ControlChart chart, int widthPx = 900, int heightPx = 560)
    {
        ArgumentNullException.ThrowIfNull(chart);
        LotPlotSupport.CheckSide(widthPx, nameof(widthPx));
        LotPlotSupport.CheckSide(heightPx, nameof(heightPx));
        return LotPlotSupport.ToPng(BuildModel(chart), widthPx, heightPx);
    }

    /// <summary>Renders the chart and writes it to <paramref name="path"/> atomically.</summary>
    /// <param name="chart">The chart numbers.</param>
    /// <param name="path">Target PNG; its directory is created when missing.</param>
    /// <exception cref="ArgumentException">The path is empty or a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WritePng(ControlChart chart, string path) => AtomicFile.WriteAllBytes(path, RenderPng(chart));

    private static PlotModel BuildModel(ControlChart chart)
    {
        var display = LotPlotSupport.DisplayOf(chart.Key);
        double f = display.Factor;
        int outside = chart.Points.Count(p => p.OutOfControl);
        string subtitle = chart.Basis switch
        {
            ControlLimitBasis.ReferenceLotMedians => "limits: centre ± 3σ, σ = average moving range of reference lot medians / 1.128",
            ControlLimitBasis.ReferenceDies => "limits: centre ± 3σ, σ = average die-to-die moving range of the reference lot / 1.128 (single-die limits)",
            _ => "no control limits: " + (chart.Reason ?? "not enough reference data"),
        };
        if (chart.Basis != ControlLimitBasis.None)
        {
            subtitle += outside == 0 ? "   ·   all lots within limits" : string.Create(Inv, $"   ·   {outside} lot{(outside == 1 ? "" : "s")} outside");
        }
        var model = LotPlotSupport.NewModel($"Lot medians of {display.Name} {display.Symbol} — individuals chart", subtitle);
        model.Legends.Add(new Legend
        {
            LegendPlacement = LegendPlacement.Outside,
            LegendPosition = LegendPosition.BottomCenter,
            LegendOrientation = LegendOrientation.Horizontal,
            LegendBorderThickness = 0,
            LegendFontSize = 10.5,
            LegendItemSpacing = 16,
        });

        var lots = chart.Points.Select(p => p.Lot).ToArray();
        model.Axes.Add(new LinearAxis
        {
            Position = AxisPosition.Bottom,
            Title = "lot (in order)",
            TitleFontSize = 11.5,
            FontSize = 10.5,
            Minimum = -0.5,
            Maximum = Math.Max(lots.Length - 0.5, 0.5),
            MajorStep = 1,
            MinorStep = 1,
            MinorTickSize = 0,
            Angle = lots.Length > 8 ? -35 : 0,
            LabelFormatter = x =>
            {
                int i = (int)Math.Round(x);
                return Math.Abs(x - i) < 1e-9 && i >= 0 && i < lots.Length ? lots[i] : "";
            },
            MajorGridlineStyle = LineStyle.None,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });

        var values = chart.Points.Where(p => p.Median is not null).Select(p => p.Median!.Value * f).ToList();
        if (chart.LowerLimit is double l) values.Add(l * f);
        if (chart.UpperLimit is double u) values.Add(u * f);
        double min = values.Count > 0 ? values.Min() : 0, max = values.Count > 0 ? values.Max() : 1;
        double span = max > min ? max - min : Math.Max(Math.Abs(max) * 0.01, 1e-6);
        model.Axes.Add(new LinearAxis
        {
            Position = AxisPosition.Left,
            Title = $"median {display.AxisTitle}",
            TitleFontSize = 11.5,
            FontSize = 10.5,
            Minimum = min - 0.12 * span,
            Maximum = max + 0.12 * span,
            MajorGridlineStyle = LineStyle.Solid,
            MajorGridlineColor = PlotPalette.Grid,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });

        var line = new LineSeries { Title = "lot median", Color = PlotPalette.Measured, StrokeThickness = 1.6, MarkerType = MarkerType.Circle, MarkerSize = 4.5, MarkerFill = PlotPalette.Measured };
        var reference = new ScatterSeries { Title = "reference lot", MarkerType = MarkerType.Square, MarkerSize = 7, MarkerFill = OxyColors.White, MarkerStroke = PlotPalette.Measured, MarkerStrokeThickness = 2 };
        var alarm = new ScatterSeries { Title = "outside limits", MarkerType = MarkerType.Diamond, MarkerSize = 9, MarkerFill = LotPlotSupport.Alarm, MarkerStroke = OxyColors.White, MarkerStrokeThickness = 1 };
        for (int i = 0; i < chart.Points.Length; i++)
        {
            var p = chart.Points[i];
            if (p.Median is not double m)
            {
                line.Points.Add(DataPoint.Undefined);
                continue;
            }
            line.Points.Add(new DataPoint(i, m * f));
            if (p.IsReference) reference.Points.Add(new ScatterPoint(i, m * f));
            if (p.OutOfControl) alarm.Points.Add(new ScatterPoint(i, m * f));
        }
        model.Series.Add(line);
        if (reference.Points.Count > 0) model.Series.Add(reference);
        if (alarm.Points.Count > 0) model.Series.Add(alarm);

        if (chart.CentreLine is double c) model.Annotations.Add(Horizontal(c * f, $"CL {DisplayQuantity.FormatGeneral(c * f)}", PlotPalette.ZeroLine, LineStyle.Solid));
        if (chart.UpperLimit is double ucl) model.Annotations.Add(Horizontal(ucl * f, $"UCL {DisplayQuantity.FormatGeneral(ucl * f)}", LotPlotSupport.Alarm, LineStyle.Dash));
        if (chart.LowerLimit is double lcl) model.Annotations.Add(Horizontal(lcl * f, $"LCL {DisplayQuantity.FormatGeneral(lcl * f)}", LotPlotSupport.Alarm, LineStyle.Dash));
        return model;
    }

    private static LineAnnotation Horizontal(double y, string label, OxyColor colour, LineStyle style) => new()
    {
        Type = LineAnnotationType.Horizontal,
        Y = y,
        Color = colour,
        StrokeThickness = 1.3,
        LineStyle = style,
        Text = label,
        TextColor = colour,
        FontSize = 10.5,
        TextHorizontalAlignment = HorizontalAlignment.Right,
        TextVerticalAlignment = VerticalAlignment.Bottom,
        Layer = AnnotationLayer.BelowSeries,
    };
}
