using System.Numerics;
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

/// <summary>Receives the index of each term a string does not commute with (see <see cref="LiouvilleTerms.ForEachAnticommuting"/>).</summary>
internal interface ITermVisitor
{
    void Visit(int term);
}

/// <summary>
/// The one loop behind every map O -> scale * i[H, O] for Hermitian H and O (real coefficients), whatever
/// buffer takes the products. For an anticommuting pair, i[P_t, S] = 2 i^{k+1} P_t S with P_t S = i^k P3,
/// k odd: k = 1 gives -2 P3, k = 3 gives +2 P3 (conventions: Heisenberg evolution). Each term overlapping S
/// is visited once, at the lowest site it shares with S, so the contributions come in one fixed order.
/// </summary>
internal static class LiouvilleTerms
{
    /// <summary>
    /// Visits, in one fixed order, every term of a site-indexed set (<paramref name="keys"/>; the terms on
    /// site j are <paramref name="siteTerms"/>[<paramref name="siteStart"/>[j] .. siteStart[j + 1]]) that
    /// anticommutes with <paramref name="key"/>, each once, at the lowest site it shares with the key: the
    /// key's support sites in increasing order, at each the row's terms in row order. Sites with a table in
    /// <paramref name="windows"/> (built from the same rows) take their terms from it, the others are tested
    /// term by term; the order is the same. <paramref name="sites"/> is scratch for the key's support. Used
    /// by the Liouvillian maps and by the evolution's rotation groups.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void ForEachAnticommuting<T, TVisitor>(T[] keys, int[] siteStart, int[] siteTerms, SiteWindows<T> windows, in T key, int[] sites, ref TVisitor visitor)
        where T : unmanaged, IPauliKey<T>
        where TVisitor : struct, ITermVisitor
    {
        int m = T.SupportSites(key, sites);
        var at = windows.Sites;
        var masks = windows.Masks;
        for (int a = 0; a < m; a++)
        {
            int j = sites[a];
            var w = at[j];
            if (w.Offset >= 0)
            {
                ulong bits = masks[w.Offset + T.Window(key, w.First, w.Width)];
                int row = siteStart[j];
                while (bits != 0)
                {
                    visitor.Visit(siteTerms[row + BitOperations.TrailingZeroCount(bits)]);
                    bits &= bits - 1;
                }
                continue;
            }
            for (int r = siteStart[j], end = siteStart[j + 1]; r < end; r++)
            {
                int t = siteTerms[r];
                ref readonly T term = ref keys[t];
                if (!T.Anticommute(term, key)) continue;
                if (a > 0 && T.OverlapBelow(term, key, j)) continue;
                visitor.Visit(t);
            }
        }
    }

    /// <summary>Emits scale * i[H, coefficient * key] term by term into <paramref name="sink"/>.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static void Apply<T, TSink>(CompiledHamiltonian<T> h, double scale, in T key, double coefficient, TSink sink)
        where T : unmanaged, IPauliKey<T>
        where TSink : struct, ITermSink<T>
    {
        var emit = new Emitter<T, TSink>(h.Keys, h.Coefficients, key, 2.0 * coefficient * scale, sink);
        ForEachAnticommuting(h.Keys, h.SiteStart, h.SiteTerms, h.Windows, key, sink.Sites, ref emit);
    }

    /// <summary>Emits +-c2 h_t P3 for i[P_t, S] (see the class remarks).</summary>
    private readonly struct Emitter<T, TSink>(T[] keys, double[] coefficients, T key, double c2, TSink sink) : ITermVisitor
        where T : unmanaged, IPauliKey<T>
        where TSink : struct, ITermSink<T>
    {
        private readonly T _key = key;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Visit(int t)
        {
            T p = T.Multiply(keys[t], _key, out int k);
            sink.Emit(p, k == 1 ? -c2 * coefficients[t] : c2 * coefficients[t]);
        }
    }
}
