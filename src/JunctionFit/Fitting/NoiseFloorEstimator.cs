using JunctionFit.Physics.Numerics;
namespace JunctionFit.Fitting;

/// <summary>Where the current noise floor σ_floor of a fit came from.</summary>
public enum NoiseFloorSource
{
    /// <summary>No floor: no zero-bias reading and no detectable quantisation (σ_floor = 0).</summary>
    None,

    /// <summary>Given by the user (<c>--noise-floor</c>).</summary>
    Given,

    /// <summary>Estimated from the currents read at zero bias (and the quantisation step, whichever is larger).</summary>
    ZeroBias,

    /// <summary>Estimated from the quantisation step of the smallest currents.</summary>
    Quantisation,
}

/// <summary>The current noise floor of a curve and how it was found.</summary>
/// <param name="FloorA">σ_floor in ampere (0 when none).</param>
/// <param name="Source">Where it came from.</param>
/// <param name="ZeroBiasSamples">Number of readings at zero bias that entered the estimate.</param>
/// <param name="QuantumA">The current quantisation step in ampere, when one was detected.</param>
public sealed record NoiseFloorEstimate(double FloorA, NoiseFloorSource Source, int ZeroBiasSamples, double? QuantumA)
{
    /// <summary>
    /// When the zero-bias readings suggested a larger floor than the scatter of the low-current points supports, the
    /// floor they suggested (ampere); <see cref="FloorA"/> is then the scatter's estimate (see
    /// <see cref="NoiseFloorEstimator.FloorFromScatter"/>). Null when the floor was not revised.
    /// </summary>
    public double? SuggestedA { get; init; }

    /// <summary>Number of independent triples of low-current points that tested the suggested floor (0 when not revised).</summary>
    public int ScatterTriples { get; init; }

    /// <summary>The floor in words for fit output, for example "1.0e-13 A (from 3 readings at zero bias)".</summary>
    public string Describe() => Source switch
    {
        NoiseFloorSource.Given => $"{FloorA:0.0#e+0} A (given)",
        NoiseFloorSource.ZeroBias when SuggestedA is double suggested =>
            $"{FloorA:0.0#e+0} A (the {ZeroBiasSamples} reading(s) at zero bias suggested {suggested:0.0#e+0} A; the scatter of " +
            $"{ScatterTriples} triples of low-current points does not support it)",
        NoiseFloorSource.ZeroBias => $"{FloorA:0.0#e+0} A (estimated from {ZeroBiasSamples} reading(s) at zero bias" +
                                     (QuantumA is double q ? $"; current quantised in steps of {q:0.0#e+0} A)" : ")"),
        NoiseFloorSource.Quantisation => $"{FloorA:0.0#e+0} A (estimated from the current quantisation step {QuantumA:0.0#e+0} A)",
        _ => "none (no reading at zero bias, no quantisation found)",
    };
}

/// <summary>
/// Model-free estimate of the current noise floor σ_floor of the noise model σ_I² = (r·I)² + σ_floor².
/// <para>
/// Two sources, the larger wins. (1) Readings at zero bias: the device passes no current there, so what the instrument
/// reads is offset plus noise; σ_floor is their root mean square. A bias counts as zero when |V| ≤ 10⁻³ of the sweep's
/// typical step (<see cref="ZeroBiasStepFraction"/>), which also catches the rounding residue of sweeps stepped in
/// floating point (a nominal 0 V read back as 1e-16 V). (2) The quantisation of the smallest currents: when the lowest
/// quarter of the |I| readings are integer multiples of one step q (an instrument's least significant digit on its most
/// sensitive range), σ_floor ≥ q/√12, the standard deviation of a uniform rounding error (common practice, no source).
/// </para>
/// Pure computation.
/// </summary>
public static class NoiseFloorEstimator
{
    /// <summary>A bias with |V| at or below this fraction of the typical sweep step is a zero-bias reading.</summary>
    public const double ZeroBiasStepFraction = 1e-3;

    /// <summary>Fraction of the low currents that must be integer multiples of a step for it to count as quantisation.</summary>
    public const double QuantisedFraction = 0.9;

    /// <summary>Relative tolerance of "integer multiple" in the quantisation test.</summary>
    public const double QuantumTolerance = 0.02;

    /// <summary>The median |ΔV| between consecutive points with distinct finite biases; 0 when there is none.</summary>
    public static double TypicalStepV(ReadOnlySpan<double> voltageV)
    {
        if (voltageV.Length < 2) return 0.0;
        var steps = new double[voltageV.Length - 1];
        int count = 0;
        for (int i = 1; i < voltageV.Length; i++)
        {
            double d = Math.Abs(voltageV[i] - voltageV[i - 1]);
            if (d > 0 && double.IsFinite(d)) steps[count++] = d;
        }
        if (count == 0) return 0.0;
        return Median(steps.AsSpan(0, count));
    }

    /// <summary>True when a bias is a zero-bias reading for a sweep with the given typical step.</summary>
    public static bool IsZeroBias(double voltageV, double typicalStepV) =>
        voltageV == 0 || Math.Abs(voltageV) <= ZeroBiasStepFraction * typicalStepV;

