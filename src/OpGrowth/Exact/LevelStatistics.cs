using System.Diagnostics;
using System.Numerics;
using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>
/// Spectral statistics: the mean ratio of consecutive level spacings r_n = min(s_n, s_n+1)/max(s_n, s_n+1)
/// within symmetry sectors, compared with Poisson (integrable) and Wigner-Dyson (chaotic) values.
/// </summary>
/// <remarks>
/// Source: Oganesyan and Huse, PRB 75, 155111 (2007) (the gap ratio); Atas, Bogomolny, Giraud and Roux,
/// PRL 110, 084101 (2013) (reference values: Poisson 2 ln 2 - 1 = 0.3863, GOE 0.5307, GUE 0.5996 at large
/// dimension). The ratio needs no unfolding, but it needs every symmetry resolved: merged independent
/// blocks look closer to Poisson.
/// </remarks>
public static class LevelStatistics
{
    /// <summary>Poisson mean gap ratio 2 ln 2 - 1.</summary>
    public static readonly double PoissonRatio = 2 * Math.Log(2) - 1;

    /// <summary>GOE mean gap ratio at large dimension (Atas et al. 2013).</summary>
    public const double GoeRatio = 0.5307;

    /// <summary>GUE mean gap ratio at large dimension (Atas et al. 2013).</summary>
    public const double GueRatio = 0.5996;

    /// <summary>Names of the symmetries resolved by default (no spatial candidates given: the chain reflection only).</summary>
    public static readonly IReadOnlyList<string> Supported = ["total-z", "reflection", "spin-flip"];

    /// <summary>Gap ratios of sorted levels, keeping the central <paramref name="centralFraction"/> of the levels; exact 0/0 ratios are skipped and counted.</summary>
    public static (double[] Ratios, int Degeneracies) GapRatios(ReadOnlySpan<double> sortedLevels, double centralFraction = 1.0)
    {
        if (!(centralFraction > 0 && centralFraction <= 1)) throw new ArgumentOutOfRangeException(nameof(centralFraction), centralFraction, "Fraction must lie in (0, 1].");
        int multiplicity = UniformMultiplicity(sortedLevels);
        if (multiplicity > 1)
        {
            // Every level sits in a multiplet of the same size (Kramers pairs of an anti-unitary
            // symmetry, e.g. SYK with 2N mod 8 = 4 Majoranas, or a non-abelian symmetry): the statistics
            // of the distinct levels are the meaningful ones, so keep one level per multiplet.
            var distinct = new double[sortedLevels.Length / multiplicity];
            for (int i = 0; i < distinct.Length; i++) distinct[i] = sortedLevels[i * multiplicity];
            return GapRatios(distinct, centralFraction);
        }
        int l = sortedLevels.Length;
        int lo = (int)Math.Floor((1 - centralFraction) / 2 * l);
        int hi = l - lo;
        var r = new List<double>(Math.Max(0, hi - lo));
        int deg = 0;
        for (int i = lo + 1; i + 1 < hi; i++)
        {
            double s1 = sortedLevels[i] - sortedLevels[i - 1];
            double s2 = sortedLevels[i + 1] - sortedLevels[i];
            double mx = Math.Max(s1, s2);
            double scale = 1e-12 * (Math.Abs(sortedLevels[i]) + 1);
            if (mx <= scale)
            {
                deg++;
                continue;
            }
            r.Add(Math.Min(s1, s2) / mx);
        }
        return ([.. r], deg);
    }

    /// <summary>
    /// The common size m &gt; 1 of exact multiplets when every level of the spectrum belongs to one of
    /// that size (levels equal to 1e-10 of the spectrum's width), else 1.
    /// </summary>
    public static int UniformMultiplicity(ReadOnlySpan<double> sortedLevels)
    {
        int l = sortedLevels.Length;
        if (l < 8) return 1;
        double tol = 1e-10 * Math.Max(1e-300, sortedLevels[l - 1] - sortedLevels[0]);
        int m = 1;
        while (m < l && sortedLevels[m] - sortedLevels[0] <= tol) m++;
        if (m == 1 || l % m != 0 || l / m < 4) return 1;
        for (int start = 0; start < l; start += m)
        {
            if (sortedLevels[start + m - 1] - sortedLevels[start] > tol) return 1;
            if (start + m < l && sortedLevels[start + m] - sortedLevels[start + m - 1] <= tol) return 1;
        }
        return m;
    }

