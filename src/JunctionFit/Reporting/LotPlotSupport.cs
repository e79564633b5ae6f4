using System.Globalization;
using JunctionFit.Results;
using OxyPlot;
using OxyPlot.SkiaSharp;
using JunctionFit.Physics;
using JunctionFit.Common;

namespace JunctionFit.Reporting;

/// <summary>Shared pieces of the lot figures: display units, page styling, PNG export, file names.</summary>
internal static class LotPlotSupport
{
    public const int MinimumSidePx = 160;
    public const int MaximumSidePx = 8000;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Colour for points outside control limits or failures: the project's "failed" red.</summary>
    public static readonly OxyColor Alarm = PlotPalette.StatusFailed;

    /// <summary>Symbol, name, display unit and factor from the key's unit to the display unit.</summary>
    public readonly record struct Display(string Symbol, string Name, string Unit, double Factor)
    {
        /// <summary>"φ (eV)" or "m*/mₑ".</summary>
        public string AxisTitle => Unit.Length == 0 ? $"{Name}  {Symbol}" : $"{Name}  {Symbol}  ({Unit})";
    }

    public static Display DisplayOf(string key)
        => key == ParameterKey.BarrierHeight.Name ? new("φ", "barrier height", "eV", 1)
        : key == ParameterKey.Thickness.Name ? new("d", "thickness", "nm", 1)
        : key == ParameterKey.Area.Name ? new("A", "effective area", "µm²", 1e12)
        : key == ParameterKey.MassRatio.Name ? new("m*/mₑ", "mass ratio", "", 1)
        : key == ResultRow.TransitionVoltageKey ? new("V_t", "transition voltage", "V", 1)
        : key == ParameterKey.FlatBandVoltage.Name ? new("V_fb", "flat-band voltage", "V", 1)
        : new(key, key, "", 1);

    public static void CheckSide(int px, string name) => Guard.InRange(px, MinimumSidePx, MaximumSidePx, name);

    public static PlotModel NewModel(string title, string subtitle) => new()
    {
        Title = title,
        Subtitle = subtitle,
        TitleFontSize = 15,
        SubtitleFontSize = 11,
        TitleFontWeight = FontWeights.Bold,
        TitleColor = PlotPalette.Text,
        SubtitleColor = PlotPalette.MutedText,
        TitleHorizontalAlignment = TitleHorizontalAlignment.CenteredWithinView,
        Background = PlotPalette.Background,
        DefaultFont = PlotPalette.Font,
        DefaultFontSize = 11,
        TextColor = PlotPalette.Text,
        PlotAreaBorderColor = PlotPalette.Axis,
        PlotAreaBorderThickness = new OxyThickness(1),
        Padding = new OxyThickness(12, 10, 16, 12),
    };

    public static byte[] ToPng(PlotModel model, int widthPx, int heightPx)
    {
        var exporter = new PngExporter { Width = widthPx, Height = heightPx, UseTextShaping = false };
        using var stream = new MemoryStream();
        exporter.Export(model, stream);
        return stream.ToArray();
    }

    /// <summary>A file-name-safe form of a lot, wafer or key: letters, digits, '-', '_' and '.', others as '_'.</summary>
    public static string Safe(string? text)
    {
        if (string.IsNullOrWhiteSpace(text)) return "unknown";
        var chars = text.Trim().Select(c => char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '_').ToArray();
        string s = new(chars);
        return s.Trim('.') is { Length: > 0 } t ? t : "unknown";
    }

    public static string Number(double x, string format) => x.ToString(format, Inv);
}
