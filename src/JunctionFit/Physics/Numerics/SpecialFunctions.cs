namespace JunctionFit.Physics.Numerics;

/// <summary>Special functions needed by the barrier profiles.</summary>
internal static class SpecialFunctions
{
    /// <summary>Euler–Mascheroni constant γ.</summary>
    public const double EulerGamma = 0.57721566490153286060651209;

    /// <summary>
    /// Digamma ψ(x) for x &gt; 0: recurrence ψ(x) = ψ(x + 1) − 1/x up to x ≥ 10, then the asymptotic series
    /// ψ(x) = ln x − 1/(2x) − Σ B₂ₖ/(2k x^{2k}) (Abramowitz and Stegun 6.3.18); absolute error below 1e-12.
    /// </summary>
    public static double Digamma(double x)
    {
        double shift = 0;
        while (x < 10.0)
        {
            shift -= 1.0 / x;
            x += 1.0;
        }
        double inv = 1.0 / x, inv2 = inv * inv;
        double series = inv2 * (1.0 / 12 - inv2 * (1.0 / 120 - inv2 * (1.0 / 252 - inv2 * (1.0 / 240 - inv2 * (1.0 / 132)))));
        return shift + Math.Log(x) - 0.5 * inv - series;
    }
}
