using System.Diagnostics;
using System.Globalization;
using System.Text;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// Entry point of the Heisenberg-picture engine: O(t) = e^{iHt} O e^{-iHt} (or U^dagger O U per
/// period for drives) in the Pauli-string basis, with truncation, checkpoints, the budget series
/// and the derived scrambling figures.
/// </summary>
public static class OperatorEvolution
{
    /// <summary>Runs every budget of the budget series (smallest first) and derives the figures.</summary>
    public static EvolutionResult Run(EvolutionProblem problem, EvolutionOptions options, LatticeGeometry? geometry = null,
        ILogger? logger = null, IProgress<EvolutionProgress>? progress = null, CancellationToken ct = default,
        ScramblingAnalysisOptions? analysis = null)
    {
        Validate(problem, options);
        var wall = Stopwatch.StartNew();
        var budgets = ResolveBudgets(problem, options, out var notes);
        var series = new EvolutionSeries?[budgets.Count];
        string? stop = null;
        bool limited = false;
        int groups = 0;
        for (int k = 0; k < budgets.Count; k++)
        {
            int r = budgets.Count - 1 - k; // coarsest first
            var budget = budgets[r];
            ulong fp = Fingerprint(problem, options, budget);
            logger?.LogInformation("budget {Index}/{Count}: {Budget}", k + 1, budgets.Count, Describe(budget));
            var func = new BudgetFunc(problem, options, budget, fp, logger, progress, ct, k, budgets.Count);
            var (s, g) = PauliWidth.Dispatch<(EvolutionSeries, int), BudgetFunc>(problem.N, func);
            series[r] = s;
            groups = g;
            if (!s.Completed)
            {
                stop = s.StopReason;
                limited = s.StopReason is not null && s.StopReason != "interrupted";
                break;
            }
        }
        var ran = series.Where(s => s is not null).Select(s => s!).ToList();
        // Keep full-budget-first order; a series stopped early may lack the larger budgets.
        var probeSites = ProbeSites(problem);
        var figures = ran.Select(s => ScramblingAnalysis.Analyze(InputOf(s, problem, probeSites, geometry), analysis)).ToList();
        var convergence = ran.Count > 1 && ran[0].Budget.Index == 0
            ? BudgetConvergence.Compare(figures, options.ConvergenceTolerance)
            : new List<FigureConvergence>();
        return new EvolutionResult
        {
            Model = problem.Name,
            N = problem.N,
            Initial = string.Join(" + ", problem.Initial.Select(t => t.Coefficient == 1 ? t.String.ToString() : $"{t.Coefficient.ToString("R", CultureInfo.InvariantCulture)} {t.String}")),
            ProbeSites = probeSites,
            Dynamics = problem.Drive is not null ? "periodic drive" : "hamiltonian",
            Method = problem.Drive is not null ? "exact layers" : options.Method.ToString().ToLowerInvariant(),
            Groups = groups,
            SizeMeasure = problem.CountMajoranas ? "qubits and Majoranas (Jordan-Wigner with X strings)" : "qubits",
            Runs = ran,
            Figures = figures,
            Convergence = convergence,
            Completed = stop is null && ran.Count == budgets.Count,
            StopReason = stop,
            ResourceLimited = limited,
            Notes = notes,
            WallSeconds = wall.Elapsed.TotalSeconds,
        };
    }

    /// <summary>The scrambling input of one series.</summary>
    public static ScramblingInput InputOf(EvolutionSeries s, EvolutionProblem problem, int[] probeSites, LatticeGeometry? geometry)
        => new()
        {
            N = problem.N,
            Times = s.Records.Select(r => r.Time).ToArray(),
            MeanSize = s.Records.Select(r => r.MeanSize).ToArray(),
            SiteWeights = s.Records.Select(r => r.SiteWeights).ToArray(),
            ProbeSites = probeSites,
            Geometry = geometry,
            MeanMajoranaSize = problem.CountMajoranas ? s.Records.Select(r => r.MeanMajoranaSize ?? double.NaN).ToArray() : null,
        };

    /// <summary>Union of the supports of the initial strings.</summary>
    public static int[] ProbeSites(EvolutionProblem problem)
        => problem.Initial.SelectMany(t => t.String.Support()).Distinct().Order().ToArray();

    /// <summary>Largest number of steps (or periods) one run may take: beyond it the run would not end in any useful time.</summary>
    public const long MaxSteps = 100_000_000;

    /// <summary>Throws an <see cref="InputException"/> when <paramref name="time"/> / <paramref name="step"/> exceeds <see cref="MaxSteps"/>.</summary>
    public static void CheckSteps(double time, double step)
    {
        double steps = Math.Ceiling(time / step - 1e-9);
        if (!(steps <= MaxSteps))
        {
            throw new InputException(FormattableString.Invariant(
                $"--time {time:G4} with a step of {step:G4}: found {steps:G3} steps; expected at most {MaxSteps:N0} (shorten --time or lengthen --dt)"));
        }
    }

