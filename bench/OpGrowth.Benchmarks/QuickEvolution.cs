using System.Diagnostics;
using OpGrowth.Evolution;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// Hand-timer for the evolution step (run with `-- quick-evolution BUDGET THREADS STEPS [TIMED_THREADS]`): the workload of
/// <see cref="EvolutionBenchmarks"/> (mixed-field Ising chain, 128 sites, trotter2, dt = 0.05, probe Z_64).
/// The operator is first grown until it fills the budget; then STEPS steps are timed one by one. Prints
/// time per step, strings kept, and the process's peak working set against the budget's memory.
/// </summary>
public static class QuickEvolution
{
    public static void Run(long budget, int threads, int steps, int timedThreads = 0)
    {
        var problem = Workloads.MixedFieldIsingProblem128();
        long memory = 20L << 30;
        var options = new EvolutionOptions
        {
            Method = IntegrationMethod.Trotter2,
            Dt = 0.05,
            Time = 100,
            Threads = threads,
            Truncation = new TruncationPolicy { MaxStrings = budget, MemoryBytes = memory },
        };
        var seriesBudget = OperatorEvolution.ResolveBudgets(problem, options, out _)[0];
        var engine = new EvolutionEngine<Pauli128>(problem, options, seriesBudget, 0, null);
        engine.Start();
        var total = Stopwatch.StartNew();
        int grow = 0;
        int kept = 0;
        while (kept < budget * 0.99 && grow < 200)
        {
            kept = engine.Step(1);
            grow++;
        }
        Console.WriteLine($"budget {budget:N0}, {threads} thread(s): filled after {grow} steps, {total.Elapsed.TotalSeconds:F1} s");
        if (timedThreads > 0 && timedThreads != threads)
        {
            engine.SetThreads(timedThreads);
            Console.WriteLine($"timing on {timedThreads} thread(s) (filled on {threads}; results do not depend on the count)");
        }
        for (int s = 0; s < steps; s++)
        {
            var cpu0 = Process.GetCurrentProcess().TotalProcessorTime;
            var sw = Stopwatch.StartNew();
            kept = engine.Step(1);
            sw.Stop();
            var cpu = Process.GetCurrentProcess().TotalProcessorTime - cpu0;
            Console.WriteLine($"step {grow + s + 1}: {sw.Elapsed.TotalSeconds:F2} s wall ({1 / sw.Elapsed.TotalSeconds:F3} steps/s), {cpu.TotalSeconds:F2} s CPU, {kept:N0} strings kept");
        }
        using var self = Process.GetCurrentProcess();
        Console.WriteLine($"peak working set {self.PeakWorkingSet64 / 1e9:F2} GB (memory budget option {memory / (double)(1L << 30):F0} GiB)");
    }
}
