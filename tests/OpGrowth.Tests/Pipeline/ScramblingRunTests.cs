using System.Text.Json;
using System.Text.RegularExpressions;
using OpGrowth.Analysis;
using OpGrowth.Diagnosis;
using OpGrowth.Evolution;
using OpGrowth.Krylov;
using OpGrowth.Pipeline;
using OpGrowth.Reporting;
using OpGrowth.Tests.Reporting;

namespace OpGrowth.Tests.Pipeline;

/// <summary>
/// One quick run of the pipeline on mixed-field-ising at N = 10 with every stage (diagnosis included) and a
/// t*(N) sweep over N = 6, 7, 8 (exact engine), shared by the library tests. The diagnosis's wall-time caps are
/// lifted so its figures do not depend on machine load (the equality test reruns it).
/// </summary>
public sealed class QuickRunFixture : IDisposable
{
    public QuickRunFixture()
    {
        Folder = Path.Combine(Path.GetTempPath(), "opgrowth-run-tests-" + Guid.NewGuid().ToString("N"));
        Result = ScramblingRun.Execute(new ScramblingRunOptions
        {
            Model = "mixed-field-ising",
            Overrides = new Dictionary<string, string> { ["N"] = "10" },
            OutputFolder = Folder,
            Effort = RunEffort.Quick,
            Threads = 2,
            Diagnosis = DiagnosisOptionsUsed,
            SweepSizes = [6, 7, 8],
        });
    }

    /// <summary>The quick diagnosis settings without wall-time caps (deterministic).</summary>
    public static DiagnosisOptions DiagnosisOptionsUsed => RunStages.DiagnosisFor(RunEffort.Quick, 2) with { LanczosSeconds = 600, EvolutionSeconds = 600 };

    public string Folder { get; }
    public ScramblingRunResult Result { get; }

    public void Dispose()
    {
        try { Directory.Delete(Folder, true); } catch (IOException) { }
    }
}

public class ScramblingRunTests(QuickRunFixture fx) : IClassFixture<QuickRunFixture>
{
    private static readonly string[] ExpectedFiles =
    [
        "report.html", "report.md", "report.json", "results.json", "manifest.json",
        "data/evolution.csv", "data/steps.csv", "data/size_distribution.csv", "data/site_weights.csv", "data/otoc.csv",
        "data/convergence.csv", "data/mean_size_by_budget.csv",
        "data/lanczos.csv", "data/krylov.csv", "data/compare.csv", "data/diagnosis.json", "data/diagnosis.txt",
        "figures/size-distribution.png", "figures/mean-size.png", "figures/light-cone.png",
        "figures/lanczos.png", "figures/krylov.png", "figures/pauli-vs-exact.png", "figures/tstar-scaling.png",
        "figures/size-distribution.svg", "figures/tstar-scaling.svg",
        "sweep/plan.toml", "sweep/sweep.json", "sweep/table.csv", "sweep/fits.json",
    ];

    [Fact]
    public void Execute_QuickRun_WritesEveryListedFile()
    {
        Assert.True(fx.Result.Completed, fx.Result.StopReason);
        foreach (string f in ExpectedFiles)
        {
            string p = Path.Combine(fx.Folder, f);
            Assert.True(File.Exists(p), "missing " + f);
            Assert.True(new FileInfo(p).Length > 0, "empty " + f);
        }
        foreach (string f in fx.Result.Files) Assert.True(File.Exists(Path.Combine(fx.Folder, f)), "listed but missing: " + f);
        Assert.Empty(ManifestWriter.Verify(Path.Combine(fx.Folder, "manifest.json")));
    }

