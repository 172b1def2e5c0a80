using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// Applies a Hamiltonian H = sum_t h_t P_t to state vectors directly from its Pauli terms, with bit
/// operations and no matrix: X flips index bits, Z gives signs, Y both with a phase.
/// </summary>
/// <remarks>
/// Terms with equal X mask move every amplitude by the same permutation k -&gt; k ^ X, so they are
/// grouped: one pass per group adds c_X(k) psi[k ^ X] with c_X(k) = sum_t h_t i^{y_t} (-1)^{popcount(k &amp; Z_t)}.
/// The diagonal group (X = 0) is precomputed once as a real vector of 2^N values. Output is produced
/// in chunks of 2^12 amplitudes that stay in the L2 cache while every group adds to them; chunks are
/// distributed over threads (each output amplitude is written by one thread only, so the result does
/// not depend on the thread count). Pure X-type groups (one term, no Z bits) use a vectorised path.
/// Basis convention: <see cref="PauliMask"/>.
/// </remarks>
public sealed class PauliHamiltonianApplier
{
    private readonly double[]? _diagonal;
    private readonly Group[] _groups;      // groups not handled by the fused pass
    private readonly PairGroup[] _pairs;   // two-bit flips with bit-local real coefficients (exchange pairs)
    private readonly ulong[] _fusedX;      // pure X-type groups (one real term, no Z bits), fused into one pass
    private readonly double[] _fusedC;
    private readonly int _threads;

    private sealed class Group
    {
        public ulong X;
        public ulong[] RealZ = [];
        public double[] RealC = [];
        public ulong[] ImagZ = [];
        public double[] ImagC = [];
        // Compressed coefficient: c(k) = (-1)^{popcount(k & Base)} (TableRe + i TableIm)[pext(k, Vary)]
        // (null when the terms' Z masks differ in too many bits for a table).
        public ulong Base;
        public ulong Vary;
        public double[]? TableRe;
        public double[]? TableIm;
        public bool PureX => ImagZ.Length == 0 && RealZ.Length == 1 && RealZ[0] == 0;
    }

    // A group whose X mask flips exactly two bits and whose coefficient depends only on those two bits
    // (e.g. the exchange XX + YY of a pair): out[k] += C[b_hi(k), b_lo(k)] psi[k ^ (bit lo | bit hi)], with C
    // indexed by the bits of the output index k (c at the source index k ^ X, read with both bits flipped).
    private readonly record struct PairGroup(int Lo, int Hi, double C00, double C01, double C10, double C11)
    {
        public ulong X => (1UL << Lo) | (1UL << Hi);

        [MethodImpl(MethodImplOptions.AggressiveInlining)]
        public double At(int bHi, int bLo) => bHi == 0 ? (bLo == 0 ? C00 : C01) : (bLo == 0 ? C10 : C11);
    }

    private const int MaxTableBits = 12;

    // Larger tables (up to 2^22 entries) for groups whose masks differ in more bits, as long as all of them together
    // stay within this many bytes: the SYK model's two-site groups (a Majorana on each of two sites times Z on any
    // third site) differ in every bit, so without a table every amplitude pays a sum over 4(N - 2) strings.
    private const int MaxLargeTableBits = 22;
    private const long LargeTableBudget = 256L << 20;

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Number of amplitudes, 2^N.</summary>
    public int Dimension { get; }

    /// <summary>The Hamiltonian this applier was built from.</summary>
    public Hamiltonian Hamiltonian { get; }

    /// <summary>Number of off-diagonal X-mask groups (the diagonal group is counted separately).</summary>
    public int OffDiagonalGroups => _groupCount;

    private readonly int _groupCount;

    /// <summary>True when H has diagonal terms (products of Z).</summary>
    public bool HasDiagonal => _diagonal is not null;

    /// <summary>Amplitude updates done by one application: 2^N per group, the diagonal included.</summary>
    public long AmplitudeUpdatesPerApply => (long)Dimension * (_groupCount + (_diagonal is null ? 0 : 1));

    /// <summary>True when H is a real matrix in the computational basis (every term has an even number of Y).</summary>
    public bool IsReal { get; }

