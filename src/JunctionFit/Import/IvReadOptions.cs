using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Import;

/// <summary>
/// Overrides for the importer, for when automatic detection gets a file wrong. Immutable; every
/// value is checked when it is set. Unset (null) means "detect".
/// </summary>
public sealed record IvReadOptions
{
    /// <summary>The options with nothing overridden.</summary>
    public static IvReadOptions Default { get; } = new();

    /// <summary>
    /// The voltage column: a header name (matched ignoring case, with or without its unit) or a
    /// 1-based column number written as digits (<c>"2"</c>).
    /// </summary>
    /// <exception cref="ArgumentException">The value is blank or the number is below 1.</exception>
    public string? VoltageColumn { get; init => field = CheckColumn(value); }

    /// <summary>The current (or current-density) column; same form as <see cref="VoltageColumn"/>.</summary>
    /// <exception cref="ArgumentException">The value is blank or the number is below 1.</exception>
    public string? CurrentColumn { get; init => field = CheckColumn(value); }

    /// <summary>Unit of the voltage column (<c>V</c>, <c>mV</c>, …), overriding the file.</summary>
    /// <exception cref="ArgumentException">Not a voltage unit.</exception>
    public string? VoltageUnit { get; init => field = CheckUnit(value, QuantityKind.Voltage, QuantityKind.Voltage); }

    /// <summary>Unit of the current column (<c>nA</c>, …, or a density such as <c>A/cm2</c>), overriding the file.</summary>
    /// <exception cref="ArgumentException">Not a current or current-density unit.</exception>
    public string? CurrentUnit { get; init => field = CheckUnit(value, QuantityKind.Current, QuantityKind.CurrentDensity); }

    /// <summary>Field delimiter: <c>','</c>, <c>';'</c>, <c>'\t'</c>, <c>'|'</c>, or <c>' '</c> for runs of spaces and tabs.</summary>
    /// <exception cref="ArgumentException">Another character.</exception>
    public char? Delimiter
    {
        get;
        init
        {
            if (value is char c && c is not (',' or ';' or '\t' or '|' or ' '))
            {
                throw new ArgumentException($"delimiter '{c}' is not supported; use ',', ';', tab, '|' or ' '", nameof(Delimiter));
            }
            field = value;
        }
    }

    /// <summary>True: numbers use a decimal comma; false: never; null: detect.</summary>
    public bool? DecimalComma { get; init; }

    /// <summary>
    /// A pattern that takes lot, wafer and die from the file path, e.g. <c>{lot}/{wafer}/die_{x}_{y}.csv</c>.
    /// Values taken from the path win over the file's own metadata (a difference is reported as a warning).
    /// </summary>
    /// <exception cref="ArgumentException">The pattern is malformed.</exception>
    public string? PathPattern
    {
        get;
        init
        {
            if (value is not null)
            {
                _ = Import.PathPattern.Create(value);
            }
            field = value;
        }
    }

    /// <summary>0-based numbers of the sweep segments to keep; null keeps all.</summary>
    /// <exception cref="ArgumentException">Empty, or a negative number.</exception>
    public ImmutableArray<int>? Segments
    {
        get;
        init
        {
            if (value is ImmutableArray<int> s)
            {
                if (s.IsDefaultOrEmpty)
                {
                    throw new ArgumentException("segment selection must name at least one segment", nameof(Segments));
                }
                foreach (int n in s)
                {
                    if (n < 0)
                    {
                        throw new ArgumentException($"segment number {n} is negative; segments are numbered from 0", nameof(Segments));
                    }
                }
            }
            field = value;
        }
    }

    /// <summary>Whether points at current compliance are flagged in <see cref="IvCurve.ImportMask"/> (default true).</summary>
    public bool MaskCompliance { get; init; } = true;

    /// <summary>Junction area in m², used to turn current density into current; overrides the file.</summary>
    /// <exception cref="ArgumentOutOfRangeException">Not finite and positive.</exception>
    public double? AreaM2 { get; init => field = value is double a ? Guard.Positive(a, nameof(AreaM2)) : null; }

    /// <summary>Longest line accepted, in characters (default 1 048 576). Longer lines refuse the file.</summary>
    /// <exception cref="ArgumentOutOfRangeException">Below 16.</exception>
    public int MaxLineLength { get; init => field = Guard.AtLeast(value, 16); } = 1 << 20;

    /// <summary>Largest file accepted by <see cref="IvFileReader.ReadFile"/>, in bytes (default 1 GiB).</summary>
    /// <exception cref="ArgumentOutOfRangeException">Below 1 or above 2 GiB − 1.</exception>
    public long MaxFileBytes
    {
        get;
        init => field = Guard.InRange(value, 1L, int.MaxValue);
    } = 1L << 30;

    private static string? CheckColumn(string? value)
    {
        if (value is null)
        {
            return null;
        }
        string t = value.Trim();
        if (t.Length == 0)
        {
            throw new ArgumentException("a column choice must not be blank", nameof(value));
        }
        if (IsNumber(t) && (!int.TryParse(t, out int n) || n < 1))
        {
            throw new ArgumentException($"column number '{t}' must be 1 or more", nameof(value));
        }
        return t;
    }

    internal static bool IsNumber(string s)
    {
        foreach (char c in s)
        {
            if (c is < '0' or > '9')
            {
                return false;
            }
        }
        return s.Length > 0;
    }

    private static string? CheckUnit(string? value, QuantityKind a, QuantityKind b)
    {
        if (value is null)
        {
            return null;
        }
        if (!UnitParser.TryParse(value, out UnitScale u) || (u.Kind != a && u.Kind != b))
        {
            throw new ArgumentException($"'{value}' is not a {(a == QuantityKind.Voltage ? "voltage" : "current or current-density")} unit", nameof(value));
        }
        return value;
    }
}
