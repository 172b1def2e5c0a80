using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Pauli;

namespace OpGrowth.Structure;

/// <summary>
/// The free-fermion solution of a Hamiltonian whose frustration graph is a line graph: every term h_j P_j
/// is a Majorana bilinear s_j i gamma_a gamma_b on the root graph's edge (a, b), so
/// H = (i/4) sum_ab A_ab gamma_a gamma_b with the real antisymmetric single-particle matrix A
/// (A_ab = 2 h_j s_j), the Majoranas evolve linearly, gamma(t) = exp(A t) gamma, and the levels are
/// E = sum_k (+-) eps_k / 2 over the positive eigenvalues eps_k of i A.
/// </summary>
/// <remarks>
/// Signs: the Majoranas' signs are free along a spanning tree of the root graph (set to +1 there); each
/// further edge closes a cycle, whose product of terms equals a phase times a conserved string C (the
/// identity, or a symmetry such as the fermion parity of a ring). The cycle's sign follows from that phase in
/// the sector C = +1, which is the sector this solution describes (stated in <see cref="Notes"/>).
/// Source: Chapman and Flammia, Quantum 4, 278 (2020); single-particle form: Lieb, Schultz, Mattis,
/// Ann. Phys. 16, 407 (1961).
/// </remarks>
public sealed class FreeFermionSolution
{
    private readonly Matrix<double> _a;

    /// <summary>Number of Majorana modes (root vertices).</summary>
    public int Modes { get; }

    /// <summary>For each term (in <see cref="Terms"/> order): its root edge (A, B) and sign s.</summary>
    public IReadOnlyList<(int A, int B, int Sign)> Edges { get; }

    /// <summary>The terms mapped (twins removed: see <see cref="Notes"/>).</summary>
    public IReadOnlyList<PauliTerm> Terms { get; }

    /// <summary>Non-negative single-particle energies eps_k (eigenvalues of iA come in +-eps pairs), ascending.</summary>
    public IReadOnlyList<double> SingleParticleEnergies { get; }

    /// <summary>Sector statements and other remarks.</summary>
    public IReadOnlyList<string> Notes { get; }

    /// <summary>Number of independent cycles of the root graph whose product is a conserved string (not a number): the solution holds in their +1 sector.</summary>
    public int SectorCycles { get; }

    private FreeFermionSolution(int modes, List<(int, int, int)> edges, List<PauliTerm> terms, Matrix<double> a, double[] eps, List<string> notes, int sectorCycles)
    {
        Modes = modes;
        Edges = edges;
        Terms = terms;
        _a = a;
        SingleParticleEnergies = eps;
        Notes = notes;
        SectorCycles = sectorCycles;
    }

    /// <summary>The single-particle matrix A (a copy).</summary>
    public double[,] SingleParticleMatrix() => _a.ToArray();

