using System.Text.Json;
using OpGrowth.Cli;

namespace OpGrowth.Tests.Exact;

/// <summary>The exact command on shipped models: exit codes, files written, summary printed.</summary>
public class ExactCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        using var o = new StringWriter();
        using var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    private static string TempDir() => Path.Combine(Path.GetTempPath(), "opgrowth-exact-" + Guid.NewGuid().ToString("N"));

    [Fact]
    public void Exact_OtocOnShippedModel_WritesJsonAndCsv()
    {
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("exact", "mixed-field-ising", "--set", "N=6", "--probe", "Z_0", "--times", "0:2:5", "--out", dir);
            Assert.True(code == 0, err);
            Assert.Contains("mean size", output);
            using var doc = JsonDocument.Parse(File.ReadAllText(Path.Combine(dir, "exact-otoc.json")));
            var r = doc.RootElement.GetProperty("results")[0];
            Assert.Equal(6, r.GetProperty("sites").GetArrayLength());
            // Mean size at t = 0 is the size of Z_0: exactly 1 (dense route).
            Assert.Equal(1.0, r.GetProperty("meanSize").GetProperty("values")[0].GetDouble(), 10);
            var csv = File.ReadAllLines(Path.Combine(dir, "exact-otoc.csv"));
            Assert.Equal("beta,time,series,value,error", csv[0]);
            Assert.True(csv.Length > 5 * (1 + 1 + 6 * 5));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Exact_ThermalAndLevels_Succeed()
    {
        string dir = TempDir();
        try
        {
            var (code, output, err) = Run("exact", "mixed-field-ising", "--set", "N=6", "--mode", "thermal", "--beta", "0,0.5", "--sites", "2", "--times", "0:2:5", "--out", dir);
            Assert.True(code == 0, err);
            Assert.True(File.Exists(Path.Combine(dir, "exact-thermal.csv")));
            (code, output, err) = Run("exact", "xxz", "--set", "N=8", "--mode", "levels", "--out", dir);
            Assert.True(code == 0, err);
            Assert.Contains("<r> =", output);
            Assert.True(File.Exists(Path.Combine(dir, "exact-levels.json")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Theory]
    [InlineData("--times", "0:x:3", 2)]
    [InlineData("--probe", "Q_0", 2)]
    [InlineData("--against", "Q_1", 2)]
    [InlineData("--mode", "spectrum", 1)]
    [InlineData("--sites", "99", 2)]
    public void Exact_BadOption_ExitsWithInputError(string option, string value, int expected)
    {
        var (code, _, err) = Run("exact", "mixed-field-ising", "--set", "N=6", option, value, "--out", TempDir());
        Assert.Equal(expected, code);
        Assert.Single(err.Split('\n', StringSplitOptions.RemoveEmptyEntries));
        Assert.StartsWith("error:", err.Trim());
        Assert.DoesNotContain("   at ", err);
    }
}
