using System.Globalization;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>The few facts every summary (HTML table, CSV, console) shows for one result, in one place.</summary>
internal static class SummaryRow
{
    /// <summary>Keys of the headline parameters shown in the HTML and console summaries.</summary>
    public static string BarrierHeightKey => ParameterKey.BarrierHeight.Name;

    /// <summary>Thickness key.</summary>
    public static string ThicknessKey => ParameterKey.Thickness.Name;

    /// <summary>Area key (m² in the result, µm² on display).</summary>
    public static string AreaKey => ParameterKey.Area.Name;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>"(3, 5)", "x 3", "y 5" or empty.</summary>
    public static string DieText(FitResult r) => (r.DieX, r.DieY) switch
    {
        (int x, int y) => string.Create(Inv, $"({x}, {y})"),
        (int x, null) => string.Create(Inv, $"x {x}"),
        (null, int y) => string.Create(Inv, $"y {y}"),
        _ => "",
    };

    /// <summary>Display form of one parameter, or null when the model has no such parameter.</summary>
    public static DisplayQuantity? Quantity(FitResult r, string key) => r.Find(key) is { } p ? DisplayQuantity.From(p) : null;

    /// <summary>Number for machine-readable output: shortest round-trip form, invariant culture; empty for null.</summary>
    public static string Number(double? x) => x is double v ? v.ToString("R", Inv) : "";

    /// <summary>Number for machine-readable output: invariant culture; empty for null.</summary>
    public static string Number(int? x) => x is int v ? v.ToString(Inv) : "";

    /// <summary>The reduced χ² for display, or an em dash.</summary>
    public static string ChiText(FitResult r) => r.Quality?.ReducedChiSquare is double c ? DisplayQuantity.FormatGeneral(c) : "—";

    /// <summary>The transition voltage for display, or an em dash.</summary>
    public static string TransitionText(FitResult r) => r.TransitionVoltageV is double v && double.IsFinite(v) ? v.ToString("0.###", Inv) : "—";
}