    [Fact]
    public void Execute_QuickRun_HtmlEmbedsEveryFigure()
    {
        string html = File.ReadAllText(Path.Combine(fx.Folder, "report.html"));
        int uris = Regex.Matches(html, "data:image/").Count;
        bool discarded = fx.Result.Evolution!.Main.Records[^1].DiscardedTotal > 0;
        Assert.Equal(discarded ? 8 : 7, fx.Result.FigureCount);
        Assert.Equal(fx.Result.FigureCount, uris);
        foreach (string id in new[] { "fig-size-distribution", "fig-mean-size", "fig-light-cone", "fig-lanczos", "fig-krylov", "fig-pauli-vs-exact", "fig-tstar-scaling" })
            Assert.Contains("id=\"" + id + "\"", html);
        if (discarded) Assert.Contains("id=\"fig-discarded-weight\"", html);
        // The diagnosis table and the t*(N) table are in both report forms.
        string md = File.ReadAllText(Path.Combine(fx.Folder, "report.md"));
        foreach (string doc in new[] { html, md })
        {
            Assert.Contains("Diagnosis", doc);
            // A mechanism is named only when it adds something: never "leading mechanism: scrambles".
            Assert.DoesNotContain("leading mechanism: scrambles", doc);
            Assert.DoesNotContain("LinearOverLog", doc);
            Assert.DoesNotContain("+ -", doc);
            Assert.DoesNotContain("model:0", doc);
            Assert.Contains("Scrambling time against size", doc);
            Assert.Contains("b ln N", doc);
        }
        Assert.DoesNotContain("<script", html, StringComparison.OrdinalIgnoreCase);
    }

