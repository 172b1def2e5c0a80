using System.CommandLine;
using System.CommandLine.Help;
using System.CommandLine.Invocation;

namespace OpGrowth.Cli;

/// <summary>Entry point: builds the command tree; each command lives in Commands/ and only translates options to the library.</summary>
public static class Program
{
    /// <summary>-q: warnings and errors only (no progress, no log lines).</summary>
    private static readonly Option<bool> Quiet = new("--quiet", "-q") { Description = "Print only results, warnings and errors.", Recursive = true };

    /// <summary>-v: also per-step detail (every Lanczos step, every sample, every sector).</summary>
    private static readonly Option<bool> Verbose = new("--verbose", "-v") { Description = "Also log every step (Lanczos steps, samples, sectors).", Recursive = true };

    public static int Main(string[] args)
    {
        CliHost.OwnsProcess = true;
        StartJitProfile(args);
        return Run(args, Console.Out, Console.Error);
    }

    /// <summary>
    /// The runtime's multi-core JIT (System.Runtime.ProfileOptimization): each command records the methods it
    /// compiles at start-up in a small profile under the user's temporary folder, and the next run of that
    /// command compiles them ahead on a second core. Start-up of a short run 0.21 -> 0.15 s on the 2-core
    /// machine. Best effort: without a writable temporary folder nothing changes but speed.
    /// </summary>
    private static void StartJitProfile(string[] args)
    {
        try
        {
            string command = args.Length > 0 && args[0].Length <= 32 && args[0].All(c => c is >= 'a' and <= 'z' or '-') ? args[0] : "other";
            string root = Path.Combine(Path.GetTempPath(), "opgrowth-jit-" + Environment.UserName);
            Directory.CreateDirectory(root);
            System.Runtime.ProfileOptimization.SetProfileRoot(root);
            System.Runtime.ProfileOptimization.StartProfile(command + ".jitprofile");
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException)
        {
            // No profile: the JIT works as usual.
        }
    }

    /// <summary>Runs the tool with explicit output writers (tests call this in-process).</summary>
    public static int Run(string[] args, TextWriter output, TextWriter error)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(error);
        CliHost.UseWriters(output, error);
        var parse = BuildRoot().Parse(args);
        CliHost.Verbosity = parse.GetValue(Quiet) ? Verbosity.Quiet : parse.GetValue(Verbose) ? Verbosity.Verbose : Verbosity.Normal;
        if (parse.Errors.Count > 0 && parse.Action is not HelpWithExamples)
        {
            // One line: the first problem, in the house form, and where to read more.
            string command = parse.CommandResult.Command is RootCommand ? "opgrowth" : $"opgrowth {parse.CommandResult.Command.Name}";
            error.WriteLine($"error: {UsageMessage(parse.Errors[0].Message)} (see '{command} --help')");
            return ExitCodes.Usage;
        }
        var config = new InvocationConfiguration { Output = output, Error = error, ProcessTerminationTimeout = null };
        return parse.Invoke(config);
    }

    /// <summary>A parser message without .NET type names ("as expected type 'System.Double'" becomes "; expected a number").</summary>
    internal static string UsageMessage(string message)
    {
        string m = CliHost.OneLine(message);
        m = System.Text.RegularExpressions.Regex.Replace(m, @" as expected type '([^']*)'\.?", t =>
            t.Groups[1].Value.Contains("Double", StringComparison.Ordinal) ? "; expected a number"
            : t.Groups[1].Value.Contains("Int", StringComparison.Ordinal) ? "; expected a whole number"
            : t.Groups[1].Value.Contains("Boolean", StringComparison.Ordinal) ? "; expected true or false" : "; expected another value");
        if (m.StartsWith("Unrecognized command or argument", StringComparison.Ordinal)) m = "found " + m["Unrecognized command or argument ".Length..].TrimEnd('.') + ", which is not a command, option or argument here";
        return m.TrimEnd('.');
    }

    /// <summary>The root command with every subcommand (also used by tests to pin help and errors).</summary>
    public static RootCommand BuildRoot()
    {
        var root = new RootCommand(
            "opgrowth: does a model scramble quantum information, how fast, and can the answer be trusted?\n" +
            "Operator growth at infinite temperature: Pauli-string evolution, Lanczos coefficients, exact OTOCs at small N.\n" +
            "MODEL is a model file (TOML, see docs/model-files.md) or the name of a shipped model ('opgrowth models').");
        root.Options.Add(Quiet);
        root.Options.Add(Verbose);
        foreach (var c in Commands.CommandRegistry.All()) root.Subcommands.Add(c);
        foreach (var option in root.Options)
        {
            if (option is HelpOption { Action: HelpAction help }) option.Action = new HelpWithExamples(help);
        }
        return root;
    }

    /// <summary>The standard help, followed by the examples of the command asked about (and the exit codes at the top level).</summary>
    private sealed class HelpWithExamples(HelpAction inner) : SynchronousCommandLineAction
    {
        public override bool ClearsParseErrors => true;

        public override int Invoke(ParseResult parseResult)
        {
            var command = parseResult.CommandResult.Command;
            int code = command is RootCommand root ? WriteRootHelp(root, parseResult.InvocationConfiguration.Output) : inner.Invoke(parseResult);
            var lines = command is RootCommand
                ? CommandHelp.RootExamples
                : CommandHelp.Examples.TryGetValue(command.Name, out var ex) ? ex : [];
            var output = parseResult.InvocationConfiguration.Output;
            if (lines.Length > 0)
            {
                output.WriteLine("Examples:");
                foreach (var l in lines) output.WriteLine("  " + l);
                output.WriteLine();
            }
            if (command is RootCommand)
            {
                output.WriteLine(CommandHelp.ExitCodeText);
                output.WriteLine();
            }
            return code;
        }

        /// <summary>The top-level help: short, one line per command with <c>run</c> first.</summary>
        private static int WriteRootHelp(RootCommand root, TextWriter o)
        {
            o.WriteLine(root.Description);
            o.WriteLine();
            o.WriteLine("Usage: opgrowth <command> [options]      (opgrowth <command> --help for a command's options)");
            o.WriteLine();
            o.WriteLine("Commands:");
            int width = CommandHelp.Summaries.Max(c => c.Name.Length) + 2;
            foreach (var (name, summary) in CommandHelp.Summaries) o.WriteLine($"  {name.PadRight(width)}{summary}");
            o.WriteLine();
            o.WriteLine("Options:");
            o.WriteLine("  -q, --quiet    " + Quiet.Description);
            o.WriteLine("  -v, --verbose  " + Verbose.Description);
            o.WriteLine("  -h, --help     Show help (also after a command).");
            o.WriteLine("  --version      Show the version.");
            o.WriteLine();
            return ExitCodes.Ok;
        }
    }
}
