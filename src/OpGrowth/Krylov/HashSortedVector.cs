using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// A Krylov vector stored sorted by key hash, so overlaps between vectors are merge joins (linear
/// time, no index). Memory: sizeof(T) + 16 bytes per string (key, coefficient, hash).
/// </summary>
internal sealed class HashSortedVector<T> where T : unmanaged, IPauliKey<T>
{
    public readonly T[] Keys;
    public readonly double[] Coefficients;
    public readonly ulong[] Hashes;

    public int Count => Keys.Length;

    public long Bytes => (long)Count * (System.Runtime.CompilerServices.Unsafe.SizeOf<T>() + 16);

    private HashSortedVector(T[] keys, double[] coefficients, ulong[] hashes)
    {
        Keys = keys;
        Coefficients = coefficients;
        Hashes = hashes;
    }

    /// <summary>Sorts the operator by hash (in a new operator, returned) and wraps the result.</summary>
    public static (PauliOperator<T> Sorted, HashSortedVector<T> View) Sort(PauliOperator<T> o)
    {
        int n = o.Count;
        var hashes = new ulong[n];
        var perm = new int[n];
        var k = o.Keys;
        for (int i = 0; i < n; i++)
        {
            hashes[i] = k[i].Hash64;
            perm[i] = i;
        }
        Array.Sort(hashes, perm);
        var keys = new T[n];
        var coeffs = new double[n];
        var c = o.Coefficients;
        for (int i = 0; i < n; i++)
        {
            keys[i] = k[perm[i]];
            coeffs[i] = c[perm[i]];
        }
        return (new PauliOperator<T>(o.N, keys, coeffs, n), new HashSortedVector<T>(keys, coeffs, hashes));
    }

    /// <summary>Wraps an operator that is already sorted by hash (copies the arrays at their count).</summary>
    public static HashSortedVector<T> FromSorted(PauliOperator<T> sorted)
    {
        var keys = sorted.Keys.ToArray();
        var hashes = new ulong[keys.Length];
        for (int i = 0; i < keys.Length; i++) hashes[i] = keys[i].Hash64;
        return new HashSortedVector<T>(keys, sorted.Coefficients.ToArray(), hashes);
    }

    /// <summary>Weighted inner product sum w(key) a_key b_key by a merge join on the hashes.</summary>
    public static double Inner<TBasis>(HashSortedVector<T> a, HashSortedVector<T> b, in TBasis basis)
        where TBasis : struct, IKrylovBasis<T>
    {
        double s = 0;
        int i = 0, j = 0;
        while (i < a.Count && j < b.Count)
        {
            ulong ha = a.Hashes[i], hb = b.Hashes[j];
            if (ha < hb) i++;
            else if (hb < ha) j++;
            else
            {
                int i1 = i, j1 = j;
                while (i1 < a.Count && a.Hashes[i1] == ha) i1++;
                while (j1 < b.Count && b.Hashes[j1] == ha) j1++;
                for (int p = i; p < i1; p++)
                {
                    for (int q = j; q < j1; q++)
                    {
                        if (a.Keys[p].Equals(b.Keys[q])) s += basis.Weight(a.Keys[p]) * a.Coefficients[p] * b.Coefficients[q];
                    }
                }
                i = i1;
                j = j1;
            }
        }
        return s;
    }

    /// <summary>
    /// target -= c * v for the strings of v present in target (in place, target's coefficients are
    /// shared with its operator); the strings of v absent from target are added to <paramref name="missing"/>.
    /// </summary>
    public static void SubtractInto(HashSortedVector<T> target, HashSortedVector<T> v, double c, PauliAccumulator<T> missing)
    {
        int i = 0, j = 0;
        while (j < v.Count)
        {
            ulong hv = v.Hashes[j];
            while (i < target.Count && target.Hashes[i] < hv) i++;
            bool found = false;
            for (int p = i; p < target.Count && target.Hashes[p] == hv; p++)
            {
                if (target.Keys[p].Equals(v.Keys[j]))
                {
                    target.Coefficients[p] -= c * v.Coefficients[j];
                    found = true;
                    break;
                }
            }
            if (!found) missing.Add(v.Keys[j], -c * v.Coefficients[j]);
            j++;
        }
    }
}
