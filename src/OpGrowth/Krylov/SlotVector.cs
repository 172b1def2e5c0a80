using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>One stored string: key and coefficient side by side (16 bytes with <see cref="ChainKey32"/>, 20 with <see cref="ChainKey48"/>, 24 with <see cref="Pauli64"/>).</summary>
/// <remarks>4-byte packing: with the 12-byte <see cref="ChainKey48"/> a pair takes 20 bytes (the coefficient unaligned, which costs nothing measurable on x64).</remarks>
[StructLayout(LayoutKind.Sequential, Pack = 4)]
internal struct KeyValue<T> where T : unmanaged
{
    public T Key;
    public double Value;
}

/// <summary>
/// A Krylov vector of the exact recursion in one block of unmanaged memory: <see cref="Count"/> (key,
/// coefficient) pairs, each string once, in the order the step table left them. It is the step table's own
/// block, compacted in place and shrunk (see <see cref="StepTable{T}.Compact"/>), so a vector is never held
/// twice, and freeing it returns its pages to the system at once (no garbage awaiting collection).
/// </summary>
internal sealed unsafe class SlotVector<T> : IDisposable where T : unmanaged, IPauliKey<T>
{
    private KeyValue<T>* _items;
    private long _spareBytes;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Number of stored strings.</summary>
    public int Count { get; private set; }

    /// <summary>A vector of <paramref name="count"/> pairs at <paramref name="items"/>, in a block with <paramref name="spareBytes"/> more bytes after them (see <see cref="TrimExcess"/>).</summary>
    internal SlotVector(int n, KeyValue<T>* items, int count, long spareBytes = 0, PagePool? pool = null)
    {
        N = n;
        _items = items;
        Count = count;
        _spareBytes = spareBytes;
        _pool = pool ?? PagePool.None;
    }

    /// <summary>Where the block goes when shrunk or freed (<see cref="PagePool.None"/>: the ordinary allocator).</summary>
    private readonly PagePool _pool;

    /// <summary>
    /// The block's bytes after the stored pairs, 8-byte aligned: the rest of the step table it was compacted
    /// from, pages already touched, usable as scratch until <see cref="TrimExcess"/> gives them back.
    /// </summary>
    internal Span<double> SpareDoubles
    {
        get
        {
            if (_items == null || _spareBytes <= 0) return default;
            long used = (long)Count * sizeof(KeyValue<T>);
            long start = (used + 7) & ~7L;
            long doubles = (used + _spareBytes - start) / sizeof(double);
            return doubles <= 0 ? default : new Span<double>((byte*)_items + start, (int)Math.Min(doubles, Array.MaxLength));
        }
    }

    /// <summary>Shrinks the block to the stored pairs (the tail's pages go back to the system).</summary>
    public void TrimExcess()
    {
        if (_spareBytes <= 0 || _items == null) return;
        long bytes = Math.Max(1, Count) * (long)sizeof(KeyValue<T>);
        _items = (KeyValue<T>*)_pool.Shrink(_items, bytes);
        _spareBytes = 0;
    }

    /// <summary>A copy of an operator (any order it has).</summary>
    public static SlotVector<T> From(PauliOperator<T> o)
    {
        var p = (KeyValue<T>*)NativeMemory.Alloc((nuint)Math.Max(1, o.Count), (nuint)sizeof(KeyValue<T>));
        var k = o.Keys;
        var c = o.Coefficients;
        for (int i = 0; i < o.Count; i++)
        {
            p[i].Key = k[i];
            p[i].Value = c[i];
        }
        return new SlotVector<T>(o.N, p, o.Count);
    }

    /// <summary>The stored pairs.</summary>
    public Span<KeyValue<T>> Items
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        get => new(_items, Count);
    }

    internal KeyValue<T>* Pointer => _items;

    /// <summary>Bytes held by the stored pairs (the spare tail, while there is one, is counted in the step that made it).</summary>
    public long Bytes => (long)Count * sizeof(KeyValue<T>);

    /// <summary>Bytes per stored string.</summary>
    public static int BytesPerString => sizeof(KeyValue<T>);

    /// <summary>A managed copy (for callers that want the operator itself).</summary>
    public PauliOperator<T> ToOperator()
    {
        var keys = new T[Count];
        var vals = new double[Count];
        var s = Items;
        for (int i = 0; i < s.Length; i++)
        {
            keys[i] = s[i].Key;
            vals[i] = s[i].Value;
        }
        return new PauliOperator<T>(N, keys, vals, Count);
    }

    public void Dispose()
    {
        Free();
        GC.SuppressFinalize(this);
    }

    ~SlotVector() => Free();

    private void Free()
    {
        if (_items != null) _pool.Release(_items);
        _items = null;
        Count = 0;
        _spareBytes = 0;
    }
}
