using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;

namespace OpGrowth.Exact;

/// <summary>
/// Operations on state vectors: <c>Complex[]</c> of 2^N amplitudes in the basis convention of
/// <see cref="PauliMask"/> (site 0 is the most significant bit of the index). Reductions are summed
/// per fixed chunk and then in chunk order, so results are identical at any thread count.
/// </summary>
public static class StateVector
{
    /// <summary>Amplitudes per work chunk (64 KiB of complex numbers): small enough to stay in L2.</summary>
    internal const int ChunkBits = 12;

    /// <summary>Vectors shorter than this are processed on one thread (parallel overhead dominates).</summary>
    internal const int ParallelThreshold = 1 << 15;

    /// <summary>Number of amplitudes for N qubits, validating N.</summary>
    public static int Dimension(int n)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, PauliMask.MaxQubits);
        return 1 << n;
    }

    /// <summary>A zero vector of 2^N amplitudes.</summary>
    public static Complex[] Create(int n) => new Complex[Dimension(n)];

    /// <summary>The computational basis state |index&gt;.</summary>
    public static Complex[] Basis(int n, int index)
    {
        var v = Create(n);
        v[index] = Complex.One;
        return v;
    }

    /// <summary>
    /// Fills <paramref name="psi"/> with a Haar-random unit vector: independent complex Gaussian
    /// amplitudes, normalised (the Gaussian vector's direction is uniform on the sphere).
    /// </summary>
    public static void FillHaarRandom(Span<Complex> psi, Random rng)
    {
        ArgumentNullException.ThrowIfNull(rng);
        double s = 0;
        for (int i = 0; i < psi.Length; i++)
        {
            // Box-Muller: two independent standard normals per amplitude.
            double u1 = 1.0 - rng.NextDouble(), u2 = rng.NextDouble();
            double r = Math.Sqrt(-2.0 * Math.Log(u1));
            double re = r * Math.Cos(2 * Math.PI * u2), im = r * Math.Sin(2 * Math.PI * u2);
            psi[i] = new Complex(re, im);
            s += re * re + im * im;
        }
        double inv = 1.0 / Math.Sqrt(s);
        for (int i = 0; i < psi.Length; i++) psi[i] *= inv;
    }

    /// <summary>&lt;a|b&gt; = sum conj(a_i) b_i.</summary>
    public static Complex Inner(Complex[] a, Complex[] b, int threads = 1)
    {
        ArgumentNullException.ThrowIfNull(a);
        ArgumentNullException.ThrowIfNull(b);
        RequireSameLength(a.Length, b.Length);
        if (a.Length < ParallelThreshold || threads <= 1) return InnerKernel(a, b);
        var parts = new Complex[ChunkCount(a.Length)];
        Parallel.For(0, parts.Length, Options(threads), c =>
        {
            var (s, l) = Chunk(c, a.Length);
            parts[c] = InnerKernel(a.AsSpan(s, l), b.AsSpan(s, l));
        });
        Complex t = 0;
        foreach (var p in parts) t += p;
        return t;
    }

    /// <summary>||a||^2.</summary>
    public static double NormSquared(Complex[] a, int threads = 1)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (a.Length < ParallelThreshold || threads <= 1) return NormKernel(a);
        var parts = new double[ChunkCount(a.Length)];
        Parallel.For(0, parts.Length, Options(threads), c =>
        {
            var (s, l) = Chunk(c, a.Length);
            parts[c] = NormKernel(a.AsSpan(s, l));
        });
        double t = 0;
        foreach (var p in parts) t += p;
        return t;
    }

    /// <summary>y += alpha x.</summary>
    public static void Axpy(Complex alpha, Complex[] x, Complex[] y, int threads = 1)
    {
        ArgumentNullException.ThrowIfNull(x);
        ArgumentNullException.ThrowIfNull(y);
        RequireSameLength(x.Length, y.Length);
        if (x.Length < ParallelThreshold || threads <= 1)
        {
            AxpyKernel(alpha, x, y);
            return;
        }
        Parallel.For(0, ChunkCount(x.Length), Options(threads), c =>
        {
            var (s, l) = Chunk(c, x.Length);
            AxpyKernel(alpha, x.AsSpan(s, l), y.AsSpan(s, l));
        });
    }

    /// <summary>a *= s.</summary>
    public static void Scale(Complex[] a, Complex s, int threads = 1)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (a.Length < ParallelThreshold || threads <= 1)
        {
            ScaleKernel(a, s);
            return;
        }
        Parallel.For(0, ChunkCount(a.Length), Options(threads), c =>
        {
            var (st, l) = Chunk(c, a.Length);
            ScaleKernel(a.AsSpan(st, l), s);
        });
    }

    /// <summary>dst = P src for a Pauli string P (dst and src must differ).</summary>
    public static void ApplyPauli(PauliMask p, ReadOnlySpan<Complex> src, Span<Complex> dst)
    {
        RequireSameLength(src.Length, dst.Length);
        if (Unsafe.AreSame(ref MemoryMarshal.GetReference(src), ref MemoryMarshal.GetReference(dst)))
        {
            throw new ArgumentException("Source and destination must be different vectors.", nameof(dst));
        }
        Complex ph = p.Phase;
        ulong x = p.X, z = p.Z;
        for (int i = 0; i < dst.Length; i++)
        {
            ulong k = (ulong)i ^ x;
            dst[i] = (BitOperations.PopCount(k & z) & 1) == 0 ? ph * src[(int)k] : -ph * src[(int)k];
        }
    }

    /// <summary>Returns P src as a new vector.</summary>
    public static Complex[] ApplyPauli(PauliMask p, Complex[] src)
    {
        ArgumentNullException.ThrowIfNull(src);
        var dst = new Complex[src.Length];
        ApplyPauli(p, src, dst);
        return dst;
    }

    /// <summary>&lt;a| P |b&gt; without forming P|b&gt;.</summary>
    public static Complex PauliMatrixElement(ReadOnlySpan<Complex> a, PauliMask p, ReadOnlySpan<Complex> b)
    {
        RequireSameLength(a.Length, b.Length);
        Complex s = 0;
        ulong x = p.X, z = p.Z;
        for (int i = 0; i < a.Length; i++)
        {
            ulong k = (ulong)i ^ x;
            Complex t = Complex.Conjugate(a[i]) * b[(int)k];
            s += (BitOperations.PopCount(k & z) & 1) == 0 ? t : -t;
        }
        return s * p.Phase;
    }

    /// <summary>
    /// Embeds a vector of N-1 qubits into N qubits with site <paramref name="site"/> in basis state
    /// <paramref name="bit"/>: |r&gt; (x) |bit&gt;_site in the site order of the full system.
    /// </summary>
    public static void EmbedWithSite(ReadOnlySpan<Complex> rest, int n, int site, int bit, Span<Complex> full)
    {
        int b = PauliMask.BitOfSite(n, site);
        if (rest.Length != 1 << (n - 1) || full.Length != 1 << n)
        {
            throw new ArgumentException($"Expected {1 << (n - 1)} and {1 << n} amplitudes, got {rest.Length} and {full.Length}.", nameof(full));
        }
        full.Clear();
        int low = (1 << b) - 1;
        for (int r = 0; r < rest.Length; r++)
        {
            int i = ((r & ~low) << 1) | (bit << b) | (r & low);
            full[i] = rest[r];
        }
    }

    /// <summary>w -= alpha v + beta u (u may be null) and returns ||w||^2: the Lanczos three-term step in one pass.</summary>
    internal static double LanczosUpdate(Complex[] w, double alpha, Complex[] v, double beta, Complex[]? u, int threads)
    {
        int len = w.Length;
        var parts = new double[ChunkCount(len)];
        void Body(int c)
        {
            var (s, l) = Chunk(c, len);
            var ws = w.AsSpan(s, l);
            AxpyKernel(-alpha, v.AsSpan(s, l), ws);
            if (u is not null && beta != 0) AxpyKernel(-beta, u.AsSpan(s, l), ws);
            parts[c] = NormKernel(ws);
        }
        if (len < ParallelThreshold || threads <= 1)
        {
            for (int c = 0; c < parts.Length; c++) Body(c);
        }
        else
        {
            Parallel.For(0, parts.Length, Options(threads), Body);
        }
        double t = 0;
        foreach (var p in parts) t += p;
        return t;
    }

    /// <summary>dst = sum_j coeffs[j] basis[j] for j &lt; count.</summary>
    internal static void Combine(Complex[][] basis, ReadOnlySpan<Complex> coeffs, int count, Complex[] dst, int threads)
    {
        var c = coeffs[..count].ToArray();
        int len = dst.Length;
        void Body(int ch)
        {
            var (s, l) = Chunk(ch, len);
            var d = dst.AsSpan(s, l);
            d.Clear();
            for (int j = 0; j < c.Length; j++) AxpyKernel(c[j], basis[j].AsSpan(s, l), d);
        }
        if (len < ParallelThreshold || threads <= 1)
        {
            for (int ch = 0; ch < ChunkCount(len); ch++) Body(ch);
        }
        else
        {
            Parallel.For(0, ChunkCount(len), Options(threads), Body);
        }
    }

    /// <summary>dst = s * src.</summary>
    internal static void ScaledCopy(Complex[] src, Complex s, Complex[] dst, int threads)
    {
        int len = src.Length;
        void Body(int ch)
        {
            var (st, l) = Chunk(ch, len);
            src.AsSpan(st, l).CopyTo(dst.AsSpan(st, l));
            ScaleKernel(dst.AsSpan(st, l), s);
        }
        if (len < ParallelThreshold || threads <= 1)
        {
            for (int ch = 0; ch < ChunkCount(len); ch++) Body(ch);
        }
        else
        {
            Parallel.For(0, ChunkCount(len), Options(threads), Body);
        }
    }

    // ---- kernels ----

    internal static Complex InnerKernel(ReadOnlySpan<Complex> a, ReadOnlySpan<Complex> b)
    {
        var x = MemoryMarshal.Cast<Complex, double>(a);
        var y = MemoryMarshal.Cast<Complex, double>(b);
        double re = 0, im = 0;
        int i = 0;
        if (Vector256.IsHardwareAccelerated && x.Length >= 8)
        {
            var swap = Vector256.Create(1L, 0L, 3L, 2L);
            var sign = Vector256.Create(1.0, -1.0, 1.0, -1.0);
            Vector256<double> accRe = Vector256<double>.Zero, accIm = Vector256<double>.Zero;
            for (; i <= x.Length - 4; i += 4)
            {
                var va = Vector256.Create(x.Slice(i, 4));
                var vb = Vector256.Create(y.Slice(i, 4));
                accRe += va * vb;                              // ar br, ai bi
                accIm += va * Vector256.Shuffle(vb, swap) * sign; // ar bi, -ai br
            }
            re = Vector256.Sum(accRe);
            im = Vector256.Sum(accIm);
        }
        for (; i < x.Length; i += 2)
        {
            re += x[i] * y[i] + x[i + 1] * y[i + 1];
            im += x[i] * y[i + 1] - x[i + 1] * y[i];
        }
        return new Complex(re, im);
    }

    internal static double NormKernel(ReadOnlySpan<Complex> a)
    {
        var x = MemoryMarshal.Cast<Complex, double>(a);
        return System.Numerics.Tensors.TensorPrimitives.Dot(x, x);
    }

    internal static void AxpyKernel(Complex alpha, ReadOnlySpan<Complex> x, Span<Complex> y)
    {
        var xd = MemoryMarshal.Cast<Complex, double>(x);
        var yd = MemoryMarshal.Cast<Complex, double>(y);
        int i = 0;
        if (Vector256.IsHardwareAccelerated && xd.Length >= 8)
        {
            var swap = Vector256.Create(1L, 0L, 3L, 2L);
            var ar = Vector256.Create(alpha.Real);
            var ai = Vector256.Create(-alpha.Imaginary, alpha.Imaginary, -alpha.Imaginary, alpha.Imaginary);
            for (; i <= xd.Length - 4; i += 4)
            {
                var vx = Vector256.Create(xd.Slice(i, 4));
                var vy = Vector256.Create(yd.Slice(i, 4));
                // (ar + i ai)(xr + i xi) = (ar xr - ai xi) + i (ar xi + ai xr)
                vy += ar * vx + ai * Vector256.Shuffle(vx, swap);
                vy.CopyTo(yd.Slice(i, 4));
            }
        }
        for (; i < xd.Length; i += 2)
        {
            double xr = xd[i], xi = xd[i + 1];
            yd[i] += alpha.Real * xr - alpha.Imaginary * xi;
            yd[i + 1] += alpha.Real * xi + alpha.Imaginary * xr;
        }
    }

    internal static void ScaleKernel(Span<Complex> a, Complex s)
    {
        if (s.Imaginary == 0)
        {
            var d = MemoryMarshal.Cast<Complex, double>(a);
            System.Numerics.Tensors.TensorPrimitives.Multiply(d, s.Real, d);
            return;
        }
        for (int i = 0; i < a.Length; i++) a[i] *= s;
    }

    internal static int ChunkCount(int length) => (length + (1 << ChunkBits) - 1) >> ChunkBits;

    internal static (int Start, int Length) Chunk(int c, int length)
    {
        int s = c << ChunkBits;
        return (s, Math.Min(1 << ChunkBits, length - s));
    }

    internal static ParallelOptions Options(int threads) => new() { MaxDegreeOfParallelism = Math.Max(1, threads) };

    private static void RequireSameLength(int a, int b)
    {
        if (a != b) throw new ArgumentException($"State vectors have different lengths ({a} and {b}).");
    }
}
