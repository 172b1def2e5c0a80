using System.Numerics;
using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// A Pauli string written as bit masks over the index of a state vector, so that it can act on
/// amplitudes with bit operations.
/// </summary>
/// <remarks>
/// Basis convention of the exact engine: the computational basis index b of N qubits is
/// b = sum_j s_j 2^(N-1-j), with s_j = 0 for the Z = +1 state of site j. Site 0 is the most significant
/// bit, so a Pauli string acts like the Kronecker product s_0 (x) s_1 (x) ... (x) s_(N-1) with site 0
/// leftmost (the order of <c>Dense.Of</c> in the tests). With P(x,z) = i^{|x&amp;z|} X^x Z^z (Z acts first),
/// P|k&gt; = i^{YCount} (-1)^{popcount(k &amp; Z)} |k ^ X&gt;.
/// </remarks>
public readonly record struct PauliMask(ulong X, ulong Z, int YCount)
{
    /// <summary>Largest number of qubits a state vector may have (2^30 amplitudes = 16 GiB).</summary>
    public const int MaxQubits = 30;

    /// <summary>Index bit of a site: site 0 is the most significant bit.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int BitOfSite(int n, int site) => n - 1 - site;

    /// <summary>Converts a Pauli string on at most <see cref="MaxQubits"/> qubits to index masks.</summary>
    public static PauliMask From(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        if (s.N > MaxQubits)
        {
            throw new ArgumentOutOfRangeException(nameof(s), s.N, $"State vectors hold at most {MaxQubits} qubits.");
        }
        ulong x = s.X[0], z = s.Z[0];
        return new PauliMask(SiteToIndex(x, s.N), SiteToIndex(z, s.N), BitOperations.PopCount(x & z));
    }

    /// <summary>Maps site-ordered bits (bit j = site j) to index bits (site j at bit N-1-j).</summary>
    public static ulong SiteToIndex(ulong siteBits, int n)
    {
        ulong r = 0;
        while (siteBits != 0)
        {
            int j = BitOperations.TrailingZeroCount(siteBits);
            r |= 1UL << (n - 1 - j);
            siteBits &= siteBits - 1;
        }
        return r;
    }

    /// <summary>The phase i^{YCount} as a complex number.</summary>
    public Complex Phase => PauliString.IPower(YCount);

    /// <summary>True when the matrix of the string is real in the computational basis (even number of Y).</summary>
    public bool IsReal => (YCount & 1) == 0;

    /// <summary>Amplitude factor of P|k&gt; = Factor(k) |k ^ X&gt;.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public Complex Factor(ulong k) => (BitOperations.PopCount(k & Z) & 1) == 0 ? Phase : -Phase;
}
