using System.Runtime.InteropServices;

namespace OpGrowth.Krylov;

/// <summary>
/// Asks Linux to back a large block with 2 MiB pages (madvise MADV_HUGEPAGE; the machine's transparent
/// huge pages are in "madvise" mode). The step table is probed at random over hundreds of megabytes: with
/// 4 KiB pages nearly every probe also misses the TLB, and every first touch of a page is a fault. A hint
/// only: where it is refused or not available nothing changes but speed.
/// </summary>
internal static partial class LargePages
{
    private const int MadvHugePage = 14;
    private const long PageSize = 4096;
    private const long HugePage = 2L << 20;
    private static bool _unavailable = !OperatingSystem.IsLinux();

    [LibraryImport("libc", EntryPoint = "madvise")]
    private static partial int Madvise(nint address, nuint length, int advice);

    /// <summary>Hints huge pages for the whole pages inside [address, address + bytes), if the block spans at least two huge pages.</summary>
    public static unsafe void Advise(void* address, long bytes)
    {
        if (_unavailable || bytes < 2 * HugePage) return;
        long start = ((long)address + PageSize - 1) & ~(PageSize - 1);
        long end = ((long)address + bytes) & ~(PageSize - 1);
        if (end <= start) return;
        try
        {
            Madvise((nint)start, (nuint)(end - start), MadvHugePage);
        }
        catch (Exception e) when (e is DllNotFoundException or EntryPointNotFoundException)
        {
            _unavailable = true;
        }
    }
}