    /// <summary>Upper bound on the spectral radius: sum of |h_t| (triangle inequality, ||P_t|| = 1).</summary>
    public double NormBound { get; }

    /// <summary>Threads used by <see cref="Apply"/>.</summary>
    public int Threads => _threads;

    /// <summary>Builds the applier. <paramref name="threads"/> defaults to the processor count.</summary>
    public PauliHamiltonianApplier(Hamiltonian hamiltonian, int threads = 0)
    {
        ArgumentNullException.ThrowIfNull(hamiltonian);
        Hamiltonian = hamiltonian;
        N = hamiltonian.N;
        Dimension = StateVector.Dimension(N);
        _threads = threads > 0 ? threads : Environment.ProcessorCount;
        var byX = new Dictionary<ulong, (List<ulong> rz, List<double> rc, List<ulong> iz, List<double> ic)>();
        var diagTerms = new List<(ulong Z, double C)>();
        bool real = true;
        double bound = 0;
        foreach (var t in hamiltonian.Terms)
        {
            var m = PauliMask.From(t.String);
            bound += Math.Abs(t.Coefficient);
            // h i^y: i^0 = 1, i^1 = i, i^2 = -1, i^3 = -i.
            int y = m.YCount & 3;
            double c = y is 0 or 1 ? t.Coefficient : -t.Coefficient;
            bool imag = (y & 1) == 1;
            real &= !imag;
            if (m.X == 0)
            {
                // Hermitian diagonal strings have no Y, so the amplitude is real.
                diagTerms.Add((m.Z, c));
                continue;
            }
            if (!byX.TryGetValue(m.X, out var g))
            {
                g = ([], [], [], []);
                byX[m.X] = g;
            }
            if (imag)
            {
                g.iz.Add(m.Z);
                g.ic.Add(c);
            }
            else
            {
                g.rz.Add(m.Z);
                g.rc.Add(c);
            }
        }
        IsReal = real;
        NormBound = bound;
        var all = byX.OrderBy(kv => kv.Key).Select(kv => new Group
        {
            X = kv.Key,
            RealZ = [.. kv.Value.rz],
            RealC = [.. kv.Value.rc],
            ImagZ = [.. kv.Value.iz],
            ImagC = [.. kv.Value.ic],
        }).ToArray();
        _groupCount = all.Length;
        bool fuse = Vector256.IsHardwareAccelerated && Dimension >= 2;
        var pairs = new List<PairGroup>();
        var rest = new List<Group>();
        foreach (var g in all)
        {
            if (fuse && g.PureX) continue;
            if (AsPair(g) is { } pg) pairs.Add(pg);
            else
            {
                Compress(g);
                rest.Add(g);
            }
        }
        // Groups left without a table: the ones with most strings per amplitude first, within the budget.
        long large = 0;
        foreach (var g in rest.Where(g => g.TableRe is null && g.RealZ.Length + g.ImagZ.Length > 8).OrderByDescending(g => g.RealZ.Length + g.ImagZ.Length).ThenBy(g => g.X))
        {
            ulong d = 0, b0 = g.RealZ.Length > 0 ? g.RealZ[0] : g.ImagZ[0];
            foreach (var z in g.RealZ) d |= z ^ b0;
            foreach (var z in g.ImagZ) d |= z ^ b0;
            int bits = BitOperations.PopCount(d);
            if (bits > MaxLargeTableBits) continue;
            long bytes = (1L << bits) * 8 * (g.ImagZ.Length > 0 ? 2 : 1);
            if (large + bytes > LargeTableBudget) continue;
            large += bytes;
            CompressLarge(g, b0, d);
        }
        _groups = [.. rest];
        // Pairs sharing the bits above the chunk read the same partner chunk: keep them together.
        int chunkMask = (1 << StateVector.ChunkBits) - 1;
        _pairs = [.. pairs.OrderBy(p => p.X & ~(ulong)chunkMask).ThenBy(p => p.Hi).ThenBy(p => p.Lo)];
        _fusedX = all.Where(g => fuse && g.PureX).Select(g => g.X).ToArray();
        _fusedC = all.Where(g => fuse && g.PureX).Select(g => g.RealC[0]).ToArray();
        if (diagTerms.Count > 0)
        {
            _diagonal = new double[Dimension];
            var zs = diagTerms.Select(d => d.Z).ToArray();
            var cs = diagTerms.Select(d => d.C).ToArray();
            var diag = _diagonal;
            Parallel.For(0, StateVector.ChunkCount(Dimension), StateVector.Options(_threads), ch =>
            {
                var (s, l) = StateVector.Chunk(ch, Dimension);
                for (int i = s; i < s + l; i++) diag[i] = SignedSum((ulong)i, zs, cs);
            });
        }
    }