    private static void Validate(EvolutionProblem p, EvolutionOptions o)
    {
        if (p.N < 1 || p.N > PauliWidth.MaxQubits) throw new InputException($"the model has {p.N} qubits; expected 1..{PauliWidth.MaxQubits}");
        if (p.Drive is null && p.Hamiltonian is null) throw new InputException("the model has neither a Hamiltonian nor a periodic drive");
        if (p.Hamiltonian is not null && p.Hamiltonian.N != p.N) throw new InputException($"the Hamiltonian acts on {p.Hamiltonian.N} qubits; expected {p.N}");
        foreach (var t in p.Initial)
        {
            if (t.String.N != p.N) throw new InputException($"the initial operator '{t.String}' acts on {t.String.N} qubits; expected {p.N}");
        }
        if (p.Drive is not null && !(p.Drive.Period > 0 && double.IsFinite(p.Drive.Period))) throw new InputException($"drive period {p.Drive.Period}; expected a positive number");
        if (p.Drive is null && !(o.Dt > 0 && double.IsFinite(o.Dt))) throw new InputException($"--dt {o.Dt}; expected a positive time step");
        if (!(o.Time >= 0 && double.IsFinite(o.Time))) throw new InputException($"--time {o.Time}; expected a non-negative final time");
        CheckSteps(o.Time, p.Drive?.Period ?? o.Dt);
        if (o.RecordEvery < 1) throw new InputException($"--record-every {o.RecordEvery}; expected at least 1");
        if (o.BudgetCount is < 1 or > 3) throw new InputException($"--budgets: found {o.BudgetCount}; expected 1, 2 or 3");
        if (o.Threads < 1) throw new InputException($"--threads {o.Threads}; expected at least 1");
        var tp = o.Truncation;
        if (!(tp.Threshold >= 0 && double.IsFinite(tp.Threshold))) throw new InputException($"--threshold {tp.Threshold}; expected a non-negative number");
        if (tp.MaxStrings is long m && m < 1) throw new InputException($"--max-strings {m}; expected at least 1");
        if (tp.MaxSize is int k && k < 1) throw new InputException($"--max-size {k}; expected at least 1");
        if (!(tp.DampingRate >= 0 && double.IsFinite(tp.DampingRate))) throw new InputException($"damping rate {tp.DampingRate}; expected a non-negative number");
        if (tp.DampingMinSize < 0) throw new InputException($"damping size l* = {tp.DampingMinSize}; expected a non-negative integer");
        if (tp.MemoryBytes is long mb && mb < (160L << 20)) throw new InputException($"--memory {MemoryBudget.Format(mb)}; expected at least 160 MiB");
        if (!(tp.PassPruneFraction >= 0 && tp.PassPruneFraction <= 1)) throw new InputException($"pass prune fraction {tp.PassPruneFraction}; expected 0..1");
    }

    /// <summary>Resolves the truncation knobs of every budget (index 0 = full budget).</summary>
    internal static List<SeriesBudget> ResolveBudgets(EvolutionProblem problem, EvolutionOptions options, out List<string> notes)
    {
        var tp = options.Truncation;
        long memory = tp.MemoryBytes ?? MemoryBudget.DefaultBytes();
        long ceiling = MemoryBudget.MaxStringsFor(memory, problem.N, Math.Max(1, options.Threads));
        bool accuracyRule = tp.Threshold > 0 || tp.MaxSize is not null || tp.DampingRate > 0;
        long? m;
        if (tp.MaxStrings is long ms)
        {
            if (ms > ceiling)
            {
                throw new ResourceLimitException(
                    $"--max-strings {ms:N0} needs about {MemoryBudget.Format((long)(ms * MemoryBudget.BytesPerString(problem.N)) + MemoryBudget.RuntimeReserve)} on {problem.N} qubits; the memory budget {MemoryBudget.Format(memory)} holds {ceiling:N0} strings. Lower --max-strings or raise --memory");
            }
            m = ms;
        }
        else if (tp.MemoryBytes is not null || !accuracyRule) m = ceiling;
        else m = null;

        notes = [];
        if (m is not null) notes.Add($"top-M truncation (M = {m:N0} strings{(tp.MaxStrings is null ? $", from the memory budget {MemoryBudget.Format(memory)}" : "")}): removes the weakest coefficients once the operator has spread; late-time size distribution, saturation and t* shift with the budget when much weight is discarded (compare the budget series).");
        if (tp.Threshold > 0) notes.Add($"coefficient threshold {tp.Threshold:g3}: removes small coefficients of long, late strings first; late-time mean size and plateau biased low, the front little affected while its coefficients exceed the threshold.");
        if (tp.MaxSize is int k) notes.Add($"size cap {k}: suppresses size growth by construction; mean size, growth rates and saturation are biased low (t* late) and the size can never exceed {k}.");
        if (tp.DampingRate > 0) notes.Add($"DAOE damping gamma = {tp.DampingRate:g3} above size l* = {tp.DampingMinSize} (Rakovszky, von Keyserlingk, Pollmann, PRB 105, 075131 (2022)): keeps short-string autocorrelations, suppresses long strings; mean size, OTOCs and the front biased low once strings longer than l* matter.");
        if (m is null && !accuracyRule) notes.Add("no truncation: exact up to rounding.");
        if (m is null) notes.Add($"memory ceiling {ceiling:N0} strings ({MemoryBudget.Format(memory)}): if the requested accuracy needs more, the run stops with exit code 3 and keeps its partial results.");

        int count = options.BudgetCount;
        bool anyKnob = m is not null || accuracyRule;
        if (!anyKnob && count > 1)
        {
            notes.Add("the budget series was skipped: nothing is truncated, so there is no budget to vary.");
            count = 1;
        }
        var list = new List<SeriesBudget>();
        for (int r = 0; r < count; r++)
        {
            double f = Math.Pow(2, r);
            list.Add(new SeriesBudget(
                r,
                tp.Threshold * f,
                m is long mm ? Math.Max(1, (long)(mm / f)) : null,
                tp.MaxSize is int kk ? Math.Max(1, kk - 2 * r) : null,
                tp.DampingRate * f,
                tp.DampingMinSize,
                memory));
        }
        if (count > 1) notes.Add($"budget series: {count} budgets (full, half{(count > 2 ? ", quarter" : "")}: strings /2, threshold x2, damping x2, size cap -2 per budget); each figure's truncation uncertainty is its movement between the two largest budgets.");
        return list;
    }

