using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Analysis;
using OpGrowth.Ensembles;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Ensembles;

public class BrownianTests
{
    private static List<PauliTerm> Cluster(int n, double j)
    {
        var terms = new List<PauliTerm>();
        double c = j / Math.Sqrt(n);
        for (int a = 0; a < n; a++)
            for (int b = a + 1; b < n; b++)
                foreach (char p in "XYZ")
                    foreach (char q in "XYZ")
                        terms.Add(new PauliTerm(new PauliString.Builder(n).Set(a, p).Set(b, q).Build(), c));
        return terms;
    }

    /// <summary>The all-to-all cluster with all nine couplings is recognised as a size chain with b = 6 Gamma, d = 2 Gamma (derivation in docs/ensembles.md).</summary>
    [Fact]
    public void Cluster_IsDetectedAsSizeChain()
    {
        var m = new BrownianModel("cluster", 8, Cluster(8, 1), LatticeGeometry.AllToAll(8));
        var expected = SizeChainRates.Cluster(8);
        Assert.NotNull(m.Chain);
        Assert.Equal(expected.Birth, m.Chain!.Birth, 1e-12);
        Assert.Equal(expected.Death, m.Chain.Death, 1e-12);
        var heis = new BrownianModel("heisenberg", 6, Enumerable.Range(0, 6).SelectMany(a => Enumerable.Range(a + 1, 5 - a).SelectMany(b => "XYZ".Select(p =>
            new PauliTerm(new PauliString.Builder(6).Set(a, p).Set(b, p).Build(), 1.0)))).ToList(), LatticeGeometry.AllToAll(6));
        Assert.Null(heis.Chain); // XX + YY + ZZ: rates depend on the letters
    }

    /// <summary>
    /// Trajectories against the size chain solved directly, N = 10 cluster: mean size at every record within 4.5
    /// standard errors of 20,000 trajectories plus the chain's own integration error; the random-operator
    /// stationary value (3N/4) 4^N/(4^N - 1) is reached by the chain (tolerance 1e-3 at t = 3).
    /// Source: Lashkari, Stanford, Hastings, Osborne, Hayden, JHEP 04 (2013) 022 (from memory).
    /// </summary>
    [Fact]
    public void Trajectories_AgreeWithSizeChain()
    {
        const int n = 10;
        var m = new BrownianModel("cluster", n, Cluster(n, 1), LatticeGeometry.AllToAll(n));
        var traj = BrownianSampler.Run(m, PauliString.Single(n, 0, 'Z'), new EnsembleOptions { Samples = 20_000, Seed = 4, Threads = 2, Time = 0.6, RecordInterval = 0.05 });
        var chain = SizeChain.Solve(m.Chain!, 0.6, 0.05, "cluster");
        for (int r = 0; r < traj.Times.Length; r++)
        {
            double tol = 4.5 * traj.MeanSizeError[r] + chain.MeanSizeError[r] + 1e-9;
            Assert.True(Math.Abs(traj.MeanSize[r] - chain.MeanSize[r]) <= tol, $"t = {traj.Times[r]}: trajectories {traj.MeanSize[r]:0.0000}, chain {chain.MeanSize[r]:0.0000}, tolerance {tol:0.0000}");
            double p = traj.SiteWeights[r][0], q = chain.SiteWeights[r][0];
            Assert.True(Math.Abs(p - q) <= 4.5 * Math.Sqrt(p * (1 - p) / 20_000) + 1e-9, $"t = {traj.Times[r]}: probe-site weight {p:0.0000} vs {q:0.0000}");
        }
        var late = SizeChain.Solve(m.Chain!, 3, 0.5, "cluster");
        Assert.Equal(0.75 * n / (1 - Math.Pow(4, -n)), late.MeanSize[^1], 1e-3);
    }

