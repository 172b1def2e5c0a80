using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Diagnosis;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;
using Complex = System.Numerics.Complex;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>The individual checks of the battery against outside references: closed-form Lanczos sequences,
/// dense spectra, dense thermal averages, and the published gap-ratio values.</summary>
public class CheckTests
{
    // ---------------- test 1: level statistics ----------------

    private static LevelFindings Levels(double r, double err, params string[] unresolved) => new()
    {
        N = 12,
        MeanRatio = r,
        Error = err,
        ErrorKind = "test",
        Gaps = 2000,
        WignerDysonClass = "GOE",
        WignerDysonRatio = DiagnosisThresholds.GoeRatio,
        PoissonRatio = DiagnosisThresholds.PoissonRatio,
        Resolved = [],
        Unresolved = unresolved,
        Sectors = [],
        Warnings = [],
        Realizations = 1,
    };

    [Fact]
    public void LevelJudge_ValuesNearTheReferences_TakeTheirSide()
    {
        // Reference values: Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013).
        Assert.Equal(TestOutcome.Scrambles, LevelStatisticsCheck.Judge(Levels(0.531, 0.005)).Outcome);
        Assert.Equal(TestOutcome.Fails, LevelStatisticsCheck.Judge(Levels(0.388, 0.005)).Outcome);
    }

    [Fact]
    public void LevelJudge_NearMidpointOrUnresolvedSymmetry_IsInconclusive()
    {
        // Midpoint (0.3863 + 0.5307)/2 = 0.4585: within 3 error bars of it no side is taken (common practice).
        Assert.Equal(TestOutcome.Inconclusive, LevelStatisticsCheck.Judge(Levels(0.46, 0.01)).Outcome);
        // Merged independent blocks look Poissonian (about 0.423 for two GOE blocks, check-values.md): not trusted.
        Assert.Equal(TestOutcome.Inconclusive, LevelStatisticsCheck.Judge(Levels(0.39, 0.005, "translation")).Outcome);
        // ... but a Wigner-Dyson value is trusted even with an unresolved symmetry.
        Assert.Equal(TestOutcome.Scrambles, LevelStatisticsCheck.Judge(Levels(0.53, 0.005, "translation")).Outcome);
    }

    [Fact]
    public void SpinMultiplets_RandomHeisenberg_RebuildTheDenseSpectrum()
    {
        // Each total-spin block, repeated 2S+1 times (one copy per S^z), must give the full spectrum of H from
        // a dense diagonalisation (MathNet): the SU(2) multiplet structure, independent of the sector code.
        int n = 8;
        var h = Families.HeisenbergAllToAll(n, seed: 3);
        var a = OpGrowth.Symmetry.SymmetryDiscovery.Analyze(h, Lattice.AllToAll(n));
        Assert.True(a.SpinRotation);
        var blocks = OpGrowth.Exact.SectorLevels.SpinBlocks(a, threads: 2);
        var rebuilt = new List<double>();
        foreach (var (spin, levels) in blocks)
        {
            for (int m = 0; m < (int)Math.Round(2 * spin + 1); m++) rebuilt.AddRange(levels);
        }
        rebuilt.Sort();
        var dense = Dense.Of(n, h.Terms).Evd(Symmetricity.Hermitian).EigenValues.Select(z => z.Real).OrderBy(x => x).ToArray();
        Assert.Equal(dense.Length, rebuilt.Count);
        // Tolerance: eigenvalues of a 256 x 256 matrix with norm ~ 10 agree to rounding (1e-9 is generous).
        for (int i = 0; i < dense.Length; i++) Assert.Equal(dense[i], rebuilt[i], 1e-9);
    }

    private static Func<int, int, Model?> Itself(Model model) => (n, r) => n >= model.N && r == 0 ? model : null;

    [Fact]
    public void LevelCheck_RandomHeisenberg_ResolvesTotalSpin()
    {
        var h = Families.HeisenbergAllToAll(10, seed: 7);
        var model = Model.Of(h, Lattice.AllToAll(10), "heisenberg");
        var (v, f) = LevelStatisticsCheck.Run(model, Itself(model), new DiagnosisOptions { Threads = 2 });
        Assert.NotNull(f);
        Assert.Contains(f!.Resolved, r => r.StartsWith("total spin", StringComparison.Ordinal));
        Assert.True(f.Gaps > 100, $"{f.Gaps} gaps");
        Assert.NotEqual(string.Empty, v.Reason);
    }

