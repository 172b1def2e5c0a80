using System.Diagnostics;
using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// Exact out-of-time-order correlators of Pauli operators, at infinite and finite temperature, by
/// dense traces (small N) or by quantum typicality with random states (large N).
/// </summary>
/// <remarks>
/// <para>Definitions (conventions.md): F(t) = Tr(W(t) V W(t) V)/2^N at beta = 0; at beta &gt; 0 the regularised
/// OTOC Tr(y W(t) y V y W(t) y V) with y = rho^{1/4}, rho = e^{-beta H}/Z.</para>
/// <para>Typicality (Source: Bartsch and Gemmer, PRL 102, 110403 (2009); review: Heitmann, Richter,
/// Schubert, Steinigeweg, Z. Naturforsch. A 75, 421 (2020)): Tr(A)/d ~ &lt;r|A|r&gt; for a Haar-random unit
/// vector r, with statistical error of order d^{-1/2}. With q = e^{-beta H/4},
/// Tr(q W(t) q V q W(t) q V) = (q W(t) q V r)^dagger V (q W(t) q r) and Z ~ ||q^2 r||^2, so each estimate needs
/// the two vectors g = q U^dagger W U q r and h = q U^dagger W U q V r, U = e^{-iHt}. U q r is carried forward
/// from one time to the next (cheap); the backward U(t)^dagger must be applied afresh at each t (its input
/// depends on t), so one estimate costs two propagations of length t: the cost of a time grid grows like
/// (number of times) x (last time).</para>
/// <para>Site blocks (all three letters on a site for the price of one probe): take r = r' (x) |e&gt;_j with r'
/// random on the other N-1 sites and e = 0, 1 (the trace over site j is done exactly). For any V acting on
/// site j alone, V|r'e&gt; = sum_e' V_{e'e} |r'e'&gt;, so q W(t) q V |r'e&gt; = sum_e' V_{e'e} g_e' is a combination of
/// the two vectors g_e = q W(t) q |r'e&gt;: two back-propagations per time give F against X_j, Y_j and Z_j
/// together; the matrix elements &lt;g_e'|V|g_e&gt; come from one pass that forms the 2 x 2 x 2 x 2 cross-Gram
/// tensor of g_0, g_1 on site j. The letter average yields the site weight rho_j = (3/4)(1 - Fbar_j) and the
/// mean size n = sum_j rho_j (check-values.md).</para>
/// <para>A single random state cannot give the site weights of all sites at once: sum_a sigma^a_j W sigma^a_j =
/// 2 Tr_j(W) (x) I_j makes rho_j a quadratic functional of W(t), which needs two copies of W(t) acting on
/// states tied to site j; local data of one pair (r, W(t) r) carry it only at relative order 2^{-N}.
/// Hence the cost per site above.</para>
/// </remarks>
public static class ExactOtoc
{
    private static readonly Complex I = Complex.ImaginaryOne;

    // Pauli matrices sigma[a][f, f'] = <f|sigma^a|f'> for a = X, Y, Z.
    private static readonly Complex[][,] Sigma =
    [
        new Complex[,] { { 0, 1 }, { 1, 0 } },
        new Complex[,] { { 0, -I }, { I, 0 } },
        new Complex[,] { { 1, 0 }, { 0, -1 } },
    ];

    /// <summary>Runs the OTOC calculation for Hamiltonian <paramref name="h"/>.</summary>
    public static ExactOtocResult Run(Hamiltonian h, ExactOtocOptions options, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(h);
        return RunCore(h, null, options, cancellationToken);
    }

    /// <summary>
    /// Runs the OTOC calculation for a periodic drive of Pauli rotations on <paramref name="n"/> qubits
    /// (times must be whole periods; infinite temperature only: a drive has no thermal state).
    /// </summary>
    public static ExactOtocResult Run(FloquetDrive drive, int n, ExactOtocOptions options, CancellationToken cancellationToken = default)
    {
        ArgumentNullException.ThrowIfNull(drive);
        ArgumentNullException.ThrowIfNull(options);
        if (options.Beta != 0) throw new ArgumentException("A periodic drive has no thermal state: beta must be 0.", nameof(options));
        var fp = new FloquetPropagator(n, drive);
        foreach (double t in options.Times) fp.Periods(t);
        // The Hamiltonian slot only carries N for validation; the dynamics come from the drive.
        var carrier = new Hamiltonian(n, [new PauliTerm(PauliString.Identity(n), 1.0)]);
        return RunCore(carrier, drive, options, cancellationToken);
    }