    /// <summary>Number of two-bit exchange groups applied by the pair kernel (e.g. XX + YY on a pair of sites).</summary>
    public int ExchangePairs => _pairs.Length;

    /// <summary>Number of groups whose coefficient comes from a table look-up (several strings with one X mask).</summary>
    public int TableGroups => _groups.Count(g => g.TableRe is not null);

    // A real group that flips two bits and whose Z masks lie inside those bits: its coefficient is a
    // function of the two bits only (four values), so no per-amplitude sign sums are needed.
    private static PairGroup? AsPair(Group g)
    {
        if (BitOperations.PopCount(g.X) != 2 || g.ImagZ.Length > 0) return null;
        foreach (var z in g.RealZ)
        {
            if ((z & ~g.X) != 0) return null;
        }
        int lo = BitOperations.TrailingZeroCount(g.X);
        int hi = 63 - BitOperations.LeadingZeroCount(g.X);
        // C[bHi, bLo] at output index k is the source coefficient at k ^ X (both bits flipped).
        double C(int bHi, int bLo)
        {
            ulong src = ((ulong)(1 - bHi) << hi) | ((ulong)(1 - bLo) << lo);
            return SignedSum(src, g.RealZ, g.RealC);
        }
        return new PairGroup(lo, hi, C(0, 0), C(0, 1), C(1, 0), C(1, 1));
    }

    // c(k) = sum_t c_t (-1)^{popcount(k & Z_t)} = (-1)^{popcount(k & B)} T[pext(k, D)] with B the first
    // term's mask and D the bits where the masks differ: one table look-up per amplitude instead of a sum
    // over terms (a 4-Majorana SYK group of 16 terms differs in 4 bits: a table of 16).
    private static void Compress(Group g)
    {
        var zs = g.RealZ.Concat(g.ImagZ).ToArray();
        if (zs.Length <= 1) return;
        ulong b = zs[0], d = 0;
        foreach (var z in zs) d |= z ^ b;
        int bits = BitOperations.PopCount(d);
        if (bits > MaxTableBits) return;
        int size = 1 << bits;
        var re = new double[size];
        var im = g.ImagZ.Length > 0 ? new double[size] : null;
        for (int m = 0; m < size; m++)
        {
            ulong k = Deposit((ulong)m, d);
            re[m] = SignedSum(k, g.RealZ.Select(z => z ^ b).ToArray(), g.RealC);
            if (im is not null) im[m] = SignedSum(k, g.ImagZ.Select(z => z ^ b).ToArray(), g.ImagC);
        }
        g.Base = b;
        g.Vary = d;
        g.TableRe = re;
        g.TableIm = im;
    }

    // The same table for many differing bits, built by a fast Walsh-Hadamard transform: T[m] = sum_u A[u] (-1)^{|m & u|}
    // with A[pext(Z_t ^ B, D)] = c_t, O(2^bits bits) instead of O(2^bits terms).
    private static void CompressLarge(Group g, ulong b, ulong d)
    {
        int size = 1 << BitOperations.PopCount(d);
        double[] Table(ulong[] zs, double[] cs)
        {
            var t = new double[size];
            for (int i = 0; i < zs.Length; i++) t[(int)Extract(zs[i] ^ b, d)] += cs[i];
            for (int h = 1; h < size; h <<= 1)
            {
                for (int i = 0; i < size; i += 2 * h)
                {
                    for (int j = i; j < i + h; j++)
                    {
                        double x = t[j], y = t[j + h];
                        t[j] = x + y;
                        t[j + h] = x - y;
                    }
                }
            }
            return t;
        }
        g.Base = b;
        g.Vary = d;
        g.TableRe = Table(g.RealZ, g.RealC);
        g.TableIm = g.ImagZ.Length > 0 ? Table(g.ImagZ, g.ImagC) : null;
    }

