using System.Diagnostics;
using System.Runtime.CompilerServices;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>
/// One evolution run (one budget of the budget series) at a fixed key width. Every step is a sequence of
/// passes over the operator (a commuting rotation group, a Liouvillian application), each followed
/// by one fused compaction that applies the truncation rules and books the removed weight.
/// All state that influences later numbers lives in <see cref="EngineState"/> and the operator
/// arrays, and both go into checkpoints, so a resumed run is bit-identical to an uninterrupted one.
/// </summary>
internal sealed class EvolutionEngine<T> where T : unmanaged, IPauliKey<T>
{
    private static readonly int EntryBytes = Unsafe.SizeOf<T>() + 8;

    private readonly EvolutionProblem _problem;
    private readonly EvolutionOptions _options;
    private readonly SeriesBudget _budget;
    private readonly ulong _fingerprint;
    private readonly ILogger? _logger;
    private readonly int _n;
    private int _threads;
    private readonly bool _floquet;
    private readonly double _stepTime;
    private readonly long _totalSteps;
    private readonly List<RotationGroup<T>> _groups = [];
    private readonly List<SplitStage> _periodStages = [];
    private readonly CompiledHamiltonian<T>? _compiled;
    private PassRunner<T> _runner;
    private Compactor<T> _compactor;
    private readonly Dictionary<(int, int, int, long), (double[] Cos, double[] Sin)> _trig = [];
    private readonly Dictionary<int, List<SplitStage>> _segments = [];
    private readonly Dictionary<int, double[]> _damping = [];
    private readonly T[] _initKeys;
    private readonly double[] _initCoeffs;
    private PassAccumulator<T>? _acc;
    /// <summary>
    /// The operator: source of every pass and, once the pass's image sits in the accumulator, the destination of
    /// its compaction (no second operator buffer; the source is dead by then).
    /// </summary>
    private readonly OperatorBuffer<T> _cur = new();
    private EngineState _state = new();
    private EvolutionSeries _series;

    public EvolutionEngine(EvolutionProblem problem, EvolutionOptions options, SeriesBudget budget, ulong fingerprint, ILogger? logger, CancellationToken ct = default)
    {
        _problem = problem;
        _options = options;
        _budget = budget;
        _fingerprint = fingerprint;
        _logger = logger;
        _n = problem.N;
        _threads = Math.Max(1, options.Threads);
        _runner = new PassRunner<T>(_threads);
        _compactor = new Compactor<T>(_threads);
        _series = new EvolutionSeries { Budget = budget };
        _floquet = problem.Drive is not null;
        if (_floquet)
        {
            var drive = problem.Drive!;
            _stepTime = drive.Period;
            // Heisenberg order: U^dagger O U with U = R_last ... R_first, so the latest rotation acts first.
            var keys = new List<T>();
            var weights = new List<double>();
            for (int l = drive.Layers.Count - 1; l >= 0; l--)
            {
                var layer = drive.Layers[l];
                for (int r = layer.Count - 1; r >= 0; r--)
                {
                    keys.Add(T.From(layer[r].Generator));
                    weights.Add(layer[r].Angle / 2); // theta = 2 * weight * 1
                }
            }
            var blocks = CommutingGroups.ConsecutiveBlocks(keys, weights);
            for (int b = 0; b < blocks.Count; b++)
            {
                _groups.Add(MergedGroup(blocks[b].Keys, blocks[b].Weights));
                _periodStages.Add(new SplitStage(b, 1.0, b == blocks.Count - 1 ? 1 : 0));
            }
            if (blocks.Count == 0) _periodStages.Add(new SplitStage(-1, 0, 1));
        }
        else
        {
            var h = problem.Hamiltonian ?? throw new InputException("the model has neither a Hamiltonian nor a periodic drive");
            _stepTime = options.Dt;
            if (options.Method is IntegrationMethod.Trotter2 or IntegrationMethod.Trotter4)
            {
                var keys = new List<T>();
                var weights = new List<double>();
                foreach (var t in h.Terms)
                {
                    if (t.String.IsIdentity) continue;
                    keys.Add(T.From(t.String));
                    weights.Add(t.Coefficient);
                }
                _groups.AddRange(CommutingGroups.Colour(_n, keys, weights, ct));
            }
            else
            {
                _compiled = h.Compile<T>();
            }
        }
        _totalSteps = Math.Max(0, (long)Math.Ceiling(options.Time / _stepTime - 1e-9));

        // O(0), normalised.
        var init = new PassAccumulator<T>(4);
        foreach (var t in problem.Initial) init.Add(T.From(t.String), t.Coefficient);
        var tmp = new OperatorBuffer<T>();
        new Compactor<T>(1).Compact(init, new CompactRule(0, int.MaxValue, long.MaxValue, null), tmp);
        double norm = Math.Sqrt(tmp.NormSquared());
        if (tmp.Count == 0 || norm == 0) throw new InputException("the initial operator is zero; expected at least one Pauli string with a nonzero coefficient");
        _initKeys = tmp.KeySpan.ToArray();
        _initCoeffs = tmp.CoeffSpan.ToArray();
        for (int i = 0; i < _initCoeffs.Length; i++) _initCoeffs[i] /= norm;
    }

    private RotationGroup<T> MergedGroup(List<T> keys, List<double> weights)
    {
        var order = new List<T>();
        var sum = new Dictionary<T, double>();
        for (int i = 0; i < keys.Count; i++)
        {
            if (sum.TryGetValue(keys[i], out double w)) sum[keys[i]] = w + weights[i];
            else
            {
                sum[keys[i]] = weights[i];
                order.Add(keys[i]);
            }
        }
        return new RotationGroup<T>(_n, order, order.Select(k => sum[k]).ToList());
    }

