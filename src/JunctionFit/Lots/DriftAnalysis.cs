using System.Collections.Immutable;
using System.Globalization;
using JunctionFit.Results;

namespace JunctionFit.Lots;

/// <summary>
/// Shift of one lot's mean against the reference for one parameter. When the comparison cannot be made
/// (too few good dies, no spread), the numbers are null and <see cref="Reason"/> says why.
/// </summary>
/// <param name="Lot">The lot compared.</param>
/// <param name="Key">Parameter key (shift, interval and threshold are in its unit).</param>
/// <param name="N">Good dies of the lot with a value.</param>
/// <param name="ReferenceN">Good dies of the reference with a value.</param>
/// <param name="LotMean">Mean over the lot's good dies.</param>
/// <param name="ReferenceMean">Mean over the reference's good dies.</param>
/// <param name="Shift">Lot mean − reference mean.</param>
/// <param name="Lower95">Lower end of the 95 % Welch interval of the shift.</param>
/// <param name="Upper95">Upper end of the 95 % Welch interval of the shift.</param>
/// <param name="DegreesOfFreedom">Welch–Satterthwaite degrees of freedom.</param>
/// <param name="PValue">Two-sided Welch p-value, uncorrected.</param>
/// <param name="PValueHolm">p-value after Holm's correction over all lots × parameters that have one.</param>
/// <param name="Threshold">Practical threshold resolved to the key's unit; null when the reference mean is unknown.</param>
/// <param name="Flagged">True when <see cref="PValueHolm"/> ≤ α and |shift| &gt; <see cref="Threshold"/>.</param>
/// <param name="Reason">Why there are no numbers; null when there are.</param>
public sealed record DriftRow(
    string Lot, string Key, int N, int ReferenceN, double? LotMean, double? ReferenceMean, double? Shift,
    double? Lower95, double? Upper95, double? DegreesOfFreedom, double? PValue, double? PValueHolm,
    double? Threshold, bool Flagged, string? Reason);

/// <summary>How the control limits of a <see cref="ControlChart"/> were obtained.</summary>
public enum ControlLimitBasis
{
    /// <summary>No limits (see <see cref="ControlChart.Reason"/>).</summary>
    None,

    /// <summary>
    /// Two or more reference lots: centre = mean of their medians; σ̂ = average moving range of their
    /// medians (in lot order) / 1.128 — the textbook individuals chart of lot medians.
    /// </summary>
    ReferenceLotMedians,

    /// <summary>
    /// One reference lot: centre = its median; σ̂ = average moving range of its good dies' values
    /// (in row order) / 1.128. The limits then describe single dies, so they are wider than limits for
    /// medians would be: a lot median outside them is far off.
    /// </summary>
    ReferenceDies,
}

/// <summary>One point of a control chart: a lot's median.</summary>
/// <param name="Lot">Lot.</param>
/// <param name="N">Good dies with a value.</param>
/// <param name="Median">Median over them; null when there are none.</param>
/// <param name="IsReference">True for a reference lot.</param>
/// <param name="OutOfControl">True when the median lies outside the control limits.</param>
public sealed record ControlChartPoint(string Lot, int N, double? Median, bool IsReference, bool OutOfControl);

/// <summary>
/// Individuals control chart of lot medians for one parameter (Montgomery, Introduction to Statistical
/// Quality Control: individuals and moving-range chart, σ̂ = MR̄/d₂, d₂ = 1.128; limits centre ± 3σ̂).
/// </summary>
/// <param name="Key">Parameter key (all numbers in its unit).</param>
/// <param name="Points">Lot medians in lot order.</param>
/// <param name="CentreLine">Centre line; null without limits.</param>
/// <param name="Sigma">σ̂ from the average moving range; null without limits.</param>
/// <param name="LowerLimit">Centre − 3σ̂.</param>
/// <param name="UpperLimit">Centre + 3σ̂.</param>
/// <param name="Basis">What the limits were computed from.</param>
/// <param name="Reason">Why there are no limits, or a caution about them; null otherwise.</param>
public sealed record ControlChart(
    string Key, ImmutableArray<ControlChartPoint> Points, double? CentreLine, double? Sigma,
    double? LowerLimit, double? UpperLimit, ControlLimitBasis Basis, string? Reason);

/// <summary>Everything <see cref="DriftAnalysis.Compute"/> finds.</summary>
/// <param name="Rows">One row per (non-reference lot, parameter), lots in lot order, parameters in key order.</param>
/// <param name="Charts">One control chart per parameter.</param>
/// <param name="Lots">All lots in lot order (reference lots included).</param>
/// <param name="ReferenceLots">The reference lots.</param>
/// <param name="Keys">Parameters analysed.</param>
/// <param name="RowsWithoutLot">Rows left out because they name no lot.</param>
/// <param name="Alpha">Family-wise level used for the Holm procedure.</param>
public sealed record DriftResult(
    ImmutableArray<DriftRow> Rows, ImmutableArray<ControlChart> Charts, ImmutableArray<string> Lots,
    ImmutableArray<string> ReferenceLots, ImmutableArray<string> Keys, int RowsWithoutLot, double Alpha)
{
    /// <summary>Rows that are flagged.</summary>
    public IEnumerable<DriftRow> Flagged => Rows.Where(r => r.Flagged);
}

