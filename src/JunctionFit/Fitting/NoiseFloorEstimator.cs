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
    /// <summary>The floor in words for fit output, for example "1.0e-13 A (from 3 readings at zero bias)".</summary>
    public string Describe() => Source switch
    {
        NoiseFloorSource.Given => $"{FloorA:0.0#e+0} A (given)",
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