    // Scatters the low bits of m to the positions of the set bits of mask (software pdep).
    private static ulong Deposit(ulong m, ulong mask)
    {
        ulong r = 0;
        for (ulong bit = 1; mask != 0; bit <<= 1)
        {
            ulong low = mask & (~mask + 1);
            if ((m & bit) != 0) r |= low;
            mask &= mask - 1;
        }
        return r;
    }

    // Gathers the bits of k at the set bits of mask into the low bits (pext).
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static ulong Extract(ulong k, ulong mask)
    {
        if (System.Runtime.Intrinsics.X86.Bmi2.X64.IsSupported) return System.Runtime.Intrinsics.X86.Bmi2.X64.ParallelBitExtract(k, mask);
        ulong r = 0;
        for (ulong bit = 1; mask != 0; bit <<= 1)
        {
            ulong low = mask & (~mask + 1);
            if ((k & low) != 0) r |= bit;
            mask &= mask - 1;
        }
        return r;
    }

    /// <summary>The diagonal of H in the computational basis (a copy), or zeros when there is none.</summary>
    public double[] Diagonal() => _diagonal is null ? new double[Dimension] : (double[])_diagonal.Clone();

    /// <summary>result = H psi (the two vectors must differ).</summary>
    public void Apply(Complex[] psi, Complex[] result) => Run(psi, result, null);

    /// <summary>result = H psi and returns &lt;psi|H|psi&gt; (real for Hermitian H), fused into the same pass.</summary>
    public double ApplyAndExpect(Complex[] psi, Complex[] result)
    {
        var parts = new double[StateVector.ChunkCount(Dimension)];
        Run(psi, result, parts);
        double s = 0;
        foreach (var p in parts) s += p;
        return s;
    }

    /// <summary>Reference path: result = H psi term by term, one Pauli string at a time (for tests and benchmarks).</summary>
    public void ApplyTermByTerm(Complex[] psi, Complex[] result)
    {
        Array.Clear(result);
        var tmp = new Complex[Dimension];
        foreach (var t in Hamiltonian.Terms)
        {
            StateVector.ApplyPauli(PauliMask.From(t.String), psi, tmp);
            StateVector.Axpy(t.Coefficient, tmp, result);
        }
    }

    private void Run(Complex[] psi, Complex[] result, double[]? expectParts)
    {
        ArgumentNullException.ThrowIfNull(psi);
        ArgumentNullException.ThrowIfNull(result);
        if (psi.Length != Dimension || result.Length != Dimension)
        {
            throw new ArgumentException($"Expected vectors of {Dimension} amplitudes, got {psi.Length} and {result.Length}.", nameof(psi));
        }
        if (ReferenceEquals(psi, result)) throw new ArgumentException("psi and result must be different vectors.", nameof(result));
        int chunks = StateVector.ChunkCount(Dimension);
        if (Dimension < StateVector.ParallelThreshold || _threads <= 1)
        {
            for (int c = 0; c < chunks; c++) ChunkKernel(c, psi, result, expectParts);
        }
        else
        {
            Parallel.For(0, chunks, StateVector.Options(_threads), c => ChunkKernel(c, psi, result, expectParts));
        }
    }

    private void ChunkKernel(int chunk, Complex[] psiArr, Complex[] outArr, double[]? expectParts)
    {
        var (start, len) = StateVector.Chunk(chunk, Dimension);
        var outC = outArr.AsSpan(start, len);
        ComputeChunk(start, len, psiArr, outC);
        if (expectParts is not null)
        {
            expectParts[chunk] = StateVector.InnerKernel(psiArr.AsSpan(start, len), outC).Real;
        }
    }

