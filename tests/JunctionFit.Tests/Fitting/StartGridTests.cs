using CsCheck;
using JunctionFit.Fitting;
using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The start grid abandons hopeless cells early (area fixed); its starts must be exactly those of the exhaustive grid, and
/// the reference is the project's own exhaustive version (invented data from the project's simulator). The sorting kernels
/// the grid uses are checked against <see cref="Array.Sort(Array)"/> in <c>Physics/Numerics/SortKernelsTests</c>.
/// </summary>
public class StartGridTests
{
    private static readonly JunctionCurrentModel Model = new(SimmonsRectangularModel.Instance);

    private static (double[] V, double[] Y, double[] W) Curve(double phiEv, double dNm, double noise, int seed, double fromV, double toV)
    {
        double[] theta = [phiEv * PhysicalConstants.JoulePerElectronVolt, dNm * 1e-9, 1.0, 1e-10];
        var (v, i) = IvSimulator.Simulate(Model, theta, new SimulationSpec(fromV, toV, 201) { RelativeNoise = noise, Seed = seed });
        var vs = new List<double>();
        var ys = new List<double>();
        for (int k = 0; k < v.Length; k++)
        {
            if (v[k] == 0 || i[k] == 0 || Math.Sign(v[k]) != Math.Sign(i[k])) continue;
            vs.Add(v[k]);
            ys.Add(Math.Log(Math.Abs(i[k])));
        }
        var w = new double[vs.Count];
        for (int k = 0; k < w.Length; k++) w[k] = 1.0 / Math.Max(noise, 1e-3) * (1 + 0.1 * (k % 3));
        return (vs.ToArray(), ys.ToArray(), w);
    }

    private static void AssertSameStarts(List<double[]> expected, List<double[]> actual)
    {
        Assert.Equal(expected.Count, actual.Count);
        for (int k = 0; k < expected.Count; k++) Assert.Equal(expected[k], actual[k]); // bitwise: the same doubles
    }

    [Fact]
    public void GridStarts_AreaFixedOrFree_SameStartsAsExhaustiveGrid()
    {
        Gen.Select(Gen.Double[0.3, 5.5], Gen.Double[0.4, 6.0], Gen.Double[0.0, 0.3], Gen.Int[1, 1_000_000], Gen.Int[0, 7])
            .Sample((phi, d, noise, seed, variant) =>
            {
                var (v, y, w) = Curve(phi, d, noise, seed, -1.5, 1.5);
                double[] template = [1.0 * PhysicalConstants.JoulePerElectronVolt, 1e-9, 1.0, 1e-10];
                bool areaFree = (variant & 1) != 0;
                bool[] free = (variant >> 1) switch
                {
                    0 => [true, true, false, areaFree],
                    1 => [true, false, false, areaFree],
                    2 => [false, true, false, areaFree],
                    _ => [true, true, false, false],
                };
                for (int count = 1; count <= 3; count++)
                {
                    AssertSameStarts(
                        JunctionFitter.GridStartsExhaustive(Model, template, free, v, y, w, count),
                        JunctionFitter.GridStarts(Model, template, free, v, y, w, count));
                }
            }, iter: 300);
    }

    [Fact]
    public void GridStarts_EveryCellTied_SameStartsAsExhaustiveGrid()
    {
        // Negative bias with positive currents: every model current has the wrong sign, every residual is the same
        // penalty, every cell costs the same; the exhaustive ranking decides.
        double[] v = [-1.0, -0.8, -0.6, -0.4, -0.2, -0.1];
        double[] y = [-20.0, -21.0, -22.0, -23.0, -24.0, -25.0];
        double[] w = [1.0, 1.0, 1.0, 1.0, 1.0, 1.0];
        double[] template = [1.0 * PhysicalConstants.JoulePerElectronVolt, 1e-9, 1.0, -1e-10];
        bool[] free = [true, true, false, false];
        for (int count = 1; count <= 2; count++)
        {
            AssertSameStarts(JunctionFitter.GridStartsExhaustive(Model, template, free, v, y, w, count),
                JunctionFitter.GridStarts(Model, template, free, v, y, w, count));
        }
    }
}