    [Fact]
    public void LevelCheck_SquareIsing3x3_ResolvesThePointGroup()
    {
        // The shipped square-lattice model shrunk to 3x3: the mirrors x and y and the diagonal mirror are found
        // from the terms and resolved (the diagonal as the swap that splits and pairs the mirror sectors), so no
        // spatial symmetry is left unresolved (a Poisson-like <r> would then be trusted).
        var model = ModelLoader.Load(ShippedModels.Resolve("square-ising"), new Dictionary<string, string> { ["Lx"] = "3", ["Ly"] = "3" });
        var (_, f) = LevelStatisticsCheck.Run(model, Itself(model), new DiagnosisOptions { Threads = 2 });
        Assert.NotNull(f);
        Assert.Contains("mirror x", f!.Resolved);
        Assert.Contains("mirror y", f.Resolved);
        Assert.Contains(f.Resolved, r => r.StartsWith("diagonal mirror", StringComparison.Ordinal));
        Assert.Empty(f.Unresolved);
        Assert.Equal(f.FullDimension, f.DimensionCovered);
    }

    [Fact]
    public void Candidates_LadderAndSquare_AreLatticeMirrors()
    {
        // Ladder sites 2x + leg: the leg exchange swaps the legs; the mirror along the legs reverses x.
        var lad = OpGrowth.Symmetry.SymmetryDiscovery.Candidates(Lattice.Ladder(3));
        Assert.Equal([1, 0, 3, 2, 5, 4], lad.Single(p => p.Name == "leg exchange").Map);
        Assert.Equal([4, 5, 2, 3, 0, 1], lad.Single(p => p.Name == "mirror along the legs").Map);
        var sq = OpGrowth.Symmetry.SymmetryDiscovery.Candidates(Lattice.Square(2, 2));
        Assert.Equal([0, 2, 1, 3], sq.Single(p => p.Name == "diagonal mirror").Map);
    }

    // ---------------- test 2: Lanczos growth ----------------

    [Fact]
    public void Classify_ClosedFormSequences_GiveTheirClass()
    {
        // b_n = 2J sqrt(n): Z_j of the critical transverse-field Ising chain (check-values.md, [V]).
        var sqrt = Enumerable.Range(1, 24).Select(n => 2 * Math.Sqrt(n)).ToArray();
        Assert.Equal("sqrt", LanczosGrowthCheck.Classify(sqrt).Kind);
        // b_n = Jp sqrt(8n): X_j of the XX chain (Brandt and Jacoby 1976; check-values.md).
        Assert.Equal("sqrt", LanczosGrowthCheck.Classify(Enumerable.Range(1, 24).Select(n => Math.Sqrt(8.0 * n)).ToArray()).Kind);
        // b_n = alpha sqrt(n(n-1+eta)), eta = 1: linear (the sech family, Parker et al. 2019).
        Assert.Equal("linear", LanczosGrowthCheck.Classify(Enumerable.Range(1, 24).Select(n => 0.5 * Math.Sqrt(n * (double)n)).ToArray()).Kind);
        // n / ln n (1D chaotic form).
        Assert.Equal("linear", LanczosGrowthCheck.Classify(Enumerable.Range(1, 30).Select(n => n < 2 ? 1.0 : 2 * n / Math.Log(n)).ToArray()).Kind);
        // Constant with a small even-odd wiggle (free chain): bounded.
        Assert.Equal("bounded", LanczosGrowthCheck.Classify(Enumerable.Range(1, 24).Select(n => 4 + 0.02 * (n % 2 == 0 ? 1 : -1)).ToArray()).Kind);
    }

    [Fact]
    public void Classify_XxChainZ_IsBounded()
    {
        // Z_j of the XX chain is quadratic in fermions: b_n bounded, tending to 4 Jp (check-values.md).
        var h = Families.Xxz(20, j: 1.0, delta: 0.0);
        var r = LanczosRecursion.Run(h, PauliString.Single(20, 10, 'Z'), new LanczosOptions { Depth = 20, Threads = 2 });
        Assert.Equal("bounded", LanczosGrowthCheck.Classify(r.B).Kind);
    }

