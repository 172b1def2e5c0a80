using OpGrowth.Analysis;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Ensembles;

/// <summary>
/// The Brownian (white-noise) counterpart of a Hamiltonian H = sum_a J_a P_a: every coupling becomes white noise
/// J_a(t) with E[J_a(t)] = 0 and E[J_a(t) J_b(t')] = delta_ab J_a^2 tau delta(t - t') (tau: the noise time,
/// default one unit of the model's time). Averaged over the noise, the Pauli weights obey a closed master
/// equation on strings: a term that anticommutes with S moves weight between S and P_a S at the rate
/// Gamma_a = 4 J_a^2 tau (derivation in docs/ensembles.md).
/// </summary>
public sealed class BrownianModel
{
    /// <summary>Model name.</summary>
    public string Name { get; }

    /// <summary>Number of qubits.</summary>
    public int N { get; }

    /// <summary>Noise time tau.</summary>
    public double NoiseTime { get; }

    /// <summary>Distances for the front.</summary>
    public LatticeGeometry Geometry { get; }

    /// <summary>Default probes (the model file's).</summary>
    public IReadOnlyList<PauliString> Probes { get; }

    /// <summary>Number of noisy terms.</summary>
    public int TermCount => Rates.Length;

    /// <summary>Hopping rate Gamma_a = 4 J_a^2 tau of each term.</summary>
    public double[] Rates { get; }

    /// <summary>Birth and death rates of the size chain, when the model is permutation symmetric (else null).</summary>
    public SizeChainRates? Chain { get; }

    /// <summary>Why there is no size chain (null when there is one).</summary>
    public string? ChainNote { get; }

    internal readonly int[] TermStart;   // CSR: sites of term t are TermSites[TermStart[t]..TermStart[t+1])
    internal readonly int[] TermSites;
    internal readonly byte[] TermCodes;
    internal readonly int[] SiteStart;   // CSR: terms touching site j
    internal readonly int[] SiteTerms;

    /// <summary>Builds the counterpart of <paramref name="terms"/> on <paramref name="n"/> qubits.</summary>
    public BrownianModel(string name, int n, IReadOnlyList<PauliTerm> terms, LatticeGeometry geometry, IReadOnlyList<PauliString>? probes = null, double noiseTime = 1)
    {
        ArgumentNullException.ThrowIfNull(terms);
        if (!(noiseTime > 0 && double.IsFinite(noiseTime))) throw new InputException($"noise time {noiseTime}; expected a positive time");
        Name = name;
        N = n;
        NoiseTime = noiseTime;
        Geometry = geometry;
        Probes = probes ?? [];
        var kept = terms.Where(t => t.Coefficient != 0 && !t.String.IsIdentity).ToList();
        Rates = kept.Select(t => 4 * t.Coefficient * t.Coefficient * noiseTime).ToArray();
        TermStart = new int[kept.Count + 1];
        var sites = new List<int>();
        var codes = new List<byte>();
        for (int t = 0; t < kept.Count; t++)
        {
            foreach (int j in kept[t].String.Support())
            {
                sites.Add(j);
                codes.Add((byte)PackedCodes.CodeOf(kept[t].String, j));
            }
            TermStart[t + 1] = sites.Count;
        }
        TermSites = sites.ToArray();
        TermCodes = codes.ToArray();
        var degree = new int[n + 1];
        foreach (int j in TermSites) degree[j + 1]++;
        for (int j = 0; j < n; j++) degree[j + 1] += degree[j];
        SiteStart = degree;
        SiteTerms = new int[TermSites.Length];
        var fill = (int[])SiteStart.Clone();
        for (int t = 0; t < kept.Count; t++)
            for (int p = TermStart[t]; p < TermStart[t + 1]; p++) SiteTerms[fill[TermSites[p]]++] = t;
        Chain = SizeChainRates.Detect(this, out string? note);
        ChainNote = note;
    }

    /// <summary>The counterpart of a model file's Hamiltonian (a periodic drive has no such counterpart here).</summary>
    public static BrownianModel From(Model model, double noiseTime = 1)
    {
        ArgumentNullException.ThrowIfNull(model);
        if (model.Drive is not null)
            throw new InputException(model.SourceFile, 0, "found a periodic drive ([[layer]] blocks); expected a Hamiltonian model ([[term]] blocks) for a Brownian counterpart");
        var geometry = new LatticeGeometry(model.N, model.Lattice.Distance, model.Lattice.IsOneDimensional, model.Lattice.Kind);
        return new BrownianModel(model.Name, model.N, model.Hamiltonian.Terms, geometry, model.Probes, noiseTime);
    }

    /// <summary>
    /// The standard Brownian cluster at any N without building its terms: every pair (i, j) carries all nine
    /// couplings sigma_i^alpha sigma_j^beta, each white noise of variance J^2 / N (tau = 1). Only its size chain
    /// is available (use <see cref="SizeChainRates.Cluster"/>).
    /// </summary>
    public static SizeChainRates ClusterChain(int n, double j = 1) => SizeChainRates.Cluster(n, j);

    /// <summary>True when term <paramref name="t"/> anticommutes with the string <paramref name="codes"/>.</summary>
    internal bool Anticommutes(int t, ReadOnlySpan<ulong> codes)
    {
        int parity = 0;
        for (int p = TermStart[t]; p < TermStart[t + 1]; p++)
            if (PackedCodes.Anticommute(PackedCodes.Get(codes, TermSites[p]), TermCodes[p])) parity ^= 1;
        return parity == 1;
    }
}
