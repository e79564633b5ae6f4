using System.Collections.Immutable;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Fitting;

/// <summary>
/// Fits several models to one curve and picks one by the corrected Akaike information criterion,
/// AICc = n ln(S/n) + 2k + 2k(k + 1)/(n − k − 1), with S the weighted residual sum of squares of ln|I|, n points and
/// k free parameters (H. Akaike, IEEE Trans. Autom. Control 19, 716, 1974; C. M. Hurvich and C.-L. Tsai,
/// Biometrika 76, 297, 1989). All candidates see the same points and weights, so their S are comparable.
/// Fits with status ok are preferred; among them the lowest AICc wins. Pure computation.
/// </summary>
public static class ModelSelection
{
    /// <summary>AICc of a fit, or null when n − k − 1 ≤ 0 or S is not positive.</summary>
    public static double? Aicc(double rss, int points, int freeParameters)
    {
        int n = points, k = freeParameters;
        if (n - k - 1 <= 0 || !(rss > 0) || !double.IsFinite(rss)) return null;
        return n * Math.Log(rss / n) + 2.0 * k + 2.0 * k * (k + 1) / (n - k - 1);
    }

    /// <summary>Fits every candidate and returns the chosen fit with the comparison table attached.</summary>
    /// <param name="curve">The curve.</param>
    /// <param name="candidates">Junction models to compare (at least one).</param>
    /// <param name="options">Fit options; keys a model does not have are ignored by it.</param>
    public static FitResult FitBest(IvCurve curve, IReadOnlyList<JunctionCurrentModel> candidates, FitOptions options)
    {
        ArgumentNullException.ThrowIfNull(curve);
        ArgumentNullException.ThrowIfNull(candidates);
        if (candidates.Count == 0) throw new ArgumentException("at least one candidate model is needed", nameof(candidates));
        var fits = new FitResult[candidates.Count];
        var aicc = new double?[candidates.Count];
        var k = new int[candidates.Count];
        for (int c = 0; c < candidates.Count; c++)
        {
            fits[c] = JunctionFitter.Fit(curve, candidates[c], options);
            k[c] = 0;
            foreach (var p in fits[c].Parameters) if (!p.IsFixed) k[c]++;
            aicc[c] = fits[c].Quality is { } q && fits[c].Status != FitStatus.Failed ? Aicc(q.ResidualSumOfSquares, q.PointsUsed, k[c]) : null;
        }
        int chosen = -1;
        for (int pass = 0; pass < 2 && chosen < 0; pass++)
        {
            for (int c = 0; c < candidates.Count; c++)
            {
                bool eligible = pass == 0 ? fits[c].Status == FitStatus.Ok : fits[c].Status != FitStatus.Failed;
                if (eligible && aicc[c] is double a && (chosen < 0 || a < aicc[chosen]!.Value)) chosen = c;
            }
        }
        if (chosen < 0) chosen = 0;
        var table = ImmutableArray.CreateBuilder<ModelComparisonRow>(candidates.Count);
        for (int c = 0; c < candidates.Count; c++)
        {
            table.Add(new ModelComparisonRow(fits[c].Model, fits[c].Status, k[c], fits[c].Quality?.PointsUsed ?? 0,
                fits[c].Quality?.ResidualSumOfSquares, aicc[c], c == chosen));
        }
        var best = fits[chosen];
        var warnings = best.Warnings.Add($"model chosen by AICc among {string.Join(", ", fits.Select(f => f.Model))}: {best.Model}");
        return best with { ModelComparison = table.MoveToImmutable(), Warnings = warnings };
    }
}
