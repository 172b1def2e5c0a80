using Microsoft.Extensions.Logging;

namespace OpGrowth.Pipeline;

/// <summary>How much work the run spends: evolution time and string budget, budgets in the budget series, Lanczos depth.</summary>
public enum RunEffort
{
    /// <summary>Seconds: a short evolution with a small budget (tests, a first look).</summary>
    Quick,
    /// <summary>A few minutes on a 2-core laptop for the shipped demo.</summary>
    Standard,
    /// <summary>Larger budgets, longer times, deeper recursion.</summary>
    Thorough,
}

/// <summary>The numbers an <see cref="RunEffort"/> stands for (see <see cref="EffortPreset.For"/>).</summary>
public sealed record EffortPreset(
    double Time, double Dt, int Budgets, long MaxStrings, int LanczosDepth, long[] LanczosBudgets, int ExactN, double ExactTime)
{
    /// <summary>The preset of an effort level.</summary>
    public static EffortPreset For(RunEffort effort) => effort switch
    {
        RunEffort.Quick => new(3, 0.1, 2, 20_000, 12, [4_000, 16_000], 6, 2),
        RunEffort.Thorough => new(14, 0.05, 3, 2_000_000, 40, [250_000, 1_000_000], 10, 4),
        _ => new(6, 0.1, 3, 100_000, 24, [25_000, 100_000], 8, 3),
    };
}

/// <summary>Options of <see cref="ScramblingRun.Execute"/>.</summary>
public sealed record ScramblingRunOptions
{
    /// <summary>The shipped demo's lead candidate, run when no model is given.</summary>
    public const string DefaultModel = "demo/tilted-chain";

    /// <summary>Model file or shipped model name (null: <see cref="DefaultModel"/>).</summary>
    public string? Model { get; init; }
    /// <summary>Parameter overrides (NAME -> VALUE), as from --set.</summary>
    public IReadOnlyDictionary<string, string> Overrides { get; init; } = new Dictionary<string, string>();
    /// <summary>The operator to evolve, as --probe gives it: a model probe index or a Pauli string (null: the model's first probe).</summary>
    public string? Probe { get; init; }
    /// <summary>Report folder (null: ./opgrowth-report/&lt;model name&gt;).</summary>
    public string? OutputFolder { get; init; }
    public RunEffort Effort { get; init; } = RunEffort.Standard;
    /// <summary>Memory budget in bytes for the evolution and the recursion (null: the engines' defaults).</summary>
    public long? MemoryBytes { get; init; }
    public int Threads { get; init; } = Environment.ProcessorCount;
    public bool RunExact { get; init; } = true;
    public bool RunLanczos { get; init; } = true;
    /// <summary>Run the diagnosis battery (bounded by the effort; see <see cref="RunStages.DiagnosisFor"/>).</summary>
    public bool RunDiagnosis { get; init; } = true;
    /// <summary>Diagnosis settings (null: the effort's, from <see cref="RunStages.DiagnosisFor"/>).</summary>
    public OpGrowth.Diagnosis.DiagnosisOptions? Diagnosis { get; init; }
    /// <summary>Final time of every t*(N) point (null: chosen from the main run's t*, at least the effort's time).</summary>
    public double? SweepTime { get; init; }
    /// <summary>
    /// Measure t* at the model's own N with the exact engine even when its estimated cost exceeds the effort's budget
    /// (the estimate is logged before it starts; the thorough effort always does).
    /// </summary>
    public bool ExactScramblingTime { get; init; }
    /// <summary>
    /// Estimated exact-engine seconds the t* statement may spend unasked (null: the effort's, see
    /// <see cref="ScramblingTimeStage.ExactBudgetSeconds"/>; 0: only when forced). Lets tests fix the route.
    /// </summary>
    public double? ExactScramblingTimeBudget { get; init; }
    /// <summary>System sizes for a t*(N) sweep (empty: no sweep).</summary>
    public IReadOnlyList<int> SweepSizes { get; init; } = [];
    /// <summary>Final evolution time (null: the effort's); for a periodic drive, the number of periods.</summary>
    public double? Time { get; init; }
    /// <summary>Largest tolerated |Pauli - exact| in the cross-check (both engines are exact to rounding there).</summary>
    public double CrossCheckTolerance { get; init; } = 1e-6;
    public ILogger? Logger { get; init; }
    /// <summary>Logger for the diagnosis battery's own lines (null: <see cref="Logger"/>).</summary>
    public ILogger? DiagnosisLogger { get; init; }
    public IProgress<RunProgress>? Progress { get; init; }
}

/// <summary>Progress of the pipeline: the stage, its fraction done (0..1) and a short detail.</summary>
public readonly record struct RunProgress(string Stage, double Fraction, string Detail, TimeSpan? Remaining = null);
