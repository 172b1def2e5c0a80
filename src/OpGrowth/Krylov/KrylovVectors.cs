using System.Numerics.Tensors;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>Norms, truncation and support measures of Krylov vectors in a (possibly weighted) representation.</summary>
internal static class KrylovVectors
{
    public static double NormSquared<T, TBasis>(PauliOperator<T> o, in TBasis basis)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        if (!basis.IsWeighted) return TensorPrimitives.SumOfSquares(o.Coefficients);
        var k = o.Keys;
        var c = o.Coefficients;
        double s = 0;
        for (int i = 0; i < k.Length; i++) s += basis.Weight(k[i]) * c[i] * c[i];
        return s;
    }

    /// <summary>
    /// Keeps the <paramref name="maxStrings"/> entries of largest weighted magnitude w c^2 (ties by
    /// storage order); returns the discarded weighted norm^2.
    /// </summary>
    public static double KeepTop<T, TBasis>(PauliOperator<T> o, long maxStrings, in TBasis basis)
        where T : unmanaged, IPauliKey<T>
        where TBasis : struct, IKrylovBasis<T>
    {
        if (o.Count <= maxStrings) return 0;
        if (!basis.IsWeighted) return Truncation.KeepTop(o, maxStrings).DiscardedWeight;
        var k = o.Keys;
        var c = o.Coefficients;
        var mags = new double[o.Count];
        for (int i = 0; i < mags.Length; i++) mags[i] = basis.Weight(k[i]) * c[i] * c[i];
        var sorted = (double[])mags.Clone();
        double cut = Truncation.Select(sorted, sorted.Length - (int)maxStrings);
        int above = 0;
        foreach (var m in mags) if (m > cut) above++;
        int ties = (int)maxStrings - above;
        int idx = 0;
        double dropped = 0;
        o.Filter((_, _) =>
        {
            double m = mags[idx++];
            if (m > cut) return true;
            if (m == cut && ties > 0)
            {
                ties--;
                return true;
            }
            dropped += m;
            return false;
        });
        return dropped;
    }

    /// <summary>Lowest and highest support site over all strings, and the largest span of one string.</summary>
    public static (int First, int Last, int MaxSpan) Extent<T>(PauliOperator<T> o) where T : unmanaged, IPauliKey<T>
    {
        int lo = int.MaxValue, hi = -1, span = 0;
        foreach (ref readonly var k in o.Keys)
        {
            int f = k.FirstSite;
            if (f < 0) continue;
            int l = k.LastSite;
            if (f < lo) lo = f;
            if (l > hi) hi = l;
            if (l - f + 1 > span) span = l - f + 1;
        }
        return hi < 0 ? (-1, -1, 0) : (lo, hi, span);
    }
}
