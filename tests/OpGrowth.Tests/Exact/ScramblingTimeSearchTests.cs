using OpGrowth.Analysis;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Exact;

/// <summary>
/// The t* search and its mean-size estimators against dense traces (ExactOtoc, method dense: exact at N = 8) and
/// against the untruncated Pauli engine for the Majorana size.
/// </summary>
public class ScramblingTimeSearchTests
{
    private static Model Load(string name, int n) => ModelLoader.Load(ShippedModels.Resolve(name), new Dictionary<string, string> { ["N"] = n.ToString(System.Globalization.CultureInfo.InvariantCulture) });

    private static double DenseMeanSize(Model m, double t)
        => ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = m.Probes[0], Times = [t], Method = OtocMethod.Dense }).MeanSize!.Values[0];

    [Theory]
    [InlineData("demo/tilted-chain", true, 0)]
    [InlineData("heisenberg-all-to-all", false, 8)]
    [InlineData("heisenberg-all-to-all", false, 1)]
    public void MeanSizes_Estimators_AgreeWithDenseTracesWithinTheirErrors(string model, bool siteBlocks, int groups)
    {
        // Reference: dense traces (exact). The estimators are unbiased; tolerance four standard errors over 16 states
        // (a false failure is a 6e-5 event) plus rounding.
        var m = Load(model, 8);
        double t = model.Contains("chain", StringComparison.Ordinal) ? 1.5 : 0.6;
        var r = ScramblingTimeSearch.MeanSizes(m.Hamiltonian, new ScramblingTimeSearchOptions { Operator = m.Probes[0], Samples = 16, SiteBlocks = siteBlocks, ProbeGroups = groups, Seed = 3 }, [t]);
        var e = r.Evaluations[^1];
        double want = DenseMeanSize(m, t);
        Assert.True(Math.Abs(e.MeanSize - want) <= 4 * e.Error + 1e-9, $"{r.Estimator}: {e.MeanSize} +- {e.Error} against dense {want}");
    }

    [Fact]
    public void Run_TiltedChainN8_LocatesTheDenseCrossingToOnePercent()
    {
        // Reference: t* from dense traces on a fine grid (dt = 0.01, linear interpolation: grid error ~1e-4).
        // Site blocks with 4 states: sampling error ~0.01 measured; tolerance 1% of t* (the accuracy).
        var m = Load("demo/tilted-chain", 8);
        var grid = Enumerable.Range(150, 100).Select(i => i * 0.01).ToArray();
        var dense = ExactOtoc.Run(m.Hamiltonian, new ExactOtocOptions { Operator = m.Probes[0], Times = grid, Method = OtocMethod.Dense });
        var ts = ScramblingAnalysis.Analyze(new ScramblingInput
        {
            N = 8,
            Times = grid,
            MeanSize = dense.MeanSize!.Values,
            SiteWeights = grid.Select((_, i) => dense.Sites.Select(s => s.Weight.Values[i]).ToArray()).ToArray(),
            ProbeSites = [0],
        }).ScramblingTime.Value!.Value;
        var r = ScramblingTimeSearch.Run(m.Hamiltonian, new ScramblingTimeSearchOptions { Operator = m.Probes[0], Samples = 4, SiteBlocks = true, Seed = 2 });
        Assert.NotNull(r.TStar);
        Assert.True(Math.Abs(r.TStar!.Value - ts) <= 0.01 * ts, $"search {r.TStar} against dense {ts}");
        Assert.True(r.LocationError <= 0.005 * ts, $"location error {r.LocationError}");
        Assert.InRange(r.Evaluations.Count - 1, 2, 8);
    }

    [Fact]
    public void MeanSizes_MajoranaSize_AgreesWithThePauliEngine()
    {
        // Reference: the Pauli engine without truncation (Taylor steps, exact to rounding) on the same SYK member
        // (N = 5 qubits, 10 Majoranas); its mean Majorana size at t = 2. Random-sign estimate with 24 states, one group
        // per qubit site; tolerance four standard errors.
        var m = Load("syk4", 5);
        var evo = OpGrowth.Evolution.OperatorEvolution.Run(new OpGrowth.Evolution.EvolutionProblem
        {
            N = 5,
            Name = "syk4",
            Hamiltonian = m.Hamiltonian,
            Initial = OpGrowth.Evolution.EvolutionProblem.Probe(m.Probes[0]),
            CountMajoranas = true,
        }, new OpGrowth.Evolution.EvolutionOptions { Method = OpGrowth.Evolution.IntegrationMethod.Taylor, Dt = 0.1, Time = 2, RecordEvery = 20, Truncation = OpGrowth.Evolution.TruncationPolicy.None });
        double want = evo.Main.Records[^1].MeanMajoranaSize!.Value;
        var r = ScramblingTimeSearch.MeanSizes(m.Hamiltonian, new ScramblingTimeSearchOptions { Operator = m.Probes[0], MajoranaSize = true, Samples = 24, ProbeGroups = 5, Seed = 4 }, [2.0]);
        var e = r.Evaluations[^1];
        Assert.Equal("majoranas", r.SizeMeasure);
        Assert.True(Math.Abs(e.MeanSize - want) <= 4 * e.Error + 1e-9, $"{e.MeanSize} +- {e.Error} against Pauli engine {want}");
    }

    [Fact]
    public void Run_WithoutCheckpoints_GivesTheSameCrossing()
    {
        // Regenerating every vector and propagating from t = 0 must give the same numbers as carrying checkpoints
        // (only the order of propagation differs: rounding and the Chebyshev tolerance 1e-8 per propagation).
        var m = Load("heisenberg-all-to-all", 8);
        var o = new ScramblingTimeSearchOptions { Operator = m.Probes[0], ProbeGroups = 8, Seed = 5 };
        var a = ScramblingTimeSearch.Run(m.Hamiltonian, o);
        var b = ScramblingTimeSearch.Run(m.Hamiltonian, o with { MemoryBytes = 1 });
        Assert.Equal(a.Evaluations.Count, b.Evaluations.Count);
        for (int i = 0; i < a.Evaluations.Count; i++) Assert.Equal(a.Evaluations[i].MeanSize, b.Evaluations[i].MeanSize, 6);
    }

    [Fact]
    public void Cross_QuadraticCurve_QuadraticCrossingIsExact()
    {
        // n(t) = t^2 crosses 2 at sqrt(2): the quadratic through three samples is exact; the linear one is not.
        var e = new[] { 0.0, 1.0, 1.3, 1.6 }.Select(t => new SizeEvaluation(t, t * t, 0, [t * t])).ToList();
        var c = ScramblingTimeSearch.Cross(e, 2);
        Assert.Equal(Math.Sqrt(2), c.Time, 12);
        Assert.True(c.Error > 0);
    }

    [Fact]
    public void Cost_TermsGrowWithTheProductOfWidthAndTime()
    {
        // The Chebyshev series needs about rho t terms plus a tolerance-dependent excess (Tal-Ezer and Kosloff 1984).
        int a = ScramblingTimeCost.Terms(10, 1e-8), b = ScramblingTimeCost.Terms(100, 1e-8);
        Assert.InRange(a, 10, 40);
        Assert.InRange(b, 100, 150);
    }
}
