using BenchmarkDotNet.Running;

namespace OpGrowth.Benchmarks;

internal static class Program
{
    private static void Main(string[] args)
    {
        if (args.Length > 0 && args[0] == "memory")
        {
            MemoryFigures.Run();
            return;
        }
        if (args.Length > 0 && args[0] == "quick-commutator")
        {
            QuickCommutator.Run(args.Length > 1 ? args[1..].Select(a => int.Parse(a, System.Globalization.CultureInfo.InvariantCulture)).ToArray() : [22, 25]);
            return;
        }
        if (args.Length > 3 && args[0] == "quick-evolution")
        {
            QuickEvolution.Run(long.Parse(args[1], System.Globalization.CultureInfo.InvariantCulture), int.Parse(args[2], System.Globalization.CultureInfo.InvariantCulture), int.Parse(args[3], System.Globalization.CultureInfo.InvariantCulture), args.Length > 4 ? int.Parse(args[4], System.Globalization.CultureInfo.InvariantCulture) : 0);
            return;
        }
        BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
    }
}
