using JunctionFit.Common;

namespace JunctionFit.Physics;

/// <summary>
/// A Fowler–Nordheim plot: y = ln(|I| / F²) against x = 1/F, F = |V|/d, and its least-squares straight line
/// y = intercept + slope·x. For Fowler–Nordheim tunnelling slope = −B (Lenzlinger and Snow 1969).
/// </summary>
/// <param name="InverseFieldMPerV">x = 1/F in m/V, one per point used.</param>
/// <param name="LogCurrentOverFieldSquared">y = ln(|I| / F²) with I in A and F in V/m.</param>
/// <param name="SlopeVPerM">Slope of the straight line in V/m (negative for Fowler–Nordheim tunnelling).</param>
/// <param name="Intercept">Intercept of the line, ln(A m² V⁻²).</param>
/// <param name="RSquared">Coefficient of determination of the line (1 for a perfectly straight plot).</param>
public sealed record FowlerNordheimPlot(
    IReadOnlyList<double> InverseFieldMPerV,
    IReadOnlyList<double> LogCurrentOverFieldSquared,
    double SlopeVPerM,
    double Intercept,
    double RSquared)
{
    /// <summary>B = −slope in V/m.</summary>
    public double SlopeConstantVPerM => -SlopeVPerM;

    /// <summary>The barrier height in eV that this slope implies for <paramref name="massRatio"/> (see <see cref="FowlerNordheimModel.BarrierHeightFromSlopeConstant"/>).</summary>
    /// <param name="massRatio">m*/mₑ assumed for the barrier.</param>
    /// <returns>φ in eV, or NaN when the slope is not negative.</returns>
    public double BarrierHeightEv(double massRatio)
        => SlopeVPerM < 0
            ? FowlerNordheimModel.BarrierHeightFromSlopeConstant(-SlopeVPerM, massRatio) / PhysicalConstants.JoulePerElectronVolt
            : double.NaN;

    /// <summary>
    /// Builds the plot from a measured curve, using the points of one polarity with |V| ≥ <paramref name="minAbsVoltageV"/>
    /// whose current has the sign of the bias. Pure computation.
    /// </summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="currentA">Current in ampere (area does not matter: it only shifts the intercept).</param>
    /// <param name="thicknessM">Barrier thickness d in metre, giving F = |V|/d.</param>
    /// <param name="positiveBias">True for V &gt; 0, false for V &lt; 0.</param>
    /// <param name="minAbsVoltageV">Smallest |V| to use, for example the barrier height in volt.</param>
    /// <returns>The plot, or null when fewer than 3 points qualify.</returns>
    /// <exception cref="ArgumentException">The spans differ in length, or the thickness is not positive.</exception>
    public static FowlerNordheimPlot? Create(ReadOnlySpan<double> voltageV, ReadOnlySpan<double> currentA, double thicknessM,
                                            bool positiveBias = true, double minAbsVoltageV = 0.0)
    {
        if (voltageV.Length != currentA.Length) throw new ArgumentException("voltage and current must have the same length", nameof(currentA));
        Guard.Positive(thicknessM);
        var xs = new List<double>();
        var ys = new List<double>();
        for (int k = 0; k < voltageV.Length; k++)
        {
            double v = voltageV[k], i = currentA[k];
            if (positiveBias ? !(v > 0 && i > 0) : !(v < 0 && i < 0)) continue;
            if (Math.Abs(v) < minAbsVoltageV || !double.IsFinite(i)) continue;
            double f = Math.Abs(v) / thicknessM;
            xs.Add(1.0 / f);
            ys.Add(Math.Log(Math.Abs(i) / (f * f)));
        }
        if (xs.Count < 3) return null;
        double n = xs.Count, sx = 0, sy = 0;
        for (int k = 0; k < xs.Count; k++) { sx += xs[k]; sy += ys[k]; }
        double mx = sx / n, my = sy / n, sxx = 0, sxy = 0, syy = 0;
        for (int k = 0; k < xs.Count; k++)
        {
            double dx = xs[k] - mx, dy = ys[k] - my;
            sxx += dx * dx; sxy += dx * dy; syy += dy * dy;
        }
        if (sxx == 0) return null;
        double slope = sxy / sxx;
        double r2 = syy == 0 ? 1.0 : sxy * sxy / (sxx * syy);
        return new FowlerNordheimPlot(xs, ys, slope, my - slope * mx, r2);
    }
}