    /// <summary>
    /// One fused Chebyshev step: next = a (H v) + b v + c prev, written over <paramref name="prev"/>
    /// (prev is not read when c = 0), and acc += coefficient * next. Returns nothing; one pass over memory.
    /// </summary>
    internal void ChebyshevStep(Complex[] v, Complex[] prev, Complex[] acc, double a, double b, double c, Complex coefficient)
    {
        int chunks = StateVector.ChunkCount(Dimension);
        int chunkLen = Math.Min(1 << StateVector.ChunkBits, Dimension);
        void Body(int ch, Complex[] tmp)
        {
            var (start, len) = StateVector.Chunk(ch, Dimension);
            var hv = tmp.AsSpan(0, len);
            ComputeChunk(start, len, v, hv);
            var vs = v.AsSpan(start, len);
            var ps = prev.AsSpan(start, len);
            var acs = acc.AsSpan(start, len);
            for (int i = 0; i < len; i++)
            {
                Complex nx = a * hv[i] + b * vs[i];
                if (c != 0) nx += c * ps[i];
                ps[i] = nx;
            }
            StateVector.AxpyKernel(coefficient, ps, acs);
        }
        if (Dimension < StateVector.ParallelThreshold || _threads <= 1)
        {
            var tmp = new Complex[chunkLen];
            for (int ch = 0; ch < chunks; ch++) Body(ch, tmp);
        }
        else
        {
            Parallel.For(0, chunks, StateVector.Options(_threads), () => new Complex[chunkLen],
                (ch, _, tmp) =>
                {
                    Body(ch, tmp);
                    return tmp;
                },
                _ => { });
        }
    }

    // outC = (H psi)[start .. start+len)
    private void ComputeChunk(int start, int len, Complex[] psiArr, Span<Complex> outC)
    {
        ReadOnlySpan<Complex> psi = psiArr;
        if (_fusedX.Length > 0)
        {
            FusedKernel(start, len, psiArr, outC);
        }
        else if (_diagonal is null)
        {
            outC.Clear();
        }
        else
        {
            DiagonalKernel(_diagonal.AsSpan(start, len), psi.Slice(start, len), outC);
        }
        int lowMask = len - 1;
        foreach (var g in _groups)
        {
            ulong x = g.X;
            int srcStart = start ^ (int)(x & ~(ulong)lowMask);
            int xl = (int)(x & (ulong)lowMask);
            var src = psi.Slice(srcStart, len);
            if (g.PureX)
            {
                PureXKernel(g.RealC[0], src, xl, outC);
            }
            else if (g.TableRe is not null)
            {
                TableKernel(g, src, srcStart, xl, outC);
            }
            else
            {
                GeneralKernel(g, src, srcStart, xl, outC);
            }
        }
        if (_pairs.Length > 0) PairKernel(start, len, psi, outC);
    }

    // Every exchange pair for one output chunk. Per pair the output splits into runs of 2^lo amplitudes
    // with one coefficient each (the two flipped bits are constant on a run): zero runs are skipped (half of
    // them for XX + YY), the others are one real axpy from a contiguous source run. A pair whose bits both lie
    // above the chunk has one coefficient for the whole chunk; a pair flipping bit 0 mixes neighbours and
    // uses the lane-swapped vector path.
    private void PairKernel(int start, int len, ReadOnlySpan<Complex> psi, Span<Complex> outC)
    {
        int lowBits = BitOperations.TrailingZeroCount(len);
        var o = MemoryMarshal.Cast<Complex, double>(outC);
        foreach (var p in _pairs)
        {
            int highX = (int)(p.X & ~(ulong)(len - 1));
            int xl = (int)(p.X & (ulong)(len - 1));
            var src = MemoryMarshal.Cast<Complex, double>(psi.Slice(start ^ highX, len));
            if (p.Lo >= lowBits)
            {
                double c = p.At((start >> p.Hi) & 1, (start >> p.Lo) & 1);
                if (c != 0) System.Numerics.Tensors.TensorPrimitives.MultiplyAdd(src, c, o, o);
                continue;
            }
            bool hiInside = p.Hi < lowBits;
            int bHiConst = hiInside ? 0 : (start >> p.Hi) & 1;
            if (p.Lo < BlockBits && len >= 1 << BlockBits)
            {
                BlockPairKernel(p, src, o, xl, hiInside, bHiConst);
                continue;
            }
            if (p.Lo == 0)
            {
                PairLaneKernel(p, src, o, xl, hiInside, bHiConst);
                continue;
            }
            int run = 1 << p.Lo;           // amplitudes per run
            int runD = 2 * run;            // doubles per run
            for (int k = 0; k < len; k += run)
            {
                int bLo = (k >> p.Lo) & 1;
                int bHi = hiInside ? (k >> p.Hi) & 1 : bHiConst;
                double c = p.At(bHi, bLo);
                if (c == 0) continue;
                RunAxpy(c, src.Slice(2 * (k ^ xl), runD), o.Slice(2 * k, runD));
            }
        }
    }

