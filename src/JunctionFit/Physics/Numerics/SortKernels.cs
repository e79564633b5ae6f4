namespace JunctionFit.Physics.Numerics;

/// <summary>
/// Sorting and order statistics of doubles for the per-curve statistics (typical step, medians, quantisation).
/// <para>
/// Sorting values alone gives the same array whatever the algorithm (equal doubles are indistinguishable, apart from the
/// order of −0 and +0, which these callers never mix), so these kernels return exactly what <see cref="Array.Sort(Array)"/>
/// returns; NaN sorts first as there. They live in this assembly so that a short run (one process per batch) executes them
/// precompiled instead of in the runtime's unoptimised first tier of <c>Array.Sort&lt;double&gt;</c>.
/// </para>
/// <para>
/// A sort of keys with items is not algorithm-independent when keys tie, so for those the callers keep
/// <see cref="Array.Sort{TKey, TValue}(TKey[], TValue[])"/> and only skip it when the keys are already strictly
/// increasing (then every sort leaves the arrays as they are): <see cref="IsStrictlyIncreasing"/>.
/// </para>
/// </summary>
internal static class SortKernels
{
    private const int InsertionLimit = 20;

    /// <summary>Sorts <paramref name="values"/> ascending in place, NaN first.</summary>
    public static void Sort(Span<double> values)
    {
        int nan = 0;
        for (int i = 0; i < values.Length; i++)
        {
            if (double.IsNaN(values[i]))
            {
                (values[i], values[nan]) = (values[nan], values[i]);
                nan++;
            }
        }
        Span<double> rest = values[nan..];
        if (rest.Length > 1) QuickSort(rest, 2 * Log2(rest.Length));
    }

    /// <summary>
    /// The median (mean of the two middle values for an even count), as from the sorted values; reorders
    /// <paramref name="values"/>. O(n) by selection.
    /// </summary>
    public static double Median(Span<double> values)
    {
        int n = values.Length;
        if (n == 0) throw new ArgumentException("no values", nameof(values));
        Select(values, n / 2);
        if (n % 2 == 1) return values[n / 2];
        // The largest of the lower half is the value a sort puts just below the middle (NaN only if the half is all NaN).
        double below = double.NaN;
        for (int i = 0; i < n / 2; i++)
        {
            if (!double.IsNaN(values[i]) && !(values[i] <= below)) below = values[i];
        }
        return 0.5 * (below + values[n / 2]);
    }

    /// <summary>Puts the <paramref name="count"/> smallest values, sorted, first (the rest in no order).</summary>
    public static void SortSmallest(Span<double> values, int count)
    {
        if (count <= 0) return;
        if (count < values.Length) Select(values, count - 1);
        Sort(values[..Math.Min(count, values.Length)]);
    }

    /// <summary>
    /// Reorders <paramref name="values"/> so that element <paramref name="k"/> is the one a sort would put there, with no
    /// larger value before it and no smaller one after it (NaN counts as the smallest, as in the sort).
    /// </summary>
    public static void Select(Span<double> values, int k)
    {
        int nan = 0;
        for (int i = 0; i < values.Length; i++)
        {
            if (double.IsNaN(values[i]))
            {
                (values[i], values[nan]) = (values[nan], values[i]);
                nan++;
            }
        }
        if (k < nan) return;
        Span<double> a = values[nan..];
        k -= nan;
        int lo = 0, hi = a.Length - 1;
        while (hi - lo > InsertionLimit)
        {
            var (leftEnd, rightStart) = Partition(a[lo..(hi + 1)]);
            int j = lo + leftEnd, i = lo + rightStart;
            // [lo, j] ≤ pivot, (j, i) = pivot, [i, hi] ≥ pivot
            if (k <= j) hi = j;
            else if (k >= i) lo = i;
            else return;
        }
        InsertionSort(a[lo..(hi + 1)]);
    }

    /// <summary>True when every value is larger than the one before it (no NaN, no ties).</summary>
    public static bool IsStrictlyIncreasing(ReadOnlySpan<double> keys)
    {
        for (int i = 1; i < keys.Length; i++)
        {
            if (!(keys[i] > keys[i - 1])) return false;
        }
        return keys.Length == 0 || !double.IsNaN(keys[0]);
    }

