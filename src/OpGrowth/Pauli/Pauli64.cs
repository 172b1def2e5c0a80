using System.Numerics;
using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>Pauli string key for N &lt;= 64: one x word and one z word (16 bytes).</summary>
/// <remarks>Site j is bit j. Phase convention as in <see cref="PauliString"/>.</remarks>
public readonly struct Pauli64 : IPauliKey<Pauli64>
{
    public readonly ulong X;
    public readonly ulong Z;

    public Pauli64(ulong x, ulong z)
    {
        X = x;
        Z = z;
    }

    public static int Capacity => 64;

    public static Pauli64 From(PauliString s)
    {
        if (s.N > 64) throw new ArgumentException($"Pauli64 holds at most 64 qubits, got {s.N}.", nameof(s));
        return new Pauli64(s.X[0], s.Z[0]);
    }

    public PauliString ToPauliString(int n) => new(n, [X], [Z]);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Pauli64 Multiply(in Pauli64 a, in Pauli64 b, out int phase)
    {
        ulong x3 = a.X ^ b.X, z3 = a.Z ^ b.Z;
        phase = PauliBits.ProductPhase(a.X, a.Z, b.X, b.Z, x3, z3);
        return new Pauli64(x3, z3);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Anticommute(in Pauli64 a, in Pauli64 b)
        => (BitOperations.PopCount((a.X & b.Z) ^ (a.Z & b.X)) & 1) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool OverlapBelow(in Pauli64 a, in Pauli64 b, int site)
        => ((a.X | a.Z) & (b.X | b.Z) & PauliBits.LowMask(site)) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in Pauli64 a, in Pauli64 b) => ((a.X | a.Z) & (b.X | b.Z)) != 0;

    public static int SupportSites(in Pauli64 a, Span<int> sites) => PauliBits.Sites(a.X | a.Z, sites);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Window(in Pauli64 a, int first, int width) => PauliBits.Window(a.X, a.Z, first, width);

    public int Weight => BitOperations.PopCount(X | Z);

    public int FirstSite => (X | Z) == 0 ? -1 : BitOperations.TrailingZeroCount(X | Z);

    public int LastSite => (X | Z) == 0 ? -1 : 63 - BitOperations.LeadingZeroCount(X | Z);

    public bool HasSite(int j) => (((X | Z) >> j) & 1) != 0;

    public int LetterCode(int j) => (int)((X >> j) & 1) | (int)(((Z >> j) & 1) << 1);

    public void CopyWords(Span<ulong> x, Span<ulong> z)
    {
        x[0] = X;
        z[0] = Z;
    }

    public ulong Hash64
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => PauliBits.Hash(X, Z);
    }

    public bool Equals(Pauli64 other) => X == other.X && Z == other.Z;

    public override bool Equals(object? obj) => obj is Pauli64 p && Equals(p);

    public override int GetHashCode() => (int)Hash64;

    public static bool operator ==(Pauli64 a, Pauli64 b) => a.Equals(b);

    public static bool operator !=(Pauli64 a, Pauli64 b) => !a.Equals(b);
}
