using System.Diagnostics;
using System.Globalization;
using System.Text;
using System.Text.Json;
using Tomlyn;
using Tomlyn.Model;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Diagnosis;

/// <summary>
/// Runs only when the environment variable OPGROWTH_VALIDATION names its effort or is 1 (every effort): the
/// quickest effort takes about 12 minutes for the whole set on 2 cores, the standard effort about an hour.
/// .ci/run sets OPGROWTH_VALIDATION=quick; the standard run is a documented measurement (docs/diagnosis.md).
/// Otherwise the test reports itself skipped with that reason.
/// </summary>
public sealed class ValidationFactAttribute : FactAttribute
{
    /// <summary>Skips unless OPGROWTH_VALIDATION is 1 or <paramref name="effort"/>.</summary>
    public ValidationFactAttribute(string effort)
    {
        string? v = Environment.GetEnvironmentVariable("OPGROWTH_VALIDATION");
        if (v != "1" && !string.Equals(v, effort, StringComparison.OrdinalIgnoreCase))
            Skip = $"validation set at effort {effort}: set OPGROWTH_VALIDATION={effort} (or 1 for every effort) to run it";
    }
}

/// <summary>
/// The diagnosis battery on models it was not written for: the validation set in tests/validation-models
/// (outside models/), each file with the published source of its expected behaviour (see manifest.toml).
/// Every model is diagnosed by the real command line in its own process (so processor-time budgets are the
/// command's own), at the standard effort (expected verdict and mechanism on at least 90 %, no wrong
/// definite verdict) and at the quickest effort (no wrong definite verdict).
/// </summary>
[Trait("Category", "Validation")]
public class ValidationSetTests(ITestOutputHelper output)
{
    private sealed record Expectation(string File, string Kind, string Class, string Expected, string Mechanism, string Source);

    private sealed record Outcome(Expectation Model, string Got, string Leading, double Seconds)
    {
        public bool Agrees => Got == Model.Expected && (Got == "scrambles" || Leading == Model.Mechanism);

        public bool WrongDefinite => Got is "scrambles" or "fails" && !Agrees;
    }

    private static string Root()
    {
        var dir = new DirectoryInfo(AppContext.BaseDirectory);
        while (dir is not null && !File.Exists(Path.Combine(dir.FullName, "OpGrowth.sln"))) dir = dir.Parent;
        return dir?.FullName ?? throw new InvalidOperationException("repository root not found");
    }

    private static List<Expectation> Manifest()
    {
        string folder = Path.Combine(Root(), "tests", "validation-models");
        var table = TomlSerializer.Deserialize<TomlTable>(File.ReadAllText(Path.Combine(folder, "manifest.toml")))!;
        return ((TomlTableArray)table["model"]).Select(t => new Expectation(
            Path.Combine(folder, (string)t["file"]), (string)t["kind"], (string)t["class"], (string)t["expected"], (string)t["mechanism"], (string)t["source"])).ToList();
    }

    private static Outcome Diagnose(Expectation m, string effort)
    {
        string cli = Path.Combine(AppContext.BaseDirectory, "opgrowth.dll");
        var psi = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true };
        foreach (var a in new[] { cli, "diagnose", m.File, "--effort", effort, "--threads", "2", "--json" }) psi.ArgumentList.Add(a);
        var sw = Stopwatch.StartNew();
        using var p = Process.Start(psi)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEndAsync();
        p.WaitForExit();
        if (p.ExitCode != 0) return new Outcome(m, $"exit {p.ExitCode}: {stderr.Result.Split('\n').LastOrDefault(l => l.Length > 0)}", "-", sw.Elapsed.TotalSeconds);
        using var doc = JsonDocument.Parse(stdout.Result);
        var overall = doc.RootElement.GetProperty("overall");
        return new Outcome(m, overall.GetProperty("outcome").GetString()!, overall.GetProperty("leading").GetString()!, sw.Elapsed.TotalSeconds);
    }

    private List<Outcome> RunAll(string effort)
    {
        var results = new List<Outcome>();
        var table = new StringBuilder($"| model | kind | expected | got ({effort}) | time |\n|---|---|---|---|---|\n");
        foreach (var m in Manifest())
        {
            var r = Diagnose(m, effort);
            results.Add(r);
            string name = Path.GetFileNameWithoutExtension(m.File);
            string got = r.Got == "scrambles" ? "scrambles" : $"{r.Got} ({r.Leading})";
            string expected = m.Expected == "scrambles" ? "scrambles" : $"fails ({m.Mechanism})";
            table.Append(CultureInfo.InvariantCulture, $"| {name} | {m.Kind} | {expected} | {got}{(r.Agrees ? string.Empty : r.WrongDefinite ? " **wrong**" : string.Empty)} | {r.Seconds:0} s |\n");
            output.WriteLine($"{name}: expected {expected}, got {got} in {r.Seconds:0} s");
        }
        output.WriteLine(table.ToString());
        return results;
    }

    [ValidationFact("standard")]
    public void StandardEffort_ExpectedVerdictOnAtLeast90Percent_NoWrongDefinite()
    {
        var r = RunAll("standard");
        int agree = r.Count(x => x.Agrees);
        Assert.True(r.Count >= 24, $"the validation set has {r.Count} models; at least 24 expected");
        Assert.Empty(r.Where(x => x.WrongDefinite).Select(x => $"{Path.GetFileNameWithoutExtension(x.Model.File)}: {x.Got} ({x.Leading})"));
        Assert.True(agree >= 0.9 * r.Count, $"{agree} of {r.Count} agree with the expected verdict and mechanism (at least 90 % required)");
    }

    [ValidationFact("quick")]
    public void QuickEffort_NoWrongDefiniteVerdict()
    {
        var r = RunAll("quick");
        Assert.Empty(r.Where(x => x.WrongDefinite).Select(x => $"{Path.GetFileNameWithoutExtension(x.Model.File)}: {x.Got} ({x.Leading})"));
    }

    [Fact]
    public void Manifest_EveryModelLoadsAndNamesItsSource()
    {
        var all = Manifest();
        Assert.True(all.Count >= 24);
        foreach (var m in all)
        {
            Assert.False(string.IsNullOrWhiteSpace(m.Source), m.File);
            var model = OpGrowth.Models.ModelLoader.Load(m.File);
            Assert.Contains("Source", File.ReadAllText(m.File), StringComparison.OrdinalIgnoreCase);
            Assert.NotNull(model);
        }
        // the kinds of issue 20: at least two models of each kind, chaotic and non-scrambling ones among them
        foreach (string kind in new[] { "2d", "graph", "majorana", "long-range", "drive" })
        {
            var k = all.Where(m => m.Kind == kind).ToList();
            Assert.True(k.Count >= 2, $"{kind}: {k.Count} models");
            Assert.Contains(k, m => m.Class == "chaotic");
            Assert.Contains(k, m => m.Class != "chaotic");
        }
        // issue 14: at least 10 chaotic, 4 free, 4 integrable, 2 localized, 2 commuting
        Assert.True(all.Count(m => m.Class == "chaotic") >= 10);
        Assert.True(all.Count(m => m.Class == "free") >= 4);
        Assert.True(all.Count(m => m.Class == "integrable") >= 4);
        Assert.True(all.Count(m => m.Class == "localized") >= 2);
        Assert.True(all.Count(m => m.Class == "commuting") >= 2);
    }
}