    private static ExactOtocResult RunCore(Hamiltonian h, FloquetDrive? drive, ExactOtocOptions options, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(options);
        Validate(h, options);
        var method = options.Method == OtocMethod.Auto ? (h.N <= 8 ? OtocMethod.Dense : OtocMethod.Typicality) : options.Method;
        var sw = Stopwatch.StartNew();
        var sites = (options.Sites ?? Enumerable.Range(0, h.N).ToArray()).ToArray();
        var times = options.Times.ToArray();
        var acc = new Accumulator(sites.Length, options.Probes.Count, times.Length, Math.Max(1, options.Samples));
        var notes = new List<string>();
        long realProps = 0, imagProps = 0, matvecs = 0;
        double propError = 0;
        int samples;
        if (method == OtocMethod.Dense)
        {
            samples = 1;
            if (drive is null) RunDense(h, options, sites, times, acc, cancellationToken);
            else RunDenseFloquet(drive, h.N, options, sites, times, acc, cancellationToken);
        }
        else
        {
            samples = options.Samples;
            (realProps, imagProps, matvecs, propError) = RunTypicality(h, drive, options, sites, times, acc, cancellationToken);
        }
        var proc = Process.GetCurrentProcess();
        proc.Refresh();
        var cost = new OtocCost(realProps, imagProps, matvecs, sw.Elapsed.TotalSeconds, proc.PeakWorkingSet64, propError);
        return Assemble(h, options, method, samples, sites, times, acc, cost, notes);
    }

    private static void Validate(Hamiltonian h, ExactOtocOptions o)
    {
        if (o.Operator.N != h.N) throw new ArgumentException($"Operator acts on {o.Operator.N} qubits; the Hamiltonian on {h.N}.", nameof(o));
        if (h.N > PauliMask.MaxQubits) throw new ArgumentOutOfRangeException(nameof(h), h.N, $"State vectors hold at most {PauliMask.MaxQubits} qubits.");
        if (o.Operator.IsIdentity) throw new ArgumentException("The operator W must not be the identity.", nameof(o));
        if (o.Times.Count == 0) throw new ArgumentException("The time grid is empty.", nameof(o));
        for (int k = 0; k < o.Times.Count; k++)
        {
            double t = o.Times[k];
            if (!double.IsFinite(t) || t < 0) throw new ArgumentOutOfRangeException(nameof(o), t, "Times must be finite and non-negative.");
            if (k > 0 && t < o.Times[k - 1]) throw new ArgumentException($"Times must be ascending; found {o.Times[k - 1]} before {t}.", nameof(o));
        }
        foreach (int s in o.Sites ?? [])
        {
            if (s < 0 || s >= h.N) throw new ArgumentOutOfRangeException(nameof(o), s, $"Site {s} is outside 0..{h.N - 1}.");
        }
        if (o.EstimateMeanSize && o.Beta != 0) throw new ArgumentException("The mean-size estimate holds at beta = 0 only.", nameof(o));
        if (o.Sites is { Count: 0 } && o.Probes.Count == 0 && !o.EstimateMeanSize) throw new ArgumentException("Nothing to compute: no sites and no probes.", nameof(o));
        foreach (var p in o.Probes)
        {
            if (p.N != h.N) throw new ArgumentException($"Probe {p} acts on {p.N} qubits; the Hamiltonian on {h.N}.", nameof(o));
        }
        if (!double.IsFinite(o.Beta) || o.Beta < 0) throw new ArgumentOutOfRangeException(nameof(o), o.Beta, "Beta must be finite and non-negative.");
        if (o.Samples < 1) throw new ArgumentOutOfRangeException(nameof(o), o.Samples, "At least one sample is needed.");
        if (o.Method == OtocMethod.Dense && h.N > (o.AllowLargeDense ? DenseSpectrum.HardMaxQubits : DenseSpectrum.DefaultMaxQubits))
        {
            throw new ArgumentOutOfRangeException(nameof(o), h.N, $"Dense traces are limited to N <= {DenseSpectrum.DefaultMaxQubits}; use typicality.");
        }
    }

    // ---------------- typicality ----------------

