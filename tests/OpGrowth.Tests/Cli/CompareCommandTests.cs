using OpGrowth.Cli;

namespace OpGrowth.Tests.Cli;

/// <summary>
/// `opgrowth compare`: the Pauli engine without truncation and the exact engine (dense traces, MathNet
/// products) are both exact at small N, so they must agree to rounding (tolerance 1e-9, far above
/// the ~1e-14 rounding of a few hundred steps).
/// </summary>
public class CompareCommandTests
{
    private static (int Code, string Out, string Err) Run(params string[] args)
    {
        using var o = new StringWriter();
        using var e = new StringWriter();
        int code = Program.Run(args, o, e);
        return (code, o.ToString(), e.ToString());
    }

    [Fact]
    public void Compare_MixedFieldIsingAtSixSites_PassesAndWritesOverlay()
    {
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-compare-" + Guid.NewGuid().ToString("N"));
        try
        {
            var (code, output, _) = Run("compare", "mixed-field-ising", "--size", "6", "--time", "1.5", "--tolerance", "1e-9", "--out", dir);
            Assert.Equal(0, code);
            Assert.Contains("passed", output);
            Assert.True(File.Exists(Path.Combine(dir, "compare.json")));
            Assert.True(File.Exists(Path.Combine(dir, "compare.csv")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Compare_SizeTooLarge_IsInvalidInput()
    {
        var (code, _, err) = Run("compare", "mixed-field-ising", "--size", "14");
        Assert.Equal(2, code);
        Assert.Contains("--size", err);
    }
}
