namespace OpGrowth.Pauli;

/// <summary>One term of a Pauli sum: a real coefficient times a Hermitian Pauli string.</summary>
public readonly record struct PauliTerm(PauliString String, double Coefficient)
{
    public override string ToString()
        => $"{Coefficient.ToString("R", System.Globalization.CultureInfo.InvariantCulture)} {String}";
}
