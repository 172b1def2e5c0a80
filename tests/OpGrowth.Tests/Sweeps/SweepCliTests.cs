using System.Diagnostics;
using OpGrowth.Sweeps;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Sweeps;

/// <summary>
/// The sweep and collect commands, run as child processes with the synthetic engine. A sweep killed with
/// SIGKILL loses only its points in flight: rerunning finishes the rest and the merged table is
/// byte-identical to the table of an uninterrupted sweep.
/// </summary>
public class SweepCliTests(ITestOutputHelper output)
{
    [Fact]
    public void Sweep_KilledMidway_RerunGivesIdenticalTable()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16, 20, 24, 28]", seeds: "[1, 2, 3]", delay: 0.25));
        string killed = kit.Path("killed"), clean = kit.Path("clean");
        int total = 18;

        using (var p = SweepTestKit.StartCli("sweep", plan, "--out", killed, "--jobs", "2"))
        {
            p.StandardOutput.ReadToEndAsync();
            p.StandardError.ReadToEndAsync();
            var sw = Stopwatch.StartNew();
            string points = Path.Combine(killed, "points");
            while (sw.Elapsed < TimeSpan.FromSeconds(60) && (!Directory.Exists(points) || Directory.GetFiles(points, "*.json").Length < 5)) Thread.Sleep(20);
            Assert.Equal(137, SweepTestKit.SigKill(p));   // 128 + SIGKILL: killed, not finished
        }
        int done = Directory.GetFiles(Path.Combine(killed, "points"), "*.json").Length;
        output.WriteLine($"killed after {done} of {total} points");
        Assert.InRange(done, 5, total - 1);
        // The kill may leave a temporary file of a write in flight; every finished file is complete and sound.
        var store = new PointStore(killed);
        foreach (string f in Directory.GetFiles(store.PointsDirectory, "*.json"))
        {
            Assert.NotNull(store.TryRead(f, out string? problem));
            Assert.Null(problem);
        }

        var rerun = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--out", killed, "--jobs", "2");
        Assert.True(rerun.Code == 0, rerun.Stderr);
        Assert.Contains($"{done} already done, {total - done} to run", rerun.Stderr, StringComparison.Ordinal);

        var fresh = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--out", clean, "--jobs", "2");
        Assert.True(fresh.Code == 0, fresh.Stderr);
        foreach (string f in new[] { "table.csv", "table.json", "averages.csv", "fits.json", "series.csv" })
        {
            Assert.Equal(File.ReadAllText(Path.Combine(clean, f)), File.ReadAllText(Path.Combine(killed, f)));
        }
        Assert.Equal(total + 1, File.ReadAllLines(Path.Combine(killed, "table.csv")).Length);
        output.WriteLine(rerun.Stdout);
    }

    /// <summary>
    /// A drive with the automatic engine: the dry run says "exact" for the small sizes, and the run then uses
    /// the exact engine on the drive (period by period) instead of refusing it. The exact engine's mean size
    /// of Z_0 under the kicked Ising drive equals the untruncated Pauli engine's (both exact to rounding), so
    /// their t* agree to the grid (the same times: whole periods).
    /// </summary>
    [Fact]
    public void Sweep_DriveWithAutomaticEngine_RunsTheEngineTheDryRunNamed()
    {
        using var kit = new SweepTestKit();
        string model = Path.GetFullPath(OpGrowth.Models.ShippedModels.Resolve("kicked-ising"));
        string Plan(string engine) => $$"""
            name = "kicked-{{engine}}"
            description = "kicked Ising drive"
            [model]
            file = "{{model}}"
            sizes = [6]
            probes = ["Z_0"]
            [engine]
            engine = "{{engine}}"
            exact_max_n = 8
            time = 6
            dt = 1
            record_every = 1
            max_strings = 1000000
            budgets = 1
            """;
        string auto = kit.WritePlan(Plan("auto"));
        var dry = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", auto, "--out", kit.Path("dry"), "--dry-run");
        Assert.True(dry.Code == 0, dry.Stderr);
        Assert.Contains("exact", dry.Stdout, StringComparison.Ordinal);
        var run = SweepTestKit.RunCli(TimeSpan.FromMinutes(3), "sweep", auto, "--out", kit.Path("auto"));
        Assert.True(run.Code == 0, run.Stderr);
        var pauliPlan = kit.WritePlan(Plan("pauli"));
        var pauli = SweepTestKit.RunCli(TimeSpan.FromMinutes(3), "sweep", pauliPlan, "--out", kit.Path("pauli"));
        Assert.True(pauli.Code == 0, pauli.Stderr);
        var a = new PointStore(kit.Path("auto")).LoadAll().Points.Single().Result;
        var b = new PointStore(kit.Path("pauli")).LoadAll().Points.Single().Result;
        Assert.NotNull(a.TStar);
        Assert.Equal(b.TStar!.Value, a.TStar!.Value, 6);
    }

