using OpGrowth.IO;
using OpGrowth.Krylov;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Krylov;

public class TranslationCellTests
{
    [Fact]
    public void FromHamiltonian_OpenAndRing_RecoversCellAndRebuildsSameHamiltonian()
    {
        var cell = KrylovTestModels.MixedIsing(1, 1.05, 0.5);
        foreach (bool ring in new[] { false, true })
        {
            var h = ring ? cell.Ring(9) : cell.OpenChain(9);
            var back = TranslationCell.FromHamiltonian(h, ring);
            Assert.Equal(1, back.Range);
            Assert.Equal(3, back.Terms.Count);
            var again = ring ? back.Ring(9) : back.OpenChain(9);
            Assert.Equal(h.Terms.ToHashSet(), again.Terms.ToHashSet());
        }
    }

    [Fact]
    public void FromHamiltonian_NonUniformField_ThrowsInputException()
    {
        var h = KrylovTestModels.Tfim(1, 0.7).OpenChain(6);
        var terms = h.Terms.Append(new PauliTerm(PauliString.Parse("X_2", 6), 0.1));
        var ex = Assert.Throws<InputException>(() => TranslationCell.FromHamiltonian(new Hamiltonian(6, terms), false, "m.toml"));
        Assert.Contains("not translation invariant", ex.Message);
    }

    [Fact]
    public void LocalPattern_WrappingBondOnRing_IsContiguous()
    {
        var (start, letters) = TranslationCell.LocalPattern(PauliString.Parse("Z_0 X_7", 8), periodic: true);
        Assert.Equal(7, start);
        Assert.Equal("XZ", letters);
    }
}
