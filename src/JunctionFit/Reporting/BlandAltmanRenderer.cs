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
/// Bland–Altman plot of a <see cref="ThicknessComparisonResult"/> as a PNG (Bland &amp; Altman, Lancet 1986):
/// electrical − ellipsometric thickness against their mean, one marker colour per lot, the bias as a solid line
/// with its 95 % interval as a light band, the limits of agreement (bias ± 1.96 SD) as dashed lines, and zero as
/// a thin grey line. Without statistics (fewer than 2 pairs) the points are drawn and the subtitle says why.
/// Thread safety: every call builds its own plot model.
/// </summary>
public static class BlandAltmanRenderer
{
    /// <summary>Default file name.</summary>
    public const string DefaultFileName = "thickness-bland-altman.png";

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly OxyColor[] LotColours =
    [
        PlotPalette.Measured, PlotPalette.Model, OxyColor.FromRgb(0x2E, 0x7D, 0x5B), OxyColor.FromRgb(0x7B, 0x4F, 0x9D),
        OxyColor.FromRgb(0x8C, 0x56, 0x3A), OxyColor.FromRgb(0x3B, 0x8E, 0xA5),
    ];

    /// <summary>Renders the plot and returns the PNG bytes.</summary>
    /// <param name="comparison">The comparison.</param>
    /// <param name="widthPx">Image width, 160 … 8000 px.</param>
    /// <param name="heightPx">Image height, 160 … 8000 px.</param>
    /// <returns>PNG bytes.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="comparison"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A size is out of range.</exception>
    public static byte[] RenderPng(ThicknessComparisonResult comparison, int widthPx = 900, int heightPx = 620)
    {
        ArgumentNullException.ThrowIfNull(comparison);
        LotPlotSupport.CheckSide(widthPx, nameof(widthPx));
        LotPlotSupport.CheckSide(heightPx, nameof(heightPx));
        return LotPlotSupport.ToPng(BuildModel(comparison), widthPx, heightPx);
    }

    /// <summary>Renders the plot and writes it to <paramref name="path"/> atomically.</summary>
    /// <param name="comparison">The comparison.</param>
    /// <param name="path">Target PNG; its directory is created when missing.</param>
    /// <exception cref="ArgumentException">The path is empty or a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WritePng(ThicknessComparisonResult comparison, string path) => AtomicFile.WriteAllBytes(path, RenderPng(comparison));

    private static string Nm(double x) => x.ToString("0.000", Inv);

