using OpGrowth.Exact;
using OpGrowth.Pauli;

namespace OpGrowth.Symmetry;

/// <summary>
/// What <see cref="SymmetryDiscovery"/> found for one Hamiltonian on one lattice, and how the level
/// statistics resolve it: the frame (a letter rotation that brings a conserved total to Z and makes H
/// real when it can), the sectors' generators, and every symmetry left unresolved.
/// </summary>
public sealed record SymmetryAnalysis
{
    /// <summary>Number of sites.</summary>
    public required int N { get; init; }

    /// <summary>The letter rotation applied to H before the sectors are built ("none" for the identity).</summary>
    public required LetterRotation Rotation { get; init; }

    /// <summary>H in the rotated frame.</summary>
    public required Hamiltonian Rotated { get; init; }

    /// <summary>Axes (X, Y, Z, in the model's own frame) whose total spin is conserved.</summary>
    public required IReadOnlyList<char> ConservedTotals { get; init; }

    /// <summary>
    /// True when total spin is resolved by multiplets: H conserves total X, Y and Z (SU(2)), or it does up to a
    /// uniform field along the conserved axis (then <see cref="Rotated"/> is H without that field).
    /// </summary>
    public bool SpinRotation { get; init; }

    /// <summary>True when H is real in the rotated frame: an anti-unitary symmetry (time reversal) exists.</summary>
    public required bool Real { get; init; }

    /// <summary>Generators of the group of conserved Pauli strings (model frame), low weight first.</summary>
    public required IReadOnlyList<PauliString> ConservedStrings { get; init; }

    /// <summary>True when all terms of H commute with each other.</summary>
    public required bool Commuting { get; init; }

    /// <summary>Site permutations (lattice translations and mirrors) that map H onto itself, by name.</summary>
    public required IReadOnlyList<string> Permutations { get; init; }

    /// <summary>Resolve total Z (in the rotated frame) into magnetisation sectors.</summary>
    public required bool ResolveTotalZ { get; init; }

    /// <summary>Commuting, independent generators of the abelian group resolved into characters (rotated frame).</summary>
    public required IReadOnlyList<SymmetryGenerator> Abelian { get; init; }

    /// <summary>The swap (an involution that maps the abelian group onto itself), or null.</summary>
    public SymmetryGenerator? Swap { get; init; }

    /// <summary>The spin flip resolved at zero magnetisation, or null.</summary>
    public SymmetryGenerator? HalfFillingFlip { get; init; }

    /// <summary>
    /// Unresolved site permutations that map the resolved group onto itself: they act on the sectors, and a
    /// sector they map onto itself is marked (<see cref="SymmetryBlock.MixedBy"/>) and left out of the
    /// statistics when enough clean sectors remain.
    /// </summary>
    public IReadOnlyList<SymmetryGenerator> Residual { get; init; } = [];

    /// <summary>What the sectors resolve, in words.</summary>
    public required IReadOnlyList<string> Resolved { get; init; }

    /// <summary>Symmetries found but not resolved (each biases &lt;r&gt; toward Poisson), in words.</summary>
    public required IReadOnlyList<string> Unresolved { get; init; }

    /// <summary>Notes for the report (why something was or was not resolved).</summary>
    public required IReadOnlyList<string> Notes { get; init; }

    /// <summary>
    /// Reference ensemble forced for every sector ("GOE", "GUE", "GSE"), or null to take each sector's own
    /// (Majorana models with only 4-fermion terms: by the number of Majoranas mod 8, You, Ludwig, Xu 2017).
    /// </summary>
    public string? ForcedEnsemble { get; init; }
}