    private static (long Real, long Imag, long MatVecs, double Error) RunTypicality(Hamiltonian h, FloquetDrive? drive, ExactOtocOptions o, int[] sites, double[] times, Accumulator acc, CancellationToken ct)
    {
        int n = h.N;
        int threads = o.Threads > 0 ? o.Threads : Environment.ProcessorCount;
        var app = new PauliHamiltonianApplier(h, threads);
        var cheb = drive is null ? new ChebyshevPropagator(app, o.Tolerance) : null;
        var floquet = drive is null ? null : new FloquetPropagator(n, drive, threads);
        var evolver = new Evolver(cheb, floquet);
        var imag = o.Beta > 0 ? new KrylovPropagator(app, new KrylovOptions { Tolerance = o.Tolerance }) : null;
        // The two branches e = 0, 1 of every time point are independent propagations: with two or more
        // threads each branch runs on its own thread with single-threaded kernels (no fork/join per
        // vector operation, which left a core idle half of the time). Each branch owns its propagators;
        // the spectral interval is shared so both branches use the same series.
        int branchThreads = threads >= 2 && (1 << n) >= StateVector.ParallelThreshold ? 2 : 1;
        var branches = new Branch[2];
        if (branchThreads == 2)
        {
            for (int e = 0; e < 2; e++)
            {
                var a1 = new PauliHamiltonianApplier(h, 1);
                var c1 = drive is null ? new ChebyshevPropagator(a1, o.Tolerance, cheb!.Bounds) : null;
                var f1 = drive is null ? null : new FloquetPropagator(n, drive, 1);
                var i1 = o.Beta > 0 ? new KrylovPropagator(a1, new KrylovOptions { Tolerance = o.Tolerance }) : null;
                branches[e] = new Branch(new Evolver(c1, f1), c1, i1, 1, o.Beta);
            }
        }
        else
        {
            branches[0] = branches[1] = new Branch(evolver, cheb, imag, threads, o.Beta);
        }
        void RunBranches(Action<int, Branch> body)
        {
            if (branchThreads == 2) Parallel.Invoke(() => body(0, branches[0]), () => body(1, branches[1]));
            else
            {
                body(0, branches[0]);
                body(1, branches[1]);
            }
        }
        long realProps = 0, imagProps = 0;
        void Q(Complex[] x)
        {
            if (imag is null) return;
            imag.EvolveImaginary(x, o.Beta / 4);
            imagProps++;
        }
        var w = PauliMask.From(o.Operator);
        int dim = 1 << n;
        var clock = Stopwatch.StartNew();
        o.Logger?.LogInformation("exact OTOC by typicality: N = {N}, {Sites} sites, {Probes} probes, {Times} times, {Samples} samples, beta = {Beta}, {Dynamics}",
            n, sites.Length, o.Probes.Count, times.Length, o.Samples, o.Beta, cheb is null ? "periodic drive" : FormattableString.Invariant($"spectrum in [{cheb.Bounds.Min:F3}, {cheb.Bounds.Max:F3}]"));

        // Vectors reused across blocks.
        var u = new[] { new Complex[dim], new Complex[dim] };
        var g = new[] { new Complex[dim], new Complex[dim] };
        var wq = new[] { new Complex[dim], new Complex[dim] };
        var tmp = new Complex[dim];
        // One time point for both branches e: carry u_e = U(t) q psi_e forward from t0, then
        // g_e = q U(t)^dagger W U(t) q psi_e (q = e^{-beta H/4}; nothing at beta = 0).
        void Advance(double t, double t0) => RunBranches((e, b) =>
        {
            if (t > t0) b.Evolve(u[e], t - t0);
            StateVector.ApplyPauli(w, u[e], g[e]);
            if (t > 0) b.Evolve(g[e], -t);
            b.Q(g[e]);
        });
        bool sizeProbe = o.EstimateMeanSize && !(sites.Length == n);
        int blocks = sites.Length + o.Probes.Count + (sizeProbe ? 1 : 0);
        int done = 0;

        for (int s = 0; s < o.Samples; s++)
        {
            // ---- site blocks ----
            for (int si = 0; si < sites.Length; si++)
            {
                ct.ThrowIfCancellationRequested();
                int j = sites[si];
                var rng = new Random(unchecked(o.Seed * 1_000_003 + s * 7919 + j * 104_729 + 17));
                var rest = new Complex[dim / 2];
                StateVector.FillHaarRandom(rest, rng);
                double zc = 0;
                for (int e = 0; e < 2; e++)
                {
                    StateVector.EmbedWithSite(rest, n, j, e, u[e]);
                    // normalisation sum_e ||q^2 psi_e||^2 and the autocorrelation partner q W q psi_e
                    if (imag is not null)
                    {
                        StateVector.ScaledCopy(u[e], 1, tmp, threads);
                        Q(tmp);
                        Q(tmp);
                        zc += StateVector.NormSquared(tmp, threads);
                    }
                    else
                    {
                        zc += 1;
                    }
                    Q(u[e]);                                   // u_e = q psi_e
                    StateVector.ApplyPauli(w, u[e], wq[e]);
                    Q(wq[e]);                                  // wq_e = q W q psi_e
                }
                double tPrev = 0;
                for (int k = 0; k < times.Length; k++)
                {
                    ct.ThrowIfCancellationRequested();
                    Advance(times[k], tPrev);
                    tPrev = times[k];
                    var letters = SiteLetters(g[0], g[1], n, j, threads);
                    for (int a = 0; a < 3; a++) acc.Site[si][a][s].Add(letters[a] / zc);
                    Complex ac = StateVector.Inner(g[0], wq[0], threads) + StateVector.Inner(g[1], wq[1], threads);
                    acc.Auto[k].Add(ac.Real / zc);
                }
                done++;
                o.Logger?.LogInformation("sample {S}/{Samples}, site {J}: done ({Done}/{Total} blocks, {Elapsed:F1} s)", s + 1, o.Samples, j, done, blocks * o.Samples, clock.Elapsed.TotalSeconds);
            }

            // ---- generic probes (Haar state on all N sites) ----
            for (int p = 0; p < o.Probes.Count; p++)
            {
                ct.ThrowIfCancellationRequested();
                var v = PauliMask.From(o.Probes[p]);
                var rng = new Random(unchecked(o.Seed * 1_000_003 + s * 7919 + (n + p) * 104_729 + 29));
                var r = new Complex[dim];
                StateVector.FillHaarRandom(r, rng);
                double zc = 1;
                if (imag is not null)
                {
                    StateVector.ScaledCopy(r, 1, tmp, threads);
                    Q(tmp);
                    Q(tmp);
                    zc = StateVector.NormSquared(tmp, threads);
                }
                // u[0] = q r ; u[1] = q V r
                StateVector.ScaledCopy(r, 1, u[0], threads);
                Q(u[0]);
                StateVector.ApplyPauli(v, r, u[1]);
                Q(u[1]);
                StateVector.ApplyPauli(w, u[0], wq[0]);
                Q(wq[0]);
                double tPrev = 0;
                for (int k = 0; k < times.Length; k++)
                {
                    ct.ThrowIfCancellationRequested();
                    Advance(times[k], tPrev);
                    tPrev = times[k];
                    // F = <h|V|g> / zc with g = g[0], h = g[1]
                    Complex num = StateVector.PauliMatrixElement(g[1], v, g[0]);
                    acc.Probe[p][s].Add(num.Real / zc);
                    acc.Auto[k].Add(StateVector.Inner(g[0], wq[0], threads).Real / zc);
                }
                done++;
                o.Logger?.LogInformation("sample {S}/{Samples}, probe {P}: done ({Done}/{Total} blocks, {Elapsed:F1} s)", s + 1, o.Samples, o.Probes[p], done, blocks * o.Samples, clock.Elapsed.TotalSeconds);
            }

            // ---- mean size for all sites at once: random-sign probe A = sum_k xi_k sigma_k ----
            // Source: Hutchinson, Commun. Stat. Simul. Comput. 18, 1059 (1989) (random-sign trace estimator).
            // E_xi Tr(W(t) A W(t) A)/D = sum_k F_k over the 3N single-site Paulis sigma_k (cross terms have
            // zero mean), and n(t) = (3/4) N - (1/4) sum_k F_k (OTOC-size identity, check-values.md).
            if (sizeProbe)
            {
                ct.ThrowIfCancellationRequested();
                var rng = new Random(unchecked(o.Seed * 1_000_003 + s * 7919 + 999_983));
                var r = new Complex[dim];
                StateVector.FillHaarRandom(r, rng);
                var paulis = new PauliMask[3 * n];
                var xi = new double[3 * n];
                for (int k = 0; k < 3 * n; k++)
                {
                    paulis[k] = PauliMask.From(PauliString.Single(n, k / 3, "XYZ"[k % 3]));
                    xi[k] = rng.Next(2) == 0 ? 1.0 : -1.0;
                }
                StateVector.ScaledCopy(r, 1, u[0], threads);
                StateVector.ApplyPauli(w, r, wq[0]); // W r, for the autocorrelation <W r|W(t) r>
                Array.Clear(u[1]);
                for (int k = 0; k < 3 * n; k++)
                {
                    StateVector.ApplyPauli(paulis[k], r, tmp);
                    StateVector.Axpy(xi[k], tmp, u[1], threads);
                }
                double tPrev = 0;
                for (int k = 0; k < times.Length; k++)
                {
                    ct.ThrowIfCancellationRequested();
                    Advance(times[k], tPrev);
                    tPrev = times[k];
                    Complex sum = 0;
                    for (int q = 0; q < 3 * n; q++) sum += xi[q] * StateVector.PauliMatrixElement(g[0], paulis[q], g[1]);
                    acc.Size[s].Add(0.75 * n - 0.25 * sum.Real);
                    acc.Auto[k].Add(StateVector.Inner(wq[0], g[0], threads).Real);
                }
                done++;
                o.Logger?.LogInformation("sample {S}/{Samples}, mean-size probe: done ({Elapsed:F1} s)", s + 1, o.Samples, clock.Elapsed.TotalSeconds);
            }
        }
        acc.RandomDimension = sites.Length > 0 ? dim / 2 : dim;
        long mv = (cheb?.MatrixVectorProducts ?? 0) + (imag?.MatrixVectorProducts ?? 0);
        double err = (cheb?.EstimatedError ?? 0) + (imag?.EstimatedError ?? 0);
        if (branchThreads == 2)
        {
            foreach (var b in branches)
            {
                mv += (b.Chebyshev?.MatrixVectorProducts ?? 0) + (b.Imaginary?.MatrixVectorProducts ?? 0);
                err += (b.Chebyshev?.EstimatedError ?? 0) + (b.Imaginary?.EstimatedError ?? 0);
            }
        }
        foreach (var b in branchThreads == 2 ? branches : [branches[0]])
        {
            realProps += b.RealPropagations;
            imagProps += b.ImaginaryPropagations;
        }
        return (realProps, imagProps, mv, err);
    }

