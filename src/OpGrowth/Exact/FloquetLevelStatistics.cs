using System.Diagnostics;
using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>Which symmetries of a periodic drive are resolved into sectors.</summary>
/// <param name="TotalZ">Total Z magnetisation (fixed number of down spins).</param>
/// <param name="Reflection">Site reversal j -&gt; N-1-j.</param>
/// <param name="SpinFlip">Global spin flip prod_j X_j.</param>
public sealed record FloquetSymmetries(bool TotalZ, bool Reflection, bool SpinFlip)
{
    /// <summary>Names of the resolved symmetries ("total-z", "reflection", "spin-flip").</summary>
    public IReadOnlyList<string> Names => new[] { (TotalZ, "total-z"), (Reflection, "reflection"), (SpinFlip, "spin-flip") }.Where(p => p.Item1).Select(p => p.Item2).ToArray();
}

/// <summary>Eigenphases of the one-period unitary in one symmetry sector.</summary>
/// <param name="Label">Sector label, e.g. "R=+1".</param>
/// <param name="Dimension">Sector dimension.</param>
/// <param name="Phases">Eigenphases arg(lambda) in (-pi, pi], ascending.</param>
/// <param name="Leakage">Largest weight a sector basis vector lost to other sectors after one period (0 when the symmetry holds).</param>
/// <param name="UnitarityDeviation">Largest | |lambda| - 1 | of the block's eigenvalues (self-check).</param>
public sealed record FloquetSectorPhases(string Label, int Dimension, double[] Phases, double Leakage, double UnitarityDeviation);

/// <summary>Settings of <see cref="FloquetLevelStatistics.Analyze"/>.</summary>
public sealed record FloquetLevelOptions
{
    /// <summary>Symmetries the model file declares ("time-reversal" makes a real drive COE).</summary>
    public IReadOnlyList<string> DeclaredSymmetries { get; init; } = [];

    /// <summary>Sectors smaller than this are left out of the statistics (too few ratios; common practice).</summary>
    public int MinimumSectorDimension { get; init; } = 32;

    /// <summary>Refuse sectors larger than this (a dense general eigenproblem costs ~ 25 D^3 flops).</summary>
    public int MaximumSectorDimension { get; init; } = 4096;

    /// <summary>Worker threads for building the blocks (0 = all cores).</summary>
    public int Threads { get; init; }

    /// <summary>Use LAPACK's zgeev when liblapacke is present (about four times faster than the managed solver).</summary>
    public bool UseNative { get; init; } = true;

    /// <summary>Progress log (optional).</summary>
    public ILogger? Logger { get; init; }
}

/// <summary>What <see cref="FloquetLevelStatistics.Analyze"/> measured.</summary>
public sealed record FloquetLevelResult
{
    /// <summary>Number of qubits.</summary>
    public required int N { get; init; }

    /// <summary>Pooled mean quasienergy gap ratio.</summary>
    public required double MeanRatio { get; init; }

    /// <summary>Its error bar.</summary>
    public required double StandardError { get; init; }

    /// <summary>How the error bar was computed.</summary>
    public required string ErrorKind { get; init; }

    /// <summary>Number of gap ratios pooled.</summary>
    public required int Gaps { get; init; }

    /// <summary>Drives (disorder realisations) pooled.</summary>
    public required int Realizations { get; init; }

    /// <summary>Circular ensemble of the chaotic reference: "COE" (time-reversal-symmetric drive) or "CUE".</summary>
    public required string EnsembleClass { get; init; }

    /// <summary>Why that ensemble was chosen.</summary>
    public required string EnsembleReason { get; init; }

    /// <summary>Reference &lt;r&gt; of that ensemble.</summary>
    public double EnsembleRatio => EnsembleClass == "COE" ? FloquetLevelStatistics.CoeRatio : FloquetLevelStatistics.CueRatio;

    /// <summary>Resolved symmetries.</summary>
    public required IReadOnlyList<string> Resolved { get; init; }

    /// <summary>Symmetries found (or declared) but not resolved: they bias &lt;r&gt; toward Poisson.</summary>
    public required IReadOnlyList<string> Unresolved { get; init; }

    /// <summary>Per-sector statistics of the first drive.</summary>
    public required IReadOnlyList<SectorStatistics> Sectors { get; init; }

    /// <summary>Largest leakage out of a sector over all blocks (self-check of the symmetry; ~1e-15 expected).</summary>
    public required double MaxLeakage { get; init; }

