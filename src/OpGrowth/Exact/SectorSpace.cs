using System.Numerics;
using OpGrowth.Pauli;

namespace OpGrowth.Exact;

/// <summary>A named symmetry operator (a site permutation, a Pauli string, or a product of both).</summary>
/// <param name="Name">Name used in sector labels and reports ("T" for translation, "R" for a reflection, "P(ZZZZ)" ...).</param>
/// <param name="Op">The operator.</param>
public sealed record SymmetryGenerator(string Name, MonomialOp Op);

/// <summary>
/// One symmetry sector: fixed number of down spins (when total Z is resolved), a character of the abelian
/// symmetry group and, for characters the swap maps onto themselves, the swap's eigenvalue. Holds the orbit
/// representatives with their norms; <see cref="Block"/> writes the Hamiltonian in the symmetrised basis.
/// </summary>
public sealed class SymmetryBlock
{
    internal SymmetryBlock(string label, string character, int downSpins, int multiplicity, string ensemble, int[] reps, double[] norms,
        SectorGroup group, Complex[] characters, Dictionary<int, int> rowOf, IReadOnlyList<string> mixedBy)
    {
        MixedBy = mixedBy;
        Label = label;
        Character = character;
        DownSpins = downSpins;
        Multiplicity = multiplicity;
        Ensemble = ensemble;
        _reps = reps;
        _norms = norms;
        _group = group;
        _chi = characters;
        _rowOf = rowOf;
    }

    private readonly int[] _reps;
    private readonly double[] _norms;
    private readonly SectorGroup _group;
    private readonly Complex[] _chi; // character of each group element
    private readonly Dictionary<int, int> _rowOf;

    /// <summary>Readable label, e.g. "Sz=0, k=3/14, R=+1".</summary>
    public string Label { get; }

    /// <summary>The character part of the label (momenta and parities, without the magnetisation).</summary>
    public string Character { get; }

    /// <summary>Number of down spins, or -1 when total Z is not resolved.</summary>
    public int DownSpins { get; }

    /// <summary>How many sectors share this block's spectrum (partners under the swap, time reversal or the half-filling flip).</summary>
    public int Multiplicity { get; }

    /// <summary>Wigner-Dyson class expected of this block for a chaotic Hamiltonian: "GOE" (an anti-unitary symmetry maps the sector onto itself) or "GUE".</summary>
    public string Ensemble { get; }

    /// <summary>Dimension of the block.</summary>
    public int Dimension => _reps.Length;

    /// <summary>
    /// Names of unresolved symmetries that map this sector onto itself: they split the block into
    /// independent pieces that are mixed here (its statistics lean toward Poisson). Empty for a clean block.
    /// </summary>
    public IReadOnlyList<string> MixedBy { get; }

    /// <summary>
    /// The block of H (row-major, Hermitian) in the symmetrised basis |a~&gt; = P_chi |a&gt; / sqrt(n_a), with
    /// P_chi = (1/|G|) sum_g conj(chi(g)) g and n_a = &lt;a|P_chi|a&gt;; &lt;a~|H|b~&gt; = sum_k h_k(b) conj(chi(g0)) w0 sqrt(n_a/n_b),
    /// where H|b&gt; = sum_k h_k(b)|s_k&gt; and g0|s_k&gt; = w0 |a&gt; brings s_k to its representative a.
    /// </summary>
    public Complex[] Block(IReadOnlyList<(ulong X, ulong Z, double Coefficient)> terms)
    {
        ArgumentNullException.ThrowIfNull(terms);
        int d = Dimension;
        var m = new Complex[(long)d * d];
        for (int col = 0; col < d; col++)
        {
            int b = _reps[col];
            foreach (var (x, z, c) in terms)
            {
                int t = b ^ (int)x;
                int p = BitOperations.PopCount(x & z) + 2 * BitOperations.PopCount(z & (ulong)(uint)b);
                var (rep, g0, w0) = _group.RepresentativeOf(t);
                if (!_rowOf.TryGetValue(rep, out int row)) continue;
                var v = c * IPow(p + w0) * Complex.Conjugate(_chi[g0]) * Math.Sqrt(_norms[row] / _norms[col]);
                m[(long)row * d + col] += v;
            }
        }
        return m;
    }

    /// <summary>The basis states spanned (orbit representatives).</summary>
    public IReadOnlyList<int> Representatives => _reps;

