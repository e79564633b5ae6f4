using System.Globalization;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Reporting;

/// <summary>
/// A parameter converted to the unit a reader expects on a plot or in a report: φ in eV, d in nm,
/// area in µm² (the result holds m², as its key says), the mass ratio without a unit.
/// Machine-readable outputs (CSV, JSON) keep the key's own unit.
/// </summary>
internal readonly record struct DisplayQuantity(
    string Key, string Symbol, string Unit, double Value, double? StandardError, double? Lower95, double? Upper95, bool IsFixed)
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Converts one estimate to its display unit.</summary>
    public static DisplayQuantity From(ParameterEstimate p)
    {
        ArgumentNullException.ThrowIfNull(p);
        double factor = 1.0;
        string unit = p.Unit;
        string label = p.Key;
        if (string.Equals(p.Key, ParameterKey.Area.Name, StringComparison.Ordinal))
        {
            factor = 1e12; // m² → µm²
            unit = "µm²";
            label = "effective area"; // the key names m², the value shown is in µm²
        }
        string? undetermined = !p.IsUndetermined ? null
            : p.Bound is { } b ? $"{(b.IsLower ? "≥" : "≤")} {FormatGeneral(b.Value * factor)}" : "undetermined";
        return new DisplayQuantity(
            p.Key, p.Symbol, unit, p.Value * factor, p.StandardError * factor, p.Lower95 * factor, p.Upper95 * factor, p.IsFixed)
        {
            Undetermined = undetermined,
            Label = label,
        };
    }

    /// <summary>
    /// Words beside the symbol in a report: the key when the value is shown in the key's own unit, else a name
    /// (the area, kept in m² as <c>area_m2</c>, is shown in µm² as "effective area").
    /// </summary>
    public string Label { get; init; } = "";

    /// <summary>For a parameter the data do not determine: its one-sided bound ("≥ 1.2") or "undetermined"; otherwise null.</summary>
    public string? Undetermined { get; init; }

    /// <summary>True when both interval ends are known and finite.</summary>
    public bool HasInterval => Undetermined is null && Lower95 is double lo && Upper95 is double hi && double.IsFinite(lo) && double.IsFinite(hi);

    /// <summary>Decimal places that show the interval's half-width to two significant figures (null: use general format).</summary>
    public int? Decimals
    {
        get
        {
            double spread = HasInterval ? 0.5 * (Upper95!.Value - Lower95!.Value) : StandardError ?? double.NaN;
            if (!double.IsFinite(spread) || spread <= 0 || !double.IsFinite(Value)) return null;
            int d = 1 - (int)Math.Floor(Math.Log10(spread));
            if (d < 0) d = 0;
            if (d > 10) return null;
            // Very large or very small magnitudes read better in exponent form; so does an interval wider than the value
            // (fixed decimals would print a poorly determined 0.4 as "0").
            double mag = Math.Abs(Value);
            if (mag >= 1e7 || (mag > 0 && mag < 1e-4) || spread > mag) return null;
            return d;
        }
    }

    /// <summary>The value alone, with as many digits as its interval justifies.</summary>
    public string ValueText => Undetermined ?? Format(Value, Decimals);

    /// <summary>A number in the chosen format (invariant culture).</summary>
    public string Format(double x) => Format(x, Decimals);

    /// <summary>An optional number in the chosen format, or an em dash.</summary>
    public string Format(double? x) => x is double v ? Format(v, Decimals) : "—";

    /// <summary>"lo – hi" or an em dash.</summary>
    public string IntervalText => HasInterval ? $"{Format(Lower95!.Value)} – {Format(Upper95!.Value)}" : "—";

    /// <summary>Value with unit, for example "2.013 eV".</summary>
    public string ValueWithUnit => Unit.Length == 0 ? ValueText : $"{ValueText} {Unit}";

    /// <summary>Compact form for tables: "2.013 [2.002, 2.018]", "1 (fixed)", or the value alone.</summary>
    public string Compact
    {
        get
        {
            if (IsFixed) return $"{ValueText} (fixed)";
            return HasInterval ? $"{ValueText} [{Format(Lower95!.Value)}, {Format(Upper95!.Value)}]" : ValueText;
        }
    }

    /// <summary>Formats with fixed decimals when known, otherwise four significant figures.</summary>
    public static string Format(double x, int? decimals)
    {
        if (double.IsNaN(x)) return "NaN";
        if (double.IsInfinity(x)) return x > 0 ? "∞" : "−∞";
        return decimals is int d ? x.ToString("F" + d.ToString(Inv), Inv) : FormatGeneral(x);
    }

    /// <summary>Four significant figures, exponent form outside 10⁻³ … 10⁴ (G4 would switch on its own at 10⁴).</summary>
    public static string FormatGeneral(double x)
    {
        if (double.IsNaN(x)) return "NaN";
        if (double.IsInfinity(x)) return x > 0 ? "∞" : "−∞";
        double mag = Math.Abs(x);
        if (mag != 0 && (mag < 1e-3 || mag >= 1e4)) return x.ToString("0.###e+0", Inv);
        return x.ToString("G4", Inv);
    }
}
