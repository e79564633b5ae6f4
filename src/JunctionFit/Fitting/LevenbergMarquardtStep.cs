namespace JunctionFit.Fitting;

/// <summary>
/// The trust-region subproblem of the Levenberg–Marquardt method: choose the damping λ ≥ 0 and the
/// step p(λ) so that the scaled step length ‖D p‖ matches the trust radius Δ.
/// </summary>
/// <remarks>
/// <para>
/// Problem. With J P = Q R the pivoted QR of the Jacobian and b = −f (so that Qᵀb = −Qᵀf), the step
/// for a damping λ solves the regularised least-squares problem
/// <code>
///     min_p ‖J p − b‖² + λ ‖D p‖²,      i.e.   (JᵀJ + λ DᵀD) p = Jᵀ b,
/// </code>
/// equivalently, after the orthogonal change Qᵀ, min ‖[R; √λ Pᵀ D P] z − [Qᵀb; 0]‖ with p = P z.
/// We want λ = 0 if the Gauss–Newton step already satisfies ‖D p(0)‖ ≤ (1 + σ) Δ, otherwise the
/// root of φ(λ) = ‖D p(λ)‖ − Δ to relative accuracy σ = 0.1.
/// </para>
/// <para>
/// Iteration (Moré 1978, §5 and the MINPACK-1 design, ANL-80-74). φ is convex and decreasing; the
/// Newton-like update on the reciprocal model φ ≈ a/(b+λ) − Δ gives
/// <code>
///     λ₊ = λ + (φ/Δ) · ‖D p‖² / ‖q‖²,     q = R_λ⁻ᵀ Pᵀ Dᵀ D p / ‖D p‖,
/// </code>
/// where R_λ is the triangular factor of the augmented system (computed by Givens rotations that
/// fold √λ D into R). Safeguards keep λ in [l, u]: u = ‖D⁻¹ Jᵀ b‖ / Δ, and, when J has full rank,
/// l = φ(0) / (Δ ‖R⁻ᵀ Pᵀ Dᵀ D p(0) / ‖D p(0)‖‖²), updated as the sign of φ is learnt. At most ten
/// iterations are made; in practice two or three suffice.
/// </para>
/// <para>
/// References: [1] J. J. Moré, "The Levenberg–Marquardt algorithm: implementation and theory",
/// in G. A. Watson (ed.), Numerical Analysis (Dundee 1977), Springer LNM 630, pp. 105–116, 1978.
/// [2] J. J. Moré, B. S. Garbow, K. E. Hillstrom, User guide for MINPACK-1, Argonne National
/// Laboratory report ANL-80-74, 1980.
/// </para>
/// </remarks>
internal static class LevenbergMarquardtStep
{
    // Smallest positive normalised double (MINPACK's "dwarf").
    private const double Dwarf = 2.2250738585072014e-308;