    /// <summary>Number of commuting groups (Trotter) or rotation blocks per period (drive).</summary>
    public int GroupCount => _groups.Count;

    /// <summary>Steps (periods) of the whole run.</summary>
    public long TotalSteps => _totalSteps;

    /// <summary>The current operator (for tests).</summary>
    public PauliOperator<T> Operator => _cur.ToOperator(_n);

    private string CheckpointPath => Path.Combine(_options.CheckpointDirectory!, $"checkpoint-budget{_budget.Index}.bin");

    /// <summary>Runs (or resumes) to the final time. Resource limits and cancellation end the run early with partial series.</summary>
    public EvolutionSeries Run(int runIndex, int runCount, IProgress<EvolutionProgress>? progress, CancellationToken ct)
    {
        var wall = Stopwatch.StartNew();
        double elapsedBefore = 0;
        if (_options.Resume && _options.CheckpointDirectory is not null && File.Exists(CheckpointPath))
        {
            Load(CheckpointPath);
            elapsedBefore = _state.ElapsedSeconds;
            _logger?.LogInformation("budget {Budget}: resumed from {Path} at step {Step} of {Total}", _budget.Index + 1, CheckpointPath, _state.Step, _totalSteps);
        }
        else
        {
            _cur.CopyFrom(_initKeys, _initCoeffs);
            _state = new EngineState { PartitionBits = PassAccumulator<T>.BitsFor(Math.Min(_budget.MaxStrings ?? 65536, 1L << 22)) };
            Record();
        }
        long stepsAtStart = _state.Step;
        var lastCheckpoint = Stopwatch.StartNew();
        int recordEvery = Math.Max(1, _options.RecordEvery);
        try
        {
            while (_state.Step < _totalSteps)
            {
                long next = Math.Min(_totalSteps, (_state.Step / recordEvery + 1) * recordEvery);
                int steps = _state.SegmentSteps > 0 ? _state.SegmentSteps : (int)(next - _state.Step);
                if (!Advance(steps, runIndex, runCount, progress, wall, stepsAtStart, ct))
                {
                    // Interrupted between two passes: the operator and the state agree there, so a checkpoint
                    // taken now resumes bit-identically (the segment continues from the same pass).
                    _state.ElapsedSeconds = elapsedBefore + wall.Elapsed.TotalSeconds;
                    if (_options.CheckpointDirectory is not null) Save(CheckpointPath);
                    throw new OperationCanceledException(ct);
                }
                Record();
                _state.ElapsedSeconds = elapsedBefore + wall.Elapsed.TotalSeconds;
                bool halt = _options.HaltAtStep is long h && _state.Step >= h;
                if (_options.CheckpointDirectory is not null
                    && (lastCheckpoint.Elapsed >= _options.CheckpointInterval || _state.Step == _totalSteps || halt))
                {
                    Save(CheckpointPath);
                    lastCheckpoint.Restart();
                }
                if (halt) throw new SimulatedKillException();
            }
            _series.Completed = true;
        }
        catch (ResourceLimitException ex)
        {
            _series.StopReason = ex.Message;
            _logger?.LogWarning("budget {Budget}: stopped at t = {Time}: {Reason}", _budget.Index + 1, _state.Records[^1].Time, ex.Message);
        }
        catch (OperationCanceledException)
        {
            _series.StopReason = "interrupted";
        }
        _state.ElapsedSeconds = elapsedBefore + wall.Elapsed.TotalSeconds;
        _series.Records.Clear();
        _series.Records.AddRange(_state.Records);
        _series.Steps.Clear();
        _series.Steps.AddRange(_state.Steps);
        _series.PeakStrings = _state.PeakStrings;
        _series.PeakTrackedBytes = _state.PeakTrackedBytes;
        _series.PeakHeapBytes = _state.PeakHeapBytes;
        _series.PeakWorkingSetBytes = Environment.WorkingSet > 0 ? System.Diagnostics.Process.GetCurrentProcess().PeakWorkingSet64 : 0;
        _series.PassRetries = _state.PassRetries;
        _series.Passes = _state.Passes;
        _series.ElapsedSeconds = _state.ElapsedSeconds;
        _series.StepsThisSession = _state.Step - stepsAtStart;
        _series.SessionSeconds = wall.Elapsed.TotalSeconds;
        return _series;
    }

    // ---------------------------------------------------------------- stepping

    /// <summary>Benchmark hook: starts from O(0) without recording or checkpoints.</summary>
    internal void Start()
    {
        _cur.CopyFrom(_initKeys, _initCoeffs);
        _state = new EngineState { PartitionBits = PassAccumulator<T>.BitsFor(Math.Min(_budget.MaxStrings ?? 65536, 1L << 22)) };
    }

    /// <summary>Benchmark hook: advances <paramref name="steps"/> steps (one segment); returns the strings held.</summary>
    internal int Step(int steps, CancellationToken ct = default)
    {
        if (!Advance(steps, 0, 1, null, Stopwatch.StartNew(), _state.Step, ct)) throw new OperationCanceledException(ct);
        return _cur.Count;
    }

    /// <summary>Benchmark hook: changes the worker count (results do not depend on it).</summary>
    internal void SetThreads(int threads)
    {
        _threads = threads;
        _runner = new PassRunner<T>(threads);
        _compactor = new Compactor<T>(threads);
    }

    /// <summary>Bytes held by the engine's arrays now.</summary>
    internal long HeldBytes => TrackedBytes;

    private long _compactTicks;
    private long _distinctTotal;
    private long _emittedTotal;

