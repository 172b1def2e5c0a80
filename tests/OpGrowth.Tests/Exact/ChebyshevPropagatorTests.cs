using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class ChebyshevPropagatorTests
{
    [Theory]
    [InlineData(0.5)]
    [InlineData(7.3)]
    [InlineData(120.0)]
    public void BesselJSequence_MatchesMathNet(double x)
    {
        // Source: MathNet SpecialFunctions.BesselJ (agrees with high-precision values to 3e-15,
        // dependencies.md). Tolerance 1e-12 absolute: Miller's recurrence is accurate to rounding.
        var j = ChebyshevPropagator.BesselJSequence(x, (int)x + 40);
        for (int k = 0; k < j.Length; k += 3)
        {
            Assert.True(Math.Abs(j[k] - MathNet.Numerics.SpecialFunctions.BesselJ(k, x)) < 1e-12, $"J_{k}({x})");
        }
    }

    [Theory]
    [InlineData(0.2)]
    [InlineData(6.0)]
    [InlineData(-2.5)]
    public void Evolve_N8_MatchesDenseExponential(double t)
    {
        // Source: dense exp(-iHt) from MathNet eigendecomposition; tolerance 1e-10 as for Lanczos.
        const int n = 8;
        var h = TestModels.RandomLocal(n, 23);
        var prop = new ChebyshevPropagator(new PauliHamiltonianApplier(h, 1), 1e-12);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(31));
        var dh = Dense.Of(n, h.Terms);
        var evd = dh.Evd(Symmetricity.Hermitian);
        var d = Matrix<Complex>.Build.DenseOfDiagonalArray(evd.EigenValues.Select(e => Complex.Exp(new Complex(0, -t * e.Real))).ToArray());
        var want = (evd.EigenVectors * d * evd.EigenVectors.ConjugateTranspose() * MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi)).ToArray();
        prop.Evolve(psi, t);
        double err = psi.Zip(want, (a, b) => (a - b).Magnitude).Max();
        Assert.True(err < 1e-10, $"max amplitude error {err:E2}");
        // The estimated interval must contain the exact spectrum.
        Assert.True(prop.Bounds.Min <= evd.EigenValues[0].Real && prop.Bounds.Max >= evd.EigenValues[^1].Real);
    }

    [Fact]
    public void Evolve_TooNarrowBounds_WidensAndStaysAccurate()
    {
        // A deliberately wrong interval must be detected by the norm check and repaired.
        const int n = 8;
        var h = TestModels.MixedFieldIsing(n);
        var app = new PauliHamiltonianApplier(h, 1);
        var cheb = new ChebyshevPropagator(app, 1e-12, new SpectralBounds(-3, 3));
        var lan = new KrylovPropagator(app, new KrylovOptions { Tolerance = 1e-12 });
        var a = StateVector.Create(n);
        StateVector.FillHaarRandom(a, new Random(2));
        var b = (Complex[])a.Clone();
        cheb.Evolve(a, 3.0);
        lan.Evolve(b, 3.0);
        Assert.True(cheb.Widenings > 0);
        Assert.True(a.Zip(b, (x, y) => (x - y).Magnitude).Max() < 1e-9);
    }
}
