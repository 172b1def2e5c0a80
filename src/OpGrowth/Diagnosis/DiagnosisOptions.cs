using Microsoft.Extensions.Logging;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Settings of the diagnosis battery. Times and temperatures are given in units of the model's local
/// energy scale epsilon = sqrt(||H||^2 / N) (the root-mean-square energy per site, Pauli normalisation),
/// so one set of defaults fits every model. The defaults keep the whole battery on a 20-24 site model
/// within about ten minutes on two cores; <see cref="WithEffort"/> raises every budget together.
/// </summary>
public sealed record DiagnosisOptions
{
    /// <summary>Size of the smaller member of the family used for level statistics (test 1).</summary>
    public int LevelN { get; init; } = 12;

    /// <summary>Estimated-cost budget of the level statistics in seconds (the member size is chosen to fit it).</summary>
    public double LevelSeconds { get; init; } = 20;

    /// <summary>Largest symmetry block diagonalised in test 1.</summary>
    public int LevelMaxDimension { get; init; } = 4000;

    /// <summary>Disorder realisations for level statistics (disordered models only; the model's seed is stepped).</summary>
    public int LevelRealizations { get; init; } = 1;

    /// <summary>Size of the cluster on which local conserved quantities are searched (test 5).</summary>
    public int ClusterN { get; init; } = 10;

    /// <summary>Largest string weight k of the conserved-quantity search.</summary>
    public int MaxWeight { get; init; } = 2;

    /// <summary>Number of Lanczos coefficients requested (test 2).</summary>
    public int LanczosDepth { get; init; } = 24;

    /// <summary>Largest string budget per Krylov vector; a second run at a quarter of it gives the truncation uncertainty.</summary>
    public long LanczosMaxStrings { get; init; } = 200_000;

    /// <summary>Memory budget of one Lanczos run in bytes.</summary>
    public long LanczosMemoryBytes { get; init; } = 1L << 30;

    /// <summary>Work limit of the Lanczos recursion per probe, in seconds on <see cref="EffectiveThreads"/> threads, counted in processor time (see <see cref="WorkBudget"/>; the coefficients finished by then are used).</summary>
    public double LanczosSeconds { get; init; } = 60;

    /// <summary>String budget of the Heisenberg evolution (tests 3 and 4).</summary>
    public long EvolutionMaxStrings { get; init; } = 1L << 16;

    /// <summary>Final time of the Heisenberg evolution (and of the exact operator-size series), in units of 1/(motion scale), see <see cref="OperatorAlgebra.MotionScale"/>; in periods for a drive.</summary>
    public double EvolutionTime { get; init; } = 24;

    /// <summary>Time step of the Heisenberg evolution, in units of 1/(motion scale) (second-order Trotter).</summary>
    public double EvolutionStep { get; init; } = 0.1;

    /// <summary>Work limit of the main probe's evolution in seconds on <see cref="EffectiveThreads"/> threads, counted in processor time (see <see cref="WorkBudget"/>); the records finished by then are used.</summary>
    public double EvolutionSeconds { get; init; } = 150;

    /// <summary>Size of the smaller member whose operator size is computed exactly (test 3).</summary>
    public int SizeN { get; init; } = 12;

    /// <summary>Time points of the exact operator-size series.</summary>
    public int SizeTimePoints { get; init; } = 25;

    /// <summary>Size of the smaller member used at finite temperature (test 6).</summary>
    public int ThermalN { get; init; } = 12;

    /// <summary>Further sizes at which the low-temperature plateau is measured (its N dependence); empty: only <see cref="ThermalN"/>.</summary>
    public IReadOnlyList<int> ThermalExtraSizes { get; init; } = [];

    /// <summary>Inverse temperatures in units of 1/epsilon (beta epsilon).</summary>
    public IReadOnlyList<double> BetaEpsilon { get; init; } = [0.5, 1, 2];

    /// <summary>Last time of the finite-temperature series, in units of 1/epsilon.</summary>
    public double ThermalTime { get; init; } = 10;

    /// <summary>Points of the finite-temperature time grid.</summary>
    public int ThermalTimePoints { get; init; } = 41;

    /// <summary>Random states per finite-temperature estimate (typicality).</summary>
    public int ThermalSamples { get; init; } = 6;

    /// <summary>
    /// Estimated-cost limit of test 6 in seconds (all temperatures): when the typicality estimate exceeds
    /// it, fewer random states are used (at least 2), and the report says so.
    /// </summary>
    public double ThermalSeconds { get; init; } = 240;

    /// <summary>Tests to skip (numbers 1..6).</summary>
    public IReadOnlySet<int> Skip { get; init; } = new HashSet<int>();

    /// <summary>Worker threads (0 = all cores).</summary>
    public int Threads { get; init; }

    /// <summary>Seed of all random states.</summary>
    public int Seed { get; init; } = 1;

    /// <summary>Progress log.</summary>
    public ILogger? Logger { get; init; }

