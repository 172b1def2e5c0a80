using System.Numerics;
using System.Numerics.Tensors;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Raw weight sums of one operator, all from one parallel sweep (no allocation per string).
/// Weights are sums of c_S^2, not yet divided by the norm.
/// </summary>
internal sealed class WeightSums
{
    public WeightSums(int n, bool majorana)
    {
        N = n;
        Size = new double[n + 1];
        Letters = new double[3 * n];
        RightEdge = new double[n];
        LeftEdge = new double[n];
        Majorana = majorana ? new double[2 * n + 1] : null;
    }

    public int N { get; }

    public double NormSquared;

    /// <summary>(O(0)|O(t)) with the initial operator.</summary>
    public double Overlap;

    /// <summary>Weight per size 0..N.</summary>
    public double[] Size { get; }

    /// <summary>Weight per (site, letter): index 3j + (0 X, 1 Y, 2 Z).</summary>
    public double[] Letters { get; }

    /// <summary>Weight per rightmost non-identity site.</summary>
    public double[] RightEdge { get; }

    /// <summary>Weight per leftmost non-identity site.</summary>
    public double[] LeftEdge { get; }

    /// <summary>Weight per Majorana size 0..2N (fermionic models only).</summary>
    public double[]? Majorana { get; }
}

/// <summary>
/// Measures every recorded observable in one pass. The operator is cut into chunks whose boundaries
/// depend on the string count only (never on the thread count); each chunk is summed by one thread
/// into its own histograms, and chunks are combined in chunk order, so the numbers are bit-identical
/// at any thread count.
/// </summary>
internal static class ObservablePass
{
    private const int MinChunk = 1 << 14;
    private const int MaxChunks = 128;

    public static WeightSums Measure<T>(T[] keys, double[] coeffs, int count, int n,
        T[] initialKeys, double[] initialCoeffs, bool majorana, int threads)
        where T : unmanaged, IPauliKey<T>
    {
        int chunk = Math.Max(MinChunk, (count + MaxChunks - 1) / MaxChunks);
        int chunks = Math.Max(1, (count + chunk - 1) / chunk);
        var partial = new WeightSums[chunks];
        Dictionary<T, double>? initial = null;
        if (initialKeys.Length > 1)
        {
            initial = new Dictionary<T, double>(initialKeys.Length);
            for (int i = 0; i < initialKeys.Length; i++) initial[initialKeys[i]] = initialCoeffs[i];
        }
        T single = initialKeys.Length == 1 ? initialKeys[0] : default;
        double singleC = initialKeys.Length == 1 ? initialCoeffs[0] : 0;
        bool hasSingle = initialKeys.Length == 1;

        void Run(int ci)
        {
            var ws = new WeightSums(n, majorana);
            int s = ci * chunk, e = Math.Min(count, s + chunk);
            Span<ulong> xw = stackalloc ulong[PauliString.WordCount(T.Capacity)];
            Span<ulong> zw = stackalloc ulong[PauliString.WordCount(T.Capacity)];
            int words = PauliString.WordCount(n);
            var size = ws.Size;
            var letters = ws.Letters;
            var right = ws.RightEdge;
            var left = ws.LeftEdge;
            var maj = ws.Majorana;
            double norm = 0, overlap = 0;
            for (int i = s; i < e; i++)
            {
                double c = coeffs[i];
                double w = c * c;
                norm += w;
                ref readonly T k = ref keys[i];
                if (hasSingle)
                {
                    if (k.Equals(single)) overlap += singleC * c;
                }
                else if (initial is not null && initial.TryGetValue(k, out double c0)) overlap += c0 * c;
                k.CopyWords(xw, zw);
                int sz = 0;
                for (int wi = 0; wi < words; wi++)
                {
                    ulong x = xw[wi], z = zw[wi];
                    int b0 = wi << 6;
                    sz += BitOperations.PopCount(x | z);
                    for (ulong m = x & ~z; m != 0; m &= m - 1) letters[3 * (b0 + BitOperations.TrailingZeroCount(m))] += w;
                    for (ulong m = x & z; m != 0; m &= m - 1) letters[3 * (b0 + BitOperations.TrailingZeroCount(m)) + 1] += w;
                    for (ulong m = z & ~x; m != 0; m &= m - 1) letters[3 * (b0 + BitOperations.TrailingZeroCount(m)) + 2] += w;
                }
                size[sz] += w;
                if (sz > 0)
                {
                    right[k.LastSite] += w;
                    left[k.FirstSite] += w;
                }
                if (maj is not null) maj[OpGrowth.Models.JordanWigner.MajoranaWeight(xw, zw, n)] += w;
            }
            ws.NormSquared = norm;
            ws.Overlap = overlap;
            partial[ci] = ws;
        }

        if (threads <= 1 || chunks == 1)
        {
            for (int ci = 0; ci < chunks; ci++) Run(ci);
        }
        else
        {
            Parallel.For(0, chunks, new ParallelOptions { MaxDegreeOfParallelism = threads }, Run);
        }

        var total = partial[0];
        for (int ci = 1; ci < chunks; ci++)
        {
            var p = partial[ci];
            total.NormSquared += p.NormSquared;
            total.Overlap += p.Overlap;
            TensorPrimitives.Add(total.Size, p.Size, total.Size);
            TensorPrimitives.Add(total.Letters, p.Letters, total.Letters);
            TensorPrimitives.Add(total.RightEdge, p.RightEdge, total.RightEdge);
            TensorPrimitives.Add(total.LeftEdge, p.LeftEdge, total.LeftEdge);
            if (total.Majorana is not null) TensorPrimitives.Add(total.Majorana, p.Majorana!, total.Majorana);
        }
        return total;
    }
}