    /// <summary>Benchmark hook: contributions emitted and distinct strings accumulated, summed over all passes so far.</summary>
    internal (long Emitted, long Distinct) PassVolume => (_emittedTotal, _distinctTotal);

    /// <summary>Benchmark hook: seconds spent so far producing contributions, merging them, and compacting (wall clock).</summary>
    internal (double Produce, double Merge, double Compact) PhaseSeconds
        => (_runner.ProduceTicks / (double)Stopwatch.Frequency, _runner.MergeTicks / (double)Stopwatch.Frequency, _compactTicks / (double)Stopwatch.Frequency);

    /// <summary>Benchmark hook: bytes held by the operator, the accumulator (and its distinct strings and partition bits), and the emit buffers.</summary>
    internal (long Operator, long Accumulator, long Distinct, int Bits, long Buffers) HeldBreakdown
        => (_cur.AllocatedBytes, _acc?.AllocatedBytes ?? 0, _acc?.Count ?? 0, _acc?.PartitionBits ?? 0, _runner.BufferBytes);

    /// <summary>Benchmark hook: strings held now.</summary>
    internal int StringCount => _cur.Count;

    /// <summary>Benchmark hook: passes applied so far.</summary>
    internal long PassCount => _state.Passes;

    /// <summary>Benchmark hook: writes the operator and the engine state in the checkpoint format.</summary>
    internal void SaveState(string path) => Save(path);

    /// <summary>Benchmark hook: continues from a state written by <see cref="SaveState"/> (bit-identical continuation).</summary>
    internal void LoadState(string path) => Load(path);

