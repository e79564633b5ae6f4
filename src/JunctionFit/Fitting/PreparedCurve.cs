using JunctionFit.Import;

namespace JunctionFit.Fitting;

/// <summary>
/// The points of a curve that enter a fit, with their ln|I| and weights. Left out (and counted by reason): non-finite
/// values, zero bias (also a bias at rounding level, |V| ≤ 1e-9·max|V|, as a float-stepped sweep writes for 0 V: the
/// model current there is below rounding and its logarithm carries no information), points flagged by the importer, points at compliance (|I| ≥ 0.999 × compliance), zero or
/// wrong-sign current, and |I| ≤ 3·σ_floor. Weights 1/sᵢ with sᵢ = √(r² + (σ_floor/|Iᵢ|)²), r the stated relative
/// noise or, when none is stated, the point-to-point estimate of <see cref="NoiseEstimator"/>.
/// </summary>
internal sealed record PreparedCurve(
    bool[] Used, double[] VoltageV, double[] LogAbsCurrent, double[] InverseSigma, double MaxAbsVoltageV,
    double? EstimatedRelativeNoise, List<string> MaskNotes)
{
    /// <summary>Points left out because the current has the wrong sign for its bias (or is zero).</summary>
    public int WrongSign { get; init; }

    /// <summary>Bias at or below this fraction of the largest |V| of the curve counts as zero bias.</summary>
    internal const double RoundingBias = 1e-9;

    public static PreparedCurve From(IvCurve curve, FitOptions options)
    {
        double floor = options.NoiseFloorA ?? 0.0;
        double? compliance = options.ComplianceA ?? curve.ComplianceA;
        int n = curve.Count;
        var used = new bool[n];
        double zeroBias = 0;
        foreach (double vb in curve.VoltageV) if (double.IsFinite(vb)) zeroBias = Math.Max(zeroBias, RoundingBias * Math.Abs(vb));
        int usedCount = 0, wrongSign = 0, belowFloor = 0, atCompliance = 0, flagged = 0, notFinite = 0;
        for (int i = 0; i < n; i++)
        {
            double v = curve.VoltageV[i], c = curve.CurrentA[i];
            bool ok = false;
            if (!double.IsFinite(v) || !double.IsFinite(c)) notFinite++;
            else if (Math.Abs(v) <= zeroBias) { }
            else if (curve.ImportMask.Length == n && curve.ImportMask[i]) flagged++;
            else if (compliance is double comp && Math.Abs(c) >= 0.999 * comp) atCompliance++;
            else if (c == 0 || Math.Sign(v) != Math.Sign(c)) wrongSign++;
            else if (Math.Abs(c) <= 3.0 * floor) belowFloor++;
            else ok = true;
            used[i] = ok;
            if (ok) usedCount++;
        }
        var notes = new List<string>();
        if (wrongSign > 0) notes.Add($"{wrongSign} with zero current or current of the wrong sign for its bias (offset or noise)");
        if (belowFloor > 0) notes.Add($"{belowFloor} at or below 3x the noise floor");
        if (atCompliance > 0) notes.Add($"{atCompliance} at the current compliance");
        if (flagged > 0) notes.Add($"{flagged} flagged by the importer");
        if (notFinite > 0) notes.Add($"{notFinite} not finite");
        var v2 = new double[usedCount];
        var y2 = new double[usedCount];
        double maxAbsV = 0;
        for (int i = 0, u = 0; i < n; i++)
        {
            if (!used[i]) continue;
            v2[u] = curve.VoltageV[i];
            y2[u] = Math.Log(Math.Abs(curve.CurrentA[i]));
            maxAbsV = Math.Max(maxAbsV, Math.Abs(v2[u]));
            u++;
        }
        double? estimated = options.RelativeNoise is null ? NoiseEstimator.RelativeNoise(v2, y2) : null;
        double relative = options.RelativeNoise ?? estimated ?? 1.0;
        var invSigma = new double[usedCount];
        for (int u = 0; u < usedCount; u++)
        {
            double c = Math.Exp(y2[u]);
            invSigma[u] = 1.0 / Math.Sqrt(relative * relative + (floor / c) * (floor / c));
        }
        return new PreparedCurve(used, v2, y2, invSigma, maxAbsV, estimated, notes) { WrongSign = wrongSign };
    }
}
