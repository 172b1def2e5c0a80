using System.Globalization;
using OpGrowth.Sweeps;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Sweeps;

/// <summary>
/// Slurm job arrays: the script's form (always), and a real four-task array on a running cluster
/// (skipped when none is running; see <see cref="SlurmFactAttribute"/>).
/// </summary>
public class SlurmArrayTests(ITestOutputHelper output)
{
    [Fact]
    public void Script_HasOneTaskPerPointAndTheTaskIndexCommand()
    {
        string s = SlurmArray.Script("/shared/run 1/plan.toml", "/shared/run 1", 12, ["/usr/bin/dotnet", "/opt/og/opgrowth.dll"],
            new SlurmOptions { JobName = "og test", CpusPerTask = 2, MemoryPerTaskBytes = 3L << 30, TimeLimit = "01:00:00", MaxConcurrent = 4, ExtraDirectives = ["--account=phys"] });
        Assert.StartsWith("#!/bin/bash\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --array=0-11%4\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --job-name=og_test\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --cpus-per-task=2\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --mem=3072M\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --time=01:00:00\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --account=phys\n", s, StringComparison.Ordinal);
        Assert.Contains("#SBATCH --output=/shared/run 1/slurm/%x-%A_%a.out\n", s, StringComparison.Ordinal);
        Assert.Contains("exec /usr/bin/dotnet /opt/og/opgrowth.dll sweep '/shared/run 1/plan.toml' --out '/shared/run 1' --task-index \"$SLURM_ARRAY_TASK_ID\" --threads 2\n", s, StringComparison.Ordinal);
    }

    [Fact]
    public void ShellQuote_QuotesSpacesAndQuotes()
    {
        Assert.Equal("/a/b.c", SlurmArray.ShellQuote("/a/b.c"));
        Assert.Equal("'a b'", SlurmArray.ShellQuote("a b"));
        Assert.Equal("'it'\\''s'", SlurmArray.ShellQuote("it's"));
    }

    [SlurmFact]
    [Trait("Category", "Slurm")]
    public void Sweep_AsSlurmArray_SubmitsWaitsCollects()
    {
        using var kit = new SweepTestKit();
        // Four points, no seeds: t* = a + b N exactly (a = 0.5, b = 0.25), so the table is known in advance.
        string plan = kit.WritePlan(SweepTestKit.SyntheticPlan(sizes: "[8, 12, 16, 20]", seeds: "[0]", noise: 0).Replace("seeds = [0]\n", "", StringComparison.Ordinal));
        string dir = kit.Path("results");
        string script = kit.Path("sweep.sbatch");
        var r = SweepTestKit.RunCli(TimeSpan.FromMinutes(4), "sweep", plan, "--out", dir, "--slurm-script", script, "--submit", "--wait", "--wait-minutes", "3");
        output.WriteLine(r.Stderr);
        output.WriteLine(r.Stdout);
        string job = r.Stdout.Split('\n')[0].Trim();
        try
        {
            Assert.True(r.Code == 0, $"exit {r.Code}: {r.Stderr}");
            Assert.Contains("#SBATCH --array=0-3\n", File.ReadAllText(script), StringComparison.Ordinal);
            Assert.Equal(4, Directory.GetFiles(Path.Combine(dir, "points"), "*.json").Length);
            Assert.Equal(4, Directory.GetFiles(Path.Combine(dir, "slurm"), "*.out").Length);
            var lines = File.ReadAllLines(Path.Combine(dir, "table.csv"));
            Assert.Equal(5, lines.Length);
            var header = lines[0].Split(',');
            int iN = Array.IndexOf(header, "N"), iT = Array.IndexOf(header, "t_star"), iE = Array.IndexOf(header, "engine");
            var rows = lines.Skip(1).Select(l => l.Split(',')).ToList();
            Assert.Equal(["8", "12", "16", "20"], rows.Select(c => c[iN]));
            foreach (var c in rows)
            {
                Assert.Equal("synthetic", c[iE]);
                Assert.Equal(0.5 + 0.25 * int.Parse(c[iN], CultureInfo.InvariantCulture), double.Parse(c[iT], CultureInfo.InvariantCulture), 12);
            }
            Assert.Contains("the data prefer t* = a + N/v", r.Stdout, StringComparison.Ordinal);
        }
        finally
        {
            if (job.Length > 0 && job.All(char.IsAsciiDigit) && SlurmArray.FindOnPath("scancel") is string scancel)
            {
                SlurmArray.RunProcess(scancel, [job], TimeSpan.FromSeconds(30));
            }
        }
    }
}
