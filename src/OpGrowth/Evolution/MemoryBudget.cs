using System.Globalization;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Turns a memory budget into a string budget. Per kept string the engine holds: the operator (source of a
/// pass, 1.5 (K + 8) bytes for a K-byte key with the slack of arrays grown by doubling) and the destination
/// (room for an image twice as large: 2 (K + 8)), plus the accumulated image of one pass, E distinct strings
/// per kept string at up to 2 (K + 8) + 16 bytes each (arrays grown by doubling, an open-addressing index at
/// load &lt;= 1/2). E was measured on the mixed-field Ising chain with the default branch pruning (see
/// docs/evolution.md); the engine also checks the real array sizes between blocks and never lets a pass grow
/// past the budget: it applies the pass in parts, reruns it with stronger pruning (booked as discarded weight)
/// or stops with a resource-limit error. A fixed reserve covers the runtime, emit buffers and observables.
/// These are upper estimates: with an explicit --memory the process's managed heap is capped as well, so the
/// estimate must not undershoot.
/// </summary>
public static class MemoryBudget
{
    /// <summary>Distinct strings in one pass's image per kept string (measured, see docs/evolution.md).</summary>
    public const double PassExpansion = 3.0;

    /// <summary>Bytes set aside for the runtime itself (not available to the arrays).</summary>
    public const long RuntimeReserve = 96L << 20;

    /// <summary>Bytes set aside per worker thread for emit buffers.</summary>
    public const long BufferReservePerThread = 24L << 20;

    /// <summary>Estimated bytes per kept string on <paramref name="n"/> qubits, transient pass overhead included.</summary>
    public static double BytesPerString(int n)
    {
        int entry = PauliWidth.KeyBytes(n) + 8;
        return 3.5 * entry + PassExpansion * (2.0 * entry + 16);
    }

    /// <summary>Bytes available to the engine's arrays out of a budget.</summary>
    public static long ArrayBytes(long budget, int threads) => budget - RuntimeReserve - threads * BufferReservePerThread;

    /// <summary>The largest string count that fits a budget.</summary>
    public static long MaxStringsFor(long budget, int n, int threads)
        => Math.Max(0, (long)(ArrayBytes(budget, threads) / BytesPerString(n)));

    /// <summary>Default budget: half of the memory available to this process.</summary>
    public static long DefaultBytes() => GC.GetGCMemoryInfo().TotalAvailableMemoryBytes / 2;

    /// <summary>
    /// Parses "8GiB", "512MiB", "512M", "2GB", "750MB" or a plain byte count. KiB/MiB/GiB/TiB and the bare
    /// letters K/M/G/T are powers of 1024 (as Slurm reads them); KB/MB/GB/TB are powers of 1000.
    /// </summary>
    public static long Parse(string text)
        => TryParse(text, out long bytes)
            ? bytes
            : throw new InputException($"memory budget '{text}': found no positive size; expected a size such as 8GiB, 512MiB or 2GB");

    /// <summary>As <see cref="Parse"/>, without throwing; false for anything that is not a positive size.</summary>
    public static bool TryParse(string? text, out long bytes)
    {
        bytes = 0;
        if (text is null) return false;
        string t = text.Trim();
        int i = 0;
        while (i < t.Length && (char.IsAsciiDigit(t[i]) || t[i] is '.' or 'e' or 'E' or '+')) i++;
        // A unit never starts with 'e'; "1e9" is a number, "1EB" is not accepted.
        if (!double.TryParse(t[..i], NumberStyles.Float, CultureInfo.InvariantCulture, out double v) || !(v > 0) || !double.IsFinite(v)) return false;
        double mult = t[i..].Trim().ToUpperInvariant() switch
        {
            "" or "B" => 1,
            "K" or "KIB" => 1L << 10,
            "M" or "MIB" => 1L << 20,
            "G" or "GIB" => 1L << 30,
            "T" or "TIB" => 1L << 40,
            "KB" => 1e3,
            "MB" => 1e6,
            "GB" => 1e9,
            "TB" => 1e12,
            _ => double.NaN,
        };
        double b = v * mult;
        if (!(b >= 1) || b > long.MaxValue / 2) return false;
        bytes = (long)b;
        return true;
    }

    /// <summary>Human-readable bytes (GiB/MiB).</summary>
    public static string Format(long bytes)
        => bytes >= 1L << 30
            ? FormattableString.Invariant($"{bytes / (double)(1L << 30):0.#} GiB")
            : FormattableString.Invariant($"{bytes / (double)(1L << 20):0} MiB");
}
