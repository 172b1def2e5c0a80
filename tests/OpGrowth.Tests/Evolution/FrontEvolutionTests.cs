using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Evolution;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Evolution;

/// <summary>The matrix-product front engine against dense traces, a free-fermion closed form and exact bookkeeping.</summary>
public class FrontEvolutionTests
{
    private static Model Load(string name, int n) => ModelLoader.Load(ShippedModels.Resolve(name), new Dictionary<string, string> { ["N"] = n.ToString(System.Globalization.CultureInfo.InvariantCulture) });

    [Fact]
    public void SiteWeights_TiltedChainN8_MatchDenseTraces()
    {
        // Reference: dense traces (ExactOtoc, exact). Bond dimension 256 keeps everything on 8 sites; what remains is the
        // second-order splitting error, measured 1.3e-5 at dt = 0.01 and t = 3 (it scales as dt^2: 4.7e-5 at 0.02).
        // Tolerance 1e-4.
        var m = Load("demo/tilted-chain", 8);
        var r = FrontEvolution.Run(m.Hamiltonian, m.Probes[0], new FrontEvolutionOptions { Time = 2, Dt = 0.01, RecordEvery = 100, BondDimensions = [256], Threads = 1 });
        var run = r.Runs[^1];
        var dense = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = m.Probes[0], Times = run.Times, Method = OtocMethod.Dense });
        double worst = 0;
        for (int i = 0; i < run.Times.Length; i++)
            foreach (var s in dense.Sites) worst = Math.Max(worst, Math.Abs(s.Weight.Values[i] - run.SiteWeights[i][s.Site]));
        Assert.True(worst < 1e-4, $"max |rho_j - dense| = {worst}");
        Assert.Equal(1.0, run.NormSquared[^1], 9);
    }

    [Fact]
    public void ZzOtoc_XxChain40Sites_MatchesFreeFermionClosedForm()
    {
        // Source: check-values.md, XX chain H = Jp sum (X X + Y Y): the Z-Z OTOC is F = 1 - 4 |U_0r|^2 (1 - |U_0r|^2) on any
        // open chain, U = exp(-i h t) with h the single-particle hopping matrix (amplitude 2 Jp between neighbours),
        // computed here with MathNet. The front engine gives F against Z_r from the letter weights:
        // F = 1 - 2 (w_X(r) + w_Y(r)). 40 sites, probe Z_0 at the end, t = 6 (the light cone reaches site 12);
        // dt = 0.01 leaves a splitting error of order 1e-5; tolerance 2e-4.
        const int n = 40;
        const double jp = 0.5, t = 6;
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++)
        {
            terms.Add(new(PauliString.Parse($"X_{i} X_{i + 1}", n), jp));
            terms.Add(new(PauliString.Parse($"Y_{i} Y_{i + 1}", n), jp));
        }
        var h = new Hamiltonian(n, terms);
        var op = PauliChainOperator.FromString(PauliString.Single(n, 0, 'Z'));
        var gates = BondGate.BondHamiltonians(h, out _)!;
        const double dt = 0.01;
        var half = gates.Select(g => BondGate.Of(g, dt / 2)).ToArray();
        var full = BondGate.Of(gates[n - 2], dt);
        for (int s = 0; s < (int)Math.Round(t / dt); s++)
        {
            for (int b = 0; b < n - 2; b++) op.ApplyBond(b, half[b], 32, 1e-16, moveRight: true);
            op.ApplyBond(n - 2, full, 32, 1e-16, moveRight: false);
            for (int b = n - 3; b >= 0; b--) op.ApplyBond(b, half[b], 32, 1e-16, moveRight: false);
        }
        var (letters, _) = op.LetterWeights();
        var hop = Matrix<Complex>.Build.Dense(n, n);
        for (int i = 0; i + 1 < n; i++) hop[i, i + 1] = hop[i + 1, i] = 2 * jp;
        var evd = hop.Evd(Symmetricity.Hermitian);
        var u = evd.EigenVectors * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(new Complex(0, -e.Real * t))).ToArray()) * evd.EigenVectors.ConjugateTranspose();
        double worst = 0;
        for (int r = 1; r < n; r++)
        {
            double p = u[0, r].Magnitude * u[0, r].Magnitude;
            double want = 1 - 4 * p * (1 - p);
            double got = 1 - 2 * (letters[r][1] + letters[r][2]);
            worst = Math.Max(worst, Math.Abs(got - want));
        }
        Assert.True(worst < 2e-4, $"max |F_ZZ - closed form| = {worst}");
        Assert.True(op.Discarded < 1e-10, $"discarded {op.Discarded}");
    }

    [Fact]
    public void SmallBond_NormPlusDiscarded_IsOne()
    {
        // Each truncation drops exactly the squared singular values it removes: ||O||^2 + dropped = 1 to rounding.
        var m = Load("demo/tilted-chain", 12);
        var r = FrontEvolution.Run(m.Hamiltonian, m.Probes[0], new FrontEvolutionOptions { Time = 3, Dt = 0.1, RecordEvery = 30, BondDimensions = [4], Threads = 1 });
        var run = r.Runs[0];
        Assert.True(run.NormSquared[^1] < 0.999, "expected truncation at bond dimension 4");
        var op = PauliChainOperator.FromString(m.Probes[0]);
        var gates = BondGate.BondHamiltonians(m.Hamiltonian, out _)!.Select(g => BondGate.Of(g, 0.05)).ToArray();
        for (int s = 0; s < 30; s++)
        {
            for (int b = 0; b < 11; b++) op.ApplyBond(b, gates[b], 4, 1e-16, moveRight: true);
            for (int b = 10; b >= 0; b--) op.ApplyBond(b, gates[b], 4, 1e-16, moveRight: false);
        }
        Assert.Equal(1.0, op.NormSquared() + op.Discarded, 10);
    }

    [Fact]
    public void BondGate_IsOrthogonalAndMatchesDenseConjugation()
    {
        // Reference: U^dagger P_b U by MathNet dense matrices, decomposed into Pauli strings (Dense.Decompose).
        var rng = new Random(3);
        var h = Matrix<Complex>.Build.Dense(4, 4);
        for (int a = 1; a < 16; a++) h += BondGate.Pauli(a >> 2, a & 3) * (rng.NextDouble() - 0.5);
        const double tau = 0.37;
        var g = BondGate.Of(h, tau);
        var m = new double[16, 16];
        foreach (var (a, b, v) in g.Entries) m[a, b] = v;
        var evd = h.Evd(Symmetricity.Hermitian);
        var u = evd.EigenVectors * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(new Complex(0, -e.Real * tau))).ToArray()) * evd.EigenVectors.ConjugateTranspose();
        for (int b = 0; b < 16; b++)
        {
            var conj = u.ConjugateTranspose() * BondGate.Pauli(b >> 2, b & 3) * u;
            for (int a = 0; a < 16; a++) Assert.Equal((BondGate.Pauli(a >> 2, a & 3) * conj).Trace().Real / 4, m[a, b], 12);
        }
        for (int a = 0; a < 16; a++)
            for (int c = 0; c < 16; c++)
            {
                double dot = 0;
                for (int b = 0; b < 16; b++) dot += m[a, b] * m[c, b];
                Assert.Equal(a == c ? 1 : 0, dot, 12);
            }
    }

    [Theory]
    [InlineData(60, 60, 70)]     // exact path (Gram eigendecomposition)
    [InlineData(200, 160, 40)]   // randomized range finder
    public void LowRank_SingularValuesAndDroppedWeight_MatchMathNetSvd(int rows, int cols, int keep)
    {
        // Reference: MathNet's full SVD. A matrix of rank 40 plus noise of 1e-7: the kept singular values agree to 1e-9
        // relative, the dropped weight to 1e-9 of the total.
        var rng = new Random(rows);
        var a = Matrix<double>.Build.Random(rows, 40, new MathNet.Numerics.Distributions.Normal(0, 1, rng));
        var b = Matrix<double>.Build.Random(40, cols, new MathNet.Numerics.Distributions.Normal(0, 1, rng));
        var mat = a * b + Matrix<double>.Build.Random(rows, cols, new MathNet.Numerics.Distributions.Normal(0, 1e-7, rng));
        var data = new double[rows * cols];
        for (int i = 0; i < rows; i++)
            for (int j = 0; j < cols; j++) data[i * cols + j] = mat[i, j];
        var f = LowRankFactor.Truncate(data, rows, cols, keep, 0, new Random(1));
        var s = mat.Svd(false).S;
        double total = s.Sum(x => x * x);
        for (int k = 0; k < Math.Min(f.Rank, 40); k++) Assert.Equal(s[k], f.S[k], 9 - (int)Math.Ceiling(Math.Log10(s[0])));
        double dropped = s.Skip(f.Rank).Sum(x => x * x);
        Assert.True(Math.Abs(f.Dropped - dropped) <= 1e-9 * total, $"dropped {f.Dropped} against {dropped}");
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Budgets_TiltedChain60Sites_AgreeOnTheFrontFarBeyondWhereTheStringEngineStalls()
    {
        // The truncated Pauli-string engine's front stalls near distance 8-9 at 1e5-4e5 strings (measured, issue 16);
        // the matrix-product front at bond dimensions 16 and 32 must agree (within 2% of the arrival time) to distance 14
        // or more on a 60-site chain by t = 10, with v_B moving by less than 5% between the two.
        var m = Load("mixed-field-ising", 60);
        var r = FrontEvolution.Run(m.Hamiltonian, PauliString.Single(60, 0, 'Z'), new FrontEvolutionOptions { Time = 10, Dt = 0.1, BondDimensions = [16, 32], Threads = 2 });
        Assert.True(r.ConvergedDistance >= 14, $"budgets agree only to distance {r.ConvergedDistance}");
        var vb = r.Convergence.Single(c => c.Figure == "butterflyVelocity");
        Assert.True(vb.RelativeMovement < 0.05, $"v_B moved {vb.RelativeMovement}");
    }
}