    /// <summary>
    /// Builds the solution when the frustration graph of <paramref name="h"/> is a line graph (after merging
    /// twins: terms with the same anticommutation pattern, whose products are conserved); null otherwise.
    /// </summary>
    public static FreeFermionSolution? TryBuild(Hamiltonian h, out string reason)
    {
        ArgumentNullException.ThrowIfNull(h);
        var notes = new List<string>();
        var all = h.Terms.Where(t => !t.String.IsIdentity).ToList();
        var g = FrustrationGraph.Of(all.Select(t => t.String));
        var coef = all.ToDictionary(t => t.String, t => t.Coefficient);
        // twins: non-adjacent vertices with identical neighbourhoods are merged into one vertex
        var keep = new List<int>();
        var bySignature = new Dictionary<string, int>();
        for (int v = 0; v < g.Count; v++)
        {
            string sig = string.Join(",", g.Neighbours(v));
            if (g.Neighbours(v).Count > 0 && bySignature.TryGetValue(sig, out int first))
            {
                notes.Add($"{g.Terms[v]} anticommutes with exactly the terms {g.Terms[first]} does: their product commutes with every term; the solution treats them in a sector of it");
                continue;
            }
            bySignature[sig] = v;
            keep.Add(v);
        }
        if (keep.Count < g.Count)
        {
            reason = $"{g.Count - keep.Count} term(s) are twins of others (same anticommutation pattern); merging them needs the sectors of their conserved products, not built here";
            return null;
        }
        var root = LineGraphRoot.Find(g.Count, g.Neighbours, out bool complete, out int failedAt);
        if (root is null)
        {
            reason = complete ? $"the frustration graph is not a line graph (no root edge fits the term {g.Terms[Math.Max(0, failedAt)]})" : "the line-graph search ran out of its budget";
            return null;
        }
        int m = root.RootVertices;
        int n = h.N;
        // spanning forest of the root graph: signs +1 on tree edges
        var parent = new int[m];
        var parentEdge = new int[m];
        var depth = new int[m];
        Array.Fill(parent, -2);
        var adjacency = new List<(int To, int Edge)>[m];
        for (int i = 0; i < m; i++) adjacency[i] = [];
        for (int e = 0; e < g.Count; e++)
        {
            adjacency[root.A[e]].Add((root.B[e], e));
            adjacency[root.B[e]].Add((root.A[e], e));
        }
        var isTree = new bool[g.Count];
        for (int s = 0; s < m; s++)
        {
            if (parent[s] != -2) continue;
            parent[s] = -1;
            parentEdge[s] = -1;
            var q = new Queue<int>();
            q.Enqueue(s);
            while (q.Count > 0)
            {
                int x = q.Dequeue();
                foreach (var (y, e) in adjacency[x])
                {
                    if (parent[y] != -2) continue;
                    parent[y] = x;
                    parentEdge[y] = e;
                    depth[y] = depth[x] + 1;
                    isTree[e] = true;
                    q.Enqueue(y);
                }
            }
        }
        var sign = Enumerable.Repeat(1, g.Count).ToArray();
        int sectorCycles = 0;
        for (int e = 0; e < g.Count; e++)
        {
            if (isTree[e]) continue;
            // fundamental cycle: a_e -> ... (tree path) ... -> b_e, closed by e (traversed b_e -> a_e)
            var path = TreePath(root.A[e], root.B[e], parent, parentEdge, depth);
            // traversal: start at a_e, follow the path edges to b_e, then edge e back to a_e
            var seq = new List<(int Edge, int From, int To)>();
            int cur = root.A[e];
            foreach (int pe in path)
            {
                int next = root.A[pe] == cur ? root.B[pe] : root.A[pe];
                seq.Add((pe, cur, next));
                cur = next;
            }
            seq.Add((e, cur, root.A[e]));
            // Pauli side: product of the terms in traversal order = i^phase C
            var prod = PauliString.Identity(n);
            int phase = 0;
            foreach (var (edge, _, _) in seq)
            {
                prod = PauliString.Multiply(prod, g.Terms[edge], out int ph);
                phase += ph;
            }
            // Majorana side: prod_j s_j sigma_j (i gamma_from gamma_to) = (prod s_j sigma_j) i^k
            int k = seq.Count;
            int known = 1;
            foreach (var (edge, from, _) in seq)
            {
                int sigma = root.A[edge] == from ? 1 : -1;
                known *= sigma * (edge == e ? 1 : sign[edge]);
            }
            int rest = ((phase - k) % 4 + 4) % 4; // prod s sigma = i^(phase - k) in the sector C = +1
            if ((rest & 1) != 0)
            {
                reason = "a cycle of the root graph has an imaginary product: the terms do not form consistent Majorana bilinears";
                return null;
            }
            int target = rest == 0 ? 1 : -1;
            sign[e] = target * known; // s_e such that the full product matches
            if (!prod.IsIdentity)
            {
                sectorCycles++;
                if (sectorCycles <= 3) notes.Add($"the cycle through {string.Join(", ", seq.Select(x => g.Terms[x.Edge]))} multiplies to the conserved string {prod}: the solution is given in its +1 sector");
            }
        }
        var a = Matrix<double>.Build.Dense(m, m);
        var edges = new List<(int, int, int)>();
        var terms = new List<PauliTerm>();
        for (int e = 0; e < g.Count; e++)
        {
            double hj = coef[g.Terms[e]];
            a[root.A[e], root.B[e]] += 2 * hj * sign[e];
            a[root.B[e], root.A[e]] -= 2 * hj * sign[e];
            edges.Add((root.A[e], root.B[e], sign[e]));
            terms.Add(new PauliTerm(g.Terms[e], hj));
        }
        var eps = SingleParticle(a);
        reason = "";
        return new FreeFermionSolution(m, edges, terms, a, eps, notes, sectorCycles);
    }

    /// <summary>
    /// Non-negative single-particle energies: the eigenvalues of the symmetric A^T A = -A^2 are eps^2, each
    /// twice (once for +eps and once for -eps of iA); an odd number of modes adds one zero mode.
    /// </summary>
    private static double[] SingleParticle(Matrix<double> a)
    {
        int m = a.RowCount;
        // A^T A from the sparse rows of A (few entries per row for local terms)
        var rows = Enumerable.Range(0, m).Select(i => Enumerable.Range(0, m).Where(j => a[i, j] != 0).Select(j => (j, a[i, j])).ToArray()).ToArray();
        var ata = new double[(long)m * m];
        foreach (var row in rows)
        {
            foreach (var (p, ap) in row)
            {
                foreach (var (q, aq) in row) ata[(long)p * m + q] += ap * aq;
            }
        }
        var w = OpGrowth.Exact.SymmetricEigen.Eigenvalues(ata, m, Environment.ProcessorCount).Select(x => Math.Sqrt(Math.Max(0, x))).OrderBy(x => x).ToList();
        var result = new List<double>();
        if (w.Count % 2 == 1)
        {
            result.Add(0);
            w.RemoveAt(0);
        }
        for (int i = 0; i + 1 < w.Count; i += 2) result.Add(0.5 * (w[i] + w[i + 1]));
        return [.. result.OrderBy(x => x)];
    }