    /// <summary>Benchmark hook: a checksum of the operator's keys and coefficients (equal for bit-identical operators).</summary>
    internal ulong OperatorChecksum()
    {
        var sum = new Checksum64();
        sum.Append(System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.KeySpan));
        sum.Append(System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.CoeffSpan));
        return sum.Value;
    }

    /// <summary>
    /// Advances one segment of <paramref name="steps"/> steps (between two records), pass by pass. Cancellation is
    /// honoured between passes only, where the operator and the state agree: the position inside the segment is
    /// kept in the state (and in a checkpoint), and a later call with the same segment continues from there.
    /// Returns false when interrupted.
    /// </summary>
    private bool Advance(int steps, int runIndex, int runCount, IProgress<EvolutionProgress>? progress, Stopwatch wall, long stepsAtStart, CancellationToken ct)
    {
        var stages = StagesFor(steps);
        int first = 0;
        long step = _state.Step;
        double pending = 0;
        if (_state.SegmentSteps == steps && _state.SegmentStage > 0)
        {
            first = _state.SegmentStage;
            step += _state.SegmentClosed;
            pending = _state.SegmentPending;
        }
        void Close(int count)
        {
            for (int e = 0; e < count; e++)
            {
                step++;
                _state.DiscardedTotal += pending;
                _state.DiscardedSinceRecord += pending;
                _state.Steps.Add(new StepLog(step, step * _stepTime, _cur.Count, pending, _state.DiscardedTotal));
                pending = 0;
                if (progress is not null)
                {
                    long done = step - stepsAtStart;
                    double left = done > 0 ? wall.Elapsed.TotalSeconds / done * (_totalSteps - step) : double.NaN;
                    TimeSpan? eta = double.IsFinite(left) && left < TimeSpan.MaxValue.TotalSeconds / 2 ? TimeSpan.FromSeconds(left) : null;
                    progress.Report(new EvolutionProgress(runIndex, runCount, step, _totalSteps, step * _stepTime, _cur.Count, _state.DiscardedTotal, wall.Elapsed, eta));
                }
            }
        }

        for (int i = first; i < stages.Count; i++)
        {
            if (ct.IsCancellationRequested)
            {
                _state.SegmentSteps = steps;
                _state.SegmentStage = i;
                _state.SegmentClosed = step - _state.Step;
                _state.SegmentPending = pending;
                return false;
            }
            var st = stages[i];
            pending += ApplyStage(st);
            Close(st.StepEnds);
        }
        _state.Step = step;
        _state.SegmentSteps = 0;
        _state.SegmentStage = 0;
        _state.SegmentClosed = 0;
        _state.SegmentPending = 0;
        return true;
    }

    /// <summary>Group index of a stage that is one whole RK4 or Taylor step.</summary>
    private const int WholeStep = -2;

    /// <summary>Group index of a stage that only applies the damping (no rotation).</summary>
    private const int DampingOnly = -1;

    /// <summary>The passes of a segment of <paramref name="steps"/> steps (cached per length).</summary>
    private List<SplitStage> StagesFor(int steps)
    {
        if (_segments.TryGetValue(steps, out var stages)) return stages;
        if (_floquet)
        {
            stages = [];
            for (int s = 0; s < steps; s++) stages.AddRange(_periodStages);
        }
        else if (_compiled is not null) stages = Enumerable.Repeat(new SplitStage(WholeStep, 1, 1), steps).ToList();
        else if (_groups.Count == 0) stages = Enumerable.Repeat(new SplitStage(DampingOnly, 0, 1), steps).ToList();
        else stages = SplittingSchedule.Segment(_options.Method, _groups.Count, steps);
        _segments[steps] = stages;
        return stages;
    }

    /// <summary>Applies one pass (a rotation group, a damping-only pass, or a whole RK4/Taylor step); returns the weight it discarded.</summary>
    private double ApplyStage(SplitStage st)
    {
        var none = CancellationToken.None;
        if (st.Group >= 0)
        {
            return _floquet
                ? ApplyGroup(st.Group, 1.0, 1.0, st.StepEnds > 0 ? Damping(1) : null, none)
                : ApplyGroup(st.Group, st.Fraction, _options.Dt, st.StepEnds > 0 ? Damping(st.StepEnds) : null, none);
        }
        if (st.Group == DampingOnly) return _budget.DampingRate > 0 ? DampOnly(none) : 0;
        return _options.Method == IntegrationMethod.Rk4 ? Rk4Step(none) : TaylorStep(none);
    }

    /// <summary>Emitted contributions per input string above which a group is split into twice as many sub-blocks.</summary>
    internal const int SplitEmissions = 32;

    /// <summary>
    /// Applies group <paramref name="group"/> as its current number of spatial sub-blocks (consecutive
    /// generators in order of their first site). The generators commute, so splitting is exact; it
    /// bounds the 2^m branching of strings that anticommute with many generators (dense operators,
    /// no pruning). When a group's passes emit more than <see cref="SplitEmissions"/> contributions per
    /// input string, its block count doubles for later applications (deterministic: it depends on
    /// counts only, and is checkpointed).
    /// </summary>
    private double ApplyGroup(int group, double fraction, double dt, double[]? damping, CancellationToken ct)
    {
        while (_state.GroupBlocks.Count <= group) _state.GroupBlocks.Add(1);
        int blocks = _state.GroupBlocks[group];
        var subs = SubGroups(group, blocks);
        double discarded = 0;
        long emitted = 0, inputs = 0;
        bool overflowed = false;
        for (int b = 0; b < subs.Count; b++)
        {
            var (cos, sin) = Trig(subs[b], group, blocks, b, fraction, dt);
            discarded += ApplyBlock(subs[b], cos, sin, b == subs.Count - 1 ? damping : null, ct, ref inputs, ref emitted, ref overflowed);
        }
        if (overflowed && blocks < _groups[group].Count)
        {
            _state.GroupBlocks[group] = Math.Min(4 * blocks, _groups[group].Count);
        }
        else if (emitted > SplitEmissions * Math.Max(1, inputs) && blocks < _groups[group].Count)
        {
            _state.GroupBlocks[group] = Math.Min(2 * blocks, _groups[group].Count);
        }
        return discarded;
    }

    /// <summary>
    /// One sub-block pass. When a single string's image would exceed <see cref="GroupRotationMap{T}.StringEmissionCap"/>
    /// contributions, the pass is abandoned (nothing of it is kept) and the sub-block is applied as four
    /// spatial parts instead: exact, and decided by the strings alone (independent of threads and timing).
    /// </summary>
    private double ApplyBlock(RotationGroup<T> g, double[] cos, double[] sin, double[]? damping, CancellationToken ct,
        ref long inputs, ref long emitted, ref bool overflowed)
    {
        inputs += _cur.Count;
        double d = RotationPass(g, cos, sin, damping, ct, out long em, out bool capped);
        emitted += em;
        if (!capped) return d;
        overflowed = true;
        var parts = Split(g, cos, sin, 4);
        double total = 0;
        for (int i = 0; i < parts.Count; i++)
        {
            var (pg, pc, ps) = parts[i];
            total += ApplyBlock(pg, pc, ps, i == parts.Count - 1 ? damping : null, ct, ref inputs, ref emitted, ref overflowed);
        }
        return total;
    }

    /// <summary>Splits a (sub)group into up to <paramref name="ways"/> spatial parts, with their rotation tables.</summary>
    private List<(RotationGroup<T>, double[], double[])> Split(RotationGroup<T> g, double[] cos, double[] sin, int ways)
    {
        var order = Enumerable.Range(0, g.Count).OrderBy(i => g.Keys[i].FirstSite).ThenBy(i => i).ToArray();
        var list = new List<(RotationGroup<T>, double[], double[])>();
        for (int b = 0; b < ways; b++)
        {
            int s = (int)((long)order.Length * b / ways), e = (int)((long)order.Length * (b + 1) / ways);
            if (e <= s) continue;
            var idx = order[s..e];
            list.Add((new RotationGroup<T>(_n, idx.Select(i => g.Keys[i]).ToList(), idx.Select(i => g.Weights[i]).ToList()),
                idx.Select(i => cos[i]).ToArray(), idx.Select(i => sin[i]).ToArray()));
        }
        return list;
    }

    private readonly Dictionary<(int, int), List<RotationGroup<T>>> _subGroups = [];

    private List<RotationGroup<T>> SubGroups(int group, int blocks)
    {
        if (_subGroups.TryGetValue((group, blocks), out var list)) return list;
        var g = _groups[group];
        list = [];
        if (blocks == 1) list.Add(g);
        else
        {
            var order = Enumerable.Range(0, g.Count).OrderBy(i => g.Keys[i].FirstSite).ThenBy(i => i).ToArray();
            for (int b = 0; b < blocks; b++)
            {
                int s = (int)((long)order.Length * b / blocks), e = (int)((long)order.Length * (b + 1) / blocks);
                if (e <= s) continue;
                list.Add(new RotationGroup<T>(_n, order[s..e].Select(i => g.Keys[i]).ToList(), order[s..e].Select(i => g.Weights[i]).ToList()));
            }
        }
        _subGroups[(group, blocks)] = list;
        return list;
    }

    private (double[] Cos, double[] Sin) Trig(RotationGroup<T> g, int group, int blocks, int block, double fraction, double dt)
    {
        var key = (group, blocks, block, BitConverter.DoubleToInt64Bits(fraction));
        if (_trig.TryGetValue(key, out var cs)) return cs;
        var cos = new double[g.Count];
        var sin = new double[g.Count];
        for (int i = 0; i < g.Count; i++)
        {
            double theta = 2.0 * g.Weights[i] * (fraction * dt);
            cos[i] = Math.Cos(theta);
            sin[i] = Math.Sin(theta);
        }
        _trig[key] = (cos, sin);
        return (cos, sin);
    }

    /// <summary>DAOE factors exp(-gamma tau max(0, size - l*)) for tau = units steps.</summary>
    private double[]? Damping(int units)
    {
        if (_budget.DampingRate <= 0) return null;
        if (_damping.TryGetValue(units, out var f)) return f;
        // Source: T. Rakovszky, C. W. von Keyserlingk, F. Pollmann, Phys. Rev. B 105, 075131 (2022).
        f = new double[_n + 1];
        double tau = units * _stepTime;
        for (int k = 0; k <= _n; k++) f[k] = Math.Exp(-_budget.DampingRate * tau * Math.Max(0, k - _budget.DampingMinSize));
        _damping[units] = f;
        return f;
    }

    private CompactRule Rule(double[]? damping)
        => new(_budget.Threshold, _budget.MaxSize ?? int.MaxValue, _budget.MaxStrings ?? long.MaxValue, damping);

    private static readonly CompactRule Exact = new(0, int.MaxValue, long.MaxValue, null);

    private PassAccumulator<T> Accumulator()
    {
        if (_acc is null || _acc.PartitionBits != _state.PartitionBits)
        {
            _acc = null;
            _acc = new PassAccumulator<T>(_state.PartitionBits, _cur.Count);
        }
        return _acc;
    }

    private long TrackedBytes => _cur.AllocatedBytes + (_acc?.AllocatedBytes ?? 0) + _runner.BufferBytes;

    private long ArrayBudget => MemoryBudget.ArrayBytes(_budget.MemoryBytes, _threads) + MemoryBudget.BufferReservePerThread * _threads;

    /// <summary>Bytes the accumulator may grow to in this pass.</summary>
    private long AccumulatorLimit(long extraOperators = 0)
    {
        // Room for the compaction to grow the operator's arrays (it writes into the source buffer, which may need to grow).
        long dest = Math.Max(_cur.AllocatedBytes, EntryBytes * Math.Min(_budget.MaxStrings ?? 2L * _cur.Count, 2L * _cur.Count + 16));
        return ArrayBudget - _cur.AllocatedBytes - dest - _runner.BufferBytes - extraOperators;
    }

    /// <summary>
    /// Distinct strings one pass's image may hold per kept string when a string budget is set. A commuting group
    /// whose generators mostly anticommute with a string (all-to-all couplings) maps it to up to 2^m strings; past
    /// this many, the pass is applied in spatial parts instead (exact: the generators commute), so the transient
    /// image, and with it the memory, stays proportional to --max-strings.
    /// </summary>
    internal const int ImagePerKeptString = 16;

    /// <summary>Distinct strings allowed in one pass's image under the string budget (unlimited without one).</summary>
    private long ImageCap() => _budget.MaxStrings is long m ? Math.Max(1L << 16, ImagePerKeptString * m) : long.MaxValue;

    /// <summary>One grouped-rotation pass plus compaction; returns the weight it discarded.</summary>
    private double RotationPass(RotationGroup<T> group, double[] cos, double[] sin, double[]? damping, CancellationToken ct, out long emitted, out bool capped)
    {
        capped = false;
        double baseCut = Math.Max(_state.Cut, _budget.Threshold);
        double basePrune = _budget.IsTruncating ? _options.Truncation.PassPruneFraction * baseCut : 0;
        double ceiling = Math.Max(baseCut, 1e-6);
        double prune = basePrune;
        var acc = Accumulator();
        for (int attempt = 0; ; attempt++)
        {
            if (attempt > 0)
            {
                prune = Math.Max(basePrune, 1e-13) * Math.Pow(8, attempt);
                if (prune > ceiling)
                {
                    throw new ResourceLimitException(
                        $"one pass over {_cur.Count} strings does not fit the memory budget {MemoryBudget.Format(_budget.MemoryBytes)} even with branches below {ceiling:g3} pruned; lower --max-strings or raise --memory");
                }
                _state.PassRetries++;
                _logger?.LogDebug("pass image exceeded the memory budget; retrying with branch pruning below {Prune:g3}", prune);
            }
            acc.Clear();
            var flag = new int[1];
            var map = new GroupRotationMap<T>(group, cos, sin, prune, flag);
            bool ok = _runner.Run(_cur.Keys, _cur.Coeffs, _cur.Count, map, acc, AccumulatorLimit(), ct, out emitted, flag, ImageCap());
            _emittedTotal += emitted;
            // Too many branches for one string, or an image beyond the string budget's allowance or the memory budget:
            // apply the group in parts (exact: its generators commute). Only a single generator falls back to pruning.
            if (group.Count > 1 && (flag[0] != 0 || !ok))
            {
                capped = true;
                acc.Clear();
                return 0;
            }
            if (ok) break;
        }
        double before = prune > 0 ? _cur.NormSquared() : 0;
        var stats = CompactInto(acc, Rule(damping), _cur);
        // Weight lost to branch pruning. It can be negative: a pruned branch may have cancelled part of a kept
        // one. Booking it with its sign keeps ||O||^2 + discarded = 1 exact (the norm check of every report).
        double passLoss = prune > 0 ? before - (stats.KeptWeight + stats.DeletedWeight + stats.DampedWeight) : 0;
        AfterPass(stats);
        return passLoss + stats.DeletedWeight + stats.DampedWeight;
    }

    private double DampOnly(CancellationToken ct)
    {
        ct.ThrowIfCancellationRequested();
        var acc = Accumulator();
        acc.Clear();
        AddScaled(acc, _cur, 1.0);
        var stats = CompactInto(acc, Rule(Damping(1)), _cur);
        AfterPass(stats);
        return stats.DeletedWeight + stats.DampedWeight;
    }

    /// <summary>
    /// Arrays dropped while the operator grows (resized partitions and buffers) stay on the managed heap
    /// until the collector runs; when the heap approaches the budget, collect and compact so the process,
    /// not only the live arrays, stays within it.
    /// </summary>
    private void HeapValve()
    {
        long heap = GC.GetTotalMemory(false);
        _state.PeakHeapBytes = Math.Max(_state.PeakHeapBytes, heap);
        if (heap > 0.7 * (_budget.MemoryBytes - MemoryBudget.RuntimeReserve))
        {
            System.Runtime.GCSettings.LargeObjectHeapCompactionMode = System.Runtime.GCLargeObjectHeapCompactionMode.CompactOnce;
            GC.Collect(2, GCCollectionMode.Forced, blocking: true, compacting: true);
        }
    }

    private CompactStats CompactInto(PassAccumulator<T> acc, CompactRule rule, OperatorBuffer<T> dest)
    {
        HeapValve();
        long room = Math.Max(0, ArrayBudget - _cur.AllocatedBytes - acc.AllocatedBytes - _runner.BufferBytes);
        long t0 = Stopwatch.GetTimestamp();
        var stats = _compactor.Compact(acc, rule, dest, room / EntryBytes);
        _compactTicks += Stopwatch.GetTimestamp() - t0;
        _distinctTotal += stats.Distinct;
        if (stats.Kept < 0)
        {
            throw new ResourceLimitException(
                $"the image of one step ({stats.Distinct} distinct strings) does not fit the memory budget {MemoryBudget.Format(_budget.MemoryBytes)} at the requested accuracy; raise --threshold or --memory, or set --max-strings");
        }
        _state.PeakTrackedBytes = Math.Max(_state.PeakTrackedBytes, TrackedBytes);
        HeapValve();
        return stats;
    }

    private void AfterPass(in CompactStats stats)
    {
        _state.Passes++;
        if (stats.CutMagnitude > 0) _state.Cut = stats.CutMagnitude;
        _state.PeakStrings = Math.Max(_state.PeakStrings, Math.Max(stats.Kept, stats.Distinct));
        int bits = PassAccumulator<T>.BitsFor(stats.Distinct);
        if (bits > _state.PartitionBits) _state.PartitionBits = bits;
    }

    private static void AddScaled(PassAccumulator<T> acc, OperatorBuffer<T> o, double a)
    {
        var k = o.Keys;
        var c = o.Coeffs;
        for (int i = 0; i < o.Count; i++) acc.Add(k[i], a * c[i]);
    }

    /// <summary>dest = scale * i[H, src], untruncated.</summary>
    private void Liouville(OperatorBuffer<T> src, OperatorBuffer<T> dest, double scale, long extra, CancellationToken ct)
    {
        var acc = Accumulator();
        acc.Clear();
        if (!_runner.Run(src.Keys, src.Coeffs, src.Count, new LiouvillePassMap<T>(_compiled!, scale), acc, AccumulatorLimit(extra), ct))
        {
            throw new ResourceLimitException($"i[H, O] of {src.Count} strings does not fit the memory budget {MemoryBudget.Format(_budget.MemoryBytes)}");
        }
        var stats = CompactInto(acc, Exact, dest);
        _state.Passes++;
        _state.PeakStrings = Math.Max(_state.PeakStrings, stats.Distinct);
        int bits = PassAccumulator<T>.BitsFor(stats.Distinct);
        if (bits > _state.PartitionBits) _state.PartitionBits = bits;
    }

    private readonly OperatorBuffer<T>[] _k = [new(), new(), new(), new()];
    private readonly OperatorBuffer<T> _y = new();

    /// <summary>
    /// Classical RK4 on dO/dt = L O, L = i[H, .]: k1 = L O, k2 = L(O + dt/2 k1), k3 = L(O + dt/2 k2),
    /// k4 = L(O + dt k3), O' = O + dt/6 (k1 + 2 k2 + 2 k3 + k4). Truncation after the full step.
    /// </summary>
    private double Rk4Step(CancellationToken ct)
    {
        double dt = _options.Dt;
        long extra = 0;
        Liouville(_cur, _k[0], 1.0, extra, ct);
        double[] stage = [dt / 2, dt / 2, dt];
        for (int s = 0; s < 3; s++)
        {
            var acc = Accumulator();
            acc.Clear();
            AddScaled(acc, _cur, 1.0);
            AddScaled(acc, _k[s], stage[s]);
            CompactInto(acc, Exact, _y);
            extra = _k[0].AllocatedBytes + _k[1].AllocatedBytes + _k[2].AllocatedBytes + _y.AllocatedBytes;
            Liouville(_y, _k[s + 1], 1.0, extra, ct);
        }
        var fin = Accumulator();
        fin.Clear();
        AddScaled(fin, _cur, 1.0);
        AddScaled(fin, _k[0], dt / 6);
        AddScaled(fin, _k[1], dt / 3);
        AddScaled(fin, _k[2], dt / 3);
        AddScaled(fin, _k[3], dt / 6);
        var stats = CompactInto(fin, Rule(Damping(1)), _cur);
        AfterPass(stats);
        return stats.DeletedWeight + stats.DampedWeight;
    }

    private PassAccumulator<T>? _sum;

    /// <summary>
    /// exp(dt L) O = sum_k (dt^k / k!) L^k O, summed until a term's squared norm falls below 1e-34
    /// (that is 1e-17 relative to ||O|| = 1: beyond double precision). Truncation after the step.
    /// </summary>
    private double TaylorStep(CancellationToken ct)
    {
        double dt = _options.Dt;
        if (_sum is null || _sum.PartitionBits != _state.PartitionBits) _sum = new PassAccumulator<T>(_state.PartitionBits);
        _sum.Clear();
        AddScaled(_sum, _cur, 1.0);
        var term = _k[0];
        var next = _k[1];
        term.CopyFrom(_cur.KeySpan, _cur.CoeffSpan);
        bool converged = false;
        for (int k = 1; k <= 200; k++)
        {
            Liouville(term, next, dt / k, _sum.AllocatedBytes + term.AllocatedBytes, ct);
            (term, next) = (next, term);
            AddScaled(_sum, term, 1.0);
            double tn = term.NormSquared();
            if (tn < 1e-34 || term.Count == 0)
            {
                converged = true;
                break;
            }
            if (k > 20 && tn > 1e30) break;
        }
        if (!converged) throw new InputException($"the Taylor series did not converge at dt = {dt}; use a smaller --dt");
        var stats = CompactInto(_sum, Rule(Damping(1)), _cur);
        AfterPass(stats);
        return stats.DeletedWeight + stats.DampedWeight;
    }

    // ---------------------------------------------------------------- records

    private void Record()
    {
        var ws = ObservablePass.Measure(_cur.Keys, _cur.Coeffs, _cur.Count, _n, _initKeys, _initCoeffs, _problem.CountMajoranas, _threads);
        _state.Records.Add(MakeRecord(ws));
        _state.DiscardedSinceRecord = 0;
    }

    private EvolutionRecord MakeRecord(WeightSums ws)
    {
        int n = _n;
        double norm = ws.NormSquared;
        double inv = norm > 0 ? 1.0 / norm : double.NaN;
        var size = new double[n + 1];
        double mean = 0;
        for (int k = 0; k <= n; k++)
        {
            size[k] = ws.Size[k] * inv;
            mean += k * size[k];
        }
        var rho = new double[n];
        var fx = new double[n];
        var fy = new double[n];
        var fz = new double[n];
        var fm = new double[n];
        var right = new double[n];
        var left = new double[n];
        for (int j = 0; j < n; j++)
        {
            double wx = ws.Letters[3 * j] * inv, wy = ws.Letters[3 * j + 1] * inv, wz = ws.Letters[3 * j + 2] * inv;
            rho[j] = wx + wy + wz;
            // V = X_j anticommutes with Y and Z at j: F = 1 - 2 (w_Y + w_Z); likewise for Y and Z.
            fx[j] = 1 - 2 * (wy + wz);
            fy[j] = 1 - 2 * (wx + wz);
            fz[j] = 1 - 2 * (wx + wy);
            fm[j] = 1 - 4.0 / 3.0 * rho[j];
            right[j] = ws.RightEdge[j] * inv;
            left[j] = ws.LeftEdge[j] * inv;
        }
        double[]? maj = null;
        double? meanMaj = null;
        if (ws.Majorana is not null)
        {
            maj = new double[ws.Majorana.Length];
            double m = 0;
            for (int k = 0; k < maj.Length; k++)
            {
                maj[k] = ws.Majorana[k] * inv;
                m += k * maj[k];
            }
            meanMaj = m;
        }
        return new EvolutionRecord
        {
            Time = _state.Step * _stepTime,
            Step = _state.Step,
            NormSquared = norm,
            Strings = _cur.Count,
            DiscardedWeight = _state.DiscardedSinceRecord,
            DiscardedTotal = _state.DiscardedTotal,
            Autocorrelation = ws.Overlap,
            MeanSize = mean,
            SizeDistribution = size,
            SiteWeights = rho,
            OtocX = fx,
            OtocY = fy,
            OtocZ = fz,
            OtocMean = fm,
            RightEdge = right,
            LeftEdge = left,
            MeanMajoranaSize = meanMaj,
            MajoranaSizeDistribution = maj,
            CutMagnitude = _state.Cut,
        };
    }

    // ---------------------------------------------------------------- checkpoints

    private const string Magic = "OPGCKPT1";
    private const int FormatVersion = 1;

    /// <summary>
    /// Binary checkpoint: magic "OPGCKPT1", int32 version, int32 key bytes, int32 N, int32 budget index,
    /// uint64 options fingerprint, int64 string count, int32 state length, the engine state as UTF-8
    /// JSON (doubles round-trip exactly), the raw key array, the raw coefficient array, and a uint64
    /// checksum of everything before it. Written atomically (temporary file, flush, rename).
    /// </summary>
    private void Save(string path)
    {
        _state.EmitPerInput = _runner.EmitPerInput;
        var stateJson = System.Text.Json.JsonSerializer.SerializeToUtf8Bytes(_state, AtomicFile.Json);
        var header = new byte[8 + 4 * 4 + 8 + 8 + 4];
        System.Text.Encoding.ASCII.GetBytes(Magic).CopyTo(header, 0);
        BitConverter.TryWriteBytes(header.AsSpan(8), FormatVersion);
        BitConverter.TryWriteBytes(header.AsSpan(12), Unsafe.SizeOf<T>());
        BitConverter.TryWriteBytes(header.AsSpan(16), _n);
        BitConverter.TryWriteBytes(header.AsSpan(20), _budget.Index);
        BitConverter.TryWriteBytes(header.AsSpan(24), _fingerprint);
        BitConverter.TryWriteBytes(header.AsSpan(32), (long)_cur.Count);
        BitConverter.TryWriteBytes(header.AsSpan(40), stateJson.Length);
        var keyBytes = System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.KeySpan);
        var coeffBytes = System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.CoeffSpan);
        var sum = new Checksum64();
        sum.Append(header);
        sum.Append(stateJson);
        sum.Append(keyBytes);
        sum.Append(coeffBytes);
        ulong check = sum.Value;
        var keys = _cur.Keys;
        var coeffs = _cur.Coeffs;
        int count = _cur.Count;
        AtomicFile.Write(path, s =>
        {
            s.Write(header);
            s.Write(stateJson);
            s.Write(System.Runtime.InteropServices.MemoryMarshal.AsBytes(keys.AsSpan(0, count)));
            s.Write(System.Runtime.InteropServices.MemoryMarshal.AsBytes(coeffs.AsSpan(0, count)));
            s.Write(BitConverter.GetBytes(check));
        });
        _logger?.LogDebug("checkpoint written: {Path} (step {Step}, {Count} strings)", path, _state.Step, count);
    }

    private void Load(string path)
    {
        using var fs = new FileStream(path, FileMode.Open, FileAccess.Read, FileShare.Read, 1 << 20);
        var header = new byte[44];
        if (fs.Length < header.Length + 8) throw Bad(path, "file is too short to be a checkpoint");
        fs.ReadExactly(header);
        if (System.Text.Encoding.ASCII.GetString(header, 0, 8) != Magic) throw Bad(path, "found no checkpoint header; expected a file written by 'opgrowth evolve'");
        int version = BitConverter.ToInt32(header, 8);
        if (version != FormatVersion) throw Bad(path, $"found format version {version}; expected {FormatVersion}");
        int keyBytes = BitConverter.ToInt32(header, 12);
        int n = BitConverter.ToInt32(header, 16);
        int budgetIndex = BitConverter.ToInt32(header, 20);
        ulong fp = BitConverter.ToUInt64(header, 24);
        long count = BitConverter.ToInt64(header, 32);
        int stateLength = BitConverter.ToInt32(header, 40);
        if (keyBytes != Unsafe.SizeOf<T>() || n != _n) throw Bad(path, $"found a run on {n} qubits ({keyBytes}-byte keys); expected {_n} qubits");
        if (budgetIndex != _budget.Index) throw Bad(path, $"found budget {budgetIndex + 1} of a budget series; expected budget {_budget.Index + 1}");
        if (fp != _fingerprint) throw Bad(path, "found a run with different model or options; expected the same model and options as the interrupted run (or delete the checkpoint)");
        long expected = header.Length + (long)stateLength + count * (Unsafe.SizeOf<T>() + 8) + 8;
        if (count < 0 || count > Array.MaxLength || stateLength < 0 || fs.Length != expected) throw Bad(path, $"found {fs.Length} bytes; expected {expected} (truncated or damaged file)");
        var stateJson = new byte[stateLength];
        fs.ReadExactly(stateJson);
        _cur.EnsureCapacity((int)count);
        var keySpan = System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.Keys.AsSpan(0, (int)count));
        var coeffSpan = System.Runtime.InteropServices.MemoryMarshal.AsBytes(_cur.Coeffs.AsSpan(0, (int)count));
        fs.ReadExactly(keySpan);
        fs.ReadExactly(coeffSpan);
        var tail = new byte[8];
        fs.ReadExactly(tail);
        var sum = new Checksum64();
        sum.Append(header);
        sum.Append(stateJson);
        sum.Append(keySpan);
        sum.Append(coeffSpan);
        if (sum.Value != BitConverter.ToUInt64(tail)) throw Bad(path, "checksum does not match (damaged file)");
        _cur.Count = (int)count;
        _state = System.Text.Json.JsonSerializer.Deserialize<EngineState>(stateJson, AtomicFile.Json)
            ?? throw Bad(path, "found an empty state record");
        _runner.EmitPerInput = _state.EmitPerInput;
    }

    private static InputException Bad(string path, string problem) => new(path, 0, $"checkpoint: {problem}");
}

