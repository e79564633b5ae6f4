using System.Globalization;
using JunctionFit.Common;

namespace JunctionFit.Import;

/// <summary>The junction area of a table: the option, the file's area line, or the ratio of a current and a density column.</summary>
internal static class TableArea
{
    /// <summary>
    /// The area: the option, else the file's area line, else I/J when the file holds both a current and
    /// a current-density column whose ratio is constant (within <see cref="IvTableParser.AreaRatioTolerance"/>).
    /// </summary>
    public static (double? AreaM2, string? Source) Resolve(TableRows data, ColumnPlan plan, MetadataSet meta, double? optionAreaM2, List<string> warnings)
    {
        double? stated = optionAreaM2 ?? meta.AreaM2;
        string? source = optionAreaM2 is not null ? "option" : meta.AreaM2 is not null ? "the file's area line" : null;
        if (data.PairI is not double[] pi || data.PairJ is not double[] pj)
        {
            return (stated, source);
        }
        CultureInfo inv = CultureInfo.InvariantCulture;
        int n = data.Count;
        if (!SweepAnalysis.TryMedianRatio(pi.AsSpan(0, n), pj.AsSpan(0, n), out double ratio, out double spread, out int used))
        {
            warnings.Add($"area not derived from I/J of {plan.PairText}: fewer than three points where both are well above zero");
            return (stated, source);
        }
        if (spread > IvTableParser.AreaRatioTolerance)
        {
            warnings.Add(string.Create(inv, $"area not derived from I/J of {plan.PairText}: the ratio varies by {spread * 100:G3} % over {used} points (more than {IvTableParser.AreaRatioTolerance * 100:G2} %), so they do not share one area"));
            return (stated, source);
        }
        string derived = string.Create(inv,
            $"{ratio:G5} m² ({ratio * 1e4:G5} cm², the area of a circle of {2 * Math.Sqrt(ratio / Math.PI) * 1e6:G4} µm diameter) from I/J of {plan.PairText}, the median over {used} points, constant within {Math.Max(spread * 100, 1e-4):G2} %");
        if (stated is double s)
        {
            if (Math.Abs(ratio / s - 1) > IvTableParser.AreaRatioTolerance)
            {
                warnings.Add(string.Create(inv, $"the {source} gives an area of {s:G5} m² but I/J gives {derived}; the {source} is used"));
            }
            return (stated, source);
        }
        warnings.Add($"area {derived}; used as the file's area (for {Remedy.AreaFromFile})");
        return (ratio, "I/J of " + plan.PairText);
    }
}
