using System.Diagnostics;
using System.Globalization;
using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// Hand-timer of the Trotter pass at a filled string budget:
/// `-- trotter-pass BUDGET THREADS STEPS [STATE_FILE]`. Workload of <see cref="EvolutionBenchmarks"/>
/// (mixed-field Ising chain, 128 sites, trotter2, dt = 0.05, probe Z_64, top-M budget, 20 GiB memory option).
/// With STATE_FILE the filled operator is read from that file when it exists; otherwise the operator is
/// grown until it fills the budget and written there (the engine's checkpoint format), so builds before
/// and after a change time the same operator. Then STEPS steps are timed one by one (each is three
/// grouped passes plus their compactions). Printed per step: wall and CPU time, passes, and input strings
/// per second per thread (passes x strings / wall / threads). Then bytes per string: the engine's arrays
/// (design figure), the resident set after the steps and its peak during the steps (the peak is reset
/// through /proc/self/clear_refs before the first timed step). Last, a checksum of the operator: equal
/// checksums mean bit-identical operators (between builds or thread counts).
/// </summary>
public static class TrotterPass
{
    public static void Run(long budget, int threads, int steps, string? stateFile)
    {
        var problem = Workloads.MixedFieldIsingProblem128();
        var options = new EvolutionOptions
        {
            Method = IntegrationMethod.Trotter2,
            Dt = 0.05,
            Time = 100,
            Threads = threads,
            Truncation = new TruncationPolicy { MaxStrings = budget, MemoryBytes = 20L << 30 },
        };
        var seriesBudget = OperatorEvolution.ResolveBudgets(problem, options, out _)[0];
        var engine = new EvolutionEngine<Pauli128>(problem, options, seriesBudget, 0, null);
        var sw = Stopwatch.StartNew();
        if (stateFile is not null && File.Exists(stateFile))
        {
            engine.LoadState(stateFile);
            Console.WriteLine($"loaded {engine.StringCount:N0} strings from {stateFile} in {sw.Elapsed.TotalSeconds:F1} s");
        }
        else
        {
            engine.Start();
            int grow = 0, kept = 0;
            while (kept < budget * 0.99 && grow < 200)
            {
                kept = engine.Step(1);
                grow++;
            }
            Console.WriteLine($"filled {kept:N0} strings after {grow} steps in {sw.Elapsed.TotalSeconds:F1} s ({threads} thread(s))");
            if (stateFile is not null)
            {
                engine.SaveState(stateFile);
                Console.WriteLine($"state written to {stateFile}");
            }
        }
        System.Runtime.GCSettings.LargeObjectHeapCompactionMode = System.Runtime.GCLargeObjectHeapCompactionMode.CompactOnce;
        GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);
        ResetPeak();
        double sumRate = 0, bestRate = 0;
        for (int s = 0; s < steps; s++)
        {
            long passes0 = engine.PassCount;
            int strings0 = engine.StringCount;
            var ph0 = engine.PhaseSeconds;
            var vol0 = engine.PassVolume;
            var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
            var t = Stopwatch.StartNew();
            int kept = engine.Step(1);
            t.Stop();
            var cpu = Process.GetCurrentProcess().TotalProcessorTime - cpu0;
            long passes = engine.PassCount - passes0;
            double rate = passes * (double)strings0 / t.Elapsed.TotalSeconds / threads;
            sumRate += rate;
            bestRate = Math.Max(bestRate, rate);
            var ph = engine.PhaseSeconds;
            var vol = engine.PassVolume;
            Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"step {s + 1}: {t.Elapsed.TotalSeconds:F2} s wall, {cpu.TotalSeconds:F2} s CPU, {passes} passes, {strings0:N0} -> {kept:N0} strings, {rate / 1e6:F3} M strings/s per thread"));
            Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
                $"        produce {ph.Produce - ph0.Produce:F2} s, merge {ph.Merge - ph0.Merge:F2} s, compact {ph.Compact - ph0.Compact:F2} s; emitted {(vol.Emitted - vol0.Emitted) / (double)passes / strings0:F1} and distinct {(vol.Distinct - vol0.Distinct) / (double)passes / strings0:F2} per input string and pass"));
        }
        int count = engine.StringCount;
        long held = engine.HeldBytes;
        long rss = Environment.WorkingSet;
        long hwm = PeakResident();
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"mean {sumRate / Math.Max(1, steps) / 1e6:F3}, best {bestRate / 1e6:F3} M strings/s per thread ({threads} thread(s), budget {budget:N0})"));
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"bytes per string: engine arrays {held / (double)count:F1}, resident set {rss / (double)count:F1}, peak resident set during the steps {hwm / (double)count:F1} ({hwm / 1e9:F2} GB)"));
        var parts = engine.HeldBreakdown;
        Console.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"engine arrays per string: operator {parts.Operator / (double)count:F1}, accumulator {parts.Accumulator / (double)count:F1} ({parts.Distinct / (double)count:F2} distinct per string in the last pass, {parts.Bits} partition bits), emit buffers {parts.Buffers / (double)count:F1}"));
        Console.WriteLine($"operator checksum {engine.OperatorChecksum():x16} ({count} strings)");
    }

    /// <summary>Resets the kernel's peak resident set of this process (Linux; ignored elsewhere).</summary>
    private static void ResetPeak()
    {
        try
        {
            File.WriteAllText("/proc/self/clear_refs", "5");
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }

    /// <summary>Peak resident set (VmHWM) in bytes, or the runtime's peak working set where /proc is missing.</summary>
    private static long PeakResident()
    {
        try
        {
            foreach (var line in File.ReadLines("/proc/self/status"))
            {
                if (!line.StartsWith("VmHWM:", StringComparison.Ordinal)) continue;
                var parts = line.Split(' ', StringSplitOptions.RemoveEmptyEntries);
                return long.Parse(parts[1], CultureInfo.InvariantCulture) * 1024;
            }
        }
        catch (IOException)
        {
        }
        using var self = Process.GetCurrentProcess();
        return self.PeakWorkingSet64;
    }
}
