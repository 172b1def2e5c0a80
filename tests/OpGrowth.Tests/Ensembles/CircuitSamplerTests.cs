using System.Numerics;
using OpGrowth.Ensembles;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Ensembles;

public class CircuitSamplerTests
{
    /// <summary>
    /// The sampler's shortcut: a uniformly random two-qubit Clifford sends a fixed non-identity Pauli to each of the
    /// 15 non-identity Paulis equally often. Checked on the whole symplectic group Sp(4, 2) (the Clifford group
    /// modulo Paulis and phases; Paulis only flip signs, which c_S^2 ignores), found by brute force over all
    /// 2^16 binary 4x4 matrices. Source: |Sp(2n, 2)| = 2^{n^2} prod_{i=1..n} (4^i - 1) = 720 for n = 2
    /// (handbook order of the finite symplectic group).
    /// </summary>
    [Fact]
    public void SymplecticGroup_MapsEveryNonIdentityPauliUniformly()
    {
        // Vector v = (x_a, z_a, x_b, z_b) bits 0..3; symplectic form <u, v> = x_a z'_a + z_a x'_a + x_b z'_b + z_b x'_b.
        static int Form(int u, int v) => (BitOperations.PopCount((uint)(((u & 0b0101) << 1) & v)) + BitOperations.PopCount((uint)(((u & 0b1010) >> 1) & v))) & 1;
        static int Apply(int m, int v)
        {
            int r = 0;
            for (int col = 0; col < 4; col++) if ((v >> col & 1) != 0) r ^= (m >> (4 * col)) & 15;
            return r;
        }
        var group = new List<int>();
        for (int m = 0; m < 1 << 16; m++)
        {
            bool ok = true;
            for (int u = 1; u < 16 && ok; u <<= 1)
                for (int v = 1; v < 16 && ok; v <<= 1)
                    if (Form(Apply(m, u), Apply(m, v)) != Form(u, v)) ok = false;
            if (ok) group.Add(m);
        }
        Assert.Equal(720, group.Count);
        for (int v = 1; v < 16; v++)
        {
            var hits = new int[16];
            foreach (int m in group) hits[Apply(m, v)]++;
            Assert.Equal(0, hits[0]);
            for (int w = 1; w < 16; w++) Assert.Equal(48, hits[w]);
        }
    }

    /// <summary>
    /// One Haar gate on Z_0 of two qubits: the image is uniform over the 15 non-identity Paulis, so P(size 2) = 9/15
    /// and rho_0 = rho_1 = 12/15 (exact by the 2-design property). Tolerance: 5 standard errors of 40,000 samples.
    /// </summary>
    [Fact]
    public void OneGate_GivesTheUniformImage()
    {
        var c = new Circuit { Name = "one-gate", N = 2, Lattice = Lattice.Chain(2), Layout = CircuitLayout.Brickwork, Layers = 1 };
        var s = CircuitSampler.Run(c, new EnsembleOptions { Samples = 40_000, Seed = 3, Threads = 2 });
        double se(double p) => Math.Sqrt(p * (1 - p) / 40_000);
        Assert.Equal(0.6, s.SizeDistribution[1][2], 5 * se(0.6));
        Assert.Equal(0.8, s.SiteWeights[1][0], 5 * se(0.8));
        Assert.Equal(0.8, s.SiteWeights[1][1], 5 * se(0.8));
        Assert.Equal(1.0, s.SiteWeights[0][0]);
        Assert.Equal(4.0 / 15, s.LetterWeights![0][1][1], 5 * se(4.0 / 15)); // X on site 1: 4 of the 15 images
    }

    /// <summary>Results do not depend on the thread count: every sample has its own stream and the tallies are integers.</summary>
    [Fact]
    public void Results_AreBitIdenticalAtAnyThreadCount()
    {
        var c = new Circuit { Name = "pairs", N = 40, Lattice = null, Layout = CircuitLayout.RandomPairs, Layers = 12, SingleQubitLayers = true };
        var a = CircuitSampler.Run(c, new EnsembleOptions { Samples = 300, Seed = 9, Threads = 1 });
        var b = CircuitSampler.Run(c, new EnsembleOptions { Samples = 300, Seed = 9, Threads = 3 });
        Assert.Equal(a.MeanSize, b.MeanSize);
        Assert.Equal(a.MeanSizeError, b.MeanSizeError);
        for (int r = 0; r < a.Times.Length; r++) Assert.Equal(a.SiteWeights[r], b.SiteWeights[r]);
    }

    public static IEnumerable<object[]> HaarCases() =>
    [
        ["brickwork chain", CircuitLayout.Brickwork, false, 4],
        ["random pairs, single-qubit layers", CircuitLayout.RandomPairs, true, 3],
    ];

