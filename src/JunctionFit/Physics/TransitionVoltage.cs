namespace JunctionFit.Physics;

/// <summary>Transition voltages of one curve, one per polarity; null where ln(I/V²) has no minimum inside the measured range.</summary>
/// <param name="PositiveV">V_t &gt; 0 from the positive branch, in volt, or null.</param>
/// <param name="NegativeV">V_t &lt; 0 from the negative branch, in volt, or null.</param>
public sealed record TransitionVoltages(double? PositiveV, double? NegativeV);

/// <summary>
/// The transition voltage V_t: the bias at the minimum of ln(|I|/V²) against 1/V (the Fowler–Nordheim-plot minimum),
/// where d ln|I| / d ln|V| = 2. A model-free figure to track between lots.
/// Source: J. M. Beebe, B. Kim, J. W. Gadzuk, C. D. Frisbie, J. G. Kushmerick, Phys. Rev. Lett. 97, 026801 (2006).
/// <para>
/// Method (robust to noise): the points of one polarity are sorted by |V|; y = ln(|I|/V²) is smoothed by a local quadratic
/// least-squares fit in a moving window (Savitzky–Golay-like, width about n/8, at least 5 points); the smoothed minimum must lie
/// inside the range and both ends must rise above it by more than three times the scatter of the data about the smooth curve;
/// V_t is then the vertex of a quadratic fitted to y(|V|) over about n/10 points around the minimum, re-centred on the vertex until it settles. The minimum of y over V and over 1/V is the same
/// point, so the fit is done in |V|, where probe-station sweeps are evenly spaced.
/// </para>
/// </summary>
public static class TransitionVoltage
{
    /// <summary>Fewest points of one polarity for which a minimum is looked for.</summary>
    public const int MinimumPoints = 9;

    /// <summary>Both transition voltages of a measured curve.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="currentA">Current in ampere.</param>
    /// <exception cref="ArgumentException">The spans differ in length.</exception>
    public static TransitionVoltages Compute(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> currentA)
        => new(Compute(voltageV, currentA, positiveBias: true), Compute(voltageV, currentA, positiveBias: false));

    /// <summary>The transition voltage of one polarity.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="currentA">Current in ampere.</param>
    /// <param name="positiveBias">True for the V &gt; 0 branch, false for V &lt; 0.</param>
    /// <returns>V_t with the sign of the branch, or null when there is no minimum inside the range (or too few points).</returns>
    /// <exception cref="ArgumentException">The spans differ in length.</exception>
    public static double? Compute(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> currentA, bool positiveBias)
    {
        if (voltageV.Length != currentA.Length) throw new ArgumentException("voltage and current must have the same length", nameof(currentA));
        var xs = new List<double>();
        var ys = new List<double>();
        for (int k = 0; k < voltageV.Length; k++)
        {
            double v = voltageV[k], i = currentA[k];
            bool ok = positiveBias ? v > 0 && i > 0 : v < 0 && i < 0;
            if (!ok || !double.IsFinite(v) || !double.IsFinite(i)) continue;
            xs.Add(Math.Abs(v));
            ys.Add(Math.Log(Math.Abs(i) / (v * v)));
        }
        int n = xs.Count;
        if (n < MinimumPoints) return null;
        var order = new int[n];
        for (int k = 0; k < n; k++) order[k] = k;
        var keys = xs.ToArray();
        Numerics.SortKernels.SortWithItems(keys, order);
        var x = keys;
        var y = new double[n];
        for (int k = 0; k < n; k++) y[k] = ys[order[k]];

        int half = Math.Max(2, n / 16);
        var smooth = Smooth(x, y, half);
        double scatter = 0;
        for (int k = 0; k < n; k++) scatter += (y[k] - smooth[k]) * (y[k] - smooth[k]);
        scatter = Math.Sqrt(scatter / n);
        int kMin = 0;
        for (int k = 1; k < n; k++) if (smooth[k] < smooth[kMin]) kMin = k;
        double rise = 3.0 * scatter + 1e-9;
        if (kMin == 0 || kMin == n - 1) return null;
        if (smooth[0] - smooth[kMin] <= rise || smooth[n - 1] - smooth[kMin] <= rise) return null;

        // Refine: quadratic fits re-centred on the vertex until it stays at the same point.
        int w = Math.Max(3, n / 20);
        double vt = x[kMin];
        int centre = kMin;
        for (int iteration = 0; iteration < 8; iteration++)
        {
            int a = Math.Max(0, centre - w), b = Math.Min(n - 1, centre + w);
            QuadraticFit(x, y, a, b, x[centre], out double c1, out double c2);
            if (!(c2 > 0)) break;
            double vertex = x[centre] - c1 / (2.0 * c2);
            if (vertex < x[a] || vertex > x[b]) break;
            vt = vertex;
            int next = Nearest(x, vertex, centre);
            if (next == centre) break;
            centre = next;
        }
        return positiveBias ? vt : -vt;
    }

