using System.Collections.Immutable;
using MathNet.Numerics.LinearAlgebra;
using JunctionFit.Common;

namespace JunctionFit.Fitting;

/// <summary>
/// The linearised (Wald) covariance of least-squares estimates at a solution, with the scaling
/// recorded: both the unscaled (JᵀJ)⁻¹ and the scaled s²(JᵀJ)⁻¹ are kept.
/// </summary>
/// <param name="ParameterCount">n.</param>
/// <param name="ResidualCount">m.</param>
/// <param name="DegreesOfFreedom">m − n.</param>
/// <param name="ResidualSumOfSquares">The RSS the scaling used.</param>
/// <param name="ResidualVariance">s² = RSS/(m − n); NaN when m = n.</param>
/// <param name="UnscaledCovariance">(JᵀJ)⁻¹, n×n row-major (a pseudo-inverse when J is rank deficient).</param>
/// <param name="ScaledCovariance">s²(JᵀJ)⁻¹, n×n row-major; NaN when m = n.</param>
/// <param name="StandardErrors">√ of the diagonal of <paramref name="ScaledCovariance"/>.</param>
/// <param name="Correlation">ρⱼₖ = Cⱼₖ/√(Cⱼⱼ Cₖₖ), n×n row-major (NaN where a variance is zero).</param>
/// <param name="ConditionNumber">κ₂ of the column-equilibrated Jacobian J·diag(1/‖Jⱼ‖) (∞ if rank deficient); the scaled JᵀJ has κ².</param>
/// <param name="Rank">Numerical rank of J (singular values above m·ε·σ_max of the equilibrated J).</param>
/// <param name="IsRankDeficient">True when <paramref name="Rank"/> &lt; n: some parameter combination is not determined at all.</param>
/// <param name="IsNearSingular">True when rank deficient or <paramref name="ConditionNumber"/> exceeds the threshold given to <c>LinearizedCovariance.Compute</c>.</param>
public sealed record LinearizedCovarianceResult(
    int ParameterCount,
    int ResidualCount,
    int DegreesOfFreedom,
    double ResidualSumOfSquares,
    double ResidualVariance,
    ImmutableArray<double> UnscaledCovariance,
    ImmutableArray<double> ScaledCovariance,
    ImmutableArray<double> StandardErrors,
    ImmutableArray<double> Correlation,
    double ConditionNumber,
    int Rank,
    bool IsRankDeficient,
    bool IsNearSingular);

/// <summary>Linearised covariance of nonlinear least-squares estimates from the Jacobian at the solution.</summary>
/// <remarks>
/// <para>
/// For r(θ) ≈ r(θ̂) + J (θ − θ̂) with independent errors of common variance σ², the estimate has
/// Cov(θ̂) ≈ σ² (JᵀJ)⁻¹, σ² estimated by s² = RSS/(m − n) (Bates &amp; Watts, Nonlinear Regression
/// Analysis and Its Applications, Wiley 1988, §2.3; the standard deviations certified by NIST StRD
/// are these).
/// </para>
/// <para>
/// Numerics. Let C = diag(‖J₀‖, …, ‖Jₙ₋₁‖) and J̃ = J C⁻¹ = U Σ Vᵀ (thin SVD). Then
/// (JᵀJ)⁻¹ = C⁻¹ V Σ⁻² Vᵀ C⁻¹, computed without forming JᵀJ, so the condition is κ(J̃), not κ(J̃)².
/// Column equilibration makes κ independent of the units of the parameters (van der Sluis: it is
/// within √n of the best diagonal scaling). Singular values below m·ε·σ_max are treated as zero
/// (pseudo-inverse) and flagged as rank deficiency.
/// </para>
/// </remarks>
public static class LinearizedCovariance
{
    /// <summary>Default threshold on κ₂ of the equilibrated Jacobian above which the result is flagged near-singular (1/√ε ≈ 6.7·10⁷, so κ of the scaled JᵀJ exceeds 1/ε).</summary>
    public const double DefaultConditionThreshold = 6.7108864e7;

