using CsCheck;
using JunctionFit.Physics.Numerics;
using Xunit;

namespace JunctionFit.Tests.Physics.Numerics;

/// <summary>
/// The sorting and order-statistic kernels against the .NET base library: every result must be exactly what
/// <see cref="Array.Sort(Array)"/> (or <see cref="Array.Sort{TKey, TValue}(TKey[], TValue[])"/>) gives, NaN first, on
/// random arrays with ties, NaN and infinities (CsCheck generators, fixed by CsCheck's own seeding), on arrays long and
/// adversarial enough to reach the quicksort, the heapsort fallback and the insertion-sort tails, and on the small
/// edge cases (empty, one value, all NaN).
/// </summary>
public class SortKernelsTests
{
    private static readonly Gen<double> AnyValue = Gen.OneOf(Gen.Double[-1e3, 1e3], Gen.Int[-3, 3].Select(k => (double)k),
        Gen.Const(double.NaN), Gen.Const(double.PositiveInfinity), Gen.Const(double.NegativeInfinity));

    private static double SortedMedian(double[] sorted)
        => sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : 0.5 * (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]);

    [Fact]
    public void Sort_RandomValuesWithTiesAndNaN_SameAsArraySort()
    {
        AnyValue.Array[0, 300].Sample(a =>
        {
            var expected = (double[])a.Clone();
            Array.Sort(expected);
            var actual = (double[])a.Clone();
            SortKernels.Sort(actual);
            Assert.Equal(expected, actual);
        }, iter: 500);
    }

    [Fact]
    public void Median_RandomValuesWithTiesAndNaN_SameAsMiddleOfArraySort()
    {
        AnyValue.Array[1, 300].Sample(a =>
        {
            var expected = (double[])a.Clone();
            Array.Sort(expected);
            Assert.Equal(SortedMedian(expected), SortKernels.Median((double[])a.Clone()));
        }, iter: 500);
    }

    [Theory]
    [InlineData(new double[] { 5.0 }, 5.0)]
    [InlineData(new double[] { 4.0, 1.0 }, 2.5)]
    [InlineData(new double[] { 9.0, 1.0, 3.0, 7.0 }, 5.0)]
    [InlineData(new double[] { 2.0, 8.0, 6.0, 4.0, 0.0, 10.0 }, 5.0)]
    [InlineData(new double[] { 3.0, 1.0, 2.0 }, 2.0)]
    public void Median_SmallHandCases_MeanOfMiddleForEvenCount(double[] values, double expected)
    {
        // The median of an even count is the mean of the two middle order statistics (textbook definition, from memory).
        Assert.Equal(expected, SortKernels.Median(values));
    }

    [Fact]
    public void Median_LongDistinctRuns_SameAsArraySort()
    {
        // Long arrays (past the insertion-sort limit) of distinct values in increasing, decreasing and organ-pipe order,
        // even and odd counts: the lower half's largest value is the one just below the middle.
        foreach (int n in new[] { 40, 41, 200, 201, 1000 })
        {
            foreach (var a in new[]
                     {
                         Enumerable.Range(0, n).Select(k => (double)k).ToArray(),
                         Enumerable.Range(0, n).Select(k => (double)(n - k)).ToArray(),
                         Enumerable.Range(0, n).Select(k => Math.Min(k, n - k) + 1e-3 * k).ToArray(),
                     })
            {
                var expected = (double[])a.Clone();
                Array.Sort(expected);
                Assert.Equal(SortedMedian(expected), SortKernels.Median((double[])a.Clone()));
            }
        }
    }

    [Fact]
    public void Median_NoValues_Throws()
        => Assert.Throws<ArgumentException>(() => SortKernels.Median(Span<double>.Empty));

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
                // Nothing is lost or invented: the whole array is still a permutation of the input.
                var all = (double[])actual.Clone();
                Array.Sort(all);
                Assert.Equal(expected, all);
            }, iter: 500);
    }

    [Fact]
    public void SortSmallest_CountZeroOrNegative_LeavesArrayAsItIs()
    {
        double[] a = [3.0, 1.0, 2.0];
        SortKernels.SortSmallest(a, 0);
        Assert.Equal([3.0, 1.0, 2.0], a);
        SortKernels.SortSmallest(a, -2);
        Assert.Equal([3.0, 1.0, 2.0], a);
    }

    [Fact]
    public void SortSmallest_CountBeyondLength_SortsAll()
    {
        double[] a = [3.0, double.NaN, 1.0, 2.0];
        SortKernels.SortSmallest(a, 10);
        Assert.Equal([double.NaN, 1.0, 2.0, 3.0], a);
    }

    [Fact]
    public void Select_RandomValues_KthIsOrderStatisticAndPartitioned()
    {
        Gen.Select(AnyValue.Array[1, 300], Gen.Double[0, 1]).Sample((a, fraction) =>
        {
            int k = Math.Min(a.Length - 1, (int)(fraction * a.Length));
            var expected = (double[])a.Clone();
            Array.Sort(expected);
            var actual = (double[])a.Clone();
            SortKernels.Select(actual, k);
            Assert.Equal(expected[k], actual[k]);
            // No larger value before k, no smaller one after it; NaN counts as the smallest (as Array.Sort puts it first).
            for (int i = 0; i < actual.Length; i++)
            {
                int order = actual[i].CompareTo(actual[k]);
                if (i < k) Assert.True(order <= 0, $"{actual[i]} before {actual[k]} at {i} < {k}");
                if (i > k) Assert.True(order >= 0, $"{actual[i]} after {actual[k]} at {i} > {k}");
            }
        }, iter: 500);
    }

    [Fact]
    public void Sort_LongAdversarialOrders_SameAsArraySort()
    {
        // Long runs reach the quicksort and, for the organ-pipe and sawtooth shapes that defeat a median-of-three pivot,
        // the heapsort past the depth limit; every shape must still end exactly as Array.Sort ends it.
        var random = new Random(20261203);
        foreach (int n in new[] { 21, 22, 64, 257, 4096 })
        {
            var shapes = new List<double[]>
            {
                Enumerable.Range(0, n).Select(k => (double)k).ToArray(),
                Enumerable.Range(0, n).Select(k => (double)(n - k)).ToArray(),
                Enumerable.Range(0, n).Select(k => (double)Math.Min(k, n - k)).ToArray(),
                Enumerable.Range(0, n).Select(k => (double)(k % 7)).ToArray(),
                Enumerable.Range(0, n).Select(_ => 1.0).ToArray(),
                Enumerable.Range(0, n).Select(_ => random.NextDouble()).ToArray(),
                Enumerable.Range(0, n).Select(k => k % 2 == 0 ? k : n - (double)k).ToArray(),
            };
            foreach (var a in shapes)
            {
                var expected = (double[])a.Clone();
                Array.Sort(expected);
                var actual = (double[])a.Clone();
                SortKernels.Sort(actual);
                Assert.Equal(expected, actual);
            }
        }
    }

    [Fact]
    public void Sort_AllNaNOrOneValue_Unchanged()
    {
        double[] nan = [double.NaN, double.NaN, double.NaN];
        SortKernels.Sort(nan);
        Assert.All(nan, v => Assert.True(double.IsNaN(v)));
        double[] one = [4.0];
        SortKernels.Sort(one);
        Assert.Equal([4.0], one);
        Assert.True(double.IsNaN(SortKernels.Median(new[] { double.NaN, double.NaN })));
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

    [Theory]
    [InlineData(new double[] { }, true, true)]
    [InlineData(new double[] { 1.0 }, true, true)]
    [InlineData(new double[] { double.NaN }, false, false)]
    [InlineData(new double[] { 1.0, 2.0, 3.0 }, true, false)]
    [InlineData(new double[] { 3.0, 2.0, 1.0 }, false, true)]
    [InlineData(new double[] { 1.0, 1.0, 2.0 }, false, false)]
    [InlineData(new double[] { 2.0, 2.0, 1.0 }, false, false)]
    [InlineData(new double[] { 1.0, double.NaN, 2.0 }, false, false)]
    [InlineData(new double[] { double.NaN, 1.0, 2.0 }, false, false)]
    [InlineData(new double[] { 1.0, 3.0, 2.0 }, false, false)]
    public void IsStrictlyIncreasingOrDecreasing_HandCases(double[] keys, bool increasing, bool decreasing)
    {
        Assert.Equal(increasing, SortKernels.IsStrictlyIncreasing(keys));
        Assert.Equal(decreasing, SortKernels.IsStrictlyDecreasing(keys));
    }
}