    /// <summary>Mean and standard error of a set of ratios.</summary>
    public static (double Mean, double StandardError) Mean(IReadOnlyList<double> r)
    {
        ArgumentNullException.ThrowIfNull(r);
        if (r.Count == 0) return (double.NaN, double.NaN);
        double m = r.Average();
        double se = r.Count > 1 ? Math.Sqrt(r.Sum(x => (x - m) * (x - m)) / (r.Count - 1) / r.Count) : double.NaN;
        return (m, se);
    }

    /// <summary>
    /// Mean gap ratio pooled over every ratio, and its error bar: with three or more realisations the
    /// standard error over realisation means (gaps within one spectrum are correlated), otherwise the
    /// standard error over the ratios.
    /// </summary>
    public static (double Mean, double Error, string Kind) Pooled(IReadOnlyList<double> all, IReadOnlyList<double> perRealization)
    {
        ArgumentNullException.ThrowIfNull(all);
        ArgumentNullException.ThrowIfNull(perRealization);
        var (mean, seGaps) = Mean(all);
        return perRealization.Count >= 3
            ? (mean, Mean(perRealization).StandardError, $"standard error over {perRealization.Count} realisations")
            : (mean, seGaps, "standard error over gap ratios (neighbouring ratios weakly correlated: common practice)");
    }