    internal static Complex IPow(int k) => (k & 3) switch { 0 => Complex.One, 1 => Complex.ImaginaryOne, 2 => -Complex.One, _ => -Complex.ImaginaryOne };
}

/// <summary>
/// The group used inside one magnetisation sector: its elements (products of the generators, and for the
/// swap-extended group also the swap times each), and for every basis state its orbit representative, the
/// element that maps it there and the phase picked up.
/// </summary>
internal sealed class SectorGroup
{
    public required MonomialOp[] Elements { get; init; }
    public required int[][] Exponents { get; init; } // per element (abelian part), plus a swap flag in the last slot
    public required Dictionary<int, (int Rep, int Element, int Phase)> Map { get; init; }
    public required Dictionary<int, List<(int Element, int Phase)>> Stabilizers { get; init; }

    public (int Rep, int Element, int Phase) RepresentativeOf(int s) => Map.TryGetValue(s, out var v) ? v : (-1, 0, 0);

    public static SectorGroup Build(IReadOnlyList<int> states, MonomialOp[] elements, int[][] exponents)
    {
        var map = new Dictionary<int, (int, int, int)>(states.Count);
        var stab = new Dictionary<int, List<(int, int)>>();
        var images = new (int Target, int Phase)[elements.Length];
        foreach (int s in states)
        {
            int rep = s, best = 0, bestPhase = 0;
            for (int e = 0; e < elements.Length; e++)
            {
                images[e] = elements[e].Apply(s);
                if (images[e].Target < rep)
                {
                    rep = images[e].Target;
                    best = e;
                    bestPhase = images[e].Phase;
                }
            }
            map[s] = (rep, best, bestPhase);
            if (rep == s)
            {
                var list = new List<(int, int)>();
                for (int e = 0; e < elements.Length; e++)
                {
                    if (images[e].Target == s) list.Add((e, images[e].Phase));
                }
                stab[s] = list;
            }
        }
        return new SectorGroup { Elements = elements, Exponents = exponents, Map = map, Stabilizers = stab };
    }
}

/// <summary>
/// Symmetry sectors of the computational basis for a group of monomial symmetries: optionally the number of
/// down spins (total Z), an abelian group generated by commuting, independent operators of finite order
/// (translations with their momenta, mirrors, Pauli-string parities), optionally one swap (an involution that
/// maps the abelian group onto itself, such as a reflection next to translations: it pairs the momenta k and
/// -k and splits k = -k into two parities), and optionally a flip that reverses total Z (resolved only at
/// zero magnetisation, where it is a symmetry; elsewhere it pairs the sectors m and N - m). With a real
/// Hamiltonian, time reversal pairs every character with its complex conjugate; such pairs are listed once.
/// </summary>
/// <remarks>
/// Characters of the abelian group: chi(prod g_i^a_i) = exp(2 pi i sum q_i a_i / o_i) with o_i the order of
/// g_i. A sector's reference ensemble is GOE when the Hamiltonian is real and an anti-unitary symmetry (time
/// reversal K, or the swap times K) maps the sector onto itself, otherwise GUE (Dyson's threefold way; for
/// translation-invariant chains, momentum sectors k != 0, pi are GOE only with a reflection: e.g. Santos and
/// Rigol, PRE 81, 036206 (2010), from memory). Basis convention: bit j of an index is site j.
/// </remarks>
public static class SectorSpace
{
    /// <summary>Largest number of elements of the symmetry group (its product with the sites' count bounds the work).</summary>
    public const int MaxGroupOrder = 4096;

