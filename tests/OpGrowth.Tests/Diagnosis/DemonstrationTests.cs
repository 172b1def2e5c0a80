using OpGrowth.Diagnosis;
using OpGrowth.Models;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>
/// The five shipped demonstrations give their expected verdict and leading mechanism, with the battery at
/// reduced sizes and budgets (the full defaults are run by hand; see docs/diagnosis.md). Expectations are
/// textbook facts: the transverse-field Ising chain is free fermions (Jordan-Wigner; check-values.md), the
/// XXZ chain is interacting integrable (Bethe ansatz), the XX chain in random fields is Anderson localized
/// (v_B = 0, check-values.md), the all-to-all Ising model in a weak transverse field has nearly conserved
/// Z's (glass-like), and the mixed-field Ising chain is the standard chaotic chain (GOE levels).
/// </summary>
public class DemonstrationTests(ITestOutputHelper output)
{
    /// <summary>Reduced battery for tests: small members of 8-10 sites, small string budgets and work limits (10 s per Lanczos probe, 20 s of evolution, on 2 threads in processor time), two temperatures.</summary>
    internal static DiagnosisOptions TestOptions => new()
    {
        LevelN = 10,
        ClusterN = 6,
        SizeN = 8,
        SizeTimePoints = 17,
        ThermalN = 8,
        BetaEpsilon = [0.5, 2],
        ThermalTimePoints = 21,
        ThermalSamples = 2,
        LanczosDepth = 24,
        LanczosMaxStrings = 20_000,
        LanczosMemoryBytes = 256L << 20,
        LanczosSeconds = 10,
        EvolutionMaxStrings = 8_000,
        EvolutionTime = 16,
        EvolutionStep = 0.1,
        EvolutionSeconds = 20,
        Threads = 2,
    };

    private DiagnosisReport Diagnose(string name, int n)
    {
        string path = ShippedModels.Resolve(name);
        var ov = new Dictionary<string, string> { ["N"] = n.ToString(System.Globalization.CultureInfo.InvariantCulture) };
        var model = ModelLoader.Load(path, ov);
        var report = DiagnosisBattery.Run(model, FamilyMembers.FromFile(path, ov, model), TestOptions);
        output.WriteLine(report.ToText());
        return report;
    }

    /// <summary>
    /// A periodic drive: the self-dual kicked Ising chain with a longitudinal field is a standard chaotic
    /// Floquet chain (quasienergies with COE statistics: Bertini, Kos, Prosen, PRL 121, 264101 (2018);
    /// D'Alessio and Rigol, PRX 4, 041048 (2014)). Tests 2, 5 and 6 need a Hamiltonian; test 1 runs on
    /// the quasienergies, and tests 1, 3 and 4 carry the verdict.
    /// </summary>
    [Fact]
    [Trait("Category", "Slow")]
    public void Run_KickedIsing_ScramblesFromQuasienergiesSizeAndFront()
    {
        var r = Diagnose("kicked-ising", 12);
        Assert.Equal(TestOutcome.Scrambles, r.Overall.Outcome);
        var levels = r.Tests.Single(t => t.Number == 1);
        Assert.Equal(TestOutcome.Scrambles, levels.Outcome);
        Assert.Contains("COE", levels.Threshold, StringComparison.Ordinal);
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Run_TransverseFieldIsing_FailsAsFreeFermions()
    {
        var r = Diagnose("transverse-field-ising", 12);
        Assert.Equal(TestOutcome.Fails, r.Overall.Outcome);
        Assert.Equal(Mechanism.FreeFermions, r.Overall.Leading);
        // The X probe is quadratic in Majoranas: bounded b_n (check-values: free chains).
        Assert.Contains(r.Lanczos!.Probes, p => p.Kind == "bounded");
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Run_XxzChain_FailsAsInteractingIntegrable()
    {
        var r = Diagnose("demo/xxz-chain", 12);
        Assert.Equal(TestOutcome.Fails, r.Overall.Outcome);
        Assert.Equal(Mechanism.InteractingIntegrable, r.Overall.Leading);
        Assert.Contains("total Z", r.Conserved!.Recognised);
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Run_DisorderedXx_FailsAsLocalized()
    {
        var r = Diagnose("demo/disordered-xx", 12);
        Assert.Equal(TestOutcome.Fails, r.Overall.Outcome);
        Assert.Equal(Mechanism.Localized, r.Overall.Leading);
        Assert.Contains(r.Spreading!.Front!.Kind, new[] { "none", "stalled", "logarithmic" });
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Run_GlassCluster_FailsAsFrozen()
    {
        var r = Diagnose("demo/glass-cluster", 10);
        Assert.Equal(TestOutcome.Fails, r.Overall.Outcome);
        Assert.Equal(Mechanism.Frozen, r.Overall.Leading);
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void Run_TiltedChain_Scrambles()
    {
        var r = Diagnose("demo/tilted-chain", 12);
        Assert.Equal(TestOutcome.Scrambles, r.Overall.Outcome);
        Assert.Equal(Mechanism.Scrambles, r.Overall.Leading);
        Assert.Equal(TestOutcome.Scrambles, r.Tests.Single(t => t.Number == 1).Outcome);
    }
}
