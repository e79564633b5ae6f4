using System.Globalization;
using JunctionFit.Common;
using JunctionFit.Lots;
using JunctionFit.Results;
using OxyPlot;
using OxyPlot.Annotations;
using OxyPlot.Axes;

namespace JunctionFit.Reporting;

/// <summary>
/// Wafer map of one parameter on one wafer, as a PNG: each die a square on the die grid (die_x across, die_y up),
/// coloured by its value on a labelled colour scale in display units (φ in eV, d in nm, area in µm²). The scale
/// spans the good dies (status ok); poor-fit dies are coloured by their value (clamped to the scale) and outlined
/// in black; failed dies and dies without a value are grey, failed ones crossed. The title names lot, wafer and
/// parameter; the subtitle counts dies by status. Dies without coordinates cannot be placed and are counted.
/// Thread safety: every call builds its own plot model.
/// </summary>
public static class WaferMapRenderer
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;
    private static readonly OxyColor NoValueFill = OxyColor.FromRgb(0xDD, 0xE0, 0xE4);
    private static readonly OxyColor PoorOutline = OxyColor.FromRgb(0x11, 0x11, 0x11);

    /// <summary>
    /// A file name for the map of <paramref name="key"/> on (lot, wafer): <c>wafer-LOT-WAFER-KEY.png</c>, with
    /// characters other than letters, digits, '-', '_' and '.' replaced by '_'.
    /// </summary>
    /// <param name="lot">Lot.</param>
    /// <param name="wafer">Wafer.</param>
    /// <param name="key">Parameter key.</param>
    /// <returns>The file name (no directory).</returns>
    public static string FileName(string? lot, string? wafer, string key)
        => $"wafer-{LotPlotSupport.Safe(lot)}-{LotPlotSupport.Safe(wafer)}-{LotPlotSupport.Safe(key)}.png";

    /// <summary>Renders the map and returns the PNG bytes.</summary>
    /// <param name="dies">Rows of one wafer (same lot and wafer).</param>
    /// <param name="key">Parameter key, for example <c>barrier_height_eV</c>.</param>
    /// <param name="widthPx">Image width, 160 … 8000 px.</param>
    /// <param name="heightPx">Image height, 160 … 8000 px.</param>
    /// <returns>PNG bytes.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException"><paramref name="dies"/> is empty or spans more than one (lot, wafer).</exception>
    /// <exception cref="ArgumentOutOfRangeException">A size is out of range.</exception>
    public static byte[] RenderPng(IReadOnlyList<ResultRow> dies, string key, int widthPx = 820, int heightPx = 720)
    {
        ArgumentNullException.ThrowIfNull(dies);
        ArgumentException.ThrowIfNullOrWhiteSpace(key);
        LotPlotSupport.CheckSide(widthPx, nameof(widthPx));
        LotPlotSupport.CheckSide(heightPx, nameof(heightPx));
        if (dies.Count == 0) throw new ArgumentException("no dies to draw", nameof(dies));
        string? lot = dies[0].Lot, wafer = dies[0].Wafer;
        if (dies.Any(d => !string.Equals(d.Lot, lot, StringComparison.Ordinal) || !string.Equals(d.Wafer, wafer, StringComparison.Ordinal)))
        {
            throw new ArgumentException("all dies of a wafer map must have the same lot and wafer", nameof(dies));
        }
        return LotPlotSupport.ToPng(BuildModel(dies, key, lot, wafer), widthPx, heightPx);
    }

    /// <summary>Renders the map and writes it to <paramref name="path"/> atomically.</summary>
    /// <param name="dies">Rows of one wafer.</param>
    /// <param name="key">Parameter key.</param>
    /// <param name="path">Target PNG; its directory is created when missing.</param>
    /// <exception cref="ArgumentException">See <see cref="RenderPng"/>; or the path is empty or a directory.</exception>
    /// <exception cref="IOException">The file could not be written; an existing file is left unchanged.</exception>
    public static void WritePng(IReadOnlyList<ResultRow> dies, string key, string path)
        => AtomicFile.WriteAllBytes(path, RenderPng(dies, key));

    private static PlotModel BuildModel(IReadOnlyList<ResultRow> dies, string key, string? lot, string? wafer)
    {
        var display = LotPlotSupport.DisplayOf(key);
        var placed = dies.Where(d => d.DieX is not null && d.DieY is not null).ToList();
        int unplaced = dies.Count - placed.Count;
        int ok = dies.Count(d => d.Status == FitStatus.Ok);
        int poor = dies.Count(d => d.Status == FitStatus.PoorFit);
        int failed = dies.Count(d => d.Status == FitStatus.Failed);

        var good = placed.Where(d => d.IsGood && d.ValueOf(key) is not null).Select(d => d.ValueOf(key)!.Value * display.Factor).ToList();
        var anyValue = good.Count > 0 ? good : placed.Where(d => d.ValueOf(key) is not null).Select(d => d.ValueOf(key)!.Value * display.Factor).ToList();
        double lo = anyValue.Count > 0 ? anyValue.Min() : 0, hi = anyValue.Count > 0 ? anyValue.Max() : 1;
        // A robust colour scale: one out-of-family die must not flatten the others into one colour. The scale spans
        // the good dies within median ± 5 scaled MAD; dies beyond it take the end colour and the subtitle says so.
        int clipped = 0;
        if (anyValue.Count >= 5 && LotStatistics.Median(anyValue) is double med && LotStatistics.ScaledMad(anyValue) is double mad && mad > 0)
        {
            double rlo = Math.Max(lo, med - 5 * mad), rhi = Math.Min(hi, med + 5 * mad);
            clipped = anyValue.Count(v => v < rlo || v > rhi);
            if (clipped > 0 && rhi > rlo) (lo, hi) = (rlo, rhi);
            else clipped = 0;
        }
        if (!(hi > lo))
        {
            double pad = Math.Max(Math.Abs(lo) * 0.005, 1e-6);
            lo -= pad;
            hi += pad;
        }

        string title = $"{display.Name} {display.Symbol} — lot {lot ?? "?"}, wafer {wafer ?? "?"}";
        var parts = new List<string>
        {
            string.Create(Inv, $"{dies.Count} dies: {ok} ok, {poor} poor (outlined), {failed} failed (×)"),
        };
        if (good.Count > 0) parts.Add($"median {DisplayQuantity.FormatGeneral(LotStatistics.Median(good))}{Unit(display)} over good dies");
        if (unplaced > 0) parts.Add(string.Create(Inv, $"{unplaced} without die coordinates not shown"));
        if (clipped > 0) parts.Add(string.Create(Inv, $"{clipped} beyond the scale (end colour)"));
        var model = LotPlotSupport.NewModel(title, string.Join("   ·   ", parts));
        model.PlotType = PlotType.Cartesian;

        int minX = placed.Count > 0 ? placed.Min(d => d.DieX!.Value) : 0, maxX = placed.Count > 0 ? placed.Max(d => d.DieX!.Value) : 0;
        int minY = placed.Count > 0 ? placed.Min(d => d.DieY!.Value) : 0, maxY = placed.Count > 0 ? placed.Max(d => d.DieY!.Value) : 0;
        model.Axes.Add(GridAxis(AxisPosition.Bottom, "die x", minX, maxX));
        model.Axes.Add(GridAxis(AxisPosition.Left, "die y", minY, maxY));
        var colours = new LinearColorAxis
        {
            Position = AxisPosition.Right,
            Palette = OxyPalettes.Viridis(256),
            Minimum = lo,
            Maximum = hi,
            Title = display.AxisTitle,
            TitleFontSize = 11.5,
            FontSize = 10.5,
            AxisDistance = 8,
            IsZoomEnabled = false,
            IsPanEnabled = false,
            StringFormat = "G4",
        };
        model.Axes.Add(colours);

        foreach (var die in placed)
        {
            double x = die.DieX!.Value, y = die.DieY!.Value;
            double? value = die.ValueOf(key) * display.Factor;
            bool hasColour = value is not null && die.Status != FitStatus.Failed;
            var fill = hasColour ? ColourOf(colours.Palette, value!.Value, lo, hi) : NoValueFill;
            bool isPoor = die.Status == FitStatus.PoorFit;
            model.Annotations.Add(new RectangleAnnotation
            {
                MinimumX = x - 0.46,
                MaximumX = x + 0.46,
                MinimumY = y - 0.46,
                MaximumY = y + 0.46,
                Fill = fill,
                Stroke = isPoor ? PoorOutline : OxyColors.White,
                StrokeThickness = isPoor ? 3 : 0.8,
                Layer = AnnotationLayer.BelowSeries,
            });
            if (die.Status == FitStatus.Failed)
            {
                foreach (var (dx, dy) in new[] { (0.3, 0.3), (0.3, -0.3) })
                {
                    var cross = new PolylineAnnotation { Color = LotPlotSupport.Alarm, StrokeThickness = 2.2, LineStyle = LineStyle.Solid };
                    cross.Points.Add(new DataPoint(x - dx, y - dy));
                    cross.Points.Add(new DataPoint(x + dx, y + dy));
                    model.Annotations.Add(cross);
                }
            }
        }
        if (placed.Count == 0)
        {
            model.Annotations.Add(new TextAnnotation
            {
                Text = "no die has coordinates (die_x, die_y): nothing to place",
                TextPosition = new DataPoint(0, 0),
                Stroke = OxyColors.Undefined,
                TextColor = PlotPalette.MutedText,
            });
        }
        return model;
    }

    /// <summary>
    /// The palette colour for <paramref name="value"/> on [lo, hi], clamped. Computed here rather than with the colour
    /// axis's own lookup, which uses the axis's actual range and that is only known after the plot has been laid out.
    /// </summary>
    internal static OxyColor ColourOf(OxyPalette palette, double value, double lo, double hi)
    {
        int n = palette.Colors.Count;
        double t = Math.Clamp((value - lo) / (hi - lo), 0, 1);
        return palette.Colors[Math.Min((int)(t * n), n - 1)];
    }

    private static string Unit(LotPlotSupport.Display d) => d.Unit.Length == 0 ? "" : " " + d.Unit;

    private static LinearAxis GridAxis(AxisPosition position, string title, int min, int max) => new()
    {
        Position = position,
        Title = title,
        TitleFontSize = 11.5,
        FontSize = 10.5,
        Minimum = min - 0.6,
        Maximum = max + 0.6,
        MajorStep = Math.Max(1, Math.Ceiling((max - min + 1) / 15.0)),
        MinorStep = 1,
        MinorTickSize = 0,
        StringFormat = "0",
        AxislineColor = PlotPalette.Axis,
        TicklineColor = PlotPalette.Axis,
        IsZoomEnabled = false,
        IsPanEnabled = false,
    };
}
