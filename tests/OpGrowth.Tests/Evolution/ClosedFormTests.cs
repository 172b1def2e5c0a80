using MathNet.Numerics;
using OpGrowth.Evolution;
using OpGrowth.Pauli;
using static OpGrowth.Tests.Evolution.EvolutionTestKit;

namespace OpGrowth.Tests.Evolution;

/// <summary>Published closed forms (check-values.md) and exact structural bounds.</summary>
public class ClosedFormTests
{
    /// <summary>
    /// Source: free-fermion result, T. Brandt and K. Jacoby, Z. Phys. B 25, 181 (1976); check-values.md
    /// gives (Z_j(t)|Z_j) = J_0(4 Jp t)^2 for H = Jp sum (X X + Y Y). Convention derived here: Jordan-Wigner
    /// turns H into hopping with amplitude 2 Jp = 1 between neighbours, Z_j = 1 - 2 n_j, and
    /// (Z_j(t)|Z_j) = |U_jj(t)|^2 with U = exp(-i h t); on the infinite chain U_jj(t) = J_0(2t), so the
    /// autocorrelation is J_0(2t)^2. On an open chain the boundary enters through J_{2(d+1)}(2t) (image
    /// method, d = distance to the end): with d = 16 and t &lt;= 5 that is J_34(10) ~ 1e-15, negligible.
    /// Reference values: MathNet SpecialFunctions.BesselJ (agrees with high precision to 3e-15).
    /// Tolerance 1e-8 (the target); RK4 with dt = 0.0025 has global error ~ t (dt w)^4 w / 120 ~ 2e-9
    /// for the band width w = 4; the Taylor integrator is exact to rounding.
    /// </summary>
    [Theory]
    [InlineData(IntegrationMethod.Taylor, 0.1, 2)]
    [InlineData(IntegrationMethod.Trotter4, 0.01, 10)]
    public void XxChain_CentreAutocorrelation_IsBesselJ0Squared(IntegrationMethod method, double dt, int recordEvery)
        => CheckXxChain(method, dt, recordEvery);

    /// <summary>The RK4 cross-check of the same closed form (2000 steps: slow).</summary>
    [Fact]
    [Trait("Category", "Slow")]
    public void XxChain_CentreAutocorrelation_Rk4_IsBesselJ0Squared() => CheckXxChain(IntegrationMethod.Rk4, 0.0025, 40);

    private static void CheckXxChain(IntegrationMethod method, double dt, int recordEvery)
    {
        int n = 33, j = 16;
        var h = XxChain(n, 0.5);
        var opts = new EvolutionOptions { Method = method, Dt = dt, Time = 5.0, RecordEvery = recordEvery, Threads = 2, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, j, 'Z')), opts);
        Assert.Equal(5.0, s.Records[^1].Time, 9);
        double worst = 0;
        foreach (var r in s.Records)
        {
            double expect = Math.Pow(SpecialFunctions.BesselJ(0, 2 * r.Time), 2);
            worst = Math.Max(worst, Math.Abs(r.Autocorrelation - expect));
        }
        Assert.True(worst < 1e-8, $"largest deviation {worst:e2}");
    }

    [Fact]
    public void TransverseIsing_BoundarySpin_NeverHoldsMoreThan2NStrings()
    {
        // Source: check-values.md (transverse-field Ising chain): Z at the boundary is a single Majorana,
        // and quadratic evolution keeps it linear in the 2N Majoranas: at most 2N strings with truncation
        // off. Trotter steps are products of quadratic rotations (ZZ and X are Majorana bilinears), so the
        // bound holds step by step; the Majorana size stays exactly 1 (tests the Jordan-Wigner count).
        int n = 12;
        var h = TransverseIsing(n, 1.0, 0.7);
        var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.05, Time = 6.0, RecordEvery = 10, Threads = 1, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 0, 'Z'), majoranas: true), opts);
        Assert.All(s.Steps, st => Assert.True(st.Strings <= 2 * n, $"step {st.Step}: {st.Strings} strings"));
        Assert.True(s.Steps.Max(st => st.Strings) >= n, "the operator should spread over the chain");
        Assert.All(s.Records, r => Assert.Equal(1.0, r.MeanMajoranaSize!.Value, 12));
    }

    [Fact]
    public void TransverseIsing_BulkX_HasMajoranaSizeTwo()
    {
        // Source: X_j = i g_{2j} g_{2j+1} is a Majorana bilinear and stays one under quadratic evolution:
        // at most N(2N - 1) strings (check-values.md), Majorana size exactly 2.
        int n = 10;
        var h = TransverseIsing(n, 1.0, 0.6);
        var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.05, Time = 3.0, RecordEvery = 20, Threads = 2, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 4, 'X'), majoranas: true), opts);
        Assert.All(s.Steps, st => Assert.True(st.Strings <= n * (2 * n - 1)));
        Assert.All(s.Records, r => Assert.Equal(2.0, r.MeanMajoranaSize!.Value, 12));
    }

    [Fact]
    [Trait("Category", "Slow")]
    public void MixedFieldIsing_SmallChain_MeanSizeSaturatesNear3NOver4()
    {
        // Source: conventions.md / check-values.md: a random operator on N qubits has mean size
        // (3N/4) 4^N/(4^N - 1). The chaotic mixed-field Ising chain (J = 1, g = 1.05, h = 0.5) approaches it;
        // energy conservation keeps a few percent of the weight on H (Mazur bound ~ h^2/(N(J^2+g^2+h^2)) per
        // check-values.md), so the tolerance is 5% of 3N/4 on the mean over t in [12, 22] (N = 7: 4^7 strings, exact).
        int n = 7;
        var h = MixedFieldIsing(n);
        var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.1, Time = 22, RecordEvery = 10, Threads = 2, Truncation = TruncationPolicy.None };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 3, 'Z')), opts);
        var late = s.Records.Where(r => r.Time >= 12).Select(r => r.MeanSize).ToArray();
        double expected = 0.75 * n * Math.Pow(4, n) / (Math.Pow(4, n) - 1);
        Assert.True(Math.Abs(late.Average() - expected) < 0.05 * expected, $"late mean size {late.Average():0.###}, expected {expected:0.###}");
    }
}
