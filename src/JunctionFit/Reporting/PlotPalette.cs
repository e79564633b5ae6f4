using OxyPlot;

namespace JunctionFit.Reporting;

/// <summary>
/// The project's plot colours: a blue/amber pair that stays distinct under the common colour-vision
/// deficiencies (they differ in lightness as well as hue), greys for everything secondary, white ground.
/// OxyColor is an immutable value, so sharing these between threads is safe.
/// </summary>
internal static class PlotPalette
{
    /// <summary>Page and plot background.</summary>
    public static readonly OxyColor Background = OxyColors.White;

    /// <summary>Measured points that entered the fit.</summary>
    public static readonly OxyColor Measured = OxyColor.FromRgb(0x1F, 0x5A, 0x96);

    /// <summary>Points left out of the fit: lighter and a different marker shape.</summary>
    public static readonly OxyColor Masked = OxyColor.FromRgb(0xA9, 0xAE, 0xB4);

    /// <summary>The fitted model.</summary>
    public static readonly OxyColor Model = OxyColor.FromRgb(0xD9, 0x82, 0x2B);

    /// <summary>Zero line of the residual panel.</summary>
    public static readonly OxyColor ZeroLine = OxyColor.FromRgb(0x5A, 0x5F, 0x66);

    /// <summary>Major grid lines.</summary>
    public static readonly OxyColor Grid = OxyColor.FromRgb(0xE4, 0xE7, 0xEB);

    /// <summary>Axis lines and ticks.</summary>
    public static readonly OxyColor Axis = OxyColor.FromRgb(0x6B, 0x71, 0x78);

    /// <summary>Body text.</summary>
    public static readonly OxyColor Text = OxyColor.FromRgb(0x22, 0x26, 0x2B);

    /// <summary>Secondary text (subtitles, notes).</summary>
    public static readonly OxyColor MutedText = OxyColor.FromRgb(0x5C, 0x63, 0x6B);

    /// <summary>Fill of the parameter box.</summary>
    public static readonly OxyColor PanelFill = OxyColor.FromRgb(0xF4, 0xF6, 0xF9);

    /// <summary>Border of the parameter box.</summary>
    public static readonly OxyColor PanelBorder = OxyColor.FromRgb(0xC9, 0xCF, 0xD6);

    /// <summary>Status ok.</summary>
    public static readonly OxyColor StatusOk = OxyColor.FromRgb(0x2E, 0x7D, 0x5B);

    /// <summary>Status poor fit.</summary>
    public static readonly OxyColor StatusPoor = OxyColor.FromRgb(0xB0, 0x6A, 0x00);

    /// <summary>Warning text: a darker amber than the status colour, readable at small sizes on the panel fill.</summary>
    public static readonly OxyColor WarningText = OxyColor.FromRgb(0x8A, 0x53, 0x00);

    /// <summary>Status failed.</summary>
    public static readonly OxyColor StatusFailed = OxyColor.FromRgb(0xB0, 0x2E, 0x2E);

    /// <summary>Preferred font; the renderer falls back to the system default when it is missing.</summary>
    public const string Font = "DejaVu Sans";
}
