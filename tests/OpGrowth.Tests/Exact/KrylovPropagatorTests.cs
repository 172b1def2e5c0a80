using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class KrylovPropagatorTests
{
    // Issue requirement: 1e-10 against dense exp(-iHt); the propagator runs at tolerance 1e-12 so
    // that the dense route's own rounding (~1e-13 for 256 x 256) dominates the margin.
    private const double Required = 1e-10;

    private static Complex[] DenseExp(Matrix<Complex> h, Complex[] psi, Complex factor)
    {
        // exp(factor H) psi via MathNet's Hermitian eigendecomposition (independent route).
        var evd = h.Evd(Symmetricity.Hermitian);
        var v = evd.EigenVectors;
        var d = Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(factor * e.Real)).ToArray());
        return (v * d * v.ConjugateTranspose() * MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi)).ToArray();
    }

    [Theory]
    [InlineData(0.3)]
    [InlineData(2.0)]
    [InlineData(-5.0)]
    public void Evolve_MixedFieldIsingN8_MatchesDenseExponential(double t)
    {
        // Source: dense exp(-iHt) from MathNet eigendecomposition (Dense.Of).
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var prop = new KrylovPropagator(new PauliHamiltonianApplier(h, 1), new KrylovOptions { Tolerance = 1e-12, MaxDimension = 24 });
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(42));
        var want = DenseExp(Dense.Of(n, h.Terms), psi, new Complex(0, -t));
        prop.Evolve(psi, t);
        double err = psi.Zip(want, (a, b) => (a - b).Magnitude).Max();
        Assert.True(err < Required, $"max amplitude error {err:E2} at t = {t}");
        Assert.Equal(1.0, StateVector.NormSquared(psi), 11); // unitarity
    }

    [Fact]
    public void Evolve_ComplexHamiltonianN8_MatchesDenseExponential()
    {
        // Y terms make H complex; source as above.
        const int n = 8;
        var h = TestModels.RandomLocal(n, 17);
        var prop = new KrylovPropagator(new PauliHamiltonianApplier(h, 1), new KrylovOptions { Tolerance = 1e-12 });
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(7));
        var want = DenseExp(Dense.Of(n, h.Terms), psi, new Complex(0, -3.0));
        prop.Evolve(psi, 3.0);
        double err = psi.Zip(want, (a, b) => (a - b).Magnitude).Max();
        Assert.True(err < Required, $"max amplitude error {err:E2}");
    }

    [Fact]
    public void EvolveImaginary_N8_MatchesDenseExponential()
    {
        // exp(-tau H) psi; relative error against the dense route.
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var prop = new KrylovPropagator(new PauliHamiltonianApplier(h, 1), new KrylovOptions { Tolerance = 1e-12 });
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(5));
        var want = DenseExp(Dense.Of(n, h.Terms), psi, new Complex(-0.75, 0));
        prop.EvolveImaginary(psi, 0.75);
        double scale = Math.Sqrt(want.Sum(a => a.Magnitude * a.Magnitude));
        double err = psi.Zip(want, (a, b) => (a - b).Magnitude).Max() / scale;
        Assert.True(err < Required, $"max relative amplitude error {err:E2}");
    }

    [Fact]
    public void Evolve_ForwardThenBack_ReturnsInitialState()
    {
        // Unitarity / time reversal: e^{iHt} e^{-iHt} = 1 at N = 14 (several restarts of the basis).
        const int n = 14;
        var h = TestModels.MixedFieldIsing(n);
        var prop = new KrylovPropagator(new PauliHamiltonianApplier(h, 2), new KrylovOptions { Tolerance = 1e-11, MaxDimension = 20 });
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(9));
        var copy = (Complex[])psi.Clone();
        prop.Evolve(psi, 4.0);
        prop.Evolve(psi, -4.0);
        double err = psi.Zip(copy, (a, b) => (a - b).Magnitude).Max();
        Assert.True(err < 1e-9, $"round trip error {err:E2}");
        Assert.True(prop.Steps > 2, "the step control should have split the interval");
    }
}
