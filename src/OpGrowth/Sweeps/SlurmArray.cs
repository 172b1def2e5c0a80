using System.Diagnostics;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// Runs a sweep as a Slurm job array: one array task per point, each task running the same command
/// with <c>--task-index $SLURM_ARRAY_TASK_ID</c>; results land in the shared results folder exactly as in
/// a local sweep, so collecting is the same. Writes the batch script, submits it with <c>sbatch</c> and
/// can wait for the array to leave the queue (<c>squeue</c>).
/// </summary>
public static class SlurmArray
{
    /// <summary>The batch script for an array over <paramref name="pointCount"/> points.</summary>
    /// <param name="planPath">Plan file the tasks read (absolute; usually the results folder's plan.toml).</param>
    /// <param name="resultsDirectory">Shared results folder (absolute).</param>
    /// <param name="pointCount">Number of points (array indices 0..count-1).</param>
    /// <param name="command">The program to run, e.g. ["/usr/bin/dotnet", "/opt/opgrowth/opgrowth.dll"] or ["/usr/local/bin/opgrowth"].</param>
    /// <param name="options">Resources per task.</param>
    public static string Script(string planPath, string resultsDirectory, int pointCount, IReadOnlyList<string> command, SlurmOptions options)
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(pointCount, 1);
        ArgumentNullException.ThrowIfNull(command);
        ArgumentNullException.ThrowIfNull(options);
        if (command.Count == 0) throw new ArgumentException("The command is empty.", nameof(command));
        var ci = CultureInfo.InvariantCulture;
        string logs = Path.Combine(resultsDirectory, "slurm");
        var sb = new StringBuilder();
        sb.Append("#!/bin/bash\n");
        sb.Append("# Written by opgrowth: a Slurm job array with one task per sweep point.\n");
        sb.Append("# Each task runs one point of the plan (its array index) and writes <results>/points/<id>.json;\n");
        sb.Append("# finished points are skipped on resubmission. Merge with: opgrowth collect ").Append(ShellQuote(resultsDirectory)).Append('\n');
        sb.Append("#SBATCH --job-name=").Append(SafeName(options.JobName)).Append('\n');
        sb.Append("#SBATCH --array=0-").Append((pointCount - 1).ToString(ci));
        if (options.MaxConcurrent is int mc) sb.Append('%').Append(mc.ToString(ci));
        sb.Append('\n');
        sb.Append("#SBATCH --ntasks=1\n");
        sb.Append("#SBATCH --cpus-per-task=").Append(options.CpusPerTask.ToString(ci)).Append('\n');
        if (options.MemoryPerTaskBytes is long mem) sb.Append("#SBATCH --mem=").Append(Math.Max(1, (mem + (1 << 20) - 1) >> 20).ToString(ci)).Append("M\n");
        if (options.TimeLimit is string tl) sb.Append("#SBATCH --time=").Append(tl).Append('\n');
        if (options.Partition is string part) sb.Append("#SBATCH --partition=").Append(part).Append('\n');
        sb.Append("#SBATCH --output=").Append(logs).Append("/%x-%A_%a.out\n");
        foreach (string extra in options.ExtraDirectives) sb.Append("#SBATCH ").Append(extra).Append('\n');
        sb.Append("set -euo pipefail\n");
        sb.Append("export DOTNET_CLI_TELEMETRY_OPTOUT=1 DOTNET_NOLOGO=1\n");
        sb.Append("exec");
        foreach (string c in command) sb.Append(' ').Append(ShellQuote(c));
        sb.Append(" sweep ").Append(ShellQuote(planPath));
        sb.Append(" --out ").Append(ShellQuote(resultsDirectory));
        sb.Append(" --task-index \"$SLURM_ARRAY_TASK_ID\"");
        sb.Append(" --threads ").Append(options.CpusPerTask.ToString(ci));
        sb.Append('\n');
        return sb.ToString();
    }

    /// <summary>Writes the script (executable) and creates the log folder Slurm needs before submission.</summary>
    public static void WriteScript(string scriptPath, string text, string resultsDirectory)
    {
        Directory.CreateDirectory(Path.Combine(resultsDirectory, "slurm"));
        AtomicFile.WriteAllText(scriptPath, text);
        if (!OperatingSystem.IsWindows())
        {
            File.SetUnixFileMode(scriptPath, UnixFileMode.UserRead | UnixFileMode.UserWrite | UnixFileMode.UserExecute
                | UnixFileMode.GroupRead | UnixFileMode.GroupExecute | UnixFileMode.OtherRead | UnixFileMode.OtherExecute);
        }
    }

    /// <summary>True when the <c>sbatch</c> program is on the PATH.</summary>
    public static bool IsAvailable() => FindOnPath("sbatch") is not null;

    /// <summary>Submits a script with <c>sbatch --parsable</c>; returns the job id.</summary>
    public static string Submit(string scriptPath, ILogger? logger = null)
    {
        string sbatch = FindOnPath("sbatch") ?? throw new InputException("found no 'sbatch' on the PATH; expected a machine with Slurm to submit to (or write the script only, without --submit)");
        var (code, stdout, stderr) = RunProcess(sbatch, ["--parsable", scriptPath], TimeSpan.FromMinutes(2));
        if (code != 0) throw new InputException($"sbatch refused the job array (exit {code}): {OneLine(stderr)}; expected a reachable Slurm controller and valid resources");
        string id = stdout.Trim().Split(';')[0].Trim();
        if (id.Length == 0 || !id.All(char.IsAsciiDigit)) throw new InputException($"sbatch printed '{OneLine(stdout)}'; expected a job id");
        logger?.LogInformation("submitted job array {JobId} ({Script})", id, scriptPath);
        return id;
    }

    /// <summary>
    /// Waits until no task of the job is pending or running any more (the job has left <c>squeue</c>).
    /// Returns false on timeout.
    /// </summary>
    public static bool Wait(string jobId, TimeSpan timeout, TimeSpan poll, ILogger? logger, CancellationToken cancellationToken)
    {
        string squeue = FindOnPath("squeue") ?? throw new InputException("found no 'squeue' on the PATH; expected Slurm's client programs to wait for the job");
        var clock = Stopwatch.StartNew();
        string last = "";
        DateTime lastLog = DateTime.MinValue;
        while (true)
        {
            cancellationToken.ThrowIfCancellationRequested();
            var (code, stdout, stderr) = RunProcess(squeue, ["-h", "-j", jobId, "-o", "%T"], TimeSpan.FromMinutes(1));
            if (code != 0)
            {
                // A job that left the controller's memory is reported as an invalid id: it has finished.
                if (stderr.Contains("Invalid job id", StringComparison.OrdinalIgnoreCase)) return true;
                logger?.LogWarning("squeue failed (exit {Code}): {Error}", code, OneLine(stderr));
            }
            else
            {
                var states = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries);
                var active = states.Where(s => s is "PENDING" or "RUNNING" or "CONFIGURING" or "COMPLETING" or "SUSPENDED" or "REQUEUED" or "RESIZING").ToList();
                if (active.Count == 0) return true;
                string summary = string.Join(", ", active.GroupBy(s => s).Select(g => $"{g.Count()} {g.Key.ToLowerInvariant()}"));
                if (summary != last || DateTime.UtcNow - lastLog > TimeSpan.FromMinutes(1))
                {
                    logger?.LogInformation("job {JobId}: {Summary} ({Elapsed:0} s)", jobId, summary, clock.Elapsed.TotalSeconds);
                    last = summary;
                    lastLog = DateTime.UtcNow;
                }
            }
            if (clock.Elapsed > timeout) return false;
            cancellationToken.WaitHandle.WaitOne(poll);
        }
    }

    /// <summary>Absolute path of a program on the PATH, or null.</summary>
    public static string? FindOnPath(string program)
    {
        foreach (string dir in (Environment.GetEnvironmentVariable("PATH") ?? "").Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
        {
            string p = Path.Combine(dir, program);
            if (File.Exists(p)) return p;
        }
        return null;
    }

    /// <summary>Runs a program with arguments, capturing output; kills it after <paramref name="timeout"/>.</summary>
    internal static (int Code, string Stdout, string Stderr) RunProcess(string program, IEnumerable<string> args, TimeSpan timeout)
    {
        var psi = new ProcessStartInfo(program) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (string a in args) psi.ArgumentList.Add(a);
        using var p = Process.Start(psi) ?? throw new InvalidOperationException($"Could not start {program}.");
        var outTask = p.StandardOutput.ReadToEndAsync();
        var errTask = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeout))
        {
            p.Kill(entireProcessTree: true);
            p.WaitForExit();
            return (-1, outTask.Result, $"timed out after {timeout.TotalSeconds:0} s");
        }
        return (p.ExitCode, outTask.Result, errTask.Result);
    }

    /// <summary>Single-quotes a word for bash.</summary>
    public static string ShellQuote(string s)
        => s.Length > 0 && s.All(c => char.IsAsciiLetterOrDigit(c) || c is '/' or '.' or '_' or '-' or '+' or ':' or '=' or ',')
            ? s
            : "'" + s.Replace("'", "'\\''", StringComparison.Ordinal) + "'";

    private static string SafeName(string s)
    {
        var sb = new StringBuilder();
        foreach (char c in s) sb.Append(char.IsAsciiLetterOrDigit(c) || c is '.' or '_' or '-' ? c : '_');
        return sb.Length == 0 ? "opgrowth-sweep" : sb.ToString();
    }

    private static string OneLine(string s)
    {
        string t = s.Trim();
        int nl = t.IndexOfAny(['\r', '\n']);
        return nl >= 0 ? t[..nl] : t;
    }
}
