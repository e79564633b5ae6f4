using System.Collections.Immutable;
using JunctionFit.Results;

namespace JunctionFit.Lots;

/// <summary>Robust summary of one parameter over the good dies of one lot.</summary>
/// <param name="Key">Parameter key (unit as the key says).</param>
/// <param name="GoodCount">Good dies (status ok) with a finite value of this parameter.</param>
/// <param name="Median">Median over those dies; null when there are none.</param>
/// <param name="RobustSpread">MAD × 1.4826 (Rousseeuw &amp; Croux 1993), an estimate of σ for normal data; null when there are no dies.</param>
public sealed record ParameterSummary(string Key, int GoodCount, double? Median, double? RobustSpread);

/// <summary>Summary of one lot.</summary>
/// <param name="Lot">Lot name; the empty string collects rows without a lot.</param>
/// <param name="Total">Rows (dies) in the lot.</param>
/// <param name="Ok">Rows with status ok.</param>
/// <param name="PoorFit">Rows with status poor-fit.</param>
/// <param name="Failed">Rows with status failed.</param>
/// <param name="Parameters">Per-parameter summaries in the order asked for.</param>
public sealed record LotSummaryRow(string Lot, int Total, int Ok, int PoorFit, int Failed, ImmutableArray<ParameterSummary> Parameters)
{
    /// <summary>Yield of good fits: ok / total (0 … 1).</summary>
    public double Yield => Total == 0 ? 0 : (double)Ok / Total;

    /// <summary>The summary of <paramref name="key"/>, or null.</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>The summary or null.</returns>
    public ParameterSummary? Find(string key) => Parameters.FirstOrDefault(p => string.Equals(p.Key, key, StringComparison.Ordinal));
}

/// <summary>
/// Per-lot summary of a results table: counts by status, the yield of good fits, and for each parameter the
/// median and a robust spread (the MAD scaled by 1.4826, see <see cref="LotStatistics.ScaledMad"/>) over the
/// good dies. "Good" means status ok; poor fits and failures are counted but never enter the statistics.
/// </summary>
public static class LotSummary
{
    /// <summary>Summarises <paramref name="rows"/> per lot.</summary>
    /// <param name="rows">Result rows of one or more lots.</param>
    /// <param name="parameterKeys">Keys to summarise; null: every parameter key of the rows (table order) and the transition voltage.</param>
    /// <param name="lotOrder">Lot order; null: ordinal order of the names. Lots present in the rows but not listed come after, in ordinal order.</param>
    /// <returns>One row per lot.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="rows"/> is null.</exception>
    public static ImmutableArray<LotSummaryRow> Compute(
        IReadOnlyList<ResultRow> rows, IReadOnlyList<string>? parameterKeys = null, IReadOnlyList<string>? lotOrder = null)
    {
        ArgumentNullException.ThrowIfNull(rows);
        var keys = parameterKeys ?? DefaultKeys(rows);
        var byLot = GroupByLot(rows);
        var result = ImmutableArray.CreateBuilder<LotSummaryRow>();
        foreach (string lot in OrderLots(byLot.Keys, lotOrder))
        {
            if (!byLot.TryGetValue(lot, out var lotRows)) continue;
            var parameters = ImmutableArray.CreateBuilder<ParameterSummary>(keys.Count);
            foreach (string key in keys)
            {
                var values = GoodValues(lotRows, key);
                parameters.Add(values.Count == 0
                    ? new ParameterSummary(key, 0, null, null)
                    : new ParameterSummary(key, values.Count, LotStatistics.Median(values), LotStatistics.ScaledMad(values)));
            }
            result.Add(new LotSummaryRow(
                lot,
                lotRows.Count,
                lotRows.Count(r => r.Status == FitStatus.Ok),
                lotRows.Count(r => r.Status == FitStatus.PoorFit),
                lotRows.Count(r => r.Status == FitStatus.Failed),
                parameters.ToImmutable()));
        }
        return result.ToImmutable();
    }

    /// <summary>Every parameter key of the rows in table order, then the transition voltage when any row has one.</summary>
    internal static List<string> DefaultKeys(IReadOnlyList<ResultRow> rows)
    {
        var keys = ResultRow.ParameterKeysOf(rows).ToList();
        if (rows.Any(r => r.TransitionVoltageV is not null)) keys.Add(ResultRow.TransitionVoltageKey);
        return keys;
    }

    /// <summary>Rows grouped by lot name (null lot → empty string), each group in input order.</summary>
    internal static Dictionary<string, List<ResultRow>> GroupByLot(IEnumerable<ResultRow> rows)
    {
        var byLot = new Dictionary<string, List<ResultRow>>(StringComparer.Ordinal);
        foreach (var row in rows)
        {
            string lot = row.Lot ?? "";
            if (!byLot.TryGetValue(lot, out var list)) byLot[lot] = list = [];
            list.Add(row);
        }
        return byLot;
    }

    /// <summary>The listed lots first (in the given order, duplicates dropped), then the rest in ordinal order.</summary>
    internal static List<string> OrderLots(IEnumerable<string> present, IReadOnlyList<string>? lotOrder)
    {
        var presentSet = new HashSet<string>(present, StringComparer.Ordinal);
        var ordered = new List<string>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        if (lotOrder is not null)
        {
            foreach (string lot in lotOrder)
            {
                if (presentSet.Contains(lot) && seen.Add(lot)) ordered.Add(lot);
            }
        }
        ordered.AddRange(presentSet.Where(l => !seen.Contains(l)).OrderBy(l => l, StringComparer.Ordinal));
        return ordered;
    }

    /// <summary>Finite values of <paramref name="key"/> over the good rows, in input order.</summary>
    internal static List<double> GoodValues(IEnumerable<ResultRow> rows, string key)
    {
        var values = new List<double>();
        foreach (var row in rows)
        {
            if (row.IsGood && row.ValueOf(key) is double v) values.Add(v);
        }
        return values;
    }
}