    /// <summary>
    /// Computes λ and the step x (of the system J x ≈ b, √λ D x ≈ 0 with Qᵀb in <paramref name="qtb"/>).
    /// </summary>
    /// <param name="n">Order of R.</param>
    /// <param name="r">R in its upper triangle (column-major, leading dimension <paramref name="ld"/>), diagonal included; the strict lower triangle is overwritten.</param>
    /// <param name="ld">Leading dimension of <paramref name="r"/>.</param>
    /// <param name="pivot">Column permutation of the QR.</param>
    /// <param name="diag">Scaling D (positive).</param>
    /// <param name="qtb">First n components of Qᵀb.</param>
    /// <param name="delta">Trust radius Δ &gt; 0.</param>
    /// <param name="lambda">On entry an estimate of λ; on exit the chosen λ.</param>
    /// <param name="x">On exit the step.</param>
    /// <param name="sdiag">On exit the diagonal of the augmented triangular factor.</param>
    /// <param name="wa1">Scratch, length n.</param>
    /// <param name="wa2">Scratch, length n.</param>
    public static void Solve(
        int n, Span<double> r, int ld, ReadOnlySpan<int> pivot, ReadOnlySpan<double> diag, ReadOnlySpan<double> qtb,
        double delta, ref double lambda, Span<double> x, Span<double> sdiag, Span<double> wa1, Span<double> wa2)
    {
        // Gauss–Newton step, minimum-norm over the numerically nonsingular leading block of R.
        int rank = n;
        for (int j = 0; j < n; j++)
        {
            wa1[j] = qtb[j];
            if (r[(j * ld) + j] == 0.0 && rank == n)
            {
                rank = j;
            }

            if (rank < n)
            {
                wa1[j] = 0.0;
            }
        }

        for (int j = rank - 1; j >= 0; j--)
        {
            wa1[j] /= r[(j * ld) + j];
            double t = wa1[j];
            int cj = j * ld;
            for (int i = 0; i < j; i++)
            {
                wa1[i] -= r[cj + i] * t;
            }
        }

        for (int j = 0; j < n; j++)
        {
            x[pivot[j]] = wa1[j];
        }

        // φ(0): accept λ = 0 if the Gauss–Newton step is (nearly) inside the region.
        int iteration = 0;
        for (int j = 0; j < n; j++)
        {
            wa2[j] = diag[j] * x[j];
        }

        double dxnorm = DenseKernels.Norm(wa2[..n]);
        double fp = dxnorm - delta;
        if (fp <= 0.1 * delta)
        {
            lambda = 0.0;
            return;
        }

        // Lower bound l (only when R is nonsingular): solve Rᵀ y = Pᵀ Dᵀ D x / ‖D x‖.
        double lower = 0.0;
        if (rank == n)
        {
            for (int j = 0; j < n; j++)
            {
                int l = pivot[j];
                wa1[j] = diag[l] * (wa2[l] / dxnorm);
            }

            for (int j = 0; j < n; j++)
            {
                double sum = 0.0;
                int cj = j * ld;
                for (int i = 0; i < j; i++)
                {
                    sum += r[cj + i] * wa1[i];
                }

                wa1[j] = (wa1[j] - sum) / r[cj + j];
            }

            double yn = DenseKernels.Norm(wa1[..n]);
            lower = ((fp / delta) / yn) / yn;
        }

        // Upper bound u = ‖D⁻¹ (R Pᵀ)ᵀ Qᵀ b‖ / Δ = ‖D⁻¹ Jᵀ b‖ / Δ.
        for (int j = 0; j < n; j++)
        {
            double sum = 0.0;
            int cj = j * ld;
            for (int i = 0; i <= j; i++)
            {
                sum += r[cj + i] * qtb[i];
            }

            wa1[j] = sum / diag[pivot[j]];
        }

        double gnorm = DenseKernels.Norm(wa1[..n]);
        double upper = gnorm / delta;
        if (upper == 0.0)
        {
            upper = Dwarf / Math.Min(delta, 0.1);
        }

        // Start inside [l, u].
        lambda = Math.Max(lambda, lower);
        lambda = Math.Min(lambda, upper);
        if (lambda == 0.0)
        {
            lambda = gnorm / dxnorm;
        }

        while (true)
        {
            iteration++;
            if (lambda == 0.0)
            {
                lambda = Math.Max(Dwarf, 0.001 * upper);
            }

            double sq = Math.Sqrt(lambda);
            for (int j = 0; j < n; j++)
            {
                wa1[j] = sq * diag[j];
            }

            SolveAugmented(n, r, ld, pivot, wa1, qtb, x, sdiag, wa2);

            for (int j = 0; j < n; j++)
            {
                wa2[j] = diag[j] * x[j];
            }

            dxnorm = DenseKernels.Norm(wa2[..n]);
            double previous = fp;
            fp = dxnorm - delta;

            // Stop when ‖D p‖ is within 10 % of Δ, or when λ has reached the lower bound 0 with the
            // step still inside and φ increasing, or after ten iterations.
            if (Math.Abs(fp) <= 0.1 * delta || (lower == 0.0 && fp <= previous && previous < 0.0) || iteration == 10)
            {
                break;
            }

            // Newton correction from the augmented factor: q = R_λ⁻ᵀ Pᵀ Dᵀ D p / ‖D p‖.
            for (int j = 0; j < n; j++)
            {
                int l = pivot[j];
                wa1[j] = diag[l] * (wa2[l] / dxnorm);
            }

            for (int j = 0; j < n; j++)
            {
                wa1[j] /= sdiag[j];
                double t = wa1[j];
                int cj = j * ld;
                for (int i = j + 1; i < n; i++)
                {
                    wa1[i] -= r[cj + i] * t;
                }
            }

            double qn = DenseKernels.Norm(wa1[..n]);
            double correction = ((fp / delta) / qn) / qn;

            if (fp > 0.0)
            {
                lower = Math.Max(lower, lambda);
            }

            if (fp < 0.0)
            {
                upper = Math.Min(upper, lambda);
            }

            lambda = Math.Max(lower, lambda + correction);
        }
    }