    /// <summary>Threads actually used.</summary>
    public int EffectiveThreads => Threads > 0 ? Threads : Environment.ProcessorCount;

    /// <summary>
    /// Raises (effort &gt; 1) or lowers (effort &lt; 1) every budget together: string budgets and samples scale
    /// with the effort, the Lanczos depth and the evolution time with its square root, the small sizes by
    /// 2 log2(effort) sites (rounded to even).
    /// </summary>
    public DiagnosisOptions WithEffort(double effort)
    {
        if (!(effort > 0) || !double.IsFinite(effort)) throw new ArgumentOutOfRangeException(nameof(effort), effort, "Effort must be a positive number.");
        if (effort == 1) return this;
        int grow = 2 * (int)Math.Round(Math.Log2(effort));
        double root = Math.Sqrt(effort);
        return this with
        {
            LevelN = Math.Clamp(LevelN + grow, 6, 16),
            ClusterN = Math.Clamp(ClusterN + grow, 6, 14),
            SizeN = Math.Clamp(SizeN + grow, 6, 16),
            ThermalN = Math.Clamp(ThermalN + grow, 6, 18),
            LanczosDepth = Math.Max(8, (int)Math.Round(LanczosDepth * root)),
            LanczosMaxStrings = Math.Max(1000, (long)(LanczosMaxStrings * effort)),
            LanczosMemoryBytes = Math.Max(64L << 20, (long)(LanczosMemoryBytes * effort)),
            LanczosSeconds = LanczosSeconds * effort,
            EvolutionMaxStrings = Math.Max(1000, (long)(EvolutionMaxStrings * effort)),
            EvolutionTime = EvolutionTime * root,
            EvolutionSeconds = EvolutionSeconds * effort,
            ThermalSamples = Math.Max(1, (int)Math.Round(ThermalSamples * effort)),
            ThermalSeconds = ThermalSeconds * effort,
        };
    }

    /// <summary>The effort names every command accepts, cheapest first.</summary>
    public static readonly IReadOnlyList<string> EffortNames = ["quick", "standard", "thorough"];

    /// <summary>
    /// The battery of an effort (the same in <c>diagnose</c> and <c>run</c>): "quick" a first look in well
    /// under a minute for up to 24 sites on two cores, "standard" (the default) a few minutes, "thorough"
    /// larger members, deeper Lanczos and longer evolutions. Work is bounded by string budgets, depths, times
    /// and processor-time limits, so the verdict does not depend on how busy the machine is.
    /// </summary>
    public static DiagnosisOptions For(string effort) => effort switch
    {
        "quick" => new DiagnosisOptions
        {
            LevelN = 10, LevelSeconds = 8, ClusterN = 8, SizeN = 8, SizeTimePoints = 17, ThermalN = 8, ThermalTimePoints = 21,
            ThermalSamples = 1, BetaEpsilon = [1], ThermalSeconds = 8, LanczosDepth = 16, LanczosMaxStrings = 20_000,
            LanczosMemoryBytes = 256L << 20, LanczosSeconds = 6, EvolutionMaxStrings = 20_000, EvolutionTime = 10, EvolutionSeconds = 12,
        },
        "standard" => new DiagnosisOptions
        {
            LevelN = 12, LevelSeconds = 20, ClusterN = 10, SizeN = 10, SizeTimePoints = 25, ThermalN = 10, ThermalTimePoints = 31,
            ThermalSamples = 3, BetaEpsilon = [0.5, 2], ThermalSeconds = 60, LanczosDepth = 24, LanczosMaxStrings = 200_000,
            LanczosMemoryBytes = 1L << 30, LanczosSeconds = 40, EvolutionMaxStrings = 50_000, EvolutionTime = 12, EvolutionSeconds = 60,
        },
        "thorough" => new DiagnosisOptions
        {
            LevelN = 14, LevelSeconds = 120, ClusterN = 12, SizeN = 14, SizeTimePoints = 33, ThermalN = 12, ThermalTimePoints = 41,
            ThermalSamples = 6, BetaEpsilon = [0.5, 1, 2], ThermalSeconds = 400, LanczosDepth = 32, LanczosMaxStrings = 2_000_000,
            LanczosMemoryBytes = 4L << 30, LanczosSeconds = 300, EvolutionMaxStrings = 1_000_000, EvolutionTime = 24, EvolutionSeconds = 900,
        },
        _ => throw new ArgumentOutOfRangeException(nameof(effort), effort, $"Expected one of {string.Join(", ", EffortNames)}."),
    };

    /// <summary>A reduced battery for tests and quick looks (small sizes, small budgets).</summary>
    public static DiagnosisOptions Quick => new()
    {
        LevelN = 10,
        ClusterN = 8,
        SizeN = 8,
        LanczosDepth = 16,
        LanczosMaxStrings = 20_000,
        EvolutionMaxStrings = 20_000,
        EvolutionTime = 16,
        EvolutionStep = 0.1,
        ThermalN = 8,
        ThermalTimePoints = 31,
        ThermalSamples = 2,
    };
}
