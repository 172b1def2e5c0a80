using System.Numerics;
using MathNet.Numerics.LinearAlgebra;
using OpGrowth.Exact;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Tests.Reference;

namespace OpGrowth.Tests.Exact;

public class FloquetTests
{
    /// <summary>Kicked Ising drive: layer 0 = ZZ (angle 2J) and Z (angle 2h) rotations, layer 1 = X (angle 2b).</summary>
    private static FloquetDrive KickedIsing(int n, double j = Math.PI / 4, double b = Math.PI / 4, double h = 0.6)
    {
        var l0 = new List<PauliRotation>();
        for (int i = 0; i + 1 < n; i++) l0.Add(new(PauliString.Parse($"Z_{i} Z_{i + 1}", n), 2 * j));
        for (int i = 0; i < n; i++) l0.Add(new(PauliString.Parse($"Z_{i}", n), 2 * h));
        var l1 = Enumerable.Range(0, n).Select(i => new PauliRotation(PauliString.Parse($"X_{i}", n), 2 * b)).ToList();
        return new FloquetDrive([l0, l1]);
    }

    /// <summary>Dense period unitary from the rotations: exp(-i a P/2) = cos(a/2) - i sin(a/2) P, first rotation first.</summary>
    private static Matrix<Complex> DenseU(int n, FloquetDrive drive)
    {
        var u = Matrix<Complex>.Build.DenseIdentity(1 << n);
        foreach (var r in drive.Layers.SelectMany(l => l))
        {
            var rot = Matrix<Complex>.Build.DenseIdentity(1 << n) * Math.Cos(r.Angle / 2) - Dense.Of(r.Generator) * new Complex(0, Math.Sin(r.Angle / 2));
            u = rot * u;
        }
        return u;
    }

    [Fact]
    public void Evolve_KickedIsingN6_MatchesDenseProductOfRotations()
    {
        // Source: Dense.Of Kronecker matrices; exact up to rounding (tolerance 1e-12), forward and backward.
        const int n = 6;
        var drive = KickedIsing(n);
        var fp = new FloquetPropagator(n, drive, 1);
        var psi = StateVector.Create(n);
        StateVector.FillHaarRandom(psi, new Random(3));
        var u = DenseU(n, drive);
        var want = (u * u * u * MathNet.Numerics.LinearAlgebra.Vector<Complex>.Build.DenseOfArray(psi)).ToArray();
        var copy = (Complex[])psi.Clone();
        fp.Evolve(psi, 3);
        Assert.True(psi.Zip(want, (a, b) => (a - b).Magnitude).Max() < 1e-12);
        fp.Evolve(psi, -3);
        Assert.True(psi.Zip(copy, (a, b) => (a - b).Magnitude).Max() < 1e-12);
        Assert.Throws<ArgumentException>(() => fp.Evolve(psi, 0.5));
    }

    [Fact]
    public void Otoc_KickedIsingN5Dense_MatchesKroneckerTraces()
    {
        // W(m) = U^{-m} W U^m with U from DenseU; F = Tr(W(m) V W(m) V)/D; tolerance 1e-10.
        const int n = 5;
        var drive = KickedIsing(n, 0.7, 0.9, 0.4);
        var w = PauliString.Parse("Z_0", n);
        var times = new double[] { 0, 1, 2, 4 };
        var r = ExactOtoc.Run(drive, n, new ExactOtocOptions { Operator = w, Times = times, Method = OtocMethod.Dense });
        var u = DenseU(n, drive);
        var dw = Dense.Of(w);
        for (int k = 0; k < times.Length; k++)
        {
            var um = Matrix<Complex>.Build.DenseIdentity(1 << n);
            for (int m = 0; m < (int)times[k]; m++) um = u * um;
            var wt = um.ConjugateTranspose() * dw * um;
            foreach (var s in r.Sites)
            {
                var v = Dense.Of(PauliString.Single(n, s.Site, 'X'));
                Assert.Equal((wt * v * wt * v).Trace().Real / (1 << n), s.X.Values[k], 10);
            }
            Assert.Equal(Dense.Inner(dw, wt).Real, r.Autocorrelation.Values[k], 10);
        }
    }

    [Fact]
    public void Otoc_KickedIsingN8Typicality_AgreesWithDense()
    {
        // Typicality (Bartsch and Gemmer 2009) against the dense period unitary; five standard errors
        // plus 2^{-N/2}.
        const int n = 8;
        var drive = KickedIsing(n);
        var o = new ExactOtocOptions { Operator = PauliString.Parse("Z_0", n), Times = [0, 1, 2, 3, 5], Sites = [2, 3], Samples = 6, Seed = 4 };
        var exact = ExactOtoc.Run(drive, n, o with { Method = OtocMethod.Dense });
        var typ = ExactOtoc.Run(drive, n, o with { Method = OtocMethod.Typicality });
        for (int si = 0; si < 2; si++)
        {
            for (int k = 0; k < 5; k++)
            {
                double bound = 5 * typ.Sites[si].Z.Errors[k] + Math.Pow(2, -n / 2.0);
                Assert.True(Math.Abs(exact.Sites[si].Z.Values[k] - typ.Sites[si].Z.Values[k]) <= bound);
            }
        }
    }
}
