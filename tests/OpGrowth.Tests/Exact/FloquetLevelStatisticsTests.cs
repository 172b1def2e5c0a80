using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;
using Xunit.Abstractions;

namespace OpGrowth.Tests.Exact;

public class FloquetLevelStatisticsTests(ITestOutputHelper output)
{
    private static PauliString P(string s, int n) => PauliString.Parse(s, n);

    /// <summary>Kicked Ising drive: layer 0 = ZZ (angle 2J) and Z (angle 2h) rotations, layer 1 = X (angle 2b).</summary>
    private static FloquetDrive KickedIsing(int n, double j = Math.PI / 4, double b = Math.PI / 4, double h = 0.6)
    {
        var l0 = new List<PauliRotation>();
        for (int i = 0; i + 1 < n; i++) l0.Add(new(P($"Z_{i} Z_{i + 1}", n), 2 * j));
        if (h != 0) for (int i = 0; i < n; i++) l0.Add(new(P($"Z_{i}", n), 2 * h));
        var l1 = Enumerable.Range(0, n).Select(i => new PauliRotation(P($"X_{i}", n), 2 * b)).ToList();
        return new FloquetDrive([l0, l1]);
    }

    /// <summary>Commuting single-site Z rotations (and, with <paramref name="bonds"/>, Z_i Z_i+1 rotations) with random
    /// angles in [0, 4 pi): a diagonal U_F.</summary>
    private static FloquetDrive RandomZ(int n, int seed, bool bonds = false)
    {
        var rng = new Random(seed);
        var l0 = Enumerable.Range(0, n).Select(i => new PauliRotation(P($"Z_{i}", n), 4 * Math.PI * rng.NextDouble())).ToList();
        if (bonds) for (int i = 0; i + 1 < n; i++) l0.Add(new PauliRotation(P($"Z_{i} Z_{i + 1}", n), 4 * Math.PI * rng.NextDouble()));
        return new FloquetDrive([l0]);
    }

    /// <summary>Dense period unitary, independent of the code under test: exp(-i a P/2) = cos(a/2) I - i sin(a/2) P
    /// with P a Kronecker product (Dense.Of), first rotation first in time.</summary>
    private static Matrix<Complex> DenseU(int n, FloquetDrive drive)
    {
        var id = Matrix<Complex>.Build.DenseIdentity(1 << n);
        var u = id;
        foreach (var r in drive.Layers.SelectMany(l => l))
        {
            u = (id * Math.Cos(r.Angle / 2) - Dense.Of(r.Generator) * new Complex(0, Math.Sin(r.Angle / 2))) * u;
        }
        return u;
    }

    // Phases mapped onto [cut, cut + 2 pi) with the cut in the largest gap of the reference, then sorted.
    private static double[] Unwrapped(IEnumerable<double> phases, double cut)
        => phases.Select(p => cut + ((p - cut) % (2 * Math.PI) + 2 * Math.PI) % (2 * Math.PI)).Order().ToArray();

    private static void AssertSamePhases(double[] reference, double[] got, double tol)
    {
        Assert.Equal(reference.Length, got.Length);
        var sorted = reference.Order().ToArray();
        int k = 0;
        double best = 2 * Math.PI + sorted[0] - sorted[^1];
        for (int i = 0; i + 1 < sorted.Length; i++)
        {
            if (sorted[i + 1] - sorted[i] > best)
            {
                best = sorted[i + 1] - sorted[i];
                k = i + 1;
            }
        }
        double cut = sorted[k] - best / 2;
        var a = Unwrapped(reference, cut);
        var b = Unwrapped(got, cut);
        double worst = a.Zip(b, (x, y) => Math.Abs(x - y)).Max();
        Assert.True(worst < tol, $"largest phase difference {worst:E2} > {tol:E0}");
    }

    public static IEnumerable<object[]> Drives() =>
    [
        ["kicked Ising h=0.6, N=7 (reflection)", 7, true],
        ["kicked Ising h=0, N=8 (reflection, spin flip)", 8, true],
        ["random Z rotations, N=6 (total Z)", 6, true],
        ["kicked Ising h=0.6, N=6, managed solver", 6, false],
    ];