    private static string Describe(SeriesBudget b)
    {
        var parts = new List<string>();
        if (b.MaxStrings is long m) parts.Add($"max strings {m:N0}");
        if (b.Threshold > 0) parts.Add($"threshold {b.Threshold:g3}");
        if (b.MaxSize is int k) parts.Add($"max size {k}");
        if (b.DampingRate > 0) parts.Add($"damping {b.DampingRate:g3}@{b.DampingMinSize}");
        parts.Add($"memory {MemoryBudget.Format(b.MemoryBytes)}");
        return string.Join(", ", parts);
    }

    /// <summary>A hash of everything that determines the numbers of one budget's run (not the thread count, the final time or checkpoint settings).</summary>
    internal static ulong Fingerprint(EvolutionProblem p, EvolutionOptions o, SeriesBudget b)
    {
        var sb = new StringBuilder();
        var inv = CultureInfo.InvariantCulture;
        sb.Append("N=").Append(p.N).Append(';');
        if (p.Drive is not null)
        {
            sb.Append("drive period=").Append(p.Drive.Period.ToString("R", inv)).Append(';');
            foreach (var layer in p.Drive.Layers)
            {
                sb.Append('[');
                foreach (var r in layer) sb.Append(r.Generator.ToDenseString()).Append(':').Append(r.Angle.ToString("R", inv)).Append(',');
                sb.Append(']');
            }
        }
        else
        {
            foreach (var t in p.Hamiltonian!.Terms) sb.Append(t.String.ToDenseString()).Append(':').Append(t.Coefficient.ToString("R", inv)).Append(',');
            sb.Append("method=").Append(o.Method).Append(";dt=").Append(o.Dt.ToString("R", inv)).Append(';');
        }
        foreach (var t in p.Initial) sb.Append("init ").Append(t.String.ToDenseString()).Append(':').Append(t.Coefficient.ToString("R", inv)).Append(';');
        sb.Append("rec=").Append(o.RecordEvery).Append(";maj=").Append(p.CountMajoranas).Append(';');
        sb.Append("budget=").Append(b.Index).Append(";thr=").Append(b.Threshold.ToString("R", inv)).Append(";m=").Append(b.MaxStrings)
          .Append(";k=").Append(b.MaxSize).Append(";g=").Append(b.DampingRate.ToString("R", inv)).Append(";l=").Append(b.DampingMinSize)
          .Append(";mem=").Append(b.MemoryBytes).Append(";prune=").Append(o.Truncation.PassPruneFraction.ToString("R", inv));
        var c = new Checksum64();
        c.Append(Encoding.UTF8.GetBytes(sb.ToString()));
        return c.Value;
    }

    private readonly struct BudgetFunc(EvolutionProblem problem, EvolutionOptions options, SeriesBudget budget, ulong fingerprint,
        ILogger? logger, IProgress<EvolutionProgress>? progress, CancellationToken ct, int index, int count) : IWidthFunc<(EvolutionSeries, int)>
    {
        public (EvolutionSeries, int) Invoke<T>() where T : unmanaged, IPauliKey<T>
        {
            var engine = new EvolutionEngine<T>(problem, options, budget, fingerprint, logger, ct);
            return (engine.Run(index, count, progress, ct), engine.GroupCount);
        }
    }
}