    // ---------------- test 6: thermal expectation ----------------

    [Fact]
    public void ThermalExpectation_MixedFieldIsing_MatchesDenseTrace()
    {
        // <Z_2>_beta = Tr(e^{-beta H} Z_2)/Tr(e^{-beta H}) from a dense eigendecomposition (MathNet).
        int n = 6;
        double beta = 0.8;
        var h = Families.MixedFieldIsing(n);
        var w = PauliString.Single(n, 2, 'Z');
        var evd = Dense.Of(n, h.Terms).Evd(Symmetricity.Hermitian);
        var v = evd.EigenVectors;
        var e = evd.EigenValues.Select(z => z.Real).ToArray();
        double e0 = e.Min();
        var wm = Dense.Of(w);
        double num = 0, den = 0;
        for (int k = 0; k < e.Length; k++)
        {
            var col = v.Column(k);
            double p = Math.Exp(-beta * (e[k] - e0));
            num += p * (col.Conjugate() * (wm * col)).Real;
            den += p;
        }
        double exact = num / den;
        var (mean, err) = FiniteTemperatureCheck.ThermalExpectation(h, w, beta, samples: 200, seed: 11, threads: 2);
        // Typicality: the estimate is within 4 standard errors of the trace (fixed seed; the error is the
        // sample spread, about 1/sqrt(samples * d_eff)).
        Assert.True(Math.Abs(mean - exact) <= 4 * err + 1e-3, $"typicality {mean} +- {err}, dense {exact}");
        Assert.True(err < 0.05, $"error {err}");
    }

    [Fact]
    public void PatternOrder_SquareIsing2x3_MatchesDenseThermalCorrelations()
    {
        // Staggered order of Z on a 2x3 antiferromagnetic tilted-field Ising patch (J = +1 > 0), against the
        // dense thermal trace (MathNet eigenvectors): C_ij = Tr(rho Z_i Z_j) - Tr(rho Z_i) Tr(rho Z_j),
        // order = sum_{i != j} s_i s_j C_ij / (N (N-1)) / (1 - <Z_probe>^2). Typicality with 400 states on
        // d = 64: statistical error ~ 0.01; tolerance 0.05.
        const int lx = 2, ly = 3, n = lx * ly;
        double beta = 1.5;
        var h = Families.SquareIsing(lx, ly);
        var lattice = Lattice.Square(lx, ly);
        var model = Model.Of(h, lattice);
        var w = model.Probes[0];
        int p0 = w.Support()[0];
        var evd = Dense.Of(n, h.Terms).Evd(Symmetricity.Hermitian);
        var e = evd.EigenValues.Select(z => z.Real).ToArray();
        double e0 = e.Min();
        var weights = e.Select(x => Math.Exp(-beta * (x - e0))).ToArray();
        double zsum = weights.Sum();
        double Thermal(Matrix<Complex> op)
        {
            double acc = 0;
            for (int k = 0; k < e.Length; k++)
            {
                var col = evd.EigenVectors.Column(k);
                acc += weights[k] * (col.Conjugate() * (op * col)).Real;
            }
            return acc / zsum;
        }
        var zi = Enumerable.Range(0, n).Select(i => Thermal(Dense.Of(PauliString.Single(n, i, 'Z')))).ToArray();
        var sign = FiniteTemperatureCheck.TwoColouring(lattice)!;
        double sum = 0;
        for (int i = 0; i < n; i++)
            for (int j = 0; j < n; j++)
                if (i != j) sum += sign[i] * sign[j] * (Thermal(Dense.Of(PauliString.Parse($"Z_{i} Z_{j}", n))) - zi[i] * zi[j]);
        double exact = sum / (n * (n - 1)) / (1 - zi[p0] * zi[p0]);
        var (order, pattern) = FiniteTemperatureCheck.PatternOrder(model, w, beta, samples: 400, seed: 3, threads: 2);
        Assert.Equal("staggered", pattern);
        Assert.True(exact > 0.3, $"dense staggered order {exact}");
        Assert.True(Math.Abs(order - exact) < 0.05, $"typicality {order}, dense {exact}");
    }

