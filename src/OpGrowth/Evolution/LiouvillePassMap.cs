using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// O -> scale * i[H, O] as a pass map (the RK4 and Taylor steps): the same contributions in the same order as
/// <see cref="CommutatorMap{T}"/>, emitted into the pass runner's chunked buffers. For an anticommuting pair,
/// i[P_t, S] = 2 i^{k+1} P_t S with P_t S = i^k P3, k odd: k = 1 gives -2 P3, k = 3 gives +2 P3. Each term
/// overlapping S is visited once, at the lowest site it shares with S.
/// </summary>
internal readonly struct LiouvillePassMap<T> : IPassMap<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CompiledHamiltonian<T> _h;
    private readonly double _scale;

    public LiouvillePassMap(CompiledHamiltonian<T> h, double scale)
    {
        _h = h;
        _scale = scale;
    }

    public void Apply(in T key, double coefficient, PassEmitter<T> sink)
    {
        var sites = sink.Sites;
        int m = T.SupportSites(key, sites);
        var hk = _h.Keys;
        var hc = _h.Coefficients;
        var start = _h.SiteStart;
        var rows = _h.SiteTerms;
        double c2 = 2.0 * coefficient * _scale;
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
