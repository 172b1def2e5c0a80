using System.CommandLine;
using System.CommandLine.Help;
using System.CommandLine.Invocation;

namespace OpGrowth.Cli;

/// <summary>Entry point: builds the command tree; each command lives in Commands/ and only translates options to the library.</summary>
public static class Program
{
    /// <summary>Usage examples shown at the end of --help (for a subcommand: the lines that use it).</summary>
    internal static readonly string[] Examples =
    [
        "opgrowth models                                   # list the shipped models",
        "opgrowth check mixed-field-ising                  # validate a shipped model and summarise it",
        "opgrowth check models/xxz.toml --set N=24 --set W=8   # override parameters from the command line",
        "opgrowth check demo/tilted-chain --json           # summary as JSON on stdout",
    ];

    /// <summary>Exit codes, as printed in --help and documented in docs/model-files.md.</summary>
    internal const string ExitCodeText =
        "Exit codes: 0 ok, 1 usage, 2 invalid input, 3 resource limit, 4 check failed, 70 internal error, 130 interrupted.";

    public static int Main(string[] args) => Run(args, Console.Out, Console.Error);

    /// <summary>Runs the tool with explicit output writers (tests call this in-process).</summary>
    public static int Run(string[] args, TextWriter output, TextWriter error)
    {
        ArgumentNullException.ThrowIfNull(output);
        ArgumentNullException.ThrowIfNull(error);
        CliHost.UseWriters(output, error);
        var config = new InvocationConfiguration { Output = output, Error = error };
        return BuildRoot().Parse(args).Invoke(config);
    }

    /// <summary>The root command with every subcommand (also used by tests to pin help and errors).</summary>
    public static RootCommand BuildRoot()
    {
        var root = new RootCommand(
            "opgrowth: operator growth and information scrambling at infinite temperature.\n" +
            "Evolves operators in the Pauli-string basis, runs the Lanczos recursion, computes exact OTOCs\n" +
            "at small N, and reports whether (and how fast) a model scrambles.\n\n" +
            "A MODEL is a model file (TOML, see docs/model-files.md) or the name of a shipped model.\n" +
            ExitCodeText);
        foreach (var c in Commands.CommandRegistry.All()) root.Subcommands.Add(c);
        foreach (var option in root.Options)
        {
            if (option is HelpOption { Action: HelpAction help }) option.Action = new HelpWithExamples(help);
        }
        return root;
    }

    /// <summary>The standard help, followed by the examples that use the command asked about.</summary>
    private sealed class HelpWithExamples(HelpAction inner) : SynchronousCommandLineAction
    {
        public override bool ClearsParseErrors => true;

        public override int Invoke(ParseResult parseResult)
        {
            int code = inner.Invoke(parseResult);
            var command = parseResult.CommandResult.Command;
            var lines = command is RootCommand
                ? Examples
                : Examples.Where(e => e.StartsWith($"opgrowth {command.Name} ", StringComparison.Ordinal)).ToArray();
            if (lines.Length > 0)
            {
                var output = parseResult.InvocationConfiguration.Output;
                output.WriteLine("Examples:");
                foreach (var l in lines) output.WriteLine("  " + l);
                output.WriteLine();
            }
            return code;
        }
    }
}
