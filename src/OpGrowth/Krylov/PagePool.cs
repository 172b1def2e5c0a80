using System.Runtime.InteropServices;

namespace OpGrowth.Krylov;

/// <summary>
/// Large blocks for one exact Lanczos run whose freed pages are kept for the next step table instead of
/// going back to the system. On this kind of machine (a virtual machine whose host takes back freed memory)
/// every fresh page costs a fault and a clear that ran at under 1 GB/s, against tens of GB/s for clearing
/// memory the process already holds: measured, the table's first touches were 14 % of a one-thread run to
/// b_29. A step frees the vector before last and the compacted table's tail; both are moved (mremap, page
/// tables only, no copy) into the front of the next table and cleared there.
/// </summary>
/// <remarks>
/// The pool never raises the peak: what it holds between steps was part of the step's peak (table plus the
/// two older vectors), and allocating the next table first takes the pooled pages, then unmaps whatever
/// the table could not use. Linux only (mmap, mremap, munmap); elsewhere, or for blocks below
/// <see cref="MinBytes"/>, blocks come from <see cref="NativeMemory"/> and are freed at once, as before.
/// Blocks it did not map (small ones, or those of <see cref="None"/>) are reallocated and freed with
/// <see cref="NativeMemory"/>, so every owner of a block can hand it back here whatever its origin.
/// Not thread-safe for allocation; <see cref="Release"/> may come from a finalizer and takes a lock.
/// </remarks>
internal sealed unsafe partial class PagePool : IDisposable
{
    /// <summary>Blocks below this size come from the ordinary allocator.</summary>
    public const long MinBytes = 8L << 20;

    private const long Granule = 2L << 20;
    private const int ProtReadWrite = 0x1 | 0x2;
    private const int MapPrivateAnonymous = 0x02 | 0x20;
    private const int MapNoReserve = 0x4000;
    private const int MremapMayMove = 1;
    private const int MremapFixed = 2;
    private static readonly nint MapFailed = -1;

    private readonly object _lock = new();
    private readonly Dictionary<nint, long> _live = [];
    private readonly List<(nint Address, long Bytes)> _free = [];
    private bool _disposed;

    /// <summary>The pool that keeps nothing: every block from and back to <see cref="NativeMemory"/> (for tables used alone).</summary>
    public static readonly PagePool None = new(enabled: false);

    /// <summary>A pool; <paramref name="enabled"/> false (or not Linux) makes it the plain allocator.</summary>
    public PagePool(bool enabled = true) => Enabled = enabled && OperatingSystem.IsLinux();

    /// <summary>Whether blocks are mapped here (Linux, and the calls answered).</summary>
    public bool Enabled { get; private set; }

    /// <summary>Bytes of freed pages held for reuse now.</summary>
    public long PooledBytes
    {
        get
        {
            lock (_lock) return _free.Sum(f => f.Bytes);
        }
    }

    /// <summary>Bytes moved from the pool into new blocks so far (pages that were not faulted in again).</summary>
    public long ReusedBytes { get; private set; }

    [LibraryImport("libc", EntryPoint = "mmap", SetLastError = true)]
    private static partial nint Mmap(nint address, nuint length, int prot, int flags, int fd, nint offset);

    [LibraryImport("libc", EntryPoint = "munmap", SetLastError = true)]
    private static partial int Munmap(nint address, nuint length);

    [LibraryImport("libc", EntryPoint = "mremap", SetLastError = true)]
    private static partial nint Mremap(nint oldAddress, nuint oldLength, nuint newLength, int flags, nint newAddress);

    private static long RoundUp(long bytes) => (bytes + Granule - 1) & ~(Granule - 1);

    /// <summary>
    /// A zeroed block of at least <paramref name="bytes"/>: pooled pages first (moved to its front, then
    /// cleared), fresh zero pages after them; pooled pages it cannot use are unmapped.
    /// </summary>
    public void* AllocateZeroed(long bytes)
    {
        if (!Enabled || bytes < MinBytes || _disposed) return NativeMemory.AllocZeroed((nuint)Math.Max(1, bytes));
        long size = RoundUp(bytes);
        nint block;
        try
        {
            // Reserve size + one granule and cut it to a 2 MiB boundary, so moved huge pages stay huge.
            nint raw = Mmap(0, (nuint)(size + Granule), ProtReadWrite, MapPrivateAnonymous | MapNoReserve, -1, 0);
            if (raw == MapFailed) return NativeMemory.AllocZeroed((nuint)bytes);
            block = (nint)RoundUp(raw);
            if (block > raw) Munmap(raw, (nuint)(block - raw));
            long tail = raw + size + Granule - (block + size);
            if (tail > 0) Munmap(block + (nint)size, (nuint)tail);
            // The owner asks for huge pages (LargePages.Advise), as it does for blocks from NativeMemory.
        }
        catch (Exception e) when (e is DllNotFoundException or EntryPointNotFoundException)
        {
            Enabled = false;
            return NativeMemory.AllocZeroed((nuint)bytes);
        }
        lock (_lock)
        {
            long filled = 0;
            // Largest pooled regions first: fewer moves.
            _free.Sort((a, b) => b.Bytes.CompareTo(a.Bytes));
            foreach (var (address, length) in _free)
            {
                long take = Math.Min(length, size - filled);
                if (take <= 0)
                {
                    Munmap(address, (nuint)length);
                    continue;
                }
                nint moved = Mremap(address, (nuint)take, (nuint)take, MremapMayMove | MremapFixed, block + (nint)filled);
                if (moved == MapFailed)
                {
                    Munmap(address, (nuint)length);
                    continue;
                }
                if (take < length) Munmap(address + (nint)take, (nuint)(length - take));
                NativeMemory.Clear((void*)(block + (nint)filled), (nuint)take);
                filled += take;
                ReusedBytes += take;
            }
            _free.Clear();
            _live[block] = size;
        }
        return (void*)block;
    }

    /// <summary>Shrinks a block to <paramref name="bytes"/> (rounded up to 2 MiB); the tail's pages are kept for the next table. Returns the block (same address).</summary>
    public void* Shrink(void* block, long bytes)
    {
        // Not enabled: nothing was ever mapped here (Enabled only turns false before the first mapping).
        if (!Enabled) return NativeMemory.Realloc(block, (nuint)Math.Max(1, bytes));
        lock (_lock)
        {
            if (!_live.TryGetValue((nint)block, out long size))
                return NativeMemory.Realloc(block, (nuint)Math.Max(1, bytes));
            long keep = Math.Max(Granule, RoundUp(bytes));
            if (keep >= size) return block;
            nint tail = (nint)block + (nint)keep;
            if (_disposed) Munmap(tail, (nuint)(size - keep));
            else _free.Add((tail, size - keep));
            _live[(nint)block] = keep;
            return block;
        }
    }

    /// <summary>Frees a block: its pages are kept for the next table (or unmapped once the pool is disposed).</summary>
    public void Release(void* block)
    {
        if (block == null) return;
        if (!Enabled)
        {
            NativeMemory.Free(block);
            return;
        }
        lock (_lock)
        {
            if (!_live.Remove((nint)block, out long size))
            {
                NativeMemory.Free(block);
                return;
            }
            if (_disposed) Munmap((nint)block, (nuint)size);
            else _free.Add(((nint)block, size));
        }
    }

    /// <summary>Unmaps the pooled pages; blocks still alive are unmapped when released.</summary>
    public void Dispose()
    {
        lock (_lock)
        {
            foreach (var (address, length) in _free) Munmap(address, (nuint)length);
            _free.Clear();
            _disposed = true;
        }
    }
}
