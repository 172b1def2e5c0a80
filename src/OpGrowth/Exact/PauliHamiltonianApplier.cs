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
        public bool PureX => ImagZ.Length == 0 && RealZ.Length == 1 && RealZ[0] == 0;
    }

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
        _groups = all.Where(g => !(fuse && g.PureX)).ToArray();
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
            else
            {
                GeneralKernel(g, src, srcStart, xl, outC);
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
