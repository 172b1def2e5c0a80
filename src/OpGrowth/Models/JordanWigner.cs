using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// Majorana operators on qubits by the Jordan-Wigner mapping, and the Majorana count of a Pauli string.
/// </summary>
/// <remarks>
/// Convention (0-based Majorana index m = 0..2N-1, site j = m / 2):
/// chi_{2j} = (prod_{k&lt;j} X_k) Z_j and chi_{2j+1} = (prod_{k&lt;j} X_k) Y_j.
/// They are Hermitian, square to 1 and anticommute pairwise: {chi_a, chi_b} = 2 delta_ab.
/// The local parity is i chi_{2j} chi_{2j+1} = X_j and the total fermion parity is prod_j X_j.
/// (This is the 1-based g_{2j-1}, g_{2j} of the transverse-field Ising literature shifted by one:
/// chi_m = g_{m+1}.)
/// Source: P. Jordan and E. Wigner, Z. Phys. 47, 631 (1928); Majorana form as in A. Kitaev,
/// Ann. Phys. 321, 2 (2006).
/// Every Pauli string is, up to a phase, exactly one Majorana monomial chi_{m1} chi_{m2} ... (m1 &lt; m2 &lt; ...),
/// so "operator size in Majoranas" is well defined for each string: see MajoranaWeight.
/// </remarks>
public static class JordanWigner
{
    /// <summary>
    /// The Majorana chi_m on n qubits as a Pauli string and a phase exponent: chi_m = i^Phase * String.
    /// With the convention above every single Majorana is itself a Hermitian Pauli string, so Phase is 0;
    /// it is returned so that callers treat single operators and products alike.
    /// </summary>
    public static (PauliString String, int Phase) Majorana(int n, int m)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfNegative(m);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(m, 2 * n);
        int j = m >> 1;
        var b = new PauliString.Builder(n);
        for (int k = 0; k < j; k++) b.Set(k, 'X');
        b.Set(j, (m & 1) == 0 ? 'Z' : 'Y');
        return (b.Build(), 0);
    }

    /// <summary>
    /// The ordered product chi_{m[0]} chi_{m[1]} ... = i^Phase * String (indices as given, any order,
    /// repeats allowed since chi^2 = 1).
    /// </summary>
    public static (PauliString String, int Phase) Product(int n, ReadOnlySpan<int> indices)
    {
        var acc = PauliString.Identity(n);
        int phase = 0;
        foreach (int m in indices)
        {
            var (s, p) = Majorana(n, m);
            acc = PauliString.Multiply(acc, s, out int k);
            phase = (phase + p + k) & 3;
        }
        return (acc, phase);
    }

    /// <summary>
    /// The Hermitian q-body monomial i^{q/2} chi_{m1} ... chi_{mq} (q even, distinct indices) as a
    /// sign times a Pauli string. The factor i^{q/2} is what makes the product Hermitian:
    /// (chi_1...chi_q)^dagger = (-1)^{q(q-1)/2} chi_1...chi_q and (-1)^{q(q-1)/2} = (-1)^{q/2} = i^q.
    /// Throws when the result would not be Hermitian (odd q), which cannot happen for even q.
    /// </summary>
    /// <returns>(String, Sign) with i^{q/2} chi_{m1}...chi_{mq} = Sign * String, Sign = +1 or -1.</returns>
    public static (PauliString String, int Sign) HermitianMonomial(int n, ReadOnlySpan<int> indices)
    {
        int q = indices.Length;
        if (q == 0 || (q & 1) != 0) throw new ArgumentException($"A Hermitian Majorana monomial with a real coefficient needs an even, positive number of Majoranas; got {q}.", nameof(indices));
        var (s, phase) = Product(n, indices);
        int total = (phase + q / 2) & 3;
        if ((total & 1) != 0) throw new InvalidOperationException($"Majorana product has phase i^{total}: not Hermitian (repeated indices?).");
        return (s, total == 0 ? 1 : -1);
    }

    /// <summary>
    /// Number of Majorana operators in the monomial that the Pauli string (x, z) on n qubits stands for.
    /// </summary>
    /// <remarks>
    /// Reading the string from the last site down, s_j = parity of z-bits above j counts the
    /// Majoranas on later sites (each of them carries an X on site j). Removing that string factor
    /// leaves the site's own content x' = x XOR s, z: Z or Y (z = 1) is one Majorana, X (x' = 1, z = 0)
    /// is the pair chi_{2j} chi_{2j+1}, I none. So weight = popcount(z) + 2 popcount(x' AND NOT z).
    /// Word-parallel: the suffix parity of z is a shift-XOR scan within each word plus a carry from
    /// the higher words; no per-site loop.
    /// </remarks>
    public static int MajoranaWeight(ReadOnlySpan<ulong> x, ReadOnlySpan<ulong> z, int n)
    {
        int words = (n + 63) >> 6;
        if (x.Length < words || z.Length < words) throw new ArgumentException($"Expected at least {words} words for {n} qubits.", nameof(x));
        int weight = 0;
        ulong carry = 0; // all ones when the z-bits of higher words have odd parity
        for (int w = words - 1; w >= 0; w--)
        {
            ulong zw = z[w];
            ulong p = zw; // inclusive suffix parity: bit i = XOR of bits i..63
            p ^= p >> 1;
            p ^= p >> 2;
            p ^= p >> 4;
            p ^= p >> 8;
            p ^= p >> 16;
            p ^= p >> 32;
            ulong s = (p >> 1) ^ carry; // exclusive: bits strictly above i, plus higher words
            if (w == words - 1 && (n & 63) != 0) s &= (1UL << (n & 63)) - 1;
            ulong xw = x[w] ^ s;
            weight += BitOperations.PopCount(zw) + 2 * BitOperations.PopCount(xw & ~zw);
            if ((BitOperations.PopCount(zw) & 1) != 0) carry = ~carry;
        }
        return weight;
    }

    /// <summary>
    /// Majorana weight of a fixed-width key on <paramref name="n"/> qubits (for the engines' size
    /// histograms): copies the words to the stack, no heap allocation.
    /// </summary>
    public static int MajoranaWeight<T>(in T key, int n) where T : unmanaged, IPauliKey<T>
    {
        int words = PauliString.WordCount(T.Capacity);
        Span<ulong> x = stackalloc ulong[words];
        Span<ulong> z = stackalloc ulong[words];
        key.CopyWords(x, z);
        return MajoranaWeight(x, z, n);
    }

    /// <summary>Majorana weight of a string (see the span overload).</summary>
    public static int MajoranaWeight(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        return MajoranaWeight(s.X, s.Z, s.N);
    }

    /// <summary>
    /// The sorted Majorana indices of the monomial a Pauli string stands for (inverse of <see cref="Product"/> up to phase).
    /// </summary>
    public static int[] MajoranaIndices(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        var list = new List<int>();
        int parity = 0; // z-parity of sites above j
        var own = new (bool X, bool Z)[s.N];
        for (int j = s.N - 1; j >= 0; j--)
        {
            char c = s[j];
            bool xb = c is 'X' or 'Y', zb = c is 'Z' or 'Y';
            own[j] = (xb ^ (parity == 1), zb);
            if (zb) parity ^= 1;
        }
        for (int j = 0; j < s.N; j++)
        {
            var (xo, zo) = own[j];
            if (zo) list.Add(xo ? 2 * j + 1 : 2 * j);
            else if (xo)
            {
                list.Add(2 * j);
                list.Add(2 * j + 1);
            }
        }
        return list.ToArray();
    }
}
