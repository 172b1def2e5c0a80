namespace OpGrowth.Pauli;

/// <summary>What one truncation removed: the discarded weight is sum of c^2 over dropped strings.</summary>
public readonly record struct TruncationResult(double DiscardedWeight, long DroppedStrings)
{
    public static TruncationResult operator +(TruncationResult a, TruncationResult b)
        => new(a.DiscardedWeight + b.DiscardedWeight, a.DroppedStrings + b.DroppedStrings);
}

/// <summary>
/// Truncation hooks used by the engines. Each works in place and returns the discarded weight,
/// so every truncated result can account for what it lost.
/// </summary>
public static class Truncation
{
    /// <summary>Drops strings with |c| &lt; threshold.</summary>
    public static TruncationResult DropBelow<T>(PauliOperator<T> o, double threshold) where T : unmanaged, IPauliKey<T>
    {
        if (threshold <= 0) return default;
        int before = o.Count;
        double w = o.Filter((_, c) => Math.Abs(c) >= threshold);
        return new TruncationResult(w, before - o.Count);
    }

    /// <summary>Drops strings of size (weight) greater than <paramref name="maxSize"/>. Biases size growth downwards by construction.</summary>
    public static TruncationResult CapSize<T>(PauliOperator<T> o, int maxSize) where T : unmanaged, IPauliKey<T>
    {
        int before = o.Count;
        double w = o.Filter((k, _) => k.Weight <= maxSize);
        return new TruncationResult(w, before - o.Count);
    }

    /// <summary>
    /// Keeps the <paramref name="maxStrings"/> strings of largest |c| (ties at the cut broken by
    /// storage order, which is deterministic). Linear time: quickselect on a copy of |c|.
    /// </summary>
    public static TruncationResult KeepTop<T>(PauliOperator<T> o, long maxStrings) where T : unmanaged, IPauliKey<T>
    {
        if (o.Count <= maxStrings) return default;
        if (maxStrings <= 0)
        {
            int all = o.Count;
            return new TruncationResult(o.Filter((_, _) => false), all);
        }
        var mags = new double[o.Count];
        var c = o.Coefficients;
        for (int i = 0; i < mags.Length; i++) mags[i] = Math.Abs(c[i]);
        int keep = (int)maxStrings;
        // k-th largest = element at index n-keep in ascending order.
        double cut = Select(mags, mags.Length - keep);
        int above = 0;
        for (int i = 0; i < c.Length; i++) if (Math.Abs(c[i]) > cut) above++;
        int tiesAllowed = keep - above;
        int before = o.Count;
        double w = o.Filter((_, v) =>
        {
            double a = Math.Abs(v);
            if (a > cut) return true;
            if (a == cut && tiesAllowed > 0)
            {
                tiesAllowed--;
                return true;
            }
            return false;
        });
        return new TruncationResult(w, before - o.Count);
    }

    /// <summary>Hoare quickselect: returns the element of rank k (0-based, ascending); reorders the array.</summary>
    internal static double Select(double[] a, int k)
    {
        int lo = 0, hi = a.Length - 1;
        var rng = new Random(12345);
        while (lo < hi)
        {
            double pivot = a[lo + rng.Next(hi - lo + 1)];
            int i = lo, j = hi;
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
            if (k <= j) hi = j;
            else if (k >= i) lo = i;
            else return a[k];
        }
        return a[k];
    }
}
