using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Results;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;
using OxyPlot.Legends;
using OxyPlot.Series;
using OxyPlot.SkiaSharp;
using SkiaSharp;

namespace JunctionFit.Reporting;

/// <summary>
/// Renders one <see cref="FitResult"/> as a PNG figure:
/// <list type="bullet">
/// <item>a title with the file name and the model, and a line with lot, wafer, die and status;</item>
/// <item>the upper panel, log₁₀|I| (I in A) against the bias V (V): points used by the fit as filled circles,
/// masked points as light crosses, the fitted model as a line;</item>
/// <item>the lower panel, the residual ln|I_meas| − ln|I_model| against V with a dashed zero line;</item>
/// <item>a box beside the panels with the fitted values and their 95 % intervals in display units
/// (φ in eV, d in nm, area in µm², m*/mₑ), "fixed" where a parameter was held, the reduced χ², the
/// transition voltage and the status.</item>
/// </list>
/// <para>
/// A result without a <see cref="FitResult.Curve"/> (a fit that failed before solving) is not refused: it is
/// drawn as a short banner, <c>widthPx</c> wide and at most 160 px high, that names the file and states the
/// error, so a report always has a picture per file.
/// </para>
/// <para>
/// Thread safety: every call builds its own plot model, render context and bitmap; the class holds only
/// immutable colours. Calls may run in parallel.
/// </para>
/// </summary>
public static class FitPlotRenderer
{
    /// <summary>Smallest accepted image side in pixels.</summary>
    public const int MinimumSidePx = 120;

    /// <summary>Largest accepted image side in pixels.</summary>
    public const int MaximumSidePx = 8000;

    /// <summary>Height cap of the banner drawn for a result without curve data.</summary>
    public const int FailureBannerMaxHeightPx = 160;

    private const string UpperAxisKey = "logI";
    private const string LowerAxisKey = "residual";
    private const double ReferenceWidth = 900;
    private const double ReferenceHeight = 700;
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Renders the figure for <paramref name="result"/> and returns the PNG file content.</summary>
    /// <param name="result">The fit to draw.</param>
    /// <param name="widthPx">Image width in pixels, 120 … 8000.</param>
    /// <param name="heightPx">Image height in pixels, 120 … 8000 (a failure banner is at most 160 px high).</param>
    /// <returns>PNG bytes.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException">A size is outside 120 … 8000.</exception>
    /// <exception cref="ArgumentException">The curve's arrays differ in length.</exception>
    public static byte[] RenderPng(FitResult result, int widthPx = 900, int heightPx = 700)
    {
        ArgumentNullException.ThrowIfNull(result);
        Guard.InRange(widthPx, MinimumSidePx, MaximumSidePx);
        Guard.InRange(heightPx, MinimumSidePx, MaximumSidePx);
        if (result.Curve is { } curve) CheckCurve(curve);
        else heightPx = Math.Min(heightPx, FailureBannerMaxHeightPx);

        using var bitmap = new SKBitmap(new SKImageInfo(widthPx, heightPx, SKColorType.Rgba8888, SKAlphaType.Premul));
        using (var canvas = new SKCanvas(bitmap))
        using (var rc = new SkiaRenderContext { RenderTarget = RenderTarget.PixelGraphic, SkCanvas = canvas, UseTextShaping = false })
        {
            canvas.Clear(SKColors.White);
            // Everything is laid out on a 900 × 700 reference page and scaled, so text keeps its proportion.
            // Below about 0.75 the text would be too small to read, so small images get a tighter layout instead.
            double scale = Math.Clamp(Math.Min(widthPx / ReferenceWidth, heightPx / ReferenceHeight), 0.75, 4.0);
            if (result.Curve is null) scale = Math.Clamp(widthPx / ReferenceWidth, 0.75, 4.0);
            rc.DpiScale = (float)scale;
            var page = new OxyRect(0, 0, widthPx / scale, heightPx / scale);
            if (result.Curve is { } c) DrawFigure(rc, page, result, c);
            else DrawFailureBanner(rc, page, result);
        }
        using var pixmap = bitmap.PeekPixels();
        using var data = pixmap.Encode(new SKPngEncoderOptions(SKPngEncoderFilterFlags.Sub, zLibLevel: 4))
            ?? throw new InvalidOperationException("the PNG encoder returned no data");
        return data.ToArray();
    }