    /// <summary>One branch's propagators and its propagation counts (a branch runs on one thread at a time).</summary>
    private sealed class Branch(Evolver evolver, ChebyshevPropagator? cheb, KrylovPropagator? imag, int threads, double beta)
    {
        public ChebyshevPropagator? Chebyshev => cheb;

        public KrylovPropagator? Imaginary => imag;

        public int Threads => threads;

        public long RealPropagations { get; private set; }

        public long ImaginaryPropagations { get; private set; }

        public void Evolve(Complex[] psi, double t)
        {
            evolver.Evolve(psi, t);
            RealPropagations++;
        }

        /// <summary>psi &lt;- e^{-beta H / 4} psi (nothing at beta = 0).</summary>
        public void Q(Complex[] psi)
        {
            if (imag is null) return;
            imag.EvolveImaginary(psi, beta / 4);
            ImaginaryPropagations++;
        }
    }

    private sealed class Evolver(ChebyshevPropagator? cheb, FloquetPropagator? floquet)
    {
        public void Evolve(Complex[] psi, double t)
        {
            if (cheb is not null) cheb.Evolve(psi, t);
            else floquet!.Evolve(psi, t);
        }
    }

    /// <summary>
    /// Re Tr over site j of the site block: for a = X, Y, Z, sum_{e,e'} conj(sigma_a[e',e]) &lt;g_e'|sigma_a|g_e&gt; with
    /// g_e = q W(t) q |r' e&gt;_j (divide by the normalisation to get F against sigma_a on site j).
    /// </summary>
    internal static double[] SiteLetters(Complex[] g0, Complex[] g1, int n, int site, int threads)
    {
        var gram = SiteGram(g0, g1, n, site, threads);
        var r = new double[3];
        for (int a = 0; a < 3; a++)
        {
            Complex num = 0;
            for (int e = 0; e < 2; e++)
            {
                for (int ep = 0; ep < 2; ep++)
                {
                    // <g_e'|sigma|g_e> = sum_{f,f'} sigma[f,f'] G[e',e,f,f']
                    Complex m = 0;
                    for (int f = 0; f < 2; f++)
                    {
                        for (int fp = 0; fp < 2; fp++) m += Sigma[a][f, fp] * gram[(((ep * 2) + e) * 2 + f) * 2 + fp];
                    }
                    num += Complex.Conjugate(Sigma[a][ep, e]) * m;
                }
            }
            r[a] = num.Real;
        }
        return r;
    }