    /// <summary>Largest | |lambda| - 1 | over all blocks (self-check of the eigensolver; ~1e-14 expected).</summary>
    public required double MaxUnitarityDeviation { get; init; }

    /// <summary>"LAPACK zgeev" or "MathNet Evd".</summary>
    public required string Solver { get; init; }

    /// <summary>Warnings.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>Wall time.</summary>
    public required double Seconds { get; init; }
}

/// <summary>
/// Quasienergy statistics of a periodic drive: the one-period unitary U_F restricted to symmetry sectors,
/// its eigenphases, and the mean ratio of consecutive gaps on the circle, compared with Poisson
/// (2 ln 2 - 1 = 0.3863) and the circular ensembles COE (0.5307) and CUE (0.5996), which share the
/// values of GOE and GUE at large dimension.
/// </summary>
/// <remarks>
/// Source: D'Alessio and Rigol, PRX 4, 041048 (2014) (quasienergy gap ratios of driven chains; COE/CUE
/// equal GOE/GUE); Atas, Bogomolny, Giraud and Roux, PRL 110, 084101 (2013) (reference values);
/// Oganesyan and Huse, PRB 75, 155111 (2007) (the ratio). The density of quasienergies is uniform on the
/// circle, so every consecutive pair of gaps is used (no central cut, no unfolding).
/// <para>
/// Sector basis: the resolved symmetries (site reversal R, spin flip F, and total Z as a filter on the
/// basis states) act on basis states as commuting involutive permutations; a sector with characters
/// chi(g) = +-1 has basis |a~&gt; = |orbit a|^{-1/2} sum over the distinct g a of chi(g) |g a&gt; for orbit
/// representatives a (smallest index) whose stabiliser has trivial character (so an R-invariant a is
/// only in R = +1). The block is &lt;a~|U_F|b~&gt;, built by propagating each |b~&gt; over one period with
/// <see cref="FloquetPropagator"/> and projecting; the weight lost in the projection (leakage) checks
/// that the symmetry really holds.
/// </para>
/// </remarks>
public static class FloquetLevelStatistics
{
    /// <summary>Poisson mean gap ratio 2 ln 2 - 1.</summary>
    public static readonly double PoissonRatio = LevelStatistics.PoissonRatio;

    /// <summary>COE mean gap ratio (= GOE at large dimension; D'Alessio and Rigol 2014, Atas et al. 2013).</summary>
    public const double CoeRatio = LevelStatistics.GoeRatio;

    /// <summary>CUE mean gap ratio (= GUE at large dimension).</summary>
    public const double CueRatio = LevelStatistics.GueRatio;

    /// <summary>
    /// Size of the smaller member used for a drive when the battery's level-statistics size is
    /// <paramref name="levelN"/>: a drive's blocks are dense general (non-Hermitian) eigenproblems, several
    /// times costlier than the Hermitian ones of a Hamiltonian, so above 10 sites drives use two sites
    /// fewer (at most 12). Default battery (12) -&gt; 10: two reflection blocks of ~512, a few seconds.
    /// </summary>
    public static int DrivenSize(int levelN) => levelN <= 10 ? levelN : Math.Min(levelN - 2, 12);

    /// <summary>The Pauli string reflected site by site (j -&gt; N-1-j).</summary>
    public static PauliString Reflect(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        var b = new PauliString.Builder(s.N);
        for (int j = 0; j < s.N; j++) b.Set(s.N - 1 - j, s[j]);
        return b.Build();
    }

    private static bool IsIdentityRotation(PauliRotation r) => Math.Abs(Math.Sin(r.Angle / 2)) < 1e-14;

    private static bool InternallyCommuting(IReadOnlyList<PauliRotation> layer)
    {
        for (int i = 0; i < layer.Count; i++)
        {
            for (int j = i + 1; j < layer.Count; j++)
            {
                if (!layer[i].Generator.CommutesWith(layer[j].Generator)) return false;
            }
        }
        return true;
    }

    private static bool SameAngle(double a, double b)
    {
        // exp(-i a P/2) is 4 pi periodic in a.
        double d = Math.IEEERemainder(a - b, 4 * Math.PI);
        return Math.Abs(d) <= 1e-12 * Math.Max(1, Math.Abs(a));
    }