    /// <summary>Renders the figure and writes it to <paramref name="path"/> atomically (see <see cref="AtomicFile"/>).</summary>
    /// <param name="result">The fit to draw.</param>
    /// <param name="path">Target PNG file; its directory is created when missing.</param>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    /// <exception cref="ArgumentException"><paramref name="path"/> is empty or names a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WritePng(FitResult result, string path)
    {
        ArgumentNullException.ThrowIfNull(result);
        ArgumentException.ThrowIfNullOrWhiteSpace(path);
        AtomicFile.WriteAllBytes(path, RenderPng(result));
    }


    private static void CheckCurve(CurveSnapshot curve)
    {
        int n = curve.VoltageV.Length;
        if (curve.MeasuredCurrentA.Length != n || curve.ModelCurrentA.Length != n || curve.Used.Length != n || curve.LogResidual.Length != n)
        {
            throw new ArgumentException("the curve's voltage, current, model, used and residual arrays must have the same length", nameof(curve));
        }
    }

    // ---- figure -------------------------------------------------------------------------------

    private const double Margin = 14;

    private static void DrawFigure(IRenderContext rc, OxyRect page, FitResult result, CurveSnapshot curve)
    {
        double top = DrawTitle(rc, page, result);
        double sideWidth = Math.Clamp(page.Width * 0.29, 200, 300);
        var plotRect = new OxyRect(0, top, Math.Max(page.Width - sideWidth, 100), Math.Max(page.Height - top, 80));
        IPlotModel model = BuildPlotModel(result, curve);
        model.Update(true);
        model.Render(rc, plotRect);
        if (model is PlotModel laidOut) FramePanels(rc, laidOut);

        // The box starts level with the upper panel's top edge once the plot has been laid out.
        double boxTop = top + 6;
        if (model is PlotModel pm && pm.PlotArea.Height > 0) boxTop = pm.PlotArea.Top;
        var box = new OxyRect(plotRect.Right + 4, boxTop, Math.Max(page.Width - plotRect.Right - 4 - Margin, 60), 0);
        DrawParameterBox(rc, box, page.Bottom - Margin, result);
    }

    /// <summary>
    /// The two panels share one bias axis, so its grid lines would run through the gap between them:
    /// paint the gap white and draw a thin frame around each panel.
    /// </summary>
    private static void FramePanels(IRenderContext rc, PlotModel model)
    {
        Axis? upper = null, lower = null;
        foreach (var axis in model.Axes)
        {
            if (axis.Key == UpperAxisKey) upper = axis;
            else if (axis.Key == LowerAxisKey) lower = axis;
        }
        if (upper is null || lower is null) return;
        double left = model.PlotArea.Left, right = model.PlotArea.Right;
        double upperTop = Math.Min(upper.ScreenMin.Y, upper.ScreenMax.Y), upperBottom = Math.Max(upper.ScreenMin.Y, upper.ScreenMax.Y);
        double lowerTop = Math.Min(lower.ScreenMin.Y, lower.ScreenMax.Y), lowerBottom = Math.Max(lower.ScreenMin.Y, lower.ScreenMax.Y);
        if (!(lowerTop > upperBottom) || !(right > left)) return;
        rc.DrawRectangle(new OxyRect(left + 1, upperBottom + 1, right - left, lowerTop - upperBottom - 2),
            PlotPalette.Background, OxyColors.Undefined, 0, EdgeRenderingMode.PreferSharpness);
        rc.DrawRectangle(new OxyRect(left, upperTop, right - left, upperBottom - upperTop),
            OxyColors.Undefined, PlotPalette.PanelBorder, 1, EdgeRenderingMode.PreferSharpness);
        rc.DrawRectangle(new OxyRect(left, lowerTop, right - left, lowerBottom - lowerTop),
            OxyColors.Undefined, PlotPalette.PanelBorder, 1, EdgeRenderingMode.PreferSharpness);
    }

