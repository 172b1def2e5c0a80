using System.Buffers.Binary;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Word-level construction and site permutations of fixed-width keys (shift, bit reversal), which the
/// translation and reflection representations need and the core key interface does not offer.
/// </summary>
/// <remarks>
/// Every key type stores its x words followed by its z words (Pauli64: X, Z; Pauli128: X0, X1, Z0, Z1;
/// PauliWide: x buffer, z buffer). <see cref="FromWords"/> reinterprets such a buffer as the key; the
/// layout is checked once per key type against <c>IPauliKey.From</c> and, if it ever differed, the
/// slow general route through <see cref="PauliString"/> is used instead.
/// </remarks>
internal static class KeyWords<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Words per symplectic half.</summary>
    public static readonly int Words = PauliString.WordCount(T.Capacity);

    private static readonly bool LayoutOk = CheckLayout();

    private static bool CheckLayout()
    {
        if (Unsafe.SizeOf<T>() != 16 * Words) return false;
        int n = T.Capacity;
        var b = new PauliString.Builder(n);
        // An irregular pattern that touches every word of both halves.
        for (int j = 0; j < n; j += 3) b.Set(j, "XYZ"[(j / 3) % 3]);
        b.Set(n - 1, 'Y');
        var s = b.Build();
        var expected = T.From(s);
        Span<ulong> buf = stackalloc ulong[2 * Words];
        expected.CopyWords(buf[..Words], buf[Words..]);
        return MemoryMarshal.Read<T>(MemoryMarshal.AsBytes(buf)).Equals(expected);
    }

    /// <summary>Builds a key from x and z words (each <see cref="Words"/> long; bits above the capacity zero).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static T FromWords(Span<ulong> xz)
    {
        if (LayoutOk) return MemoryMarshal.Read<T>(MemoryMarshal.AsBytes(xz));
        return T.From(new PauliString(T.Capacity, xz[..Words], xz[Words..]));
    }

    /// <summary>Moves every site j of the key to j - s (s &gt;= 0; sites below s must be identity).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static T ShiftDown(in T key, int s)
    {
        if (s == 0) return key;
        if (typeof(T) == typeof(Pauli64))
        {
            var p = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in key));
            var r = new Pauli64(p.X >> s, p.Z >> s);
            return Unsafe.As<Pauli64, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey32))
        {
            var p = Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in key));
            var r = new ChainKey32(p.X >> s, p.Z >> s);
            return Unsafe.As<ChainKey32, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey48))
        {
            var p = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in key));
            var r = new ChainKey48(p.X >> s, p.Z >> s, true);
            return Unsafe.As<ChainKey48, T>(ref r);
        }
        Span<ulong> xz = stackalloc ulong[2 * Words];
        key.CopyWords(xz[..Words], xz[Words..]);
        ShiftDownWords(xz[..Words], s);
        ShiftDownWords(xz[Words..], s);
        return FromWords(xz);
    }

    /// <summary>Moves every site j of the key to j + s (s &gt;= 0; the result must fit in the capacity).</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static T ShiftUp(in T key, int s)
    {
        if (s == 0) return key;
        if (typeof(T) == typeof(Pauli64))
        {
            var p = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in key));
            var r = new Pauli64(p.X << s, p.Z << s);
            return Unsafe.As<Pauli64, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey32))
        {
            var p = Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in key));
            var r = new ChainKey32(p.X << s, p.Z << s);
            return Unsafe.As<ChainKey32, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey48))
        {
            var p = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in key));
            const ulong mask = (1UL << 48) - 1;
            var r = new ChainKey48((p.X << s) & mask, (p.Z << s) & mask, true);
            return Unsafe.As<ChainKey48, T>(ref r);
        }
        Span<ulong> xz = stackalloc ulong[2 * Words];
        key.CopyWords(xz[..Words], xz[Words..]);
        ShiftUpWords(xz[..Words], s);
        ShiftUpWords(xz[Words..], s);
        return FromWords(xz);
    }

    /// <summary>Mirror image j -> m - j (every support site must satisfy 0 &lt;= m - j &lt; capacity).</summary>
    public static T Reflect(in T key, int m)
    {
        // Reverse all Capacity bits (j -> Capacity-1-j), then shift so that j -> m - j.
        int cap = T.Capacity;
        if (typeof(T) == typeof(Pauli64))
        {
            var p = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in key));
            int d64 = 63 - m; // m <= 63 for a site of a 64-site key
            var r = new Pauli64(ReverseBits(p.X) >> d64, ReverseBits(p.Z) >> d64);
            return Unsafe.As<Pauli64, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey32))
        {
            var p = Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in key));
            int d32 = 63 - m; // reversing 64 bits puts site j at 63 - j; m <= 31
            var r = new ChainKey32((uint)(ReverseBits(p.X) >> d32), (uint)(ReverseBits(p.Z) >> d32));
            return Unsafe.As<ChainKey32, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey48))
        {
            var p = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in key));
            int d48 = 63 - m; // m <= 47
            var r = new ChainKey48(ReverseBits(p.X) >> d48, ReverseBits(p.Z) >> d48, true);
            return Unsafe.As<ChainKey48, T>(ref r);
        }
        Span<ulong> xz = stackalloc ulong[2 * Words];
        key.CopyWords(xz[..Words], xz[Words..]);
        ReverseWords(xz[..Words]);
        ReverseWords(xz[Words..]);
        int d = cap - 1 - m; // reversed site = cap-1-j = (m - j) + d
        if (d > 0)
        {
            ShiftDownWords(xz[..Words], d);
            ShiftDownWords(xz[Words..], d);
        }
        else if (d < 0)
        {
            ShiftUpWords(xz[..Words], -d);
            ShiftUpWords(xz[Words..], -d);
        }
        return FromWords(xz);
    }

    /// <summary>Rotation on a ring of L sites: j -> (j - s) mod L (0 &lt;= s &lt; L &lt;= capacity).</summary>
    public static T RotateDown(in T key, int s, int ringSize)
    {
        if (s == 0) return key;
        if (typeof(T) == typeof(Pauli64))
        {
            var p = Unsafe.As<T, Pauli64>(ref Unsafe.AsRef(in key));
            ulong mask = ringSize == 64 ? ulong.MaxValue : (1UL << ringSize) - 1;
            var r = new Pauli64(((p.X >> s) | (p.X << (ringSize - s))) & mask, ((p.Z >> s) | (p.Z << (ringSize - s))) & mask);
            return Unsafe.As<Pauli64, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey32))
        {
            var p = Unsafe.As<T, ChainKey32>(ref Unsafe.AsRef(in key));
            ulong mask = ringSize == 64 ? ulong.MaxValue : (1UL << ringSize) - 1;
            ulong x = p.X, z = p.Z;
            var r = new ChainKey32((uint)(((x >> s) | (x << (ringSize - s))) & mask), (uint)(((z >> s) | (z << (ringSize - s))) & mask));
            return Unsafe.As<ChainKey32, T>(ref r);
        }
        if (typeof(T) == typeof(ChainKey48))
        {
            var p = Unsafe.As<T, ChainKey48>(ref Unsafe.AsRef(in key));
            ulong mask = (1UL << ringSize) - 1; // ringSize <= 48
            ulong x = p.X, z = p.Z;
            var r = new ChainKey48(((x >> s) | (x << (ringSize - s))) & mask, ((z >> s) | (z << (ringSize - s))) & mask, true);
            return Unsafe.As<ChainKey48, T>(ref r);
        }
        Span<ulong> xz = stackalloc ulong[2 * Words];
        Span<ulong> lo = stackalloc ulong[Words];
        key.CopyWords(xz[..Words], xz[Words..]);
        for (int h = 0; h < 2; h++)
        {
            var w = xz.Slice(h * Words, Words);
            w.CopyTo(lo);
            ShiftDownWords(w, s);            // sites s.. -> 0..
            ShiftUpWords(lo, ringSize - s);  // sites 0..s-1 -> L-s..L-1
            for (int i = 0; i < Words; i++) w[i] |= lo[i];
            MaskBelow(w, ringSize);
        }
        return FromWords(xz);
    }

    private static void MaskBelow(Span<ulong> w, int sites)
    {
        for (int i = 0; i < w.Length; i++)
        {
            int lo = i * 64;
            if (sites >= lo + 64) continue;
            w[i] = sites <= lo ? 0 : w[i] & ((1UL << (sites - lo)) - 1);
        }
    }

    private static void ShiftDownWords(Span<ulong> w, int s)
    {
        int ws = s >> 6, bs = s & 63;
        for (int i = 0; i < w.Length; i++)
        {
            int a = i + ws;
            ulong v = a < w.Length ? w[a] >> bs : 0;
            if (bs != 0 && a + 1 < w.Length) v |= w[a + 1] << (64 - bs);
            w[i] = v;
        }
    }

    private static void ShiftUpWords(Span<ulong> w, int s)
    {
        int ws = s >> 6, bs = s & 63;
        for (int i = w.Length - 1; i >= 0; i--)
        {
            int a = i - ws;
            ulong v = a >= 0 ? w[a] << bs : 0;
            if (bs != 0 && a - 1 >= 0) v |= w[a - 1] >> (64 - bs);
            w[i] = v;
        }
    }

    private static void ReverseWords(Span<ulong> w)
    {
        w.Reverse();
        for (int i = 0; i < w.Length; i++) w[i] = ReverseBits(w[i]);
    }

    private static ulong ReverseBits(ulong v)
    {
        v = ((v >> 1) & 0x5555555555555555UL) | ((v & 0x5555555555555555UL) << 1);
        v = ((v >> 2) & 0x3333333333333333UL) | ((v & 0x3333333333333333UL) << 2);
        v = ((v >> 4) & 0x0F0F0F0F0F0F0F0FUL) | ((v & 0x0F0F0F0F0F0F0F0FUL) << 4);
        return BinaryPrimitives.ReverseEndianness(v);
    }
}
