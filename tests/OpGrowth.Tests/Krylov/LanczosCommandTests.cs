using System.Text.Json;
using OpGrowth.Cli;
using OpGrowth.Cli.Commands;

namespace OpGrowth.Tests.Krylov;

/// <summary>The 'opgrowth lanczos' command end to end on shipped models (in-process).</summary>
public class LanczosCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        var o = new StringWriter();
        var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    private static string TempDir() => Path.Combine(Path.GetTempPath(), "opgrowth-lanczos-test-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public void Lanczos_CriticalIsingInfiniteChain_WritesFilesWith2SqrtN()
    {
        // Source: check-values.md [V]: transverse-field Ising at h = J = 1, b_n(Z_j) = 2 sqrt(n) exactly.
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("lanczos", "transverse-field-ising", "--mode", "infinite-chain", "--depth", "12", "--t-max", "2", "--time-points", "21", "--out", dir);
            Assert.True(code == 0, err);
            Assert.Contains("best growth class sqrt", output);
            Assert.Contains("no bound on lambda_L", output);
            foreach (var f in new[] { "lanczos.json", "lanczos.csv", "krylov.csv", "spectrum.csv", "summary.txt" }) Assert.True(File.Exists(Path.Combine(dir, f)), f);
            using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "lanczos.json")));
            var coeffs = doc.RootElement.GetProperty("coefficients");
            Assert.Equal(12, coeffs.GetArrayLength());
            foreach (var c in coeffs.EnumerateArray())
            {
                int n = c.GetProperty("n").GetInt32();
                Assert.Equal(2 * Math.Sqrt(n), c.GetProperty("b").GetDouble(), 11);
            }
            // Gaussian: C(t) = exp(-2 t^2) (check-values.md [V]); 21 points up to t = 2; the sqrt(n) fit continues it exactly.
            var lines = File.ReadAllLines(Path.Combine(dir, "krylov.csv"));
            Assert.Equal(22, lines.Length);
            var last = lines[^1].Split(',');
            Assert.Equal(Math.Exp(-2 * 4.0), double.Parse(last[1], System.Globalization.CultureInfo.InvariantCulture), 8);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Lanczos_TruncatedMode_ReportsBudgetsAndUncertainty()
    {
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("lanczos", "mixed-field-ising", "--set", "N=12", "--mode", "truncated", "--depth", "14", "--max-strings", "400", "--out", dir);
            Assert.True(code == 0, err);
            Assert.Contains("truncated at budgets 100, 400", output);
            var rows = File.ReadAllLines(Path.Combine(dir, "lanczos.csv"));
            Assert.StartsWith("n,b,uncertainty", rows[0]);
            Assert.EndsWith("b_budget_100", rows[0]);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Lanczos_InfiniteChainOnAllToAll_ExitsWithInputError()
    {
        var (code, _, err) = Run("lanczos", "ising-glass", "--mode", "infinite-chain", "--depth", "4", "--out", TempDir());
        Assert.Equal(ExitCodes.InvalidInput, code);
        Assert.Contains("expects a chain or ring", err);
    }

    [Fact]
    public void Lanczos_BadModeAndMemory_AreUsageErrors()
    {
        Assert.Equal(ExitCodes.Usage, Run("lanczos", "xxz", "--mode", "fast").Code);
        Assert.Equal(ExitCodes.Usage, Run("lanczos", "xxz", "--memory", "lots").Code);
    }

    [Fact]
    public void Lanczos_TinyMemoryBudget_WritesPartialResultsAndExits3()
    {
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("lanczos", "mixed-field-ising", "--mode", "infinite-chain", "--depth", "40", "--memory", "12MiB", "--threads", "1", "--out", dir);
            Assert.Equal(ExitCodes.ResourceLimit, code);
            Assert.Contains("memory budget", err);
            Assert.Contains("memory budget", output);
            Assert.True(File.Exists(Path.Combine(dir, "lanczos.json")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Theory]
    [InlineData("20GiB", 20L << 30)]
    [InlineData("512MiB", 512L << 20)]
    [InlineData("8GB", 8_000_000_000L)]
    [InlineData("1.5G", 3L << 29)]
    [InlineData("2000000", 2_000_000L)]
    public void TryParseMemory_Units_Parse(string text, long expected)
    {
        Assert.True(OpGrowth.Evolution.MemoryBudget.TryParse(text, out long b));
        Assert.Equal(expected, b);
    }
}