    /// <summary>Estimates σ_floor from a curve's readings.</summary>
    /// <param name="voltageV">Bias of every point.</param>
    /// <param name="currentA">Current of every point.</param>
    /// <param name="extraFloorSamplesA">Further readings known to be at the floor (off-grid near-zero points), may be empty.</param>
    public static NoiseFloorEstimate Estimate(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> currentA, ReadOnlySpan<double> extraFloorSamplesA)
    {
        if (voltageV.Length != currentA.Length) throw new ArgumentException("voltage and current lengths differ");
        return Estimate(voltageV, currentA, extraFloorSamplesA, TypicalStepV(voltageV));
    }

    /// <summary><see cref="Estimate(ReadOnlySpan{double}, ReadOnlySpan{double}, ReadOnlySpan{double})"/> with the typical step already known.</summary>
    internal static NoiseFloorEstimate Estimate(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> currentA, ReadOnlySpan<double> extraFloorSamplesA, double step)
    {
        if (voltageV.Length != currentA.Length) throw new ArgumentException("voltage and current lengths differ");
        double sumSquares = 0;
        int samples = 0;
        for (int i = 0; i < voltageV.Length; i++)
        {
            double v = voltageV[i], c = currentA[i];
            if (!double.IsFinite(v) || !double.IsFinite(c) || !IsZeroBias(v, step)) continue;
            sumSquares += c * c;
            samples++;
        }
        foreach (double c in extraFloorSamplesA)
        {
            if (!double.IsFinite(c)) continue;
            sumSquares += c * c;
            samples++;
        }
        double? quantum = Quantum(currentA);
        double fromQuantum = quantum is double q ? q / Math.Sqrt(12.0) : 0.0;
        double fromZero = samples > 0 ? Math.Sqrt(sumSquares / samples) : 0.0;
        if (fromZero > 0 && fromZero >= fromQuantum) return new NoiseFloorEstimate(fromZero, NoiseFloorSource.ZeroBias, samples, quantum);
        if (fromQuantum > 0) return new NoiseFloorEstimate(fromQuantum, NoiseFloorSource.Quantisation, samples, quantum);
        return new NoiseFloorEstimate(0.0, NoiseFloorSource.None, samples, null);
    }

    /// <summary>Likelihood-ratio statistic above which the scatter rejects a suggested floor: the 99.9 % point of χ²₁, 10.83
    /// (standard table value). The strict level allows for what the Gaussian ln-space model leaves out (points below 3σ
    /// are already dropped, which trims the scatter of the survivors); measured false rejections of a real floor are
    /// in NoiseFloorTests.</summary>
    public const double FloorRejectionStatistic = 10.83;

    /// <summary>A suggested floor is only revised when the scatter's estimate is below this fraction of it.</summary>
    public const double FloorRevisionFraction = 1.0 / 3.0;

    /// <summary>Fewest independent triples of floor-dominated points for the scatter to judge a floor.</summary>
    public const int MinimumFloorTriples = 8;

