using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>The fitter's optimum against an independent brute-force search of the same objective.</summary>
public class GlobalOptimumTests
{
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    /// <summary>
    /// Brute force: a 241 × 241 log grid over φ ∈ [0.3, 6] eV, d ∈ [0.4, 6] nm with the area profiled out exactly
    /// (it is an additive constant in ln|I|), then the best cell refined by a pattern search. Unweighted ln|I|
    /// residuals, as the fitter uses without a noise model.
    /// </summary>
    private static (double Rss, double PhiEv, double DNm) BruteForce(IvCurve curve)
    {
        var v = new List<double>();
        var y = new List<double>();
        for (int i = 0; i < curve.Count; i++)
        {
            if (curve.VoltageV[i] != 0 && Math.Sign(curve.CurrentA[i]) == Math.Sign(curve.VoltageV[i]))
            {
                v.Add(curve.VoltageV[i]);
                y.Add(Math.Log(Math.Abs(curve.CurrentA[i])));
            }
        }
        double Cost(double phiEv, double dNm)
        {
            double[] theta = [phiEv * PhysicalConstants.JoulePerElectronVolt, dNm * 1e-9, 1.0, 1.0];
            var r = new double[v.Count];
            double mean = 0;
            for (int i = 0; i < v.Count; i++)
            {
                double c = Model.Current(v[i], theta);
                r[i] = c > 0 == v[i] > 0 && c != 0 ? y[i] - Math.Log(Math.Abs(c)) : 1e3;
                mean += r[i];
            }
            mean /= v.Count;
            double s = 0;
            foreach (double ri in r) s += (ri - mean) * (ri - mean);
            return s;
        }
        double bestCost = double.PositiveInfinity, bestPhi = 0, bestD = 0;
        const int n = 241;
        for (int a = 0; a < n; a++)
        for (int b = 0; b < n; b++)
        {
            double phi = 0.3 * Math.Pow(20.0, a / (n - 1.0));
            double d = 0.4 * Math.Pow(15.0, b / (n - 1.0));
            double c = Cost(phi, d);
            if (c < bestCost) (bestCost, bestPhi, bestD) = (c, phi, d);
        }
        // Pattern search from the best cell: a 21 × 21 local grid of half-width w (log scale) moves with the best
        // point and shrinks only when the centre stays best, until w < 1e-9.
        double w = Math.Log(20.0) / (n - 1.0);
        for (int round = 0; round < 2000 && w > 1e-9; round++)
        {
            double p0 = bestPhi, d0 = bestD;
            for (int a = -10; a <= 10; a++)
            for (int b = -10; b <= 10; b++)
            {
                double phi = p0 * Math.Exp(w * a / 10.0), d = d0 * Math.Exp(w * b / 10.0);
                double c = Cost(phi, d);
                if (c < bestCost) (bestCost, bestPhi, bestD) = (c, phi, d);
            }
            if (bestPhi == p0 && bestD == d0) w *= 0.3;
        }
        return (bestCost, bestPhi, bestD);
    }

    [Theory]
    [InlineData(1.2, 1.2, 21)]
    [InlineData(2.0, 1.5, 22)]
    [InlineData(3.1, 2.2, 23)]
    [InlineData(0.8, 3.0, 24)]
    public void Fit_AreaFree_ReachesBruteForceOptimum(double phiEv, double dNm, int seed)
    {
        var curve = JunctionFitterTests.Simulate(phiEv, dNm, 50, 0.02, seed, fromV: -0.6 * phiEv, toV: 0.6 * phiEv);
        var result = JunctionFitter.Fit(curve, Model, FitOptions.Default);
        var (rss, bestPhi, bestD) = BruteForce(curve);

        Assert.NotEqual(FitStatus.Failed, result.Status);
        // The fitter may only be better than the grid (it is continuous), never worse beyond rounding.
        // Unweighted Σ (ln|I| − ln|I_model|)² over the fitted points (the fitter's own RSS is divided by its noise estimate).
        double fitterRss = 0;
        for (int i = 0; i < curve.Count; i++)
        {
            if (result.Curve!.Used[i]) fitterRss += result.Curve.LogResidual[i] * result.Curve.LogResidual[i];
        }
        Assert.True(fitterRss <= rss * (1 + 1e-6) + 1e-12, $"fitter RSS {fitterRss} above brute-force {rss}");
        // Same optimum: the parameters agree to a small fraction of their standard error (the valley is long and
        // flat when the area is free).
        var phi = result.Find("barrier_height_eV")!;
        var d = result.Find("thickness_nm")!;
        Assert.Equal(bestPhi, phi.Value, Math.Max(1e-3 * bestPhi, 0.05 * phi.StandardError!.Value));
        Assert.Equal(bestD, d.Value, Math.Max(1e-3 * bestD, 0.05 * d.StandardError!.Value));
    }
}
