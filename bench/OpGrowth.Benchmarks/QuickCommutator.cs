using System.Diagnostics;
using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// A fast hand-timer for the commutator kernel (run with `-- quick-commutator`): the same workload as
/// <see cref="CommutatorBenchmarks"/>, median of five repetitions per thread count, printed as
/// accumulated products per second. For iterating on the kernel; quote BenchmarkDotNet figures.
/// </summary>
public static class QuickCommutator
{
    public static void Run(int[] steps)
    {
        foreach (int s in steps)
        {
            var (h, o) = Workloads.GrownMixedFieldIsing(64, s);
            long products = Workloads.CountProducts(h, o);
            double t1 = 0;
            foreach (int threads in new[] { 1, 2 })
            {
                var times = new List<double>();
                int count = 0;
                for (int r = 0; r < 6; r++)
                {
                    GC.Collect();
                    var sw = Stopwatch.StartNew();
                    count = Liouvillian.Commutator(h, o, threads).Count;
                    sw.Stop();
                    if (r > 0) times.Add(sw.Elapsed.TotalSeconds);
                }
                times.Sort();
                double med = times[times.Count / 2];
                if (threads == 1) t1 = med;
                Console.WriteLine($"steps {s}: {o.Count} strings in, {count} out, {products} products, {threads} thread(s): {med * 1e3:F1} ms, {products / med / 1e6:F1} M products/s" + (threads == 2 ? $", speed-up {t1 / med:F2}" : ""));
            }
        }
    }
}
