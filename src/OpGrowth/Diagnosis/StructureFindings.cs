namespace OpGrowth.Diagnosis;

/// <summary>What test 7 (term structure) found about the Hamiltonian's (or the drive's) terms.</summary>
public sealed record StructureFindings
{
    /// <summary>Number of terms (for a drive: distinct generators over all layers).</summary>
    public required int Terms { get; init; }

    /// <summary>Edges of the frustration graph (anticommuting pairs).</summary>
    public required int AnticommutingPairs { get; init; }

    /// <summary>True when every term commutes with every other.</summary>
    public required bool Commuting { get; init; }

    /// <summary>Independent conserved Pauli strings (generators of their group) at the full size.</summary>
    public required int ConservedStrings { get; init; }

    /// <summary>How many of them have weight at most 4 (local conserved strings).</summary>
    public required int LocalConservedStrings { get; init; }

    /// <summary>Examples of conserved strings, low weight first.</summary>
    public required IReadOnlyList<string> ConservedExamples { get; init; }

    /// <summary>"line graph", "claw-free with a simplicial clique", "claw-free", "claw", or "not decided".</summary>
    public required string GraphClass { get; init; }

    /// <summary>The claw found (centre term anticommuting with three mutually commuting terms), when there is one.</summary>
    public IReadOnlyList<string>? Claw { get; init; }

    /// <summary>For a line graph: number of Majorana modes of the root graph.</summary>
    public int? MajoranaModes { get; init; }

    /// <summary>For a line graph: the smallest single-particle energy.</summary>
    public double? SingleParticleMin { get; init; }

    /// <summary>For a line graph: the largest single-particle energy.</summary>
    public double? SingleParticleMax { get; init; }

    /// <summary>For a line graph: the first terms with their Majorana pairs (a, b), "i g_a g_b".</summary>
    public IReadOnlyList<string> MajoranaMap { get; init; } = [];

    /// <summary>Remarks (sectors of the free-fermion solution, budget limits).</summary>
    public IReadOnlyList<string> Notes { get; init; } = [];
}