    /// <summary>
    /// Checks a floor suggested by zero-bias readings against the scatter of the points it would down-weight, and returns
    /// the floor the scatter supports, or null when the suggested floor stands (or the points cannot tell).
    /// <para>
    /// A single zero-bias reading (an offset, one noisy sample) can suggest a floor far above the real noise of the
    /// low-current points. Under the noise model the relative standard deviation of ln|Iᵢ| is sᵢ = √(r² + (σ/|Iᵢ|)²), so a
    /// real floor σ shows as extra point-to-point scatter wherever σ/|I| &gt; r. The test uses y = ln|I/V| (nearly flat
    /// where the current is lowest, near zero bias), sorted by V, and the second differences eₜ = yᵢ − (wₗ yᵢ₋₁ + wᵣ yᵢ₊₁)
    /// of non-overlapping triples (independent under the model) whose middle point is floor-dominated; Var eₜ =
    /// sᵢ² + wₗ² sᵢ₋₁² + wᵣ² sᵢ₊₁² for Gaussian noise. The log-likelihood ℓ(σ) = −½ Σₜ [ln Var eₜ + eₜ²/Var eₜ] is maximised
    /// over σ ∈ {0} ∪ {σ₀·10^(−k/8), k = 0 … 48} (σ₀ the suggested floor); when 2[ℓ(σ̂) − ℓ(σ₀)] exceeds
    /// <see cref="FloorRejectionStatistic"/> and σ̂ is below <see cref="FloorRevisionFraction"/> of σ₀, the suggested floor is
    /// rejected and σ̂ returned (a likelihood-ratio test,
    /// Wilks 1938; the χ²₁ reference is approximate, σ being bounded). Curvature of y left in eₜ only adds scatter, which
    /// keeps a floor: the test errs toward the suggested floor.
    /// </para>
    /// </summary>
    /// <param name="voltageV">Bias of the points that enter the fit (no zero bias), any order.</param>
    /// <param name="logAbsCurrent">ln|I| of those points.</param>
    /// <param name="relativeNoise">The relative noise r.</param>
    /// <param name="suggestedFloorA">The floor σ₀ suggested by the zero-bias readings.</param>
    /// <param name="triples">Number of triples that entered the test.</param>
    public static double? FloorFromScatter(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> logAbsCurrent, double relativeNoise,
        double suggestedFloorA, out int triples)
    {
        if (voltageV.Length != logAbsCurrent.Length) throw new ArgumentException("voltage and current lengths differ");
        triples = 0;
        int m = voltageV.Length;
        if (!(suggestedFloorA > 0) || !(relativeNoise > 0) || m < 3) return null;
        var v = voltageV.ToArray();
        var y = new double[m];
        var logI = logAbsCurrent.ToArray();
        SortKernels.SortWithItems(v, logI);
        for (int i = 0; i < m; i++) y[i] = logI[i] - Math.Log(Math.Abs(v[i]));
        // Per triple: e² and Var e = r²·(1 + wₗ² + wᵣ²) + σ²·(1/Iᵢ² + wₗ²/Iᵢ₋₁² + wᵣ²/Iᵢ₊₁²), kept as its two coefficients.
        var tested = new List<(double E2, double NoiseCoefficient, double FloorCoefficient)>();
        for (int i = 1; i < m - 1; i++)
        {
            double im = Math.Exp(logI[i]);
            if (!(suggestedFloorA / im > relativeNoise)) continue;
            if (!NoiseEstimator.TrySecondDifference(v, y, i, out double e, out double wl, out double wr)) continue;
            tested.Add((e * e, 1.0 + wl * wl + wr * wr,
                1.0 / (im * im) + wl * wl * Math.Exp(-2 * logI[i - 1]) + wr * wr * Math.Exp(-2 * logI[i + 1])));
            i += 2; // non-overlapping: the next triple starts after this one's right point
        }
        triples = tested.Count;
        if (triples < MinimumFloorTriples) return null;
        double r2 = relativeNoise * relativeNoise;
        double LogLikelihood(double floorA)
        {
            double f2 = floorA * floorA, sum = 0;
            foreach (var t in tested)
            {
                double variance = r2 * t.NoiseCoefficient + f2 * t.FloorCoefficient;
                sum += Math.Log(variance) + t.E2 / variance;
            }
            return -0.5 * sum;
        }
        double atSuggested = LogLikelihood(suggestedFloorA);
        double best = LogLikelihood(0.0), bestFloor = 0.0;
        for (int k = 1; k <= 48; k++)
        {
            double floor = suggestedFloorA * Math.Pow(10.0, -k / 8.0);
            double l = LogLikelihood(floor);
            if (l > best) { best = l; bestFloor = floor; }
        }
        if (atSuggested >= best) return null;
        return 2.0 * (best - atSuggested) > FloorRejectionStatistic && bestFloor < FloorRevisionFraction * suggestedFloorA ? bestFloor : null;
    }

    /// <summary>
    /// The quantisation step of the smallest currents, or null. Takes the lowest quarter of the non-zero |I| (at least 8
    /// readings), and tries q = δ/k for k = 1 … 10, δ the smallest positive difference between them: the largest q of which
    /// at least <see cref="QuantisedFraction"/> of them are integer multiples (within <see cref="QuantumTolerance"/> of q),
    /// with at least three distinct multiples, is the step.
    /// </summary>
    public static double? Quantum(ReadOnlySpan<double> currentA)
    {
        int nonZero = 0;
        foreach (double c in currentA) if (c != 0 && double.IsFinite(c)) nonZero++;
        if (nonZero < 32) return null;
        var abs = new double[nonZero];
        int k0 = 0;
        foreach (double c in currentA) if (c != 0 && double.IsFinite(c)) abs[k0++] = Math.Abs(c);
        int low = Math.Max(8, nonZero / 4);
        SortKernels.SortSmallest(abs, low); // only the lowest quarter is read below
        double delta = double.PositiveInfinity;
        for (int i = 1; i < low; i++)
        {
            double d = abs[i] - abs[i - 1];
            if (d > 0) delta = Math.Min(delta, d);
        }
        if (!double.IsFinite(delta)) return null;
        for (int k = 1; k <= 10; k++)
        {
            double q = delta / k;
            int multiples = 0;
            // Distinct multiples are counted up to three (all the test needs): the first two seen, then any third.
            int distinct = 0;
            long first = 0, second = 0;
            for (int i = 0; i < low; i++)
            {
                double ratio = abs[i] / q;
                double nearest = Math.Round(ratio);
                if (nearest >= 1 && Math.Abs(ratio - nearest) <= QuantumTolerance)
                {
                    multiples++;
                    long key = (long)nearest;
                    if (distinct == 0) { first = key; distinct = 1; }
                    else if (distinct == 1 && key != first) { second = key; distinct = 2; }
                    else if (distinct == 2 && key != first && key != second) distinct = 3;
                }
            }
            if (multiples >= QuantisedFraction * low && distinct >= 3) return q;
        }
        return null;
    }

    private static double Median(Span<double> values)
    {
        return SortKernels.Median(values);
    }
}
