using System.Diagnostics;
using System.Numerics;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Symmetry;

namespace OpGrowth.Exact;

/// <summary>Gap-ratio statistics of one resolved block.</summary>
/// <param name="Label">Sector label.</param>
/// <param name="Dimension">Levels in the block (after multiplet subtraction for total spin).</param>
/// <param name="Multiplicity">How many sectors share this spectrum.</param>
/// <param name="Ensemble">Reference class of the block (GOE, GUE or GSE).</param>
/// <param name="Ratios">Gap ratios used.</param>
/// <param name="Mean">Their mean.</param>
/// <param name="Error">Standard error of the mean.</param>
/// <param name="Degenerate">Exactly degenerate neighbouring levels skipped.</param>
public sealed record BlockRatios(string Label, int Dimension, int Multiplicity, string Ensemble, int Ratios, double Mean, double Error, int Degenerate);

/// <summary>Pooled level statistics over every resolved block (and disorder realisation).</summary>
public sealed record SectorLevelsResult
{
    /// <summary>Sites.</summary>
    public required int N { get; init; }

    /// <summary>Blocks of the first realisation.</summary>
    public required IReadOnlyList<BlockRatios> Blocks { get; init; }

    /// <summary>Mean gap ratio over all blocks and realisations.</summary>
    public required double MeanRatio { get; init; }

    /// <summary>Its error bar.</summary>
    public required double Error { get; init; }

    /// <summary>How the error bar was computed.</summary>
    public required string ErrorKind { get; init; }

    /// <summary>Number of gap ratios.</summary>
    public required int Gaps { get; init; }

    /// <summary>Chaotic reference value: the ratio-weighted mean of the blocks' ensemble values.</summary>
    public required double WignerDysonRatio { get; init; }

    /// <summary>The ensembles of the blocks with their share of the ratios, e.g. "GOE" or "GOE 62%, GUE 38%".</summary>
    public required string WignerDysonClass { get; init; }

    /// <summary>Sum over blocks of dimension times multiplicity (before multiplet subtraction), to compare with the full dimension.</summary>
    public required long DimensionCovered { get; init; }

    /// <summary>Full Hilbert-space dimension 2^N.</summary>
    public long FullDimension => 1L << N;

    /// <summary>Unresolved symmetries that map some block used in the statistics onto itself (empty: every block used is clean).</summary>
    public required IReadOnlyList<string> MixedBy { get; init; }

    /// <summary>Realisations pooled.</summary>
    public required int Realizations { get; init; }

    /// <summary>Warnings.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }
}

/// <summary>
/// Level statistics with every symmetry that <see cref="SymmetryDiscovery"/> resolves: the Hamiltonian is
/// written in each symmetry sector (<see cref="SectorSpace"/>), diagonalised, and the gap ratios of every
/// block are pooled; with SU(2) symmetry, total spin is separated by subtracting the levels of S^z = S + 1
/// from those of S^z = S within each spatial sector (every multiplet has one state in each S^z &lt;= S).
/// Source: Oganesyan and Huse, PRB 75, 155111 (2007) (gap ratio); Atas, Bogomolny, Giraud, Roux, PRL 110,
/// 084101 (2013) (reference values GOE 0.5307, GUE 0.5996, GSE 0.6744, Poisson 0.3863).
/// </summary>
public static class SectorLevels
{
    /// <summary>GSE mean gap ratio at large dimension (Atas et al. 2013).</summary>
    public const double GseRatio = 0.6744;

    /// <summary>Reference value of an ensemble name.</summary>
    public static double ReferenceOf(string ensemble) => ensemble switch
    {
        "GOE" => LevelStatistics.GoeRatio,
        "GSE" => GseRatio,
        _ => LevelStatistics.GueRatio,
    };

    /// <summary>
    /// Largest block dimension over the sectors of <paramref name="analysis"/> (cheap: no matrices), and the
    /// total number of states covered; used to choose a size before diagonalising.
    /// </summary>
    public static (int Largest, int Blocks) Dimensions(SymmetryAnalysis analysis)
    {
        ArgumentNullException.ThrowIfNull(analysis);
        var blocks = Blocks(analysis);
        return (blocks.Count == 0 ? 0 : blocks.Max(b => b.Dimension), blocks.Count);
    }

    private static IReadOnlyList<SymmetryBlock> Blocks(SymmetryAnalysis a)
        => SectorSpace.Enumerate(a.N, a.ResolveTotalZ, a.Abelian, a.Swap, a.HalfFillingFlip, a.Real,
            a.SpinRotation ? a.N / 2 : int.MaxValue, a.Residual);

