using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;
using static OpGrowth.Tests.Evolution.EvolutionTestKit;

namespace OpGrowth.Tests.Evolution;

/// <summary>
/// Untruncated evolution against the independent dense route: exp(iHt) O exp(-iHt) from MathNet's
/// Hermitian eigendecomposition (Reference/Dense.cs), matrices built entry by entry from the letters.
/// Distances are sqrt(sum_S (c_S - c'_S)^2) in the Pauli basis (||O|| = 1).
/// </summary>
public class DenseAgreementTests
{
    private static Matrix<Complex> Evolved<T>(EvolutionEngine<T> e, int n) where T : unmanaged, IPauliKey<T>
        => DenseOf(n, e.Operator.ToTerms());

    [Theory]
    [InlineData(6, 10, 11)]
    [InlineData(7, 12, 12)]
    [InlineData(8, 14, 13)]
    public void Taylor_RandomModel_MatchesDenseHeisenbergTo1e10(int n, int terms, int seed)
    {
        // Source: dense reference exp(iHt) O exp(-iHt) (MathNet EVD, accurate to ~1e-14 per dependencies.md).
        // Tolerance 1e-10: the series is summed to 1e-17 per step; rounding over ~100 passes stays near 1e-14.
        var h = RandomHamiltonian(n, terms, seed);
        var probe = PauliString.Single(n, n / 2, 'Z');
        var opts = new EvolutionOptions { Method = IntegrationMethod.Taylor, Dt = 0.25, Time = 1.0, RecordEvery = 4, Threads = 2, Truncation = TruncationPolicy.None };
        var (e, s) = RunEngine<Pauli64>(Problem(h, probe), opts);
        var exact = Dense.Heisenberg(DenseOf(n, h.Terms), DenseOf(n, [new PauliTerm(probe, 1)]), 1.0);
        double dist = PauliDistance(Evolved(e, n), exact);
        Assert.True(dist < 1e-10, $"distance {dist:e2}");
        Assert.Equal(0.0, s.Records[^1].DiscardedTotal);
    }

    [Fact]
    public void Rk4_SmallStep_MatchesDenseHeisenbergTo1e10()
    {
        // Source: dense reference as above. RK4 global error ~ t (dt ||L||)^4 ||L|| / 120; with
        // ||L|| ~ 3 and dt = 0.002 that is ~1e-11, so 1e-10 is reachable.
        int n = 5;
        var h = RandomHamiltonian(n, 8, 21, scale: 0.5);
        var probe = PauliString.Single(n, 2, 'X');
        var opts = new EvolutionOptions { Method = IntegrationMethod.Rk4, Dt = 0.002, Time = 0.5, RecordEvery = 250, Threads = 1, Truncation = TruncationPolicy.None };
        var (e, _) = RunEngine<Pauli64>(Problem(h, probe), opts);
        var exact = Dense.Heisenberg(DenseOf(n, h.Terms), DenseOf(n, [new PauliTerm(probe, 1)]), 0.5);
        double dist = PauliDistance(Evolved(e, n), exact);
        Assert.True(dist < 1e-10, $"distance {dist:e2}");
    }

    /// <summary>S2(s) = prod_{g&lt;k-1} e^{-i G_g s/2} e^{-i G_{k-1} s} prod_{g desc} e^{-i G_g s/2}, built densely here.</summary>
    private static Matrix<Complex> DenseS2(List<Matrix<Complex>> g, double s)
    {
        int k = g.Count;
        var u = Matrix<Complex>.Build.DenseIdentity(g[0].RowCount);
        for (int i = 0; i < k - 1; i++) u *= Propagator(g[i], s / 2);
        u *= Propagator(g[k - 1], s);
        for (int i = k - 2; i >= 0; i--) u *= Propagator(g[i], s / 2);
        return u;
    }

