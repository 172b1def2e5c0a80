using Microsoft.Extensions.Logging.Abstractions;
using OpGrowth.Exact;
using OpGrowth.Pauli;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Exact;

/// <summary>
/// Hand-run timing of the benchmark: a 40-point infinite-temperature OTOC on a 20-site
/// mixed-field Ising chain (W = Z_0 against X, Y and Z on the centre site 10, t = 0.2 .. 8), two random
/// states. Prints wall time and peak working set; asserts only sanity (the numbers depend on the machine).
/// The full N = 20 run takes minutes, so it runs only with OPGROWTH_TIMING=1; otherwise the same grid runs
/// at N = 14 (seconds) as a smoke test.
/// Run: OPGROWTH_TIMING=1 dotnet test tests/OpGrowth.Tests -c Release --filter "FullyQualifiedName~ExactTimingTests" --logger "console;verbosity=detailed"
/// </summary>
public class ExactTimingTests(ITestOutputHelper output)
{
    [Fact]
    [Trait("Category", "Slow")]
    public void Otoc40PointsChain_WallTimeAndMemory()
    {
        int n = Environment.GetEnvironmentVariable("OPGROWTH_TIMING") == "1" ? 20 : 14;
        var h = TestModels.MixedFieldIsing(n);
        var times = Enumerable.Range(1, 40).Select(k => 0.2 * k).ToArray();
        var r = ExactOtoc.Run(h, new ExactOtocOptions
        {
            Operator = PauliString.Parse("Z_0", n),
            Times = times,
            Sites = [n / 2],
            Samples = 2,
            Method = OtocMethod.Typicality,
            Logger = NullLogger.Instance,
        });
        output.WriteLine($"N = {n}: wall {r.Cost.WallSeconds:F1} s, peak working set {r.Cost.PeakWorkingSetBytes / 1e6:F0} MB, {r.Cost.MatrixVectorProducts} H applications, {r.Cost.RealTimePropagations} propagations");
        for (int k = 0; k < times.Length; k += 5) output.WriteLine($"t = {times[k]:F1}: F_Z = {r.Sites[0].Z.Values[k]:F5} +- {r.Sites[0].Z.Errors[k]:F5}");
        // Sanity: before the front arrives (t = 0.2) F is 1 to within the typicality error ~2^{-N/2}.
        Assert.True(Math.Abs(r.Sites[0].Z.Values[0] - 1) < 0.01);
    }
}
