using OpGrowth.Exact;

namespace OpGrowth.Diagnosis;

/// <summary>What test 1 (level statistics) measured.</summary>
public sealed record LevelFindings
{
    /// <summary>System size of the smaller member used.</summary>
    public required int N { get; init; }

    /// <summary>Pooled mean gap ratio &lt;r&gt;.</summary>
    public required double MeanRatio { get; init; }

    /// <summary>Its error bar.</summary>
    public required double Error { get; init; }

    /// <summary>How the error bar was computed.</summary>
    public required string ErrorKind { get; init; }

    /// <summary>Number of gap ratios.</summary>
    public required int Gaps { get; init; }

    /// <summary>"GOE" (real blocks) or "GUE".</summary>
    public required string WignerDysonClass { get; init; }

    /// <summary>Reference value of that class.</summary>
    public required double WignerDysonRatio { get; init; }

    /// <summary>Poisson value.</summary>
    public required double PoissonRatio { get; init; }

    /// <summary>Midpoint between Poisson and the Wigner-Dyson value.</summary>
    public double Midpoint => (PoissonRatio + WignerDysonRatio) / 2;

    /// <summary>(r - midpoint) / error.</summary>
    public double SigmasFromMidpoint => (MeanRatio - Midpoint) / Error;

    /// <summary>(r - Poisson) / error.</summary>
    public double SigmasFromPoisson => (MeanRatio - PoissonRatio) / Error;

    /// <summary>(r - Wigner-Dyson) / error.</summary>
    public double SigmasFromWignerDyson => (MeanRatio - WignerDysonRatio) / Error;

    /// <summary>Symmetries resolved into sectors ("total spin" when SU(2) multiplets were separated).</summary>
    public required IReadOnlyList<string> Resolved { get; init; }

    /// <summary>Symmetries H has that were not resolved (they bias &lt;r&gt; toward Poisson).</summary>
    public required IReadOnlyList<string> Unresolved { get; init; }

    /// <summary>Per-sector statistics (first realisation).</summary>
    public required IReadOnlyList<SectorStatistics> Sectors { get; init; }

    /// <summary>Warnings from the exact engine and from this test.</summary>
    public required IReadOnlyList<string> Warnings { get; init; }

    /// <summary>Disorder realisations pooled.</summary>
    public required int Realizations { get; init; }

    /// <summary>Conserved totals found ("total Z", ...).</summary>
    public IReadOnlyList<string> ConservedTotals { get; init; } = [];

    /// <summary>Number of independent conserved Pauli strings found (generators of their group).</summary>
    public int ConservedStrings { get; init; }

    /// <summary>Some of them, low weight first.</summary>
    public IReadOnlyList<string> ConservedStringExamples { get; init; } = [];

    /// <summary>True when every term of H commutes with every other.</summary>
    public bool Commuting { get; init; }

    /// <summary>Sum over the sectors of dimension times multiplicity (equals <see cref="FullDimension"/> when no level is lost or counted twice).</summary>
    public long DimensionCovered { get; init; }

    /// <summary>Dimension of the full space, 2^N.</summary>
    public long FullDimension { get; init; }

    /// <summary>Size of the member used, in the model's own unit ("12 sites", "16 Majoranas").</summary>
    public string SizeMeasure { get; init; } = "";
}