    private const int BlockBits = 3;                   // blocks of 8 amplitudes = four 256-bit vectors
    private const int BlockAmps = 1 << BlockBits;
    private const int BlockVecs = BlockAmps / 2;

    // Pair flipping one of the four lowest bits: the output is walked in blocks of 16 amplitudes (eight vectors).
    // Inside a block the flip of the low bit is a fixed permutation of vectors (and of the two lanes for bit 0),
    // and the coefficient of each lane is fixed by the lane's bits, so a block costs eight loads, eight
    // multiply-adds and no branch (zero lanes are multiplied, not skipped: cheaper than a branch per two amplitudes).
    private static unsafe void BlockPairKernel(PairGroup p, ReadOnlySpan<double> src, Span<double> o, int xl, bool hiInside, int bHiConst)
    {
        var swap = Vector256.Create(2L, 3L, 0L, 1L);
        int inBlock = xl & (BlockAmps - 1);                // the flipped bits inside a block
        int outside = xl & ~(BlockAmps - 1);               // the flipped bit outside (hi above the block, inside the chunk)
        bool laneSwap = (inBlock & 1) != 0;
        int vflip = inBlock >> 1;                          // vector index flip within the block
        bool hiInBlock = hiInside && p.Hi < BlockBits;
        // Lane coefficients per vector v (amplitudes 2v, 2v + 1 of the block) for b_hi = 0 and 1.
        var cv = stackalloc Vector256<double>[2 * BlockVecs];
        for (int bh = 0; bh < 2; bh++)
        {
            for (int v = 0; v < BlockVecs; v++)
            {
                int a0 = 2 * v, a1 = 2 * v + 1;
                double x0 = p.At(hiInBlock ? (a0 >> p.Hi) & 1 : bh, (a0 >> p.Lo) & 1);
                double x1 = p.At(hiInBlock ? (a1 >> p.Hi) & 1 : bh, (a1 >> p.Lo) & 1);
                cv[bh * BlockVecs + v] = Vector256.Create(x0, x0, x1, x1);
            }
        }
        int amps = o.Length / 2;
        fixed (double* sp = src)
        fixed (double* op = o)
        {
            for (int k = 0; k < amps; k += BlockAmps)
            {
                int bHi = hiInBlock ? 0 : hiInside ? (k >> p.Hi) & 1 : bHiConst;
                var c = cv + bHi * BlockVecs;
                double* sb = sp + 2 * (k ^ outside);
                double* ob = op + 2 * k;
                if (laneSwap)
                {
                    for (int v = 0; v < BlockVecs; v++)
                    {
                        var x = Vector256.Shuffle(Vector256.Load(sb + 4 * (v ^ vflip)), swap);
                        (Vector256.Load(ob + 4 * v) + c[v] * x).Store(ob + 4 * v);
                    }
                }
                else
                {
                    for (int v = 0; v < BlockVecs; v++)
                    {
                        (Vector256.Load(ob + 4 * v) + c[v] * Vector256.Load(sb + 4 * (v ^ vflip))).Store(ob + 4 * v);
                    }
                }
            }
        }
    }

