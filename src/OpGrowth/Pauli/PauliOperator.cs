using System.Numerics.Tensors;

namespace OpGrowth.Pauli;

/// <summary>
/// A Hermitian operator O = sum_S c_S S with real coefficients, stored compactly as two parallel
/// arrays (structure of arrays): <see cref="Keys"/> and <see cref="Coefficients"/>, each string
/// exactly once. Steady-state memory is sizeof(T) + 8 bytes per string (24 bytes for N &lt;= 64).
/// Order is deterministic (set by the accumulator that built it) but carries no meaning.
/// </summary>
public sealed class PauliOperator<T> where T : unmanaged, IPauliKey<T>
{
    private T[] _keys;
    private double[] _coeffs;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Number of stored strings.</summary>
    public int Count { get; private set; }

    /// <summary>Stored strings.</summary>
    public ReadOnlySpan<T> Keys => _keys.AsSpan(0, Count);

    /// <summary>Coefficients, aligned with <see cref="Keys"/>.</summary>
    public ReadOnlySpan<double> Coefficients => _coeffs.AsSpan(0, Count);

    /// <summary>Mutable coefficients (for in-place scaling or damping).</summary>
    public Span<double> CoefficientsMutable => _coeffs.AsSpan(0, Count);

    internal T[] KeyArray => _keys;

    internal double[] CoefficientArray => _coeffs;

    /// <summary>Takes ownership of the arrays; keys must be distinct.</summary>
    public PauliOperator(int n, T[] keys, double[] coefficients, int count)
    {
        if (n > T.Capacity) throw new ArgumentException($"{n} qubits exceed the key capacity {T.Capacity}.", nameof(n));
        ArgumentOutOfRangeException.ThrowIfGreaterThan(count, keys.Length);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(count, coefficients.Length);
        N = n;
        _keys = keys;
        _coeffs = coefficients;
        Count = count;
    }

    /// <summary>An empty operator.</summary>
    public static PauliOperator<T> Empty(int n) => new(n, [], [], 0);

    /// <summary>A single string with a coefficient.</summary>
    public static PauliOperator<T> Single(PauliString s, double coefficient = 1.0)
        => new(s.N, [T.From(s)], [coefficient], 1);

    /// <summary>Builds from general terms; duplicates are summed.</summary>
    public static PauliOperator<T> FromTerms(int n, IEnumerable<PauliTerm> terms)
    {
        var acc = new PauliAccumulator<T>(n, 16);
        foreach (var t in terms) acc.Add(T.From(t.String), t.Coefficient);
        return acc.ToOperator();
    }

    /// <summary>||O||^2 = (O|O) = sum c^2.</summary>
    public double NormSquared() => TensorPrimitives.SumOfSquares(Coefficients);

    /// <summary>||O||.</summary>
    public double Norm() => Math.Sqrt(NormSquared());

    /// <summary>O *= a, in place.</summary>
    public void Scale(double a) => TensorPrimitives.Multiply(CoefficientsMutable, a, CoefficientsMutable);

    /// <summary>A deep copy.</summary>
    public PauliOperator<T> Clone() => new(N, Keys.ToArray(), Coefficients.ToArray(), Count);

    /// <summary>Inner product (A|B) = Tr(A B)/2^N = sum_S a_S b_S (real for Hermitian A, B).</summary>
    public static double Inner(PauliOperator<T> a, PauliOperator<T> b)
    {
        if (a.Count > b.Count) (a, b) = (b, a);
        if (a.Count == 0) return 0;
        var index = new Dictionary<T, double>(a.Count);
        for (int i = 0; i < a.Count; i++) index[a._keys[i]] = a._coeffs[i];
        double s = 0;
        for (int i = 0; i < b.Count; i++)
        {
            if (index.TryGetValue(b._keys[i], out double c)) s += c * b._coeffs[i];
        }
        return s;
    }

    /// <summary>Coefficient of a string (0 if absent). Linear scan: for tests and small operators.</summary>
    public double CoefficientOf(in T key)
    {
        for (int i = 0; i < Count; i++) if (_keys[i].Equals(key)) return _coeffs[i];
        return 0;
    }

    /// <summary>Converts to general terms (for output and tests).</summary>
    public IEnumerable<PauliTerm> ToTerms()
    {
        for (int i = 0; i < Count; i++) yield return new PauliTerm(_keys[i].ToPauliString(N), _coeffs[i]);
    }

    /// <summary>Bytes held by the arrays (capacity, not count).</summary>
    public long AllocatedBytes => (long)_keys.Length * System.Runtime.CompilerServices.Unsafe.SizeOf<T>() + (long)_coeffs.Length * sizeof(double);

    /// <summary>Removes entries in place where keep[i] is false; returns the discarded weight.</summary>
    public double Filter(Func<T, double, bool> keep)
    {
        int w = 0;
        double dropped = 0;
        for (int i = 0; i < Count; i++)
        {
            if (keep(_keys[i], _coeffs[i]))
            {
                _keys[w] = _keys[i];
                _coeffs[w] = _coeffs[i];
                w++;
            }
            else dropped += _coeffs[i] * _coeffs[i];
        }
        Count = w;
        return dropped;
    }

    /// <summary>Releases unused capacity.</summary>
    public void TrimExcess()
    {
        if (_keys.Length == Count) return;
        _keys = Keys.ToArray();
        _coeffs = Coefficients.ToArray();
    }
}