    /// <summary>Draws the two title lines; returns the y where the content starts.</summary>
    private static double DrawTitle(IRenderContext rc, OxyRect page, FitResult result)
    {
        double maxWidth = page.Width - 2 * Margin;
        string title = $"{FileNameOf(result.SourcePath)}  —  {result.Model} model";
        title = Ellipsize(rc, title, 15, FontWeights.Bold, maxWidth);
        rc.DrawText(new ScreenPoint(Margin, Margin), title, PlotPalette.Text, PlotPalette.Font, 15, FontWeights.Bold);

        string sub = Ellipsize(rc, SubtitleOf(result), 11, FontWeights.Normal, maxWidth);
        rc.DrawText(new ScreenPoint(Margin, Margin + 22), sub, PlotPalette.MutedText, PlotPalette.Font, 11, FontWeights.Normal);
        return Margin + 40;
    }

    internal static string SubtitleOf(FitResult result)
    {
        var parts = new List<string>(5);
        if (!string.IsNullOrWhiteSpace(result.Lot)) parts.Add($"lot {result.Lot}");
        if (!string.IsNullOrWhiteSpace(result.Wafer)) parts.Add($"wafer {result.Wafer}");
        if (result.DieX is int x && result.DieY is int y) parts.Add(string.Create(Inv, $"die ({x}, {y})"));
        else if (result.DieX is int x1) parts.Add(string.Create(Inv, $"die x {x1}"));
        else if (result.DieY is int y1) parts.Add(string.Create(Inv, $"die y {y1}"));
        parts.Add($"status: {ResultSchema.StatusText(result.Status)}");
        if (result.Warnings.Length > 0) parts.Add(result.Warnings.Length == 1 ? "1 warning" : $"{result.Warnings.Length} warnings");
        return string.Join("   ·   ", parts);
    }

    private static PlotModel BuildPlotModel(FitResult result, CurveSnapshot curve)
    {
        var model = NewPlotModel();
        var (upperMinimum, below) = UpperMinimum(curve);
        var (limit, clipped) = ResidualLimit(curve);
        model.Axes.Add(BiasAxis());
        model.Axes.Add(CurrentAxis(upperMinimum));
        model.Axes.Add(ResidualAxis(limit));
        AddPointSeries(model, result, curve, upperMinimum, limit, below + clipped);
        model.Annotations.Add(new LineAnnotation
        {
            Type = LineAnnotationType.Horizontal,
            Y = 0,
            YAxisKey = LowerAxisKey,
            Color = PlotPalette.ZeroLine,
            StrokeThickness = 1.1,
            LineStyle = LineStyle.Dash,
            Layer = AnnotationLayer.BelowSeries,
        });
        return model;
    }

    /// <summary>The empty model: colours, fonts, padding and the legend above the panels.</summary>
    private static PlotModel NewPlotModel()
    {
        var model = new PlotModel
        {
            Background = PlotPalette.Background,
            DefaultFont = PlotPalette.Font,
            DefaultFontSize = 11,
            TextColor = PlotPalette.Text,
            PlotAreaBorderThickness = new OxyThickness(0),
            Padding = new OxyThickness(Margin, 4, 12, Margin),
            TitleFontSize = 0,
        };
        model.Legends.Add(new Legend
        {
            LegendPlacement = LegendPlacement.Outside,
            LegendPosition = LegendPosition.TopCenter,
            LegendOrientation = LegendOrientation.Horizontal,
            LegendFont = PlotPalette.Font,
            LegendFontSize = 11,
            LegendTextColor = PlotPalette.Text,
            LegendBackground = OxyColors.Undefined,
            LegendBorderThickness = 0,
            LegendItemSpacing = 18,
            LegendMargin = 2,
            LegendPadding = 2,
            LegendSymbolLength = 22,
        });
        return model;
    }

