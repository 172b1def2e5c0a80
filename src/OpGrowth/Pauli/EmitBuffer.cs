using System.Runtime.CompilerServices;

namespace OpGrowth.Pauli;

/// <summary>
/// One thread's output of a map pass: contributions appended in emission order to one stream per
/// merging thread (the owner of the target partition the string hashes to). Appends are sequential,
/// so producing costs a few nanoseconds per contribution; the merge then inserts each stream into the
/// owner's partitions with prefetching. Reused across blocks and passes: steady state allocates nothing.
/// </summary>
public sealed class EmitBuffer<T> where T : unmanaged, IPauliKey<T>
{
    internal Entry[][] Streams;
    internal int[] Counts;
    private int _shift;
    private int _owners;

    /// <summary>Scratch for support sites, sized to the key capacity.</summary>
    public int[] Sites { get; } = new int[T.Capacity];

    /// <summary>General-purpose scratch for maps (e.g. branching in grouped rotations).</summary>
    public T[] ScratchKeys { get; } = new T[256];

    /// <summary>General-purpose scratch for maps.</summary>
    public double[] ScratchValues { get; } = new double[256];

    internal EmitBuffer()
    {
        Streams = [];
        Counts = [];
    }

    /// <summary>Prepares for a pass into a target with the given partition shift and owner count.</summary>
    internal void Reset(int shift, int owners)
    {
        _shift = shift;
        _owners = owners;
        if (Streams.Length != owners)
        {
            Streams = new Entry[owners][];
            for (int i = 0; i < owners; i++) Streams[i] = new Entry[1024];
            Counts = new int[owners];
        }
        Array.Clear(Counts);
    }

    /// <summary>Emits one contribution to the target.</summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public void Emit(in T key, double value)
    {
        ulong h = key.Hash64;
        int u = _owners == 1 ? 0 : (int)(h >> _shift) % _owners;
        int c = Counts[u];
        var arr = Streams[u];
        if (c == arr.Length) arr = Grow(u);
        ref var e = ref arr[c];
        e.Key = key;
        e.Value = value;
        e.Hash = h;
        Counts[u] = c + 1;
    }

    private Entry[] Grow(int u)
    {
        Array.Resize(ref Streams[u], Streams[u].Length * 2);
        return Streams[u];
    }

    internal struct Entry
    {
        public T Key;
        public double Value;
        public ulong Hash;
    }
}