    /// <summary>
    /// Clifford-sampled averages equal Haar averages: at N = 6, 400 circuits of Haar two-qubit gates (QR of a complex
    /// Gaussian matrix with the phase fix; Mezzadri, Notices AMS 54, 592 (2007)) evolved on the dense route,
    /// against 20,000 Clifford samples. Every site weight rho_j(t) and the mean size agree within 4.5 combined
    /// standard errors (about 40 comparisons; a false alarm at that level has probability below 0.1%).
    /// Source: Webb, arXiv:1510.02769 (2015); Zhu, PRA 96, 062336 (2017) (Clifford group is a unitary 2-design).
    /// </summary>
    [Theory]
    [MemberData(nameof(HaarCases))]
    public void CliffordSamples_MatchHaarCircuitsOnTheDenseRoute(string label, CircuitLayout layout, bool singles, int layers)
    {
        const int n = 6, circuits = 400;
        var circuit = new Circuit { Name = label.Replace(' ', '-'), N = n, Lattice = layout == CircuitLayout.Brickwork ? Lattice.Chain(n) : null, Layout = layout, Layers = layers, SingleQubitLayers = singles };
        var sampled = CircuitSampler.Run(circuit, PauliString.Single(n, 0, 'Z'), new EnsembleOptions { Samples = 20_000, Seed = 5, Threads = 2 });

        var rng = new Random(20240601);
        int records = layers + 1;
        var sumRho = new double[records, n];
        var sqRho = new double[records, n];
        var sumMean = new double[records];
        var sqMean = new double[records];
        for (int c = 0; c < circuits; c++)
        {
            var op = new DenseOperatorRoute(n, 0, 'Z');
            Add(0, op);
            for (int layer = 1; layer <= layers; layer++)
            {
                foreach (var (a, b) in Pairs(layout, layer, n, rng)) op.ConjugateTwo(DenseOperatorRoute.Haar4(rng), a, b);
                if (singles) for (int q = 0; q < n; q++) op.ConjugateTwo(DenseOperatorRoute.HaarOnFirst(rng), q, (q + 1) % n);
                Add(layer, op);
            }
        }
        void Add(int r, DenseOperatorRoute op)
        {
            var (mean, rho, _) = op.Sizes(op.Weights());
            sumMean[r] += mean;
            sqMean[r] += mean * mean;
            for (int j = 0; j < n; j++)
            {
                sumRho[r, j] += rho[j];
                sqRho[r, j] += rho[j] * rho[j];
            }
        }
        static double Se(double sum, double sq, int m) => Math.Sqrt(Math.Max(0, (sq - sum * sum / m) / (m - 1)) / m);
        for (int r = 1; r < records; r++)
        {
            double hm = sumMean[r] / circuits;
            double tol = 4.5 * Math.Sqrt(Math.Pow(Se(sumMean[r], sqMean[r], circuits), 2) + Math.Pow(sampled.MeanSizeError[r], 2));
            Assert.True(Math.Abs(hm - sampled.MeanSize[r]) <= tol, $"{label}: layer {r}: Haar mean size {hm:0.0000}, Clifford {sampled.MeanSize[r]:0.0000}, tolerance {tol:0.0000}");
            for (int j = 0; j < n; j++)
            {
                double h = sumRho[r, j] / circuits, p = sampled.SiteWeights[r][j];
                double se = Math.Sqrt(Math.Pow(Se(sumRho[r, j], sqRho[r, j], circuits), 2) + p * (1 - p) / sampled.Samples);
                Assert.True(Math.Abs(h - p) <= 4.5 * se + 1e-12, $"{label}: layer {r}, site {j}: Haar {h:0.0000}, Clifford {p:0.0000}, tolerance {4.5 * se:0.0000}");
            }
        }
    }

    private static IEnumerable<(int, int)> Pairs(CircuitLayout layout, int layer, int n, Random rng)
    {
        if (layout == CircuitLayout.Brickwork)
        {
            for (int a = (layer - 1) % 2; a + 1 < n; a += 2) yield return (a, a + 1);
            yield break;
        }
        var perm = Enumerable.Range(0, n).ToArray();
        for (int i = n - 1; i > 0; i--)
        {
            int j = rng.Next(i + 1);
            (perm[i], perm[j]) = (perm[j], perm[i]);
        }
        for (int i = 0; i + 1 < n; i += 2) yield return (perm[i], perm[i + 1]);
    }

    /// <summary>
    /// Qubit brickwork on an open chain of 1001 qubits, probe at the centre, 400 layers (one layer = one unit of
    /// time; gates on even bonds, then odd bonds). The right end of the operator performs a biased walk:
    /// v_B = (q^2 - 1)/(q^2 + 1) = 3/5 sites per layer and variance growth 2 D t with D = 2 q^2/(q^2 + 1)^2 = 8/25.
    /// Source: A. Nahum, S. Vijay, J. Haah, PRX 8, 021014 (2018); C. W. von Keyserlingk, T. Rakovszky, F. Pollmann,
    /// S. L. Sondhi, PRX 8, 021013 (2018). Tolerances: the fitted slopes' own standard errors from 3000 samples
    /// (about 0.005 and 0.03), widened to 0.02 and 0.08. The project's front analysis (threshold rho = 3/8) must give
    /// the same v_B within 0.03 (the half-weight contour moves with the mean of the end).
    /// </summary>
    [Fact]
    [Trait("Category", "Slow")]
    public void Brickwork_FrontMovesAtThreeFifthsAndBroadensDiffusively()
    {
        const int n = 1001, layers = 400;
        var c = new Circuit { Name = "brickwork-1001", N = n, Lattice = Lattice.Chain(n), Layout = CircuitLayout.Brickwork, Layers = layers };
        var s = CircuitSampler.Run(c, PauliString.Single(n, 500, 'Z'), new EnsembleOptions { Samples = 3000, Seed = 11, Threads = 2, RecordEvery = 10 });
        var idx = Enumerable.Range(0, s.Times.Length).Where(r => s.Times[r] >= 100).ToArray();
        var t = idx.Select(r => s.Times[r]).ToArray();
        var mean = OpGrowth.Analysis.LinearFit.Fit(t, idx.Select(r => s.RightEndMean![r]).ToArray());
        var variance = OpGrowth.Analysis.LinearFit.Fit(t, idx.Select(r => s.RightEndVariance![r]).ToArray());
        Assert.Equal(0.6, mean.Slope, 0.02);
        Assert.Equal(2 * 8.0 / 25, variance.Slope, 0.08);
        var f = EnsembleFigures.Of(s);
        Assert.NotNull(f.Figures.Butterfly?.Primary.Velocity);
        Assert.Equal(0.6, f.Figures.Butterfly!.Primary.Velocity!.Value, 0.03);
    }
}
