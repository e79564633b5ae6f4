using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Physics;

namespace JunctionFit.Fitting;

/// <summary>
/// What to fit and how. Immutable; validated on construction. Values are SI (area in m², energies in J).
/// </summary>
public sealed record FitOptions
{
    /// <summary>
    /// Parameters held fixed, by key, at a value in the key's SI unit (<see cref="ParameterKey.SiUnit"/>: the thickness in
    /// metres, the barrier height in joules, the area in m²), whatever the display unit in the key's name.
    /// </summary>
    public ImmutableDictionary<ParameterKey, double> FixedValues { get; init; } = ImmutableDictionary<ParameterKey, double>.Empty;

    /// <summary>Keys of parameters that are fixed by default (mass ratio) but freed by the user.</summary>
    public ImmutableHashSet<ParameterKey> FreedKeys { get; init; } = [];

    /// <summary>
    /// Start values by key in the key's SI unit, overriding the data-driven guess: a given start of the barrier height or
    /// the thickness replaces the start grid along that parameter.
    /// </summary>
    public ImmutableDictionary<ParameterKey, double> StartValues { get; init; } = ImmutableDictionary<ParameterKey, double>.Empty;

    /// <summary>
    /// Fit bounds by key in SI, narrowing the physical range of a free parameter (<see cref="ParameterDefinition.WithBounds"/>);
    /// intervals and profile searches stay inside them.
    /// </summary>
    public ImmutableDictionary<ParameterKey, ParameterBounds> Bounds { get; init; } = ImmutableDictionary<ParameterKey, ParameterBounds>.Empty;

    /// <summary>Relative current noise r of σ_I² = (r·I)² + σ_floor²; null: unknown (weights relative, covariance scaled).</summary>
    public double? RelativeNoise { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>
    /// Current noise floor σ_floor in ampere; points with |I| ≤ 3·σ_floor are masked. Null: estimated from the data
    /// (<see cref="NoiseFloorEstimator"/>).
    /// </summary>
    public double? NoiseFloorA { get; init => field = value is double v ? Guard.NonNegative(v) : null; }

    /// <summary>
    /// Lowest bias in volt of the points that enter the fit (inclusive); null: no lower limit. With
    /// <see cref="BiasWindowHighV"/> it selects a branch or a range of the sweep (<c>--bias-window</c>, <c>--polarity</c>).
    /// </summary>
    public double? BiasWindowLowV { get; init => field = value is double v ? Guard.Finite(v) : null; }

    /// <summary>Highest bias in volt of the points that enter the fit (inclusive); null: no upper limit.</summary>
    public double? BiasWindowHighV { get; init => field = value is double v ? Guard.Finite(v) : null; }

    /// <summary>
    /// Largest systematic misfit, as the RMS of the ln|I| residuals beyond the point-to-point noise, for which a fit is
    /// <c>ok</c> (default 0.05, about 5 % in current; common practice, no source). See docs/fitting.md, "Status".
    /// </summary>
    public double MisfitTolerance { get; init => field = Guard.Positive(value); } = DefaultMisfitTolerance;

    /// <summary>Default of <see cref="MisfitTolerance"/>.</summary>
    public const double DefaultMisfitTolerance = 0.05;

    /// <summary>Fit only the points of one sweep direction: +1 rising bias, −1 falling bias, 0 both (default).</summary>
    public int SweepDirection { get; init => field = Guard.InRange(value, -1, 1); }

    /// <summary>Keep the first point of a trace even when it looks like a settling artefact (default: leave it out).</summary>
    public bool KeepSettling { get; init; }

    /// <summary>
    /// Run the curve diagnoses that need extra fits (separate fits of the two sweep directions for hysteresis). On by
    /// default; the direction fits themselves run with it off.
    /// </summary>
    public bool DirectionFits { get; init; } = true;

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