    /// <summary>
    /// Pooled gap ratios over the realisations (each with its own analysis; same size). Blocks smaller than
    /// <paramref name="minimumDimension"/> are skipped; a block larger than <paramref name="maximumDimension"/>
    /// is a <see cref="ResourceLimitException"/>.
    /// </summary>
    public static SectorLevelsResult Run(IReadOnlyList<SymmetryAnalysis> realizations, int threads = 0, double centralFraction = 0.8,
        int minimumDimension = 32, int maximumDimension = 8000, ILogger? log = null)
    {
        ArgumentNullException.ThrowIfNull(realizations);
        if (realizations.Count == 0) throw new ArgumentException("No realisation given.", nameof(realizations));
        int n = realizations[0].N;
        var warnings = new List<string>();
        var all = new List<double>();
        var perReal = new List<double>();
        var firstBlocks = new List<BlockRatios>();
        var refWeights = new Dictionary<string, int>();
        long covered = 0;
        int degTotal = 0;
        var mixing = new List<string>();
        for (int ri = 0; ri < realizations.Count; ri++)
        {
            var a = realizations[ri];
            var sw = Stopwatch.StartNew();
            var blocks = Blocks(a);
            var masks = SectorSpace.Masks(a.Rotated);
            var spectra = new List<(SymmetryBlock Block, double[] Levels)>();
            if (ri == 0) covered = blocks.Sum(b => (long)b.Dimension * b.Multiplicity * (a.SpinRotation && 2 * b.DownSpins < n ? 2 : 1));
            // Blocks that an unresolved symmetry maps onto itself mix independent pieces: leave them out when
            // the clean blocks alone hold enough levels (common practice: at least 400 states in blocks of 32+).
            int Usable(IEnumerable<SymmetryBlock> bs) => bs.Where(b => b.Dimension >= minimumDimension).Sum(b => b.Dimension);
            var clean = blocks.Where(b => b.MixedBy.Count == 0).ToList();
            bool dropMixed = clean.Count < blocks.Count && Usable(clean) >= 400;
            if (ri == 0 && dropMixed)
            {
                int left = blocks.Count - clean.Count;
                warnings.Add($"{left} of {blocks.Count} sectors are mapped onto themselves by an unresolved symmetry ({string.Join(", ", blocks.SelectMany(b => b.MixedBy).Distinct())}) and were left out; the {clean.Count} others are free of it");
            }
            var used = dropMixed ? clean : blocks.ToList();
            if (ri == 0) mixing = used.SelectMany(b => b.MixedBy).Distinct().ToList();
            foreach (var b in used)
            {
                if (b.Dimension > maximumDimension) throw new ResourceLimitException($"sector {b.Label} has dimension {b.Dimension} > {maximumDimension}; use a smaller size");
                if (b.Dimension < (a.SpinRotation ? 2 : minimumDimension)) continue;
                spectra.Add((b, Eigenvalues(b.Block(masks), b.Dimension, threads)));
            }
            var mine = new List<double>();
            foreach (var (label, dim, mult, ens, levels) in Resolve(a, spectra, warnings))
            {
                if (levels.Length < minimumDimension) continue;
                int multiplicity = LevelStatistics.UniformMultiplicity(levels);
                string ensemble = a.ForcedEnsemble ?? (multiplicity == 2 ? "GSE" : ens);
                var (r, deg) = LevelStatistics.GapRatios(levels, centralFraction);
                degTotal += deg;
                mine.AddRange(r);
                refWeights[ensemble] = refWeights.GetValueOrDefault(ensemble) + r.Length;
                if (ri == 0)
                {
                    var (m, se) = LevelStatistics.Mean(r);
                    firstBlocks.Add(new BlockRatios(label, levels.Length, mult, ensemble, r.Length, m, se, deg));
                }
            }
            all.AddRange(mine);
            perReal.Add(LevelStatistics.Mean(mine).Mean);
            log?.LogInformation("level statistics: realisation {R}/{Count}: {Blocks} blocks, {Ratios} ratios, {S:F1} s", ri + 1, realizations.Count, spectra.Count, mine.Count, sw.Elapsed.TotalSeconds);
        }
        if (all.Count > 0 && degTotal > 0.01 * all.Count) warnings.Add($"{degTotal} exactly degenerate level pairs within blocks: a symmetry is probably unresolved");
        var (mean, se2, kind) = LevelStatistics.Pooled(all, perReal);
        int total = refWeights.Values.Sum();
        double reference = total == 0 ? LevelStatistics.GoeRatio : refWeights.Sum(kv => kv.Value * ReferenceOf(kv.Key)) / total;
        string cls = total == 0 ? "GOE" : refWeights.Count == 1 ? refWeights.Keys.First()
            : string.Join(", ", refWeights.OrderByDescending(kv => kv.Value).Select(kv => $"{kv.Key} {100.0 * kv.Value / total:0}%"));
        return new SectorLevelsResult
        {
            N = n,
            Blocks = firstBlocks,
            MeanRatio = mean,
            Error = se2,
            ErrorKind = kind,
            Gaps = all.Count,
            WignerDysonRatio = reference,
            WignerDysonClass = cls,
            DimensionCovered = covered,
            MixedBy = mixing,
            Realizations = realizations.Count,
            Warnings = warnings,
        };
    }