#if OPGROWTH_EXACT
    /// <summary>
    /// The same kill-and-rerun with real physics: the exact engine (dense traces) on a small disordered Ising
    /// chain, N = 5..7, two seeds. The sweep is ended by SIGKILL once at least one point file exists and before
    /// the last one; the rerun computes only the missing points, and every merged output (table, averages, fits,
    /// series) is byte-identical to that of an uninterrupted sweep in another folder. Reference: an
    /// uninterrupted run of the same plan (dense traces are deterministic, so identity is exact).
    /// </summary>
    [Fact]
    public void Sweep_ExactEngineKilledBySigkill_RerunGivesIdenticalMergedTable()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan("""
            name = "resume-exact"
            [model]
            file = "model.toml"
            sizes = [5, 6, 7]
            seeds = [1, 2]
            probes = ["Z_0"]
            [engine]
            engine = "exact"
            time = 3
            dt = 0.05
            record_every = 2
            """);
        string killed = kit.Path("killed"), clean = kit.Path("clean");
        const int total = 6;
        var clock = Stopwatch.StartNew();
        int done;
        using (var p = SweepTestKit.StartCli("sweep", plan, "--out", killed, "--jobs", "1", "--no-figures"))
        {
            p.StandardOutput.ReadToEndAsync();
            p.StandardError.ReadToEndAsync();
            string points = Path.Combine(killed, "points");
            while (clock.Elapsed < TimeSpan.FromSeconds(60) && !p.HasExited && (!Directory.Exists(points) || Directory.GetFiles(points, "*.json").Length < 1)) Thread.Sleep(5);
            Assert.False(p.HasExited, "the sweep finished before it could be killed");
            Assert.Equal(137, SweepTestKit.SigKill(p));
            done = Directory.GetFiles(points, "*.json").Length;
        }
        output.WriteLine($"SIGKILL after {done} of {total} points ({clock.Elapsed.TotalSeconds:0.0} s)");
        Assert.InRange(done, 1, total - 1);
        Assert.False(File.Exists(Path.Combine(killed, "table.csv")));

        var rerun = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--out", killed, "--jobs", "1", "--no-figures");
        Assert.True(rerun.Code == 0, rerun.Stderr);
        Assert.Contains($"{done} already done, {total - done} to run", rerun.Stderr, StringComparison.Ordinal);
        var fresh = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--out", clean, "--jobs", "1", "--no-figures");
        Assert.True(fresh.Code == 0, fresh.Stderr);
        foreach (string f in new[] { "table.csv", "table.json", "averages.csv", "fits.json", "series.csv" })
        {
            Assert.Equal(File.ReadAllText(Path.Combine(clean, f)), File.ReadAllText(Path.Combine(killed, f)));
        }
        var rows = File.ReadAllLines(Path.Combine(killed, "table.csv"));
        Assert.Equal(total + 1, rows.Length);
        Assert.All(rows.Skip(1), r => Assert.Contains(",exact,", r, StringComparison.Ordinal));
        output.WriteLine(rerun.Stdout);
        output.WriteLine($"total {clock.Elapsed.TotalSeconds:0.0} s");
    }
