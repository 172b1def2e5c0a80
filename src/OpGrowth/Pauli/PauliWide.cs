using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace OpGrowth.Pauli;

/// <summary>A fixed number of 64-bit words stored inline (no heap), one type per width.</summary>
public interface IWordBuffer
{
    /// <summary>Number of words.</summary>
    static abstract int Length { get; }
}

/// <summary>4 words: up to 256 qubits.</summary>
[InlineArray(4)]
public struct Words4 : IWordBuffer
{
    private ulong _e;

    public static int Length => 4;
}

/// <summary>8 words: up to 512 qubits.</summary>
[InlineArray(8)]
public struct Words8 : IWordBuffer
{
    private ulong _e;

    public static int Length => 8;
}

/// <summary>16 words: up to 1024 qubits.</summary>
[InlineArray(16)]
public struct Words16 : IWordBuffer
{
    private ulong _e;

    public static int Length => 16;
}

/// <summary>
/// Pauli string key for wide systems (up to 64 * TWords.Length qubits), stored inline. The word
/// count is a JIT-time constant per instantiation, so loops unroll and nothing is allocated.
/// </summary>
/// <remarks>Site j is bit j % 64 of word j / 64. Phase convention as in <see cref="PauliString"/>.</remarks>
public struct PauliWide<TWords> : IPauliKey<PauliWide<TWords>>
    where TWords : unmanaged, IWordBuffer
{
    private TWords _x;
    private TWords _z;

    public static int Capacity => 64 * TWords.Length;

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static ReadOnlySpan<ulong> View(in TWords w)
        => MemoryMarshal.CreateReadOnlySpan(ref Unsafe.As<TWords, ulong>(ref Unsafe.AsRef(in w)), TWords.Length);

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static Span<ulong> Edit(ref TWords w)
        => MemoryMarshal.CreateSpan(ref Unsafe.As<TWords, ulong>(ref w), TWords.Length);

    /// <summary>X words.</summary>
    [System.Diagnostics.CodeAnalysis.UnscopedRef]
    public readonly ReadOnlySpan<ulong> XWords => View(in _x);

    /// <summary>Z words.</summary>
    [System.Diagnostics.CodeAnalysis.UnscopedRef]
    public readonly ReadOnlySpan<ulong> ZWords => View(in _z);

    public static PauliWide<TWords> From(PauliString s)
    {
        if (s.N > Capacity) throw new ArgumentException($"This key holds at most {Capacity} qubits, got {s.N}.", nameof(s));
        var p = default(PauliWide<TWords>);
        s.X.CopyTo(Edit(ref p._x));
        s.Z.CopyTo(Edit(ref p._z));
        return p;
    }

    public readonly PauliString ToPauliString(int n)
    {
        int w = PauliString.WordCount(n);
        return new PauliString(n, XWords[..w], ZWords[..w]);
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static PauliWide<TWords> Multiply(in PauliWide<TWords> a, in PauliWide<TWords> b, out int phase)
    {
        var r = default(PauliWide<TWords>);
        var ax = View(in a._x);
        var az = View(in a._z);
        var bx = View(in b._x);
        var bz = View(in b._z);
        var rx = Edit(ref r._x);
        var rz = Edit(ref r._z);
        int k = 0;
        for (int i = 0; i < TWords.Length; i++)
        {
            ulong x3 = ax[i] ^ bx[i], z3 = az[i] ^ bz[i];
            k += BitOperations.PopCount(ax[i] & az[i]) + BitOperations.PopCount(bx[i] & bz[i])
               - BitOperations.PopCount(x3 & z3) + 2 * BitOperations.PopCount(az[i] & bx[i]);
            rx[i] = x3;
            rz[i] = z3;
        }
        phase = k & 3;
        return r;
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool Anticommute(in PauliWide<TWords> a, in PauliWide<TWords> b)
    {
        var ax = View(in a._x);
        var az = View(in a._z);
        var bx = View(in b._x);
        var bz = View(in b._z);
        int c = 0;
        for (int i = 0; i < TWords.Length; i++) c += BitOperations.PopCount((ax[i] & bz[i]) ^ (az[i] & bx[i]));
        return (c & 1) != 0;
    }

    public static bool OverlapBelow(in PauliWide<TWords> a, in PauliWide<TWords> b, int site)
    {
        var ax = View(in a._x);
        var az = View(in a._z);
        var bx = View(in b._x);
        var bz = View(in b._z);
        int full = site >> 6;
        for (int i = 0; i < full && i < TWords.Length; i++)
        {
            if (((ax[i] | az[i]) & (bx[i] | bz[i])) != 0) return true;
        }
        int rem = site & 63;
        if (rem != 0 && full < TWords.Length)
        {
            if (((ax[full] | az[full]) & (bx[full] | bz[full]) & ((1UL << rem) - 1)) != 0) return true;
        }
        return false;
    }

    public static bool Overlaps(in PauliWide<TWords> a, in PauliWide<TWords> b)
    {
        var ax = View(in a._x);
        var az = View(in a._z);
        var bx = View(in b._x);
        var bz = View(in b._z);
        for (int i = 0; i < TWords.Length; i++)
        {
            if (((ax[i] | az[i]) & (bx[i] | bz[i])) != 0) return true;
        }
        return false;
    }

    public static int Window(in PauliWide<TWords> a, int first, int width)
    {
        var ax = View(in a._x);
        var az = View(in a._z);
        int w = first >> 6, b = first & 63;
        ulong hiX = w + 1 < TWords.Length ? ax[w + 1] : 0, hiZ = w + 1 < TWords.Length ? az[w + 1] : 0;
        return PauliBits.Window(PauliBits.From128(ax[w], hiX, b), PauliBits.From128(az[w], hiZ, b), 0, width);
    }

    public static int SupportSites(in PauliWide<TWords> a, Span<int> sites)
    {
        var ax = View(in a._x);
        var az = View(in a._z);
        int k = 0;
        for (int i = 0; i < TWords.Length; i++)
        {
            ulong s = ax[i] | az[i];
            while (s != 0)
            {
                sites[k++] = (i << 6) + BitOperations.TrailingZeroCount(s);
                s &= s - 1;
            }
        }
        return k;
    }

    public readonly int Weight
    {
        get
        {
            var x = XWords;
            var z = ZWords;
            int w = 0;
            for (int i = 0; i < TWords.Length; i++) w += BitOperations.PopCount(x[i] | z[i]);
            return w;
        }
    }

    public readonly int FirstSite
    {
        get
        {
            var x = XWords;
            var z = ZWords;
            for (int i = 0; i < TWords.Length; i++)
            {
                ulong s = x[i] | z[i];
                if (s != 0) return (i << 6) + BitOperations.TrailingZeroCount(s);
            }
            return -1;
        }
    }

    public readonly int LastSite
    {
        get
        {
            var x = XWords;
            var z = ZWords;
            for (int i = TWords.Length - 1; i >= 0; i--)
            {
                ulong s = x[i] | z[i];
                if (s != 0) return (i << 6) + 63 - BitOperations.LeadingZeroCount(s);
            }
            return -1;
        }
    }

    public readonly bool HasSite(int j) => (((XWords[j >> 6] | ZWords[j >> 6]) >> (j & 63)) & 1) != 0;

    public readonly int LetterCode(int j)
        => (int)((XWords[j >> 6] >> (j & 63)) & 1) | (int)(((ZWords[j >> 6] >> (j & 63)) & 1) << 1);

    public readonly void CopyWords(Span<ulong> x, Span<ulong> z)
    {
        int w = Math.Min(x.Length, TWords.Length);
        XWords[..w].CopyTo(x);
        ZWords[..w].CopyTo(z);
    }

    public readonly ulong Hash64
    {
        get
        {
            var x = XWords;
            var z = ZWords;
            ulong h = 0x243F6A8885A308D3UL;
            for (int i = 0; i < TWords.Length; i++)
            {
                h = PauliBits.Mix(h ^ (x[i] * 0x9E3779B97F4A7C15UL) ^ BitOperations.RotateLeft(z[i], 31));
            }
            return h;
        }
    }

    public readonly bool Equals(PauliWide<TWords> other)
        => XWords.SequenceEqual(other.XWords) && ZWords.SequenceEqual(other.ZWords);

    public override readonly bool Equals(object? obj) => obj is PauliWide<TWords> p && Equals(p);

    public override readonly int GetHashCode() => (int)Hash64;

    public static bool operator ==(PauliWide<TWords> a, PauliWide<TWords> b) => a.Equals(b);

    public static bool operator !=(PauliWide<TWords> a, PauliWide<TWords> b) => !a.Equals(b);
}