    [Theory]
    [InlineData(IntegrationMethod.Trotter2)]
    [InlineData(IntegrationMethod.Trotter4)]
    public void TrotterSteps_RandomModel_EqualDenseProductFormula(IntegrationMethod method)
    {
        // Source: the product formulas of Suzuki, Phys. Lett. A 146, 319 (1990) and J. Math. Phys. 32,
        // 400 (1991), multiplied out densely (group exponentials by EVD). Same formula, independent
        // arithmetic: agreement to 1e-12 (rounding only) checks the rotation map, its signs and the order.
        int n = 6;
        double dt = 0.3;
        var h = RandomHamiltonian(n, 10, 31);
        var keys = h.Terms.Select(t => Pauli64.From(t.String)).ToList();
        var groups = CommutingGroups.Colour(n, keys, h.Terms.Select(t => t.Coefficient).ToList());
        Assert.True(groups.Count >= 2);
        var dense = groups.Select(g => DenseOf(n, g.Keys.Select((k, i) => new PauliTerm(k.ToPauliString(n), g.Weights[i])))).ToList();
        Matrix<Complex> step;
        if (method == IntegrationMethod.Trotter2) step = DenseS2(dense, dt);
        else
        {
            double p = 1.0 / (4.0 - Math.Cbrt(4.0));
            step = DenseS2(dense, p * dt) * DenseS2(dense, p * dt) * DenseS2(dense, (1 - 4 * p) * dt) * DenseS2(dense, p * dt) * DenseS2(dense, p * dt);
        }
        var u = step * step * step;
        var probe = PauliString.Single(n, 1, 'Y');
        var o = DenseOf(n, [new PauliTerm(probe, 1)]);
        var expected = u.ConjugateTranspose() * o * u;
        var opts = new EvolutionOptions { Method = method, Dt = dt, Time = 3 * dt, RecordEvery = 2, Threads = 2, Truncation = TruncationPolicy.None };
        var (e, _) = RunEngine<Pauli64>(Problem(h, probe), opts);
        double dist = PauliDistance(Evolved(e, n), expected);
        Assert.True(dist < 1e-12, $"distance {dist:e2}");
    }

    [Fact]
    public void CommutingGroups_Colour_MembersCommuteAndCoverTheHamiltonian()
    {
        // Conservation check: the groups partition the terms, and members of a group commute.
        int n = 8;
        var h = RandomHamiltonian(n, 30, 41);
        var keys = h.Terms.Select(t => Pauli64.From(t.String)).ToList();
        var groups = CommutingGroups.Colour(n, keys, h.Terms.Select(t => t.Coefficient).ToList());
        Assert.Equal(h.Terms.Count, groups.Sum(g => g.Count));
        foreach (var g in groups)
        {
            for (int a = 0; a < g.Count; a++)
            {
                for (int b = a + 1; b < g.Count; b++) Assert.False(Pauli64.Anticommute(g.Keys[a], g.Keys[b]));
            }
        }
    }

    [Theory]
    [InlineData(IntegrationMethod.Trotter2, 2.0, 0.1, 0.05, 0.025)]
    [InlineData(IntegrationMethod.Trotter4, 4.0, 0.2, 0.1, 0.05)]
    public void Trotter_ErrorScaling_MatchesOrder(IntegrationMethod method, double order, double dt1, double dt2, double dt3)
    {
        // Source: Suzuki 1990/1991: global error O(dt^2) and O(dt^4). Measured against the dense exact
        // evolution at t = 1; the log-log slope must be within 0.3 (order 2) / 0.5 (order 4) of the order
        // (higher-order terms bend the line at the largest step: common practice tolerance).
        int n = 5;
        var h = RandomHamiltonian(n, 9, 51);
        var probe = PauliString.Single(n, 0, 'Z');
        var exact = Dense.Heisenberg(DenseOf(n, h.Terms), DenseOf(n, [new PauliTerm(probe, 1)]), 1.0);
        var dts = new[] { dt1, dt2, dt3 };
        var errs = dts.Select(dt =>
        {
            var opts = new EvolutionOptions { Method = method, Dt = dt, Time = 1.0, RecordEvery = 1000, Threads = 1, Truncation = TruncationPolicy.None };
            var (e, _) = RunEngine<Pauli64>(Problem(h, probe), opts);
            return PauliDistance(Evolved(e, n), exact);
        }).ToArray();
        var fit = LinearFit.Fit(dts.Select(x => Math.Log(x)).ToArray(), errs.Select(x => Math.Log(x)).ToArray());
        Assert.True(Math.Abs(fit.Slope - order) < (order == 2 ? 0.3 : 0.5), $"slope {fit.Slope:0.###}, errors {string.Join(", ", errs.Select(x => x.ToString("e2")))}");
    }

