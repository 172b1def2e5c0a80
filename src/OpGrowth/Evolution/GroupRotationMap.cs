using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Conjugation by a product of commuting Pauli rotations R_g = exp(-i theta_g P_g / 2), applied to
/// every string in one pass. For one rotation (conventions: Heisenberg evolution)
/// R^dagger S R = S when [P, S] = 0, else cos(theta) S + sin(theta) (i P S), with i P S = i^{k+1} P3
/// for P S = i^k P3 (k odd: -1 for k = 1, +1 for k = 3).
/// For a string S only the generators that anticommute with S act (found through the group's site
/// index, each visited once at the lowest site it shares with S). Because the generators commute
/// with each other, a generator that anticommutes with S also anticommutes with every product
/// P_A S, so the image is the sum over subsets A of those generators, amplitude
/// prod_{A} sin * prod_{not A} cos; it is enumerated depth first.
/// Pruning: a branch whose amplitude falls below <c>prune</c> is dropped with everything below it
/// (every completion only multiplies by |cos|, |sin| &lt;= 1); the weight it carried leaves the
/// operator's norm, and the engine books that loss as discarded weight.
/// </summary>
internal readonly struct GroupRotationMap<T> : IPassMap<T> where T : unmanaged, IPauliKey<T>
{
    private readonly T[] _keys;
    private readonly double[] _cos;
    private readonly double[] _sin;
    private readonly int[] _start;
    private readonly int[] _terms;
    private readonly SiteWindows<T> _windows;
    private readonly double _prune;
    private readonly int[]? _overflow;

    /// <summary>Most contributions one string may emit in one pass; beyond it the pass is abandoned and the group split.</summary>
    public const int StringEmissionCap = 4096;

    [ThreadStatic]
    private static int[]? t_idx;

    public GroupRotationMap(RotationGroup<T> group, double[] cos, double[] sin, double prune, int[]? overflow = null)
    {
        _overflow = overflow;
        _keys = group.Keys;
        _cos = cos;
        _sin = sin;
        _start = group.SiteStart;
        _terms = group.SiteTerms;
        _windows = group.Windows;
        _prune = prune;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public void Apply(in T key, double coefficient, PassEmitter<T> sink)
    {
        // The generators that anticommute with the key, in the Liouvillian maps' order.
        var found = new Collector(t_idx ??= new int[64]);
        LiouvilleTerms.ForEachAnticommuting(_keys, _start, _terms, _windows, key, sink.Sites, ref found);
        int[] idx = found.Indices;
        int m = found.Count;
        if (m == 0)
        {
            sink.Emit(key, coefficient);
            return;
        }
        int budget = StringEmissionCap;
        Branch(0, m, idx, key, coefficient, sink, ref budget);
        if (budget < 0 && _overflow is not null) _overflow[0] = 1;
    }

    /// <summary>Collects the visited generator indices into the thread's scratch (grown when full).</summary>
    private struct Collector(int[] indices) : ITermVisitor
    {
        public int[] Indices = indices;
        public int Count;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Visit(int term)
        {
            if (Count == Indices.Length) Indices = Grow();
            Indices[Count++] = term;
        }
    }

    [MethodImpl(MethodImplOptions.NoInlining)]
    private static int[] Grow()
    {
        var a = new int[t_idx!.Length * 2];
        t_idx.CopyTo(a, 0);
        t_idx = a;
        return a;
    }

    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private void Branch(int i, int m, int[] idx, T key, double amp, PassEmitter<T> sink, ref int budget)
    {
        double prune = _prune;
        while (true)
        {
            if (i == m)
            {
                if (--budget >= 0) sink.Emit(key, amp);
                return;
            }
            if (budget < 0) return;
            int g = idx[i];
            double sa = amp * _sin[g];
            if (sa != 0 && Math.Abs(sa) >= prune)
            {
                T p = T.Multiply(_keys[g], key, out int k);
                Branch(i + 1, m, idx, p, k == 1 ? -sa : sa, sink, ref budget);
            }
            amp *= _cos[g];
            if (amp == 0 || Math.Abs(amp) < prune) return;
            i++;
        }
    }
}
