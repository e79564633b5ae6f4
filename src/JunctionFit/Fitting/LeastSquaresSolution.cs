using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Fitting;

/// <summary>Why the solver stopped.</summary>
public enum SolverTermination
{
    /// <summary>Both the actual and predicted relative reductions of S are below the tolerance.</summary>
    RelativeReduction,

    /// <summary>The relative change of the scaled step is below the tolerance.</summary>
    StepSize,

    /// <summary>Both the reduction and the step tests are met.</summary>
    ReductionAndStep,

    /// <summary>The cosine of the angle between the residuals and any Jacobian column is below the tolerance.</summary>
    Gradient,

    /// <summary>The residuals are exactly zero.</summary>
    ZeroResidual,

    /// <summary>The iteration limit was reached before convergence.</summary>
    IterationLimit,

    /// <summary>The function-evaluation limit was reached before convergence.</summary>
    EvaluationLimit,

    /// <summary>A residual or Jacobian entry became NaN or infinite and no finite step could be found.</summary>
    NonFinite,

    /// <summary>Tolerances are too small: no further reduction is possible in floating point.</summary>
    NoFurtherProgress,
}

/// <summary>Snapshot of a finished least-squares minimisation. Holds no reference to the problem.</summary>
/// <param name="Parameters">x at the end.</param>
/// <param name="Residuals">r(x) at the end.</param>
/// <param name="JacobianRowMajor">The m×n Jacobian at the end, row-major.</param>
/// <param name="ResidualSumOfSquares">S = Σ r².</param>
/// <param name="Iterations">Outer iterations (Jacobian evaluations).</param>
/// <param name="FunctionEvaluations">Residual evaluations, including any for finite differences.</param>
/// <param name="Termination">Exit condition.</param>
/// <param name="Reason">Exit condition in words.</param>
public sealed record LeastSquaresSolution(
    ImmutableArray<double> Parameters,
    ImmutableArray<double> Residuals,
    ImmutableArray<double> JacobianRowMajor,
    double ResidualSumOfSquares,
    int Iterations,
    int FunctionEvaluations,
    SolverTermination Termination,
    string Reason)
{
    /// <summary>True for the exit conditions that mean a (local) minimum was found.</summary>
    public bool Converged => Termination is SolverTermination.RelativeReduction or SolverTermination.StepSize
        or SolverTermination.ReductionAndStep or SolverTermination.Gradient or SolverTermination.ZeroResidual
        or SolverTermination.NoFurtherProgress;
}

/// <summary>Options of the Levenberg–Marquardt solver. Immutable; validated on construction.</summary>
public sealed record LevenbergMarquardtOptions
{
    /// <summary>Maximum outer iterations.</summary>
    public int MaxIterations { get; init => field = Guard.AtLeast(value, 1); } = 200;

    /// <summary>Maximum residual evaluations, or null for 100·(n+1)·(iterations bound).</summary>
    public int? MaxFunctionEvaluations { get; init; }

    /// <summary>Relative reduction tolerance (MINPACK ftol).</summary>
    public double RelativeReductionTolerance { get; init => field = Guard.NonNegative(value); } = 1e-12;

    /// <summary>Relative step tolerance (MINPACK xtol).</summary>
    public double StepTolerance { get; init => field = Guard.NonNegative(value); } = 1e-12;

    /// <summary>Gradient (orthogonality) tolerance (MINPACK gtol).</summary>
    public double GradientTolerance { get; init => field = Guard.NonNegative(value); } = 1e-14;

    /// <summary>Initial trust-region radius factor (MINPACK factor).</summary>
    public double InitialStepFactor { get; init => field = Guard.Positive(value); } = 100.0;

    /// <summary>The default options.</summary>
    public static LevenbergMarquardtOptions Default { get; } = new();
}
