using System.Numerics;
using System.Runtime.CompilerServices;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// The commutator map, scale * i[H, S] for each stored string S of a block, written out as one loop for the
/// step driver (the plain basis, and the mirror-pair basis through <see cref="IProductClass"/>): the same contributions in the same order with the same values as
/// <see cref="LiouvilleTerms.Apply{T, TSink}"/> followed by <see cref="EmitBuffer{T}.Emit"/> (so the same
/// bits), with the Hamiltonian's arrays, the site tables and the stream pointers held in locals. The terms of
/// a support site come from its <see cref="SiteWindows{T}"/> table, together with the sign of each product
/// (no symplectic product, overlap test or phase count per term); sites without a table are tested term by
/// term as in the shared loop. Each stream is given room for the most contributions one string can emit
/// (one per term) before the string is taken, so a contribution is written without a bounds check.
/// </summary>
internal static unsafe class CommutatorKernel<T> where T : unmanaged, IPauliKey<T>
{
    /// <summary>Most streams the kernel serves (the step driver uses one per owner); more go through the shared loop.</summary>
    public const int MaxStreams = 8;

    /// <summary>Emits map(items[start..end)) into <paramref name="sink"/>; false (nothing emitted) when the sink has more than <see cref="MaxStreams"/> streams.</summary>
    public static bool Produce(CommutatorMap<T> map, KeyValue<T>* items, int start, int end, EmitBuffer<T> sink)
        => Produce(map.Hamiltonian, items, start, end, sink, new PlainClass(map.Scale));

    /// <summary>
    /// The kernel for a basis whose map is the commutator followed by a change of key: each input string's
    /// factor comes from <paramref name="classes"/> (<see cref="IProductClass.Scale"/>), and each product is
    /// replaced by its class's key before it is written (<see cref="IProductClass.Class"/>), as the basis's
    /// own sink does after the shared loop.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    public static bool Produce<TClass>(CompiledHamiltonian<T> h, KeyValue<T>* items, int start, int end, EmitBuffer<T> sink, TClass classes)
        where TClass : struct, IProductClass
    {
        int groups = sink.Groups;
        if (groups > MaxStreams) return false;
        var windows = h.Windows;
        int room = Math.Max(1, h.Count);
        int shift = sink.GroupShift, mask = sink.GroupMask;
        var w = stackalloc EmitBuffer<T>.Entry*[MaxStreams];
        var limit = stackalloc EmitBuffer<T>.Entry*[MaxStreams];
        var counts = sink.Counts;
        fixed (T* keys = h.Keys)
        fixed (double* coef = h.Coefficients)
        fixed (int* rowStart = h.SiteStart)
        fixed (int* rowTerms = h.SiteTerms)
        fixed (SiteWindow* at = windows.Sites)
        fixed (ulong* masks = windows.Masks)
        fixed (ulong* signs = windows.Signs)
        fixed (int* sites = sink.Sites)
        {
            var siteSpan = new Span<int>(sites, sink.Sites.Length);
            int i = start;
            while (i < end)
            {
                for (int g = 0; g < groups; g++)
                {
                    sink.EnsureRoom(g, room);
                    var p0 = sink.StreamPointer(g);
                    w[g] = p0 + counts[g];
                    limit[g] = p0 + (sink.Streams[g].Length - room);
                }
                for (; i < end; i++)
                {
                    T key = items[i].Key;
                    double c2 = 2.0 * items[i].Value * classes.Scale(key);
                    int m = T.SupportSites(key, siteSpan);
                    for (int a = 0; a < m; a++)
                    {
                        int j = sites[a];
                        SiteWindow sw = at[j];
                        if (sw.Offset >= 0)
                        {
                            int x = sw.Offset + T.Window(key, sw.First, sw.Width);
                            ulong bits = masks[x], neg = signs[x];
                            int* row = rowTerms + rowStart[j];
                            while (bits != 0)
                            {
                                int r = BitOperations.TrailingZeroCount(bits);
                                bits &= bits - 1;
                                int t = row[r];
                                T p = T.Multiply(keys[t], key, out _);
                                // -(c2 h_t) equals (-c2) h_t exactly: flipping the sign bit is the shared loop's k == 1 branch.
                                double v = BitConverter.Int64BitsToDouble(BitConverter.DoubleToInt64Bits(c2 * coef[t]) ^ (long)(((neg >> r) & 1) << 63));
                                p = classes.Class(p, ref v);
                                ulong hash = p.Hash64;
                                int u = (int)(hash >> shift) & mask;
                                var e = w[u];
                                w[u] = e + 1;
                                e->Key = p;
                                e->Value = v;
                                e->Hash = hash;
                            }
                            continue;
                        }
                        for (int q = rowStart[j], qEnd = rowStart[j + 1]; q < qEnd; q++)
                        {
                            int t = rowTerms[q];
                            if (!T.Anticommute(keys[t], key)) continue;
                            if (a > 0 && T.OverlapBelow(keys[t], key, j)) continue;
                            T p = T.Multiply(keys[t], key, out int k);
                            double v = k == 1 ? -c2 * coef[t] : c2 * coef[t];
                            p = classes.Class(p, ref v);
                            ulong hash = p.Hash64;
                            int u = (int)(hash >> shift) & mask;
                            var e = w[u];
                            w[u] = e + 1;
                            e->Key = p;
                            e->Value = v;
                            e->Hash = hash;
                        }
                    }
                    bool full = false;
                    for (int g = 0; g < groups; g++) full |= w[g] > limit[g];
                    if (full)
                    {
                        i++;
                        break;
                    }
                }
                for (int g = 0; g < groups; g++) counts[g] = (int)(w[g] - sink.StreamPointer(g));
            }
        }
        return true;
    }

    /// <summary>What a basis does around the commutator: a factor per input string, and the key (and factor) a product is stored under.</summary>
    internal interface IProductClass
    {
        /// <summary>The factor in front of i[H, S] for the input string S.</summary>
        double Scale(in T key);

        /// <summary>The key the product is stored under; may change its value.</summary>
        T Class(in T product, ref double value);
    }

    /// <summary>The plain basis: one factor for every string, every product its own key.</summary>
    internal readonly struct PlainClass(double scale) : IProductClass
    {
        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public double Scale(in T key) => scale;

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public T Class(in T product, ref double value) => product;
    }
}