/// <summary>Everything besides the operator that determines how a run continues (checkpointed).</summary>
internal sealed class EngineState
{
    public long Step { get; set; }

    public double DiscardedTotal { get; set; }

    public double DiscardedSinceRecord { get; set; }

    /// <summary>Weakest |c| kept by the last top-M cut (sticky); sets the branch pruning of later passes.</summary>
    public double Cut { get; set; }

    public int PartitionBits { get; set; }

    /// <summary>Sub-blocks each commuting group is currently applied in.</summary>
    public List<int> GroupBlocks { get; set; } = [];

    public long PeakStrings { get; set; }

    public long PeakTrackedBytes { get; set; }

    public long PeakHeapBytes { get; set; }

    /// <summary>Block sizing of the pass driver (only matters when a pass meets the memory limit).</summary>
    public double EmitPerInput { get; set; } = 4;

    public long PassRetries { get; set; }

    public long Passes { get; set; }

    public double ElapsedSeconds { get; set; }

    /// <summary>Length (steps) of the segment in progress when the run was interrupted between two passes; 0 otherwise.</summary>
    public int SegmentSteps { get; set; }

    /// <summary>Passes of that segment already applied.</summary>
    public int SegmentStage { get; set; }

    /// <summary>Steps of that segment already closed.</summary>
    public long SegmentClosed { get; set; }

    /// <summary>Weight discarded in that segment since the last closed step.</summary>
    public double SegmentPending { get; set; }

    public List<EvolutionRecord> Records { get; set; } = [];

    public List<StepLog> Steps { get; set; } = [];
}

/// <summary>Testing hook: the run stops here as if the process had been killed.</summary>
internal sealed class SimulatedKillException : Exception
{
    public SimulatedKillException() : base("simulated kill")
    {
    }

    public SimulatedKillException(string message) : base(message)
    {
    }

    public SimulatedKillException(string message, Exception inner) : base(message, inner)
    {
    }
}
