using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Fitting;

/// <summary>
/// Parameters that a fit drives to the edge of their physical range (φ → ∞ on a straight line, d → 0, m* → ∞ in the
/// m*–φ–d trade-off) are not determined by the data. For them the report gives no value but a one-sided 95 % profile
/// bound: with the parameter held at t and every other free parameter refitted, the profile RSS(t) rises above its
/// minimum by the one-sided 95 % point of χ²₁ (2.706, the 90 % two-sided quantile), in units of the residual variance
/// when the noise is estimated (Venzon and Moolgavkar, Appl. Stat. 37, 87, 1988, for the profile-likelihood idea).
/// Pure computation.
/// </summary>
internal static class UndeterminedParameters
{
    /// <summary>One-sided 95 % point of χ²₁ (2.7055, the 0.90 quantile).</summary>
    public const double OneSidedChiSquare = 2.705543454095404;

    /// <summary>Bisection steps in the log of the parameter after bracketing.</summary>
    private const int Refinements = 7;

    /// <summary>
    /// The range of values the fitter reports as determined: the definition's bounds, and for the barrier parameters a
    /// physical floor (φ ≥ 0.01 eV, d ≥ 0.1 nm — less than one atomic layer, m*/mₑ ≥ 0.01) and for the area 10⁻²⁰ … 10⁻² m² (a molecule to a
    /// 10 cm square; common practice, no source).
    /// </summary>
    public static (double Lower, double Upper) PlausibleRange(ParameterDefinition def)
    {
        var key = def.Id;
        double lower = key == ParameterKey.Thickness ? 0.1e-9
            : key == ParameterKey.BarrierHeight ? 0.01 * PhysicalConstants.JoulePerElectronVolt
            : key == ParameterKey.MassRatio ? 0.01
            : key == ParameterKey.Area ? 1e-20
            : def.LowerSi;
        double upper = key == ParameterKey.Area ? Math.Min(1e-2, def.UpperSi) : def.UpperSi;
        return (Math.Max(lower, def.LowerSi), upper);
    }

    /// <summary>
    /// The one-sided bound of parameter <paramref name="k"/>, which ran above (bound "≥") or below (bound "≤") its
    /// plausible range; null when the profile never rises by the threshold inside the physical range.
    /// </summary>
    public static OneSidedBound? OneSidedBound(JunctionCurrentModel model, PreparedCurve data, FitOptions options, double[] thetaHat,
        int[] freeIndex, int k, double rssMin, double scale)
    {
        var def = model.Parameters[k];
        var (lower, upper) = PlausibleRange(def);
        bool ranHigh = thetaHat[k] > upper;
        double target = rssMin + OneSidedChiSquare * scale;
        // Walk from the edge it ran to into the range by factors of 2 until the profile rises past the target.
        double edge = ranHigh ? upper : lower;
        double inner = ranHigh ? lower : upper;
        if (!double.IsFinite(inner) || inner <= 0) inner = ranHigh ? edge * 1e-4 : edge * 1e4;
        double outside = edge, t = edge;
        double rss = ProfileRss(model, data, options, thetaHat, freeIndex, k, t);
        if (rss > target)
        {
            // Already excluded at the edge: the data put the bound beyond the physical range.
            return new OneSidedBound(def.ToDisplay(edge), ranHigh, "profile likelihood, one-sided 95 %; the bound lies at the edge of the physical range");
        }
        int steps = (int)Math.Ceiling(Math.Abs(Math.Log2(edge / inner)));
        bool bracketed = false;
        for (int s = 0; s < steps; s++)
        {
            outside = t;
            t = ranHigh ? t / 2 : t * 2;
            rss = ProfileRss(model, data, options, thetaHat, freeIndex, k, t);
            if (rss > target) { bracketed = true; break; }
        }
        if (!bracketed) return null;
        double a = t, b = outside; // a: excluded, b: allowed
        for (int r = 0; r < Refinements; r++)
        {
            double mid = Math.Sqrt(a * b);
            if (ProfileRss(model, data, options, thetaHat, freeIndex, k, mid) > target) a = mid; else b = mid;
        }
        return new OneSidedBound(def.ToDisplay(Math.Sqrt(a * b)), ranHigh, "profile likelihood, one-sided 95 %");
    }

    /// <summary>Minimum RSS with parameter k held at <paramref name="valueSi"/> and the other free parameters refitted.</summary>
    private static double ProfileRss(JunctionCurrentModel model, PreparedCurve data, FitOptions options, double[] thetaHat, int[] freeIndex,
        int k, double valueSi)
    {
        var defs = model.Parameters;
        int p = defs.Count;
        var template = (double[])thetaHat.Clone();
        template[k] = valueSi;
        var isFree = new bool[p];
        foreach (int j in freeIndex) isFree[j] = j != k;
        for (int j = 0; j < p; j++) if (isFree[j]) template[j] = ParameterTransforms.Inside(defs[j], Clamp(defs[j], template[j]));
        bool profileArea = isFree[model.AreaIndex] && !model.Parasitics.Any;
        var iter = new List<int>();
        for (int j = 0; j < p; j++) if (isFree[j] && !(profileArea && j == model.AreaIndex)) iter.Add(j);
        int[] iterIndex = iter.ToArray();
        var problem = new LogCurrentProblem(model, data.VoltageV, data.LogAbsCurrent, data.InverseSigma, iterIndex, template, profileArea);
        var starts = JunctionFitter.GridStarts(model, template, isFree, data.VoltageV, data.LogAbsCurrent, data.InverseSigma, 1);
        starts.Add(template);
        double best = double.PositiveInfinity;
        foreach (var start in starts)
        {
            if (!ParameterTransforms.TryToSolver(defs, iterIndex, start, out var x0)) continue;
            if (iterIndex.Length == 0)
            {
                var r = new double[data.VoltageV.Length];
                problem.Evaluate(x0, r);
                double ss = 0;
                foreach (double e in r) ss += e * e;
                best = Math.Min(best, ss);
                continue;
            }
            var solution = LevenbergMarquardtSolver.Minimize(problem, x0, options.Solver with { MaxIterations = 300 });
            if (double.IsFinite(solution.ResidualSumOfSquares)) best = Math.Min(best, solution.ResidualSumOfSquares);
        }
        return best;
    }

    /// <summary>Brings a start value that ran off to the edge back inside the plausible range.</summary>
    private static double Clamp(ParameterDefinition def, double value)
    {
        var (lower, upper) = PlausibleRange(def);
        if (!double.IsFinite(value)) return def.DefaultSi;
        if (double.IsFinite(upper) && value > upper) return upper;
        if (value < lower) return lower;
        return value;
    }
}