    /// <summary>
    /// All sectors. <paramref name="abelian"/> must commute pairwise and be independent (no product of
    /// them equal to another, or to a multiple of the identity); <paramref name="swap"/> must be an involution
    /// outside their group that maps each of them into it by conjugation; <paramref name="halfFillingFlip"/>
    /// must commute with all of them, square to the identity and flip every spin (X part = all sites).
    /// Throws <see cref="ArgumentException"/> when these conditions fail. <paramref name="maxDownSpins"/> skips
    /// the magnetisation sectors with more down spins (used when total spin is resolved by multiplets).
    /// </summary>
    public static IReadOnlyList<SymmetryBlock> Enumerate(int n, bool totalZ, IReadOnlyList<SymmetryGenerator> abelian, SymmetryGenerator? swap = null,
        SymmetryGenerator? halfFillingFlip = null, bool realHamiltonian = false, int maxDownSpins = int.MaxValue,
        IReadOnlyList<SymmetryGenerator>? residual = null)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(n, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(n, 24);
        ArgumentNullException.ThrowIfNull(abelian);
        if (halfFillingFlip is not null && !totalZ) throw new ArgumentException("A half-filling flip needs total Z resolved; pass it as an abelian generator otherwise.", nameof(halfFillingFlip));
        var result = new List<SymmetryBlock>();
        var mags = totalZ ? Enumerable.Range(0, n + 1).ToArray() : [-1];
        foreach (int m in mags)
        {
            if (m > maxDownSpins) continue;
            int magMult = 1;
            var gens = abelian.ToList();
            if (halfFillingFlip is not null)
            {
                if (2 * m > n) continue; // the flip maps it onto n - m: same spectrum
                if (2 * m < n) magMult = 2;
                else gens.Add(halfFillingFlip);
            }
            var states = States(n, m);
            result.AddRange(SectorsOf(n, m, states, gens, swap, realHamiltonian, magMult, residual ?? []));
        }
        return result;
    }

    private static List<int> States(int n, int m)
    {
        var list = new List<int>();
        int full = 1 << n;
        for (int s = 0; s < full; s++)
        {
            if (m < 0 || BitOperations.PopCount((uint)s) == m) list.Add(s);
        }
        return list;
    }