    [Fact]
    public void TrotterSteps_NoTruncation_ConserveNormToRounding()
    {
        // Conservation law: products of Pauli rotations are unitary conjugations, ||O(t)|| = 1.
        // Tolerance 1e-12: ~500 passes, each rounding at ~1e-16 relative.
        int n = 6;
        var h = MixedFieldIsing(n);
        var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter4, Dt = 0.1, Time = 3.0, RecordEvery = 5, Threads = 2, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 3, 'Z')), opts);
        foreach (var r in s.Records) Assert.True(Math.Abs(r.NormSquared - 1) < 1e-12, $"t = {r.Time}: norm^2 - 1 = {r.NormSquared - 1:e2}");
        Assert.Equal(0.0, s.Records[^1].DiscardedTotal);
    }

    [Fact]
    public void Otoc_FromPauliWeights_MatchesDenseOtoc()
    {
        // Source: conventions.md, F(t) = Tr(W(t) V W(t) V) / 2^N = sum_S c_S^2 e_S(V); dense side computes
        // the trace directly. Tolerance 1e-10 (Taylor evolution exact to ~1e-14, traces to ~1e-15).
        int n = 6;
        var h = RandomHamiltonian(n, 10, 61);
        var probe = PauliString.Single(n, 2, 'Z');
        double t = 0.8;
        var opts = new EvolutionOptions { Method = IntegrationMethod.Taylor, Dt = 0.2, Time = t, RecordEvery = 4, Threads = 1, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, probe), opts);
        var w = Dense.Heisenberg(DenseOf(n, h.Terms), DenseOf(n, [new PauliTerm(probe, 1)]), t);
        var rec = s.Records[^1];
        Assert.Equal(t, rec.Time, 12);
        for (int j = 0; j < n; j++)
        {
            var expect = new double[3];
            for (int a = 0; a < 3; a++)
            {
                var v = DenseOf(n, [new PauliTerm(PauliString.Single(n, j, "XYZ"[a]), 1)]);
                expect[a] = ((w * v * w * v).Trace() / (1 << n)).Real;
            }
            Assert.True(Math.Abs(rec.OtocX[j] - expect[0]) < 1e-10, $"X_{j}: {rec.OtocX[j]} vs {expect[0]}");
            Assert.True(Math.Abs(rec.OtocY[j] - expect[1]) < 1e-10, $"Y_{j}: {rec.OtocY[j]} vs {expect[1]}");
            Assert.True(Math.Abs(rec.OtocZ[j] - expect[2]) < 1e-10, $"Z_{j}: {rec.OtocZ[j]} vs {expect[2]}");
            Assert.True(Math.Abs(rec.OtocMean[j] - expect.Average()) < 1e-10);
        }
        // Source: check-values.md, OTOC-size identity n(t) = (3/4) sum_x (1 - Fbar_x(t)).
        Assert.True(Math.Abs(rec.MeanSize - 0.75 * rec.OtocMean.Sum(f => 1 - f)) < 1e-12);
    }

    [Fact]
    public void PeriodicDrive_KickedIsing_MatchesDenseStroboscopicEvolution()
    {
        // Source: U = L_last ... L_0 (layer 0 first in time), each rotation exp(-i a P / 2) =
        // cos(a/2) I - i sin(a/2) P built densely; O(3 periods) = (U^dagger)^3 O U^3. One layer does not
        // commute internally (X_0 then Z_0) to check the order within a layer. Tolerance 1e-12 (rounding).
        int n = 6;
        var layer0 = new List<DriveRotation>();
        for (int i = 0; i + 1 < n; i++) layer0.Add(new DriveRotation(Pair(n, i, 'Z', i + 1, 'Z'), 2 * 0.9));
        for (int i = 0; i < n; i++) layer0.Add(new DriveRotation(PauliString.Single(n, i, 'Z'), 2 * 0.4));
        var layer1 = new List<DriveRotation>();
        for (int i = 0; i < n; i++) layer1.Add(new DriveRotation(PauliString.Single(n, i, 'X'), 2 * 0.7));
        var layer2 = new List<DriveRotation> { new(PauliString.Single(n, 0, 'X'), 0.3), new(PauliString.Single(n, 0, 'Z'), 0.5) };
        var drive = new PeriodicDrive([layer0, layer1, layer2], 1.0);
        var id = Matrix<Complex>.Build.DenseIdentity(1 << n);
        Matrix<Complex> Rot(DriveRotation r) => id * Math.Cos(r.Angle / 2) - DenseOf(n, [new PauliTerm(r.Generator, 1)]) * (Complex.ImaginaryOne * Math.Sin(r.Angle / 2));
        var u = id;
        foreach (var layer in drive.Layers)
        {
            foreach (var r in layer) u = Rot(r) * u; // later rotations to the left
        }
        var probe = PauliString.Single(n, 2, 'Z');
        var o = DenseOf(n, [new PauliTerm(probe, 1)]);
        var u3 = u * u * u;
        var expected = u3.ConjugateTranspose() * o * u3;
        var problem = new EvolutionProblem { N = n, Drive = drive, Initial = EvolutionProblem.Probe(probe) };
        var (e, s) = RunEngine<Pauli64>(problem, new EvolutionOptions { Time = 3, Threads = 2, Truncation = TruncationPolicy.None });
        Assert.Equal(3, s.Records[^1].Step);
        double dist = PauliDistance(Evolved(e, n), expected);
        Assert.True(dist < 1e-12, $"distance {dist:e2}");
    }
}
