using System.CommandLine;

namespace OpGrowth.Cli;

/// <summary>Entry point: builds the command tree; each command lives in Commands/ and only translates options to the library.</summary>
public static class Program
{
    public static int Main(string[] args) => BuildRoot().Parse(args).Invoke();

    /// <summary>The root command with every subcommand (also used by tests to pin help and errors).</summary>
    public static RootCommand BuildRoot()
    {
        var root = new RootCommand(
            "opgrowth: operator growth and information scrambling at infinite temperature.\n" +
            "Evolves operators in the Pauli-string basis, runs the Lanczos recursion, computes exact OTOCs\n" +
            "at small N, and reports whether (and how fast) a model scrambles.\n\n" +
            "Exit codes: 0 ok, 1 usage, 2 invalid input, 3 resource limit, 4 check failed, 70 internal error, 130 interrupted.");
        foreach (var c in Commands.CommandRegistry.All()) root.Subcommands.Add(c);
        return root;
    }
}
