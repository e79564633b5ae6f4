using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Physics.Numerics;

namespace JunctionFit.Fitting;

/// <summary>
/// The points of a curve that enter a fit, with their ln|I| and weights.
/// <para>
/// Left out, and counted by reason: non-finite values; zero-bias readings (|V| ≤ 10⁻³ of the sweep step, see
/// <see cref="NoiseFloorEstimator"/>); off-grid points closer to zero bias than half a step whose conductance |I/V| is off
/// that of the nearest on-grid points by more than a factor 3 (a floor reading at a bias that carries no current of its
/// own); points outside the bias window; points flagged by the importer; points at compliance (|I| ≥ 0.999 × compliance);
/// a settling artefact on the first point of a trace (see <see cref="CurveDiagnostics.SettlingPoints"/>); zero or
/// wrong-sign current; and |I| ≤ 3·σ_floor.
/// </para>
/// <para>
/// Weights 1/sᵢ with sᵢ = √(r² + (σ_floor/|Iᵢ|)²), the relative standard deviation of ln|Iᵢ| from the noise model
/// σ_I² = (r·I)² + σ_floor²; r is the stated relative noise or, when none is stated, the point-to-point estimate of
/// <see cref="NoiseEstimator"/>; σ_floor is the stated floor or the estimate of <see cref="NoiseFloorEstimator"/>.
/// A point is "down-weighted" when its floor term exceeds its relative term (σ_floor/|I| > r).
/// </para>
/// </summary>
internal sealed record PreparedCurve(
    bool[] Used, double[] VoltageV, double[] LogAbsCurrent, double[] InverseSigma, double MaxAbsVoltageV,
    double? EstimatedRelativeNoise, List<string> MaskNotes)
{
    /// <summary>Conductance ratio beyond which an off-grid near-zero point is a floor reading (common practice, no source).</summary>
    public const double NearZeroConductanceFactor = 3.0;

    /// <summary>Points left out because the current has the wrong sign for its bias (or is zero).</summary>
    public int WrongSign { get; init; }

    /// <summary>Wrong-sign points in the upper half of the bias range (where any real device current dominates offsets).</summary>
    public int WrongSignHighBias { get; init; }

    /// <summary>Points left out at or below 3·σ_floor.</summary>
    public int BelowFloor { get; init; }

    /// <summary>Used points whose floor term dominates their weight.</summary>
    public int DownWeighted { get; init; }

    /// <summary>The noise floor used for the weights.</summary>
    public NoiseFloorEstimate Floor { get; init; } = new(0.0, NoiseFloorSource.None, 0, null);

    /// <summary>The relative noise r used for the weights.</summary>
    public double RelativeNoiseUsed { get; init; } = 1.0;

    /// <summary>Points (indices into the curve) left out as a settling artefact.</summary>
    public int[] SettlingIndices { get; init; } = [];

    /// <summary>Points with a finite, non-zero bias inside the bias window (before the current-based masks).</summary>
    public int InWindow { get; init; }

    /// <summary>
    /// The points, ln|I| and weights of a curve. A floor estimated from zero-bias readings is checked against the scatter
    /// of the points it down-weights (<see cref="NoiseFloorEstimator.FloorFromScatter"/>); when the scatter rejects it,
    /// the curve is prepared again with the floor the scatter supports (never below the quantisation floor q/√12).
    /// </summary>
    public static PreparedCurve From(IvCurve curve, FitOptions options)
    {
        var first = Build(curve, options, null);
        if (first.Floor.Source != NoiseFloorSource.ZeroBias || first.DownWeighted < NoiseFloorEstimator.MinimumFloorTriples) return first;
        if (NoiseFloorEstimator.FloorFromScatter(first.VoltageV, first.LogAbsCurrent, first.RelativeNoiseUsed, first.Floor.FloorA, out int triples)
            is not double supported)
        {
            return first;
        }
        double quantisationFloor = first.Floor.QuantumA is double q ? q / Math.Sqrt(12.0) : 0.0;
        var revised = first.Floor with { FloorA = Math.Max(supported, quantisationFloor), SuggestedA = first.Floor.FloorA, ScatterTriples = triples };
        return Build(curve, options, revised);
    }

    private static PreparedCurve Build(IvCurve curve, FitOptions options, NoiseFloorEstimate? revisedFloor)
    {
        double? compliance = options.ComplianceA ?? curve.ComplianceA;
        int n = curve.Count;
        var vAll = curve.VoltageV.AsSpan();
        var iAll = curve.CurrentA.AsSpan();
        double step = NoiseFloorEstimator.TypicalStepV(vAll);
        double lowV = options.BiasWindowLowV ?? double.NegativeInfinity, highV = options.BiasWindowHighV ?? double.PositiveInfinity;

        // Off-grid near-zero points whose conductance disagrees with their on-grid neighbours are floor readings.
        var nearZeroFloor = NearZeroFloorReadings(vAll, iAll, step);
        var settling = options.KeepSettling ? [] : CurveDiagnostics.SettlingPoints(vAll, iAll, step);
        var floor = revisedFloor ?? (options.NoiseFloorA is double given
            ? new NoiseFloorEstimate(given, given > 0 ? NoiseFloorSource.Given : NoiseFloorSource.None, 0, null)
            : NoiseFloorEstimator.Estimate(vAll, iAll, nearZeroFloor.Currents, step));
        double floorA = floor.FloorA;

        var directions = options.SweepDirection != 0 ? CurveDiagnostics.Directions(vAll) : null;
        var used = new bool[n];
        int usedCount = 0, wrongSign = 0, belowFloor = 0, atCompliance = 0, flagged = 0, notFinite = 0, zeroBias = 0;
        int outside = 0, offGrid = 0, settled = 0, inWindow = 0, wrongSignHighBias = 0, zeroBiasResidue = 0;
        double maxAbsBias = 0;
        foreach (double v in vAll) if (double.IsFinite(v)) maxAbsBias = Math.Max(maxAbsBias, Math.Abs(v));
        for (int i = 0; i < n; i++)
        {
            double v = vAll[i], c = iAll[i];
            bool ok = false;
            if (!double.IsFinite(v) || !double.IsFinite(c)) notFinite++;
            else if (NoiseFloorEstimator.IsZeroBias(v, step)) { zeroBias++; if (v != 0) zeroBiasResidue++; }
            else if (v < lowV || v > highV || (directions is not null && directions[i] != options.SweepDirection)) outside++;
            else if (Array.IndexOf(nearZeroFloor.Indices, i) >= 0) { offGrid++; inWindow++; }
            else if (curve.ImportMask.Length == n && curve.ImportMask[i]) { flagged++; inWindow++; }
            else if (compliance is double comp && Math.Abs(c) >= 0.999 * comp) { atCompliance++; inWindow++; }
            else if (Array.IndexOf(settling, i) >= 0) { settled++; inWindow++; }
            else if (c == 0 || Math.Sign(v) != Math.Sign(c))
            {
                wrongSign++;
                inWindow++;
                if (Math.Abs(v) > 0.5 * maxAbsBias) wrongSignHighBias++;
            }
            else if (Math.Abs(c) <= 3.0 * floorA) { belowFloor++; inWindow++; }
            else { ok = true; inWindow++; }
            used[i] = ok;
            if (ok) usedCount++;
        }
        var notes = new List<string>();
        // A reading at exactly 0 V is left out silently (it carries no information on a barrier); a bias at rounding level
        // (a float-stepped 0 V) is worth a word.
        if (zeroBiasResidue > 0) notes.Add($"{zeroBias} at zero bias (|V| ≤ {NoiseFloorEstimator.ZeroBiasStepFraction:0e0} of the {step:0.###} V step; their currents measure the floor)");
        if (offGrid > 0) notes.Add($"{offGrid} off the sweep grid near zero bias with a current at the instrument floor (conductance off its neighbours' by more than {NearZeroConductanceFactor:0}x)");
        if (outside > 0) notes.Add($"{outside} outside the bias window or sweep direction");
        if (wrongSign > 0) notes.Add($"{wrongSign} with zero current or current of the wrong sign for its bias (offset or noise)");
        if (belowFloor > 0) notes.Add($"{belowFloor} at or below 3x the noise floor");
        if (atCompliance > 0) notes.Add($"{atCompliance} at the current compliance ({new Remedy(RemedyKind.KeepCompliance)} keeps them)");
        if (flagged > 0) notes.Add($"{flagged} flagged by the importer (a flat run at the current compliance; {new Remedy(RemedyKind.KeepCompliance)} keeps them)");
        if (settled > 0) notes.Add($"{settled} settling artefact(s) at the start of a trace ({new Remedy(RemedyKind.KeepSettling)} keeps them)");
        if (notFinite > 0) notes.Add($"{notFinite} not finite");
        var v2 = new double[usedCount];
        var y2 = new double[usedCount];
        double maxAbsV = 0;
        for (int i = 0, u = 0; i < n; i++)
        {
            if (!used[i]) continue;
            v2[u] = vAll[i];
            y2[u] = Math.Log(Math.Abs(iAll[i]));
            maxAbsV = Math.Max(maxAbsV, Math.Abs(v2[u]));
            u++;
        }
        double? estimated = null;
        if (options.RelativeNoise is null)
        {
            // Triples within each sweep direction: hysteresis between directions is not noise.
            var dirs = directions ?? CurveDiagnostics.Directions(vAll);
            var groups = new sbyte[usedCount];
            bool both = false;
            for (int i = 0, u = 0; i < n; i++)
            {
                if (!used[i]) continue;
                groups[u] = dirs[i];
                both |= groups[u] != groups[0];
                u++;
            }
            // The second differences are taken both in ln|I| and in ln|I/V| against V, and the smaller estimate is kept: each
            // adds the local curvature of its curve to the noise, and ln|I/V| is nearly flat where ln|I| bends most (near 0 V).
            var g2 = new double[usedCount];
            for (int u = 0; u < usedCount; u++) g2[u] = y2[u] - Math.Log(Math.Abs(v2[u]));
            double? inCurrent = both ? NoiseEstimator.RelativeNoise(v2, y2, groups) : NoiseEstimator.RelativeNoise(v2, y2);
            double? inConductance = both ? NoiseEstimator.RelativeNoise(v2, g2, groups) : NoiseEstimator.RelativeNoise(v2, g2);
            estimated = inCurrent is double a && inConductance is double b ? Math.Min(a, b) : inCurrent ?? inConductance;
        }
        double relative = options.RelativeNoise ?? estimated ?? 1.0;
        var invSigma = new double[usedCount];
        int downWeighted = 0;
        for (int u = 0; u < usedCount; u++)
        {
            double floorRelative = floorA / Math.Exp(y2[u]);
            if (floorRelative > relative) downWeighted++;
            invSigma[u] = 1.0 / Math.Sqrt(relative * relative + floorRelative * floorRelative);
        }
        return new PreparedCurve(used, v2, y2, invSigma, maxAbsV, estimated, notes)
        {
            WrongSign = wrongSign,
            WrongSignHighBias = wrongSignHighBias,
            BelowFloor = belowFloor,
            DownWeighted = downWeighted,
            Floor = floor,
            RelativeNoiseUsed = relative,
            SettlingIndices = settling,
            InWindow = inWindow,
        };
    }

    /// <summary>
    /// Off-grid points with 10⁻³·step &lt; |V| &lt; step/2 whose conductance |I/V| differs from the median conductance of the
    /// (up to four) on-grid points nearest zero bias by more than <see cref="NearZeroConductanceFactor"/>: at such a bias
    /// the device current is far below what the instrument reads, so the reading is the floor.
    /// </summary>
    private static (int[] Indices, double[] Currents) NearZeroFloorReadings(ReadOnlySpan<double> v, ReadOnlySpan<double> c, double step)
    {
        if (!(step > 0)) return ([], []);
        List<int>? candidates = null;
        for (int i = 0; i < v.Length; i++)
        {
            double a = Math.Abs(v[i]);
            if (double.IsFinite(a) && double.IsFinite(c[i]) && a > NoiseFloorEstimator.ZeroBiasStepFraction * step && a < 0.5 * step)
            {
                (candidates ??= []).Add(i);
            }
        }
        if (candidates is null) return ([], []);
        // The on-grid points nearest zero bias: the four smallest |V| ≥ step/2 with a finite, same-sign current.
        Span<double> nearestV = stackalloc double[4];
        Span<double> nearestG = stackalloc double[4];
        int count = 0;
        for (int i = 0; i < v.Length; i++)
        {
            double a = Math.Abs(v[i]);
            if (!(a >= 0.5 * step) || !double.IsFinite(a) || !double.IsFinite(c[i]) || c[i] == 0 || Math.Sign(c[i]) != Math.Sign(v[i])) continue;
            double g = Math.Abs(c[i]) / a;
            if (count < 4) { nearestV[count] = a; nearestG[count] = g; count++; continue; }
            int worst = 0;
            for (int k = 1; k < 4; k++) if (nearestV[k] > nearestV[worst]) worst = k;
            if (a < nearestV[worst]) { nearestV[worst] = a; nearestG[worst] = g; }
        }
        if (count == 0) return ([], []);
        var gs = nearestG[..count].ToArray();
        SortKernels.Sort(gs);
        double gRef = count % 2 == 1 ? gs[count / 2] : Math.Sqrt(gs[count / 2 - 1] * gs[count / 2]);
        var indices = new List<int>();
        var currents = new List<double>();
        foreach (int i in candidates)
        {
            double g = Math.Abs(c[i] / v[i]);
            bool floorReading = c[i] == 0 || Math.Sign(c[i]) != Math.Sign(v[i])
                || g > NearZeroConductanceFactor * gRef || g < gRef / NearZeroConductanceFactor;
            if (floorReading) { indices.Add(i); currents.Add(c[i]); }
        }
        return (indices.ToArray(), currents.ToArray());
    }
}