    /// <summary>A linear axis in the plot's style: solid axis line, grid, no zoom or pan.</summary>
    private static LinearAxis StyledAxis(AxisPosition position, string title) => new()
    {
        Position = position,
        Title = title,
        TitleFontSize = 11.5,
        FontSize = 10.5,
        AxislineStyle = LineStyle.Solid,
        AxislineColor = PlotPalette.Axis,
        TicklineColor = PlotPalette.Axis,
        MajorGridlineStyle = LineStyle.Solid,
        MajorGridlineColor = PlotPalette.Grid,
        IsZoomEnabled = false,
        IsPanEnabled = false,
    };

    private static LinearAxis BiasAxis()
    {
        var axis = StyledAxis(AxisPosition.Bottom, "bias V  (V)");
        axis.MinimumPadding = 0.03;
        axis.MaximumPadding = 0.03;
        return axis;
    }

    /// <summary>The upper panel, log₁₀ |I|; cut at <paramref name="minimum"/> when masked points lie far below the fit.</summary>
    private static LinearAxis CurrentAxis(double? minimum)
    {
        var axis = StyledAxis(AxisPosition.Left, "log₁₀ |I|   (I in A)");
        axis.Key = UpperAxisKey;
        axis.Minimum = minimum ?? double.NaN;
        axis.StartPosition = 0.36;
        axis.EndPosition = 1.0;
        axis.MinimumPadding = 0.04;
        axis.MaximumPadding = 0.06;
        return axis;
    }

    /// <summary>The lower panel, the log residuals within ±<paramref name="limit"/>.</summary>
    private static LinearAxis ResidualAxis(double limit)
    {
        var axis = StyledAxis(AxisPosition.Left, "ln|I| − ln|I_model|");
        axis.Key = LowerAxisKey;
        axis.StartPosition = 0.0;
        axis.EndPosition = 0.25;
        axis.Minimum = -limit;
        axis.Maximum = limit;
        axis.MaximumRange = double.MaxValue;
        return axis;
    }

    private enum Marker { Fitted, Masked, OffScale }

    /// <summary>Markers of one kind on one panel: filled circles (fitted), crosses (masked), open triangles (off scale).</summary>
    private static ScatterSeries Markers(Marker kind, string axisKey, string? title = null) => kind switch
    {
        Marker.Fitted => new ScatterSeries
        {
            Title = title, MarkerType = MarkerType.Circle, MarkerSize = 2.6, MarkerFill = PlotPalette.Measured, MarkerStrokeThickness = 0, YAxisKey = axisKey,
        },
        Marker.Masked => new ScatterSeries
        {
            Title = title, MarkerType = MarkerType.Cross, MarkerSize = 3.4, MarkerStroke = PlotPalette.Masked, MarkerStrokeThickness = 1.2, YAxisKey = axisKey,
        },
        _ => new ScatterSeries
        {
            Title = title, MarkerType = MarkerType.Triangle, MarkerSize = 3.6, MarkerFill = OxyColors.Undefined, MarkerStroke = PlotPalette.ZeroLine,
            MarkerStrokeThickness = 1.1, YAxisKey = axisKey,
        },
    };

