using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>Point identity: the same inputs give the same id on every run; any change of an input gives a new id.</summary>
public class PointIdentityTests
{
    private static readonly KeyValuePair<string, double>[] Params = [new("g", 1.05), new("h", 0.5)];

    private static string Id(EngineSettings e, int n = 12, long? seed = 3, string probe = "Z_0", string sha = "ab12", KeyValuePair<string, double>[]? ps = null, string seedParam = "seed")
        => PointIdentity.Compute(sha, n, ps ?? Params, seed, seedParam, probe, e);

    [Fact]
    public void Compute_SameInputs_SameIdAndPinnedValue()
    {
        var e = new EngineSettings { Engine = EngineChoice.Pauli };
        string a = Id(e);
        string b = Id(e with { });
        Assert.Equal(a, b);
        // Parameter order does not matter: they are sorted by name.
        Assert.Equal(a, Id(e, ps: [new("h", 0.5), new("g", 1.05)]));
        Assert.Equal(PointIdentity.IdLength, a.Length);
        // Pinned: the canonical form must never change silently, or every stored result would be recomputed
        // (and, worse, a changed meaning could reuse old files). Change SchemaVersion deliberately instead.
        Assert.Equal(
            """{"engine":{"budgets":"2","dt":"0.05","engine":"pauli","front_fraction":"0.5","max_strings":"200000","method":"trotter2","record_every":"2","threshold":"0","time":"20"},"model_sha256":"ab12","n":12,"parameters":{"g":"1.05","h":"0.5"},"probe":"Z_0","schema":"opgrowth.sweep-point/1","seed":"3","seed_parameter":"seed"}""",
            PointIdentity.CanonicalJson("ab12", 12, Params, 3, "seed", "Z_0", e));
        Assert.Equal(PointIdentity.Sha256Hex(System.Text.Encoding.UTF8.GetBytes(PointIdentity.CanonicalJson("ab12", 12, Params, 3, "seed", "Z_0", e)))[..16], a);
    }

    [Fact]
    public void Compute_AnyChangedInput_NewId()
    {
        var pauli = new EngineSettings { Engine = EngineChoice.Pauli };
        var exact = new EngineSettings { Engine = EngineChoice.Exact };
        var synth = new EngineSettings { Engine = EngineChoice.Synthetic };
        var ids = new List<(string What, string Id)>
        {
            ("base", Id(pauli)),
            ("N", Id(pauli, n: 13)),
            ("seed", Id(pauli, seed: 4)),
            ("no seed", Id(pauli, seed: null)),
            ("seed parameter", Id(pauli, seedParam: "disorder")),
            ("probe", Id(pauli, probe: "X_0")),
            ("model content", Id(pauli, sha: "ab13")),
            ("parameter value", Id(pauli, ps: [new("g", 1.05), new("h", 0.50000000001)])),
            ("extra parameter", Id(pauli, ps: [new("g", 1.05), new("h", 0.5), new("J", 1)])),
            ("time", Id(pauli with { Time = 21 })),
            ("dt", Id(pauli with { Dt = 0.025 })),
            ("record_every", Id(pauli with { RecordEvery = 1 })),
            ("method", Id(pauli with { Method = "trotter4" })),
            ("max_strings", Id(pauli with { MaxStrings = 200_001 })),
            ("threshold", Id(pauli with { Threshold = 1e-8 })),
            ("budgets", Id(pauli with { Budgets = 3 })),
            ("front_fraction", Id(pauli with { FrontFraction = 0.25 })),
            ("engine exact", Id(exact)),
            ("samples", Id(exact with { Samples = 8 })),
            ("sample_seed", Id(exact with { SampleSeed = 2 })),
            ("engine synthetic", Id(synth)),
            ("law", Id(synth with { Synthetic = synth.Synthetic with { Law = "log" } })),
            ("a", Id(synth with { Synthetic = synth.Synthetic with { A = 0.6 } })),
            ("b", Id(synth with { Synthetic = synth.Synthetic with { B = 0.3 } })),
            ("noise", Id(synth with { Synthetic = synth.Synthetic with { Noise = 0.1 } })),
            ("delay", Id(synth with { Synthetic = synth.Synthetic with { Delay = 1 } })),
            ("memory", Id(synth with { Synthetic = synth.Synthetic with { MemoryBytes = 1 << 20 } })),
            ("truncation fraction", Id(synth with { Synthetic = synth.Synthetic with { TruncationFraction = 0.02 } })),
        };
        var dup = ids.GroupBy(x => x.Id).Where(g => g.Count() > 1).Select(g => string.Join(" = ", g.Select(x => x.What))).ToList();
        Assert.True(dup.Count == 0, "same id for: " + string.Join("; ", dup));
    }

    [Fact]
    public void Compute_AutoEngine_ResolvesPerSize()
    {
        var auto = new EngineSettings { Engine = EngineChoice.Auto, ExactMaxN = 10 };
        // Auto resolves to the engine that really runs: the id equals the explicit engine's id.
        Assert.Equal(Id(new EngineSettings { Engine = EngineChoice.Exact }, n: 10), Id(auto, n: 10));
        Assert.Equal(Id(new EngineSettings { Engine = EngineChoice.Pauli }, n: 11), Id(auto, n: 11));
    }

    [Fact]
    public void Expand_ModelMovedButUnchanged_SameIds_ContentChanged_NewIds()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan(SweepTestKit.SyntheticPlan());
        var before = plan.Expand().Select(p => p.Id).ToArray();
        string moved = kit.Path("moved.toml");
        File.Copy(kit.ModelFile, moved);
        Assert.Equal(before, (plan with { ModelFiles = [moved] }).Expand().Select(p => p.Id));
        File.AppendAllText(kit.ModelFile, "# edited\n");
        var after = plan.Expand().Select(p => p.Id).ToArray();
        Assert.Empty(before.Intersect(after));
    }
}
