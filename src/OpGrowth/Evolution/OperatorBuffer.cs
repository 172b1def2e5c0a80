using System.Numerics.Tensors;
using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// The engine's operator storage: parallel key and coefficient arrays whose capacity is kept between
/// steps (two of them are swapped as source and destination of every pass).
/// </summary>
internal sealed class OperatorBuffer<T> where T : unmanaged, IPauliKey<T>
{
    public T[] Keys = [];
    public double[] Coeffs = [];
    public int Count;

    public long AllocatedBytes => (long)Keys.Length * Unsafe.SizeOf<T>() + (long)Coeffs.Length * 8;

    public ReadOnlySpan<T> KeySpan => Keys.AsSpan(0, Count);

    public ReadOnlySpan<double> CoeffSpan => Coeffs.AsSpan(0, Count);

    public double NormSquared() => TensorPrimitives.SumOfSquares(CoeffSpan);

    /// <summary>Makes room for <paramref name="count"/> entries; content is not kept.</summary>
    public void EnsureCapacity(int count)
    {
        if (Keys.Length >= count) return;
        Keys = [];
        Coeffs = [];
        int cap = (int)Math.Min(Array.MaxLength, Math.Max(16, count + (long)count / 8));
        Keys = GC.AllocateUninitializedArray<T>(cap);
        Coeffs = GC.AllocateUninitializedArray<double>(cap);
    }

    public void CopyFrom(ReadOnlySpan<T> keys, ReadOnlySpan<double> coeffs)
    {
        EnsureCapacity(keys.Length);
        keys.CopyTo(Keys);
        coeffs.CopyTo(Coeffs);
        Count = keys.Length;
    }

    public PauliOperator<T> ToOperator(int n) => new(n, KeySpan.ToArray(), CoeffSpan.ToArray(), Count);
}
