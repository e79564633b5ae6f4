using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Physics;

namespace JunctionFit.Planning;

/// <summary>Which biases a candidate sweep of the recommendation covers.</summary>
public enum SweepFamily
{
    /// <summary>−V … +V, evenly spaced (the zero-bias point, when there is one, is left out by the fit).</summary>
    BothPolarities,

    /// <summary>0 … +V, evenly spaced.</summary>
    PositiveOnly,

    /// <summary>0 … −V, evenly spaced.</summary>
    NegativeOnly,

    /// <summary>A loop 0 → +V → −V → 0 (as <see cref="SweepShape.Loop"/>).</summary>
    Loop,
}

/// <summary>A precision goal for one parameter: a 95 % half-width in its display unit, or relative to its nominal value.</summary>
/// <param name="Key">Parameter key.</param>
/// <param name="Value">Half-width in the display unit, or a fraction (0.01 = 1 %) when <paramref name="IsRelative"/>.</param>
/// <param name="IsRelative">True when <paramref name="Value"/> is relative to the nominal value.</param>
public sealed record PrecisionTarget(string Key, double Value, bool IsRelative);

/// <summary>
/// The worst case of a sweep over a grid of nominal points: per free parameter the largest predicted 95 % half-width,
/// with the nominal point where it occurs.
/// </summary>
/// <param name="Parameters">Per free parameter, the prediction at the grid point with the largest half-width (model order).</param>
/// <param name="WorstAt">Per free parameter key, the nominal values (display units, by key) of that grid point.</param>
/// <param name="CenterValues">Per free parameter key, its value at the centre of the grid (the reference of relative half-widths).</param>
/// <param name="IsIdentifiable">True when the sweep identifies the parameters at every grid point.</param>
/// <param name="Reasons">Why not, with the grid point; empty when identifiable.</param>
/// <param name="GridPoints">Number of nominal points evaluated.</param>
/// <param name="MaxAbsCurrentA">Largest predicted |I| over the grid.</param>
public sealed record WorstCasePrediction(
    ImmutableArray<ParameterPrediction> Parameters,
    ImmutableDictionary<string, ImmutableDictionary<string, double>> WorstAt,
    ImmutableDictionary<string, double> CenterValues,
    bool IsIdentifiable,
    ImmutableArray<string> Reasons,
    int GridPoints,
    double MaxAbsCurrentA)
{
    /// <summary>The worst prediction for <paramref name="key"/>, or null when it is not free.</summary>
    public ParameterPrediction? Find(string key)
    {
        foreach (var p in Parameters) if (string.Equals(p.Key, key, StringComparison.Ordinal)) return p;
        return null;
    }

    /// <summary>Worst half-width of <paramref name="key"/> over |its value at the grid centre|; null when not determined.</summary>
    public double? RelativeHalfWidth(string key)
    {
        var p = Find(key);
        return p?.HalfWidth95 is double h && CenterValues.TryGetValue(key, out double c) && c != 0 ? h / Math.Abs(c) : null;
    }
}

/// <summary>One point of the bias scan behind a recommendation: the worst-case prediction for a sweep to ±<paramref name="MaxBiasV"/>.</summary>
/// <param name="MaxBiasV">Largest |V| of the candidate sweep.</param>
/// <param name="Points">Points of the candidate sweep.</param>
/// <param name="Prediction">Worst case over the nominal grid.</param>
/// <param name="Score">The largest ratio of half-width to target (with targets) or relative half-width (without) over the focus parameters; ∞ when not identifiable.</param>
/// <param name="WithinCompliance">False when some point of the sweep reaches 0.999 × the compliance at some grid point.</param>
public sealed record BiasScanPoint(double MaxBiasV, int Points, WorstCasePrediction Prediction, double Score, bool WithinCompliance);

