using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Fitting;

/// <summary>
/// What to fit and how. Immutable; validated on construction. Values are SI (area in m², energies in J).
/// </summary>
public sealed record FitOptions
{
    /// <summary>Parameters held fixed at the given SI value, by key (for example <c>area_m2</c>).</summary>
    public ImmutableDictionary<string, double> FixedValues { get; init; } = ImmutableDictionary<string, double>.Empty;

    /// <summary>Keys of parameters that are fixed by default (mass ratio) but freed by the user.</summary>
    public ImmutableHashSet<string> FreedKeys { get; init; } = [];

    /// <summary>Start values in SI by key, overriding the data-driven guess.</summary>
    public ImmutableDictionary<string, double> StartValues { get; init; } = ImmutableDictionary<string, double>.Empty;

    /// <summary>Relative current noise r of σ_I² = (r·I)² + σ_floor²; null: unknown (weights relative, covariance scaled).</summary>
    public double? RelativeNoise { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>Current noise floor σ_floor in ampere; points with |I| ≤ 3·σ_floor are masked. Null: 0.</summary>
    public double? NoiseFloorA { get; init => field = value is double v ? Guard.NonNegative(v) : null; }

    /// <summary>Current compliance in ampere; points with |I| ≥ 0.999·compliance are masked. Null: the file's, if any.</summary>
    public double? ComplianceA { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>Hold the area fixed at the file's stated area when the file states one (and no fixed value is given).</summary>
    public bool FixAreaFromMetadata { get; init; }

    /// <summary>Solver options.</summary>
    public LevenbergMarquardtOptions Solver { get; init; } = DefaultSolver;

    /// <summary>
    /// Solver settings for junction fits: relative reduction and step tolerances of 1e-9 (far below the noise of any
    /// measured curve), and up to 2000 iterations because an area-free fit can crawl along a curved, nearly flat valley.
    /// </summary>
    public static LevenbergMarquardtOptions DefaultSolver { get; } = new()
    {
        MaxIterations = 2000,
        RelativeReductionTolerance = 1e-9,
        StepTolerance = 1e-9,
    };

    /// <summary>Number of grid starts refined by the solver (multi-start), at least 1.</summary>
    public int Starts { get; init => field = Guard.AtLeast(value, 1); } = 2;

    /// <summary>Default options: area, φ and d free, mass ratio fixed at 1, noise unknown.</summary>
    public static FitOptions Default { get; } = new();
}
