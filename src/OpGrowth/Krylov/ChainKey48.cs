using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Pauli string key for chains of 33 to 48 sites in 12 bytes: 96 bits holding the x bits of sites 0..47
/// (bits 0..47) and the z bits (bits 48..95), stored as a 64-bit and a 32-bit word with 4-byte alignment, so
/// a stored (key, coefficient) pair takes 20 bytes instead of the 24 of <see cref="Pauli64"/>. The recursion
/// for Z in the mixed-field Ising chain needs 33 to 48 sites from depth 32 to depth 47.
/// </summary>
/// <remarks>
/// <see cref="Hash64"/> is the number <see cref="Pauli64"/> gives for the same string and every operation
/// follows the same convention, so tables and vectors built with this key hold the same strings in the same
/// order and sum them in the same order: the b_n are bit for bit those of the 16-byte key.
/// </remarks>
[StructLayout(LayoutKind.Sequential, Pack = 4)]
internal readonly struct ChainKey48 : IPauliKey<ChainKey48>
{
    private const ulong Mask48 = (1UL << 48) - 1;

    /// <summary>Bits 0..63 of the packed string (x of sites 0..47, z of sites 0..15).</summary>
    public readonly ulong Lo;

    /// <summary>Bits 64..95 (z of sites 16..47).</summary>
    public readonly uint Hi;

    private ChainKey48(ulong lo, uint hi)
    {
        Lo = lo;
        Hi = hi;
    }

    public ChainKey48(ulong x, ulong z, bool _) : this(x | (z << 48), (uint)(z >> 16))
    {
    }

    /// <summary>x bits of sites 0..47.</summary>
    public ulong X
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => Lo & Mask48;
    }

    /// <summary>z bits of sites 0..47.</summary>
    public ulong Z
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => (Lo >> 48) | ((ulong)Hi << 16);
    }

    private ulong Support => X | Z;

    public static int Capacity => 48;

    public static ChainKey48 From(PauliString s)
    {
        if (s.N > 48) throw new ArgumentException($"ChainKey48 holds at most 48 sites, got {s.N}.", nameof(s));
        return new ChainKey48(s.X[0], s.Z[0], true);
    }

    public PauliString ToPauliString(int n) => new(n, [X], [Z]);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static ChainKey48 Multiply(in ChainKey48 a, in ChainKey48 b, out int phase)
    {
        var p = new ChainKey48(a.Lo ^ b.Lo, a.Hi ^ b.Hi);
        ulong ax = a.X, az = a.Z, bx = b.X, bz = b.Z;
        // Same phase rule as Pauli64.
        phase = PauliBits.ProductPhase(ax, az, bx, bz, p.X, p.Z);
        return p;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Anticommute(in ChainKey48 a, in ChainKey48 b)
        => (BitOperations.PopCount((a.X & b.Z) ^ (a.Z & b.X)) & 1) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool OverlapBelow(in ChainKey48 a, in ChainKey48 b, int site)
        => (a.Support & b.Support & PauliBits.LowMask(site)) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in ChainKey48 a, in ChainKey48 b) => (a.Support & b.Support) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Window(in ChainKey48 a, int first, int width) => PauliBits.Window(a.X, a.Z, first, width);

    public static int SupportSites(in ChainKey48 a, Span<int> sites) => PauliBits.Sites(a.Support, sites);

    public int Weight => BitOperations.PopCount(Support);

    public int FirstSite => Support == 0 ? -1 : BitOperations.TrailingZeroCount(Support);

    public int LastSite => Support == 0 ? -1 : 63 - BitOperations.LeadingZeroCount(Support);

    public bool HasSite(int j) => ((Support >> j) & 1) != 0;

    public int LetterCode(int j) => (int)((X >> j) & 1) | (int)(((Z >> j) & 1) << 1);

    public void CopyWords(Span<ulong> x, Span<ulong> z)
    {
        x[0] = X;
        z[0] = Z;
    }

    public ulong Hash64
    {
        // Pauli64's hash of the same string.
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => PauliBits.Hash(X, Z);
    }

    public bool Equals(ChainKey48 other) => Lo == other.Lo && Hi == other.Hi;

    public override bool Equals(object? obj) => obj is ChainKey48 p && Equals(p);

    public override int GetHashCode() => (int)Hash64;

    public static bool operator ==(ChainKey48 a, ChainKey48 b) => a.Equals(b);

    public static bool operator !=(ChainKey48 a, ChainKey48 b) => !a.Equals(b);
}
