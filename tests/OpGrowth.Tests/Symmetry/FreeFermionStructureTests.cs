using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Structure;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Symmetry;

/// <summary>
/// Frustration-graph structure (Chapman and Flammia, Quantum 4, 278 (2020)): known free models give line
/// graphs and their free-fermion levels reproduce the dense spectrum (MathNet, the independent route);
/// known non-free models contain a claw. Tolerance 1e-9 of the spectral scale (double-precision solvers).
/// </summary>
public class FreeFermionStructureTests(Xunit.Abstractions.ITestOutputHelper output)
{
    private const string Header = "name = \"t\"\ndescription = \"test\"\n";

    private static Model Load(string toml) => ModelLoader.Parse(toml, "test.toml");

    private static Model Chain(int n, string terms) => Load(Header + $"[parameters]\nN = {n}\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n" + terms);

    private static string Term(string pauli, string on, string coupling) => $"[[term]]\npauli = {pauli}\non = \"{on}\"\ncoupling = {coupling}\n";

    private void AssertFreeSpectrum(Model model)
    {
        var ff = FreeFermionSolution.TryBuild(model.Hamiltonian, out string why);
        Assert.True(ff is not null, why);
        Assert.Equal(0, ff!.SectorCycles);
        var levels = ff.ManyBodyLevels();
        int repeat = (1 << model.N) / levels.Length;
        var expanded = levels.SelectMany(e => Enumerable.Repeat(e, repeat)).OrderBy(x => x).ToArray();
        var dense = Dense.Of(model.N, model.Hamiltonian.Terms).Evd(Symmetricity.Hermitian).EigenValues.Select(z => z.Real).OrderBy(x => x).ToArray();
        output.WriteLine($"{ff.Modes} Majorana modes, {levels.Length} free levels x {repeat}");
        Assert.Equal(dense.Length, expanded.Length);
        double scale = dense.Max(Math.Abs) + 1;
        for (int i = 0; i < dense.Length; i++) Assert.True(Math.Abs(dense[i] - expanded[i]) < 1e-9 * scale, $"level {i}: dense {dense[i]}, free {expanded[i]}");
    }

    [Fact]
    public void TransverseIsingOpenChain_LineGraph_LevelsMatchDense()
        => AssertFreeSpectrum(Chain(7, Term("\"ZZ\"", "bonds", "-1") + Term("\"X\"", "sites", "-0.7")));

    [Fact]
    public void AnisotropicXyInField_LineGraph_LevelsMatchDense()
        // Source: Lieb, Schultz, Mattis, Ann. Phys. 16, 407 (1961); the root graph has 4-cycles whose term
        // products are numbers, so no sector is involved.
        => AssertFreeSpectrum(Chain(6, Term("\"XX\"", "bonds", "0.75") + Term("\"YY\"", "bonds", "0.25") + Term("\"Z\"", "sites", "0.7")));

    [Fact]
    public void CompassChain_LineGraph_LevelsMatchDense()
        // Source: Brzezicki, Dziarmaga, Oles, PRB 75, 134415 (2007) (from memory).
        => AssertFreeSpectrum(Chain(7, Term("\"XX\"", "bonds", "\"(1+(-1)^i)/2\"") + Term("\"YY\"", "bonds", "\"0.7*(1-(-1)^i)/2\"")));

    [Fact]
    public void QuadraticMajoranaModel_LineGraph_LevelsMatchDense()
        => AssertFreeSpectrum(Load(Header + "[parameters]\nN = 5\n[lattice]\nkind = \"all-to-all\"\nsites = \"N\"\n[[term]]\nmajorana = 2\ncoupling = \"normal(0, 0.3)\"\nseed = 5\n"));

    [Fact]
    public void FreeModelInAScrambledBasis_StillALineGraph()
    {
        // The transverse-field Ising chain conjugated by a Clifford circuit (CNOTs and Hadamard-like letter
        // swaps: a symplectic map of the strings) keeps its frustration graph, so it stays free; its levels are
        // checked against the dense spectrum of the scrambled Hamiltonian itself.
        var tfi = Chain(6, Term("\"ZZ\"", "bonds", "-1") + Term("\"X\"", "sites", "-0.7"));
        int n = tfi.N;
        var rng = new Random(11);
        var terms = tfi.Hamiltonian.Terms.Select(t => t.String).ToList();
        for (int g = 0; g < 12; g++)
        {
            int c = rng.Next(n), t = (c + 1 + rng.Next(n - 1)) % n;
            terms = terms.Select(s => Cnot(s, c, t)).ToList();
        }
        var scrambled = new Hamiltonian(n, terms.Zip(tfi.Hamiltonian.Terms, (s, t) => new PauliTerm(s, t.Coefficient)));
        Assert.Contains(scrambled.Terms, t => t.String.Weight >= 3);
        AssertFreeSpectrum(Model.Of(scrambled, Lattice.Chain(n)));
    }