    /// <summary>
    /// True when two layers give the same unitary for sure: the same rotations in the same order, or, when
    /// both are internally commuting, the same multiset of rotations.
    /// </summary>
    private static bool SameLayer(IReadOnlyList<PauliRotation> a, IReadOnlyList<PauliRotation> b)
    {
        var aa = a.Where(r => !IsIdentityRotation(r)).ToList();
        var bb = b.Where(r => !IsIdentityRotation(r)).ToList();
        if (aa.Count != bb.Count) return false;
        if (aa.Zip(bb).All(p => p.First.Generator.Equals(p.Second.Generator) && SameAngle(p.First.Angle, p.Second.Angle))) return true;
        if (!InternallyCommuting(aa) || !InternallyCommuting(bb)) return false;
        var left = new List<PauliRotation>(bb);
        foreach (var r in aa)
        {
            int k = left.FindIndex(x => x.Generator.Equals(r.Generator) && SameAngle(x.Angle, r.Angle));
            if (k < 0)
            {
                // Commuting rotations with the same generator combine: compare total angles per generator.
                return SameByGenerator(aa, bb);
            }
            left.RemoveAt(k);
        }
        return true;
    }

    private static bool SameByGenerator(List<PauliRotation> a, List<PauliRotation> b)
    {
        static Dictionary<PauliString, double> Sum(List<PauliRotation> l)
        {
            var d = new Dictionary<PauliString, double>();
            foreach (var r in l) d[r.Generator] = d.GetValueOrDefault(r.Generator) + r.Angle;
            return d;
        }
        var da = Sum(a);
        var db = Sum(b);
        if (da.Count != db.Count) return false;
        return da.All(kv => db.TryGetValue(kv.Key, out double v) && SameAngle(kv.Value, v));
    }

    /// <summary>True when every layer maps to itself under the site reversal j -&gt; N-1-j (checked rotation by rotation).</summary>
    public static bool IsReflectionSymmetric(FloquetDrive drive)
    {
        ArgumentNullException.ThrowIfNull(drive);
        return drive.Layers.All(l => SameLayer(l, l.Select(r => r with { Generator = Reflect(r.Generator) }).ToList()));
    }

    /// <summary>True when every generator commutes with total Z (diagonal generators).</summary>
    public static bool ConservesTotalZ(FloquetDrive drive)
        => drive.Layers.SelectMany(l => l).Where(r => !IsIdentityRotation(r)).All(r => PauliMask.From(r.Generator).X == 0);

    /// <summary>True when every generator commutes with the spin flip prod X (an even number of Z and Y letters).</summary>
    public static bool ConservesSpinFlip(FloquetDrive drive)
        => drive.Layers.SelectMany(l => l).Where(r => !IsIdentityRotation(r)).All(r => (BitOperations.PopCount(PauliMask.From(r.Generator).Z) & 1) == 0);

    /// <summary>
    /// The circular ensemble of the chaotic reference. COE when every generator is real in the computational
    /// basis (an even number of Y) and either the layer sequence, read as a necklace (the period is cyclic),
    /// is a palindrome with every layer internally symmetric, or the model declares "time-reversal"; CUE
    /// otherwise. A necklace palindrome makes U_F unitarily equivalent (shift the origin of the period) to a
    /// product that reads the same backward; with real symmetric rotations that product equals its transpose.
    /// Source: Haake, Quantum Signatures of Chaos (Springer), ch. 2 and 4, on anti-unitary symmetries of
    /// Floquet operators (from memory).
    /// </summary>
    public static (string Class, string Reason) Classify(FloquetDrive drive, IReadOnlyList<string>? declared = null)
    {
        ArgumentNullException.ThrowIfNull(drive);
        bool real = drive.Layers.SelectMany(l => l).All(r => PauliMask.From(r.Generator).IsReal);
        bool declaredTr = declared?.Contains("time-reversal") == true;
        if (!real)
        {
            return ("CUE", declaredTr
                ? "a generator has an odd number of Y (complex in the computational basis), so the declared time reversal is not the plain complex conjugation; CUE assumed"
                : "a generator has an odd number of Y (complex rotations): no plain time-reversal symmetry");
        }
        var layers = drive.Layers;
        bool layersSymmetric = layers.All(l => InternallyCommuting(l) || SameLayer(l, l.Reverse().ToList()));
        int k = layers.Count;
        bool necklace = false;
        if (layersSymmetric)
        {
            for (int c = 0; c < k && !necklace; c++)
            {
                bool ok = true;
                for (int i = 0; i < k && ok; i++) ok = SameLayer(layers[i], layers[((c - i) % k + k) % k]);
                necklace = ok;
            }
        }
        if (necklace) return ("COE", "real generators and a layer sequence that reads the same backward (up to a cyclic shift of the period): time-reversal symmetric");
        if (declaredTr) return ("COE", "real generators and a declared time-reversal symmetry (the layer order is not a palindrome; taken from the model file)");
        return ("CUE", "real generators, but the layer order is not a palindrome and no time reversal is declared: CUE assumed");
    }