    /// <summary>G[e',e,f,f'] = sum over the other sites of conj(g_e'[.., f]) g_e[.., f'] (f = value of site j's bit).</summary>
    internal static Complex[] SiteGram(Complex[] g0, Complex[] g1, int n, int site, int threads)
    {
        int b = PauliMask.BitOfSite(n, site);
        int half = g0.Length / 2;
        int low = (1 << b) - 1;
        int chunks = StateVector.ChunkCount(half);
        var parts = new Complex[chunks][];
        var gs = new[] { g0, g1 };
        void Body(int c)
        {
            var (start, len) = StateVector.Chunk(c, half);
            var sum = new Complex[16];
            for (int r = start; r < start + len; r++)
            {
                int i0 = ((r & ~low) << 1) | (r & low);
                int i1 = i0 | (1 << b);
                for (int ep = 0; ep < 2; ep++)
                {
                    var a = gs[ep];
                    Complex a0 = Complex.Conjugate(a[i0]), a1 = Complex.Conjugate(a[i1]);
                    for (int e = 0; e < 2; e++)
                    {
                        var x = gs[e];
                        Complex x0 = x[i0], x1 = x[i1];
                        int baseIdx = ((ep * 2) + e) * 4;
                        sum[baseIdx + 0] += a0 * x0;
                        sum[baseIdx + 1] += a0 * x1;
                        sum[baseIdx + 2] += a1 * x0;
                        sum[baseIdx + 3] += a1 * x1;
                    }
                }
            }
            parts[c] = sum;
        }
        if (half < StateVector.ParallelThreshold || threads <= 1)
        {
            for (int c = 0; c < chunks; c++) Body(c);
        }
        else
        {
            Parallel.For(0, chunks, StateVector.Options(threads), Body);
        }
        var total = new Complex[16];
        foreach (var p in parts)
        {
            for (int k = 0; k < 16; k++) total[k] += p[k];
        }
        return total;
    }

    // ---------------- dense ----------------

