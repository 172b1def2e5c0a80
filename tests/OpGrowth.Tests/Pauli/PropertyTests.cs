using CsCheck;
using OpGrowth.Pauli;

namespace OpGrowth.Tests.Pauli;

/// <summary>
/// Algebraic identities of the Pauli group on random strings of random widths (1..1024 qubits),
/// property-based with CsCheck (it prints a seed to reproduce any failure). Phases are exact
/// integers mod 4, so the checks are exact.
/// </summary>
public class PropertyTests
{
    private static readonly Gen<int> Width = Gen.OneOf(Gen.Int[1, 8], Gen.Int[60, 140], Gen.Int[200, 1024]);

    private static Gen<PauliString> StringGen(int n)
        => Gen.Int[0, 3].Array[n].Select(codes =>
        {
            var b = new PauliString.Builder(n);
            for (int j = 0; j < n; j++) b.Set(j, "IXYZ"[codes[j]]);
            return b.Build();
        });

    private static Gen<(PauliString, PauliString, PauliString)> Triple
        => Width.SelectMany(n => Gen.Select(StringGen(n), StringGen(n), StringGen(n)));

    [Fact]
    public void Multiply_IsAssociativeIncludingPhase()
    {
        Triple.Sample(t =>
        {
            var (a, b, c) = t;
            var ab = PauliString.Multiply(a, b, out int k1);
            var abc = PauliString.Multiply(ab, c, out int k2);
            var bc = PauliString.Multiply(b, c, out int k3);
            var abc2 = PauliString.Multiply(a, bc, out int k4);
            return abc == abc2 && ((k1 + k2) & 3) == ((k3 + k4) & 3);
        }, iter: 300);
    }

    [Fact]
    public void Commutator_IsAntisymmetric()
    {
        Triple.Sample(t =>
        {
            var (a, b, _) = t;
            bool ab = PauliString.Commutator(a, b, out var c1, out var p1);
            bool ba = PauliString.Commutator(b, a, out var c2, out var p2);
            return ab == ba && (!ab || (p1 == p2 && c1 == -c2));
        }, iter: 300);
    }

    [Fact]
    public void Commutator_SatisfiesJacobiIdentity()
    {
        // [A,[B,C]] + [B,[C,A]] + [C,[A,B]] = 0, summed as a map string -> complex coefficient.
        Triple.Sample(t =>
        {
            var (a, b, c) = t;
            var sum = new Dictionary<PauliString, System.Numerics.Complex>();
            void AddNested(PauliString x, PauliString y, PauliString z)
            {
                if (!PauliString.Commutator(y, z, out var c1, out var p1)) return;
                if (!PauliString.Commutator(x, p1!, out var c2, out var p2)) return;
                sum[p2!] = sum.GetValueOrDefault(p2!) + c1 * c2;
            }
            AddNested(a, b, c);
            AddNested(b, c, a);
            AddNested(c, a, b);
            return sum.Values.All(v => v.Magnitude < 1e-12);
        }, iter: 300);
    }

    [Fact]
    public void FixedWidthKeys_AgreeWithGeneralForm()
    {
        Triple.Sample(t =>
        {
            var (a, b, _) = t;
            var p = PauliString.Multiply(a, b, out int k);
            var kp = PauliWide<Words16>.Multiply(PauliWide<Words16>.From(a), PauliWide<Words16>.From(b), out int k2);
            return k == k2 && kp.ToPauliString(a.N) == p
                && PauliWide<Words16>.Anticommute(PauliWide<Words16>.From(a), PauliWide<Words16>.From(b)) == !a.CommutesWith(b);
        }, iter: 300);
    }
}
