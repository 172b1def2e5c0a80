namespace OpGrowth.Krylov;

/// <summary>
/// One term of a translation-invariant 1D Hamiltonian's unit cell: dense letters starting at the cell's
/// site 0 (e.g. "ZZ", "X", "XIX"; first and last letters are never I) and a real coefficient. The
/// Hamiltonian is the sum of this term over all translations.
/// </summary>
public readonly record struct CellTerm(string Letters, double Coefficient)
{
    /// <summary>Number of sites the term spans.</summary>
    public int Span => Letters.Length;
}