    /// <summary>Eigenvalues (ascending) of a real symmetric matrix, row-major (overwritten); LAPACK when present.</summary>
    public static double[] SymmetricEigenvalues(double[] a, int n, int threads = 0, bool useNative = true)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (useNative && NativeLapack.TrySymmetricEigen(a, n, vectors: false, out var w)) return w;
        return SymmetricEigen.Eigenvalues(a, n, threads > 0 ? threads : Environment.ProcessorCount);
    }

    /// <summary>
    /// Eigenvalues (ascending) of a complex Hermitian matrix, row-major. LAPACK when present; otherwise the
    /// real symmetric embedding [[A, -B], [B, A]] of A + iB, whose spectrum is that of A + iB twice.
    /// </summary>
    public static double[] HermitianEigenvalues(Complex[] a, int n, int threads = 0, bool useNative = true)
    {
        ArgumentNullException.ThrowIfNull(a);
        if (useNative)
        {
            // LAPACK wants column-major: the transpose of a Hermitian matrix is its conjugate, same spectrum.
            var copy = (Complex[])a.Clone();
            if (NativeLapack.TryHermitianEigen(copy, n, vectors: false, out var w)) return w;
        }
        int m = 2 * n;
        var big = new double[(long)m * m];
        for (int i = 0; i < n; i++)
        {
            for (int j = 0; j < n; j++)
            {
                var z = a[(long)i * n + j];
                big[(long)i * m + j] = z.Real;
                big[(long)(i + n) * m + j + n] = z.Real;
                big[(long)i * m + j + n] = -z.Imaginary;
                big[(long)(i + n) * m + j] = z.Imaginary;
            }
        }
        var all = SymmetricEigen.Eigenvalues(big, m, threads > 0 ? threads : Environment.ProcessorCount);
        var res = new double[n];
        for (int i = 0; i < n; i++) res[i] = 0.5 * (all[2 * i] + all[2 * i + 1]);
        return res;
    }

    /// <summary>Supported symmetries that commute with H (total Z, the chain reflection, spin flip).</summary>
    public static IReadOnlyList<string> DetectSymmetries(Hamiltonian h)
        => DetectSymmetries(h, [SitePermutation.Reversal(h.N)], null);

    /// <summary>
    /// Symmetries that commute with H: "total-z", the names of the candidate site permutations (and of the
    /// swap) that map H onto itself, and "spin-flip", in that order.
    /// </summary>
    public static IReadOnlyList<string> DetectSymmetries(Hamiltonian h, IReadOnlyList<SitePermutation> candidates, SitePermutation? swap)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(candidates);
        var found = new List<string>();
        if (CommutesWithTotalZ(h)) found.Add("total-z");
        foreach (var p in candidates) if (p.N == h.N && !p.IsIdentity && p.IsSymmetryOf(h)) found.Add(p.Name);
        if (swap is not null && swap.N == h.N && !swap.IsIdentity && swap.IsSymmetryOf(h)) found.Add(swap.Name);
        // prod_j X_j commutes with a string iff the string has an even number of Z-type letters (Z or Y).
        if (h.Terms.All(t => (ZCount(t.String) & 1) == 0)) found.Add("spin-flip");
        return found;
    }

    /// <summary>
    /// The mirrors to resolve among <paramref name="candidates"/> named in <paramref name="wanted"/>: each is
    /// taken when it is an involution commuting with those already taken and not their product. Also
    /// returns the names of every candidate that lies in the group they generate (resolved implicitly).
    /// </summary>
    public static (IReadOnlyList<SitePermutation> Mirrors, IReadOnlyList<string> Covered) ChooseMirrors(IReadOnlyList<SitePermutation> candidates, IEnumerable<string> wanted)
    {
        ArgumentNullException.ThrowIfNull(candidates);
        ArgumentNullException.ThrowIfNull(wanted);
        var want = wanted.ToHashSet();
        var chosen = new List<SitePermutation>();
        var group = new List<SitePermutation>();
        foreach (var p in candidates)
        {
            if (!want.Contains(p.Name) || p.IsIdentity || !p.IsInvolution) continue;
            if (group.Any(g => g.SameMap(p))) continue;
            if (!chosen.All(q => q.CommutesWith(p))) continue;
            chosen.Add(p);
            if (group.Count == 0) group.Add(new SitePermutation("identity", Enumerable.Range(0, p.N).ToArray()));
            group.AddRange(group.Select(g => p.After(g)).ToArray());
        }
        var covered = candidates.Where(p => want.Contains(p.Name) && group.Any(g => g.SameMap(p))).Select(p => p.Name).ToList();
        return (chosen, covered);
    }

    private static int ZCount(PauliString s)
    {
        int c = 0;
        foreach (ulong w in s.Z) c += BitOperations.PopCount(w);
        return c;
    }

    private static bool CommutesWithTotalZ(Hamiltonian h)
    {
        var acc = new Dictionary<PauliString, Complex>();
        double scale = h.Terms.Sum(t => Math.Abs(t.Coefficient)) + 1e-300;
        foreach (var t in h.Terms)
        {
            for (int j = 0; j < h.N; j++)
            {
                if (!PauliString.Commutator(t.String, PauliString.Single(h.N, j, 'Z'), out var c, out var p)) continue;
                acc[p!] = acc.GetValueOrDefault(p!) + t.Coefficient * c;
            }
        }
        return acc.Values.All(v => v.Magnitude <= 1e-12 * scale);
    }

    /// <summary>Level statistics of one Hamiltonian.</summary>
    public static LevelStatisticsResult Analyze(Hamiltonian h, LevelStatisticsOptions? options = null)
        => Analyze([h], options);

    /// <summary>
    /// Level statistics pooled over disorder realisations (same N and symmetries); the error bar is then
    /// the standard error over realisation means (more honest than over gaps: gaps within one spectrum are
    /// correlated).
    /// </summary>
    public static LevelStatisticsResult Analyze(IReadOnlyList<Hamiltonian> realizations, LevelStatisticsOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(realizations);
        if (realizations.Count == 0) throw new ArgumentException("No Hamiltonian given.", nameof(realizations));
        var o = options ?? new LevelStatisticsOptions();
        var sw = Stopwatch.StartNew();
        var h0 = realizations[0];
        int n = h0.N;
        if (n > 24) throw new ArgumentOutOfRangeException(nameof(realizations), n, "Level statistics are limited to N <= 24.");
        var warnings = new List<string>();
        var candidates = (o.SpatialCandidates ?? [SitePermutation.Reversal(n)]).Where(p => p.N == n && !p.IsIdentity).ToList();
        var swapCandidate = o.SwapCandidate is { } sc && sc.N == n && !sc.IsIdentity ? sc : null;
        var detected = DetectSymmetries(h0, candidates, swapCandidate);
        var supported = new List<string> { "total-z" };
        supported.AddRange(candidates.Select(p => p.Name));
        if (swapCandidate is not null) supported.Add(swapCandidate.Name);
        supported.Add("spin-flip");
        var requested = (o.Resolve ?? detected).Distinct().ToList();
        foreach (var name in requested.ToArray())
        {
            if (!supported.Contains(name))
            {
                warnings.Add($"symmetry '{name}' cannot be resolved here (supported: {string.Join(", ", supported)}); <r> may be biased toward Poisson");
                requested.Remove(name);
            }
            else if (!detected.Contains(name))
            {
                warnings.Add($"symmetry '{name}' was requested but H does not commute with it; not used");
                requested.Remove(name);
            }
        }
        var (mirrors, covered) = ChooseMirrors(candidates, requested);
        SitePermutation? swap = null;
        if (swapCandidate is not null && requested.Contains(swapCandidate.Name))
        {
            if (mirrors.Count > 0 && SymmetrySector.IsCompatibleSwap(mirrors, swapCandidate)) swap = swapCandidate;
            else if (mirrors.Count == 0 && swapCandidate.IsInvolution) mirrors = [swapCandidate]; // alone it is a mirror
        }
        var resolve = new List<string>();
        bool tz = requested.Contains("total-z"), flip = requested.Contains("spin-flip");
        if (tz) resolve.Add("total-z");
        resolve.AddRange(covered);
        foreach (var p in mirrors) if (!resolve.Contains(p.Name)) resolve.Add(p.Name);
        if (swap is not null) resolve.Add(swap.Name);
        if (flip) resolve.Add("spin-flip");
        foreach (var name in detected.Where(d => !resolve.Contains(d)))
        {
            warnings.Add(requested.Contains(name)
                ? $"H commutes with '{name}' but it could not be combined with the other resolved symmetries: independent blocks are mixed and <r> is biased toward Poisson"
                : $"H commutes with '{name}' but it was not resolved: independent blocks are mixed and <r> is biased toward Poisson");
        }
        foreach (var declared in o.DeclaredSymmetries.Distinct())
        {
            // fermion parity is the spin flip prod_j X_j; time reversal is anti-unitary: it makes the
            // blocks real (GOE class) and has no sectors to resolve.
            string name = declared == "fermion-parity" ? "spin-flip" : declared;
            if (name == "time-reversal") continue;
            if (supported.Contains(name))
            {
                if (!detected.Contains(name)) warnings.Add($"declared symmetry '{name}' does not commute with H (check the model)");
            }
            else if (o.Resolve is null || !o.Resolve.Contains(name))
            {
                warnings.Add($"declared symmetry '{name}' is not resolved (supported: {string.Join(", ", supported)}); <r> may be biased toward Poisson");
            }
        }
        var sectors = SymmetrySector.Enumerate(n, tz, mirrors, flip, swap);
        bool real = realizations.All(h => h.Terms.All(t => PauliMask.From(t.String).IsReal));
        int threads = o.Threads > 0 ? o.Threads : Environment.ProcessorCount;
        var all = new List<double>();
        var perReal = new List<double>();
        var firstSectors = new List<SectorStatistics>();
        int degTotal = 0;
        for (int ri = 0; ri < realizations.Count; ri++)
        {
            var h = realizations[ri];
            if (h.N != n) throw new ArgumentException($"Realisation {ri} acts on {h.N} qubits, expected {n}.", nameof(realizations));
            var mine = new List<double>();
            foreach (var sec in sectors)
            {
                if (sec.Dimension < o.MinimumSectorDimension) continue;
                if (sec.Dimension > o.MaximumSectorDimension)
                {
                    throw new OpGrowth.IO.ResourceLimitException($"sector {sec.Label} has dimension {sec.Dimension} > {o.MaximumSectorDimension}; resolve more symmetries or lower N");
                }
                var secClock = Stopwatch.StartNew();
                double[] ev = real
                    ? SymmetricEigenvalues(sec.RealBlock(h), sec.Dimension, threads, o.UseNative)
                    : HermitianEigenvalues(sec.ComplexBlock(h), sec.Dimension, threads, o.UseNative);
                var (r, deg) = GapRatios(ev, o.CentralFraction);
                degTotal += deg;
                mine.AddRange(r);
                if (ri == 0)
                {
                    var (m, sem) = Mean(r);
                    firstSectors.Add(new SectorStatistics(sec.Label, sec.Dimension, r.Length, m, sem, deg));
                }
                o.Logger?.LogInformation("realisation {R}/{Count}, sector {Label}: dimension {D}, {Gaps} ratios, {Seconds:F1} s", ri + 1, realizations.Count, sec.Label, sec.Dimension, r.Length, secClock.Elapsed.TotalSeconds);
            }
            all.AddRange(mine);
            perReal.Add(Mean(mine).Mean);
        }
        if (sectors.Any(s => s.Dimension < o.MinimumSectorDimension)) warnings.Add($"sectors smaller than {o.MinimumSectorDimension} were skipped");
        if (all.Count > 0 && degTotal > 0.01 * all.Count) warnings.Add($"{degTotal} exactly degenerate level pairs: a symmetry is probably unresolved");
        var (mean, se, kind) = Pooled(all, perReal);
        if (all.Count == 0) warnings.Add("no sector was large enough for statistics");
        string closest = new[] { ("Poisson", PoissonRatio), ("GOE", GoeRatio), ("GUE", GueRatio) }.OrderBy(x => Math.Abs(x.Item2 - mean)).First().Item1;
        return new LevelStatisticsResult
        {
            N = n,
            RealBlocks = real,
            Detected = detected,
            Resolved = resolve,
            Sectors = firstSectors,
            MeanRatio = mean,
            StandardError = se,
            ErrorKind = kind,
            Gaps = all.Count,
            Realizations = realizations.Count,
            RealizationMeans = perReal,
            Closest = closest,
            Warnings = warnings,
            WallSeconds = sw.Elapsed.TotalSeconds,
        };
    }
}