    private static PlotModel BuildModel(ThicknessComparisonResult c)
    {
        string level = c.Level == ThicknessMatchLevel.Site ? "per site" : "per wafer";
        var a = c.Agreement;
        string subtitle = a is null
            ? $"{level}, n = {c.Pairs.Length.ToString(Inv)}: {c.Reason}"
            : $"{level}, n = {a.N.ToString(Inv)}:  bias {Nm(a.BiasNm)} nm [{Nm(a.BiasLower95Nm)}, {Nm(a.BiasUpper95Nm)}],  limits of agreement {Nm(a.LowerLimitNm)} … {Nm(a.UpperLimitNm)} nm";
        int unmatched = c.UnmatchedResults.Length + c.UnmatchedEllipsometry.Length;
        if (unmatched > 0) subtitle += $"   ·   {unmatched.ToString(Inv)} rows not compared (see the unmatched list)";
        var model = LotPlotSupport.NewModel("Electrical − ellipsometric barrier thickness (Bland–Altman)", subtitle);
        model.Legends.Add(new Legend
        {
            LegendPlacement = LegendPlacement.Outside,
            LegendPosition = LegendPosition.BottomCenter,
            LegendOrientation = LegendOrientation.Horizontal,
            LegendBorderThickness = 0,
            LegendFontSize = 10.5,
            LegendItemSpacing = 16,
        });

        // The y range covers the points and the lines; zero is included only when it is near them, so that a large
        // bias does not squeeze the points into a thin strip (the bias is written on its line).
        var ys = c.Pairs.Select(p => p.DifferenceNm).ToList();
        if (a is not null) ys.AddRange([a.LowerLimitNm, a.UpperLimitNm, a.BiasLower95Nm, a.BiasUpper95Nm]);
        if (ys.Count == 0) ys.Add(0);
        double yMin = ys.Min(), yMax = ys.Max();
        double ySpan = yMax > yMin ? yMax - yMin : 0.1;
        if (yMin - 0.5 * ySpan <= 0 && yMax + 0.5 * ySpan >= 0)
        {
            yMin = Math.Min(yMin, 0);
            yMax = Math.Max(yMax, 0);
            ySpan = yMax > yMin ? yMax - yMin : 0.1;
        }
        var xs = c.Pairs.Select(p => p.MeanNm).ToList();
        double xMin = xs.Count > 0 ? xs.Min() : 0, xMax = xs.Count > 0 ? xs.Max() : 1;
        double xSpan = xMax > xMin ? xMax - xMin : Math.Max(0.05 * Math.Abs(xMax), 0.1);
        model.Axes.Add(new LinearAxis
        {
            Position = AxisPosition.Bottom,
            Title = "mean of electrical and ellipsometric d  (nm)",
            TitleFontSize = 11.5,
            FontSize = 10.5,
            Minimum = xMin - 0.22 * xSpan,
            Maximum = xMax + 0.22 * xSpan,
            MajorGridlineStyle = LineStyle.Solid,
            MajorGridlineColor = PlotPalette.Grid,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });
        model.Axes.Add(new LinearAxis
        {
            Position = AxisPosition.Left,
            Title = "electrical − ellipsometric d  (nm)",
            TitleFontSize = 11.5,
            FontSize = 10.5,
            Minimum = yMin - 0.15 * ySpan,
            Maximum = yMax + 0.15 * ySpan,
            MajorGridlineStyle = LineStyle.Solid,
            MajorGridlineColor = PlotPalette.Grid,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });

        if (a is not null)
        {
            model.Annotations.Add(new RectangleAnnotation
            {
                MinimumY = a.BiasLower95Nm,
                MaximumY = a.BiasUpper95Nm,
                Fill = OxyColor.FromAColor(40, PlotPalette.Measured),
                Layer = AnnotationLayer.BelowSeries,
            });
            model.Annotations.Add(Horizontal(a.BiasNm, $"bias {Nm(a.BiasNm)} nm", PlotPalette.Measured, LineStyle.Solid, 1.8));
            model.Annotations.Add(Horizontal(a.UpperLimitNm, $"bias + 1.96 SD  {Nm(a.UpperLimitNm)} nm", PlotPalette.StatusPoor, LineStyle.Dash, 1.4));
            var lowerLine = Horizontal(a.LowerLimitNm, $"bias − 1.96 SD  {Nm(a.LowerLimitNm)} nm", PlotPalette.StatusPoor, LineStyle.Dash, 1.4);
            lowerLine.TextVerticalAlignment = VerticalAlignment.Top;
            model.Annotations.Add(lowerLine);
        }
        if (yMin <= 0 && yMax >= 0) model.Annotations.Add(Horizontal(0, "zero", PlotPalette.Masked, LineStyle.Solid, 1.0));

        var lots = c.Pairs.Select(p => p.Lot).Distinct(StringComparer.Ordinal).ToList();
        for (int k = 0; k < lots.Count; k++)
        {
            // Open markers of a different shape and size per lot, so that coinciding wafers stay visible.
            MarkerType[] shapes = [MarkerType.Circle, MarkerType.Square, MarkerType.Diamond, MarkerType.Triangle];
            var colour = LotColours[k % LotColours.Length];
            var series = new ScatterSeries
            {
                Title = $"lot {lots[k]}",
                MarkerType = shapes[k % shapes.Length],
                MarkerSize = (c.Level == ThicknessMatchLevel.Site ? 3.5 : 5.5) + 2.0 * (k % shapes.Length),
                MarkerFill = OxyColors.Transparent,
                MarkerStroke = colour,
                MarkerStrokeThickness = 1.6,
            };
            foreach (var p in c.Pairs.Where(p => string.Equals(p.Lot, lots[k], StringComparison.Ordinal)))
            {
                series.Points.Add(new ScatterPoint(p.MeanNm, p.DifferenceNm));
            }
            model.Series.Add(series);
        }
        return model;
    }

    private static LineAnnotation Horizontal(double y, string label, OxyColor colour, LineStyle style, double thickness) => new()
    {
        Type = LineAnnotationType.Horizontal,
        Y = y,
        Color = colour,
        StrokeThickness = thickness,
        LineStyle = style,
        Text = label,
        TextColor = colour,
        FontSize = 10.5,
        // Labels in the middle of the lines: points cluster at the ends of the thickness range.
        TextLinePosition = 0.5,
        TextHorizontalAlignment = HorizontalAlignment.Center,
        TextVerticalAlignment = VerticalAlignment.Bottom,
        Layer = AnnotationLayer.BelowSeries,
    };
}
