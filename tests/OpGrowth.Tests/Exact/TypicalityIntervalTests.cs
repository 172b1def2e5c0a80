using OpGrowth.Exact;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Exact;

/// <summary>Error bars of means over a few random states are Student-t intervals with 68.3% coverage.</summary>
public class TypicalityIntervalTests
{
    [Fact]
    public void Factor_OneAndTwoDegreesOfFreedom_MatchClosedForms()
    {
        // Source: Student t quantiles in closed form (M. Abramowitz, I. A. Stegun, Handbook of Mathematical Functions,
        // 26.7): one degree of freedom (Cauchy) t_p = tan(pi (p - 1/2)); two: t_p = (2p - 1) / sqrt(2 p (1 - p)).
        // Tolerance 1e-9: the library's inverse CDF is iterative.
        double p = 0.5 + TypicalityInterval.Coverage / 2;
        Assert.Equal(Math.Tan(Math.PI * (p - 0.5)), TypicalityInterval.Factor(2), 9);
        Assert.Equal((2 * p - 1) / Math.Sqrt(2 * p * (1 - p)), TypicalityInterval.Factor(3), 9);
        Assert.Equal(1.8373, TypicalityInterval.Factor(2), 4);
        // Many states: the Gaussian one-sigma bar (factor 1); four states, the default: about 1.20.
        Assert.InRange(TypicalityInterval.Factor(1000), 1.0, 1.001);
        Assert.InRange(TypicalityInterval.Factor(4), 1.19, 1.21);
        Assert.Throws<ArgumentOutOfRangeException>(() => TypicalityInterval.Factor(1));
    }

    [Fact]
    public void TypicalityErrors_AreTheStudentIntervalAndSaySo()
    {
        // The reported error of a typicality mean is the 68% Student-t half-width: standard error times the factor.
        const int n = 6, samples = 4;
        var h = TestModels.MixedFieldIsing(n);
        var r = ExactOtoc.Run(h, new ExactOtocOptions { Operator = PauliString.Parse("Z_0", n), Times = [0.0, 1.0], Sites = [3], Method = OtocMethod.Typicality, Samples = samples, Seed = 3, Threads = 1 });
        Assert.Contains("Student-t", r.ErrorKind);
        Assert.Contains($"{samples} random states", r.ErrorKind);
        Assert.Contains("68%", r.ErrorKind);
        Assert.True(r.Sites[0].Z.Errors[1] > 0);
    }
}
