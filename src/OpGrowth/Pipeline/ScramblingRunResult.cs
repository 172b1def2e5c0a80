using OpGrowth.Analysis;
using OpGrowth.Evolution;
using OpGrowth.Exact;
using OpGrowth.Krylov;
using OpGrowth.Models;
using OpGrowth.Reporting;

namespace OpGrowth.Pipeline;

/// <summary>Pauli engine (no truncation) against the exact state-vector engine at a small N of the same family.</summary>
public sealed record CrossCheck
{
    public bool Ran { get; init; }
    /// <summary>Why it did not run (null when it ran).</summary>
    public string? SkipReason { get; init; }
    public int N { get; init; }
    public string Probe { get; init; } = "";
    public double[] Times { get; init; } = [];
    public double[] PauliAutocorrelation { get; init; } = [];
    public double[] ExactAutocorrelation { get; init; } = [];
    /// <summary>max over times, sites j and P in {X, Y, Z} of |F_P,j(Pauli) - F_P,j(exact)|.</summary>
    public double MaxOtocDifference { get; init; }
    /// <summary>max over times of |C(Pauli) - C(exact)|.</summary>
    public double MaxAutocorrelationDifference { get; init; }
    public double Tolerance { get; init; }
    /// <summary>OTOCs F_j(t) against X_j, Y_j, Z_j from both engines, per site.</summary>
    public IReadOnlyList<SiteComparison> Sites { get; init; } = [];
    public bool Passed => Ran && MaxOtocDifference <= Tolerance && MaxAutocorrelationDifference <= Tolerance;
    public string ExactMethod { get; init; } = "";
}

/// <summary>One site's OTOCs F(t) against X_j, Y_j and Z_j from the Pauli engine and the exact engine.</summary>
public sealed record SiteComparison(int Site, double[] PauliX, double[] ExactX, double[] PauliY, double[] ExactY, double[] PauliZ, double[] ExactZ);

/// <summary>Everything a <see cref="ScramblingRun"/> produced (stages that did not run are null).</summary>
public sealed record ScramblingRunResult
{
    public required Model Model { get; init; }
    public required string ModelFile { get; init; }
    public required string Folder { get; init; }
    public required ScramblingRunOptions Options { get; init; }
    public required EffortPreset Preset { get; init; }
    /// <summary>The evolution inputs exactly as given to <see cref="OperatorEvolution.Run"/>.</summary>
    public required EvolutionProblem Problem { get; init; }
    public required EvolutionOptions EvolutionOptions { get; init; }
    public required LatticeGeometry Geometry { get; init; }
    public EvolutionResult? Evolution { get; init; }
    public LanczosOptions? LanczosOptions { get; init; }
    public LanczosEstimate? Lanczos { get; init; }
    public KrylovAnalysis? Krylov { get; init; }
    public CrossCheck? CrossCheck { get; init; }
    /// <summary>The diagnosis battery's report (null when it did not run).</summary>
    public OpGrowth.Diagnosis.DiagnosisReport? Diagnosis { get; init; }
    /// <summary>Why the diagnosis did not run (null when it ran).</summary>
    public string? DiagnosisSkipReason { get; init; }
    /// <summary>The scrambling-time statement at the model's own N (null when the stage did not run).</summary>
    public OpGrowth.Sweeps.ScramblingTimeStatement? ScramblingTime { get; init; }
    /// <summary>The front engine's budget series, when the t* statement used it (chains).</summary>
    public FrontStage? Front { get; init; }
    /// <summary>Free-fermion figures instead of a scrambling time, when the battery finds the model free (null otherwise).</summary>
    public FreeFermionStage? FreeFermion { get; init; }
    /// <summary>The t*(N) stage (null when no sweep was requested or it did not start).</summary>
    public SweepStage? Sweep { get; init; }
    /// <summary>The overall answer, consistent with the diagnosis battery when it ran.</summary>
    public RunVerdict? Verdict { get; init; }
    public IReadOnlyList<HeadlineFigure> Headlines { get; init; } = [];
    public IReadOnlyList<VerdictRow> Verdicts { get; init; } = [];
    public IReadOnlyList<CheckRow> Checks { get; init; } = [];
    /// <summary>Every file written, relative to <see cref="Folder"/>.</summary>
    public IReadOnlyList<string> Files { get; init; } = [];
    public int FigureCount { get; init; }
    public IReadOnlyDictionary<string, double> TimingsSeconds { get; init; } = new Dictionary<string, double>();
    /// <summary>False when the run was interrupted or a stage stopped at a resource limit.</summary>
    public bool Completed { get; init; }
    public string? StopReason { get; init; }
    public bool Cancelled { get; init; }
    public IReadOnlyList<string> Notes { get; init; } = [];
}
