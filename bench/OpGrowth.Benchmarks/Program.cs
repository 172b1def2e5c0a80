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
        if (args.Length > 3 && args[0] == "trotter-pass")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            TrotterPass.Run(long.Parse(args[1], ci), int.Parse(args[2], ci), int.Parse(args[3], ci), args.Length > 4 ? args[4] : null);
            return;
        }
        if (args.Length > 3 && args[0] == "quick-apply")
        {
            QuickExact.Apply(args[1], int.Parse(args[2], System.Globalization.CultureInfo.InvariantCulture), int.Parse(args[3], System.Globalization.CultureInfo.InvariantCulture), args.Length > 4 ? int.Parse(args[4], System.Globalization.CultureInfo.InvariantCulture) : 5);
            return;
        }
        if (args.Length > 3 && args[0] == "quick-tstar")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickScramblingTime.Run(args[1], int.Parse(args[2], ci), int.Parse(args[3], ci), args.Length > 4 ? int.Parse(args[4], ci) : 1, args.Length > 5 ? int.Parse(args[5], ci) : 1);
            return;
        }
        if (args.Length > 5 && args[0] == "quick-sizecheck")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickSizeCheck.Run(args[1], int.Parse(args[2], ci), double.Parse(args[3], ci), int.Parse(args[4], ci), int.Parse(args[5], ci));
            return;
        }
        if (args.Length > 1 && args[0] == "quick-svd")
        {
            QuickSvd.Run(int.Parse(args[1], System.Globalization.CultureInfo.InvariantCulture));
            return;
        }
        if (args.Length > 6 && args[0] == "quick-front")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickFront.Run(args[1], int.Parse(args[2], ci), args[3], double.Parse(args[4], ci), double.Parse(args[5], ci), args[6].Split(',').Select(x => int.Parse(x, ci)).ToArray());
            return;
        }
        if (args.Length > 3 && args[0] == "quick-crosscheck")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickCrossCheck.Run(args[1], int.Parse(args[2], ci), double.Parse(args[3], ci));
            return;
        }
        if (args.Length > 4 && args[0] == "quick-validate")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickValidate.Run(args[1], args[2], int.Parse(args[3], ci), args[4].Split(',').Select(x => int.Parse(x, ci)).ToArray());
            return;
        }
        if (args.Length > 3 && args[0] == "quick-contours")
        {
            var ci = System.Globalization.CultureInfo.InvariantCulture;
            QuickContours.Run(int.Parse(args[1], ci), double.Parse(args[2], ci), args[3].Split(',').Select(x => int.Parse(x, ci)).ToArray());
            return;
        }
        BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
    }
}