    private static FloquetDrive DriveOf(string label, int n) => label.StartsWith("random", StringComparison.Ordinal)
        ? RandomZ(n, 5)
        : KickedIsing(n, 0.7, 0.9, label.Contains("h=0,", StringComparison.Ordinal) ? 0 : 0.6);

    [Theory]
    [MemberData(nameof(Drives))]
    public void SectorPhases_UnionOfSectors_MatchesDenseUnitary(string label, int n, bool native)
    {
        // Source: the eigenphases of U_F built independently as a dense Kronecker product (MathNet Evd). The
        // sectors block-diagonalise U_F by an orthogonal change of basis, so the union of their phases is the
        // full spectrum. Tolerance 1e-9: both routes are backward stable (errors ~1e-14 x dimension).
        var drive = DriveOf(label, n);
        var sym = FloquetLevelStatistics.Detect(drive, n, out var unresolved);
        output.WriteLine($"{label}: resolved {string.Join(", ", sym.Names)}; unresolved {string.Join(", ", unresolved)}");
        Assert.Empty(unresolved);
        if (label.Contains("reflection", StringComparison.Ordinal)) Assert.True(sym.Reflection);
        if (label.Contains("spin flip", StringComparison.Ordinal)) Assert.True(sym.SpinFlip);
        if (label.Contains("total Z", StringComparison.Ordinal)) Assert.True(sym.TotalZ);
        if (label.StartsWith("kicked Ising h=0.6", StringComparison.Ordinal)) Assert.False(sym.SpinFlip || sym.TotalZ);
        var sectors = FloquetLevelStatistics.SectorPhases(drive, n, sym, threads: 2, useNative: native);
        Assert.Equal(1 << n, sectors.Sum(s => s.Dimension));
        Assert.True(sectors.Count > 1);
        foreach (var s in sectors)
        {
            Assert.True(s.Leakage < 1e-12, $"{s.Label}: leakage {s.Leakage:E1}");
            Assert.True(s.UnitarityDeviation < 1e-10);
        }
        var dense = DenseU(n, drive).Evd().EigenValues.Select(z => z.Phase).ToArray();
        AssertSamePhases(dense, sectors.SelectMany(s => s.Phases).ToArray(), 1e-9);
    }

    [Fact]
    public void Detect_ReflectionBrokenByOneSite_NotResolved()
    {
        // A field on site 0 only breaks j -> N-1-j in one layer: the check must see it (no assumption).
        const int n = 6;
        var d = KickedIsing(n);
        var layers = d.Layers.Select(l => (IReadOnlyList<PauliRotation>)l.ToList()).ToList();
        layers[1] = [.. layers[1], new PauliRotation(P("Z_0", n), 0.3)];
        var broken = new FloquetDrive(layers);
        Assert.False(FloquetLevelStatistics.IsReflectionSymmetric(broken));
        var sym = FloquetLevelStatistics.Detect(broken, n, out var unresolved);
        Assert.False(sym.Reflection);
        Assert.Empty(unresolved);
        Assert.True(FloquetLevelStatistics.IsReflectionSymmetric(d));
    }

    [Fact]
    public void CircularGapRatios_EquallySpacedPhases_AllOne()
    {
        // D equally spaced phases on the circle: every gap (including the wrap-around one) is 2 pi / D, r = 1.
        var phases = Enumerable.Range(0, 16).Select(k => -Math.PI + 2 * Math.PI * (k + 0.5) / 16).ToArray();
        var (r, deg) = FloquetLevelStatistics.CircularGapRatios(phases);
        Assert.Equal(16, r.Length);
        Assert.Equal(0, deg);
        Assert.All(r, x => Assert.Equal(1.0, x, 12));
    }

    [Fact]
    public void Classify_KickedIsingAndComplexDrive_CoeAndCue()
    {
        // Two real layers always read the same backward as a necklace (U = B A ~ A^1/2 B A^1/2): COE.
        Assert.Equal("COE", FloquetLevelStatistics.Classify(KickedIsing(6)).Class);
        // A Y rotation is complex in the computational basis: CUE even if time reversal is declared.
        const int n = 4;
        var complex = new FloquetDrive([[new PauliRotation(P("Y_0", n), 0.4)], [new PauliRotation(P("Z_0 Z_1", n), 0.5)], [new PauliRotation(P("X_1", n), 0.6)]]);
        Assert.Equal("CUE", FloquetLevelStatistics.Classify(complex, ["time-reversal"]).Class);
        // Three distinct real layers A, B, C: not a necklace palindrome -> CUE unless declared.
        var three = new FloquetDrive([[new PauliRotation(P("X_0", n), 0.4)], [new PauliRotation(P("Z_0 Z_1", n), 0.5)], [new PauliRotation(P("X_1", n), 0.6)]]);
        Assert.Equal("CUE", FloquetLevelStatistics.Classify(three).Class);
        Assert.Equal("COE", FloquetLevelStatistics.Classify(three, ["time-reversal"]).Class);
    }