    private static IEnumerable<SymmetryBlock> SectorsOf(int n, int m, List<int> states, List<SymmetryGenerator> gens, SymmetryGenerator? swap, bool real, int magMult,
        IReadOnlyList<SymmetryGenerator> residual)
    {
        int r = gens.Count;
        var orders = new int[r];
        for (int i = 0; i < r; i++)
        {
            var (order, scalar) = gens[i].Op.Order();
            if (scalar != 0) throw new ArgumentException($"Generator '{gens[i].Name}' has a power equal to i^{scalar} times the identity; use a Hermitian form.", nameof(gens));
            orders[i] = order;
            for (int j = 0; j < i; j++)
            {
                if (!MonomialOp.Compose(gens[i].Op, gens[j].Op).Equals(MonomialOp.Compose(gens[j].Op, gens[i].Op)))
                    throw new ArgumentException($"Generators '{gens[i].Name}' and '{gens[j].Name}' do not commute.", nameof(gens));
            }
        }
        long size = 1;
        foreach (int o in orders) size *= o;
        if (size * (swap is null ? 1 : 2) > MaxGroupOrder) throw new ArgumentException($"The symmetry group has {size} elements; at most {MaxGroupOrder} are supported.", nameof(gens));
        // abelian elements by exponent tuples (mixed radix)
        var elems = new MonomialOp[size];
        var exps = new int[size][];
        var index = new Dictionary<MonomialOp, int>();
        for (int e = 0; e < size; e++)
        {
            var a = new int[r];
            int rest = e;
            var op = MonomialOp.Identity(n);
            for (int i = 0; i < r; i++)
            {
                a[i] = rest % orders[i];
                rest /= orders[i];
                for (int k = 0; k < a[i]; k++) op = MonomialOp.Compose(gens[i].Op, op);
            }
            if (index.ContainsKey(op)) throw new ArgumentException("The generators are not independent (two different products are equal).", nameof(gens));
            index[op] = e;
            elems[e] = op;
            exps[e] = a;
        }
        // characters q: mixed radix index over orders
        Complex Chi(int[] q, int[] a)
        {
            double ph = 0;
            for (int i = 0; i < r; i++) ph += (double)q[i] * a[i] / orders[i];
            return Complex.FromPolarCoordinates(1, 2 * Math.PI * ph);
        }
        int[] Q(int c)
        {
            var q = new int[r];
            for (int i = 0; i < r; i++)
            {
                q[i] = c % orders[i];
                c /= orders[i];
            }
            return q;
        }
        int C(int[] q)
        {
            int c = 0;
            for (int i = r - 1; i >= 0; i--) c = c * orders[i] + ((q[i] % orders[i]) + orders[i]) % orders[i];
            return c;
        }
        // swap: conjugation of each generator, as an exponent tuple
        int[][]? conj = null;
        MonomialOp? d = swap?.Op;
        if (d is not null)
        {
            if (!MonomialOp.Compose(d, d).IsIdentity) throw new ArgumentException($"Swap '{swap!.Name}' is not an involution.", nameof(swap));
            if (index.ContainsKey(d)) throw new ArgumentException($"Swap '{swap!.Name}' lies in the abelian group.", nameof(swap));
            conj = new int[r][];
            for (int i = 0; i < r; i++)
            {
                var c = MonomialOp.Compose(MonomialOp.Compose(d, gens[i].Op), d);
                if (!index.TryGetValue(c, out int e)) throw new ArgumentException($"Swap '{swap!.Name}' does not map '{gens[i].Name}' into the group.", nameof(swap));
                conj[i] = exps[e];
            }
        }
        // character maps: swap (chi o Ad_d) and time reversal (conj(chi(g*)))
        int SwapOf(int c)
        {
            var q = Q(c);
            var q2 = new int[r];
            for (int i = 0; i < r; i++)
            {
                // chi'(g_i) = chi(d g_i d) = exp(2 pi i sum_j q_j conj[i][j] / o_j)
                double ph = 0;
                for (int j = 0; j < r; j++) ph += (double)q[j] * conj![i][j] / orders[j];
                ph -= Math.Floor(ph);
                q2[i] = (int)Math.Round(ph * orders[i]) % orders[i];
            }
            return C(q2);
        }
        // unresolved symmetries: their action on characters (null when one does not map the group onto itself)
        var residualMaps = new List<(string Name, int[][]? Conj)>();
        foreach (var u in residual)
        {
            var inv = Inverse(u.Op);
            int[][]? cj = new int[r][];
            for (int i = 0; i < r && cj is not null; i++)
            {
                var c = MonomialOp.Compose(MonomialOp.Compose(u.Op, gens[i].Op), inv);
                if (index.TryGetValue(c, out int e)) cj[i] = exps[e];
                else cj = null;
            }
            residualMaps.Add((u.Name, cj));
        }
        int MapBy(int[][] cj, int c)
        {
            var q = Q(c);
            var q2 = new int[r];
            for (int i = 0; i < r; i++)
            {
                double ph = 0;
                for (int j = 0; j < r; j++) ph += (double)q[j] * cj[i][j] / orders[j];
                ph -= Math.Floor(ph);
                q2[i] = (int)Math.Round(ph * orders[i]) % orders[i];
            }
            return C(q2);
        }
        List<string> Mixing(int c)
        {
            var list = new List<string>();
            foreach (var (name, cj) in residualMaps)
            {
                if (cj is null) { list.Add(name); continue; }
                int img = MapBy(cj, c);
                if (img == c || (d is not null && MapBy(cj, SwapOf(c)) == c)) list.Add(name);
            }
            return list;
        }
        var gensReal = gens.Select(g => g.Op.IsReal).ToArray();
        bool kOk = real && (d is null || d.IsReal) && gens.All(g => g.Op.IsReal || orders[Array.IndexOf(gens.ToArray(), g)] % 2 == 0);
        int KOf(int c)
        {
            var q = Q(c);
            var q2 = new int[r];
            for (int i = 0; i < r; i++) q2[i] = gensReal[i] ? -q[i] : orders[i] / 2 - q[i];
            return C(q2);
        }
        var groupA = SectorGroup.Build(states, elems, exps);
        SectorGroup? groupD = null;
        if (d is not null)
        {
            var ext = new MonomialOp[2 * size];
            var extExp = new int[2 * size][];
            for (int e = 0; e < size; e++)
            {
                ext[e] = elems[e];
                ext[size + e] = MonomialOp.Compose(d, elems[e]);
                extExp[e] = exps[e];
                extExp[size + e] = exps[e];
            }
            groupD = SectorGroup.Build(states, ext, extExp);
        }
        var done = new bool[size];
        for (int c = 0; c < size; c++)
        {
            if (done[c]) continue;
            // orbit of the character under swap and time reversal
            var orbit = new HashSet<int> { c };
            var queue = new Queue<int>();
            queue.Enqueue(c);
            while (queue.Count > 0)
            {
                int x = queue.Dequeue();
                var next = new List<int>();
                if (d is not null) next.Add(SwapOf(x));
                if (kOk) next.Add(KOf(x));
                foreach (int y in next) if (orbit.Add(y)) queue.Enqueue(y);
            }
            foreach (int y in orbit) done[y] = true;
            var q = Q(c);
            bool invariant = d is not null && SwapOf(c) == c;
            bool goe = kOk && (KOf(c) == c || (d is not null && SwapOf(KOf(c)) == c));
            string qLabel = Label(gens, orders, q);
            if (invariant)
            {
                foreach (int eps in new[] { 1, -1 })
                {
                    var chi = new Complex[2 * size];
                    for (int e = 0; e < size; e++)
                    {
                        chi[e] = Chi(q, exps[e]);
                        chi[size + e] = eps * chi[e];
                    }
                    var block = Make(groupD!, chi, m, n, qLabel + $"{(qLabel.Length > 0 ? ", " : "")}{swap!.Name}={(eps > 0 ? "+1" : "-1")}", magMult * orbit.Count, goe && KOf(c) == c ? "GOE" : "GUE", Mixing(c));
                    if (block is not null) yield return block;
                }
            }
            else
            {
                var chi = new Complex[size];
                for (int e = 0; e < size; e++) chi[e] = Chi(q, exps[e]);
                var block = Make(groupA, chi, m, n, qLabel, magMult * orbit.Count, goe ? "GOE" : "GUE", Mixing(c));
                if (block is not null) yield return block;
            }
        }
    }