    /// <summary>
    /// The measured points (fitted, masked, off scale) on both panels and the model line on the upper one. Points beyond a
    /// panel's edge are drawn just inside it as open triangles, so nothing disappears silently.
    /// </summary>
    private static void AddPointSeries(PlotModel model, FitResult result, CurveSnapshot curve, double? upperMinimum, double limit, int offScale)
    {
        int n = curve.VoltageV.Length;
        int usedCount = 0;
        for (int i = 0; i < n; i++) if (curve.Used[i]) usedCount++;

        var masked = Markers(Marker.Masked, UpperAxisKey, $"masked ({n - usedCount})");
        var used = Markers(Marker.Fitted, UpperAxisKey, $"measured ({usedCount} fitted)");
        var residualMasked = Markers(Marker.Masked, LowerAxisKey);
        var residualUsed = Markers(Marker.Fitted, LowerAxisKey);
        var edge = Markers(Marker.OffScale, UpperAxisKey, string.Create(Inv, $"off scale ({offScale})"));
        var edgeResidual = Markers(Marker.OffScale, LowerAxisKey);
        for (int i = 0; i < n; i++)
        {
            double v = curve.VoltageV[i];
            if (!double.IsFinite(v)) continue;
            double logI = Log10Abs(curve.MeasuredCurrentA[i]);
            double r = curve.LogResidual[i];
            bool isUsed = curve.Used[i];
            if (double.IsFinite(logI))
            {
                if (upperMinimum is double lowest && logI < lowest) edge.Points.Add(new ScatterPoint(v, lowest + 0.05));
                else (isUsed ? used : masked).Points.Add(new ScatterPoint(v, logI));
            }
            if (double.IsFinite(r))
            {
                if (Math.Abs(r) <= limit) (isUsed ? residualUsed : residualMasked).Points.Add(new ScatterPoint(v, r));
                else edgeResidual.Points.Add(new ScatterPoint(v, Math.CopySign(0.95 * limit, r)));
            }
        }

        var line = new LineSeries
        {
            Title = $"model ({result.Model})",
            Color = PlotPalette.Model,
            StrokeThickness = 2.0,
            YAxisKey = UpperAxisKey,
            LineJoin = LineJoin.Round,
        };
        foreach (var p in ModelLine(curve)) line.Points.Add(p);

        model.Series.Add(used);
        if (usedCount < n) model.Series.Add(masked); // listed even when all masked points are off scale
        model.Series.Add(line);
        if (offScale > 0) model.Series.Add(edge);
        model.Series.Add(residualMasked);
        if (edgeResidual.Points.Count > 0) model.Series.Add(edgeResidual);
        model.Series.Add(residualUsed);
    }

    /// <summary>Decades shown below the lowest fitted point before masked points are cut off.</summary>
    internal const double DecadesBelowFitted = 1.0;

    /// <summary>
    /// Lower end of the upper panel: masked points at the noise floor (around zero bias) can lie many decades
    /// below the fitted data and would squash it, so the axis stops one decade below the lowest fitted point
    /// and the points beyond are drawn on that edge. Null when nothing needs cutting.
    /// </summary>
    internal static (double? Minimum, int Below) UpperMinimum(CurveSnapshot curve)
    {
        double minUsed = double.PositiveInfinity;
        for (int i = 0; i < curve.MeasuredCurrentA.Length; i++)
        {
            double y = Log10Abs(curve.MeasuredCurrentA[i]);
            if (curve.Used[i] && double.IsFinite(y)) minUsed = Math.Min(minUsed, y);
        }
        if (!double.IsFinite(minUsed)) return (null, 0);
        double cut = minUsed - DecadesBelowFitted;
        int below = 0;
        for (int i = 0; i < curve.MeasuredCurrentA.Length; i++)
        {
            double y = Log10Abs(curve.MeasuredCurrentA[i]);
            if (double.IsFinite(y) && y < cut) below++;
        }
        return below > 0 ? (cut, below) : (null, 0);
    }

