namespace OpGrowth.Ensembles;

/// <summary>
/// The birth-death chain on operator size of a permutation-symmetric Brownian model: a string of size k grows
/// at rate lambda_k = b k (N - k) (every occupied site seeds every empty one at rate b) and shrinks at rate
/// mu_k = d k (k - 1) (every ordered pair of occupied sites empties its second site at rate d). It is exact when
/// every pair of qubits carries the same two-site terms and the rates b and d do not depend on which Pauli
/// letters occupy the sites (then single-site terms, which only change letters, do not matter).
/// Source: the all-to-all Brownian cluster reduces to such a chain: N. Lashkari, D. Stanford, M. Hastings,
/// T. Osborne, P. Hayden, JHEP 04 (2013) 022; T. Zhou, X. Chen, PRE 99, 052212 (2019) (both from memory).
/// </summary>
/// <param name="N">Number of qubits.</param>
/// <param name="Birth">b: rate at which one occupied site makes one empty site occupied.</param>
/// <param name="Death">d: rate at which one occupied site empties one other occupied site.</param>
/// <param name="Origin">Where the rates came from (one phrase).</param>
public sealed record SizeChainRates(int N, double Birth, double Death, string Origin)
{
    /// <summary>
    /// The standard Brownian cluster: all nine couplings on every pair, each of variance J^2/N: Gamma = 4 J^2 / N
    /// per term; an occupied-empty pair has 6 anticommuting terms that occupy the empty site (b = 6 Gamma); an
    /// occupied-occupied pair has 4 anticommuting terms, 2 emptying each site (d = 2 Gamma).
    /// </summary>
    public static SizeChainRates Cluster(int n, double j = 1)
    {
        if (n < 2) throw new IO.InputException($"N = {n}; expected at least 2 qubits");
        double gamma = 4 * j * j / n;
        return new SizeChainRates(n, 6 * gamma, 2 * gamma, $"Brownian cluster: all nine couplings on every pair, variance {j * j}/N each");
    }

    /// <summary>Rates of a model's terms, or null with the reason when the chain is not exact for it.</summary>
    internal static SizeChainRates? Detect(BrownianModel m, out string? note)
    {
        int n = m.N;
        if (n < 2)
        {
            note = "fewer than two qubits";
            return null;
        }
        // Per unordered pair (i < j): rates to occupy j from (c_i, I), to occupy i from (I, c_j), to empty j / i from (c_i, c_j).
        var tables = new Dictionary<long, double[]>();
        for (int t = 0; t < m.TermCount; t++)
        {
            int w = m.TermStart[t + 1] - m.TermStart[t];
            if (w > 2)
            {
                note = "a term acts on three or more qubits";
                return null;
            }
            if (w == 1) continue;
            int p = m.TermStart[t];
            int i = m.TermSites[p], j = m.TermSites[p + 1], ai = m.TermCodes[p], aj = m.TermCodes[p + 1];
            if (i > j) (i, j, ai, aj) = (j, i, aj, ai);
            long key = (long)i * n + j;
            if (!tables.TryGetValue(key, out var tab)) tables[key] = tab = new double[64];
            for (int ci = 0; ci < 4; ci++)
            {
                for (int cj = 0; cj < 4; cj++)
                {
                    if ((ci | cj) == 0) continue;
                    bool odd = PackedCodes.Anticommute(ci, ai) ^ PackedCodes.Anticommute(cj, aj);
                    if (!odd) continue;
                    int ni = ci ^ ai, nj = cj ^ aj;
                    // slots: 0 occupy j (from ci != 0, cj == 0), 1 occupy i, 2 empty j, 3 empty i
                    if (cj == 0 && nj != 0) tab[(ci * 4 + cj) * 4 + 0] += m.Rates[t];
                    if (ci == 0 && ni != 0) tab[(ci * 4 + cj) * 4 + 1] += m.Rates[t];
                    if (cj != 0 && nj == 0) tab[(ci * 4 + cj) * 4 + 2] += m.Rates[t];
                    if (ci != 0 && ni == 0) tab[(ci * 4 + cj) * 4 + 3] += m.Rates[t];
                }
            }
        }
        long pairs = (long)n * (n - 1) / 2;
        if (tables.Count != pairs)
        {
            note = $"{tables.Count} of the {pairs} pairs carry two-site terms: not every pair interacts";
            return null;
        }
        double b = double.NaN, d = double.NaN;
        bool Same(ref double target, double v)
        {
            if (double.IsNaN(target)) target = v;
            return Math.Abs(v - target) <= 1e-9 * Math.Max(1, Math.Abs(target));
        }
        foreach (var tab in tables.Values)
        {
            for (int c = 1; c < 4; c++)
            {
                if (!Same(ref b, tab[(c * 4) * 4 + 0]) || !Same(ref b, tab[c * 4 + 1]))
                {
                    note = "the growth rate of a pair depends on the pair or on the Pauli letter: not permutation symmetric with letter-independent rates";
                    return null;
                }
                for (int c2 = 1; c2 < 4; c2++)
                {
                    if (!Same(ref d, tab[(c * 4 + c2) * 4 + 2]) || !Same(ref d, tab[(c * 4 + c2) * 4 + 3]))
                    {
                        note = "the shrink rate of a pair depends on the pair or on the Pauli letters: not permutation symmetric with letter-independent rates";
                        return null;
                    }
                }
            }
        }
        note = null;
        return new SizeChainRates(n, b, d, "permutation-symmetric model file with letter-independent pair rates");
    }
}
