namespace OpGrowth.Pauli;

/// <summary>
/// A fixed-width, allocation-free Pauli string used as a key by the hot engines. Each width is
/// its own struct so the JIT specialises every generic kernel per width (no branch on N per
/// operation). Same symplectic layout and phase convention as <see cref="PauliString"/>.
/// </summary>
/// <typeparam name="TSelf">The implementing struct.</typeparam>
public interface IPauliKey<TSelf> : IEquatable<TSelf>
    where TSelf : unmanaged, IPauliKey<TSelf>
{
    /// <summary>Largest number of qubits this width holds.</summary>
    static abstract int Capacity { get; }

    /// <summary>Converts from the general form; throws when N exceeds <see cref="Capacity"/>.</summary>
    static abstract TSelf From(PauliString s);

    /// <summary>Converts back to the general form on <paramref name="n"/> qubits.</summary>
    PauliString ToPauliString(int n);

    /// <summary>Product a*b = i^phase * result, phase in 0..3.</summary>
    static abstract TSelf Multiply(in TSelf a, in TSelf b, out int phase);

    /// <summary>True when a and b anticommute.</summary>
    static abstract bool Anticommute(in TSelf a, in TSelf b);

    /// <summary>True when the supports of a and b share a site below <paramref name="site"/>.</summary>
    static abstract bool OverlapBelow(in TSelf a, in TSelf b, int site);

    /// <summary>True when the supports of a and b intersect.</summary>
    static abstract bool Overlaps(in TSelf a, in TSelf b);

    /// <summary>Writes the support sites in increasing order; returns how many.</summary>
    static abstract int SupportSites(in TSelf a, Span<int> sites);

    /// <summary>
    /// The letters of sites first .. first + width - 1 (all inside the capacity, width at most
    /// <see cref="SiteWindows{T}.MaxWidth"/>) as one number: x bits in bits 0 .. width - 1, z bits in
    /// bits width .. 2 width - 1 (see <see cref="SiteWindows{T}"/>).
    /// </summary>
    static abstract int Window(in TSelf a, int first, int width);

    /// <summary>Number of non-identity sites.</summary>
    int Weight { get; }

    /// <summary>First non-identity site or -1.</summary>
    int FirstSite { get; }

    /// <summary>Last non-identity site or -1.</summary>
    int LastSite { get; }

    /// <summary>True when site j is not the identity.</summary>
    bool HasSite(int j);

    /// <summary>2-bit letter code at site j: bit 0 = x, bit 1 = z (I=0, X=1, Z=2, Y=3).</summary>
    int LetterCode(int j);

    /// <summary>Copies the symplectic words (site j = bit j % 64 of word j / 64); spans must hold PauliString.WordCount(Capacity) words or at least the used ones.</summary>
    void CopyWords(Span<ulong> x, Span<ulong> z);

    /// <summary>A well-mixed 64-bit hash (both halves usable independently).</summary>
    ulong Hash64 { get; }
}

/// <summary>Shared bit tricks for the keys.</summary>
internal static class PauliBits
{
    /// <summary>Finalizer of a 64-bit mixer (Stafford variant 13 of the MurmurHash3 finalizer).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static ulong Mix(ulong h)
    {
        h ^= h >> 30;
        h *= 0xbf58476d1ce4e5b9UL;
        h ^= h >> 27;
        h *= 0x94d049bb133111ebUL;
        h ^= h >> 31;
        return h;
    }

    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static ulong LowMask(int site) => site >= 64 ? ulong.MaxValue : (1UL << site) - 1;

    /// <summary>The hash of the string with x bits <paramref name="x"/> and z bits <paramref name="z"/> (one word each): every single-word key gives this number.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static ulong Hash(ulong x, ulong z) => Mix(x * 0x9E3779B97F4A7C15UL ^ System.Numerics.BitOperations.RotateLeft(z, 32) ^ z * 0xC2B2AE3D27D4EB4FUL);

    /// <summary>
    /// k in P_a P_b = i^k P_p for one-word strings a, b and their product p (x and z bits): |x&amp;z| of a, of b,
    /// minus that of the product, plus 2 |z_a &amp; x_b|, modulo 4.
    /// </summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static int ProductPhase(ulong ax, ulong az, ulong bx, ulong bz, ulong px, ulong pz)
        => (System.Numerics.BitOperations.PopCount(ax & az) + System.Numerics.BitOperations.PopCount(bx & bz)
            - System.Numerics.BitOperations.PopCount(px & pz) + 2 * System.Numerics.BitOperations.PopCount(az & bx)) & 3;

    /// <summary>The window number of one-word x and z bits (see <see cref="IPauliKey{TSelf}.Window"/>).</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static int Window(ulong x, ulong z, int first, int width)
    {
        ulong m = (1UL << width) - 1;
        return (int)(((x >> first) & m) | (((z >> first) & m) << width));
    }

    /// <summary>Bits first .. first + 63 of the 128-bit number (hi, lo), first in 0..127.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static ulong From128(ulong lo, ulong hi, int first)
        => first == 0 ? lo : first < 64 ? (lo >> first) | (hi << (64 - first)) : hi >> (first - 64);

    /// <summary>Writes the set bits of <paramref name="support"/> in increasing order; returns how many.</summary>
    [System.Runtime.CompilerServices.MethodImpl(System.Runtime.CompilerServices.MethodImplOptions.AggressiveInlining)]
    public static int Sites(ulong support, System.Span<int> sites)
    {
        int k = 0;
        while (support != 0)
        {
            sites[k++] = System.Numerics.BitOperations.TrailingZeroCount(support);
            support &= support - 1;
        }
        return k;
    }
}