    /// <summary>
    /// The total-spin blocks of an SU(2)-symmetric analysis: (S, levels) for every spatial sector, each block
    /// listed once per sector multiplicity (every multiplet appears 2S + 1 times in the full spectrum).
    /// </summary>
    internal static IReadOnlyList<(double Spin, double[] Levels)> SpinBlocks(SymmetryAnalysis a, int threads)
    {
        if (!a.SpinRotation) throw new ArgumentException("The analysis has no total-spin resolution.", nameof(a));
        var masks = SectorSpace.Masks(a.Rotated);
        var spectra = Blocks(a).Select(b => (b, Eigenvalues(b.Block(masks), b.Dimension, threads))).ToList();
        var warnings = new List<string>();
        var result = new List<(double, double[])>();
        foreach (var (label, _, mult, _, levels) in Resolve(a, spectra, warnings))
        {
            double spin = double.Parse(label[2..].Split(',', ' ')[0], System.Globalization.CultureInfo.InvariantCulture);
            for (int k = 0; k < mult; k++) result.Add((spin, levels));
        }
        if (warnings.Count > 0) throw new InvalidOperationException(string.Join("; ", warnings));
        return result;
    }

    /// <summary>The blocks whose statistics are taken: the sectors themselves, or with SU(2) the total-spin blocks.</summary>
    private static IEnumerable<(string Label, int Dimension, int Multiplicity, string Ensemble, double[] Levels)> Resolve(SymmetryAnalysis a,
        List<(SymmetryBlock Block, double[] Levels)> spectra, List<string> warnings)
    {
        if (!a.SpinRotation)
        {
            foreach (var (b, l) in spectra) yield return (b.Label, b.Dimension, b.Multiplicity, b.Ensemble, l);
            yield break;
        }
        int n = a.N;
        var byChar = spectra.GroupBy(x => x.Block.Character);
        foreach (var g in byChar)
        {
            var byM = g.ToDictionary(x => x.Block.DownSpins, x => x);
            double scale = g.SelectMany(x => x.Levels).Select(Math.Abs).DefaultIfEmpty(1).Max() + 1;
            foreach (var (m, (b, levels)) in byM.OrderBy(kv => kv.Key))
            {
                double[] rest = levels;
                if (m > 0 && byM.TryGetValue(m - 1, out var above))
                {
                    rest = Difference(levels, above.Levels, 1e-8 * scale, out bool ok);
                    if (!ok)
                    {
                        warnings.Add($"levels of {b.Label} and the sector above did not match as SU(2) multiplets; that total-spin block was skipped");
                        continue;
                    }
                }
                string label = $"S={(n - 2 * m) / 2.0:0.#}" + (g.Key.Length > 0 ? ", " + g.Key : string.Empty) + (b.Multiplicity > 1 ? $" (x{b.Multiplicity})" : string.Empty);
                yield return (label, rest.Length, b.Multiplicity, b.Ensemble, rest);
            }
        }
    }

    /// <summary>Sorted multiset difference a \ b to a tolerance; ok = every element of b was matched.</summary>
    internal static double[] Difference(double[] a, double[] b, double tol, out bool ok)
    {
        var result = new List<double>(Math.Max(0, a.Length - b.Length));
        int j = 0;
        ok = true;
        foreach (double x in a)
        {
            while (j < b.Length && b[j] < x - tol)
            {
                ok = false;
                j++;
            }
            if (j < b.Length && Math.Abs(x - b[j]) <= tol)
            {
                j++;
                continue;
            }
            result.Add(x);
        }
        if (j < b.Length) ok = false;
        return [.. result];
    }

    /// <summary>Eigenvalues of a Hermitian block: real symmetric path when every entry is real.</summary>
    internal static double[] Eigenvalues(Complex[] m, int d, int threads)
    {
        double scale = 0, imag = 0;
        foreach (var z in m)
        {
            scale = Math.Max(scale, z.Magnitude);
            imag = Math.Max(imag, Math.Abs(z.Imaginary));
        }
        if (imag <= 1e-13 * Math.Max(scale, 1e-300))
        {
            var r = new double[m.Length];
            for (int i = 0; i < m.Length; i++) r[i] = m[i].Real;
            return LevelStatistics.SymmetricEigenvalues(r, d, threads);
        }
        return LevelStatistics.HermitianEigenvalues(m, d, threads);
    }
}