    private static void RunDense(Hamiltonian h, ExactOtocOptions o, int[] sites, double[] times, Accumulator acc, CancellationToken ct)
    {
        int n = h.N;
        int d = 1 << n;
        o.Logger?.LogInformation("exact OTOC by dense diagonalisation: N = {N}, dimension {D}", n, d);
        var spec = DenseSpectrum.Compute(h, o.AllowLargeDense);
        var q = spec.Vectors;
        var e = spec.Energies;
        // y_m = e^{-beta E_m / 4} / Z^{1/4}, energies shifted by E_0 for range.
        var y = new double[d];
        double z = 0;
        for (int m = 0; m < d; m++) z += Math.Exp(-o.Beta * (e[m] - e[0]));
        for (int m = 0; m < d; m++) y[m] = Math.Exp(-o.Beta * (e[m] - e[0]) / 4) / Math.Pow(z, 0.25);
        var wMask = PauliMask.From(o.Operator);
        var qa = q.ToColumnMajorArray();
        var wq = new Complex[(long)d * d];
        for (int col = 0; col < d; col++)
        {
            for (int i = 0; i < d; i++)
            {
                ulong src = (ulong)i ^ wMask.X;
                wq[(long)col * d + i] = wMask.Factor(src) * qa[(long)col * d + (int)src];
            }
        }
        var we = q.ConjugateTransposeThisAndMultiply(Matrix<Complex>.Build.Dense(d, d, wq)).ToColumnMajorArray();
        var letters = new List<(int SiteIndex, int Letter, PauliMask Mask)>();
        for (int si = 0; si < sites.Length; si++)
        {
            for (int a = 0; a < 3; a++) letters.Add((si, a, PauliMask.From(PauliString.Single(n, sites[si], "XYZ"[a]))));
        }
        var probes = o.Probes.Select(PauliMask.From).ToArray();
        var be = new Complex[(long)d * d];
        Complex[] ComputeB(double t)
        {
            for (int col = 0; col < d; col++)
            {
                for (int m = 0; m < d; m++)
                {
                    be[(long)col * d + m] = y[m] * y[col] * Complex.Exp(new Complex(0, (e[m] - e[col]) * t)) * we[(long)col * d + m];
                }
            }
            var bm = q * Matrix<Complex>.Build.Dense(d, d, be);
            return bm.ConjugateTransposeAndMultiply(q).ToColumnMajorArray(); // B = y W(t) y in the computational basis
        }
        Complex[]? b0 = times[0] == 0 ? null : ComputeB(0);
        for (int k = 0; k < times.Length; k++)
        {
            ct.ThrowIfCancellationRequested();
            double t = times[k];
            var b = ComputeB(t);
            b0 ??= b;
            foreach (var (si, a, mask) in letters) acc.Site[si][a][0].Add(TraceBVBV(b, mask, d));
            for (int p = 0; p < probes.Length; p++) acc.Probe[p][0].Add(TraceBVBV(b, probes[p], d));
            Complex ac = 0;
            for (int i = 0; i < d; i++)
            {
                for (int kk = 0; kk < d; kk++) ac += b[(long)kk * d + i] * b0[(long)i * d + kk];
            }
            acc.Auto[k].Add(ac.Real);
            o.Logger?.LogDebug("dense OTOC: t = {T} done", t);
        }
        acc.RandomDimension = 0;
    }

    private static void RunDenseFloquet(FloquetDrive drive, int n, ExactOtocOptions o, int[] sites, double[] times, Accumulator acc, CancellationToken ct)
    {
        int d = 1 << n;
        if (n > (o.AllowLargeDense ? DenseSpectrum.HardMaxQubits : DenseSpectrum.DefaultMaxQubits)) throw new ArgumentOutOfRangeException(nameof(n), n, "Dense traces are limited to small N.");
        o.Logger?.LogInformation("exact OTOC by dense period unitary: N = {N}, dimension {D}", n, d);
        var fp = new FloquetPropagator(n, drive, o.Threads);
        // U of one period, column by column.
        var u = Matrix<Complex>.Build.Dense(d, d);
        var col = new Complex[d];
        for (int c = 0; c < d; c++)
        {
            Array.Clear(col);
            col[c] = 1;
            fp.Evolve(col, fp.Period);
            for (int r = 0; r < d; r++) u[r, c] = col[r];
        }
        var wMask = PauliMask.From(o.Operator);
        var w = Matrix<Complex>.Build.Dense(d, d);
        for (int k = 0; k < d; k++) w[(int)((ulong)k ^ wMask.X), k] = wMask.Factor((ulong)k);
        var letters = new List<(int SiteIndex, int Letter, PauliMask Mask)>();
        for (int si = 0; si < sites.Length; si++)
        {
            for (int a = 0; a < 3; a++) letters.Add((si, a, PauliMask.From(PauliString.Single(n, sites[si], "XYZ"[a]))));
        }
        var probes = o.Probes.Select(PauliMask.From).ToArray();
        double scale = 1 / Math.Sqrt(d); // B = W(t)/sqrt(D) so that Tr(BVBV) = Tr(W(t)VW(t)V)/D
        var wt = w;
        int m = 0;
        var b0 = (w * scale).ToColumnMajorArray();
        for (int k = 0; k < times.Length; k++)
        {
            ct.ThrowIfCancellationRequested();
            int target = fp.Periods(times[k]);
            for (; m < target; m++) wt = u.ConjugateTransposeThisAndMultiply(wt * u); // W(m+1) = U^dagger W(m) U
            var b = (wt * scale).ToColumnMajorArray();
            foreach (var (si, a, mask) in letters) acc.Site[si][a][0].Add(TraceBVBV(b, mask, d));
            for (int p = 0; p < probes.Length; p++) acc.Probe[p][0].Add(TraceBVBV(b, probes[p], d));
            Complex ac = 0;
            for (int i = 0; i < d; i++)
            {
                for (int kk = 0; kk < d; kk++) ac += b[(long)kk * d + i] * b0[(long)i * d + kk];
            }
            acc.Auto[k].Add(ac.Real);
        }
        acc.RandomDimension = 0;
    }