    // Pair flipping bit 0: within each 256-bit vector (amplitudes k, k + 1) the source pair is swapped and the
    // two lanes take the coefficients for bit 0 = 0 and 1.
    private static void PairLaneKernel(PairGroup p, ReadOnlySpan<double> src, Span<double> o, int xl, bool hiInside, int bHiConst)
    {
        var swap = Vector256.Create(2L, 3L, 0L, 1L);
        int rest = xl & ~1;
        int amps = o.Length / 2;
        for (int k = 0; k < amps; k += 2)
        {
            int bHi = hiInside ? (k >> p.Hi) & 1 : bHiConst;
            double c0 = p.At(bHi, 0), c1 = p.At(bHi, 1);
            if (c0 == 0 && c1 == 0) continue;
            var vc = Vector256.Create(c0, c0, c1, c1);
            var vs = Vector256.Shuffle(Vector256.Create(src.Slice(2 * (k ^ rest), 4)), swap);
            var vo = Vector256.Create(o.Slice(2 * k, 4));
            (vo + vc * vs).CopyTo(o.Slice(2 * k, 4));
        }
    }

    // y += c x on a run of doubles whose length is a multiple of 4 (runs of at least two amplitudes).
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static unsafe void RunAxpy(double c, ReadOnlySpan<double> x, Span<double> y)
    {
        if (x.Length >= 256)
        {
            System.Numerics.Tensors.TensorPrimitives.MultiplyAdd(x, c, y, y);
            return;
        }
        var vc = Vector256.Create(c);
        fixed (double* xp = x)
        fixed (double* yp = y)
        {
            int i = 0;
            for (; i + 8 <= x.Length; i += 8)
            {
                (Vector256.Load(yp + i) + vc * Vector256.Load(xp + i)).Store(yp + i);
                (Vector256.Load(yp + i + 4) + vc * Vector256.Load(xp + i + 4)).Store(yp + i + 4);
            }
            for (; i < x.Length; i += 4) (Vector256.Load(yp + i) + vc * Vector256.Load(xp + i)).Store(yp + i);
        }
    }

    private static void TableKernel(Group g, ReadOnlySpan<Complex> src, int srcStart, int xl, Span<Complex> outC)
    {
        var re = g.TableRe!;
        var im = g.TableIm;
        ulong b = g.Base, d = g.Vary;
        for (int i = 0; i < outC.Length; i++)
        {
            int li = i ^ xl;
            ulong k = (ulong)(srcStart + li);
            int m = (int)Extract(k, d);
            double s = (BitOperations.PopCount(k & b) & 1) == 0 ? 1.0 : -1.0;
            double a = s * re[m];
            var v = src[li];
            if (im is null)
            {
                outC[i] += new Complex(a * v.Real, a * v.Imaginary);
            }
            else
            {
                double c = s * im[m];
                outC[i] += new Complex(a * v.Real - c * v.Imaginary, a * v.Imaginary + c * v.Real);
            }
        }
    }

    // One pass for the diagonal and every pure X-type group: each pair of outputs (one 256-bit vector)
    // sums diag * psi and c_g psi[i ^ x_g] in registers, so the output is written once instead of once
    // per group. A group flipping the lowest bit reads the neighbouring pair with its halves swapped.
    private unsafe void FusedKernel(int start, int len, Complex[] psiArr, Span<Complex> outC)
    {
        var xs = _fusedX;
        var cs = _fusedC;
        int g = xs.Length;
        var swap = Vector256.Create(2L, 3L, 0L, 1L);
        fixed (Complex* psiC = psiArr)
        fixed (Complex* outP = outC)
        fixed (double* diag = _diagonal)
        {
            double* psi = (double*)psiC;
            double* o = (double*)outP;
            for (int li = 0; li < len; li += 2)
            {
                int i = start + li;
                Vector256<double> acc;
                if (diag is not null)
                {
                    acc = Vector256.Create(diag[i], diag[i], diag[i + 1], diag[i + 1]) * Vector256.Load(psi + 2 * i);
                }
                else
                {
                    acc = Vector256<double>.Zero;
                }
                for (int k = 0; k < g; k++)
                {
                    ulong x = xs[k];
                    if ((x & 1) == 0)
                    {
                        acc += Vector256.Create(cs[k]) * Vector256.Load(psi + 2 * (long)((ulong)i ^ x));
                    }
                    else
                    {
                        acc += Vector256.Create(cs[k]) * Vector256.Shuffle(Vector256.Load(psi + 2 * (long)((ulong)i ^ x ^ 1)), swap);
                    }
                }
                acc.Store(o + 2 * li);
            }
        }
    }