/// <summary>A recommended sweep.</summary>
/// <param name="FromV">First bias in volt.</param>
/// <param name="ToV">Last bias in volt.</param>
/// <param name="Points">Number of points.</param>
/// <param name="Family">Which biases it covers.</param>
/// <param name="MaxBiasV">Largest |V|.</param>
/// <param name="MaxFieldVPerM">Largest oxide field |V|/d at the thinnest nominal thickness, V/m; null when the model has no thickness.</param>
/// <param name="Prediction">Worst-case prediction for it.</param>
/// <param name="MeetsTargets">True when every target is met (true without targets).</param>
/// <param name="Score">See <see cref="BiasScanPoint.Score"/>.</param>
/// <param name="ValidityWarnings">The model's validity warnings for this bias range at the grid points.</param>
public sealed record SweepRecommendation(
    double FromV, double ToV, int Points, SweepFamily Family, double MaxBiasV, double? MaxFieldVPerM,
    WorstCasePrediction Prediction, bool MeetsTargets, double Score, ImmutableArray<string> ValidityWarnings);

/// <summary>Everything a plan asks for. Immutable; validated on construction.</summary>
public sealed record PlanRequest
{
    /// <summary>Creates a request around a nominal setup.</summary>
    /// <param name="setup">Model, nominal parameters (the centre of any range), free parameters, noise, compliance.</param>
    public PlanRequest(PlanningSetup setup) => Setup = setup ?? throw new ArgumentNullException(nameof(setup));

    /// <summary>The nominal setup.</summary>
    public PlanningSetup Setup { get; }

    /// <summary>Ranges of nominal values (SI, by key) for the worst case; empty for the nominal point only.</summary>
    public ImmutableDictionary<string, (double LowSi, double HighSi)> Ranges { get; init; } = ImmutableDictionary<string, (double, double)>.Empty;

    /// <summary>Grid points per range (evenly spaced, ends included), 2 … 9.</summary>
    public int RangePoints { get; init => field = Guard.InRange(value, 2, 9); } = 3;

    /// <summary>The proposed sweep's bias points, or null to plan without one.</summary>
    public ImmutableArray<double>? ProposedVoltagesV { get; init; }

    /// <summary>Which biases the candidate sweeps of the recommendation cover.</summary>
    public SweepFamily Family { get; init; } = SweepFamily.BothPolarities;

