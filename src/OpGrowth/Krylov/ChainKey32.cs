using System.Numerics;
using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Pauli string key for chains of at most 32 sites in one 64-bit word: the x bits of sites 0..31 in the
/// low half, the z bits in the high half (8 bytes instead of the 16 of <see cref="Pauli64"/>). The
/// recursion on a light-cone chain of up to 32 sites (depth about 31 for Z in the mixed-field Ising chain)
/// stores every string in it.
/// </summary>
/// <remarks>
/// <see cref="Hash64"/> is the same number <see cref="Pauli64"/> gives for the same string, and every
/// operation follows the same convention, so the tables and vectors built with this key hold the same
/// strings in the same order and sum them in the same order: the b_n are bit for bit those of the
/// 16-byte key.
/// </remarks>
internal readonly struct ChainKey32 : IPauliKey<ChainKey32>
{
    /// <summary>x bits in bits 0..31, z bits in bits 32..63.</summary>
    public readonly ulong Bits;

    public ChainKey32(ulong bits) => Bits = bits;

    public ChainKey32(uint x, uint z) => Bits = x | ((ulong)z << 32);

    public uint X => (uint)Bits;

    public uint Z => (uint)(Bits >> 32);

    private uint Support => (uint)(Bits | (Bits >> 32));

    public static int Capacity => 32;

    public static ChainKey32 From(PauliString s)
    {
        if (s.N > 32) throw new ArgumentException($"ChainKey32 holds at most 32 sites, got {s.N}.", nameof(s));
        return new ChainKey32((uint)s.X[0], (uint)s.Z[0]);
    }

    public PauliString ToPauliString(int n) => new(n, [X], [Z]);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static ChainKey32 Multiply(in ChainKey32 a, in ChainKey32 b, out int phase)
    {
        ulong p = a.Bits ^ b.Bits;
        // Same phase rule as Pauli64: |x&z| of a, of b, minus that of the product, plus 2 |z_a & x_b|.
        phase = (BitOperations.PopCount((uint)(a.Bits & (a.Bits >> 32))) + BitOperations.PopCount((uint)(b.Bits & (b.Bits >> 32)))
                 - BitOperations.PopCount((uint)(p & (p >> 32))) + 2 * BitOperations.PopCount((uint)(a.Bits >> 32) & (uint)b.Bits)) & 3;
        return new ChainKey32(p);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Anticommute(in ChainKey32 a, in ChainKey32 b)
        // low half: x_a & z_b, high half: z_a & x_b; the parity of the whole is the symplectic product.
        => (BitOperations.PopCount(a.Bits & BitOperations.RotateLeft(b.Bits, 32)) & 1) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool OverlapBelow(in ChainKey32 a, in ChainKey32 b, int site)
        => (a.Support & b.Support & (uint)PauliBits.LowMask(site)) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in ChainKey32 a, in ChainKey32 b) => (a.Support & b.Support) != 0;

    public static int SupportSites(in ChainKey32 a, Span<int> sites) => PauliBits.Sites(a.Support, sites);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Window(in ChainKey32 a, int first, int width)
    {
        ulong m = (1UL << width) - 1;
        return (int)(((a.Bits >> first) & m) | (((a.Bits >> (32 + first)) & m) << width));
    }

    public int Weight => BitOperations.PopCount(Support);

    public int FirstSite => Support == 0 ? -1 : BitOperations.TrailingZeroCount(Support);

    public int LastSite => Support == 0 ? -1 : 31 - BitOperations.LeadingZeroCount(Support);

    public bool HasSite(int j) => ((Support >> j) & 1) != 0;

    public int LetterCode(int j) => (int)((Bits >> j) & 1) | (int)(((Bits >> (32 + j)) & 1) << 1);

    public void CopyWords(Span<ulong> x, Span<ulong> z)
    {
        x[0] = X;
        z[0] = Z;
    }

    public ulong Hash64
    {
        // Pauli64's hash of the same string: X * c1 ^ rotl(Z, 32) ^ Z * c2 with Z < 2^32, so rotl(Z, 32) = Z << 32.
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => PauliBits.Mix(((Bits & 0xFFFFFFFFUL) * 0x9E3779B97F4A7C15UL) ^ (Bits & 0xFFFFFFFF00000000UL) ^ ((Bits >> 32) * 0xC2B2AE3D27D4EB4FUL));
    }

    public bool Equals(ChainKey32 other) => Bits == other.Bits;

    public override bool Equals(object? obj) => obj is ChainKey32 p && Equals(p);

    public override int GetHashCode() => (int)Hash64;

    public static bool operator ==(ChainKey32 a, ChainKey32 b) => a.Equals(b);

    public static bool operator !=(ChainKey32 a, ChainKey32 b) => !a.Equals(b);
}