    // Tr(B V B V) = sum_{i,k} B[i,k] conj(phi(k)) phi(i) B[k^x, i^x], V|i> = phi(i)|i^x>; B column-major.
    private static double TraceBVBV(Complex[] b, PauliMask v, int d)
    {
        Complex s = 0;
        for (int k = 0; k < d; k++)
        {
            Complex pk = Complex.Conjugate(v.Factor((ulong)k));
            int kx = (int)((ulong)k ^ v.X);
            for (int i = 0; i < d; i++)
            {
                int ix = (int)((ulong)i ^ v.X);
                s += b[(long)k * d + i] * pk * v.Factor((ulong)i) * b[(long)ix * d + kx];
            }
        }
        return s.Real;
    }

    // ---------------- assembly ----------------

    private sealed class Accumulator
    {
        // Site[si][letter][sample] = values over time; Probe[p][sample]; Auto[time] = all estimates.
        public readonly List<double>[][][] Site;
        public readonly List<double>[][] Probe;
        public readonly List<double>[] Auto;
        public readonly List<double>[] Size;
        public int RandomDimension;

        public Accumulator(int sites, int probes, int times, int samples)
        {
            Site = new List<double>[sites][][];
            for (int i = 0; i < sites; i++)
            {
                Site[i] = new List<double>[3][];
                for (int a = 0; a < 3; a++) Site[i][a] = NewSamples(samples);
            }
            Probe = new List<double>[probes][];
            for (int p = 0; p < probes; p++) Probe[p] = NewSamples(samples);
            Auto = Enumerable.Range(0, times).Select(_ => new List<double>()).ToArray();
            Size = NewSamples(samples);
        }

        private static List<double>[] NewSamples(int max) => Enumerable.Range(0, max).Select(_ => new List<double>()).ToArray();
    }

