using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>What one compaction does to the accumulated image of a pass.</summary>
/// <param name="Threshold">Drop strings with |c| below this (0: off).</param>
/// <param name="MaxSize">Drop strings of size above this (int.MaxValue: off).</param>
/// <param name="MaxStrings">Keep at most this many strings, those of largest |c| (long.MaxValue: off).</param>
/// <param name="Damping">Per-size factors f[size] multiplying c before the other rules (null: off).</param>
internal readonly record struct CompactRule(double Threshold, int MaxSize, long MaxStrings, double[]? Damping);

/// <summary>What a compaction kept and removed. Weights are sums of c^2.</summary>
internal readonly record struct CompactStats(
    int Kept, long Distinct, double KeptWeight, double DeletedWeight, double DampedWeight, double CutMagnitude);

/// <summary>
/// Turns an accumulator into the next operator in one fused sweep: size damping, size cap,
/// coefficient threshold and top-M selection, writing the survivors in partition order (so the
/// result is deterministic) and booking every removed weight. Top-M finds the M-th largest |c|
/// without sorting: a histogram of the top 16 bits of |c| (IEEE order = numeric order for positive
/// doubles) locates the boundary bin, and a quickselect inside that bin gives the exact cut; ties
/// at the cut are kept in storage order. Parallel over partitions; every floating-point sum is
/// made per partition and combined in partition order (bit-identical at any thread count).
/// </summary>
internal sealed class Compactor<T> where T : unmanaged, IPauliKey<T>
{
    private const int Bins = 1 << 15;
    private readonly int _threads;
    private readonly int[][] _hist;
    private int[] _cand = [];
    private int[] _above = [];
    private int[] _ties = [];
    private int[] _offset = [];
    private double[] _keptSq = [];
    private double[] _delSq = [];
    private double[] _dampSq = [];
    private double[] _binValues = [];
    private readonly double[][] _threadBins;
    private readonly int[] _threadFill;
    private int[] _binStart = [];
    private int[] _binEnd = [];
    private int[] _binThread = [];

    public Compactor(int threads)
    {
        _threads = threads;
        _hist = new int[threads][];
        _threadBins = new double[threads][];
        _threadFill = new int[threads];
    }

    private static int Bin(double a) => (int)(BitConverter.DoubleToInt64Bits(a) >>> 48);