    /// <summary>
    /// Symmetries to resolve: those that hold rotation by rotation (reflection layer by layer). A symmetry
    /// that fails this check but still commutes with U_F (found with one random state) is reported in
    /// <paramref name="unresolved"/>.
    /// </summary>
    public static FloquetSymmetries Detect(FloquetDrive drive, int n, out IReadOnlyList<string> unresolved)
    {
        ArgumentNullException.ThrowIfNull(drive);
        var sym = new FloquetSymmetries(ConservesTotalZ(drive), n > 1 && IsReflectionSymmetric(drive), ConservesSpinFlip(drive));
        var un = new List<string>();
        var fp = new FloquetPropagator(n, drive, 1);
        var rng = new Random(12345);
        int dim = 1 << n;
        var psi = new Complex[dim];
        if (!sym.TotalZ)
        {
            int m = n / 2;
            for (int s = 0; s < dim; s++) psi[s] = BitOperations.PopCount((uint)s) == m ? new Complex(rng.NextDouble() - 0.5, rng.NextDouble() - 0.5) : 0;
            fp.Evolve(psi, drive.Period);
            double lost = 0, all = 0;
            for (int s = 0; s < dim; s++)
            {
                double w = psi[s].Magnitude * psi[s].Magnitude;
                all += w;
                if (BitOperations.PopCount((uint)s) != m) lost += w;
            }
            if (lost < 1e-20 * all) un.Add("total-z");
        }
        foreach (var (have, name, map) in new (bool, string, Func<int, int>)[]
        {
            (sym.Reflection || n < 2, "reflection", s => SymmetrySector.Reflect(s, n)),
            (sym.SpinFlip, "spin-flip", s => s ^ (dim - 1)),
        })
        {
            if (have) continue;
            var phi = new Complex[dim];
            for (int s = 0; s < dim; s++) phi[s] = new Complex(rng.NextDouble() - 0.5, rng.NextDouble() - 0.5);
            for (int s = 0; s < dim; s++) psi[s] = phi[s] + phi[map(s)];
            fp.Evolve(psi, drive.Period);
            double diff = 0, all = 0;
            for (int s = 0; s < dim; s++)
            {
                diff += (psi[s] - psi[map(s)]).Magnitude * (psi[s] - psi[map(s)]).Magnitude;
                all += psi[s].Magnitude * psi[s].Magnitude;
            }
            if (diff < 1e-20 * all) un.Add(name);
        }
        unresolved = un;
        return sym;
    }

