using OpGrowth.Pauli;

namespace OpGrowth.Benchmarks;

/// <summary>
/// Measured (not estimated) bytes per stored string: the managed heap growth while an operator of
/// about a million strings is alive, divided by its string count. Run with `-- memory`.
/// </summary>
public static class MemoryFigures
{
    public static void Run()
    {
        var (h, o) = Workloads.GrownMixedFieldIsing(64, 25);
        var keys = o.Keys.ToArray();
        var vals = o.Coefficients.ToArray();
        o = null!;
        GC.Collect(2, GCCollectionMode.Forced, true, true);
        long before = GC.GetTotalMemory(true);
        var op = new PauliOperator<Pauli64>(64, keys.ToArray(), vals.ToArray(), keys.Length);
        long after = GC.GetTotalMemory(true);
        Console.WriteLine($"operator (steady state): {op.Count} strings, {(after - before) / (double)op.Count:F2} bytes/string");

        before = GC.GetTotalMemory(true);
        var acc = PauliAccumulator<Pauli64>.For(64, keys.Length);
        acc.AddScaled(op, 1.0);
        long afterAcc = GC.GetTotalMemory(true);
        Console.WriteLine($"accumulator (transient, presized): {(afterAcc - before) / (double)op.Count:F2} bytes/string");
        var grown = Liouvillian.Commutator(h, op, 2);
        Console.WriteLine($"commutator image: {grown.Count} strings, operator arrays {grown.AllocatedBytes / (double)grown.Count:F2} bytes/string");
        GC.KeepAlive(acc);
        GC.KeepAlive(op);
    }
}
