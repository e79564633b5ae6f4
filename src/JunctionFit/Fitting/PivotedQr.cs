namespace JunctionFit.Fitting;

/// <summary>
/// Householder QR factorisation with column pivoting, A·P = Q·R, of an m×n matrix (m ≥ n) held
/// column-major in place.
/// </summary>
/// <remarks>
/// <para>
/// Mathematics. At stage j the column k ≥ j of largest remaining norm (of rows j…m−1) is swapped
/// into position j. A Householder reflector H = I − u uᵀ/u₀ with u = a/±‖a‖ + e₀ (the sign of the
/// leading entry, so no cancellation) maps the sub-column a = A[j:m, j] to ∓‖a‖·e₀; it is applied to
/// the columns to the right. The diagonal of R is returned separately; the strict upper triangle of
/// R is left in the matrix and the vectors u below (and on) the diagonal, so Qᵀ can be applied later.
/// </para>
/// <para>
/// The partial column norms are downdated after each stage, ‖a_k‖² ← ‖a_k‖² − r_jk², and
/// recomputed from scratch when cancellation has eaten most of their digits (when
/// 0.05·(current/last exact)² falls to machine epsilon), as in the MINPACK-1 QR routine
/// (Moré, Garbow &amp; Hillstrom, ANL-80-74, 1980; Golub &amp; Van Loan, Matrix Computations, §5.4).
/// Pivoting by norm makes |r₀₀| ≥ |r₁₁| ≥ … so rank deficiency shows up at the end of R.
/// </para>
/// </remarks>
internal static class PivotedQr
{
    /// <summary>Factors <paramref name="a"/> (m×n, column-major, leading dimension m) in place.</summary>
    /// <param name="m">Rows.</param>
    /// <param name="n">Columns, n ≤ m.</param>
    /// <param name="a">On entry A; on exit the strict upper triangle of R and the Householder vectors.</param>
    /// <param name="pivot">On exit column j of A·P is column pivot[j] of A.</param>
    /// <param name="rdiag">On exit the diagonal of R.</param>
    /// <param name="columnNorms">On exit the Euclidean norms of the columns of the original A.</param>
    /// <param name="work">Scratch of length n.</param>
    public static void Factor(int m, int n, Span<double> a, Span<int> pivot, Span<double> rdiag, Span<double> columnNorms, Span<double> work)
    {
        for (int j = 0; j < n; j++)
        {
            double norm = DenseKernels.ColumnNorm(a, m, j, 0, m);
            columnNorms[j] = norm;
            rdiag[j] = norm;
            work[j] = norm;
            pivot[j] = j;
        }

        int steps = Math.Min(m, n);
        for (int j = 0; j < steps; j++)
        {
            // Bring the column of largest remaining norm to position j.
            int kmax = j;
            for (int k = j + 1; k < n; k++)
            {
                if (rdiag[k] > rdiag[kmax])
                {
                    kmax = k;
                }
            }

            if (kmax != j)
            {
                Span<double> cj = a.Slice(j * m, m);
                Span<double> ck = a.Slice(kmax * m, m);
                for (int i = 0; i < m; i++)
                {
                    (cj[i], ck[i]) = (ck[i], cj[i]);
                }

                rdiag[kmax] = rdiag[j];
                work[kmax] = work[j];
                (pivot[j], pivot[kmax]) = (pivot[kmax], pivot[j]);
            }

            // Reflector for rows j..m-1 of column j.
            Span<double> col = a.Slice(j * m, m);
            double alpha = DenseKernels.Norm(col[j..]);
            if (alpha != 0.0)
            {
                if (col[j] < 0.0)
                {
                    alpha = -alpha;
                }

                double inv = 1.0 / alpha;
                for (int i = j; i < m; i++)
                {
                    col[i] *= inv;
                }

                col[j] += 1.0;

                // Apply H to the remaining columns and downdate their partial norms.
                double ujj = col[j];
                for (int k = j + 1; k < n; k++)
                {
                    Span<double> ck = a.Slice(k * m, m);
                    double dot = 0.0;
                    for (int i = j; i < m; i++)
                    {
                        dot += col[i] * ck[i];
                    }

                    double t = dot / ujj;
                    for (int i = j; i < m; i++)
                    {
                        ck[i] -= t * col[i];
                    }

                    if (rdiag[k] != 0.0)
                    {
                        double ratio = ck[j] / rdiag[k];
                        rdiag[k] *= Math.Sqrt(Math.Max(0.0, 1.0 - (ratio * ratio)));
                        double rel = rdiag[k] / work[k];
                        if (0.05 * rel * rel <= MachineEpsilon)
                        {
                            rdiag[k] = DenseKernels.ColumnNorm(a, m, k, j + 1, m);
                            work[k] = rdiag[k];
                        }
                    }
                }
            }

            rdiag[j] = -alpha;
        }
    }

    /// <summary>Overwrites <paramref name="b"/> (length m) with Qᵀb using the stored reflectors.</summary>
    /// <remarks>Must be called before the diagonal entries of the factored matrix are overwritten.</remarks>
    public static void ApplyQTranspose(int m, int n, ReadOnlySpan<double> a, Span<double> b)
    {
        int steps = Math.Min(m, n);
        for (int j = 0; j < steps; j++)
        {
            ReadOnlySpan<double> col = a.Slice(j * m, m);
            double ujj = col[j];
            if (ujj == 0.0)
            {
                continue;
            }

            double dot = 0.0;
            for (int i = j; i < m; i++)
            {
                dot += col[i] * b[i];
            }

            double t = -dot / ujj;
            for (int i = j; i < m; i++)
            {
                b[i] += t * col[i];
            }
        }
    }

    /// <summary>Machine epsilon ε = 2⁻⁵² (the spacing of doubles at 1).</summary>
    public const double MachineEpsilon = 2.220446049250313e-16;
}
