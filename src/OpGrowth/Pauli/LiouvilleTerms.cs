using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>Where the contributions of one string go: its support scratch and one emission per product.</summary>
/// <remarks>Implemented by small structs wrapping a buffer, so the generic loop is compiled per sink with the emission inlined.</remarks>
internal interface ITermSink<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Scratch for support sites, sized to the key capacity.</summary>
    int[] Sites { get; }

    /// <summary>Emits one contribution.</summary>
    void Emit(in T key, double value);
}

/// <summary>
/// The one loop behind every map O -> scale * i[H, O] for Hermitian H and O (real coefficients), whatever
/// buffer takes the products. For an anticommuting pair, i[P_t, S] = 2 i^{k+1} P_t S with P_t S = i^k P3,
/// k odd: k = 1 gives -2 P3, k = 3 gives +2 P3 (conventions: Heisenberg evolution). Each term overlapping S
/// is visited once, at the lowest site it shares with S, so the contributions come in one fixed order.
/// </summary>
internal static class LiouvilleTerms
{
    /// <summary>Emits scale * i[H, coefficient * key] term by term into <paramref name="sink"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Apply<T, TSink>(CompiledHamiltonian<T> h, double scale, in T key, double coefficient, TSink sink)
        where T : unmanaged, IPauliKey<T>
        where TSink : struct, ITermSink<T>
    {
        var sites = sink.Sites;
        int m = T.SupportSites(key, sites);
        var hk = h.Keys;
        var hc = h.Coefficients;
        var start = h.SiteStart;
        var rows = h.SiteTerms;
        double c2 = 2.0 * coefficient * scale;
        for (int a = 0; a < m; a++)
        {
            int j = sites[a];
            for (int r = start[j], end = start[j + 1]; r < end; r++)
            {
                int t = rows[r];
                ref readonly T term = ref hk[t];
                if (!T.Anticommute(term, key)) continue;
                if (a > 0 && T.OverlapBelow(term, key, j)) continue;
                T p = T.Multiply(term, key, out int k);
                sink.Emit(p, k == 1 ? -c2 * hc[t] : c2 * hc[t]);
            }
        }
    }
}
