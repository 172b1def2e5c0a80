using OpGrowth.IO;
using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>Plan reading, expansion and strictness: every bad plan gives one "file:line: found ...; expected ..." line.</summary>
public class SweepPlanTests
{
    private const string Valid = """
        name = "ising-end"
        description = "t* against N"

        [model]
        file = "model.toml"
        sizes = { from = 8, to = 16, step = 4 }
        seeds = { from = 1, count = 2 }
        probes = ["Z_0", "X_{N-1}"]

        [parameters]
        h = [0.5, 0.7]
        g = 1.05

        [engine]
        engine = "pauli"
        time = 12
        dt = 0.1
        max_strings = 50000
        budgets = 3
        """;

    [Fact]
    public void Parse_ValidPlan_ExpandsInModelParameterProbeSizeSeedOrder()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan(Valid);
        Assert.Equal("ising-end", plan.Name);
        Assert.Equal([8, 12, 16], plan.Sizes);
        Assert.Equal([1L, 2L], plan.Seeds);
        Assert.Equal(12, plan.Engine.Time);
        Assert.Equal(3, plan.Engine.Budgets);
        var points = plan.Expand();
        // 1 model x 2 h-values x 1 g x 2 probes x 3 sizes x 2 seeds.
        Assert.Equal(24, points.Count);
        Assert.Equal(24, plan.PointCount);
        Assert.Equal(Enumerable.Range(0, 24), points.Select(p => p.Index));
        Assert.Equal(24, points.Select(p => p.Id).Distinct().Count());
        Assert.Equal((8, 1L, "Z_0", 0.5), (points[0].N, points[0].Seed!.Value, points[0].Probe, points[0].Parameters.Single(kv => kv.Key == "h").Value));
        Assert.Equal((8, 2L), (points[1].N, points[1].Seed!.Value));
        Assert.Equal(12, points[2].N);
        Assert.Equal("X_7", points[6].Probe);   // second probe, N = 8: site N-1 = 7
        Assert.Equal("X_{N-1}", points[6].ProbeTemplate);
        Assert.Equal(0.7, points[12].Parameters.Single(kv => kv.Key == "h").Value);
        Assert.Equal(["g", "h"], points[0].Parameters.Select(kv => kv.Key));
        Assert.Equal("12", points[2].Overrides()["N"]);
        Assert.Equal("1", points[0].Overrides()["seed"]);
        // Points of one series share the group key across N and seeds.
        Assert.Single(points.Take(6).Select(p => p.GroupKey).Distinct());
        Assert.NotEqual(points[0].GroupKey, points[6].GroupKey);
    }

    [Fact]
    public void ToToml_RoundTrip_GivesTheSamePoints()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan(Valid);
        string again = plan.ToToml();
        var plan2 = SweepPlanReader.Parse(again, kit.Path("resolved.toml"), "/nonexistent-base");
        Assert.Equal(plan.Expand().Select(p => p.Id), plan2.Expand().Select(p => p.Id));
    }

    [Theory]
    [InlineData("h = 0.5, 0.7", 1, "TOML syntax error")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\nsizez = [8]", 4, "unknown key 'sizez' in [model] (did you mean 'sizes'?)")]
    [InlineData("nam = \"x\"\n[model]\nfile = \"model.toml\"\nsizes = [8]", 1, "unknown key 'nam' in the top level (did you mean 'name'?)")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\nengine = \"paul\"", 5, "found the string \"paul\" for 'engine' (did you mean 'pauli'?)")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\ntime = \"long\"", 5, "found the string \"long\" for 'time'; expected a number")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\ntime = -1.0", 5, "expected a finite number")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\nbudgets = 4", 5, "expected an integer in 1..3")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\nmax_strings = 1.5", 5, "expected an integer")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\nmethod = \"euler\"", 5, "expected one of \"trotter2\", \"trotter4\", \"rk4\"")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[engine]\ndt = 2.0\ntime = 1.0", 4, "found dt = 2 larger than time = 1")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = []", 3, "found an empty array for 'sizes'")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [1]", 3, "found size 1; expected sizes N in 2..1024")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8, 8]", 3, "found a size twice")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = { from = 16, to = 8 }", 3, "found to = 8 below from = 16")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = { from = 8, to = 16, count = 2 }", 3, "found both 'to' and 'count'")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8, 9.5]", 3, "found the number 9.5 in 'sizes'; expected integers")]
    [InlineData("[model]\nfile = \"missing.toml\"\nsizes = [8]", 2, "found model file 'missing.toml', which does not exist")]
    [InlineData("[model]\nsizes = [8]", 1, "found no model file in [model]")]
    [InlineData("[model]\nfile = \"model.toml\"", 1, "found no 'sizes' in [model]")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\nprobes = [\"Q_0\"]", 4, "'Q_0' is not a Pauli factor")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\nprobes = [\"Z_{N}\"]", 4, "site 8 in 'Z_8' is out of range")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\nprobes = [\"Z_{N-}\"]", 4, "expected an integer expression in N")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[parameters]\nN = [8, 12]", 5, "found N in [parameters]")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[parameters]\nseed = [1, 2]", 5, "found the seed parameter 'seed' in [parameters]")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[parameters]\nh = []", 5, "found an empty array for parameter 'h'")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[parameters]\nh = \"big\"", 5, "found the string \"big\" for parameter 'h'")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[parameters]\nh = { from = 0.1, to = 0.5 }", 5, "found no 'step' for parameter 'h'")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\nengine.time = 3.0", 4, "found the dotted key")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[[engine]]\ntime = 3.0", 4, "found an array of tables")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[synthetic]\nlaw = \"cubic\"", 5, "expected one of \"linear\", \"log\"")]
    [InlineData("[model]\nfile = \"model.toml\"\nsizes = [8]\n[synthetic]\nmemory = \"lots\"", 5, "expected a size such as \"512MiB\"")]
    [InlineData("model = 3", 1, "found the integer 3 for [model]; expected a table")]
    [InlineData("name = \"a b\"\n[model]\nfile = \"model.toml\"\nsizes = [8]", 1, "expected a name of letters, digits")]
    public void Parse_BadPlan_ReportsFileLineFoundExpected(string text, int line, string fragment)
    {
        using var kit = new SweepTestKit();
        var ex = Assert.Throws<InputException>(() => kit.LoadPlan(text));
        Assert.Contains(fragment, ex.Message, StringComparison.Ordinal);
        Assert.Equal(line, ex.Line);
        Assert.StartsWith(kit.Path("plan.toml") + ":" + line + ": ", ex.Message, StringComparison.Ordinal);
        Assert.DoesNotContain('\n', ex.Message);
    }

    [Fact]
    public void Parse_DuplicateKey_IsRejected()
    {
        using var kit = new SweepTestKit();
        var ex = Assert.Throws<InputException>(() => kit.LoadPlan("[model]\nfile = \"model.toml\"\nsizes = [8]\nsizes = [12]"));
        Assert.True(ex.Line is 3 or 4, ex.Message);
        Assert.DoesNotContain('\n', ex.Message);
    }

    [Fact]
    public void Expand_CleanModelBesideDisorderedOne_SeedsOnlyWhereDeclared()
    {
        using var kit = new SweepTestKit();
        File.WriteAllText(kit.Path("clean.toml"), SweepTestKit.ModelText.Replace("seed = 1\n", "", StringComparison.Ordinal)
            .Replace("coupling = \"normal(1, 0.1)\"\nseed = \"seed\"", "coupling = 1.0", StringComparison.Ordinal));
        var plan = kit.LoadPlan("[model]\nfiles = [\"model.toml\", \"clean.toml\"]\nsizes = [8, 12]\nseeds = [1, 2, 3]\n[engine]\nengine = \"pauli\"");
        var points = plan.Expand();
        Assert.Equal(6, points.Count(p => p.ModelLabel == "model"));
        Assert.Equal(2, points.Count(p => p.ModelLabel == "clean"));
        Assert.All(points.Where(p => p.ModelLabel == "clean"), p => Assert.Null(p.Seed));
    }

    [Fact]
    public void PointModel_Load_AppliesSizeParametersSeedAndProbe()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan("[model]\nfile = \"model.toml\"\nsizes = [10]\nseeds = [5]\nprobes = [\"X_{N-1}\", \"model\"]\n[parameters]\nh = 0.25\n[engine]\nengine = \"pauli\"");
        var points = plan.Expand();
        var pm = PointModel.Load(points[0]);
        Assert.Equal(10, pm.Model.N);
        Assert.Equal(0.25, pm.Model.Parameters["h"]);
        Assert.Equal(5, pm.Model.Parameters["seed"]);
        Assert.Equal("X_9", pm.Probe.ToString());
        Assert.Equal("Z_0", PointModel.Load(points[1]).Probe.ToString());
        Assert.Equal(7.5, pm.SaturationSize);
    }

    [Theory]
    [InlineData("8:16:4", new long[] { 8, 12, 16 })]
    [InlineData("1:3", new long[] { 1, 2, 3 })]
    [InlineData("8, 12,20", new long[] { 8, 12, 20 })]
    public void ParseIntRange_CommandLineForms_Expand(string text, long[] expected)
        => Assert.Equal(expected, SweepPlanReader.ParseIntRange(text, "--sizes"));

    [Theory]
    [InlineData("8:4")]
    [InlineData("8:16:0")]
    [InlineData("a,b")]
    [InlineData("")]
    public void ParseIntRange_BadText_IsInputError(string text)
        => Assert.Throws<InputException>(() => SweepPlanReader.ParseIntRange(text, "--sizes"));

    [Fact]
    public void ParseGrid_RangeAndList_Expand()
    {
        Assert.Equal([0.1, 0.3, 0.5], SweepPlanReader.ParseGrid("h=0.1:0.5:0.2").Values);
        Assert.Equal([1.0, 2.5], SweepPlanReader.ParseGrid("J=1,2.5").Values);
        Assert.Throws<InputException>(() => SweepPlanReader.ParseGrid("=1"));
        Assert.Throws<InputException>(() => SweepPlanReader.ParseGrid("h=1,1"));
    }

    [Theory]
    [InlineData("Z_0", 8, "Z_0")]
    [InlineData("Z_{N-1}", 8, "Z_7")]
    [InlineData("X_{N/2} X_{N/2+1}", 9, "X_4 X_5")]
    [InlineData("Y_{(N-1)/2}", 10, "Y_4")]
    [InlineData("model", 10, "model:0")]
    [InlineData("model:1", 10, "model:1")]
    public void ProbeTemplate_Resolve_SubstitutesN(string template, int n, string expected)
    {
        Assert.True(ProbeTemplate.TryResolve(template, n, out string resolved, out string? error), error);
        Assert.Equal(expected, resolved);
    }
}
