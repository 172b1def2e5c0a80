using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>
/// One thread's output of a map pass: contributions sorted into the target's partitions
/// (radix partitioning), kept in emission order. Reused across blocks, so the steady state
/// allocates nothing.
/// </summary>
public sealed class EmitBuffer<T> where T : unmanaged, IPauliKey<T>
{
    internal readonly Entry[][] Entries;
    internal readonly int[] Counts;
    private readonly int _shift;

    /// <summary>Scratch for support sites, sized to the key capacity.</summary>
    public int[] Sites { get; } = new int[T.Capacity];

    /// <summary>General-purpose scratch for maps (e.g. branching in grouped rotations).</summary>
    public T[] ScratchKeys { get; } = new T[256];

    /// <summary>General-purpose scratch for maps.</summary>
    public double[] ScratchValues { get; } = new double[256];

    internal EmitBuffer(int partitionBits)
    {
        _shift = 64 - partitionBits;
        Entries = new Entry[1 << partitionBits][];
        Counts = new int[1 << partitionBits];
        for (int i = 0; i < Entries.Length; i++) Entries[i] = new Entry[64];
    }

    /// <summary>Emits one contribution to the target.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Emit(in T key, double value)
    {
        ulong h = key.Hash64;
        int p = (int)(h >> _shift);
        int c = Counts[p];
        var arr = Entries[p];
        if (c == arr.Length) arr = Grow(p);
        ref var e = ref arr[c];
        e.Key = key;
        e.Value = value;
        e.Hash = h;
        Counts[p] = c + 1;
    }

    private Entry[] Grow(int p)
    {
        Array.Resize(ref Entries[p], Entries[p].Length * 2);
        return Entries[p];
    }

    internal void Clear() => Array.Clear(Counts);

    internal struct Entry
    {
        public T Key;
        public double Value;
        public ulong Hash;
    }
}
