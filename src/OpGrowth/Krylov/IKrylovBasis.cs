using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// A representation of operators for the recursion: the Liouvillian map O -> i[H, O] expressed on
/// stored keys (<see cref="IPauliMap{T}.Apply"/>) and the inner-product weight of the basis element a
/// key stands for. In the plain representation a key is one string (weight 1); in a symmetry-reduced
/// one it stands for the sum over a class of strings, and (A|B) = sum_key w(key) a_key b_key.
/// </summary>
internal interface IKrylovBasis<T> : IPauliMap<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>False when every weight is 1 (fast norms).</summary>
    bool IsWeighted { get; }

    /// <summary>Inner-product weight of the basis element stored under <paramref name="key"/>.</summary>
    double Weight(in T key);
}

/// <summary>Plain representation: one key = one Pauli string; the core commutator.</summary>
internal readonly struct PlainBasis<T> : IKrylovBasis<T> where T : unmanaged, IPauliKey<T>
{
    private readonly CommutatorMap<T> _map;

    public PlainBasis(CompiledHamiltonian<T> h) => _map = new CommutatorMap<T>(h);

    /// <summary>The commutator map (the step driver runs it through <see cref="CommutatorKernel{T}"/>).</summary>
    internal CommutatorMap<T> Map => _map;

    public bool IsWeighted => false;

    public double Weight(in T key) => 1.0;

    public void Apply(in T key, double coefficient, EmitBuffer<T> sink) => _map.Apply(key, coefficient, sink);
}