    private static List<int> TreePath(int from, int to, int[] parent, int[] parentEdge, int[] depth)
    {
        var up = new List<int>();
        var down = new List<int>();
        int x = from, y = to;
        while (depth[x] > depth[y]) { up.Add(parentEdge[x]); x = parent[x]; }
        while (depth[y] > depth[x]) { down.Add(parentEdge[y]); y = parent[y]; }
        while (x != y)
        {
            up.Add(parentEdge[x]);
            x = parent[x];
            down.Add(parentEdge[y]);
            y = parent[y];
        }
        down.Reverse();
        up.AddRange(down);
        return up;
    }

    /// <summary>
    /// The many-body levels E = sum_k (+-) eps_k / 2 (all 2^(modes/2) sign choices), ascending; for tests and
    /// small models only (at most 24 modes).
    /// </summary>
    public double[] ManyBodyLevels()
    {
        var eps = SingleParticleEnergies;
        if (eps.Count > 12) throw new InvalidOperationException("Too many modes to list every level.");
        int k = eps.Count;
        var levels = new double[1 << k];
        for (int mask = 0; mask < levels.Length; mask++)
        {
            double e = 0;
            for (int i = 0; i < k; i++) e += ((mask >> i & 1) != 0 ? 0.5 : -0.5) * eps[i];
            levels[mask] = e;
        }
        Array.Sort(levels);
        return levels;
    }

    /// <summary>
    /// The Majorana light cone: |R_ab(t)|^2 with R(t) = exp(A t), for Majorana a and every b, at each time.
    /// Row a of exp(A t) is exp(-A t) e_a (A is antisymmetric), computed by the Chebyshev-Bessel expansion
    /// exp(tau B) = J_0(tau) + 2 sum_k J_k(tau) Q_k(B), Q_0 = 1, Q_1 = B, Q_(k+1) = 2 B Q_k + Q_(k-1), with
    /// B = -A / rho, tau = rho t and rho a Gershgorin bound on the spectral radius; the vectors Q_k e_a are
    /// made once (sparse products) and shared by every time. Source: Tal-Ezer and Kosloff, J. Chem. Phys. 81,
    /// 3967 (1984) (Chebyshev propagator); Bessel values from MathNet.
    /// </summary>
    public double[][] LightCone(int a, IReadOnlyList<double> times)
    {
        ArgumentNullException.ThrowIfNull(times);
        ArgumentOutOfRangeException.ThrowIfNegative(a);
        ArgumentOutOfRangeException.ThrowIfGreaterThanOrEqual(a, Modes);
        int m = Modes;
        var rows = new (int Col, double Value)[m][];
        double rho = 1e-300;
        for (int i = 0; i < m; i++)
        {
            var list = new List<(int, double)>();
            double sum = 0;
            for (int j = 0; j < m; j++)
            {
                if (_a[i, j] == 0) continue;
                list.Add((j, -_a[i, j]));
                sum += Math.Abs(_a[i, j]);
            }
            rows[i] = [.. list];
            rho = Math.Max(rho, sum);
        }
        double tauMax = rho * times.Select(Math.Abs).DefaultIfEmpty(0).Max();
        int kMax = (int)Math.Ceiling(tauMax + 10 * Math.Pow(tauMax, 1.0 / 3) + 40); // J_k(tau) < 1e-16 beyond this (common practice)
        var q = new List<double[]>(kMax + 1);
        var q0 = new double[m];
        q0[a] = 1;
        q.Add(q0);
        double[] Apply(double[] v)
        {
            var r = new double[m];
            for (int i = 0; i < m; i++)
            {
                double acc = 0;
                foreach (var (c, val) in rows[i]) acc += val * v[c];
                r[i] = acc / rho;
            }
            return r;
        }
        q.Add(Apply(q0));
        for (int k = 1; k < kMax; k++)
        {
            var bq = Apply(q[k]);
            var next = new double[m];
            for (int i = 0; i < m; i++) next[i] = 2 * bq[i] + q[k - 1][i];
            q.Add(next);
        }
        var result = new double[times.Count][];
        for (int ti = 0; ti < times.Count; ti++)
        {
            double tau = rho * times[ti];
            var v = new double[m];
            for (int k = 0; k <= kMax; k++)
            {
                double j = MathNet.Numerics.SpecialFunctions.BesselJ(k, tau) * (k == 0 ? 1 : 2);
                if (j == 0) continue;
                var qk = q[k];
                for (int i = 0; i < m; i++) v[i] += j * qk[i];
            }
            result[ti] = v.Select(x => x * x).ToArray();
        }
        return result;
    }
}