    private static ExactOtocResult Assemble(Hamiltonian h, ExactOtocOptions o, OtocMethod method, int samples, int[] sites, double[] times, Accumulator acc, OtocCost cost, List<string> notes)
    {
        int nt = times.Length;
        bool dense = method == OtocMethod.Dense;
        // A mean over a few random states: its error bar is a Student-t interval (samples - 1 degrees of freedom),
        // not a Gaussian one, so it covers the stated probability (68.3%, the Gaussian one-sigma coverage).
        // Source: W. S. Gosset ("Student"), Biometrika 6, 1 (1908).
        double tFactor = samples > 1 ? TypicalityInterval.Factor(samples) : 1;
        string errorKind = dense ? "none (exact trace)"
            : samples > 1 ? FormattableString.Invariant($"half-width of the {100 * TypicalityInterval.Coverage:0}% Student-t interval over {samples} random states ({samples - 1} degrees of freedom: {tFactor:0.###} standard errors)")
            : "a-priori Haar estimate sqrt((1 - F^2)/(d + 1)) from one random state (one standard deviation)";
        if (!dense && samples == 1 && o.Beta > 0) notes.Add("With one random state at beta > 0 the a-priori error assumes an effective dimension d; it underestimates the error when few levels carry the thermal weight.");

        (double[] Mean, double[] Err, double[][] PerSample) Reduce(List<double>[] perSample)
        {
            var rows = perSample.Take(samples).Select(l => l.ToArray()).ToArray();
            var mean = new double[nt];
            var err = new double[nt];
            for (int k = 0; k < nt; k++)
            {
                double m = rows.Average(r => r[k]);
                mean[k] = m;
                if (dense) err[k] = 0;
                else if (samples > 1) err[k] = tFactor * Math.Sqrt(rows.Sum(r => (r[k] - m) * (r[k] - m)) / (samples - 1) / samples);
                else err[k] = Math.Sqrt(Math.Max(0, 1 - m * m) / (acc.RandomDimension + 1.0));
            }
            return (mean, err, rows);
        }

        var siteResults = new List<SiteOtoc>();
        var fits = new List<OtocGrowthFit>();
        double[]? sizeMean = null, sizeVar = null;
        bool allSites = sites.Length == h.N && o.Beta == 0;
        if (allSites)
        {
            sizeMean = new double[nt];
            sizeVar = new double[nt];
        }
        for (int si = 0; si < sites.Length; si++)
        {
            int j = sites[si];
            var red = new (double[] Mean, double[] Err, double[][] Rows)[3];
            for (int a = 0; a < 3; a++) red[a] = Reduce(acc.Site[si][a]);
            // Letter average per sample (letters share the random state, so average before the error).
            var avgRows = Enumerable.Range(0, red[0].Rows.Length).Select(s => Enumerable.Range(0, nt).Select(k => (red[0].Rows[s][k] + red[1].Rows[s][k] + red[2].Rows[s][k]) / 3).ToArray()).ToArray();
            var avgLists = avgRows.Select(r => r.ToList()).ToArray();
            var mean = Reduce(avgLists);
            var weight = mean.Mean.Select(f => 0.75 * (1 - f)).ToArray();
            var weightErr = mean.Err.Select(x => 0.75 * x).ToArray();
            siteResults.Add(new SiteOtoc(j,
                new OtocSeries($"X_{j}", red[0].Mean, red[0].Err),
                new OtocSeries($"Y_{j}", red[1].Mean, red[1].Err),
                new OtocSeries($"Z_{j}", red[2].Mean, red[2].Err),
                new OtocSeries($"mean_{j}", mean.Mean, mean.Err),
                new OtocSeries($"weight_{j}", weight, weightErr)));
            if (allSites)
            {
                for (int k = 0; k < nt; k++)
                {
                    sizeMean![k] += weight[k];
                    sizeVar![k] += weightErr[k] * weightErr[k];
                }
            }
            fits.Add(GrowthRate.Fit($"mean_{j}", times, mean.Mean, o.Beta, o.FitRange.Low, o.FitRange.High));
        }
        var probeResults = new List<OtocSeries>();
        for (int p = 0; p < o.Probes.Count; p++)
        {
            var red = Reduce(acc.Probe[p]);
            probeResults.Add(new OtocSeries(o.Probes[p].ToString(), red.Mean, red.Err));
            fits.Add(GrowthRate.Fit(o.Probes[p].ToString(), times, red.Mean, o.Beta, o.FitRange.Low, o.FitRange.High));
        }
        // Autocorrelation: all estimates at each time are independent states.
        var autoMean = new double[nt];
        var autoErr = new double[nt];
        for (int k = 0; k < nt; k++)
        {
            var v = acc.Auto[k];
            double m = v.Count > 0 ? v.Average() : double.NaN;
            autoMean[k] = m;
            autoErr[k] = dense || v.Count < 2 ? (dense ? 0 : double.NaN) : Math.Sqrt(v.Sum(x => (x - m) * (x - m)) / (v.Count - 1) / v.Count);
        }
        OtocSeries? probeSize = null;
        if (!allSites && acc.Size[0].Count == nt)
        {
            var (sm, se, _) = Reduce(acc.Size);
            if (samples == 1) se = sm.Select(_ => double.NaN).ToArray();
            probeSize = new OtocSeries("mean size", sm, se);
            notes.Add("Mean size from the random-sign probe: unbiased; its error bar (over samples) includes the sign randomness.");
        }
        if (fits.Any(f => f.Points >= 3 && f.RSquared < 0.9)) notes.Add("Some growth fits have R^2 < 0.9: no clean exponential regime in the window (expected for short-range 1D chains).");
        if (o.Beta == 0) notes.Add("lambda/(2 pi T) is not defined at beta = 0 (infinite temperature).");
        return new ExactOtocResult
        {
            N = h.N,
            Operator = o.Operator.ToString(),
            Beta = o.Beta,
            Method = dense ? "dense" : "typicality",
            Samples = samples,
            ErrorKind = errorKind,
            Times = times,
            Autocorrelation = new OtocSeries("autocorrelation", autoMean, autoErr),
            Sites = siteResults,
            Probes = probeResults,
            MeanSize = allSites ? new OtocSeries("mean size", sizeMean!, sizeVar!.Select(Math.Sqrt).ToArray()) : probeSize,
            MeanSizeMethod = allSites ? "site-resolved OTOCs" : probeSize is not null ? "random-sign probe" : "none",
            Fits = fits,
            Cost = cost,
            Notes = notes,
        };
    }
}