    [Fact]
    public void Execute_QuickRun_ResultsJsonHasDocumentedKeys()
    {
        using var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(fx.Folder, "results.json")));
        var keys = doc.RootElement.EnumerateObject().Select(p => p.Name).ToList();
        Assert.Equal(RunReport.ResultKeys.OrderBy(k => k, StringComparer.Ordinal), keys.OrderBy(k => k, StringComparer.Ordinal));
        // docs/run.md lists the same keys.
        string md = File.ReadAllText(Path.Combine(RepoRoot(), "docs", "run.md"));
        foreach (string k in RunReport.ResultKeys) Assert.Contains("`" + k + "`", md);
        Assert.True(doc.RootElement.GetProperty("crossCheck").GetProperty("passed").GetBoolean());

        // Diagnosis: ran, seven tests with verdict, figure, threshold and reason; overall verdict and leading mechanism.
        var diag = doc.RootElement.GetProperty("diagnosis");
        Assert.True(diag.GetProperty("ran").GetBoolean());
        Assert.Equal(7, diag.GetProperty("tests").GetArrayLength());
        foreach (var t in diag.GetProperty("tests").EnumerateArray())
            foreach (string k in new[] { "number", "name", "verdict", "figure", "threshold", "source", "reason" }) Assert.True(t.TryGetProperty(k, out _), "diagnosis test lacks " + k);
        Assert.Contains(diag.GetProperty("overall").GetProperty("verdict").GetString(), new[] { "scrambles", "does not scramble", "inconclusive" });
        Assert.False(string.IsNullOrEmpty(diag.GetProperty("overall").GetProperty("leadingMechanism").GetString()));

        // The run's verdict is the battery's.
        var verdict = doc.RootElement.GetProperty("verdict");
        Assert.Equal(diag.GetProperty("overall").GetProperty("verdict").GetString(), verdict.GetProperty("outcome").GetString());
        string leading = diag.GetProperty("overall").GetProperty("leadingMechanism").GetString()!;
        Assert.Equal(leading is "scrambles" or "undetermined" ? "-" : leading, verdict.GetProperty("mechanism").GetString());

        // Sweep: three sizes, both fits with errors, a preferred law.
        var sweep = doc.RootElement.GetProperty("sweep");
        Assert.True(sweep.GetProperty("ran").GetBoolean());
        Assert.Equal(3, sweep.GetProperty("points").GetArrayLength());
        var fits = sweep.GetProperty("fits");
        foreach (string law in new[] { "log", "linear" })
            foreach (string k in new[] { "a", "aError", "slope", "slopeError", "aic" }) Assert.True(fits.GetProperty(law).TryGetProperty(k, out _), $"{law} fit lacks {k}");
        Assert.Contains(fits.GetProperty("preferred").GetString(), new[] { "log", "linear", "neither" });
    }

    [Fact]
    public void Execute_QuickRun_DiagnosisEqualsTheBatteryOnTheSameInputs()
    {
        var r = fx.Result;
        var direct = DiagnosisBattery.Run(r.Model, FamilyMembers.FromFile(r.ModelFile, r.Options.Overrides, r.Model), QuickRunFixture.DiagnosisOptionsUsed);
        var mine = r.Diagnosis!;
        Assert.Equal(direct.Overall.Outcome, mine.Overall.Outcome);
        Assert.Equal(direct.Overall.Leading, mine.Overall.Leading);
        Assert.Equal(direct.Tests.Select(t => (t.Number, t.Outcome, t.Figure)), mine.Tests.Select(t => (t.Number, t.Outcome, t.Figure)));
        Assert.Equal(RunStages.OutcomeText(mine.Overall.Outcome), r.Verdict!.Outcome);
        Assert.Contains("> Verdict: " + r.Verdict.Outcome, File.ReadAllText(Path.Combine(fx.Folder, "report.md")));
    }

    [Fact]
    public void Execute_QuickRun_SweepEqualsTheSweepLibraryAndResumes()
    {
        var r = fx.Result;
        var stage = r.Sweep!;
        Assert.Equal(3, stage.Computed + stage.Reused);
        // Rerunning the stage on the same folder computes nothing: every point is reused from the report folder.
        var plan = RunStages.SweepPlanFor(r.ModelFile, r.Model, r.Options.Overrides, r.Options.SweepSizes, stage.Engine);
        var again = RunStages.Sweep(plan, stage.Folder, 2, 1L << 30, null, CancellationToken.None);
        Assert.Equal(0, again.Computed);
        Assert.Equal(3, again.Reused);
        var a = stage.Series!;
        var b = again.Series!;
        Assert.Equal(a.Data.Select(x => x.TStar), b.Data.Select(x => x.TStar));
        // The fits equal the sweep library's fit of the same points.
        var usable = a.Data.Where(x => x.TStar is not null).ToList();
        var cmp = OpGrowth.Sweeps.FitComparison.Compare(usable.Select(x => (double)x.N).ToArray(), usable.Select(x => x.TStar!.Value).ToArray(), usable.Select(x => x.TStarTotalError).ToArray());
        Assert.Equal(cmp.DeltaAic, a.Comparison!.DeltaAic, 12);
        Assert.Equal(cmp.Log.Slope, a.Comparison.Log.Slope, 12);
    }

    [Fact]
    public void Execute_QuickRun_CrossCheckEqualsTheCompareCommand()
    {
        var x = fx.Result.CrossCheck!;
        string dir = Path.Combine(fx.Folder, "compare-cli");
        var o = new StringWriter();
        var e = new StringWriter();
        int code = OpGrowth.Cli.Program.Run(["compare", "mixed-field-ising", "--set", "N=10", "--size", x.N.ToString(System.Globalization.CultureInfo.InvariantCulture),
            "--time", fx.Result.Preset.ExactTime.ToString(System.Globalization.CultureInfo.InvariantCulture), "--threads", "2", "--out", dir], o, e);
        Assert.True(code == 0, e.ToString());
        using var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(dir, "compare.json")));
        double Get(string name) => doc.RootElement.EnumerateObject().Single(p => string.Equals(p.Name, name, StringComparison.OrdinalIgnoreCase)).Value.GetDouble();
        Assert.Equal(x.MaxOtocDifference, Get("maxOtocDifference"));
        Assert.Equal(x.MaxAutocorrelationDifference, Get("maxAutocorrelationDifference"));
    }

    [Fact]
    public void Execute_QuickRun_HeadlinesEqualTheEnginesOnTheSameInputs()
    {
        var r = fx.Result;
        // The evolution engine and its analysis, called directly with the same inputs (results do not depend on threads).
        var direct = OperatorEvolution.Run(r.Problem, r.EvolutionOptions, r.Geometry);
        var fig = direct.Figures[0];
        Assert.Equal(fig.ScramblingTime.Value, r.Evolution!.Figures[0].ScramblingTime.Value);
        Assert.Equal(fig.Butterfly?.Primary.Velocity, r.Evolution.Figures[0].Butterfly?.Primary.Velocity);
        // The t* headline carries the run's statement at its own N; at N = 10 the exact engine measures it (cheap).
        var tstar = r.Headlines.Single(h => h.Name == "scrambling time t*");
        Assert.NotNull(r.ScramblingTime);
        Assert.Equal(r.ScramblingTime!.Value!.Value, tstar.Value.Value);
        var vb = r.Headlines.Single(h => h.Name == "butterfly velocity v_B");
        Assert.Equal(fig.Butterfly!.Primary.Velocity!.Value, vb.Value.Value);

        // The Lanczos engine called directly.
        var lz = LanczosStudy.Run(r.Model, r.Model.Probes[0], LanczosMode.Truncated, r.LanczosOptions!, r.Preset.LanczosBudgets);
        Assert.Equal(lz.B, r.Lanczos!.B);
        var alpha = r.Headlines.Single(h => h.Name == "Lanczos slope alpha");
        Assert.Equal(KrylovAnalyzer.Analyze(lz, new KrylovAnalysisOptions()).Growth!.Alpha, alpha.Value.Value);
    }

    [Fact]
    public void Execute_QuickRun_StatesTStarMeasuredByTheExactEngine()
    {
        // N = 10 costs the exact t* search well under a second: the statement is a measurement, it agrees with the exact
        // engine called directly with the same options (site blocks, two random states), and results.json carries it.
        var r = fx.Result;
        var st = r.ScramblingTime!;
        Assert.Equal("measured", st.Route);
        Assert.Equal(10, st.N);
        var direct = OpGrowth.Exact.ScramblingTimeSearch.Run(r.Model.Hamiltonian, new OpGrowth.Exact.ScramblingTimeSearchOptions
        {
            Operator = r.Model.Probes[0],
            Samples = ScramblingTimeStage.MemberSamples(10),
            SiteBlocks = true,
            MaxTime = Math.Max(4 * r.Preset.Time, 40),
            Guess = r.Evolution!.Figures[0].ScramblingTime.Value,
        });
        Assert.Equal(direct.TStar!.Value, st.Value!.Value, 9);
        Assert.True(st.Low < st.Value && st.High > st.Value);
        using var doc = System.Text.Json.JsonDocument.Parse(File.ReadAllText(Path.Combine(r.Folder, RunReport.ResultsFileName)));
        var js = doc.RootElement.GetProperty("scramblingTime");
        Assert.Equal("measured", js.GetProperty("route").GetString());
        Assert.Equal(st.Value!.Value, js.GetProperty("value").GetDouble(), 12);
    }

    [Fact]
    public void Execute_QuickRun_CrossCheckPassesAgainstExactEngine()
    {
        // Both engines are exact to rounding on this grid (Taylor steps, no truncation; dense traces), so 1e-6 is a
        // loose bound: a failure means a real disagreement, not accumulated error.
        var x = fx.Result.CrossCheck!;
        Assert.True(x.Ran, x.SkipReason);
        Assert.True(x.MaxOtocDifference < 1e-6, $"max |dF| = {x.MaxOtocDifference}");
        Assert.True(x.MaxAutocorrelationDifference < 1e-6, $"max |dC| = {x.MaxAutocorrelationDifference}");
        Assert.Equal(1.0, x.ExactAutocorrelation[0], 12); // C(0) = (O|O) = 1 by normalisation
    }

    [Fact]
    public void Execute_QuickRun_EveryJsonFileIsCamelCase()
    {
        // One key style in every JSON file the run writes (the battery's own data/diagnosis.json aside); model
        // parameters and overrides are user-named dictionaries.
        foreach (string f in Directory.GetFiles(fx.Folder, "*.json", SearchOption.AllDirectories))
        {
            if (Path.GetFileName(f) == "diagnosis.json" || f.Contains(Path.Combine("sweep", "points"), StringComparison.Ordinal)) continue;
            OpGrowth.Tests.Reporting.JsonOutputTests.AssertCamelCase(File.ReadAllText(f), Path.GetRelativePath(fx.Folder, f), "parameters", "overrides", "timingsSeconds", "settings");
        }
    }

    [Fact]
    public void Execute_QuickRun_StatesEachHeadlineOnce()
    {
        // The verdict table reuses the headline figures (same value and uncertainty), and the report names a
        // leading mechanism only when it adds something.
        var r = fx.Result;
        var vb = r.Headlines.SingleOrDefault(h => h.Name == EvolutionHeadlines.ButterflyVelocity);
        var front = r.Verdicts.SingleOrDefault(v => v.Test == "ballistic operator front");
        if (vb is not null && front is not null) Assert.Same(vb.Value, front.Figure);
        var alpha = r.Headlines.Single(h => h.Name == RunReport.LanczosSlope);
        Assert.Same(alpha.Value, r.Verdicts.Single(v => v.Test == "Lanczos growth class").Figure);
        Assert.Equal(1, r.Headlines.Count(h => h.Name == RunReport.LanczosSlope));
        if (r.Krylov!.Growth!.BoundApplies) Assert.Contains(r.Headlines, h => h.Name == RunReport.LyapunovBound);
        else Assert.DoesNotContain(r.Headlines, h => h.Name == RunReport.LyapunovBound);
        Assert.DoesNotContain(r.Headlines, h => h.Name.Contains("agreement", StringComparison.Ordinal));
    }

    [Fact]
    public void Execute_QuickRun_EveryPngCarriesText()
    {
        foreach (string png in Directory.GetFiles(Path.Combine(fx.Folder, "figures"), "*.png"))
        {
            byte[] bytes = File.ReadAllBytes(png);
            Assert.True(bytes.Length > 1000, png);
            // Title band at the top: dark text on white (same idea as the Reporting chart tests).
            Assert.True(PixelProbe.InkPixels(bytes, 0.05, 0.95, 0.0, 0.12) > 30, "no title text in " + png);
        }
    }

    internal static string RepoRoot()
    {
        var d = new DirectoryInfo(AppContext.BaseDirectory);
        while (d is not null && !File.Exists(Path.Combine(d.FullName, "OpGrowth.sln"))) d = d.Parent;
        return d?.FullName ?? throw new InvalidOperationException("repository root not found");
    }
}