    private static void DiagonalKernel(ReadOnlySpan<double> diag, ReadOnlySpan<Complex> psi, Span<Complex> outC)
    {
        var p = MemoryMarshal.Cast<Complex, double>(psi);
        var o = MemoryMarshal.Cast<Complex, double>(outC);
        int i = 0;
        if (Vector256.IsHardwareAccelerated)
        {
            for (; i <= diag.Length - 2; i += 2)
            {
                double d0 = diag[i], d1 = diag[i + 1];
                var vd = Vector256.Create(d0, d0, d1, d1);
                (vd * Vector256.Create(p.Slice(2 * i, 4))).CopyTo(o.Slice(2 * i, 4));
            }
        }
        for (; i < diag.Length; i++) outC[i] = diag[i] * psi[i];
    }

    // out[i] += c psi[i ^ x] with src = the chunk that holds the partners and xl = low bits of x.
    private static void PureXKernel(double c, ReadOnlySpan<Complex> src, int xl, Span<Complex> outC)
    {
        if (xl == 0)
        {
            RealAxpy(c, src, outC);
            return;
        }
        int p = BitOperations.TrailingZeroCount(xl);
        if (p >= 1)
        {
            // Runs of 2^p consecutive outputs read 2^p consecutive inputs (x has no bits below p).
            int block = 1 << p;
            for (int b = 0; b < outC.Length; b += block)
            {
                RealAxpy(c, src.Slice(b ^ xl, block), outC.Slice(b, block));
            }
            return;
        }
        // Lowest bit flipped: pairs are swapped; swap the two complex numbers of a 256-bit vector.
        var s = MemoryMarshal.Cast<Complex, double>(src);
        var o = MemoryMarshal.Cast<Complex, double>(outC);
        int rest = xl & ~1;
        if (Vector256.IsHardwareAccelerated)
        {
            var vc = Vector256.Create(c);
            var swap = Vector256.Create(2L, 3L, 0L, 1L);
            for (int b = 0; b < outC.Length; b += 2)
            {
                var vs = Vector256.Shuffle(Vector256.Create(s.Slice(2 * (b ^ rest), 4)), swap);
                var vo = Vector256.Create(o.Slice(2 * b, 4));
                (vo + vc * vs).CopyTo(o.Slice(2 * b, 4));
            }
            return;
        }
        for (int i = 0; i < outC.Length; i++) outC[i] += c * src[i ^ xl];
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static void RealAxpy(double c, ReadOnlySpan<Complex> x, Span<Complex> y)
    {
        var yd = MemoryMarshal.Cast<Complex, double>(y);
        System.Numerics.Tensors.TensorPrimitives.MultiplyAdd(MemoryMarshal.Cast<Complex, double>(x), c, yd, yd);
    }

    private static void GeneralKernel(Group g, ReadOnlySpan<Complex> src, int srcStart, int xl, Span<Complex> outC)
    {
        var rz = g.RealZ;
        var rc = g.RealC;
        var iz = g.ImagZ;
        var ic = g.ImagC;
        for (int i = 0; i < outC.Length; i++)
        {
            int li = i ^ xl;
            ulong k = (ulong)(srcStart + li);
            double a = SignedSum(k, rz, rc);
            double b = iz.Length == 0 ? 0 : SignedSum(k, iz, ic);
            var v = src[li];
            outC[i] += new Complex(a * v.Real - b * v.Imaginary, a * v.Imaginary + b * v.Real);
        }
    }

    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    private static double SignedSum(ulong k, ulong[] zs, double[] cs)
    {
        double a = 0;
        for (int t = 0; t < zs.Length; t++)
        {
            a += (BitOperations.PopCount(k & zs[t]) & 1) == 0 ? cs[t] : -cs[t];
        }
        return a;
    }
}