    /// <summary>
    /// Solves min ‖[R; Pᵀ S P] z − [c; 0]‖ for a diagonal S (entries <paramref name="s"/>) by Givens
    /// rotations, returning x = P z.
    /// </summary>
    /// <remarks>
    /// Each row of S P is eliminated against R by rotations G = [cos sin; −sin cos] chosen so the
    /// S entry vanishes; the result is an upper-triangular T with Tᵀ T = Rᵀ R + Pᵀ S² P. T's diagonal
    /// goes to <paramref name="sdiag"/>, its strict upper triangle (transposed) to the strict lower
    /// triangle of <paramref name="r"/>; the upper triangle of R, including its diagonal, is kept.
    /// A zero on T's diagonal truncates the back substitution (least-squares solution of the
    /// leading nonsingular block).
    /// </remarks>
    public static void SolveAugmented(
        int n, Span<double> r, int ld, ReadOnlySpan<int> pivot, ReadOnlySpan<double> s, ReadOnlySpan<double> c,
        Span<double> x, Span<double> sdiag, Span<double> wa)
    {
        // Copy R's upper triangle into the lower one (to be rotated) and keep R's diagonal in x.
        for (int j = 0; j < n; j++)
        {
            int cj = j * ld;
            for (int i = j; i < n; i++)
            {
                r[cj + i] = r[(i * ld) + j];
            }

            x[j] = r[cj + j];
            wa[j] = c[j];
        }

        for (int j = 0; j < n; j++)
        {
            double sj = s[pivot[j]];
            if (sj != 0.0)
            {
                for (int k = j; k < n; k++)
                {
                    sdiag[k] = 0.0;
                }

                sdiag[j] = sj;

                // The extra right-hand-side entry starts at zero.
                double extra = 0.0;
                for (int k = j; k < n; k++)
                {
                    if (sdiag[k] == 0.0)
                    {
                        continue;
                    }

                    int ck = k * ld;
                    double rkk = r[ck + k];
                    double cos;
                    double sin;
                    if (Math.Abs(rkk) < Math.Abs(sdiag[k]))
                    {
                        double cot = rkk / sdiag[k];
                        sin = 1.0 / Math.Sqrt(1.0 + (cot * cot));
                        cos = sin * cot;
                    }
                    else
                    {
                        double tan = sdiag[k] / rkk;
                        cos = 1.0 / Math.Sqrt(1.0 + (tan * tan));
                        sin = cos * tan;
                    }

                    r[ck + k] = (cos * rkk) + (sin * sdiag[k]);
                    double t = (cos * wa[k]) + (sin * extra);
                    extra = (-sin * wa[k]) + (cos * extra);
                    wa[k] = t;

                    for (int i = k + 1; i < n; i++)
                    {
                        double rik = r[ck + i];
                        double u = (cos * rik) + (sin * sdiag[i]);
                        sdiag[i] = (-sin * rik) + (cos * sdiag[i]);
                        r[ck + i] = u;
                    }
                }
            }

            int cjj = (j * ld) + j;
            sdiag[j] = r[cjj];
            r[cjj] = x[j];
        }

        // Back substitution with T (diagonal in sdiag, off-diagonal transposed below R's diagonal).
        int rank = n;
        for (int j = 0; j < n; j++)
        {
            if (sdiag[j] == 0.0 && rank == n)
            {
                rank = j;
            }

            if (rank < n)
            {
                wa[j] = 0.0;
            }
        }

        for (int j = rank - 1; j >= 0; j--)
        {
            double sum = 0.0;
            int cj = j * ld;
            for (int i = j + 1; i < rank; i++)
            {
                sum += r[cj + i] * wa[i];
            }

            wa[j] = (wa[j] - sum) / sdiag[j];
        }

        for (int j = 0; j < n; j++)
        {
            x[pivot[j]] = wa[j];
        }
    }
}