public class RunCommandTests
{
    [Fact]
    public void RunCommand_QuickSmallModel_ExitsZeroAndWritesReport()
    {
        using var temp = new TempFolder("opgrowth-run-cli-");
        string dir = temp.Path;
        var o = new StringWriter();
        var e = new StringWriter();
        int code = OpGrowth.Cli.Program.Run(["run", "mixed-field-ising", "--set", "N=8", "--effort", "quick", "--no-lanczos", "--no-diagnosis", "--threads", "2", "--out", dir], o, e);
        Assert.True(code == 0, e.ToString());
        Assert.Contains("scrambling time t*", o.ToString());
        Assert.Contains("verdict: ", o.ToString());
        Assert.Contains("discarded weight: ", o.ToString());
        using (var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(dir, "results.json"))))
        {
            Assert.False(doc.RootElement.GetProperty("diagnosis").GetProperty("ran").GetBoolean());
            Assert.Equal("evolution", doc.RootElement.GetProperty("verdict").GetProperty("source").GetString());
        }
        Assert.False(File.Exists(Path.Combine(dir, "data", "diagnosis.json")));
        Assert.True(File.Exists(Path.Combine(dir, "report.html")));
        Assert.True(File.Exists(Path.Combine(dir, "results.json")));
        Assert.False(File.Exists(Path.Combine(dir, "data", "lanczos.csv")));
    }

    [Fact]
    public void RunCommand_SquareLattice_CrossChecksAMemberShrunkAlongOneDirection()
    {
        // The square model is sized by its width and height (no parameter N): the cross-check now takes the
        // largest member of at most the exact size, shrinking one direction, and compares the engines on it.
        using var temp = new TempFolder("opgrowth-run-cli-");
        string dir = temp.Path;
        var r = ScramblingRun.Execute(new ScramblingRunOptions
        {
            Model = "square-ising", Overrides = new Dictionary<string, string>(), OutputFolder = dir, Effort = RunEffort.Quick, Threads = 2, RunLanczos = false, RunDiagnosis = false, Time = 0.5,
        });
        Assert.True(r.CrossCheck!.Ran, r.CrossCheck.SkipReason);
        Assert.True(r.CrossCheck.N <= 8 && r.CrossCheck.N >= 6, $"member of {r.CrossCheck.N} sites");
        Assert.True(r.CrossCheck.MaxOtocDifference < 1e-6);
    }

    /// <summary>
    /// A periodic drive has no single generator: run computes no Lanczos coefficients for it (the battery's test 2
    /// is not run for drives either) and says why in the notes, so run and diagnose rest on the same evidence.
    /// </summary>
    [Fact]
    public void Execute_Drive_SkipsLanczosWithReason()
    {
        using var temp = new TempFolder("og-drive-");
        string dir = temp.Path;
        var r = ScramblingRun.Execute(new ScramblingRunOptions
        {
            Model = "kicked-ising", Overrides = new Dictionary<string, string> { ["N"] = "6" }, OutputFolder = dir, Effort = RunEffort.Quick, Threads = 2, RunExact = false, RunDiagnosis = false, Time = 3,
        });
        Assert.Null(r.Lanczos);
        Assert.Contains(r.Notes, n => n.Contains("no single generator", StringComparison.Ordinal));
        Assert.DoesNotContain(r.Headlines, h => h.Name == RunReport.LanczosSlope);
    }

    /// <summary>
    /// A model the battery finds free (transverse-field Ising: a line-graph frustration graph, Chapman and Flammia,
    /// Quantum 4, 278 (2020)) gets no scrambling-time headline or statement, but the free-fermion figures: 2N
    /// Majorana modes and a light cone whose weights sum to 1 at every time (R(t) is orthogonal).
    /// </summary>
    [Fact]
    public void Execute_FreeModel_GivesFreeFermionFiguresInsteadOfTStar()
    {
        using var temp = new TempFolder("og-free-");
        string dir = temp.Path;
        var r = ScramblingRun.Execute(new ScramblingRunOptions
        {
            Model = "transverse-field-ising", Overrides = new Dictionary<string, string> { ["N"] = "8" }, OutputFolder = dir, Effort = RunEffort.Quick, Threads = 2, RunExact = false, RunLanczos = false,
        });
        Assert.Equal(OpGrowth.Diagnosis.Mechanism.FreeFermions, r.Diagnosis!.Overall.Leading);
        var ff = Assert.IsType<FreeFermionStage>(r.FreeFermion);
        Assert.Equal(16, ff.Modes);
        Assert.Null(r.ScramblingTime);
        Assert.DoesNotContain(r.Headlines, h => h.Name == EvolutionHeadlines.ScramblingTime);
        for (int i = 0; i < ff.Times.Length; i++)
        {
            double sum = 0;
            for (int b = 0; b < ff.Modes; b++) sum += ff.Weights[b, i];
            Assert.Equal(1.0, sum, 10);
        }
        Assert.True(File.Exists(Path.Combine(dir, "data", "free_fermion_light_cone.csv")));
        Assert.True(File.Exists(Path.Combine(dir, "figures", "free-fermion-light-cone.svg")));
    }

    /// <summary>
    /// A Majorana model (q = 4 SYK on 6 qubits = 12 Majoranas) states sizes in Majoranas: the saturation headline
    /// against N of 2N Majoranas (a random operator's mean Majorana size), the growth rate in Majoranas per unit time.
    /// </summary>
    [Fact]
    public void Execute_MajoranaModel_StatesSizesInMajoranas()
    {
        using var temp = new TempFolder("og-syk-");
        string dir = temp.Path;
        var r = ScramblingRun.Execute(new ScramblingRunOptions
        {
            Model = "syk4", Overrides = new Dictionary<string, string> { ["N"] = "6" }, OutputFolder = dir, Effort = RunEffort.Quick, Threads = 2, RunExact = false, RunLanczos = false, RunDiagnosis = false, Time = 6,
        });
        var sat = Assert.Single(r.Headlines, h => h.Name == EvolutionHeadlines.Saturation);
        Assert.Equal("Majoranas", sat.Value.Unit);
        Assert.Contains("N of 2N Majoranas", sat.Value.Definition, StringComparison.Ordinal);
        // saturation of the Majorana size near N = 6 (random operator: 6 x 4^6 / (4^6 - 1))
        Assert.InRange(sat.Value.Value, 4.5, 7.0);
        Assert.Contains(r.Headlines, h => h.Name.StartsWith("size growth rate", StringComparison.Ordinal) && h.Value.Unit!.Contains("Majoranas", StringComparison.Ordinal));
    }
}

/// <summary>A fresh folder under the system temp folder, deleted with everything in it on dispose.</summary>
internal sealed class TempFolder : IDisposable
{
    public TempFolder(string prefix) => Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), prefix + Guid.NewGuid().ToString("N"));

    public string Path { get; }

    public void Dispose()
    {
        if (Directory.Exists(Path)) Directory.Delete(Path, true);
    }
}