    /// <summary>
    /// The local quadratic smooth of y at every x (sorted ascending): the value at xₖ of the least-squares quadratic over the
    /// points k − half … k + half (clipped to the data, at least 5 points). O(n) through <see cref="MovingQuadraticFit"/>.
    /// </summary>
    internal static double[] Smooth(double[] x, double[] y, int half)
    {
        int n = x.Length;
        var smooth = new double[n];
        var window = new MovingQuadraticFit(x, y);
        for (int k = 0; k < n; k++)
        {
            int lo = Math.Max(0, k - half), hi = Math.Min(n - 1, k + half);
            if (hi - lo < 4) { if (lo == 0) hi = Math.Min(n - 1, 4); else lo = Math.Max(0, hi - 4); }
            smooth[k] = window.ValueAt(lo, hi, x[k], rebaseEvery: half);
        }
        return smooth;
    }

    /// <summary>Index of the point of the sorted <paramref name="x"/> nearest to <paramref name="value"/> (<paramref name="fallback"/> when it is as near).</summary>
    private static int Nearest(double[] x, double value, int fallback)
    {
        int at = Array.BinarySearch(x, value);
        if (at >= 0) return x[fallback] == value ? fallback : at;
        at = ~at;
        int best = fallback;
        foreach (int k in (ReadOnlySpan<int>)[at - 1, at])
        {
            if (k >= 0 && k < x.Length && Math.Abs(x[k] - value) < Math.Abs(x[best] - value)) best = k;
        }
        return best;
    }

    /// <summary>Solves the 3×3 normal equations of a quadratic in u from the moments s0…s4 (of u) and t0…t2 (of y·uᵖ).</summary>
    private static double SolveQuadratic(double s0, double s1, double s2, double s3, double s4, double t0, double t1, double t2, double scale,
        out double c1, out double c2)
    {
        double det = s0 * (s2 * s4 - s3 * s3) - s1 * (s1 * s4 - s3 * s2) + s2 * (s1 * s3 - s2 * s2);
        if (Math.Abs(det) < 1e-300) { c1 = 0; c2 = 0; return t0 / s0; }
        double a0 = (t0 * (s2 * s4 - s3 * s3) - s1 * (t1 * s4 - s3 * t2) + s2 * (t1 * s3 - s2 * t2)) / det;
        double a1 = (s0 * (t1 * s4 - t2 * s3) - t0 * (s1 * s4 - s3 * s2) + s2 * (s1 * t2 - t1 * s2)) / det;
        double a2 = (s0 * (s2 * t2 - s3 * t1) - s1 * (s1 * t2 - s2 * t1) + t0 * (s1 * s3 - s2 * s2)) / det;
        c1 = a1 / scale;
        c2 = a2 / (scale * scale);
        return a0;
    }

