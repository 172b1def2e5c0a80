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

        using (var p = SweepTestKit.StartCli("sweep", plan, "--results", killed, "--jobs", "2"))
        {
            p.StandardOutput.ReadToEndAsync();
            p.StandardError.ReadToEndAsync();
            var sw = Stopwatch.StartNew();
            string points = Path.Combine(killed, "points");
            while (sw.Elapsed < TimeSpan.FromSeconds(60) && (!Directory.Exists(points) || Directory.GetFiles(points, "*.json").Length < 5)) Thread.Sleep(20);
            p.Kill(entireProcessTree: false);   // SIGKILL on Linux
            p.WaitForExit();
            Assert.NotEqual(0, p.ExitCode);
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

        var rerun = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--results", killed, "--jobs", "2");
        Assert.True(rerun.Code == 0, rerun.Stderr);
        Assert.Contains($"{done} already done, {total - done} to run", rerun.Stderr, StringComparison.Ordinal);

        var fresh = SweepTestKit.RunCli(TimeSpan.FromMinutes(2), "sweep", plan, "--results", clean, "--jobs", "2");
        Assert.True(fresh.Code == 0, fresh.Stderr);
        foreach (string f in new[] { "table.csv", "table.json", "averages.csv", "fits.json", "series.csv" })
        {
            Assert.Equal(File.ReadAllText(Path.Combine(clean, f)), File.ReadAllText(Path.Combine(killed, f)));
        }
        Assert.Equal(total + 1, File.ReadAllLines(Path.Combine(killed, "table.csv")).Length);
        output.WriteLine(rerun.Stdout);
    }

    [Fact]
    public void Collect_Cli_ReportsCorruptFileAndExcludesIt()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16]", seeds: "[1]"));
        string dir = kit.Path("out");
        var first = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--results", dir);
        Assert.True(first.Code == 0, first.Stderr);
        string victim = Directory.GetFiles(Path.Combine(dir, "points"))[0];
        File.WriteAllText(victim, File.ReadAllText(victim)[..100]);
        var c = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "collect", dir);
        Assert.Equal(0, c.Code);
        Assert.Contains("corrupt point file", c.Stderr, StringComparison.Ordinal);
        Assert.Contains("1 missing", c.Stdout, StringComparison.Ordinal);
        Assert.Equal(3, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);   // header + 2 sound points
        var again = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--results", dir);
        Assert.Equal(0, again.Code);
        Assert.Equal(4, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);
        output.WriteLine(c.Stderr);
    }

    [Fact]
    public void Sweep_BadPlan_ExitCode2OneLine()
    {
        using var kit = new SweepTestKit();
        string plan = kit.WritePlan("[model]\nfile = \"model.toml\"\nsizes = [8]\nsizez = 3\n");
        var r = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", plan, "--results", kit.Path("out"));
        Assert.Equal(2, r.Code);
        Assert.Equal($"error: {plan}:4: found unknown key 'sizez' in [model] (did you mean 'sizes'?); expected one of file, files, sizes, seeds, seed_parameter, probes", r.Stderr.Trim());
    }

    [Fact]
    public void Sweep_CommandLineRanges_WithoutPlanFile_RunAndDryRun()
    {
        using var kit = new SweepTestKit();
        string dir = kit.Path("cli");
        var dry = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8:16:4", "--seeds", "1,2",
            "--grid", "h=0.3,0.6", "--probe", "Z_{N-1}", "--engine", "synthetic", "--results", dir, "--dry-run");
        Assert.True(dry.Code == 0, dry.Stderr);
        var lines = dry.Stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.Equal(1 + 3 * 2 * 2, lines.Length);
        Assert.Contains("model N=16 h=0.6 seed=2 Z_15 synthetic", dry.Stdout, StringComparison.Ordinal);
        Assert.All(lines.Skip(1), l => Assert.Contains(" todo ", l, StringComparison.Ordinal));
        var run = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8:16:4", "--seeds", "1,2",
            "--grid", "h=0.3,0.6", "--probe", "Z_{N-1}", "--engine", "synthetic", "--results", dir);
        Assert.True(run.Code == 0, run.Stderr);
        Assert.Equal(13, File.ReadAllLines(Path.Combine(dir, "table.csv")).Length);
        // Two series (h = 0.3 and 0.6), each fitted over three sizes.
        Assert.Equal(2, CountOccurrences(run.Stdout, "the data prefer"));
        // The resolved plan in the results folder expands to the same points (array tasks use it).
        var saved = SweepPlanReader.Load(Path.Combine(dir, "plan.toml"));
        var manifest = SweepManifest.Load(Path.Combine(dir, "sweep.json"))!;
        Assert.Equal(manifest.Points.Select(p => p.Id), saved.Expand().Select(p => p.Id));
        var task = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", Path.Combine(dir, "plan.toml"), "--results", dir, "--task-index", "99");
        Assert.Equal(2, task.Code);
        Assert.Contains("expected 0..11", task.Stderr, StringComparison.Ordinal);
    }

#if !OPGROWTH_EVOLUTION
    [Fact]
    public void Sweep_EngineNotInThisBuild_IsInputErrorBeforeRunning()
    {
        using var kit = new SweepTestKit();
        var r = SweepTestKit.RunCli(TimeSpan.FromMinutes(1), "sweep", "--model", kit.ModelFile, "--sizes", "8", "--engine", "pauli", "--results", kit.Path("x"));
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