    private static PauliString Cnot(PauliString s, int control, int target)
    {
        // CNOT: X_c -> X_c X_t, Z_t -> Z_c Z_t (signs do not matter for the structure: the coefficients are re-set)
        bool xc = s[control] is 'X' or 'Y', zc = s[control] is 'Z' or 'Y';
        bool xt = s[target] is 'X' or 'Y', zt = s[target] is 'Z' or 'Y';
        xt ^= xc;
        zc ^= zt;
        var b = new PauliString.Builder(s.N);
        for (int j = 0; j < s.N; j++) if (s[j] != 'I') b.Set(j, s[j]);
        b.Set(control, Letter(xc, zc));
        b.Set(target, Letter(xt, zt));
        return b.Build();
    }

    private static char Letter(bool x, bool z) => x && z ? 'Y' : x ? 'X' : z ? 'Z' : 'I';

    [Fact]
    public void NonFreeModels_HaveAClaw()
    {
        var xxz = Chain(6, Term("[\"XX\", \"YY\"]", "bonds", "1") + Term("\"ZZ\"", "bonds", "0.5"));
        var xy2d = Load(Header + "[lattice]\nkind = \"square\"\nwidth = 3\nheight = 3\n" + Term("[\"XX\", \"YY\"]", "bonds", "1"));
        var tfim2d = Load(Header + "[lattice]\nkind = \"square\"\nwidth = 3\nheight = 3\n" + Term("\"ZZ\"", "bonds", "1") + Term("\"X\"", "sites", "1"));
        foreach (var m in new[] { xxz, xy2d, tfim2d })
        {
            Assert.Null(FreeFermionSolution.TryBuild(m.Hamiltonian, out _));
            Assert.NotNull(FrustrationGraph.Of(m.Hamiltonian.Terms.Select(t => t.String)).FindClaw());
        }
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void MajoranaLightCone_MatchesExactEvolution_N10()
    {
        // Open transverse-field Ising chain, N = 10: Z_0 is the end Majorana chi_0 of the root path. Its exact
        // Heisenberg evolution (dense exp(iHt), MathNet) expanded in Pauli strings must put weight |R_0b(t)|^2
        // on the string of Majorana b (Z_0 times the terms along the root path from 0 to b). Tolerance 1e-10.
        int n = 10;
        var model = Chain(n, Term("\"ZZ\"", "bonds", "-1") + Term("\"X\"", "sites", "-0.7"));
        var ff = FreeFermionSolution.TryBuild(model.Hamiltonian, out string why)!;
        Assert.NotNull(ff);
        var probe = PauliString.Single(n, 0, 'Z');
        // the root vertex of Z_0: the endpoint of the X_0 edge that no ZZ edge touches
        int x0 = ff.Terms.ToList().FindIndex(t => t.String == PauliString.Single(n, 0, 'X'));
        var (ea, eb, _) = ff.Edges[x0];
        int a = ff.Edges.Count(e => e.A == ea || e.B == ea) == 1 ? ea : eb;
        // strings of every Majorana b: probe times the terms on the root path from a to b
        var stringOf = new Dictionary<int, PauliString> { [a] = probe };
        var queue = new Queue<int>();
        queue.Enqueue(a);
        while (queue.Count > 0)
        {
            int v = queue.Dequeue();
            for (int e = 0; e < ff.Edges.Count; e++)
            {
                var (p, q, _) = ff.Edges[e];
                int w = p == v ? q : q == v ? p : -1;
                if (w < 0 || stringOf.ContainsKey(w)) continue;
                stringOf[w] = PauliString.Multiply(stringOf[v], ff.Terms[e].String, out _);
                queue.Enqueue(w);
            }
        }
        var times = new[] { 0.5, 1.3, 2.7 };
        var cone = ff.LightCone(a, times);
        var h = Dense.Of(n, model.Hamiltonian.Terms);
        var p0 = Dense.Of(probe);
        for (int ti = 0; ti < times.Length; ti++)
        {
            var pt = Dense.Heisenberg(h, p0, times[ti]);
            double total = 0;
            foreach (var (b, s) in stringOf)
            {
                double weight = Dense.Inner(Dense.Of(s), pt).Magnitude;
                weight *= weight;
                total += weight;
                Assert.True(Math.Abs(weight - cone[ti][b]) < 1e-10, $"t = {times[ti]}, Majorana {b}: exact {weight}, free {cone[ti][b]}");
            }
            Assert.True(Math.Abs(total - 1) < 1e-10, $"weight outside the Majorana strings: {1 - total}");
        }
    }

    [Fact]
    public void MajoranaLightCone_ThousandSites_RunsInSeconds()
    {
        int n = 1000;
        var model = Chain(n, Term("\"ZZ\"", "bonds", "-1") + Term("\"X\"", "sites", "-0.7"));
        var sw = System.Diagnostics.Stopwatch.StartNew();
        var ff = FreeFermionSolution.TryBuild(model.Hamiltonian, out string why);
        Assert.True(ff is not null, why);
        var cone = ff!.LightCone(0, [0, 10, 50, 100]);
        output.WriteLine($"N = 1000: {ff.Modes} modes, build + light cone {sw.Elapsed.TotalSeconds:F1} s");
        foreach (var row in cone) Assert.True(Math.Abs(row.Sum() - 1) < 1e-8, $"norm {row.Sum()}");
        Assert.True(sw.Elapsed.TotalSeconds < 120, $"{sw.Elapsed.TotalSeconds:F1} s");
    }
}
