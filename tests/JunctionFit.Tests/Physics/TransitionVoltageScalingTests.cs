using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>The O(n) moving-window smoother of <see cref="TransitionVoltage"/> against direct least-squares fits per window.</summary>
public class TransitionVoltageScalingTests
{
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;

    /// <summary>Direct least-squares quadratic through points lo..hi, evaluated at x0 (normal equations by Gaussian elimination).</summary>
    private static double DirectQuadratic(double[] x, double[] y, int lo, int hi, double x0)
    {
        var a = new double[3, 4];
        for (int k = lo; k <= hi; k++)
        {
            double u = x[k] - x0;
            double[] basis = [1, u, u * u];
            for (int r = 0; r < 3; r++)
            {
                for (int c = 0; c < 3; c++) a[r, c] += basis[r] * basis[c];
                a[r, 3] += basis[r] * y[k];
            }
        }
        for (int p = 0; p < 3; p++)
        for (int r = p + 1; r < 3; r++)
        {
            double f = a[r, p] / a[p, p];
            for (int c = p; c < 4; c++) a[r, c] -= f * a[p, c];
        }
        double c2 = a[2, 3] / a[2, 2];
        double c1 = (a[1, 3] - a[1, 2] * c2) / a[1, 1];
        return (a[0, 3] - a[0, 1] * c1 - a[0, 2] * c2) / a[0, 0];
    }

    [Theory]
    [InlineData(9, 2)]
    [InlineData(201, 12)]
    [InlineData(5000, 312)]
    public void Smooth_MatchesDirectWindowFits(int n, int half)
    {
        // Invented data: uneven spacing (with some repeated biases), a curved trend and noise.
        var rng = new Random(42);
        var x = new double[n];
        double at = 0.01;
        for (int k = 0; k < n; k++)
        {
            if (k % 7 != 3) at += 0.5 / n * (0.5 + rng.NextDouble());
            x[k] = at;
        }
        var y = new double[n];
        for (int k = 0; k < n; k++) y[k] = -25 + 3 * Math.Pow(x[k] - 0.3, 2) - Math.Log(x[k]) + 0.01 * (rng.NextDouble() - 0.5);

        var smooth = TransitionVoltage.Smooth(x, y, half);
        for (int k = 0; k < n; k++)
        {
            int lo = Math.Max(0, k - half), hi = Math.Min(n - 1, k + half);
            if (hi - lo < 4) { if (lo == 0) hi = Math.Min(n - 1, 4); else lo = Math.Max(0, hi - 4); }
            double expected = DirectQuadratic(x, y, lo, hi, x[k]);
            Assert.Equal(expected, smooth[k], 1e-9 * Math.Abs(expected));
        }
    }

    [Fact]
    public void Compute_MillionPointSweep_MatchesModelMinimum()
    {
        // 10⁶ points (the direct smoother took minutes here). Reference: the minimum of ln(J/V²) of the model itself by
        // golden-section search, the definition of Beebe et al., Phys. Rev. Lett. 97, 026801 (2006).
        double[] p = [1.0 * Ev, 1.5e-9, 1.0];
        var junction = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        var (v, i) = IvSimulator.Simulate(junction, [.. p, 1e-10], new SimulationSpec(-2.0, 2.0, 1_000_000) { RelativeNoise = 0.01, Seed = 3 });
        double F(double bias) => Math.Log(SimmonsRectangularModel.Instance.CurrentDensity(bias, p) / (bias * bias));
        double g = (Math.Sqrt(5) - 1) / 2, a = 0.05, b = 2.0;
        for (int k = 0; k < 200; k++)
        {
            double c = b - g * (b - a), d = a + g * (b - a);
            if (F(c) < F(d)) b = d; else a = c;
        }
        double expected = 0.5 * (a + b);
        var vt = TransitionVoltage.Compute(v.AsSpan(), i.AsSpan());
        Assert.NotNull(vt.PositiveV);
        Assert.InRange(vt.PositiveV.Value / expected, 0.99, 1.01);
        Assert.InRange(-vt.NegativeV!.Value / expected, 0.99, 1.01);
    }
}