    /// <summary>
    /// Eigenphases of U_F in every sector of the chosen symmetries (sectors of every size). Each sector's
    /// block is dense, D x D, built from D propagations over one period.
    /// </summary>
    public static IReadOnlyList<FloquetSectorPhases> SectorPhases(FloquetDrive drive, int n, FloquetSymmetries symmetries, int threads = 0, bool useNative = true, int maxDimension = 4096)
    {
        ArgumentNullException.ThrowIfNull(drive);
        ArgumentNullException.ThrowIfNull(symmetries);
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, 20);
        int threadCount = threads > 0 ? threads : Environment.ProcessorCount;
        var result = new List<FloquetSectorPhases>();
        foreach (var sector in Sectors(n, symmetries))
        {
            int d = sector.Dimension;
            if (d > maxDimension) throw new InvalidOperationException($"Sector {sector.Label} has dimension {d} > {maxDimension}: lower N.");
            var (block, leak) = Block(drive, n, sector, threadCount);
            var (phases, dev) = Eigenphases(block, d, useNative, out _);
            result.Add(new FloquetSectorPhases(sector.Label, d, phases, leak, dev));
        }
        return result;
    }

    private sealed record Sector(string Label, int Dimension, int[] RowOf, double[] Coef);

    // The sectors of the resolved symmetries (shared with the Hamiltonian path), written out as amplitudes.
    private static IEnumerable<Sector> Sectors(int n, FloquetSymmetries sym)
    {
        foreach (var sector in SymmetrySector.Enumerate(n, sym.TotalZ, sym.Reflection, sym.SpinFlip))
        {
            var (rowOf, amp) = sector.Expansion();
            yield return new Sector(sector.Label, sector.Dimension, rowOf, amp);
        }
    }

    // Column-major block <a~|U_F|b~> and the largest weight lost by a column.
    private static (Complex[] Block, double Leakage) Block(FloquetDrive drive, int n, Sector sector, int threads)
    {
        int d = sector.Dimension;
        int dim = 1 << n;
        var block = new Complex[(long)d * d];
        var leaks = new double[d];
        var po = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, threads) };
        Parallel.For(0, d, po,
            () => (new FloquetPropagator(n, drive, 1), new Complex[dim]),
            (col, _, local) =>
            {
                var (fp, psi) = local;
                Array.Clear(psi);
                // |a~>: every element t of a's orbit carries coef[t] (rowOf[t] == col).
                for (int t = 0; t < dim; t++) if (sector.RowOf[t] == col) psi[t] = sector.Coef[t];
                fp.Evolve(psi, drive.Period);
                long off = (long)col * d;
                for (int t = 0; t < dim; t++)
                {
                    int row = sector.RowOf[t];
                    if (row >= 0) block[off + row] += sector.Coef[t] * psi[t];
                }
                double w = 0;
                for (int row = 0; row < d; row++) w += block[off + row].Real * block[off + row].Real + block[off + row].Imaginary * block[off + row].Imaginary;
                leaks[col] = Math.Abs(1 - w);
                return local;
            },
            _ => { });
        return (block, leaks.Length == 0 ? 0 : leaks.Max());
    }

    /// <summary>
    /// Eigenphases (ascending, in (-pi, pi]) of a unitary d x d matrix stored column-major; returns the
    /// largest | |lambda| - 1 | and throws when it exceeds 1e-8 (the block is not unitary: a symmetry or
    /// the propagation is wrong). LAPACK zgeev when present, else MathNet's general complex Evd.
    /// </summary>
    public static (double[] Phases, double UnitarityDeviation) Eigenphases(Complex[] columnMajor, int d, bool useNative, out string solver)
    {
        ArgumentNullException.ThrowIfNull(columnMajor);
        if (columnMajor.Length != (long)d * d) throw new ArgumentException($"Expected {d * d} entries, got {columnMajor.Length}.", nameof(columnMajor));
        Complex[]? w = null;
        solver = "MathNet Evd";
        if (d == 0) return ([], 0);
        if (useNative && NativeLapack.TryGeneralEigenvalues(columnMajor, d, out var ev))
        {
            w = ev;
            solver = "LAPACK zgeev";
        }
        w ??= Matrix<Complex>.Build.Dense(d, d, columnMajor).Evd().EigenValues.ToArray();
        double dev = 0;
        var phases = new double[d];
        for (int i = 0; i < d; i++)
        {
            dev = Math.Max(dev, Math.Abs(w[i].Magnitude - 1));
            double p = w[i].Phase; // Atan2: in [-pi, pi]
            if (p <= -Math.PI) p += 2 * Math.PI;
            phases[i] = p;
        }
        if (dev > 1e-8) throw new InvalidOperationException(FormattableString.Invariant($"An eigenvalue of the one-period block has |lambda| - 1 = {dev:E2} (> 1e-8): the block is not unitary."));
        Array.Sort(phases);
        return (phases, dev);
    }

    /// <summary>
    /// Gap ratios of sorted eigenphases on the circle: gaps s_k = phi_{k+1} - phi_k and the wrap-around gap
    /// 2 pi + phi_0 - phi_last; r_k = min(s_k, s_{k+1}) / max(s_k, s_{k+1}) over all consecutive pairs
    /// (cyclically, D ratios from D phases). Exactly degenerate pairs (0/0) are skipped and counted.
    /// </summary>
    public static (double[] Ratios, int Degeneracies) CircularGapRatios(ReadOnlySpan<double> sortedPhases)
    {
        int d = sortedPhases.Length;
        if (d < 3) return ([], 0);
        var gaps = new double[d];
        for (int k = 0; k + 1 < d; k++) gaps[k] = sortedPhases[k + 1] - sortedPhases[k];
        gaps[d - 1] = 2 * Math.PI + sortedPhases[0] - sortedPhases[d - 1];
        var r = new List<double>(d);
        int deg = 0;
        for (int k = 0; k < d; k++)
        {
            double s1 = gaps[k], s2 = gaps[(k + 1) % d];
            double mx = Math.Max(s1, s2);
            if (mx <= 1e-12)
            {
                deg++;
                continue;
            }
            r.Add(Math.Min(s1, s2) / mx);
        }
        return ([.. r], deg);
    }

    /// <summary>
    /// Quasienergy gap-ratio statistics of one or more drives on <paramref name="n"/> qubits (disorder
    /// realisations: the symmetries and the ensemble are taken from the first).
    /// </summary>
    public static FloquetLevelResult Analyze(IReadOnlyList<FloquetDrive> realizations, int n, FloquetLevelOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(realizations);
        if (realizations.Count == 0) throw new ArgumentException("No drive given.", nameof(realizations));
        options ??= new FloquetLevelOptions();
        var sw = Stopwatch.StartNew();
        var log = options.Logger;
        var first = realizations[0];
        var sym = Detect(first, n, out var foundUnresolved);
        var (cls, why) = Classify(first, options.DeclaredSymmetries);
        var unresolved = new List<string>(foundUnresolved);
        foreach (var s in options.DeclaredSymmetries)
        {
            string name = s == "fermion-parity" ? "spin-flip" : s;
            if (name == "time-reversal" || sym.Names.Contains(name) || unresolved.Contains(name)) continue;
            unresolved.Add(name);
        }
        var warnings = new List<string>();
        if (options.DeclaredSymmetries.Contains("reflection") && !sym.Reflection)
            warnings.Add("the model declares a reflection symmetry, but a layer does not map to itself under j -> N-1-j: not resolved");
        var all = new List<double>();
        var perReal = new List<double>();
        var stats = new List<SectorStatistics>();
        double maxLeak = 0, maxDev = 0;
        string solver = "";
        for (int ri = 0; ri < realizations.Count; ri++)
        {
            var mine = new List<double>();
            foreach (var sector in Sectors(n, sym))
            {
                int d = sector.Dimension;
                if (d < options.MinimumSectorDimension) continue;
                if (d > options.MaximumSectorDimension) throw new InvalidOperationException($"Sector {sector.Label} has dimension {d} > {options.MaximumSectorDimension}: lower N.");
                var t0 = sw.Elapsed.TotalSeconds;
                var (block, leak) = Block(realizations[ri], n, sector, options.Threads > 0 ? options.Threads : Environment.ProcessorCount);
                var (phases, dev) = Eigenphases(block, d, options.UseNative, out solver);
                maxLeak = Math.Max(maxLeak, leak);
                maxDev = Math.Max(maxDev, dev);
                var (r, deg) = CircularGapRatios(phases);
                mine.AddRange(r);
                if (ri == 0)
                {
                    var (mean, se) = LevelStatistics.Mean(r);
                    stats.Add(new SectorStatistics(sector.Label, d, r.Length, mean, se, deg));
                }
                log?.LogInformation("quasienergy statistics: drive {R}, sector {Label}: D = {D}, <r> = {Mean:F4} ({S:F1} s, {Solver})", ri + 1, sector.Label, d, LevelStatistics.Mean(r).Mean, sw.Elapsed.TotalSeconds - t0, solver);
            }
            all.AddRange(mine);
            perReal.Add(LevelStatistics.Mean(mine).Mean);
        }
        if (maxLeak > 1e-10) warnings.Add(FormattableString.Invariant($"a sector basis vector lost {maxLeak:E1} of its weight over one period: the resolved symmetry does not hold exactly"));
        var (mAll, err, kind) = LevelStatistics.Pooled(all, perReal);
        return new FloquetLevelResult
        {
            N = n,
            MeanRatio = mAll,
            StandardError = err,
            ErrorKind = kind,
            Gaps = all.Count,
            Realizations = realizations.Count,
            EnsembleClass = cls,
            EnsembleReason = why,
            Resolved = sym.Names,
            Unresolved = unresolved,
            Sectors = stats,
            MaxLeakage = maxLeak,
            MaxUnitarityDeviation = maxDev,
            Solver = solver,
            Warnings = warnings,
            Seconds = sw.Elapsed.TotalSeconds,
        };
    }
}
