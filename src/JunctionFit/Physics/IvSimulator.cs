using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>Shape of a simulated bias sweep.</summary>
public enum SweepShape
{
    /// <summary>Evenly spaced from the start to the end voltage.</summary>
    Linear,
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
        var v = new double[spec.Points];
        var i = new double[spec.Points];
        var rng = new Random(spec.Seed);
        for (int k = 0; k < spec.Points; k++)
        {
            double voltage = spec.FromV + (spec.ToV - spec.FromV) * k / (spec.Points - 1);
            double current = model.Current(voltage, parametersSi);
            double sigma = Math.Sqrt(Square(spec.RelativeNoise * current) + Square(spec.NoiseFloorA));
            if (sigma > 0) current += sigma * StandardNormal(rng);
            v[k] = voltage;
            i[k] = current;
        }
        return (ImmutableArray.Create(v), ImmutableArray.Create(i));
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
