namespace OpGrowth.Pauli;

/// <summary>
/// A Hermitian operator H = sum_t h_t P_t with real coefficients, on N qubits: the general,
/// width-independent form built by models. Duplicate strings are merged on construction and
/// zero coefficients removed. Compile it with <see cref="Compile{T}"/> for the engines.
/// </summary>
public sealed class Hamiltonian
{
    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Terms in first-seen order, duplicates merged.</summary>
    public IReadOnlyList<PauliTerm> Terms { get; }

    public Hamiltonian(int n, IEnumerable<PauliTerm> terms)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        N = n;
        var order = new List<PauliString>();
        var sum = new Dictionary<PauliString, double>();
        foreach (var t in terms)
        {
            if (t.String.N != n) throw new ArgumentException($"Term {t} acts on {t.String.N} qubits, expected {n}.", nameof(terms));
            if (!double.IsFinite(t.Coefficient)) throw new ArgumentException($"Term {t} has a non-finite coefficient.", nameof(terms));
            if (sum.TryGetValue(t.String, out double c)) sum[t.String] = c + t.Coefficient;
            else
            {
                sum[t.String] = t.Coefficient;
                order.Add(t.String);
            }
        }
        Terms = order.Where(s => sum[s] != 0).Select(s => new PauliTerm(s, sum[s])).ToArray();
    }

    /// <summary>||H||^2 = Tr(H^2)/2^N = sum of squared coefficients (identity included).</summary>
    public double FrobeniusNormSquared => Terms.Sum(t => t.Coefficient * t.Coefficient);

    /// <summary>Largest term weight (locality).</summary>
    public int Locality => Terms.Count == 0 ? 0 : Terms.Max(t => t.String.Weight);

    /// <summary>Compiles to a site-indexed form over key type <typeparamref name="T"/>; the identity term is dropped (it commutes with everything).</summary>
    public CompiledHamiltonian<T> Compile<T>() where T : unmanaged, IPauliKey<T>
        => new(N, Terms.Where(t => !t.String.IsIdentity).Select(t => (T.From(t.String), t.Coefficient)).ToArray());
}
