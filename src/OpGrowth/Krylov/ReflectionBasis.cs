using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Reflection-reduced representation on an open chain of L sites whose Hamiltonian is symmetric under
/// R: j -> L-1-j, for an operator that is itself symmetric (a palindromic probe at the centre: every
/// Krylov vector then is). One key per pair {S, R(S)}: the representative is the smaller of the two (by
/// words); its coefficient c stands for c (S + R(S)), or c S when S = R(S), so (A|B) = sum w a b with
/// w = 2 or 1. With i[H, S] = sum_P v_P P, the image of the class of S adds v_P f to the class of P with
/// f = (P symmetric ? 2 : 1) (S symmetric ? 1/2 : 1): a symmetric S meets each asymmetric pair twice
/// (as P and R(P)), an asymmetric class meets a symmetric P as P + R(P) = 2P. About halves memory and work.
/// </summary>
internal readonly struct ReflectionBasis<T> : IKrylovBasis<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CompiledHamiltonian<T> _h;
    private readonly int _mirror;

    public ReflectionBasis(CompiledHamiltonian<T> h)
    {
        _h = h;
        _mirror = h.N - 1;
    }

    public bool IsWeighted => true;

    public double Weight(in T key) => KeyWords<T>.Reflect(key, _mirror).Equals(key) ? 1 : 2;

    /// <summary>The representative of a key's pair and whether the key is symmetric.</summary>
    public T Canonical(in T key, out bool symmetric)
    {
        T r = KeyWords<T>.Reflect(key, _mirror);
        symmetric = r.Equals(key);
        return Less(r, key) ? r : key;
    }

    /// <summary>The Hamiltonian (the step driver runs this basis's map through <see cref="CommutatorKernel{T}"/> with <see cref="PairClass"/>).</summary>
    internal CompiledHamiltonian<T> Hamiltonian => _h;

    public void Apply(in T key, double coefficient, EmitBuffer<T> sink)
    {
        var pairs = new PairClass(this);
        LiouvilleTerms.Apply(_h, pairs.Scale(key), key, coefficient, new ClassSink(pairs, sink));
    }

    /// <summary>
    /// The basis's rule around the commutator: 1/2 in front of i[H, S] for a symmetric input, and each product added to
    /// its pair's representative, doubled when the product is symmetric. Used by <see cref="Apply"/> and by the
    /// commutator kernel.
    /// </summary>
    internal readonly struct PairClass(ReflectionBasis<T> basis) : CommutatorKernel<T>.IProductClass
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public double Scale(in T key) => KeyWords<T>.Reflect(key, basis._mirror).Equals(key) ? 0.5 : 1.0;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public T Class(in T product, ref double value)
        {
            T cp = basis.Canonical(product, out bool pSym);
            if (pSym) value = 2 * value;
            return cp;
        }
    }

    /// <summary>Adds each product to its pair's representative (<see cref="PairClass.Class"/>).</summary>
    private readonly struct ClassSink(PairClass pairs, EmitBuffer<T> buffer) : ITermSink<T>
    {
        public int[] Sites
        {
            [MethodImpl(MethodImplOptions.AggressiveInlining)]
            get => buffer.Sites;
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Emit(in T key, double value)
        {
            T cp = pairs.Class(key, ref value);
            buffer.Emit(cp, value);
        }
    }

    private static bool Less(in T a, in T b)
    {
        if (typeof(T) == typeof(Pauli64))
        {
            var pa = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in a));
            var pb = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in b));
            return pa.Z != pb.Z ? pa.Z < pb.Z : pa.X < pb.X;
        }
        if (typeof(T) == typeof(ChainKey32))
        {
            // z in the high half: comparing the words compares z first, then x, as for the wider keys.
            return Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in a)).Bits
                 < Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in b)).Bits;
        }
        if (typeof(T) == typeof(ChainKey48))
        {
            var ka = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in a));
            var kb = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in b));
            return ka.Z != kb.Z ? ka.Z < kb.Z : ka.X < kb.X;
        }
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
