using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Results;

/// <summary>Outcome of one fit.</summary>
public enum FitStatus
{
    /// <summary>Converged and the model describes the data.</summary>
    Ok,

    /// <summary>Converged, but the model does not describe the data (see warnings).</summary>
    PoorFit,

    /// <summary>No usable result; <see cref="FitResult.Error"/> says why.</summary>
    Failed,
}

/// <summary>One fitted or fixed parameter in its display unit (the unit is part of <see cref="Key"/>).</summary>
/// <param name="Key">Stable key, for example <c>barrier_height_eV</c>.</param>
/// <param name="Symbol">Symbol for plots (φ, d, A, m*/mₑ).</param>
/// <param name="Unit">Display unit.</param>
/// <param name="Value">Estimate (or the fixed value).</param>
/// <param name="StandardError">Standard error, null when fixed or not estimable.</param>
/// <param name="Lower95">Lower end of the 95 % interval, null when fixed or not estimable.</param>
/// <param name="Upper95">Upper end of the 95 % interval.</param>
/// <param name="IsFixed">True when held fixed during the fit.</param>
public sealed record ParameterEstimate(
    string Key, string Symbol, string Unit, double Value, double? StandardError, double? Lower95, double? Upper95, bool IsFixed)
{
    /// <summary>
    /// Set when the data do not determine the parameter (it ran to the edge of its physical range): <see cref="Value"/> is
    /// NaN, and the bound says how far the data constrain it from one side.
    /// </summary>
    public OneSidedBound? Bound { get; init; }

    /// <summary>True when the data do not determine this parameter (see <see cref="Bound"/>).</summary>
    public bool IsUndetermined => !IsFixed && double.IsNaN(Value);
}

/// <summary>A one-sided 95 % limit on a parameter that the data do not determine, in its display unit.</summary>
/// <param name="Value">The limit.</param>
/// <param name="IsLower">True for "at least Value" (the parameter ran high), false for "at most Value".</param>
/// <param name="Method">How the limit was found, in words.</param>
public sealed record OneSidedBound(double Value, bool IsLower, string Method);

/// <summary>The two sweep directions of a curve fitted separately (hysteresis).</summary>
/// <param name="RisingPoints">Points fitted of the rising-bias sweep.</param>
/// <param name="FallingPoints">Points fitted of the falling-bias sweep.</param>
/// <param name="LogCurrentRms">RMS of ln(I_rising/I_falling) at the biases measured in both directions; null when none is shared.</param>
/// <param name="Differences">Rising minus falling for every parameter fitted in both.</param>
/// <param name="Significant">True when the directions differ beyond the noise (reported as a warning).</param>
public sealed record HysteresisReport(int RisingPoints, int FallingPoints, double? LogCurrentRms,
    ImmutableArray<DirectionDifference> Differences, bool Significant);

/// <summary>One parameter fitted on each sweep direction, in its display unit.</summary>
/// <param name="Key">Parameter key.</param>
/// <param name="Rising">Estimate on the rising-bias sweep.</param>
/// <param name="Falling">Estimate on the falling-bias sweep.</param>
/// <param name="StandardError">Standard error of the difference, √(SE₁² + SE₂²), when both are known.</param>
public sealed record DirectionDifference(string Key, double Rising, double Falling, double? StandardError)
{
    /// <summary>Rising minus falling.</summary>
    public double Difference => Rising - Falling;

    /// <summary>95 % interval of the difference (normal approximation), when the standard error is known.</summary>
    public (double Lower, double Upper)? Interval95 => StandardError is double se ? (Difference - 1.96 * se, Difference + 1.96 * se) : null;
}

