using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class DenseSpectrumTests
{
    [Fact]
    public void Compute_ComplexH_EigenpairsSatisfyEigenEquation()
    {
        // H v = E v for every pair, against the independent Kronecker matrix (Dense.Of); tolerance 1e-10.
        const int n = 6;
        var h = TestModels.RandomLocal(n, 12);
        var spec = DenseSpectrum.Compute(h);
        var dh = Dense.Of(n, h.Terms);
        var resid = dh * spec.Vectors - spec.Vectors * Matrix<Complex>.Build.DenseOfDiagonalArray(spec.Energies.Select(e => (Complex)e).ToArray());
        Assert.True(resid.FrobeniusNorm() < 1e-10);
        for (int i = 1; i < spec.Energies.Length; i++) Assert.True(spec.Energies[i] >= spec.Energies[i - 1]);
    }

    [Fact]
    public void NativeAndManaged_AgreeOrFallBackSilently()
    {
        // The optional LAPACK path (liblapacke.so.3) must give the managed eigenvalues; when the library
        // is absent both calls take the managed route. Tolerance 1e-10.
        const int n = 7;
        var real = TestModels.MixedFieldIsing(n);
        var cplx = TestModels.RandomLocal(n, 2);
        foreach (var h in new[] { real, cplx })
        {
            var a = DenseSpectrum.Compute(h, useNative: true);
            var b = DenseSpectrum.Compute(h, useNative: false);
            Assert.False(b.UsedNativeLapack);
            Assert.Equal(NativeLapack.IsAvailable, a.UsedNativeLapack);
            for (int i = 0; i < a.Energies.Length; i++) Assert.Equal(b.Energies[i], a.Energies[i], 10);
        }
        // eigenvalues-only routes used by the level statistics
        var rng = new Random(5);
        const int d = 150;
        var m = new double[d * d];
        for (int i = 0; i < d; i++) for (int j = 0; j <= i; j++) m[i * d + j] = m[j * d + i] = rng.NextDouble();
        var e1 = LevelStatistics.SymmetricEigenvalues((double[])m.Clone(), d, 1, useNative: true);
        var e2 = LevelStatistics.SymmetricEigenvalues((double[])m.Clone(), d, 1, useNative: false);
        for (int i = 0; i < d; i++) Assert.Equal(e2[i], e1[i], 10);
        var c = new Complex[d * d];
        for (int i = 0; i < d; i++)
        {
            c[i * d + i] = rng.NextDouble();
            for (int j = 0; j < i; j++)
            {
                c[i * d + j] = new Complex(rng.NextDouble(), rng.NextDouble());
                c[j * d + i] = Complex.Conjugate(c[i * d + j]);
            }
        }
        var h1 = LevelStatistics.HermitianEigenvalues(c, d, 1, useNative: true);
        var h2 = LevelStatistics.HermitianEigenvalues(c, d, 1, useNative: false);
        for (int i = 0; i < d; i++) Assert.Equal(h2[i], h1[i], 9);
    }
}
