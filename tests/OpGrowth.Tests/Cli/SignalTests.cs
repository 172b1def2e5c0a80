using System.Text.Json;
using OpGrowth.Cli;
using OpGrowth.Tests.Sweeps;

namespace OpGrowth.Tests.Cli;

/// <summary>
/// SIGTERM (what Slurm sends at a time limit) behaves like Ctrl-C: the run stops between two passes, writes its
/// results so far and a checkpoint, says so on one line and exits with 143; --resume then finishes the run.
/// The CLI runs as a separate process, so the signal is real.
/// </summary>
public class SignalTests
{
    [Fact]
    public async Task Evolve_SigTerm_WritesCheckpointAndResults_Exits143_ThenResumes()
    {
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-sigterm-" + Guid.NewGuid().ToString("N"));
        string[] args = ["evolve", "mixed-field-ising", "--set", "N=16", "--max-strings", "20000", "--time", "20", "--threads", "2", "--checkpoint-minutes", "60", "--out", dir];
        try
        {
            int code;
            string stderr;
            using (var p = SweepTestKit.StartCli(args))
            {
                var err = new System.Text.StringBuilder();
                var started = new ManualResetEventSlim();
                p.ErrorDataReceived += (_, e) =>
                {
                    if (e.Data is null) return;
                    lock (err) err.AppendLine(e.Data);
                    if (e.Data.Contains("budget 1/1:", StringComparison.Ordinal)) started.Set();
                };
                p.BeginErrorReadLine();
                var stdout = p.StandardOutput.ReadToEndAsync();
                Assert.True(started.Wait(TimeSpan.FromMinutes(2)), "the evolution did not start");
                Thread.Sleep(1500);
                Assert.False(p.HasExited, "the run ended before the signal; make it longer");
                code = SweepTestKit.SigTerm(p);
                await stdout.WaitAsync(TimeSpan.FromSeconds(30));
                lock (err) stderr = err.ToString();
            }
            Assert.Equal(ExitCodes.Terminated, code);
            var lines = stderr.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
            Assert.StartsWith("interrupted (SIGTERM)", lines[^1]);
            Assert.DoesNotContain("   at ", stderr);
            Assert.True(File.Exists(Path.Combine(dir, "checkpoints", "checkpoint-budget0.bin")), "no checkpoint");
            using (var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(dir, "evolve.json"))))
            {
                Assert.False(doc.RootElement.GetProperty("completed").GetBoolean());
                Assert.Equal("interrupted", doc.RootElement.GetProperty("stopReason").GetString());
            }
            Assert.True(File.ReadAllLines(Path.Combine(dir, "evolution.csv")).Length > 1, "no records kept");

            var resumed = SweepTestKit.RunCli(TimeSpan.FromMinutes(5), [.. args, "--resume"]);
            Assert.True(resumed.Code == 0, resumed.Stderr);
            Assert.Contains("resumed from", resumed.Stderr);
            using (var doc = JsonDocument.Parse(File.ReadAllBytes(Path.Combine(dir, "evolve.json"))))
                Assert.True(doc.RootElement.GetProperty("completed").GetBoolean());
            Assert.False(Directory.Exists(Path.Combine(dir, "checkpoints")), "checkpoints are removed after a completed run");
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }
}
