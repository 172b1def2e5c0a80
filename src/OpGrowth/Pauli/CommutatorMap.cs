using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>
/// The Liouvillian action O -> scale * i[H, O] for Hermitian H and O (real coefficients).
/// For an anticommuting pair, i[P_t, S] = 2 i^{k+1} P_t S with P_t S = i^k P3, k odd:
/// k = 1 gives -2 P3, k = 3 gives +2 P3 (conventions: Heisenberg evolution).
/// Each term overlapping S is visited once, at the lowest site it shares with S (the loop is
/// <see cref="LiouvilleTerms"/>, shared with the evolution's pass map).
/// </summary>
public readonly struct CommutatorMap<T> : IPauliMap<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CompiledHamiltonian<T> _h;
    private readonly double _scale;

    public CommutatorMap(CompiledHamiltonian<T> h, double scale = 1.0)
    {
        _h = h;
        _scale = scale;
    }

    /// <summary>The Hamiltonian H.</summary>
    internal CompiledHamiltonian<T> Hamiltonian => _h;

    /// <summary>The factor in front of i[H, O].</summary>
    internal double Scale => _scale;

    public void Apply(in T key, double coefficient, EmitBuffer<T> sink)
        => LiouvilleTerms.Apply(_h, _scale, key, coefficient, new Sink(sink));

    private readonly struct Sink(EmitBuffer<T> buffer) : ITermSink<T>
    {
        public int[] Sites
        {
            [MethodImpl(MethodImplOptions.AggressiveInlining)]
            get => buffer.Sites;
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Emit(in T key, double value) => buffer.Emit(key, value);
    }
}
