using OpGrowth.Pauli;

namespace OpGrowth.Tests.Pauli;

public class SmokeTests
{
    [Fact]
    public void Commutator_XZ_OnOneSite_IsMinus2Y()
    {
        // i[X, Z] = i(-2iY) = 2Y ... with H = X and O = Z: i[X,Z] = i * (XZ - ZX) = i * (-2iY) = 2Y.
        var h = new Hamiltonian(1, [new PauliTerm(PauliString.Parse("X_0", 1), 1.0)]).Compile<Pauli64>();
        var o = PauliOperator<Pauli64>.Single(PauliString.Parse("Z_0", 1));
        var r = Liouvillian.Commutator(h, o);
        Assert.Equal(1, r.Count);
        Assert.Equal("Y_0", r.Keys[0].ToPauliString(1).ToString());
        Assert.Equal(2.0, r.Coefficients[0]);
    }
}
