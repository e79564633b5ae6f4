namespace JunctionFit.Physics.Numerics;

/// <summary>A function of one variable, as a struct so that the integrator is specialised per integrand (no delegate, no allocation).</summary>
internal interface IIntegrand
{
    /// <summary>f(x).</summary>
    double Evaluate(double x);
}

/// <summary>
/// Globally adaptive Gauss–Kronrod quadrature, 7-point Gauss / 15-point Kronrod pair: the interval with the largest error
/// estimate is bisected until the summed estimate is below max(absTol, relTol·|I|) or the interval budget is spent.
/// Error estimate per interval: |K15 − G7| scaled as in QUADPACK, err = I_abs·min(1, (200 |K15 − G7| / I_abs)^{3/2}),
/// I_abs = ∫|f − K15/(b−a)| (R. Piessens, E. de Doncker-Kapenga, C. Überhuber, D. Kahaner, QUADPACK, Springer 1983).
/// Nodes and weights are the standard Kronrod extension of the 7-point Gauss–Legendre rule. The interval store lives on the stack.
/// </summary>
internal static class AdaptiveQuadrature
{
    /// <summary>Largest number of intervals kept.</summary>
    public const int MaxIntervals = 256;

    private static ReadOnlySpan<double> Xgk =>
    [
        0.991455371120812639206854697526329, 0.949107912342758524526189684047851,
        0.864864423359769072789712788640926, 0.741531185599394439863864773280788,
        0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
        0.207784955007898467600689403773245, 0.0,
    ];

    private static ReadOnlySpan<double> Wgk =>
    [
        0.022935322010529224963732008058970, 0.063092092629978553290700663189204,
        0.104790010322250183839876322541518, 0.140653259715525918745189590510238,
        0.169004726639267902826583426598550, 0.190350578064785409913256402421014,
        0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
    ];

    private static ReadOnlySpan<double> Wg =>
    [
        0.129484966168869693270611432679082, 0.279705391489276667901467771423780,
        0.381830050505118944950369775488975, 0.417959183673469387755102040816327,
    ];

    private struct Piece
    {
        public double A, B, Value, Error;
    }

    /// <summary>∫ₐᵇ f dx.</summary>
    /// <param name="f">The integrand.</param>
    /// <param name="a">Lower limit.</param>
    /// <param name="b">Upper limit.</param>
    /// <param name="relTol">Relative error target.</param>
    /// <param name="absTol">Absolute error target.</param>
    /// <param name="errorEstimate">Summed error estimate of the result.</param>
    /// <param name="maxIntervals">Interval budget (at most <see cref="MaxIntervals"/>).</param>
    /// <returns>The integral; when the budget is spent the best estimate is returned with its (larger) error estimate.</returns>
    public static double Integrate<TF>(ref TF f, double a, double b, double relTol, double absTol, out double errorEstimate, int maxIntervals = 128)
        where TF : struct, IIntegrand
    {
        if (a == b) { errorEstimate = 0; return 0; }
        maxIntervals = Math.Clamp(maxIntervals, 1, MaxIntervals);
        Span<Piece> pieces = stackalloc Piece[MaxIntervals];
        int count = 1;
        pieces[0].A = a;
        pieces[0].B = b;
        pieces[0].Value = Kronrod(ref f, a, b, out pieces[0].Error);
        double total = pieces[0].Value, error = pieces[0].Error;
        while (error > Math.Max(absTol, relTol * Math.Abs(total)) && count < maxIntervals)
        {
            int worst = 0;
            for (int k = 1; k < count; k++) if (pieces[k].Error > pieces[worst].Error) worst = k;
            var p = pieces[worst];
            double mid = 0.5 * (p.A + p.B);
            if (mid <= p.A || mid >= p.B) break; // interval at machine resolution
            double left = Kronrod(ref f, p.A, mid, out double errLeft);
            double right = Kronrod(ref f, mid, p.B, out double errRight);
            pieces[worst] = new Piece { A = p.A, B = mid, Value = left, Error = errLeft };
            pieces[count++] = new Piece { A = mid, B = p.B, Value = right, Error = errRight };
            total = 0;
            error = 0;
            for (int k = 0; k < count; k++) { total += pieces[k].Value; error += pieces[k].Error; }
        }
        errorEstimate = error;
        return total;
    }

    /// <summary>The 15-point Kronrod estimate on [a, b] and its error estimate.</summary>
    private static double Kronrod<TF>(ref TF f, double a, double b, out double error)
        where TF : struct, IIntegrand
    {
        double centre = 0.5 * (a + b), half = 0.5 * (b - a);
        Span<double> values = stackalloc double[15];
        double fc = f.Evaluate(centre);
        values[7] = fc;
        double kronrod = fc * Wgk[7], gauss = fc * Wg[3];
        for (int j = 0; j < 7; j++)
        {
            double dx = half * Xgk[j];
            double f1 = f.Evaluate(centre - dx), f2 = f.Evaluate(centre + dx);
            values[j] = f1;
            values[14 - j] = f2;
            kronrod += Wgk[j] * (f1 + f2);
            if (j % 2 == 1) gauss += Wg[j / 2] * (f1 + f2);
        }
        double mean = 0.5 * kronrod;
        double abs = Wgk[7] * Math.Abs(fc - mean);
        for (int j = 0; j < 7; j++) abs += Wgk[j] * (Math.Abs(values[j] - mean) + Math.Abs(values[14 - j] - mean));
        abs *= Math.Abs(half);
        double diff = Math.Abs((kronrod - gauss) * half);
        error = abs != 0 && diff != 0 ? abs * Math.Min(1.0, Math.Pow(200.0 * diff / abs, 1.5)) : diff;
        error = Math.Max(error, 50.0 * double.Epsilon);
        return kronrod * half;
    }
}
