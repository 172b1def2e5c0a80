using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// The shipped model families built in code, term for term (and draw for draw) as the files under
/// models/ build them, so tests can compare the two routes and library users can skip the file.
/// Random couplings use <see cref="ModelRandom"/> with the same seed and the same placement order
/// (sites in index order, bonds in <see cref="Lattice.Edges"/> order, pairs i &lt; j lexicographic,
/// Majorana sets a &lt; b &lt; c &lt; d lexicographic).
/// </summary>
public static class Families
{
    private static PauliString On(int n, ReadOnlySpan<int> sites, string letters)
    {
        var b = new PauliString.Builder(n);
        for (int k = 0; k < sites.Length; k++) b.Set(sites[k], letters[k]);
        return b.Build();
    }

    private static void AddBonds(List<PauliTerm> terms, Lattice lat, string letters, double c)
    {
        if (c == 0) return;
        foreach (var (a, b) in lat.Edges) terms.Add(new PauliTerm(On(lat.N, [a, b], letters), c));
    }

    private static void AddSites(List<PauliTerm> terms, int n, char letter, double c)
    {
        if (c == 0) return;
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, letter), c));
    }

    /// <summary>
    /// Mixed-field Ising chain H = J sum Z_i Z_{i+1} + g sum X_i + h sum Z_i; chaotic at the usual
    /// J = 1, g = 1.05, h = 0.5 (Kim and Huse, PRL 111, 127205 (2013), from memory).
    /// </summary>
    public static Hamiltonian MixedFieldIsing(int n, double j = 1.0, double g = 1.05, double h = 0.5, bool periodic = false)
    {
        var lat = Lattice.Chain(n, periodic);
        var terms = new List<PauliTerm>();
        AddBonds(terms, lat, "ZZ", j);
        AddSites(terms, n, 'X', g);
        AddSites(terms, n, 'Z', h);
        return new Hamiltonian(n, terms);
    }

    /// <summary>
    /// Long-range Ising chain in a tilted field, H = sum_{i&lt;j} J/|i-j|^alpha Z_i Z_j + g sum X_i + h sum Z_i
    /// (every pair coupled; the shipped <c>power-law-ising</c> model).
    /// </summary>
    public static Hamiltonian PowerLawIsing(int n, double j = 1.0, double alpha = 1.5, double g = 1.05, double h = 0.5)
    {
        var terms = new List<PauliTerm>();
        for (int a = 0; a < n; a++)
        {
            for (int b = a + 1; b < n; b++)
            {
                var pb = new PauliString.Builder(n);
                pb.Set(a, 'Z');
                pb.Set(b, 'Z');
                terms.Add(new PauliTerm(pb.Build(), j / Math.Pow(b - a, alpha)));
            }
        }
        AddSites(terms, n, 'X', g);
        AddSites(terms, n, 'Z', h);
        return new Hamiltonian(n, terms);
    }

    /// <summary>Transverse-field Ising chain H = -J sum Z_i Z_{i+1} - h sum X_i (free fermions; critical at h = J).</summary>
    public static Hamiltonian TransverseFieldIsing(int n, double j = 1.0, double h = 1.0, bool periodic = false)
    {
        var lat = Lattice.Chain(n, periodic);
        var terms = new List<PauliTerm>();
        AddBonds(terms, lat, "ZZ", -j);
        AddSites(terms, n, 'X', -h);
        return new Hamiltonian(n, terms);
    }

    /// <summary>
    /// XXZ chain H = J sum (X X + Y Y + Delta Z Z) + sum w_i Z_i with w_i uniform in [-W, W] drawn
    /// from <paramref name="seed"/> in site order (no fields when W = 0).
    /// </summary>
    public static Hamiltonian Xxz(int n, double j = 1.0, double delta = 1.0, double w = 0.0, long seed = 1, bool periodic = false)
    {
        var lat = Lattice.Chain(n, periodic);
        var terms = new List<PauliTerm>();
        if (j != 0)
        {
            foreach (var (a, b) in lat.Edges)
            {
                terms.Add(new PauliTerm(On(n, [a, b], "XX"), j));
                terms.Add(new PauliTerm(On(n, [a, b], "YY"), j));
            }
        }
        AddBonds(terms, lat, "ZZ", j * delta);
        AddRandomFields(terms, n, w, seed);
        return new Hamiltonian(n, terms);
    }

    /// <summary>XX chain in random fields: H = J sum (X X + Y Y) + sum w_i Z_i, w_i uniform in [-W, W] (Anderson localized for W &gt; 0).</summary>
    public static Hamiltonian XxRandomField(int n, double j = 1.0, double w = 5.0, long seed = 3, bool periodic = false)
        => Xxz(n, j, 0.0, w, seed, periodic);

    private static void AddRandomFields(List<PauliTerm> terms, int n, double w, long seed)
    {
        var rng = new ModelRandom(seed);
        for (int i = 0; i < n; i++)
        {
            double c = rng.Uniform(-w, w);
            if (c != 0) terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), c));
        }
    }

    /// <summary>
    /// All-to-all Heisenberg cluster H = sum_{i&lt;j} J_ij (X X + Y Y + Z Z), J_ij Gaussian with mean 0 and
    /// standard deviation J/sqrt(N) (variance J^2/N: extensive energy), one draw per pair.
    /// </summary>
    public static Hamiltonian HeisenbergAllToAll(int n, double j = 1.0, long seed = 7)
    {
        var rng = new ModelRandom(seed);
        var terms = new List<PauliTerm>();
        double std = j / Math.Sqrt(n);
        for (int a = 0; a < n; a++)
        {
            for (int b = a + 1; b < n; b++)
            {
                double c = rng.Normal(0, std);
                if (c == 0) continue;
                terms.Add(new PauliTerm(On(n, [a, b], "XX"), c));
                terms.Add(new PauliTerm(On(n, [a, b], "YY"), c));
                terms.Add(new PauliTerm(On(n, [a, b], "ZZ"), c));
            }
        }
        return new Hamiltonian(n, terms);
    }

    /// <summary>
    /// Random all-to-all Ising model in a transverse field: H = sum_{i&lt;j} J_ij Z Z + g sum X_i, J_ij
    /// Gaussian with standard deviation J/sqrt(N); glassy (nearly frozen Z) for g much below J.
    /// </summary>
    public static Hamiltonian IsingGlass(int n, double j = 1.0, double g = 0.1, long seed = 5)
    {
        var rng = new ModelRandom(seed);
        var terms = new List<PauliTerm>();
        double std = j / Math.Sqrt(n);
        for (int a = 0; a < n; a++)
        {
            for (int b = a + 1; b < n; b++)
            {
                double c = rng.Normal(0, std);
                if (c != 0) terms.Add(new PauliTerm(On(n, [a, b], "ZZ"), c));
            }
        }
        AddSites(terms, n, 'X', g);
        return new Hamiltonian(n, terms);
    }

    /// <summary>Tilted-field Ising model on a width x height square lattice: H = J sum_&lt;ij&gt; Z Z + g sum X + h sum Z.</summary>
    public static Hamiltonian SquareIsing(int width, int height, double j = 1.0, double g = 1.05, double h = 0.5, bool periodic = false)
    {
        var lat = Lattice.Square(width, height, periodic);
        var terms = new List<PauliTerm>();
        AddBonds(terms, lat, "ZZ", j);
        AddSites(terms, lat.N, 'X', g);
        AddSites(terms, lat.N, 'Z', h);
        return new Hamiltonian(lat.N, terms);
    }

    /// <summary>
    /// Kicked Ising chain, one period U = exp(-i b sum X) exp(-i sum (J Z Z + h Z)): layer 0 holds the
    /// rotations exp(-i (2J) ZZ/2) on bonds and exp(-i (2h) Z/2) on sites, layer 1 exp(-i (2b) X/2).
    /// Self-dual at |J| = |b| = pi/4 (Bertini, Kos, Prosen, PRX 9, 021033 (2019), from memory).
    /// </summary>
    public static FloquetDrive KickedIsing(int n, double j = Math.PI / 4, double b = Math.PI / 4, double h = 0.6, bool periodic = false)
    {
        var lat = Lattice.Chain(n, periodic);
        var ising = new List<PauliRotation>();
        if (j != 0)
        {
            foreach (var (a, c) in lat.Edges) ising.Add(new PauliRotation(On(n, [a, c], "ZZ"), 2 * j));
        }
        if (h != 0)
        {
            for (int i = 0; i < n; i++) ising.Add(new PauliRotation(PauliString.Single(n, i, 'Z'), 2 * h));
        }
        var kick = new List<PauliRotation>();
        if (b != 0)
        {
            for (int i = 0; i < n; i++) kick.Add(new PauliRotation(PauliString.Single(n, i, 'X'), 2 * b));
        }
        return new FloquetDrive([ising, kick], 1.0);
    }

    /// <summary>
    /// q-body Majorana (SYK) model on <paramref name="qubits"/> qubits, M = 2 * qubits Majoranas:
    /// H = i^{q/2} sum_{a1&lt;...&lt;aq} J_a psi_a1 ... psi_aq with {psi_a, psi_b} = delta_ab and
    /// Gaussian J_a of variance J^2 (q-1)! / M^{q-1}. In Pauli-string Majoranas chi = sqrt(2) psi each
    /// term is i^{q/2} (J_a / 2^{q/2}) chi_a1 ... chi_aq, so the drawn standard deviation is
    /// sqrt((q-1)!) J / M^{(q-1)/2} / 2^{q/2}.
    /// Source: J. Maldacena and D. Stanford, PRD 94, 106002 (2016); A. Kitaev (2015).
    /// </summary>
    public static Hamiltonian Syk(int qubits, int q = 4, double j = 1.0, long seed = 11)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(qubits, 1);
        if (q < 2 || (q & 1) != 0 || q > 2 * qubits) throw new ArgumentOutOfRangeException(nameof(q), q, "q must be even, at least 2 and at most the number of Majoranas.");
        int m = 2 * qubits;
        double fact = 1;
        for (int k = 2; k < q; k++) fact *= k;
        double std = Math.Sqrt(fact) * j / Math.Pow(m, (q - 1) / 2.0) / Math.Pow(2, q / 2.0);
        var rng = new ModelRandom(seed);
        var terms = new List<PauliTerm>();
        var idx = new int[q];
        for (int k = 0; k < q; k++) idx[k] = k;
        while (true)
        {
            double c = rng.Normal(0, std);
            var (s, sign) = JordanWigner.HermitianMonomial(qubits, idx);
            if (c != 0) terms.Add(new PauliTerm(s, sign * c));
            int p = q - 1;
            while (p >= 0 && idx[p] == m - q + p) p--;
            if (p < 0) break;
            idx[p]++;
            for (int k = p + 1; k < q; k++) idx[k] = idx[k - 1] + 1;
        }
        return new Hamiltonian(qubits, terms);
    }
}
