using CsCheck;
using JunctionFit.Fitting;
using JunctionFit.Physics;
using JunctionFit.Physics.Numerics;
using Xunit;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// The start grid abandons hopeless cells early (area fixed); its starts must be exactly those of the exhaustive grid, and
/// the sorting kernels exactly those of <see cref="Array.Sort(Array)"/>. The references are the project's own exhaustive
/// versions (invented data from the project's simulator).
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

    [Fact]
    public void Sort_RandomValuesWithTiesAndNaN_SameAsArraySort()
    {
        var values = Gen.OneOf(Gen.Double[-1e3, 1e3], Gen.Int[-3, 3].Select(k => (double)k), Gen.Const(double.NaN),
            Gen.Const(double.PositiveInfinity), Gen.Const(double.NegativeInfinity));
        values.Array[0, 300].Sample(a =>
        {
            var expected = (double[])a.Clone();
            Array.Sort(expected);
            var actual = (double[])a.Clone();
            SortKernels.Sort(actual);
            Assert.Equal(expected, actual);
            if (a.Length > 0)
            {
                var m = (double[])a.Clone();
                double median = a.Length % 2 == 1 ? expected[a.Length / 2] : 0.5 * (expected[a.Length / 2 - 1] + expected[a.Length / 2]);
                Assert.Equal(median, SortKernels.Median(m));
            }
        }, iter: 500);
    }

    [Fact]
    public void SortSmallest_RandomValues_PrefixSameAsArraySort()
    {
        Gen.Select(Gen.OneOf(Gen.Double[0, 10], Gen.Int[0, 4].Select(k => (double)k), Gen.Const(double.NaN)).Array[1, 250], Gen.Double[0, 1])
            .Sample((a, fraction) =>
            {
                int count = Math.Max(1, (int)(fraction * a.Length));
                var expected = (double[])a.Clone();
                Array.Sort(expected);
                var actual = (double[])a.Clone();
                SortKernels.SortSmallest(actual, count);
                Assert.Equal(expected[..count], actual[..count]);
            }, iter: 500);
    }

    [Fact]
    public void SortWithItems_AnyKeys_SameAsArraySort()
    {
        Gen.Select(Gen.Double[-5, 5].Array[0, 120], Gen.Int[0, 2]).Sample((a, shape) =>
        {
            var keys = (double[])a.Clone();
            if (shape == 1) Array.Sort(keys);                      // increasing (strictly unless ties)
            if (shape == 2) { Array.Sort(keys); Array.Reverse(keys); } // decreasing
            var items = new int[keys.Length];
            for (int k = 0; k < items.Length; k++) items[k] = k;
            var expectedKeys = (double[])keys.Clone();
            var expectedItems = (int[])items.Clone();
            Array.Sort(expectedKeys, expectedItems);
            SortKernels.SortWithItems(keys, items);
            Assert.Equal(expectedKeys, keys);
            Assert.Equal(expectedItems, items);
        }, iter: 500);
    }
}
