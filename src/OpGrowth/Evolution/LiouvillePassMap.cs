using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// O -> scale * i[H, O] as a pass map (the RK4 and Taylor steps): the same loop (<see cref="LiouvilleTerms"/>),
/// hence the same contributions in the same order, as <see cref="CommutatorMap{T}"/>, emitted into the pass
/// runner's chunked buffers.
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
        => LiouvilleTerms.Apply(_h, _scale, key, coefficient, new Sink(sink));

    private readonly struct Sink(PassEmitter<T> emitter) : ITermSink<T>
    {
        public int[] Sites
        {
            [MethodImpl(MethodImplOptions.AggressiveInlining)]
            get => emitter.Sites;
        }

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public void Emit(in T key, double value) => emitter.Emit(key, value);
    }
}