    /// <summary>
    /// Exactly <see cref="Array.Sort{TKey, TValue}(TKey[], TValue[])"/> of the whole arrays, without the sort when the keys are
    /// strictly increasing (nothing to do) or strictly decreasing (the reversal is the only sorted order).
    /// </summary>
    public static void SortWithItems<T>(double[] keys, T[] items)
    {
        if (IsStrictlyIncreasing(keys)) return;
        if (IsStrictlyDecreasing(keys))
        {
            for (int i = 0, j = keys.Length - 1; i < j; i++, j--)
            {
                (keys[i], keys[j]) = (keys[j], keys[i]);
                (items[i], items[j]) = (items[j], items[i]);
            }
            return;
        }
        Array.Sort(keys, items);
    }

    /// <summary>True when every value is smaller than the one before it (no NaN, no ties).</summary>
    public static bool IsStrictlyDecreasing(ReadOnlySpan<double> keys)
    {
        for (int i = 1; i < keys.Length; i++)
        {
            if (!(keys[i] < keys[i - 1])) return false;
        }
        return keys.Length == 0 || !double.IsNaN(keys[0]);
    }

    private static int Log2(int n)
    {
        int k = 0;
        while ((n >>= 1) > 0) k++;
        return k;
    }

    // Quicksort with a median-of-three pivot, insertion sort on short ranges and heapsort past the depth limit; recursion on
    // the shorter side only. No NaN in the range.
    private static void QuickSort(Span<double> a, int depth)
    {
        while (a.Length > InsertionLimit)
        {
            if (depth-- == 0)
            {
                HeapSort(a);
                return;
            }
            var (j, i) = Partition(a);
            // [0, j] ≤ pivot ≤ [i, end]
            if (j + 1 < a.Length - i)
            {
                QuickSort(a[..(j + 1)], depth);
                a = a[i..];
            }
            else
            {
                QuickSort(a[i..], depth);
                a = a[..(j + 1)];
            }
        }
        InsertionSort(a);
    }

    /// <summary>
    /// Hoare partition of <paramref name="a"/> (no NaN, at least 3 values) around the median of its first, middle and last
    /// values: afterwards [0, LeftEnd] ≤ pivot, (LeftEnd, RightStart) = pivot and [RightStart, end] ≥ pivot.
    /// </summary>
    private static (int LeftEnd, int RightStart) Partition(Span<double> a)
    {
        int hi = a.Length - 1, mid = hi / 2;
        if (a[mid] < a[0]) (a[mid], a[0]) = (a[0], a[mid]);
        if (a[hi] < a[0]) (a[hi], a[0]) = (a[0], a[hi]);
        if (a[hi] < a[mid]) (a[hi], a[mid]) = (a[mid], a[hi]);
        double pivot = a[mid];
        int i = 0, j = hi;
        while (i <= j)
        {
            while (a[i] < pivot) i++;
            while (a[j] > pivot) j--;
            if (i <= j)
            {
                (a[i], a[j]) = (a[j], a[i]);
                i++;
                j--;
            }
        }
        return (j, i);
    }

    private static void InsertionSort(Span<double> a)
    {
        for (int i = 1; i < a.Length; i++)
        {
            double x = a[i];
            int j = i - 1;
            while (j >= 0 && a[j] > x)
            {
                a[j + 1] = a[j];
                j--;
            }
            a[j + 1] = x;
        }
    }

    private static void HeapSort(Span<double> a)
    {
        int n = a.Length;
        for (int i = n / 2 - 1; i >= 0; i--) SiftDown(a, i, n);
        for (int end = n - 1; end > 0; end--)
        {
            (a[0], a[end]) = (a[end], a[0]);
            SiftDown(a, 0, end);
        }
    }

    private static void SiftDown(Span<double> a, int root, int n)
    {
        double x = a[root];
        while (true)
        {
            int child = 2 * root + 1;
            if (child >= n) break;
            if (child + 1 < n && a[child + 1] > a[child]) child++;
            if (!(a[child] > x)) break;
            a[root] = a[child];
            root = child;
        }
        a[root] = x;
    }
}