    /// <summary>Compacts; returns Kept = -1 (and leaves <paramref name="dest"/> untouched) when more than <paramref name="maxCount"/> strings survive.</summary>
    public CompactStats Compact(PassAccumulator<T> acc, in CompactRule rule, OperatorBuffer<T> dest, long maxCount = long.MaxValue)
    {
        var parts = acc.Parts;
        int np = parts.Length;
        if (_cand.Length != np)
        {
            _cand = new int[np];
            _above = new int[np];
            _ties = new int[np];
            _offset = new int[np + 1];
            _keptSq = new double[np];
            _delSq = new double[np];
            _dampSq = new double[np];
            _binStart = new int[np];
            _binEnd = new int[np];
            _binThread = new int[np];
        }
        bool topM = rule.MaxStrings < long.MaxValue;
        double thr = rule.Threshold;
        int maxSize = rule.MaxSize;
        double[]? damp = rule.Damping;
        bool needSize = damp is not null || maxSize < int.MaxValue;
        long distinct = 0;
        foreach (var p in parts) distinct += p.Count;

        // Phase 1: candidates per partition (+ |c| histogram for top-M).
        int threads = Math.Min(_threads, Math.Max(1, (int)(distinct / 16384)));
        if (topM)
        {
            for (int t = 0; t < threads; t++)
            {
                if (_hist[t] is null) _hist[t] = new int[Bins];
                else Array.Clear(_hist[t]);
            }
        }
        ForStripes(threads, np, (t, pi) =>
        {
            var part = parts[pi];
            var ents = part.Entries;
            int[]? hist = topM ? _hist[t] : null;
            int cand = 0;
            for (int i = 0; i < part.Count; i++)
            {
                double c = ents[i].Val;
                if (c == 0) continue;
                if (needSize)
                {
                    int w = ents[i].Key.Weight;
                    if (w > maxSize) continue;
                    if (damp is not null) c *= damp[w];
                }
                double a = Math.Abs(c);
                if (a < thr || a == 0) continue;
                cand++;
                if (hist is not null) hist[Bin(a)]++;
            }
            _cand[pi] = cand;
        });
        long candidates = 0;
        for (int p = 0; p < np; p++) candidates += _cand[p];

        // Phase 2: the cut for top-M.
        double cut = 0;
        bool applyCut = topM && candidates > rule.MaxStrings;
        if (applyCut)
        {
            var hist = _hist[0];
            for (int t = 1; t < threads; t++)
            {
                var h = _hist[t];
                for (int b = 0; b < Bins; b++) hist[b] += h[b];
            }
            long need = rule.MaxStrings, cum = 0;
            int bin = Bins - 1;
            for (; bin >= 0; bin--)
            {
                if (cum + hist[bin] >= need) break;
                cum += hist[bin];
            }
            int inBin = hist[bin];
            int rankFromTop = (int)(need - cum); // 1..inBin
            // One parallel sweep: per partition, the candidates above the boundary bin, and the magnitudes inside it
            // (gathered per thread, partition after partition). The cut is the value of a rank, whatever the order
            // the values are gathered in; the counts per partition then come from each partition's slice.
            for (int t = 0; t < threads; t++)
            {
                if (_threadBins[t] is null || _threadBins[t].Length < inBin) _threadBins[t] = new double[Math.Max(inBin, 2 * (_threadBins[t]?.Length ?? 0))];
                _threadFill[t] = 0;
            }
            ForStripes(threads, np, (t, pi) =>
            {
                var part = parts[pi];
                var ents = part.Entries;
                var values = _threadBins[t];
                int f = _threadFill[t];
                _binStart[pi] = f;
                int above = 0;
                for (int i = 0; i < part.Count; i++)
                {
                    double a = Magnitude(ents[i].Key, ents[i].Val, thr, maxSize, damp, needSize);
                    if (a == 0) continue;
                    int b = Bin(a);
                    if (b > bin) above++;
                    else if (b == bin) values[f++] = a;
                }
                _threadFill[t] = f;
                _binEnd[pi] = f;
                _binThread[pi] = t;
                _above[pi] = above;
            });
            if (_binValues.Length < inBin) _binValues = new double[Math.Max(inBin, _binValues.Length * 2)];
            int filled = 0;
            for (int t = 0; t < threads; t++)
            {
                _threadBins[t].AsSpan(0, _threadFill[t]).CopyTo(_binValues.AsSpan(filled));
                filled += _threadFill[t];
            }
            cut = Select(_binValues.AsSpan(0, filled), filled - rankFromTop);
            for (int pi = 0; pi < np; pi++)
            {
                var values = _threadBins[_binThread[pi]];
                int above = 0, ties = 0;
                for (int i = _binStart[pi], end = _binEnd[pi]; i < end; i++)
                {
                    if (values[i] > cut) above++;
                    else if (values[i] == cut) ties++;
                }
                _above[pi] += above;
                _ties[pi] = ties;
            }
            long remaining = need;
            for (int p = 0; p < np; p++) remaining -= _above[p];
            for (int p = 0; p < np; p++)
            {
                int q = (int)Math.Min(_ties[p], Math.Max(0, remaining));
                _ties[p] = q; // now: ties this partition may keep
                remaining -= q;
                _cand[p] = _above[p] + q;
            }
        }

        long total = 0;
        _offset[0] = 0;
        for (int p = 0; p < np; p++)
        {
            total += _cand[p];
            if (total > Array.MaxLength) throw new InsufficientMemoryException($"{total} strings exceed one array's capacity.");
            _offset[p + 1] = (int)total;
        }
        if (total > maxCount && total > dest.Keys.Length) return new CompactStats(-1, distinct, 0, 0, 0, 0);
        dest.EnsureCapacity((int)total);
        var dk = dest.Keys;
        var dv = dest.Coeffs;

        // Phase 3: copy survivors, book weights.
        ForStripes(threads, np, (_, pi) =>
        {
            var part = parts[pi];
            var ents = part.Entries;
            int w = _offset[pi];
            int tiesLeft = applyCut ? _ties[pi] : 0;
            double kept = 0, del = 0, damped = 0;
            for (int i = 0; i < part.Count; i++)
            {
                double c = ents[i].Val;
                if (c == 0) continue;
                if (needSize)
                {
                    int sz = ents[i].Key.Weight;
                    if (damp is not null)
                    {
                        double c2 = c * damp[sz];
                        damped += c * c - c2 * c2;
                        c = c2;
                    }
                    if (sz > maxSize)
                    {
                        del += c * c;
                        continue;
                    }
                }
                double a = Math.Abs(c);
                bool keep = a >= thr && a != 0;
                if (keep && applyCut)
                {
                    if (a < cut) keep = false;
                    else if (a == cut)
                    {
                        if (tiesLeft > 0) tiesLeft--;
                        else keep = false;
                    }
                }
                if (!keep)
                {
                    del += c * c;
                    continue;
                }
                dk[w] = ents[i].Key;
                dv[w] = c;
                w++;
                kept += c * c;
            }
            _keptSq[pi] = kept;
            _delSq[pi] = del;
            _dampSq[pi] = damped;
        });
        dest.Count = (int)total;
        double keptW = 0, delW = 0, dampW = 0;
        for (int p = 0; p < np; p++)
        {
            keptW += _keptSq[p];
            delW += _delSq[p];
            dampW += _dampSq[p];
        }
        return new CompactStats((int)total, distinct, keptW, delW, dampW, applyCut ? cut : 0);
    }

    private static double Magnitude(in T key, double c, double thr, int maxSize, double[]? damp, bool needSize)
    {
        if (c == 0) return 0;
        if (needSize)
        {
            int w = key.Weight;
            if (w > maxSize) return 0;
            if (damp is not null) c *= damp[w];
        }
        double a = Math.Abs(c);
        return a < thr ? 0 : a;
    }

    /// <summary>Quickselect (Hoare partition, middle pivot): the element of ascending rank k; reorders the span.</summary>
    internal static double Select(Span<double> a, int k)
    {
        int lo = 0, hi = a.Length - 1;
        while (lo < hi)
        {
            double pivot = a[lo + ((hi - lo) >> 1)];
            int i = lo, j = hi;
            while (i <= j)
            {
                while (a[i] < pivot) i++;
                while (a[j] > pivot) j--;
                if (i <= j)
                {
                    (a[i], a[j]) = (a[j], a[i]);
                    i++;
                    j--;
                }
            }
            if (k <= j) hi = j;
            else if (k >= i) lo = i;
            else return a[k];
        }
        return a[k];
    }

    private void ForStripes(int threads, int np, Action<int, int> body)
    {
        if (threads == 1)
        {
            for (int p = 0; p < np; p++) body(0, p);
            return;
        }
        Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads }, t =>
        {
            for (int p = t; p < np; p += threads) body(t, p);
        });
    }
}
