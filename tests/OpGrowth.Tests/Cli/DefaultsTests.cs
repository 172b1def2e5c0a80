using System.Text.Json;
using OpGrowth.Cli;
using OpGrowth.Cli.Commands;
using OpGrowth.Evolution;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Cli;

/// <summary>
/// Safe defaults: evolve and lanczos with no budget option stay bounded and say how to go further; a drive's
/// --time counts periods in every command; --max-strings bounds the transient image of a pass.
/// </summary>
public class DefaultsTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    private static string TempDir() => Path.Combine(Path.GetTempPath(), "opgrowth-defaults-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public void EvolveDefaultBudget_ScalesWithTermsPerSite()
    {
        Assert.Equal(EvolveCommand.DefaultMaxStrings, EvolveCommand.DefaultBudgetFor(ModelLoader.Load(ShippedModels.Resolve("mixed-field-ising"))));
        long dense = EvolveCommand.DefaultBudgetFor(ModelLoader.Load(ShippedModels.Resolve("demo/heisenberg-cluster")));
        Assert.InRange(dense, 2_000, EvolveCommand.DefaultMaxStrings / 2);
    }

    [Fact]
    public void Evolve_NoBudgetOption_UsesTheDefaultAndSaysHowToGoFurther()
    {
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("evolve", "mixed-field-ising", "--set", "N=10", "--time", "1", "--out", dir, "-q");
            Assert.True(code == 0, err);
            Assert.Contains("note: default budget of 100,000 strings; to go further: --max-strings 1000000", output);
            using var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(dir, "evolve.json")));
            Assert.Equal(100_000, doc.RootElement.GetProperty("options").GetProperty("truncation").GetProperty("maxStrings").GetInt64());
            foreach (var f in new[] { "evolution.csv", "steps.csv", "size_distribution.csv", "site_weights.csv", "otoc.csv", "summary.txt" })
                Assert.True(File.Exists(Path.Combine(dir, f)), f);
            OpGrowth.Tests.Reporting.JsonOutputTests.AssertCamelCase(File.ReadAllText(Path.Combine(dir, "evolve.json")), "evolve.json", "parameters");
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Lanczos_DefaultStringLimit_StopsCleanlyAndExplicitRequestExits3()
    {
        // A 12-site chain: b_n of the exact recursion need more than 5,000 strings within a few steps.
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("lanczos", "mixed-field-ising", "--set", "N=12", "--exact-limit", "5000", "--out", dir, "-q");
            Assert.Equal(ExitCodes.ResourceLimit, code);
            Assert.Contains("the next Krylov vector would exceed 5,000 strings; to go further: --exact-limit 50000", output);
            var line = Assert.Single(err.Split('\n', StringSplitOptions.RemoveEmptyEntries));
            Assert.StartsWith("resource limit: string limit", line);
            Assert.True(File.Exists(Path.Combine(dir, "lanczos.csv")));
            OpGrowth.Tests.Reporting.JsonOutputTests.AssertCamelCase(File.ReadAllText(Path.Combine(dir, "lanczos.json")), "lanczos.json", "parameters");
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Lanczos_DepthBeyondTheOperatorSpace_IsCappedWithANote()
    {
        // On 2 qubits the traceless operators span 4^2 - 1 = 15 dimensions: no more coefficients exist.
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("lanczos", "mixed-field-ising", "--set", "N=2", "--depth", "40", "--out", dir, "-q");
            Assert.True(code == 0, err);
            Assert.Contains("exceeds the dimension of the operator space (4^2 - 1 = 15)", output);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Drive_TimeCountsPeriods_InEvolveAndRun()
    {
        // A kicked chain with period 0.5: --time 4 means four periods, t = 2.
        string model = Path.Combine(Path.GetTempPath(), $"opgrowth-half-period-{Guid.NewGuid():N}.toml");
        string text = File.ReadAllText(ShippedModels.Resolve("kicked-ising")).Replace("name = \"kicked-ising\"", "name = \"half-period\"\nperiod = 0.5", StringComparison.Ordinal);
        File.WriteAllText(model, text);
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("evolve", model, "--set", "N=8", "--time", "4", "--out", dir, "-q");
            Assert.True(code == 0, err);
            Assert.Contains(", t = 2", output.Split('\n')[0]);
            var m = ModelLoader.Load(model, new Dictionary<string, string> { ["N"] = "8" });
            Assert.Equal(2.0, OpGrowth.Pipeline.ScramblingRun.AbsoluteTime(m, 4));
            Assert.Equal(2.0, CommonOptions.AbsoluteTime(4, m, 0.05));
        }
        finally
        {
            File.Delete(model);
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void MaxStrings_BoundsThePassImage_OnAllToAllCouplings()
    {
        // All-to-all Heisenberg couplings: the XX (YY, ZZ) terms on all pairs commute, so one pass maps a string
        // that anticommutes with m of them to 2^m strings. With --max-strings M the image of a pass stays within
        // 16 M distinct strings (the group is applied in parts beyond that); before, M = 20,000 at N = 14 peaked
        // at 19.3 million.
        var m = ModelLoader.Load(ShippedModels.Resolve("heisenberg-all-to-all"), new Dictionary<string, string> { ["N"] = "14" });
        var problem = new EvolutionProblem { N = m.N, Name = m.Name, Hamiltonian = m.Hamiltonian, Initial = EvolutionProblem.Probe(m.Probes[0]) };
        const long budget = 20_000;
        var r = OperatorEvolution.Run(problem, new EvolutionOptions { Dt = 0.1, Time = 1.0, RecordEvery = 5, Threads = 2, Truncation = new TruncationPolicy { MaxStrings = budget } });
        Assert.True(r.Completed, r.StopReason);
        Assert.InRange(r.Main.PeakStrings, budget, EvolutionEngine<Pauli64>.ImagePerKeptString * budget);
    }
}
