using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Extensive operators on the infinite line, one key per translation class: the representative is the
/// class member whose first support site is 0. A stored coefficient c for representative S stands for
/// c sum_x T^x S; since distinct translates of a non-identity string are distinct strings, norms per unit
/// length are plain sums of squares (weight 1). The Liouvillian: S is moved to start at site r, every
/// placement of every cell term overlapping it is taken from a window Hamiltonian (an open chain as wide
/// as the key), and each product is moved back to start at 0.
/// </summary>
/// <remarks>Source: translation-class storage as in Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019), methods.</remarks>
internal readonly struct LineClassBasis<T> : IKrylovBasis<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CompiledHamiltonian<T> _window;
    private readonly int _r;

    public LineClassBasis(TranslationCell cell)
    {
        _window = cell.OpenChain(T.Capacity).Compile<T>();
        _r = cell.Range;
    }

    public bool IsWeighted => false;

    public double Weight(in T key) => 1.0;

    public void Apply(in T key, double coefficient, EmitBuffer<T> sink)
        => LiouvilleTerms.Apply(_window, 1.0, KeyWords<T>.ShiftUp(key, _r), coefficient, new ShiftSink(sink));

    /// <summary>Moves each product back to start at site 0 (the class representative).</summary>
    private readonly struct ShiftSink(EmitBuffer<T> buffer) : ITermSink<T>
    {
        public int[] Sites
        {
            [MethodImpl(MethodImplOptions.AggressiveInlining)]
            get => buffer.Sites;
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Emit(in T key, double value) => buffer.Emit(KeyWords<T>.ShiftDown(key, key.FirstSite), value);
    }
}

/// <summary>
/// Extensive operators on a ring of L sites, one key per rotation class: the representative is the
/// smallest rotation (by its words). A coefficient c for representative S stands for c times the sum of
/// the distinct rotations of S (p_S of them, p_S the period), so (A|B) = sum p_S a_S b_S. The Liouvillian
/// maps that sum to sum_P v_P (p_S / p_P) [sum of distinct rotations of P], where i[H, S] = sum_P v_P P.
/// </summary>
internal readonly struct RingClassBasis<T> : IKrylovBasis<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CompiledHamiltonian<T> _ring;
    private readonly int _l;

    public RingClassBasis(TranslationCell cell, int ringSites)
    {
        _ring = cell.Ring(ringSites).Compile<T>();
        _l = ringSites;
    }

    public bool IsWeighted => true;

    public double Weight(in T key)
    {
        Canonical(key, _l, out int period);
        return period;
    }

    public void Apply(in T key, double coefficient, EmitBuffer<T> sink)
    {
        Canonical(key, _l, out int ps);
        LiouvilleTerms.Apply(_ring, 1.0, key, coefficient, new ClassSink(sink, _l, ps));
    }

    /// <summary>Adds each product to its rotation class's representative with the factor p_S / p_P.</summary>
    private readonly struct ClassSink(EmitBuffer<T> buffer, int l, int ps) : ITermSink<T>
    {
        public int[] Sites
        {
            [MethodImpl(MethodImplOptions.AggressiveInlining)]
            get => buffer.Sites;
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Emit(in T key, double value)
        {
            T cp = Canonical(key, l, out int pp);
            buffer.Emit(cp, value * ps / pp);
        }
    }

    /// <summary>Smallest rotation of the key and the size of its rotation class (its period).</summary>
    public static T Canonical(in T key, int l, out int period)
    {
        T best = key;
        period = l;
        for (int s = 1; s < l; s++)
        {
            T r = KeyWords<T>.RotateDown(key, s, l);
            if (r.Equals(key))
            {
                period = s;
                break;
            }
            if (Less(r, best)) best = r;
        }
        return best;
    }

    private static bool Less(in T a, in T b)
    {
        int w = KeyWords<T>.Words;
        Span<ulong> wa = stackalloc ulong[2 * w];
        Span<ulong> wb = stackalloc ulong[2 * w];
        a.CopyWords(wa[..w], wa[w..]);
        b.CopyWords(wb[..w], wb[w..]);
        for (int i = 2 * w - 1; i >= 0; i--)
        {
            if (wa[i] != wb[i]) return wa[i] < wb[i];
        }
        return false;
    }
}