    /// <summary>
    /// Half-range of the residual panel: the largest |residual| among fitted points plus a margin, at least 0.05.
    /// Masked points can sit far off (noise floor, compliance); those beyond the range are counted and drawn on the edge.
    /// </summary>
    internal static (double Limit, int Clipped) ResidualLimit(CurveSnapshot curve)
    {
        double max = 0;
        bool any = false;
        for (int i = 0; i < curve.LogResidual.Length; i++)
        {
            double r = curve.LogResidual[i];
            if (!curve.Used[i] || !double.IsFinite(r)) continue;
            any = true;
            max = Math.Max(max, Math.Abs(r));
        }
        if (!any)
        {
            for (int i = 0; i < curve.LogResidual.Length; i++)
            {
                double r = curve.LogResidual[i];
                if (double.IsFinite(r)) max = Math.Max(max, Math.Abs(r));
            }
        }
        double limit = Math.Max(max * 1.2, 0.05);
        int clipped = 0;
        for (int i = 0; i < curve.LogResidual.Length; i++)
        {
            double r = curve.LogResidual[i];
            if (double.IsFinite(r) && Math.Abs(r) > limit) clipped++;
        }
        return (limit, clipped);
    }

    /// <summary>The model sorted by bias (sweeps may run up and back), broken where |I_model| has no logarithm.</summary>
    private static List<DataPoint> ModelLine(CurveSnapshot curve)
    {
        int n = curve.VoltageV.Length;
        var v = new double[n];
        var y = new double[n];
        int m = 0;
        for (int i = 0; i < n; i++)
        {
            if (!double.IsFinite(curve.VoltageV[i])) continue;
            v[m] = curve.VoltageV[i];
            y[m] = Log10Abs(curve.ModelCurrentA[i]);
            m++;
        }
        Array.Sort(v, y, 0, m);
        var points = new List<DataPoint>(m);
        for (int i = 0; i < m; i++)
        {
            points.Add(double.IsFinite(y[i]) ? new DataPoint(v[i], y[i]) : DataPoint.Undefined);
        }
        return points;
    }

    private static double Log10Abs(double current) => current == 0 || !double.IsFinite(current) ? double.NaN : Math.Log10(Math.Abs(current));

    // ---- parameter box ------------------------------------------------------------------------

    /// <summary>One line of the parameter box.</summary>
    internal readonly record struct BoxLine(string Text, BoxLineKind Kind);

    /// <summary>How a line of the parameter box is drawn.</summary>
    internal enum BoxLineKind
    {
        /// <summary>Box heading.</summary>
        Heading,

        /// <summary>A parameter value.</summary>
        Value,

        /// <summary>The interval under a value, or a note.</summary>
        Detail,

        /// <summary>A thin rule.</summary>
        Rule,

        /// <summary>The status line.</summary>
        Status,

        /// <summary>One warning (wrapped; cut off with "…" when the box runs out of room).</summary>
        Warning,
    }