#endif

    /// <summary>
    /// Damage found by the sweep itself (no collect in between): one point file truncated mid-write and one
    /// whose t* was edited (valid JSON, checksum no longer matches). The rerun reports both, moves them to
    /// corrupt/, recomputes exactly those two, and the merged table equals an undamaged sweep's, so the edited
    /// value was never merged.
    /// </summary>
    [Fact]
    public void Sweep_RerunOverTruncatedAndTamperedFiles_ReportsRecomputesNeverMerges()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16]", seeds: "[1, 2]"));
        string dir = kit.Path("out"), clean = kit.Path("clean");
        var first = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", dir);
        Assert.True(first.Code == 0, first.Stderr);
        string reference = File.ReadAllText(Path.Combine(dir, "table.csv"));
        var files = Directory.GetFiles(Path.Combine(dir, "points"), "*.json").Order(StringComparer.Ordinal).ToArray();
        string truncated = files[0], tampered = files[1];
        File.WriteAllText(truncated, File.ReadAllText(truncated)[..(File.ReadAllText(truncated).Length / 2)]);
        string text = File.ReadAllText(tampered);
        int i = text.IndexOf("\"tStar\": ", StringComparison.Ordinal) + 9;
        File.WriteAllText(tampered, text[..i] + "9" + text[i..]);   // t* gains a leading 9: still valid JSON
        File.Delete(Path.Combine(dir, "table.csv"));

        var again = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", dir);
        Assert.True(again.Code == 0, again.Stderr);
        output.WriteLine(again.Stderr);
        Assert.Contains($"corrupt point file {truncated}: is not valid JSON (truncated or damaged", again.Stderr, StringComparison.Ordinal);
        Assert.Contains($"corrupt point file {tampered}: fails its checksum", again.Stderr, StringComparison.Ordinal);
        Assert.Contains("4 already done, 2 to run", again.Stderr, StringComparison.Ordinal);
        Assert.Contains("2 computed, 4 skipped, 0 failed, 2 corrupt files replaced", again.Stderr, StringComparison.Ordinal);
        Assert.Equal(2, Directory.GetFiles(Path.Combine(dir, "corrupt")).Length);
        Assert.Equal(reference, File.ReadAllText(Path.Combine(dir, "table.csv")));
        var fresh = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", clean);
        Assert.True(fresh.Code == 0, fresh.Stderr);
        Assert.Equal(File.ReadAllText(Path.Combine(clean, "table.csv")), File.ReadAllText(Path.Combine(dir, "table.csv")));
        Assert.Equal(File.ReadAllText(Path.Combine(clean, "fits.json")), File.ReadAllText(Path.Combine(dir, "fits.json")));
    }

    [Fact]
    public void Collect_Cli_ReportsCorruptFileAndExcludesIt()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16]", seeds: "[1]"));
        string dir = kit.Path("out");
        var first = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", dir);
        Assert.True(first.Code == 0, first.Stderr);
        string victim = Directory.GetFiles(Path.Combine(dir, "points"))[0];
        File.WriteAllText(victim, File.ReadAllText(victim)[..100]);
        var c = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "collect", dir);
        Assert.Equal(0, c.Code);
        Assert.Contains("corrupt point file", c.Stderr, StringComparison.Ordinal);
        Assert.Contains("1 missing", c.Stdout, StringComparison.Ordinal);
        Assert.Equal(3, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);   // header + 2 sound points
        var again = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", dir);
        Assert.Equal(0, again.Code);
        Assert.Equal(4, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);
        output.WriteLine(c.Stderr);
    }

    [Fact]
    public void Sweep_BadPlan_ExitCode2OneLine()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan("[model]\nfile = \"model.toml\"\nsizes = [8]\nsizez = 3\n");
        var r = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--out", kit.Path("out"));
        Assert.Equal(2, r.Code);
        Assert.Equal($"error: {plan}:4: found unknown key 'sizez' in [model] (did you mean 'sizes'?); expected one of file, files, sizes, seeds, seed_parameter, probes", r.Stderr.Trim());
    }

    [Fact]
    public void Sweep_CommandLineRanges_WithoutPlanFile_RunAndDryRun()
    {
        using var kit = new SweepTestKit();
        string dir = kit.Path("cli");
        var dry = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8:16:4", "--seeds", "1,2",
            "--grid", "h=0.3,0.6", "--probe", "Z_{N-1}", "--engine", "synthetic", "--out", dir, "--dry-run");
        Assert.True(dry.Code == 0, dry.Stderr);
        var lines = dry.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(1 + 3 * 2 * 2, lines.Length);
        Assert.Contains("model N=16 h=0.6 seed=2 Z_15 synthetic", dry.Stdout, StringComparison.Ordinal);
        Assert.All(lines.Skip(1), l => Assert.Contains(" todo ", l, StringComparison.Ordinal));
        var run = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8:16:4", "--seeds", "1,2",
            "--grid", "h=0.3,0.6", "--probe", "Z_{N-1}", "--engine", "synthetic", "--out", dir);
        Assert.True(run.Code == 0, run.Stderr);
        Assert.Equal(13, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);
        // Two series (h = 0.3 and 0.6), each fitted over three sizes.
        Assert.Equal(2, CountOccurrences(run.Stdout, "the data prefer"));
        // The resolved plan in the results folder expands to the same points (array tasks use it).
        var saved = SweepPlanReader.Load(Path.Combine(dir, "plan.toml"));
        var manifest = SweepManifest.Load(Path.Combine(dir, "sweep.json"))!;
        Assert.Equal(manifest.Points.Select(p => p.Id), saved.Expand().Select(p => p.Id));
        var task = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", Path.Combine(dir, "plan.toml"), "--out", dir, "--task-index", "99");
        Assert.Equal(2, task.Code);
        Assert.Contains("expected 0..11", task.Stderr, StringComparison.Ordinal);
    }

#if !OPGROWTH_EVOLUTION
    [Fact]
    public void Sweep_EngineNotInThisBuild_IsInputErrorBeforeRunning()
    {
        using var kit = new SweepTestKit();
        var r = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8", "--engine", "pauli", "--out", kit.Path("x"));
        Assert.Equal(2, r.Code);
        Assert.Contains("needs the Pauli engine, which this build does not include", r.Stderr, StringComparison.Ordinal);
    }
#endif

    private static int CountOccurrences(string s, string what)
    {
        int n = 0;
        for (int i = s.IndexOf(what, StringComparison.Ordinal); i >= 0; i = s.IndexOf(what, i + 1, StringComparison.Ordinal)) n++;
        return n;
    }
}