    private static SymmetryBlock? Make(SectorGroup g, Complex[] chi, int m, int n, string qLabel, int mult, string ensemble, IReadOnlyList<string> mixedBy)
    {
        double order = g.Elements.Length;
        var reps = new List<int>();
        var norms = new List<double>();
        foreach (var (a, stab) in g.Stabilizers)
        {
            Complex s = Complex.Zero;
            foreach (var (e, p) in stab) s += Complex.Conjugate(chi[e]) * SymmetryBlock.IPow(p);
            double na = s.Real / order;
            if (Math.Abs(s.Imaginary) > 1e-9 * order) throw new InvalidOperationException("A sector norm came out complex: the character is inconsistent with the group.");
            if (na > 1e-9) // the projector annihilates states whose stabiliser has a non-trivial character
            {
                reps.Add(a);
                norms.Add(na);
            }
        }
        if (reps.Count == 0) return null;
        var order2 = reps.Select((a, i) => (a, i)).OrderBy(x => x.a).ToArray();
        var repsSorted = order2.Select(x => x.a).ToArray();
        var normsSorted = order2.Select(x => norms[x.i]).ToArray();
        var rowOf = new Dictionary<int, int>(repsSorted.Length);
        for (int i = 0; i < repsSorted.Length; i++) rowOf[repsSorted[i]] = i;
        string label = (m >= 0 ? $"Sz={(n - 2 * m) / 2.0:0.#}" : string.Empty);
        if (qLabel.Length > 0) label += (label.Length > 0 ? ", " : string.Empty) + qLabel;
        if (label.Length == 0) label = "full space";
        if (mult > 1) label += $" (x{mult})";
        return new SymmetryBlock(label, qLabel, m, mult, ensemble, repsSorted, normsSorted, g, chi, rowOf, mixedBy);
    }

    /// <summary>The inverse of a monomial operator (its power order - 1).</summary>
    private static MonomialOp Inverse(MonomialOp g)
    {
        var (order, _) = g.Order();
        var inv = MonomialOp.Identity(g.N);
        for (int k = 1; k < order; k++) inv = MonomialOp.Compose(g, inv);
        return inv;
    }

    private static string Label(List<SymmetryGenerator> gens, int[] orders, int[] q)
    {
        var parts = new List<string>();
        for (int i = 0; i < gens.Count; i++)
        {
            if (orders[i] == 2) parts.Add($"{gens[i].Name}={(q[i] == 0 ? "+1" : "-1")}");
            else parts.Add($"{gens[i].Name}: k={q[i]}/{orders[i]}");
        }
        return string.Join(", ", parts);
    }

    /// <summary>Terms of H as site-bit masks (bit j = site j), for <see cref="SymmetryBlock.Block"/>.</summary>
    public static (ulong X, ulong Z, double Coefficient)[] Masks(Hamiltonian h)
    {
        ArgumentNullException.ThrowIfNull(h);
        if (h.N > 30) throw new ArgumentOutOfRangeException(nameof(h), h.N, "At most 30 sites.");
        return h.Terms.Select(t => (t.String.X[0], t.String.Z[0], t.Coefficient)).ToArray();
    }
}
