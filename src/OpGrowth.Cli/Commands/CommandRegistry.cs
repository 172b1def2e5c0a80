using System.CommandLine;

namespace OpGrowth.Cli.Commands;

/// <summary>Every subcommand, one line each. Each command is a static class with <c>Create()</c> in its own file.</summary>
internal static class CommandRegistry
{
    public static IEnumerable<Command> All()
    {
        yield return RunCommand.Create();
        yield return ModelsCommand.Create();
        yield return CheckCommand.Create();
        yield return EvolveCommand.Create();
        yield return LanczosCommand.Create();
        yield return FrontCommand.Create();
        yield return ExactCommand.Create();
        yield return CompareCommand.Create();
        yield return DiagnoseCommand.Create();
        yield return SweepCommand.Create();
        yield return CollectCommand.Create();
        yield return EnsembleCommand.Create();
    }
}
