using OpGrowth.Cli;
using OpGrowth.Ensembles;
using OpGrowth.IO;

namespace OpGrowth.Tests.Ensembles;

/// <summary>`opgrowth ensemble` and circuit files: the report folder, the printed figures and one-line input errors.</summary>
public class EnsembleCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        using var o = new StringWriter();
        using var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    private static string Temp(string tag) => Path.Combine(Path.GetTempPath(), $"opgrowth-{tag}-" + Guid.NewGuid().ToString("N"));

    /// <summary>The demo circuit: v_B near 3/5 per layer (Nahum, Vijay, Haah, PRX 8, 021014 (2018)); tolerance 0.06 for 200 samples on 24 qubits.</summary>
    [Fact]
    public void Ensemble_DemoCircuit_WritesReportAndPrintsVB()
    {
        string dir = Temp("ensemble");
        try
        {
            var (code, output, err) = Run("ensemble", "demo/device-brickwork", "--effort", "quick", "--out", dir, "--threads", "2");
            Assert.True(code == 0, err);
            Assert.Contains("butterfly velocity v_B", output);
            Assert.True(File.Exists(Path.Combine(dir, "report.html")));
            Assert.True(File.Exists(Path.Combine(dir, "results.json")));
            Assert.True(File.Exists(Path.Combine(dir, "figures", "light-cone.png")));
            using var json = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "results.json")));
            Assert.Equal(0.6, json.RootElement.GetProperty("butterflyVelocity").GetDouble(), 0.06);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void RunBoth_PutsTheBrownianCounterpartBesideTheStaticModel()
    {
        string dir = Temp("run-both");
        try
        {
            var (code, output, err) = Run("run", "mixed-field-ising", "--set", "N=8", "--effort", "quick", "--no-exact", "--no-lanczos", "--no-diagnosis", "--ensemble", "both", "--out", dir, "--threads", "2");
            Assert.True(code == 0, err);
            Assert.Contains("Brownian", output);
            Assert.True(File.Exists(Path.Combine(dir, "report.html")));
            Assert.True(File.Exists(Path.Combine(dir, "brownian", "figures", "static-vs-brownian.png")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void CircuitFile_MisspeltLayout_IsOneLineWithFileAndLine()
    {
        string text = "name = \"c\"\ndescription = \"d\"\n\n[lattice]\nkind = \"chain\"\nsites = 8\n\n[circuit]\nlayout = \"brickwrk\"\nlayers = 4\n";
        var ex = Assert.Throws<InputException>(() => CircuitLoader.Parse(text, "c.toml"));
        Assert.Equal(9, ex.Line);
        Assert.Contains("did you mean 'brickwork'", ex.Message);
    }

    [Fact]
    public void CircuitFile_ParametersAndOverrides_AreTheModelLoaders()
    {
        string text = "name = \"c\"\ndescription = \"d\"\n\n[parameters]\nN = 8\nL = \"2*N\"\n\n[lattice]\nkind = \"chain\"\nsites = \"N\"\n\n[circuit]\nlayout = \"brickwork\"\nlayers = \"L\"\nsingle_qubit = true\n";
        var c = CircuitLoader.Parse(text, "c.toml", new Dictionary<string, string> { ["N"] = "10" });
        Assert.Equal(10, c.N);
        Assert.Equal(20, c.Layers);
        Assert.True(c.SingleQubitLayers);
        Assert.Equal(CircuitLayout.Brickwork, c.Layout);
    }

    /// <summary>The square-lattice brickwork uses four bond sets without a shared qubit.</summary>
    [Fact]
    public void Square_BrickworkColouring_IsProperWithFourClasses()
    {
        var classes = GateSchedule.Colour(OpGrowth.Models.Lattice.Square(4, 6));
        Assert.Equal(4, classes.Length);
        foreach (var c in classes) Assert.Equal(c.Length, c.Distinct().Count());
        Assert.Equal(2 * OpGrowth.Models.Lattice.Square(4, 6).Edges.Count, classes.Sum(c => c.Length));
    }
}
