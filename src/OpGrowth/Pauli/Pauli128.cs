using System.Numerics;
using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>Pauli string key for N &lt;= 128: two x words and two z words (32 bytes).</summary>
/// <remarks>Site j is bit j % 64 of word j / 64. Phase convention as in <see cref="PauliString"/>.</remarks>
public readonly struct Pauli128 : IPauliKey<Pauli128>
{
    public readonly ulong X0;
    public readonly ulong X1;
    public readonly ulong Z0;
    public readonly ulong Z1;

    public Pauli128(ulong x0, ulong x1, ulong z0, ulong z1)
    {
        X0 = x0;
        X1 = x1;
        Z0 = z0;
        Z1 = z1;
    }

    public static int Capacity => 128;

    public static Pauli128 From(PauliString s)
    {
        if (s.N > 128) throw new ArgumentException($"Pauli128 holds at most 128 qubits, got {s.N}.", nameof(s));
        return s.Words == 1 ? new Pauli128(s.X[0], 0, s.Z[0], 0) : new Pauli128(s.X[0], s.X[1], s.Z[0], s.Z[1]);
    }

    public PauliString ToPauliString(int n) => n <= 64 ? new(n, [X0], [Z0]) : new(n, [X0, X1], [Z0, Z1]);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static Pauli128 Multiply(in Pauli128 a, in Pauli128 b, out int phase)
    {
        ulong x0 = a.X0 ^ b.X0, z0 = a.Z0 ^ b.Z0, x1 = a.X1 ^ b.X1, z1 = a.Z1 ^ b.Z1;
        int k = BitOperations.PopCount(a.X0 & a.Z0) + BitOperations.PopCount(a.X1 & a.Z1)
              + BitOperations.PopCount(b.X0 & b.Z0) + BitOperations.PopCount(b.X1 & b.Z1)
              - BitOperations.PopCount(x0 & z0) - BitOperations.PopCount(x1 & z1)
              + 2 * (BitOperations.PopCount(a.Z0 & b.X0) + BitOperations.PopCount(a.Z1 & b.X1));
        phase = k & 3;
        return new Pauli128(x0, x1, z0, z1);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Anticommute(in Pauli128 a, in Pauli128 b)
        => ((BitOperations.PopCount((a.X0 & b.Z0) ^ (a.Z0 & b.X0)) + BitOperations.PopCount((a.X1 & b.Z1) ^ (a.Z1 & b.X1))) & 1) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool OverlapBelow(in Pauli128 a, in Pauli128 b, int site)
    {
        ulong o0 = (a.X0 | a.Z0) & (b.X0 | b.Z0) & PauliBits.LowMask(site);
        ulong o1 = site > 64 ? (a.X1 | a.Z1) & (b.X1 | b.Z1) & PauliBits.LowMask(site - 64) : 0;
        return (o0 | o1) != 0;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Overlaps(in Pauli128 a, in Pauli128 b)
        => (((a.X0 | a.Z0) & (b.X0 | b.Z0)) | ((a.X1 | a.Z1) & (b.X1 | b.Z1))) != 0;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int Window(in Pauli128 a, int first, int width)
        => PauliBits.Window(PauliBits.From128(a.X0, a.X1, first), PauliBits.From128(a.Z0, a.Z1, first), 0, width);

    public static int SupportSites(in Pauli128 a, Span<int> sites)
    {
        int k = 0;
        ulong s = a.X0 | a.Z0;
        while (s != 0)
        {
            sites[k++] = BitOperations.TrailingZeroCount(s);
            s &= s - 1;
        }
        s = a.X1 | a.Z1;
        while (s != 0)
        {
            sites[k++] = 64 + BitOperations.TrailingZeroCount(s);
            s &= s - 1;
        }
        return k;
    }

    public int Weight => BitOperations.PopCount(X0 | Z0) + BitOperations.PopCount(X1 | Z1);

    public int FirstSite => (X0 | Z0) != 0 ? BitOperations.TrailingZeroCount(X0 | Z0)
        : (X1 | Z1) != 0 ? 64 + BitOperations.TrailingZeroCount(X1 | Z1) : -1;

    public int LastSite => (X1 | Z1) != 0 ? 127 - BitOperations.LeadingZeroCount(X1 | Z1)
        : (X0 | Z0) != 0 ? 63 - BitOperations.LeadingZeroCount(X0 | Z0) : -1;

    public bool HasSite(int j) => j < 64 ? (((X0 | Z0) >> j) & 1) != 0 : (((X1 | Z1) >> (j - 64)) & 1) != 0;

    public int LetterCode(int j) => j < 64
        ? (int)((X0 >> j) & 1) | (int)(((Z0 >> j) & 1) << 1)
        : (int)((X1 >> (j - 64)) & 1) | (int)(((Z1 >> (j - 64)) & 1) << 1);

    public void CopyWords(Span<ulong> x, Span<ulong> z)
    {
        x[0] = X0;
        z[0] = Z0;
        if (x.Length > 1)
        {
            x[1] = X1;
            z[1] = Z1;
        }
    }

    public ulong Hash64
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => PauliBits.Mix(PauliBits.Mix(X0 * 0x9E3779B97F4A7C15UL ^ Z0) ^ (X1 * 0xC2B2AE3D27D4EB4FUL + BitOperations.RotateLeft(Z1, 29)));
    }

    public bool Equals(Pauli128 other) => X0 == other.X0 && X1 == other.X1 && Z0 == other.Z0 && Z1 == other.Z1;

    public override bool Equals(object? obj) => obj is Pauli128 p && Equals(p);

    public override int GetHashCode() => (int)Hash64;

    public static bool operator ==(Pauli128 a, Pauli128 b) => a.Equals(b);

    public static bool operator !=(Pauli128 a, Pauli128 b) => !a.Equals(b);
}