/// <summary>Figures of merit of a fit.</summary>
/// <param name="PointsUsed">Points that entered the residuals.</param>
/// <param name="PointsMasked">Points left out (noise floor, wrong sign, compliance, zero bias).</param>
/// <param name="Iterations">Solver iterations of the winning start.</param>
/// <param name="ResidualSumOfSquares">Weighted residual sum of squares.</param>
/// <param name="ReducedChiSquare">RSS / (points − free parameters), null when there are no degrees of freedom.</param>
/// <param name="Converged">True when the solver met a convergence test.</param>
/// <param name="StopReason">The solver's exit condition in words.</param>
/// <param name="CovarianceScaling">How the covariance was scaled (for example "scaled by reduced chi-square").</param>
/// <param name="IntervalMethod">How the 95 % intervals were computed.</param>
public sealed record FitQuality(
    int PointsUsed, int PointsMasked, int Iterations, double ResidualSumOfSquares, double? ReducedChiSquare,
    bool Converged, string StopReason, string CovarianceScaling, string IntervalMethod)
{
    /// <summary>Current noise floor σ_floor used in the weights, in ampere.</summary>
    public double NoiseFloorA { get; init; }

    /// <summary>Where the floor came from, in words (for example "1.0e-13 A (estimated from 3 readings at zero bias)").</summary>
    public string? NoiseFloorDescription { get; init; }

    /// <summary>Used points whose weight the floor dominates (σ_floor/|I| larger than the relative noise).</summary>
    public int PointsDownWeighted { get; init; }

    /// <summary>Relative noise r used in the weights (stated, or estimated from the point-to-point scatter).</summary>
    public double? RelativeNoise { get; init; }

    /// <summary>RMS of the ln|I| residuals of the used points (weighted as in the fit, normalised to the relative noise).</summary>
    public double? LogResidualRms { get; init; }

    /// <summary>Systematic misfit: √(RMS² − r²), the part of the residual scatter beyond the point-to-point noise.</summary>
    public double? SystematicMisfit { get; init; }

    /// <summary>The tolerance on <see cref="SystematicMisfit"/> that the status rule used.</summary>
    public double? MisfitTolerance { get; init; }
}

/// <summary>The data and the model along the measured voltages, for plots. A snapshot.</summary>
/// <param name="VoltageV">Bias in volt.</param>
/// <param name="MeasuredCurrentA">Measured current in ampere.</param>
/// <param name="ModelCurrentA">Fitted model current in ampere at the same voltages.</param>
/// <param name="Used">True where the point entered the fit.</param>
/// <param name="LogResidual">ln|I_meas| − ln|I_model| (NaN where undefined).</param>
public sealed record CurveSnapshot(
    ImmutableArray<double> VoltageV,
    ImmutableArray<double> MeasuredCurrentA,
    ImmutableArray<double> ModelCurrentA,
    ImmutableArray<bool> Used,
    ImmutableArray<double> LogResidual);

/// <summary>Everything known about one fit. Immutable; no reference back into solver state.</summary>
public sealed record FitResult
{
    /// <summary>The input path as given.</summary>
    public required string SourcePath { get; init; }

    /// <summary>Model name (as for <c>--model</c>).</summary>
    public required string Model { get; init; }

    /// <summary>Outcome.</summary>
    public required FitStatus Status { get; init; }

    /// <summary>Why the fit failed, in words a user can act on; null unless failed.</summary>
    public string? Error { get; init; }

    /// <summary>Why the status is not ok, in one sentence a user can act on (for failed fits the same as <see cref="Error"/>).</summary>
    public string? StatusReason { get; init; }

    /// <summary>Short names of what the diagnoses found (ohmic, shorted, open, units, hysteresis, settling, undetermined, trade-off).</summary>
    public ImmutableArray<string> Diagnoses { get; init; } = [];

    /// <summary>Separate fits of the two sweep directions, when the curve has both.</summary>
    public HysteresisReport? Hysteresis { get; init; }

    /// <summary>Warnings in words (regime, identifiability, masked points, misfit).</summary>
    public ImmutableArray<string> Warnings { get; init; } = [];

    /// <summary>All model parameters, in the model's order.</summary>
    public ImmutableArray<ParameterEstimate> Parameters { get; init; } = [];

    /// <summary>Fit statistics; null when the fit failed before solving.</summary>
    public FitQuality? Quality { get; init; }

    /// <summary>Keys of the free parameters, the order of <see cref="CorrelationRowMajor"/>.</summary>
    public ImmutableArray<string> CorrelationKeys { get; init; } = [];