    private static ThermalFindings Thermal(double plateau, double order) => new()
    {
        N = 12,
        Operator = "Z_4",
        PartnerSite = 5,
        Epsilon = 1,
        TimeMax = 10,
        Method = "test",
        Points = [new ThermalPoint(2, 2, ExponentialRegime.Fit([], []), double.NaN, 0.1, plateau, 0.02, 0.5) { Order = order, OrderPattern = "staggered" }],
        PlateauBySize = [new PlateauAtSize(12, 2, plateau, 0.02)],
    };

    [Fact]
    public void ThermalJudge_FrozenPlateau_GlassUnlessLatticeOrderExplainsIt()
    {
        // A plateau of 0.8 (threshold 0.5, common practice) with no lattice order is glass-like freezing;
        // matched by staggered order 0.7 (>= 0.5 of the plateau) it is an ordered phase: not a failure.
        var glass = FiniteTemperatureCheck.Judge(Thermal(0.8, 0.05));
        Assert.Equal(TestOutcome.Fails, glass.Outcome);
        Assert.Contains(Mechanism.Frozen, glass.Evidence);
        var ordered = FiniteTemperatureCheck.Judge(Thermal(0.8, 0.7));
        Assert.Equal(TestOutcome.Inconclusive, ordered.Outcome);
        Assert.Contains("order", ordered.Reason, StringComparison.Ordinal);
        Assert.DoesNotContain(Mechanism.Frozen, ordered.Evidence);
        // Order not measured (multi-site probe): the old reading stands.
        Assert.Equal(TestOutcome.Fails, FiniteTemperatureCheck.Judge(Thermal(0.8, double.NaN)).Outcome);
    }

    // ---------------- exponential regime ----------------

    [Fact]
    public void ExponentialRegime_ExponentialAndPowerLaw_AreToldApart()
    {
        var t = Enumerable.Range(0, 60).Select(i => 0.1 * i).ToArray();
        var exp = ExponentialRegime.Fit(t, t.Select(x => 1e-4 * Math.Exp(2 * x)).ToArray());
        Assert.True(exp.IsExponential);
        Assert.Equal(2.0, exp.Rate, 6);
        // A short-time t^2 onset is a power law, not a Lyapunov regime.
        var pow = ExponentialRegime.Fit(t, t.Select(x => 0.01 * x * x).ToArray());
        Assert.False(pow.IsExponential);
    }

    // ---------------- test 4: front ----------------

    private static ProbeEvolution Synthetic(int n, int probe, Func<double, int, double> rho, double tMax, double discarded = 0)
    {
        var times = Enumerable.Range(0, 101).Select(i => tMax * i / 100).ToArray();
        return new ProbeEvolution
        {
            Probe = $"Z_{probe}",
            ProbeSite = probe,
            Times = times,
            MeanSize = times.Select(_ => 1.0).ToArray(),
            Autocorrelation = times.Select(_ => 0.0).ToArray(),
            SiteWeights = times.Select(t => Enumerable.Range(0, n).Select(j => rho(t, Math.Abs(j - probe))).ToArray()).ToArray(),
            Discarded = times.Select(_ => discarded).ToArray(),
            MaxStrings = 0,
        };
    }

