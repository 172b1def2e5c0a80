using System.Diagnostics;
using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>Temporary folders, plan files and a way to run the opgrowth CLI as a child process.</summary>
internal sealed class SweepTestKit : IDisposable
{
    public SweepTestKit()
    {
        Root = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "opgrowth-sweep-tests", Guid.NewGuid().ToString("N")[..12]);
        Directory.CreateDirectory(Root);
        ModelFile = System.IO.Path.Combine(Root, "model.toml");
        File.WriteAllText(ModelFile, ModelText);
    }

    /// <summary>A small disordered Ising chain with parameters N, g, h and seed.</summary>
    public const string ModelText = """
        # Small disordered Ising chain for sweep tests.
        name = "kit-chain"
        description = "Ising chain with random bonds and fields g, h (sweep tests)"
        probes = ["Z_0"]

        [parameters]
        N = 8
        g = 1.05
        h = 0.5
        seed = 1

        [lattice]
        kind = "chain"
        sites = "N"

        [[term]]
        pauli = "ZZ"
        on = "bonds"
        coupling = "normal(1, 0.1)"
        seed = "seed"

        [[term]]
        pauli = "X"
        on = "sites"
        coupling = "g"

        [[term]]
        pauli = "Z"
        on = "sites"
        coupling = "h"

        """;

    public string Root { get; }

    /// <summary>A model file (its content is hashed; the synthetic runner never loads it, the real engines do).</summary>
    public string ModelFile { get; }

    public string Path(string name) => System.IO.Path.Combine(Root, name);

    /// <summary>Writes a plan file and returns its path.</summary>
    public string WritePlan(string text, string name = "plan.toml")
    {
        string p = Path(name);
        File.WriteAllText(p, text);
        return p;
    }

    /// <summary>A synthetic plan over the given sizes and seeds.</summary>
    public static string SyntheticPlan(string sizes = "[8, 12, 16, 24]", string seeds = "[1, 2, 3]", string law = "linear", double delay = 0, double noise = 0.05)
        => $$"""
            name = "synthetic"
            description = "sweep machinery test"

            [model]
            file = "model.toml"
            sizes = {{sizes}}
            seeds = {{seeds}}
            probes = ["Z_0"]

            [engine]
            engine = "synthetic"

            [synthetic]
            law = "{{law}}"
            a = 0.5
            b = 0.25
            noise = {{noise.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}}
            delay = {{delay.ToString("R", System.Globalization.CultureInfo.InvariantCulture)}}
            """;

    public SweepPlan LoadPlan(string text) => SweepPlanReader.Parse(text, Path("plan.toml"), Root);

    /// <summary>Command prefix that starts the CLI: dotnet and the opgrowth assembly next to the tests.</summary>
    public static IReadOnlyList<string> CliCommand()
    {
        string dll = typeof(OpGrowth.Cli.Program).Assembly.Location;
        string dotnet = Environment.GetEnvironmentVariable("DOTNET_HOST_PATH") is { Length: > 0 } h && File.Exists(h)
            ? h
            : SlurmArray.FindOnPath("dotnet") ?? "dotnet";
        return [dotnet, dll];
    }

    /// <summary>Starts the CLI with arguments; output is captured.</summary>
    public static Process StartCli(params string[] args)
    {
        var cmd = CliCommand();
        var psi = new ProcessStartInfo(cmd[0]) { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (string c in cmd.Skip(1)) psi.ArgumentList.Add(c);
        foreach (string a in args) psi.ArgumentList.Add(a);
        psi.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        return Process.Start(psi)!;
    }

    /// <summary>Runs the CLI to the end; returns exit code, stdout, stderr.</summary>
    public static (int Code, string Stdout, string Stderr) RunCli(TimeSpan timeout, params string[] args)
    {
        using var p = StartCli(args);
        var o = p.StandardOutput.ReadToEndAsync();
        var e = p.StandardError.ReadToEndAsync();
        if (!p.WaitForExit(timeout))
        {
            p.Kill(entireProcessTree: true);
            throw new TimeoutException($"opgrowth {string.Join(' ', args)} did not finish in {timeout}");
        }
        return (p.ExitCode, o.Result, e.Result);
    }

    /// <summary>
    /// Sends SIGKILL to a running child (through the kill program, so the signal is explicit rather than
    /// whatever Process.Kill uses) and waits for it to end. Returns the exit code: 137 = 128 + SIGKILL(9)
    /// is how .NET reports a child ended by that signal.
    /// </summary>
    public static int SigKill(Process p) => Signal(p, "-KILL");

    /// <summary>Sends SIGTERM (what Slurm sends at a time limit) and waits for the child to end; returns its exit code.</summary>
    public static int SigTerm(Process p) => Signal(p, "-TERM");

    private static int Signal(Process p, string signal)
    {
        string kill = SlurmArray.FindOnPath("kill") ?? "/bin/kill";
        using (var k = Process.Start(new ProcessStartInfo(kill) { ArgumentList = { signal, p.Id.ToString(System.Globalization.CultureInfo.InvariantCulture) }, UseShellExecute = false })!)
        {
            k.WaitForExit();
        }
        p.WaitForExit();
        return p.ExitCode;
    }

    public void Dispose()
    {
        try
        {
            Directory.Delete(Root, recursive: true);
        }
        catch (IOException)
        {
        }
        catch (UnauthorizedAccessException)
        {
        }
    }
}