    /// <summary>Correlation matrix of the free parameters, row-major.</summary>
    public ImmutableArray<double> CorrelationRowMajor { get; init; } = [];

    /// <summary>Data and model for plotting; null when the fit failed before solving.</summary>
    public CurveSnapshot? Curve { get; init; }

    /// <summary>Transition voltage (minimum of ln(I/V²) against 1/V) for positive bias, in volt, if found.</summary>
    public double? TransitionVoltageV { get; init; }

    /// <summary>Where the model is valid, in words (from the model), for reports.</summary>
    public string? ModelValidity { get; init; }

    /// <summary>Transition voltage for negative bias (a negative number), in volt, if found.</summary>
    public double? TransitionVoltageNegativeV { get; init; }

    /// <summary>Model-selection table when several models were compared (<c>--model auto</c>); empty otherwise.</summary>
    public ImmutableArray<ModelComparisonRow> ModelComparison { get; init; } = [];

    /// <summary>
    /// The capacitance–voltage summary of the gate stack when a C–V file was given (<c>--cv</c>): CET = ε_ox ε₀ A / C_max beside the
    /// fitted physical oxide thickness; null otherwise.
    /// </summary>
    public Physics.CvSummary? CapacitanceVoltage { get; init; }

    /// <summary>Lot, if known.</summary>
    public string? Lot { get; init; }

    /// <summary>Wafer, if known.</summary>
    public string? Wafer { get; init; }

    /// <summary>Die column, if known.</summary>
    public int? DieX { get; init; }

    /// <summary>Die row, if known.</summary>
    public int? DieY { get; init; }

    /// <summary>The estimate with <paramref name="key"/>, or null.</summary>
    public ParameterEstimate? Find(string key)
    {
        foreach (var p in Parameters)
        {
            if (string.Equals(p.Key, key, StringComparison.Ordinal)) return p;
        }
        return null;
    }

    /// <summary>A failed result with a message.</summary>
    public static FitResult Failed(string sourcePath, string model, string error) => new()
    {
        SourcePath = sourcePath,
        Model = model,
        Status = FitStatus.Failed,
        Error = error,
        StatusReason = error,
    };

    /// <summary>
    /// This result with every remedy placeholder in its texts (error, status reason, validity, warnings, diagnoses, the
    /// noise-floor description) worded by <paramref name="words"/> — done once, before the result is printed, written or
    /// stored, by whoever knows how remedies are said (the command line: as its options).
    /// </summary>
    /// <param name="words">How to word a remedy.</param>
    /// <returns>The worded result.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="words"/> is null.</exception>
    public FitResult WithRemediesWorded(Func<Remedy, string> words)
    {
        ArgumentNullException.ThrowIfNull(words);
        return this with
        {
            Error = Remedy.Word(Error, words),
            StatusReason = Remedy.Word(StatusReason, words),
            ModelValidity = Remedy.Word(ModelValidity, words),
            Warnings = [.. Warnings.Select(w => Remedy.Word(w, words)!)],
            Diagnoses = [.. Diagnoses.Select(d => Remedy.Word(d, words)!)],
            Quality = Quality is { NoiseFloorDescription: { } description } q ? q with { NoiseFloorDescription = Remedy.Word(description, words) } : Quality,
        };
    }
}

/// <summary>One candidate of a model comparison.</summary>
/// <param name="Model">Model name.</param>
/// <param name="Status">Outcome of that model's fit.</param>
/// <param name="FreeParameters">Number of free parameters k.</param>
/// <param name="PointsUsed">Points n.</param>
/// <param name="ResidualSumOfSquares">Weighted RSS of that fit.</param>
/// <param name="Aicc">Corrected Akaike information criterion (lower is better); null when not computable.</param>
/// <param name="Chosen">True for the selected model.</param>
public sealed record ModelComparisonRow(string Model, FitStatus Status, int FreeParameters, int PointsUsed, double? ResidualSumOfSquares, double? Aicc, bool Chosen);