    /// <summary>
    /// Brownian trajectories against direct averaging of exact noisy evolutions, N = 4 tilted-field Ising chain
    /// (J = 0.5 ZZ, g = 0.5 X, h = 0.25 Z): each noise sample holds Gaussian couplings J_a g_k / sqrt(dt) for
    /// dt = 0.005 and evolves the operator with the exact exponential (MathNet Hermitian eigendecomposition) on the
    /// dense route; 600 noise samples, t up to 1. Mean size and every site weight agree within 4.5 combined standard
    /// errors plus 0.01 for the finite step (the bias is about (rate dt) per unit time, rates here at most 1).
    /// </summary>
    [Fact]
    public void Trajectories_AgreeWithExactNoisyEvolution()
    {
        const int n = 4, samples = 600;
        const double dt = 0.005, tEnd = 1.0, interval = 0.25;
        var terms = new List<PauliTerm>();
        for (int i = 0; i + 1 < n; i++) terms.Add(new PauliTerm(new PauliString.Builder(n).Set(i, 'Z').Set(i + 1, 'Z').Build(), 0.5));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'X'), 0.5));
        for (int i = 0; i < n; i++) terms.Add(new PauliTerm(PauliString.Single(n, i, 'Z'), 0.25));
        var model = new BrownianModel("tilted-4", n, terms, LatticeGeometry.Chain(n));
        var traj = BrownianSampler.Run(model, PauliString.Single(n, 0, 'Z'), new EnsembleOptions { Samples = 20_000, Seed = 8, Threads = 2, Time = tEnd, RecordInterval = interval });

        var mats = terms.Select(t => Reference.Dense.Of(t.String)).ToArray();
        var rng = new Random(77);
        int records = traj.Times.Length, stepsPerRecord = (int)Math.Round(interval / dt);
        var sum = new double[records, n + 1];
        var sq = new double[records, n + 1];
        for (int s = 0; s < samples; s++)
        {
            var op = new DenseOperatorRoute(n, 0, 'Z');
            Record(0, op);
            for (int r = 1; r < records; r++)
            {
                for (int k = 0; k < stepsPerRecord; k++)
                {
                    var h = Matrix<Complex>.Build.Dense(1 << n, 1 << n);
                    for (int a = 0; a < terms.Count; a++) h += mats[a] * (Complex)(terms[a].Coefficient * DenseOperatorRoute.Gauss(rng) * Math.Sqrt(dt));
                    var evd = h.Evd(MathNet.Numerics.LinearAlgebra.Symmetricity.Hermitian);
                    var v = evd.EigenVectors;
                    var u = v * Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(-Complex.ImaginaryOne * e.Real)).ToArray()) * v.ConjugateTranspose();
                    op.ConjugateFull(u); // W -> U^dagger W U, U = exp(-i H dt)
                }
                Record(r, op);
            }
        }
        void Record(int r, DenseOperatorRoute op)
        {
            var (mean, rho, _) = op.Sizes(op.Weights());
            for (int j = 0; j < n; j++)
            {
                sum[r, j] += rho[j];
                sq[r, j] += rho[j] * rho[j];
            }
            sum[r, n] += mean;
            sq[r, n] += mean * mean;
        }
        double Se(int r, int j) => Math.Sqrt(Math.Max(0, (sq[r, j] - sum[r, j] * sum[r, j] / samples) / (samples - 1)) / samples);
        for (int r = 1; r < records; r++)
        {
            double exact = sum[r, n] / samples;
            double tol = 4.5 * Math.Sqrt(Se(r, n) * Se(r, n) + traj.MeanSizeError[r] * traj.MeanSizeError[r]) + 0.01 * n;
            Assert.True(Math.Abs(exact - traj.MeanSize[r]) <= tol, $"t = {traj.Times[r]}: noisy evolutions {exact:0.0000}, trajectories {traj.MeanSize[r]:0.0000}, tolerance {tol:0.0000}");
            for (int j = 0; j < n; j++)
            {
                double e = sum[r, j] / samples, p = traj.SiteWeights[r][j];
                double tj = 4.5 * Math.Sqrt(Se(r, j) * Se(r, j) + p * (1 - p) / traj.Samples) + 0.01;
                Assert.True(Math.Abs(e - p) <= tj, $"t = {traj.Times[r]}, site {j}: noisy evolutions {e:0.0000}, trajectories {p:0.0000}, tolerance {tj:0.0000}");
            }
        }
    }
}