    /// <summary>
    /// The local quadratic smoother in O(1) per point: running sums Σ(x − o)ᵖ (p ≤ 4) and Σ y (x − o)ᵖ (p ≤ 2) over a window
    /// that slides forward, shifted to each centre x₀ binomially. The origin o is moved to the current centre (sums recomputed
    /// over the window) every <c>rebaseEvery</c> points, so |x₀ − o| stays within about a window width and the binomial
    /// shift loses at most a digit or two; the direct sums of <see cref="QuadraticFit"/> made the whole smoothing O(n²/8).
    /// </summary>
    private sealed class MovingQuadraticFit(double[] x, double[] y)
    {
        private int _lo, _hi = -1, _sinceRebase = int.MaxValue;
        private double _origin;
        private double _a0, _a1, _a2, _a3, _a4, _b0, _b1, _b2;

        public double ValueAt(int lo, int hi, double x0, int rebaseEvery)
        {
            if (lo < _lo || hi < _hi || lo > _hi + 1 || ++_sinceRebase >= rebaseEvery) Rebase(lo, hi, x0);
            while (_hi < hi) Add(++_hi, 1.0);
            while (_lo < lo) Add(_lo++, -1.0);
            double scale = Math.Max(x[hi] - x[lo], 1e-300);
            double dl = _origin - x0; // x − x₀ = (x − o) + (o − x₀)
            double d2 = dl * dl, d3 = d2 * dl, d4 = d2 * d2;
            double m1 = _a1 + dl * _a0;
            double m2 = _a2 + 2 * dl * _a1 + d2 * _a0;
            double m3 = _a3 + 3 * dl * _a2 + 3 * d2 * _a1 + d3 * _a0;
            double m4 = _a4 + 4 * dl * _a3 + 6 * d2 * _a2 + 4 * d3 * _a1 + d4 * _a0;
            double n1 = _b1 + dl * _b0;
            double n2 = _b2 + 2 * dl * _b1 + d2 * _b0;
            double i1 = 1.0 / scale, i2 = i1 * i1;
            return SolveQuadratic(_a0, m1 * i1, m2 * i2, m3 * i2 * i1, m4 * i2 * i2, _b0, n1 * i1, n2 * i2, scale, out _, out _);
        }

        private void Rebase(int lo, int hi, double x0)
        {
            _origin = x0;
            _a0 = _a1 = _a2 = _a3 = _a4 = _b0 = _b1 = _b2 = 0;
            _lo = lo;
            _hi = hi;
            for (int k = lo; k <= hi; k++) Add(k, 1.0);
            _sinceRebase = 0;
        }

        private void Add(int k, double sign)
        {
            double d = x[k] - _origin, d2 = d * d, yk = sign * y[k];
            _a0 += sign; _a1 += sign * d; _a2 += sign * d2; _a3 += sign * d2 * d; _a4 += sign * d2 * d2;
            _b0 += yk; _b1 += yk * d; _b2 += yk * d2;
        }
    }

    /// <summary>
    /// Least-squares y ≈ c0 + c1 (x − x0) + c2 (x − x0)² over points lo..hi; returns c0 (the value at x0) and the
    /// coefficients c1, c2. Normal equations solved by Cramer's rule on centred data.
    /// </summary>
    private static double QuadraticFit(double[] x, double[] y, int lo, int hi, double x0, out double c1, out double c2)
    {
        double s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, t0 = 0, t1 = 0, t2 = 0;
        double scale = Math.Max(x[hi] - x[lo], 1e-300);
        for (int k = lo; k <= hi; k++)
        {
            double u = (x[k] - x0) / scale, u2 = u * u;
            s0 += 1; s1 += u; s2 += u2; s3 += u2 * u; s4 += u2 * u2;
            t0 += y[k]; t1 += y[k] * u; t2 += y[k] * u2;
        }
        return SolveQuadratic(s0, s1, s2, s3, s4, t0, t1, t2, scale, out c1, out c2);
    }
}
