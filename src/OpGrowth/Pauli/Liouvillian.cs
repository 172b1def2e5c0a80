namespace OpGrowth.Pauli;

/// <summary>Operator-level helpers built on <see cref="PauliMapper"/>.</summary>
public static class Liouvillian
{
    /// <summary>Returns i[H, O] (optionally scaled), accumulated on <paramref name="threads"/> threads.</summary>
    public static PauliOperator<T> Commutator<T>(CompiledHamiltonian<T> h, PauliOperator<T> o, int threads = 1, double scale = 1.0)
        where T : unmanaged, IPauliKey<T>
    {
        var acc = PauliAccumulator<T>.For(o.N, EstimateImage(h, o));
        PauliMapper.Run(o, new CommutatorMap<T>(h, scale), acc, threads);
        return acc.ToOperator(threads);
    }

    /// <summary>Accumulates scale * i[H, O] into an existing accumulator.</summary>
    public static void CommutatorInto<T>(CompiledHamiltonian<T> h, PauliOperator<T> o, PauliAccumulator<T> target, int threads = 1, double scale = 1.0)
        where T : unmanaged, IPauliKey<T>
        => PauliMapper.Run(o, new CommutatorMap<T>(h, scale), target, threads);

    /// <summary>a * A + b * B as a new operator.</summary>
    public static PauliOperator<T> Combine<T>(double a, PauliOperator<T> x, double b, PauliOperator<T> y)
        where T : unmanaged, IPauliKey<T>
    {
        var acc = PauliAccumulator<T>.For(x.N, x.Count + y.Count);
        acc.AddScaled(x, a);
        acc.AddScaled(y, b);
        return acc.ToOperator();
    }

    /// <summary>A size hint for the image of O under i[H, .] (depends on inputs only).</summary>
    public static long EstimateImage<T>(CompiledHamiltonian<T> h, PauliOperator<T> o)
        where T : unmanaged, IPauliKey<T>
        => Math.Max(16, (long)o.Count * 2);
}
