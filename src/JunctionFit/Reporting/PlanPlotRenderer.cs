using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Planning;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Legends;
using OxyPlot.Series;

namespace JunctionFit.Reporting;

/// <summary>
/// The trade-off behind a recommended sweep as a PNG: the predicted (worst-case) 95 % half-width of each focus parameter,
/// relative to its nominal value, against the largest bias of the sweep, on a log scale; the bias limit (from
/// <c>--max-bias</c> and <c>--max-field</c>), the bias at which the compliance is reached, the proposed sweep's largest bias
/// and the recommendation as vertical lines; relative targets as horizontal lines. Candidates that do not identify the
/// parameters leave a gap. Thread safety: every call builds its own plot model.
/// </summary>
public static class PlanPlotRenderer
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly OxyColor[] SeriesColours =
        [PlotPalette.Measured, PlotPalette.Model, PlotPalette.StatusOk, OxyColor.FromRgb(0x7B, 0x4F, 0x9D)];

    /// <summary>Renders the plot and returns the PNG bytes.</summary>
    /// <param name="plan">A plan with a bias scan.</param>
    /// <param name="request">The request it answers (limits, targets, proposed sweep).</param>
    /// <param name="widthPx">Image width, 160 … 8000 px.</param>
    /// <param name="heightPx">Image height, 160 … 8000 px.</param>
    /// <returns>PNG bytes.</returns>
    /// <exception cref="ArgumentException">The plan has no bias scan (no limit was given).</exception>
    public static byte[] RenderPng(MeasurementPlan plan, PlanRequest request, int widthPx = 900, int heightPx = 600)
    {
        ArgumentNullException.ThrowIfNull(plan);
        ArgumentNullException.ThrowIfNull(request);
        if (plan.Scan.IsDefaultOrEmpty) throw new ArgumentException("the plan has no bias scan (give a bias or field limit)", nameof(plan));
        LotPlotSupport.CheckSide(widthPx, nameof(widthPx));
        LotPlotSupport.CheckSide(heightPx, nameof(heightPx));
        return LotPlotSupport.ToPng(BuildModel(plan, request), widthPx, heightPx);
    }

    /// <summary>Renders the plot and writes it to <paramref name="path"/> atomically.</summary>
    /// <param name="plan">A plan with a bias scan.</param>
    /// <param name="request">The request it answers.</param>
    /// <param name="path">Target PNG; its directory is created when missing.</param>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WritePng(MeasurementPlan plan, PlanRequest request, string path) => AtomicFile.WriteAllBytes(path, RenderPng(plan, request));

    private static PlotModel BuildModel(MeasurementPlan plan, PlanRequest request)
    {
        var scan = plan.Scan;
        int points = scan[0].Points;
        string grid = scan[0].Prediction.GridPoints > 1 ? $", worst case over {scan[0].Prediction.GridPoints.ToString(Inv)} nominal points" : "";
        var model = LotPlotSupport.NewModel("Predicted 95 % half-width against the largest bias",
            $"{request.Setup.Model.Barrier.Name}, {points.ToString(Inv)} points per sweep, noise {(request.Setup.RelativeNoise * 100).ToString("0.###", Inv)} %{grid}");
        model.Legends.Add(new Legend
        {
            LegendPlacement = LegendPlacement.Outside,
            LegendPosition = LegendPosition.BottomCenter,
            LegendOrientation = LegendOrientation.Horizontal,
            LegendBorderThickness = 0,
            LegendFontSize = 10.5,
        });
        double xMax = plan.BiasLimitV ?? scan[^1].MaxBiasV;
        if (plan.Proposed is { } p) xMax = Math.Max(xMax, p.MaxAbsVoltageV);
        model.Axes.Add(new LinearAxis
        {
            Position = AxisPosition.Bottom,
            Title = "largest |bias| of the sweep  (V)",
            Minimum = 0,
            Maximum = xMax * 1.05,
            MajorGridlineStyle = LineStyle.Solid,
            MajorGridlineColor = PlotPalette.Grid,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });
        model.Axes.Add(new LogarithmicAxis
        {
            Position = AxisPosition.Left,
            Title = "predicted 95 % half-width / nominal value  (%)",
            MajorGridlineStyle = LineStyle.Solid,
            MajorGridlineColor = PlotPalette.Grid,
            MinorGridlineStyle = LineStyle.None,
            IsZoomEnabled = false,
            IsPanEnabled = false,
        });
        double yMin = double.PositiveInfinity, yMax = 0;
        for (int k = 0; k < plan.FocusKeys.Length; k++)
        {
            string key = plan.FocusKeys[k];
            var display = LotPlotSupport.DisplayOf(key);
            var line = new LineSeries
            {
                Title = display.Symbol,
                Color = SeriesColours[k % SeriesColours.Length],
                StrokeThickness = 2,
                MarkerType = MarkerType.Circle,
                MarkerSize = 2.5,
                MarkerFill = SeriesColours[k % SeriesColours.Length],
            };
            foreach (var s in scan)
            {
                double? rel = s.Prediction.IsIdentifiable ? s.Prediction.RelativeHalfWidth(key) : null;
                if (rel is double r && r > 0 && double.IsFinite(r))
                {
                    line.Points.Add(new DataPoint(s.MaxBiasV, 100 * r));
                    yMin = Math.Min(yMin, 100 * r);
                    yMax = Math.Max(yMax, 100 * r);
                }
                else
                {
                    line.Points.Add(DataPoint.Undefined);
                }
            }
            model.Series.Add(line);
        }
        foreach (var target in request.Targets)
        {
            var w = scan[0].Prediction;
            double centre = w.CenterValues.TryGetValue(target.Key, out double c) ? Math.Abs(c) : 0;
            double pct = target.IsRelative ? 100 * target.Value : centre > 0 ? 100 * target.Value / centre : double.NaN;
            if (!(pct > 0) || !double.IsFinite(pct)) continue;
            yMin = Math.Min(yMin, pct);
            yMax = Math.Max(yMax, pct);
            model.Annotations.Add(new LineAnnotation
            {
                Type = LineAnnotationType.Horizontal,
                Y = pct,
                Color = PlotPalette.StatusOk,
                LineStyle = LineStyle.Dash,
                StrokeThickness = 1.4,
                Text = $"target {LotPlotSupport.DisplayOf(target.Key).Symbol} {pct.ToString("0.###", Inv)} %",
                TextColor = PlotPalette.StatusOk,
                FontSize = 10.5,
                TextHorizontalAlignment = HorizontalAlignment.Left,
                TextLinePosition = 0.02,
            });
        }
        if (yMax > 0)
        {
            model.Axes[1].Minimum = yMin / 1.6;
            model.Axes[1].Maximum = yMax * 1.6;
        }
        if (plan.BiasLimitV is double limit)
        {
            string what = request.MaxFieldVPerM is double f && plan.FieldThicknessNm is double d && (request.MaxBiasV is not double b || f * d * 1e-9 <= b)
                ? $"field limit {(f / 1e8).ToString("0.##", Inv)} MV/cm × {d.ToString("0.###", Inv)} nm = {limit.ToString("0.###", Inv)} V"
                : $"bias limit {limit.ToString("0.###", Inv)} V";
            model.Annotations.Add(Vertical(limit, what, PlotPalette.StatusFailed, LineStyle.Solid, 0.95));
        }
        if (plan.ComplianceBiasV is double cv) model.Annotations.Add(Vertical(cv, $"compliance reached at {cv.ToString("0.###", Inv)} V", PlotPalette.StatusPoor, LineStyle.Dash, 0.75));
        if (plan.Proposed is { } proposed) model.Annotations.Add(Vertical(proposed.MaxAbsVoltageV, $"proposed {proposed.MaxAbsVoltageV.ToString("0.###", Inv)} V", PlotPalette.Masked, LineStyle.Dot, 0.55));
        if (plan.Recommendation is { } rec) model.Annotations.Add(Vertical(rec.MaxBiasV, $"recommended {rec.MaxBiasV.ToString("0.###", Inv)} V", PlotPalette.StatusOk, LineStyle.Solid, 0.35));
        return model;
    }

    private static LineAnnotation Vertical(double x, string label, OxyColor colour, LineStyle style, double position) => new()
    {
        Type = LineAnnotationType.Vertical,
        X = x,
        Color = colour,
        StrokeThickness = 1.6,
        LineStyle = style,
        Text = label,
        TextColor = colour,
        FontSize = 10.5,
        TextLinePosition = position,
        TextOrientation = AnnotationTextOrientation.Vertical,
        TextHorizontalAlignment = HorizontalAlignment.Right,
        Layer = AnnotationLayer.BelowSeries,
    };
}