    [Fact]
    public void JudgeFront_LogarithmicFrontUnderHeavyTruncation_IsInconclusive()
    {
        // A logarithmic creep r = 3 ln(1 + t) is localization (Fails) only when truncation kept the weight:
        // with 0.99 discarded (what the 2D runs showed at 24 sites) a top-M budget can stop a front by
        // itself, so the verdict is inconclusive and names the discarded weight. Threshold
        // FrontMaxDiscarded = 0.1 (common practice).
        int n = 24;
        var model = Model.Of(Families.MixedFieldIsing(n));
        var o = new DiagnosisOptions();
        var kept = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= 3 * Math.Log(1 + t) ? 0.75 : 0, 400, discarded: 0.01), o);
        Assert.Equal("logarithmic", kept.Kind);
        Assert.Equal(TestOutcome.Fails, SpreadingCheck.JudgeFront(kept, model).Outcome);
        var cut = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= 3 * Math.Log(1 + t) ? 0.75 : 0, 400, discarded: 0.99), o);
        var v = SpreadingCheck.JudgeFront(cut, model);
        Assert.Equal(TestOutcome.Inconclusive, v.Outcome);
        Assert.Contains("0.99", v.Reason, StringComparison.Ordinal);
        Assert.Contains("discarded", v.Reason, StringComparison.Ordinal);
        // The pure judge guards every localization reading, also a stalled figure handed to it directly.
        var stalled = kept with { Kind = "stalled", Discarded = 0.5 };
        Assert.Equal(TestOutcome.Inconclusive, SpreadingCheck.JudgeFront(stalled, model).Outcome);
    }

    [Fact]
    public void FrontOf_SyntheticFronts_AreClassified()
    {
        int n = 24;
        var model = Model.Of(Families.MixedFieldIsing(n));
        var o = new DiagnosisOptions();
        // Ballistic: rho = 3/4 inside r <= 2t.
        var ball = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= 2 * t ? 0.75 : 0, 20), o);
        Assert.Equal("ballistic", ball.Kind);
        Assert.Equal(2.0, ball.Linear!.Slope, 1);
        // Stalled at distance 4 (Anderson localization: v_B = 0, check-values.md).
        var stall = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= Math.Min(2 * t, 4) ? 0.75 : 0, 20), o);
        Assert.Equal("stalled", stall.Kind);
        // The same stop under heavy truncation is not trusted.
        var trunc = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= Math.Min(2 * t, 4) ? 0.75 : 0, 20, discarded: 0.5), o);
        Assert.Equal("undetermined", trunc.Kind);
        // Logarithmic light cone r = 3 ln(1 + t), still moving at the end.
        var log = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r <= 3 * Math.Log(1 + t) ? 0.75 : 0, 400), o);
        Assert.Equal("logarithmic", log.Kind);
        // No front at all.
        var none = SpreadingCheck.FrontOf(model, Synthetic(n, 0, (t, r) => r == 0 ? 0.75 : 0.01, 20), o);
        Assert.Equal("none", none.Kind);
        // All-to-all: nothing to follow.
        var a2a = Model.Of(Families.IsingGlass(8), Lattice.AllToAll(8));
        Assert.Equal("not applicable", SpreadingCheck.FrontOf(a2a, Synthetic(8, 0, (t, r) => 0.75, 5), o).Kind);
    }

    // ---------------- test 3: size verdict ----------------

    private static SizeFigures Size(double fraction, double auto, double mazur, int n = 10, bool trusted = true, double growth = 0) => new()
    {
        Probe = "Z_0",
        N = n,
        Engine = "test",
        SizeTrusted = trusted,
        Saturation = 0.75 * n,
        Measure = "qubits",
        LateSize = fraction * 0.75 * n,
        LateGrowth = growth,
        HalfTime = 1,
        EarlyGrowth = ExponentialRegime.Fit([], []),
        LateAutocorrelation = auto,
        Mazur = mazur,
        Discarded = trusted ? 0 : 0.9,
        TimeReached = 10,
    };

    [Fact]
    public void JudgeSize_Cases_FollowTheThresholds()
    {
        Assert.Equal(TestOutcome.Scrambles, SpreadingCheck.JudgeSize([Size(0.95, 0.02, 0.01)]).Outcome);
        var plateau = SpreadingCheck.JudgeSize([Size(0.3, 0.9, 0.0)]);
        Assert.Equal(TestOutcome.Fails, plateau.Outcome);
        Assert.Contains(Mechanism.Frozen, plateau.Evidence);
        var below = SpreadingCheck.JudgeSize([Size(0.45, 0.01, 0.0)]);
        Assert.Equal(TestOutcome.Fails, below.Outcome);
        Assert.Contains(Mechanism.FreeFermions, below.Evidence);
        // A truncated run's low size is not used when an exact run exists.
        Assert.Equal(TestOutcome.Scrambles, SpreadingCheck.JudgeSize([Size(0.9, 0.02, 0.01), Size(0.3, 0.01, 0.01, 24, trusted: false)]).Outcome);
        // Still growing at the end: inconclusive.
        Assert.Equal(TestOutcome.Inconclusive, SpreadingCheck.JudgeSize([Size(0.5, 0.01, 0.0, growth: 0.2)]).Outcome);
    }
}
