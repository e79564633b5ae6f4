namespace JunctionFit.Fitting;

/// <summary>
/// A nonlinear least-squares problem: minimise S(x) = Σᵢ rᵢ(x)² over x ∈ ℝⁿ.
/// Implementations must be safe to call from one thread at a time; the solver keeps no reference after it returns.
/// </summary>
public interface ILeastSquaresProblem
{
    /// <summary>Number of residuals m (m ≥ n).</summary>
    int ResidualCount { get; }

    /// <summary>Number of free variables n.</summary>
    int ParameterCount { get; }

    /// <summary>Fills <paramref name="residuals"/> (length m) with r(x).</summary>
    void Evaluate(ReadOnlySpan<double> x, Span<double> residuals);

    /// <summary>True when <see cref="Jacobian"/> is analytic; otherwise the solver uses forward differences.</summary>
    bool HasAnalyticJacobian { get; }

    /// <summary>Fills the row-major m×n Jacobian, <c>jacobian[i * n + j] = ∂rᵢ/∂xⱼ</c>.</summary>
    void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian);
}