    /// <summary>The text of the parameter box, in order. Pure, for tests.</summary>
    internal static List<BoxLine> BoxLines(FitResult result)
    {
        var lines = new List<BoxLine> { new("Fitted values", BoxLineKind.Heading) };
        foreach (var p in result.Parameters)
        {
            var q = DisplayQuantity.From(p);
            string unit = q.Unit.Length == 0 ? "" : " " + q.Unit;
            if (q.IsFixed)
            {
                lines.Add(new($"{q.Symbol} = {DisplayQuantity.FormatGeneral(q.Value)}{unit}  (fixed)", BoxLineKind.Value));
                continue;
            }
            lines.Add(new($"{q.Symbol} = {q.ValueText}{unit}", BoxLineKind.Value));
            lines.Add(new(q.HasInterval ? $"95 %: {q.Format(q.Lower95!.Value)} … {q.Format(q.Upper95!.Value)}{unit}" : "95 % interval not estimable", BoxLineKind.Detail));
        }
        lines.Add(new("", BoxLineKind.Rule));
        if (result.Quality is { } fit)
        {
            string chi = fit.ReducedChiSquare is double c ? DisplayQuantity.FormatGeneral(c) : "— (no degrees of freedom)";
            lines.Add(new($"reduced χ² = {chi}", BoxLineKind.Value));
            lines.Add(new(string.Create(Inv, $"{fit.PointsUsed} points fitted, {fit.PointsMasked} masked"), BoxLineKind.Detail));
        }
        if (result.TransitionVoltageV is double vt && double.IsFinite(vt))
        {
            lines.Add(new($"transition voltage {vt.ToString("0.###", Inv)} V", BoxLineKind.Detail));
        }
        lines.Add(new($"status: {ResultSchema.StatusText(result.Status)}", BoxLineKind.Status));
        if (result.Warnings.Length > 0)
        {
            lines.Add(new("", BoxLineKind.Rule));
            lines.Add(new(result.Warnings.Length == 1 ? "Warning" : "Warnings", BoxLineKind.Heading));
            foreach (string w in result.Warnings) lines.Add(new("• " + w.ReplaceLineEndings(" "), BoxLineKind.Warning));
        }
        return lines;
    }

    private static void DrawParameterBox(IRenderContext rc, OxyRect box, double maxBottom, FitResult result)
    {
        const double pad = 10;
        double innerWidth = box.Width - 2 * pad;
        var lines = BoxLines(result);

        // First pass: wrap and measure, stopping with "…" when the box would run past the page;
        // second pass: draw on the filled box.
        double available = Math.Max(maxBottom - box.Top - 2 * pad, 20);
        var laid = new List<(string Text, BoxLineKind Kind, double Height)>(lines.Count + 4);
        double used = 0;
        bool full = false;
        foreach (var line in lines)
        {
            var (size, weight) = StyleOf(line.Kind);
            var pieces = line.Kind == BoxLineKind.Rule ? [""] : Wrap(rc, line.Text, size, weight, innerWidth - IndentOf(line.Kind));
            double h = line.Kind switch
            {
                BoxLineKind.Rule => 9,
                BoxLineKind.Detail or BoxLineKind.Warning => size * 1.3,
                _ => size * 1.45,
            };
            foreach (string piece in pieces)
            {
                if (used + h > available)
                {
                    full = true;
                    break;
                }
                laid.Add((piece, line.Kind, h));
                used += h;
            }
            if (full) break;
            if (line.Kind == BoxLineKind.Heading) { laid.Add(("", BoxLineKind.Detail, 4)); used += 4; }
        }
        if (full && laid.Count > 0)
        {
            var (lastText, lastKind, lastHeight) = laid[^1];
            laid[^1] = (lastKind == BoxLineKind.Rule ? "…" : Ellipsize(rc, lastText + " …", 10.5, FontWeights.Normal, innerWidth), BoxLineKind.Detail, lastHeight);
        }

        var frame = new OxyRect(box.Left, box.Top, box.Width, used + 2 * pad);
        rc.DrawRectangle(frame, PlotPalette.PanelFill, PlotPalette.PanelBorder, 1, EdgeRenderingMode.Automatic);
        rc.PushClip(frame);
        double y = box.Top + pad;
        foreach (var (text, kind, h) in laid)
        {
            if (kind == BoxLineKind.Rule)
            {
                double ry = y + h / 2;
                rc.DrawLine([new ScreenPoint(box.Left + pad, ry), new ScreenPoint(box.Right - pad, ry)],
                    PlotPalette.PanelBorder, 1, EdgeRenderingMode.Automatic, null, LineJoin.Miter);
            }
            else if (text.Length > 0)
            {
                var (size, weight) = StyleOf(kind);
                OxyColor color = kind switch
                {
                    BoxLineKind.Detail => PlotPalette.MutedText,
                    BoxLineKind.Warning => PlotPalette.WarningText,
                    BoxLineKind.Status => StatusColor(result.Status),
                    _ => PlotPalette.Text,
                };
                rc.DrawText(new ScreenPoint(box.Left + pad + IndentOf(kind), y), text, color, PlotPalette.Font, size, weight);
            }
            y += h;
        }
        rc.PopClip();
    }

    private static double IndentOf(BoxLineKind kind) => kind == BoxLineKind.Detail ? 12 : 0;

    private static (double Size, double Weight) StyleOf(BoxLineKind kind) => kind switch
    {
        BoxLineKind.Heading => (11.5, FontWeights.Bold),
        BoxLineKind.Value => (12.5, FontWeights.Normal),
        BoxLineKind.Status => (12.5, FontWeights.Bold),
        BoxLineKind.Warning => (10.5, FontWeights.Normal),
        _ => (10.5, FontWeights.Normal),
    };

    private static OxyColor StatusColor(FitStatus status) => status switch
    {
        FitStatus.Ok => PlotPalette.StatusOk,
        FitStatus.PoorFit => PlotPalette.StatusPoor,
        _ => PlotPalette.StatusFailed,
    };

    // ---- failure banner -----------------------------------------------------------------------

    private static void DrawFailureBanner(SkiaRenderContext rc, OxyRect page, FitResult result)
    {
        double top = DrawTitle(rc, page, result);
        var frame = new OxyRect(Margin, top + 4, page.Width - 2 * Margin, Math.Max(page.Bottom - top - 4 - Margin, 20));
        rc.DrawRectangle(frame, OxyColor.FromRgb(0xFB, 0xF1, 0xF1), PlotPalette.StatusFailed, 1, EdgeRenderingMode.Automatic);
        rc.PushClip(frame);
        string message = result.Curve is null && result.Status != FitStatus.Failed
            ? "no curve data was kept for this result, so there is nothing to plot"
            : $"fit failed: {result.Error ?? "no reason was recorded"}";
        double y = frame.Top + 10;
        foreach (string piece in Wrap(rc, message, 12, FontWeights.Normal, frame.Width - 20))
        {
            rc.DrawText(new ScreenPoint(frame.Left + 10, y), piece, PlotPalette.Text, PlotPalette.Font, 12, FontWeights.Normal);
            y += 17;
        }
        rc.PopClip();
    }

    // ---- text helpers -------------------------------------------------------------------------

    internal static string FileNameOf(string path)
    {
        if (string.IsNullOrEmpty(path)) return "(no file name)";
        string name = Path.GetFileName(path.Replace('\\', '/'));
        return name.Length == 0 ? path : name;
    }

    private static string Ellipsize(IRenderContext rc, string text, double size, double weight, double maxWidth)
    {
        if (rc.MeasureText(text, PlotPalette.Font, size, weight).Width <= maxWidth) return text;
        int lo = 0, hi = text.Length;
        while (lo < hi)
        {
            int mid = (lo + hi + 1) / 2;
            if (rc.MeasureText(string.Concat(text.AsSpan(0, mid), "…"), PlotPalette.Font, size, weight).Width <= maxWidth) lo = mid;
            else hi = mid - 1;
        }
        return string.Concat(text.AsSpan(0, lo), "…");
    }

    /// <summary>Greedy word wrap; a single word wider than the line is cut.</summary>
    private static List<string> Wrap(IRenderContext rc, string text, double size, double weight, double maxWidth)
    {
        var result = new List<string>();
        if (rc.MeasureText(text, PlotPalette.Font, size, weight).Width <= maxWidth)
        {
            result.Add(text);
            return result;
        }
        string current = "";
        foreach (string word in text.Split(' ', StringSplitOptions.RemoveEmptyEntries))
        {
            string candidate = current.Length == 0 ? word : current + " " + word;
            if (rc.MeasureText(candidate, PlotPalette.Font, size, weight).Width <= maxWidth)
            {
                current = candidate;
                continue;
            }
            if (current.Length > 0) result.Add(current);
            current = rc.MeasureText(word, PlotPalette.Font, size, weight).Width <= maxWidth
                ? word
                : Ellipsize(rc, word, size, weight, maxWidth);
        }
        if (current.Length > 0) result.Add(current);
        return result;
    }
}
