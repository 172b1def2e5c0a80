namespace OpGrowth.Diagnosis;

/// <summary>Mazur bound of one probe at the full size, and the conserved operators it comes from.</summary>
/// <param name="Probe">The probe (Pauli string).</param>
/// <param name="Bound">lim avg (A(t)|A)/(A|A) &gt;= Bound.</param>
/// <param name="Contributions">Per conserved operator: its label and its share of the bound.</param>
public sealed record MazurEntry(string Probe, double Bound, IReadOnlyList<MazurShare> Contributions);

/// <summary>One conserved operator's share of a Mazur bound.</summary>
/// <param name="Label">"H", "total Z", ...</param>
/// <param name="Share">(Q|A)^2 / ((Q|Q)(A|A)).</param>
public sealed record MazurShare(string Label, double Share);

/// <summary>One conserved operator found, with its class.</summary>
/// <param name="Class">"the Hamiltonian", "conserved total (U(1) symmetry)", "symmetry algebra (...)" or "local charge outside the symmetry algebra (integrability)".</param>
/// <param name="Operator">Its strongest terms.</param>
public sealed record ConservedCharge(string Class, string Operator);

/// <summary>What test 5 (conserved quantities) measured.</summary>
public sealed record ConservedFindings
{
    /// <summary>Cluster size of the search.</summary>
    public required int ClusterN { get; init; }

    /// <summary>Largest string weight searched (translation-invariant mode: largest word length).</summary>
    public required int MaxWeight { get; init; }

    /// <summary>"cluster" (local strings on a small cluster) or "translation-invariant" (densities on a ring from the chain's unit cell).</summary>
    public string Mode { get; init; } = "cluster";

    /// <summary>Every conserved operator found with its class (recognised first).</summary>
    public IReadOnlyList<ConservedCharge> Charges { get; init; } = [];

    /// <summary>Number of strings searched.</summary>
    public required int SearchDimension { get; init; }

    /// <summary>Dimension of the conserved space found.</summary>
    public required int NullDimension { get; init; }

    /// <summary>True when H (restricted to weight &lt;= k) is among them.</summary>
    public required bool ContainsHamiltonian { get; init; }

    /// <summary>Recognised operators ("H", "total Z", ...).</summary>
    public required IReadOnlyList<string> Recognised { get; init; }

    /// <summary>Conserved directions not explained by H and the totals.</summary>
    public required int Unexplained { get; init; }

    /// <summary>One-line descriptions of every conserved operator found (recognised first).</summary>
    public required IReadOnlyList<string> Operators { get; init; }

    /// <summary>Smallest non-zero singular value of the commutator map relative to the largest (how clean the count is).</summary>
    public required double Gap { get; init; }

    /// <summary>Conserved operators verified at the full size and used for the Mazur bounds.</summary>
    public required IReadOnlyList<string> UsedAtFullSize { get; init; }

    /// <summary>Mazur bounds of the probes at the full size.</summary>
    public required IReadOnlyList<MazurEntry> Mazur { get; init; }

    /// <summary>The largest Mazur bound over the probes.</summary>
    public double LargestBound => Mazur.Count == 0 ? 0 : Mazur.Max(m => m.Bound);

    /// <summary>Bound of a given probe (0 when unknown).</summary>
    public double BoundOf(string probe) => Mazur.FirstOrDefault(m => m.Probe == probe)?.Bound ?? 0;
}