    /// <summary>Largest |V| a recommended sweep may reach, volt; null: no bias limit.</summary>
    public double? MaxBiasV { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>Largest oxide field |V|/d a recommended sweep may reach, V/m (1 MV/cm = 10⁸ V/m); null: no field limit.</summary>
    public double? MaxFieldVPerM { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>Largest number of points of a recommended sweep (the point budget).</summary>
    public int MaxPoints { get; init => field = Guard.InRange(value, 5, 100_000); } = 201;

    /// <summary>Precision targets; empty: the best precision for the point budget.</summary>
    public ImmutableArray<PrecisionTarget> Targets { get; init; } = [];

    /// <summary>Parameters whose precision the recommendation optimises without targets; empty: barrier height and thickness where free, else all free.</summary>
    public ImmutableArray<string> FocusKeys { get; init; } = [];

    /// <summary>Largest-bias values tried, evenly spaced up to the limit, 4 … 400.</summary>
    public int BiasSteps { get; init => field = Guard.InRange(value, 4, 400); } = 40;
}

/// <summary>The outcome of a plan.</summary>
/// <param name="Proposed">Prediction for the proposed sweep at the nominal point; null without a proposed sweep.</param>
/// <param name="ProposedWorstCase">Worst case of the proposed sweep over the ranges; null without ranges or without a proposed sweep.</param>
/// <param name="Recommendation">The recommended sweep; null when no limit was given or no candidate fits the limits.</param>
/// <param name="Scan">Worst-case predictions against the largest bias at the recommended point count (for the plot); empty without a recommendation.</param>
/// <param name="BiasLimitV">The largest |V| the recommendation may reach (from the bias and field limits), null without limits.</param>
/// <param name="FieldThicknessNm">Thickness used to turn the field limit into a bias (the thinnest nominal), null when the model has none.</param>
/// <param name="ComplianceBiasV">The lowest largest bias at which the scan reaches the compliance; null when it never does.</param>
/// <param name="FocusKeys">The parameters the recommendation optimised.</param>
/// <param name="Warnings">Warnings in words.</param>
public sealed record MeasurementPlan(
    SweepPrediction? Proposed,
    WorstCasePrediction? ProposedWorstCase,
    SweepRecommendation? Recommendation,
    ImmutableArray<BiasScanPoint> Scan,
    double? BiasLimitV,
    double? FieldThicknessNm,
    double? ComplianceBiasV,
    ImmutableArray<string> FocusKeys,
    ImmutableArray<string> Warnings);

/// <summary>
/// Plans a measurement: predictions for a proposed sweep (<see cref="FisherPredictor"/>), the worst case over ranges of
/// nominal values, and a recommended sweep under bias, field and compliance limits.
/// <para>
/// Search. The candidates are sweeps of <see cref="PlanRequest.Family"/> to a largest bias V on an even grid of
/// <see cref="PlanRequest.BiasSteps"/> values up to the bias limit min(max bias, max field × thinnest d), rounded down to
/// 1 mV; a candidate that reaches 0.999 × the compliance at any grid point is left out. Without targets every candidate
/// has the point budget, and the recommendation is the lowest V whose score (largest relative 95 % half-width of the focus
/// parameters, worst case) is within 1 % of the best (common practice, no source: less stress for a precision that is
/// not measurably worse). With targets, each V gets the fewest points that meet every target (the half-width falls as
/// 1/√N for a denser sweep of the same range, refined by direct evaluation), and the recommendation is the candidate
/// with the fewest points, then the lowest V. No candidate ever exceeds the bias limit.
/// </para>
/// Pure computation.
/// </summary>
public static class MeasurementPlanner
{
    /// <summary>Tolerance of the "best precision" choice: the lowest bias within this fraction of the best score.</summary>
    public const double BestScoreTolerance = 0.01;

    /// <summary>Plans.</summary>
    /// <param name="request">What to plan.</param>
    /// <returns>The plan.</returns>
    public static MeasurementPlan Plan(PlanRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        var setup = request.Setup;
        var grid = Grid(request);
        var warnings = ImmutableArray.CreateBuilder<string>();
        var focus = FocusKeys(request);

        SweepPrediction? proposed = null;
        WorstCasePrediction? proposedWorst = null;
        if (request.ProposedVoltagesV is { } pv)
        {
            proposed = FisherPredictor.Predict(setup, pv.AsSpan());
            if (grid.Count > 1) proposedWorst = WorstCase(grid, pv.AsSpan(), setup);
        }

        int thicknessIndex = setup.Model.IndexOf(StandardParameters.Thickness.Key);
        double? thinnest = null;
        if (thicknessIndex >= 0)
        {
            double d = double.PositiveInfinity;
            foreach (var g in grid) d = Math.Min(d, g.NominalSi[thicknessIndex]);
            thinnest = d;
        }
        double? limit = request.MaxBiasV;
        if (request.MaxFieldVPerM is double f)
        {
            if (thinnest is not double dMin) throw new ArgumentException($"model '{setup.Model.Barrier.Name}' has no thickness: a field limit cannot be applied", nameof(request));
            double fromField = f * dMin;
            limit = limit is double b ? Math.Min(b, fromField) : fromField;
        }
        double? fieldThicknessNm = thinnest is double t ? t * 1e9 : null;
        if (limit is not double biasLimit)
        {
            return new MeasurementPlan(proposed, proposedWorst, null, [], null, fieldThicknessNm, null, focus, warnings.ToImmutable());
        }
        if (proposed is not null && proposed.MaxAbsVoltageV > biasLimit * (1 + 1e-12))
        {
            warnings.Add($"the proposed sweep reaches {proposed.MaxAbsVoltageV:0.###} V, beyond the bias limit of {biasLimit:0.###} V from the stated limits");
        }
        biasLimit = RoundDownToMillivolt(biasLimit);
        if (!(biasLimit > 0))
        {
            warnings.Add("the bias and field limits leave less than 1 mV of bias: no sweep can be recommended");
            return new MeasurementPlan(proposed, proposedWorst, null, [], biasLimit, fieldThicknessNm, null, focus, warnings.ToImmutable());
        }

        int steps = request.BiasSteps;
        int budget = request.MaxPoints;
        int minPoints = Math.Max(setup.FreeKeys.Count + 3, 5);
        var biases = new double[steps];
        for (int j = 1; j <= steps; j++) biases[j - 1] = j == steps ? biasLimit : biasLimit * j / steps;

        var atBudget = new BiasScanPoint[steps];
        double? complianceBias = null;
        for (int j = 0; j < steps; j++)
        {
            atBudget[j] = Evaluate(grid, setup, request, focus, biases[j], budget);
            if (!atBudget[j].WithinCompliance && complianceBias is null) complianceBias = biases[j];
        }

        int chosen = -1;
        int chosenPoints = budget;
        bool meets = true;
        if (request.Targets.IsDefaultOrEmpty)
        {
            double best = double.PositiveInfinity;
            foreach (var s in atBudget) if (s.WithinCompliance && s.Score < best) best = s.Score;
            if (double.IsFinite(best))
            {
                for (int j = 0; j < steps; j++)
                {
                    if (atBudget[j].WithinCompliance && atBudget[j].Score <= best * (1 + BestScoreTolerance)) { chosen = j; break; }
                }
            }
        }
        else
        {
            int fewest = int.MaxValue;
            for (int j = 0; j < steps; j++)
            {
                var s = atBudget[j];
                if (!s.WithinCompliance || !(s.Score <= 1.0)) continue;
                int n = FewestPoints(grid, setup, request, focus, biases[j], s.Score, minPoints, budget);
                if (n < fewest) { fewest = n; chosen = j; }
            }
            if (chosen >= 0)
            {
                chosenPoints = fewest;
            }
            else
            {
                // No candidate reaches the targets within the budget: the best one at the budget, said so.
                meets = false;
                double best = double.PositiveInfinity;
                for (int j = 0; j < steps; j++)
                {
                    if (atBudget[j].WithinCompliance && atBudget[j].Score < best) { best = atBudget[j].Score; chosen = j; }
                }
                if (chosen >= 0) warnings.Add($"no sweep within the limits and the budget of {budget} points reaches every target (best: {best:0.##}x a target)");
            }
        }
        if (chosen < 0)
        {
            warnings.Add(complianceBias is double cb && cb <= biases[0]
                ? $"every candidate sweep reaches the compliance already at {cb:0.###} V: no sweep can be recommended"
                : "no candidate sweep within the limits identifies the parameters: no sweep can be recommended; fix a parameter (for example the area) or allow a wider bias range");
            return new MeasurementPlan(proposed, proposedWorst, null, [.. atBudget], biasLimit, fieldThicknessNm, complianceBias, focus, warnings.ToImmutable());
        }

        var scan = new BiasScanPoint[steps];
        for (int j = 0; j < steps; j++) scan[j] = chosenPoints == budget ? atBudget[j] : Evaluate(grid, setup, request, focus, biases[j], chosenPoints);
        var pick = scan[chosen];
        double vmax = biases[chosen];
        var (from, to) = Ends(request.Family, vmax);
        var validity = new SortedSet<string>(StringComparer.Ordinal);
        foreach (var g in grid) foreach (string w in setup.Model.CheckValidity(vmax, g.NominalSi.AsSpan())) validity.Add(w);
        var recommendation = new SweepRecommendation(from, to, chosenPoints, request.Family, vmax,
            thinnest is double th ? vmax / th : null, pick.Prediction, meets && pick.Score <= (request.Targets.IsDefaultOrEmpty ? double.PositiveInfinity : 1.0),
            pick.Score, [.. validity]);
        return new MeasurementPlan(proposed, proposedWorst, recommendation, [.. scan], biasLimit, fieldThicknessNm, complianceBias, focus, warnings.ToImmutable());
    }

    /// <summary>The bias points of a candidate sweep.</summary>
    /// <param name="family">Which biases.</param>
    /// <param name="maxBiasV">Largest |V|, positive.</param>
    /// <param name="points">Number of points, at least 2.</param>
    public static double[] CandidateVoltages(SweepFamily family, double maxBiasV, int points)
    {
        Guard.Positive(maxBiasV);
        Guard.AtLeast(points, 2);
        var (from, to) = Ends(family, maxBiasV);
        var spec = new SimulationSpec(from, to, points) { Shape = family == SweepFamily.Loop ? SweepShape.Loop : SweepShape.Linear };
        return IvSimulator.SweepVoltages(spec);
    }

    /// <summary>Worst case of a sweep over a grid of setups.</summary>
    /// <param name="grid">Setups (same model and free parameters), the first being the centre.</param>
    /// <param name="voltagesV">Bias points.</param>
    /// <param name="center">The centre setup (reference of relative half-widths).</param>
    public static WorstCasePrediction WorstCase(IReadOnlyList<PlanningSetup> grid, ReadOnlySpan<double> voltagesV, PlanningSetup center)
    {
        ArgumentNullException.ThrowIfNull(grid);
        ArgumentNullException.ThrowIfNull(center);
        if (grid.Count == 0) throw new ArgumentException("at least one setup", nameof(grid));
        var defs = center.Model.Parameters;
        int[] freeIndex = center.FreeIndex();
        var worst = new ParameterPrediction?[freeIndex.Length];
        var worstAt = new int[freeIndex.Length];
        var reasons = ImmutableArray.CreateBuilder<string>();
        bool identifiable = true;
        double maxI = 0;
        for (int g = 0; g < grid.Count; g++)
        {
            var p = FisherPredictor.Predict(grid[g], voltagesV);
            maxI = Math.Max(maxI, p.MaxAbsCurrentA);
            if (!p.IsIdentifiable)
            {
                identifiable = false;
                if (reasons.Count < 6) foreach (string r in p.Reasons) reasons.Add($"{r} (at {Describe(grid[g])})");
            }
            for (int j = 0; j < freeIndex.Length; j++)
            {
                var q = p.Parameters[j];
                var w = worst[j];
                bool undetermined = q.HalfWidth95 is null;
                if (w is null || (w.HalfWidth95 is double hw && (undetermined || q.HalfWidth95 > hw)))
                {
                    worst[j] = q;
                    worstAt[j] = g;
                }
            }
        }
        var at = ImmutableDictionary.CreateBuilder<string, ImmutableDictionary<string, double>>(StringComparer.Ordinal);
        var centres = ImmutableDictionary.CreateBuilder<string, double>(StringComparer.Ordinal);
        for (int j = 0; j < freeIndex.Length; j++)
        {
            var def = defs[freeIndex[j]];
            at[def.Key] = NominalDisplay(grid[worstAt[j]]);
            centres[def.Key] = def.ToDisplay(center.NominalSi[freeIndex[j]]);
        }
        return new WorstCasePrediction([.. worst.Select(w => w!)], at.ToImmutable(), centres.ToImmutable(), identifiable, reasons.ToImmutable(), grid.Count, maxI);
    }

    /// <summary>
    /// The nominal grid: the centre first (the nominal setup, whose ranged values are the middles of their ranges), then every
    /// other combination of <see cref="PlanRequest.RangePoints"/> evenly spaced values per range (ends included).
    /// </summary>
    /// <param name="request">The request.</param>
    public static IReadOnlyList<PlanningSetup> Grid(PlanRequest request)
    {
        ArgumentNullException.ThrowIfNull(request);
        var list = new List<PlanningSetup> { request.Setup };
        if (request.Ranges.IsEmpty) return list;
        var keys = request.Ranges.Keys.OrderBy(k => k, StringComparer.Ordinal).ToArray();
        int per = request.RangePoints;
        int total = 1;
        foreach (string _ in keys) total *= per;
        for (int c = 0; c < total; c++)
        {
            var values = new Dictionary<string, double>(StringComparer.Ordinal);
            int rest = c;
            bool middle = per % 2 == 1;
            foreach (string key in keys)
            {
                var (lo, hi) = request.Ranges[key];
                int i = rest % per;
                rest /= per;
                middle &= i == per / 2;
                values[key] = i == per - 1 ? hi : lo + (hi - lo) * i / (per - 1);
            }
            // The middle of every range is the centre, already first in the list.
            if (!middle) list.Add(request.Setup.WithNominal(values));
        }
        return list;
    }

    private static ImmutableArray<string> FocusKeys(PlanRequest request)
    {
        var free = request.Setup.FreeKeys;
        if (!request.Targets.IsDefaultOrEmpty) return [.. request.Targets.Select(t => t.Key).Distinct(StringComparer.Ordinal)];
        if (!request.FocusKeys.IsDefaultOrEmpty) return request.FocusKeys;
        var keys = new List<string>();
        foreach (string key in new[] { StandardParameters.BarrierHeight.Key, StandardParameters.Thickness.Key }) if (free.Contains(key)) keys.Add(key);
        if (keys.Count == 0) foreach (var def in request.Setup.Model.Parameters) if (free.Contains(def.Key)) keys.Add(def.Key);
        return [.. keys];
    }

    private static BiasScanPoint Evaluate(IReadOnlyList<PlanningSetup> grid, PlanningSetup center, PlanRequest request, ImmutableArray<string> focus, double vmax, int points)
    {
        var v = CandidateVoltages(request.Family, vmax, points);
        var w = WorstCase(grid, v, center);
        bool within = center.ComplianceA is not double comp || w.MaxAbsCurrentA < 0.999 * comp;
        return new BiasScanPoint(vmax, points, w, Score(w, request, focus), within);
    }

    /// <summary>The largest ratio to a target (with targets) or relative half-width (without) over the focus; ∞ when not identifiable.</summary>
    private static double Score(WorstCasePrediction w, PlanRequest request, ImmutableArray<string> focus)
    {
        if (!w.IsIdentifiable) return double.PositiveInfinity;
        double score = 0;
        if (!request.Targets.IsDefaultOrEmpty)
        {
            foreach (var target in request.Targets)
            {
                var p = w.Find(target.Key);
                if (p?.HalfWidth95 is not double hw) return double.PositiveInfinity;
                double goal = target.IsRelative ? target.Value * Math.Abs(w.CenterValues[target.Key]) : target.Value;
                score = Math.Max(score, goal > 0 ? hw / goal : double.PositiveInfinity);
            }
            return score;
        }
        foreach (string key in focus)
        {
            var p = w.Find(key);
            if (p?.HalfWidth95 is not double hw) return double.PositiveInfinity;
            score = Math.Max(score, w.RelativeHalfWidth(key) ?? hw);
        }
        return score;
    }

    private static int FewestPoints(IReadOnlyList<PlanningSetup> grid, PlanningSetup center, PlanRequest request, ImmutableArray<string> focus,
        double vmax, double scoreAtBudget, int minPoints, int budget)
    {
        // Half-widths fall as 1/√N for a denser sweep of the same range: N ≈ budget·score², then checked and raised.
        int n = Math.Clamp((int)Math.Ceiling(budget * scoreAtBudget * scoreAtBudget), minPoints, budget);
        for (int iteration = 0; iteration < 8 && n < budget; iteration++)
        {
            double s = Evaluate(grid, center, request, focus, vmax, n).Score;
            if (s <= 1.0) return n;
            n = Math.Min(budget, Math.Max(n + 1, (int)Math.Ceiling(n * Math.Max(1.02, s * s))));
        }
        return budget;
    }

    private static (double From, double To) Ends(SweepFamily family, double vmax) => family switch
    {
        SweepFamily.PositiveOnly => (0.0, vmax),
        SweepFamily.NegativeOnly => (0.0, -vmax),
        _ => (-vmax, vmax),
    };

    /// <summary>Rounds a positive bias down to whole millivolts (a value within 10⁻⁹ V above a whole millivolt counts as it).</summary>
    internal static double RoundDownToMillivolt(double v)
    {
        double mv = Math.Floor(v * 1000.0 + 1e-6);
        double rounded = mv / 1000.0;
        return rounded > v + 1e-9 ? (mv - 1) / 1000.0 : rounded;
    }

    private static ImmutableDictionary<string, double> NominalDisplay(PlanningSetup s)
    {
        var b = ImmutableDictionary.CreateBuilder<string, double>(StringComparer.Ordinal);
        var defs = s.Model.Parameters;
        for (int k = 0; k < defs.Count; k++) b[defs[k].Key] = defs[k].ToDisplay(s.NominalSi[k]);
        return b.ToImmutable();
    }

    private static string Describe(PlanningSetup s)
    {
        var defs = s.Model.Parameters;
        var parts = new List<string>();
        foreach (string key in new[] { StandardParameters.BarrierHeight.Key, StandardParameters.Thickness.Key })
        {
            int k = s.Model.IndexOf(key);
            if (k >= 0) parts.Add($"{defs[k].Symbol} = {defs[k].ToDisplay(s.NominalSi[k]):G4} {defs[k].DisplayUnit}");
        }
        return string.Join(", ", parts);
    }
}
