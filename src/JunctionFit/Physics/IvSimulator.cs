using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>Shape of a simulated bias sweep.</summary>
public enum SweepShape
{
    /// <summary>Evenly spaced from the start to the end voltage (both polarities when the range spans zero).</summary>
    Linear,

    /// <summary>
    /// Positive bias only: evenly spaced from max(0, min(from, to)) to max(from, to); needs max(from, to) &gt; 0.
    /// </summary>
    PositiveOnly,

    /// <summary>
    /// A loop 0 → +V → −V → 0 with V = max(|from|, |to|), the points evenly spaced along the path (length 4V), starting and ending at 0.
    /// </summary>
    Loop,
}

/// <summary>What to simulate. Immutable; validated on construction.</summary>
public sealed record SimulationSpec
{
    /// <summary>Creates a specification.</summary>
    /// <param name="fromV">First bias in volt.</param>
    /// <param name="toV">Last bias in volt.</param>
    /// <param name="points">Number of points, at least 2.</param>
    public SimulationSpec(double fromV, double toV, int points)
    {
        FromV = Guard.Finite(fromV);
        ToV = Guard.Finite(toV);
        Points = Guard.AtLeast(points, 2);
    }

    /// <summary>First bias in volt.</summary>
    public double FromV { get; }

    /// <summary>Last bias in volt.</summary>
    public double ToV { get; }

    /// <summary>Number of points.</summary>
    public int Points { get; }

    /// <summary>Sweep shape.</summary>
    public SweepShape Shape { get; init; } = SweepShape.Linear;

    /// <summary>Relative Gaussian current noise r (σ = r·|I|); 0 for none.</summary>
    public double RelativeNoise { get; init => field = Guard.NonNegative(value); }

    /// <summary>Absolute Gaussian current noise floor σ_floor in ampere; 0 for none.</summary>
    public double NoiseFloorA { get; init => field = Guard.NonNegative(value); }

    /// <summary>Seed of the noise generator (same seed, same curve).</summary>
    public int Seed { get; init; } = 1;
}

/// <summary>Generates synthetic I–V sweeps from a junction model. Pure computation.</summary>
public static class IvSimulator
{
    /// <summary>Simulates one sweep. Noise: I = I₀ + N(0, (r·I₀)² + σ_floor²), from a seeded generator.</summary>
    /// <param name="model">The junction model.</param>
    /// <param name="parametersSi">SI parameters in the model's order.</param>
    /// <param name="spec">Sweep and noise.</param>
    /// <returns>Voltages (V) and currents (A).</returns>
    public static (ImmutableArray<double> VoltageV, ImmutableArray<double> CurrentA) Simulate(
        JunctionCurrentModel model, ReadOnlySpan<double> parametersSi, SimulationSpec spec)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(spec);
        if (parametersSi.Length != model.Parameters.Count)
        {
            throw new ArgumentException($"expected {model.Parameters.Count} parameters, got {parametersSi.Length}", nameof(parametersSi));
        }
        var v = SweepVoltages(spec);
        var i = new double[spec.Points];
        var rng = new Random(spec.Seed);
        for (int k = 0; k < spec.Points; k++)
        {
            double current = model.Current(v[k], parametersSi);
            double sigma = Math.Sqrt(Square(spec.RelativeNoise * current) + Square(spec.NoiseFloorA));
            if (sigma > 0) current += sigma * StandardNormal(rng);
            i[k] = current;
        }
        return (ImmutableArray.Create(v), ImmutableArray.Create(i));
    }

    /// <summary>The bias points of a sweep, in volt, in measurement order (see <see cref="SweepShape"/>).</summary>
    /// <param name="spec">Sweep range, number of points and shape.</param>
    /// <returns>A new array of <see cref="SimulationSpec.Points"/> voltages.</returns>
    /// <exception cref="ArgumentException">The shape cannot be made from the range (positive only with no positive bias, loop with zero range).</exception>
    public static double[] SweepVoltages(SimulationSpec spec)
    {
        ArgumentNullException.ThrowIfNull(spec);
        int n = spec.Points;
        var v = new double[n];
        switch (spec.Shape)
        {
            case SweepShape.Linear:
                for (int k = 0; k < n; k++) v[k] = spec.FromV + (spec.ToV - spec.FromV) * k / (n - 1);
                break;
            case SweepShape.PositiveOnly:
            {
                double top = Math.Max(spec.FromV, spec.ToV);
                if (!(top > 0)) throw new ArgumentException("a positive-only sweep needs a positive end voltage", nameof(spec));
                double start = Math.Max(0.0, Math.Min(spec.FromV, spec.ToV));
                for (int k = 0; k < n; k++) v[k] = start + (top - start) * k / (n - 1);
                break;
            }
            case SweepShape.Loop:
            {
                double amplitude = Math.Max(Math.Abs(spec.FromV), Math.Abs(spec.ToV));
                if (!(amplitude > 0)) throw new ArgumentException("a loop sweep needs a non-zero voltage range", nameof(spec));
                for (int k = 0; k < n; k++)
                {
                    double s = 4.0 * amplitude * k / (n - 1);
                    v[k] = s <= amplitude ? s : s <= 3.0 * amplitude ? 2.0 * amplitude - s : s - 4.0 * amplitude;
                }
                v[n - 1] = 0.0;
                break;
            }
            default:
                throw new ArgumentException($"unknown sweep shape {spec.Shape}", nameof(spec));
        }
        return v;
    }

    private static double Square(double x) => x * x;

    /// <summary>Box–Muller standard normal deviate.</summary>
    internal static double StandardNormal(Random rng)
    {
        double u1 = 1.0 - rng.NextDouble();
        double u2 = rng.NextDouble();
        return Math.Sqrt(-2.0 * Math.Log(u1)) * Math.Cos(2.0 * Math.PI * u2);
    }
}