    /// <summary>Computes the covariance from the m×n row-major Jacobian at the solution and the RSS there.</summary>
    /// <param name="jacobianRowMajor">J, <c>jacobian[i * n + j] = ∂rᵢ/∂θⱼ</c>, finite.</param>
    /// <param name="residualCount">m ≥ n.</param>
    /// <param name="parameterCount">n ≥ 1.</param>
    /// <param name="residualSumOfSquares">RSS at the solution, finite and ≥ 0.</param>
    /// <param name="conditionThreshold">κ₂ above which <see cref="LinearizedCovarianceResult.IsNearSingular"/> is set; null for <see cref="DefaultConditionThreshold"/>.</param>
    /// <returns>The immutable covariance result.</returns>
    /// <exception cref="ArgumentException">Sizes inconsistent, or non-finite entries.</exception>
    /// <exception cref="ArgumentOutOfRangeException">The RSS or the threshold is out of range.</exception>
    public static LinearizedCovarianceResult Compute(
        ReadOnlySpan<double> jacobianRowMajor, int residualCount, int parameterCount, double residualSumOfSquares, double? conditionThreshold = null)
    {
        int m = residualCount;
        int n = parameterCount;
        if (n < 1 || m < n)
        {
            throw new ArgumentException($"Need 1 ≤ n ≤ m; got m = {m}, n = {n}.", nameof(parameterCount));
        }

        if (jacobianRowMajor.Length != m * n)
        {
            throw new ArgumentException($"The Jacobian has {jacobianRowMajor.Length} entries; m·n = {m * n}.", nameof(jacobianRowMajor));
        }

        if (!DenseKernels.AllFinite(jacobianRowMajor))
        {
            throw new ArgumentException("The Jacobian holds NaN or infinite entries.", nameof(jacobianRowMajor));
        }

        Guard.NonNegative(residualSumOfSquares);

        double threshold = Guard.AtLeast(conditionThreshold ?? DefaultConditionThreshold, 1.0, nameof(conditionThreshold));

        // Column norms C and the equilibrated J̃ = J C⁻¹ (zero columns left as they are).
        var scale = new double[n];
        for (int j = 0; j < n; j++)
        {
            double sum = 0.0;
            for (int i = 0; i < m; i++)
            {
                double v = jacobianRowMajor[(i * n) + j];
                sum += v * v;
            }

            scale[j] = sum > 0.0 ? Math.Sqrt(sum) : 1.0;
        }

        // J̃ = J C⁻¹ column-major, then J̃·P = Q·R by our pivoted Householder QR and the SVD of the small n×n R:
        // R = U Σ Wᵀ, so J̃ = Q U Σ (P W)ᵀ — the singular values of J̃ and, permuted back by P, its right singular
        // vectors, without the m×m left factor of a full SVD (318 KB per 201-point fit, measured).
        var columnMajor = new double[m * n];
        for (int i = 0; i < m; i++)
        {
            for (int j = 0; j < n; j++)
            {
                columnMajor[(j * m) + i] = jacobianRowMajor[(i * n) + j] / scale[j];
            }
        }

        var pivot = new int[n];
        var rdiag = new double[n];
        PivotedQr.Factor(m, n, columnMajor, pivot, rdiag, new double[n], new double[n]);
        var r = Matrix<double>.Build.Dense(n, n);
        for (int i = 0; i < n; i++)
        {
            r[i, i] = rdiag[i];
            for (int j = i + 1; j < n; j++)
            {
                r[i, j] = columnMajor[(j * m) + i];
            }
        }

        var small = r.Svd(computeVectors: true);
        var sigma = small.S;
        var vt = Matrix<double>.Build.Dense(n, n);
        for (int k = 0; k < n; k++)
        {
            for (int i = 0; i < n; i++)
            {
                vt[k, pivot[i]] = small.VT[k, i];
            }
        }

        double smax = sigma[0];
        double cutoff = m * PivotedQr.MachineEpsilon * smax;
        int rank = 0;
        for (int k = 0; k < n; k++)
        {
            if (sigma[k] > cutoff)
            {
                rank++;
            }
        }

        double condition = rank == n ? smax / sigma[n - 1] : double.PositiveInfinity;

        // (JᵀJ)⁻¹ = C⁻¹ V Σ⁻² Vᵀ C⁻¹ over the numerical range.
        var unscaled = new double[n * n];
        for (int j = 0; j < n; j++)
        {
            for (int l = j; l < n; l++)
            {
                double sum = 0.0;
                for (int k = 0; k < rank; k++)
                {
                    double inv = 1.0 / sigma[k];
                    sum += vt[k, j] * vt[k, l] * inv * inv;
                }

                double c = sum / (scale[j] * scale[l]);
                unscaled[(j * n) + l] = c;
                unscaled[(l * n) + j] = c;
            }
        }

        int dof = m - n;
        double s2 = dof > 0 ? residualSumOfSquares / dof : double.NaN;
        var scaledCov = new double[n * n];
        for (int k = 0; k < scaledCov.Length; k++)
        {
            scaledCov[k] = s2 * unscaled[k];
        }

        var se = new double[n];
        for (int j = 0; j < n; j++)
        {
            se[j] = Math.Sqrt(scaledCov[(j * n) + j]);
        }

        var corr = new double[n * n];
        for (int j = 0; j < n; j++)
        {
            for (int l = 0; l < n; l++)
            {
                double d = Math.Sqrt(unscaled[(j * n) + j] * unscaled[(l * n) + l]);
                corr[(j * n) + l] = d > 0.0 ? (j == l ? 1.0 : unscaled[(j * n) + l] / d) : double.NaN;
            }
        }

        return new LinearizedCovarianceResult(
            n, m, dof, residualSumOfSquares, s2,
            ImmutableArray.Create(unscaled), ImmutableArray.Create(scaledCov), ImmutableArray.Create(se), ImmutableArray.Create(corr),
            condition, rank, rank < n, rank < n || condition > threshold);
    }

    /// <summary>Computes the covariance at a solver result (its Jacobian and RSS).</summary>
    /// <param name="solution">A finished minimisation with a finite Jacobian.</param>
    /// <param name="conditionThreshold">See <see cref="Compute(ReadOnlySpan{double}, int, int, double, double?)"/>.</param>
    /// <returns>The immutable covariance result.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="solution"/> is null.</exception>
    /// <exception cref="ArgumentException">The solution's Jacobian is not finite.</exception>
    public static LinearizedCovarianceResult Compute(LeastSquaresSolution solution, double? conditionThreshold = null)
    {
        ArgumentNullException.ThrowIfNull(solution);
        return Compute(solution.JacobianRowMajor.AsSpan(), solution.Residuals.Length, solution.Parameters.Length, solution.ResidualSumOfSquares, conditionThreshold);
    }
}