/// <summary>
/// Lot-to-lot drift: for every lot that is not a reference lot and every parameter, the shift of the lot's mean
/// against the pooled good dies of the reference lot(s), with
/// <list type="number">
/// <item>a 95 % Welch interval and a two-sided Welch p-value (<see cref="LotStatistics.Welch"/>; Welch 1947,
/// Satterthwaite 1946);</item>
/// <item>Holm's correction over all comparisons that have a p-value, lots × parameters (Holm 1979);</item>
/// <item><c>flagged</c> = Holm-corrected p ≤ α and |shift| &gt; the practical threshold of the parameter
/// (<see cref="DriftOptions"/>) — significant and large enough to matter;</item>
/// </list>
/// and per parameter an individuals control chart of the lot medians (<see cref="ControlChart"/>).
/// Only good dies (status ok) with a finite value enter; a lot (or reference) with fewer than
/// <see cref="DriftOptions.MinimumGoodDies"/> of them gets a reason instead of numbers.
/// Pure computation.
/// </summary>
public static class DriftAnalysis
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Runs the analysis.</summary>
    /// <param name="rows">Result rows of all lots (from one or several results files).</param>
    /// <param name="options">Reference lot(s), thresholds, α.</param>
    /// <returns>Shifts, flags and control charts.</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentException">A reference lot does not occur in <paramref name="rows"/>; the message lists the lots present.</exception>
    public static DriftResult Compute(IReadOnlyList<ResultRow> rows, DriftOptions options)
    {
        ArgumentNullException.ThrowIfNull(rows);
        ArgumentNullException.ThrowIfNull(options);

        var withLot = rows.Where(r => !string.IsNullOrWhiteSpace(r.Lot)).ToList();
        int withoutLot = rows.Count - withLot.Count;
        var byLot = LotSummary.GroupByLot(withLot);
        var lots = LotSummary.OrderLots(byLot.Keys, options.LotOrder is { } order ? order : null);
        foreach (string reference in options.ReferenceLots)
        {
            if (!byLot.ContainsKey(reference))
            {
                string present = lots.Count == 0 ? "none" : string.Join(", ", lots);
                throw new ArgumentException($"reference lot '{reference}' is not in the results (lots present: {present})", nameof(options));
            }
        }
        var referenceSet = new HashSet<string>(options.ReferenceLots, StringComparer.Ordinal);
        var keys = options.ParameterKeys is { } given ? given.ToList() : DefaultKeys(withLot);

        // 1. Welch comparisons.
        var pending = new List<DriftRow>();
        foreach (string lot in lots)
        {
            if (referenceSet.Contains(lot)) continue;
            foreach (string key in keys)
            {
                var referenceValues = new List<double>();
                foreach (string r in options.ReferenceLots) referenceValues.AddRange(LotSummary.GoodValues(byLot[r], key));
                var values = LotSummary.GoodValues(byLot[lot], key);
                pending.Add(Compare(lot, key, values, referenceValues, options));
            }
        }

        // 2. Holm over every comparison with a p-value; 3. flags.
        var tested = pending.Where(r => r.PValue is not null).ToList();
        var adjusted = LotStatistics.HolmAdjust(tested.Select(r => r.PValue!.Value).ToList());
        var adjustedByRow = new Dictionary<DriftRow, double>(ReferenceEqualityComparer.Instance);
        for (int i = 0; i < tested.Count; i++) adjustedByRow[tested[i]] = adjusted[i];
        var finalRows = ImmutableArray.CreateBuilder<DriftRow>(pending.Count);
        foreach (var row in pending)
        {
            if (!adjustedByRow.TryGetValue(row, out double pHolm))
            {
                finalRows.Add(row);
                continue;
            }
            bool large = row.Shift is double s && row.Threshold is double t && Math.Abs(s) > t;
            finalRows.Add(row with { PValueHolm = pHolm, Flagged = pHolm <= options.Alpha && large });
        }

        // 4. Control charts.
        var charts = ImmutableArray.CreateBuilder<ControlChart>(keys.Count);
        foreach (string key in keys) charts.Add(Chart(key, lots, byLot, referenceSet, options));

        return new DriftResult(finalRows.ToImmutable(), charts.ToImmutable(), [.. lots], options.ReferenceLots, [.. keys], withoutLot, options.Alpha);
    }

    /// <summary>Parameters free in at least one good fit, in table order, then the transition voltage when any good row has one.</summary>
    internal static List<string> DefaultKeys(IReadOnlyList<ResultRow> rows)
    {
        var keys = new List<string>();
        foreach (string key in ResultRow.ParameterKeysOf(rows))
        {
            if (rows.Any(r => r.IsGood && r.Find(key) is { StandardError: not null, Value: not null })) keys.Add(key);
        }
        if (rows.Any(r => r.IsGood && r.TransitionVoltageV is not null)) keys.Add(ResultRow.TransitionVoltageKey);
        return keys;
    }

    private static DriftRow Compare(string lot, string key, List<double> values, List<double> reference, DriftOptions options)
    {
        int min = options.MinimumGoodDies;
        double? lotMean = values.Count > 0 ? LotStatistics.MeanAndVariance(values).Mean : null;
        double? refMean = reference.Count > 0 ? LotStatistics.MeanAndVariance(reference).Mean : null;
        double? threshold = refMean is double rm ? options.ThresholdFor(key).Resolve(rm) : null;
        var empty = new DriftRow(lot, key, values.Count, reference.Count, lotMean, refMean, null, null, null, null, null, null, threshold, false, null);
        if (reference.Count < min)
        {
            return empty with { Reason = string.Create(Inv, $"the reference has {Dies(reference.Count)} with a value of {key}; at least {min} are needed") };
        }
        if (values.Count < min)
        {
            return empty with { Reason = string.Create(Inv, $"lot {lot} has {Dies(values.Count)} with a value of {key}; at least {min} are needed") };
        }
        var welch = LotStatistics.Welch(values, reference);
        if (welch is null)
        {
            return empty with { Shift = lotMean - refMean, Reason = "neither the lot nor the reference varies (held fixed?); the Welch test is undefined" };
        }
        return empty with
        {
            Shift = welch.Difference,
            Lower95 = welch.Lower95,
            Upper95 = welch.Upper95,
            DegreesOfFreedom = welch.DegreesOfFreedom,
            PValue = welch.PValue,
        };
    }

    private static string Dies(int n) => n == 1 ? "1 good die" : string.Create(Inv, $"{n} good dies");

    private static ControlChart Chart(
        string key, List<string> lots, Dictionary<string, List<ResultRow>> byLot, HashSet<string> referenceSet, DriftOptions options)
    {
        var medians = new List<(string Lot, int N, double? Median, bool IsReference)>();
        foreach (string lot in lots)
        {
            var values = LotSummary.GoodValues(byLot[lot], key);
            medians.Add((lot, values.Count, values.Count > 0 ? LotStatistics.Median(values) : null, referenceSet.Contains(lot)));
        }

        double? centre = null, sigma = null;
        var basis = ControlLimitBasis.None;
        string? reason = null;
        var referenceMedians = medians.Where(m => m.IsReference && m.Median is not null).Select(m => m.Median!.Value).ToList();
        if (referenceMedians.Count >= 2)
        {
            centre = LotStatistics.MeanAndVariance(referenceMedians).Mean;
            sigma = LotStatistics.MovingRangeSigma(referenceMedians);
            basis = ControlLimitBasis.ReferenceLotMedians;
            if (referenceMedians.Count < 20)
            {
                reason = string.Create(Inv, $"limits from only {referenceMedians.Count} reference lot medians are rough; about 20 or more give settled limits");
            }
        }
        else if (referenceSet.Count == 1)
        {
            string reference = referenceSet.First();
            var dies = LotSummary.GoodValues(byLot[reference], key);
            if (dies.Count >= options.MinimumGoodDies)
            {
                centre = LotStatistics.Median(dies);
                sigma = LotStatistics.MovingRangeSigma(dies);
                basis = ControlLimitBasis.ReferenceDies;
                reason = "one reference lot: limits from the die-to-die moving range of the reference lot, so they are limits for single dies";
            }
            else
            {
                reason = string.Create(Inv, $"the reference lot has {Dies(dies.Count)} with a value of {key}; at least {options.MinimumGoodDies} are needed for limits");
            }
        }
        else
        {
            reason = "fewer than two reference lots have a median, and more than one reference lot was named: no limits";
        }

        double? lower = centre - 3 * sigma;
        double? upper = centre + 3 * sigma;
        var points = ImmutableArray.CreateBuilder<ControlChartPoint>(medians.Count);
        foreach (var (lot, n, median, isReference) in medians)
        {
            bool outside = median is double m && lower is double lo && upper is double hi && (m < lo || m > hi);
            points.Add(new ControlChartPoint(lot, n, median, isReference, outside));
        }
        return new ControlChart(key, points.ToImmutable(), centre, sigma, lower, upper, basis, reason);
    }
}