    [Fact]
    public void Analyze_RandomCommutingZAndZZRotationsN10_NearPoisson()
    {
        // Commuting Z and Z_i Z_i+1 rotations with random angles: U_F is diagonal (integrable, every basis state
        // conserved) and the quasienergies of a total-Z sector are random sums folded on the circle, an
        // uncorrelated spectrum. Single-site Z rotations alone give an additive spectrum (like free fermions):
        // measured <r> per drive scattered from 0.32 to 0.46 over six seeds, with sectors m and N-m mirror
        // images; the random bond angles remove that structure (0.365-0.405 over six seeds).
        // Source: Poisson <r> = 2 ln 2 - 1 (Atas, Bogomolny, Giraud, Roux, PRL 110, 084101 (2013));
        // tolerance 3 error bars (common practice), error bar over 4 random drives.
        const int n = 10;
        var drives = Enumerable.Range(0, 4).Select(s => RandomZ(n, 100 + s, bonds: true)).ToArray();
        var res = FloquetLevelStatistics.Analyze(drives, n);
        output.WriteLine($"<r> = {res.MeanRatio:F4} +- {res.StandardError:F4} over {res.Gaps} ratios; resolved {string.Join(", ", res.Resolved)}; {res.Solver}, {res.Seconds:F1} s");
        Assert.Contains("total-z", res.Resolved);
        Assert.True(Math.Abs(res.MeanRatio - FloquetLevelStatistics.PoissonRatio) < 3 * res.StandardError,
            $"<r> = {res.MeanRatio:F4} +- {res.StandardError:F4}, Poisson {FloquetLevelStatistics.PoissonRatio:F4}");
    }

    [Fact]
    public void Analyze_ShippedKickedIsingN10_CoeSide()
    {
        // The shipped self-dual kicked Ising chain with a longitudinal field is chaotic: quasienergy ratios on
        // the COE side. Source: COE 0.5307 (D'Alessio and Rigol, PRX 4, 041048 (2014); Atas et al., PRL 110,
        // 084101 (2013)); verdict rule: more than 3 error bars above the Poisson/COE midpoint (common practice).
        // Measured: <r> = 0.53 (two reflection sectors, D = 528 and 496).
        var model = ModelLoader.Load(ShippedModels.Resolve("kicked-ising"), new Dictionary<string, string> { ["N"] = "10" });
        Assert.NotNull(model.Drive);
        var res = FloquetLevelStatistics.Analyze([model.Drive!], model.N, new FloquetLevelOptions { DeclaredSymmetries = model.Symmetries });
        output.WriteLine($"<r> = {res.MeanRatio:F4} +- {res.StandardError:F4} over {res.Gaps} ratios; {res.EnsembleClass}; sectors {string.Join("; ", res.Sectors.Select(s => $"{s.Label} D={s.Dimension} <r>={s.MeanRatio:F4}"))}; leak {res.MaxLeakage:E1}, |lambda|-1 {res.MaxUnitarityDeviation:E1}; {res.Solver}, {res.Seconds:F1} s");
        Assert.Equal("COE", res.EnsembleClass);
        Assert.Equal(["reflection"], res.Resolved);
        Assert.Equal([528, 496], res.Sectors.Select(s => s.Dimension).ToArray());
        double mid = (FloquetLevelStatistics.PoissonRatio + FloquetLevelStatistics.CoeRatio) / 2;
        Assert.True(res.MeanRatio > mid + 3 * res.StandardError, $"<r> = {res.MeanRatio:F4} +- {res.StandardError:F4}");
        Assert.True(res.MaxLeakage < 1e-12);
    }
}
