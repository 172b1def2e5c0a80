namespace OpGrowth.Cli;

internal static class Program
{
    private static int Main(string[] args)
    {
        Console.WriteLine("opgrowth");
        return 0;
    }
}
