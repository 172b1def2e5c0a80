using OpGrowth.Evolution;
using OpGrowth.Pauli;
using static OpGrowth.Tests.Evolution.EvolutionTestKit;

namespace OpGrowth.Tests.Evolution;

/// <summary>Truncation accounting, determinism (threads, resume) and resource limits.</summary>
public class EngineBehaviourTests
{
    [Fact]
    public void TruncatedRotations_NormPlusDiscardedWeight_StaysOne()
    {
        // Conservation law: rotation steps are unitary, so every unit of weight lost must be booked:
        // ||O(t)||^2 + discarded(t) = 1. Tolerance 1e-9: bookkeeping sums ~1e5 terms at rounding level.
        int n = 24;
        var h = MixedFieldIsing(n);
        var policy = new TruncationPolicy { Threshold = 1e-4, MaxSize = 10, DampingRate = 0.2, DampingMinSize = 6, MaxStrings = 20000, MemoryBytes = 1L << 30 };
        var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.1, Time = 3.0, RecordEvery = 5, Threads = 2, Truncation = policy };
        var (_, s) = RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 12, 'Z')), opts);
        Assert.True(s.Records[^1].DiscardedTotal > 1e-3, "the policy should discard weight");
        foreach (var r in s.Records) Assert.True(Math.Abs(r.NormSquared + r.DiscardedTotal - 1) < 1e-9, $"t = {r.Time}: {r.NormSquared + r.DiscardedTotal - 1:e2}");
        Assert.All(s.Records, r => Assert.True(r.SizeDistribution.Skip(11).All(p => p == 0)));
        double stepSum = s.Steps.Sum(st => st.Discarded);
        Assert.True(Math.Abs(stepSum - s.Records[^1].DiscardedTotal) < 1e-12);
    }

    [Fact]
    public void Run_OneVersusTwoThreads_BitIdentical()
    {
        // Determinism contract: every reduction is in a thread-independent order.
        int n = 24;
        var h = MixedFieldIsing(n);
        EvolutionSeries Go(int threads)
        {
            var policy = new TruncationPolicy { MaxStrings = 40000, MemoryBytes = 2L << 30 };
            var opts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.1, Time = 1.6, RecordEvery = 4, Threads = threads, Truncation = policy };
            return RunEngine<Pauli64>(Problem(h, PauliString.Single(n, 11, 'Z')), opts).Series;
        }
        var a = Go(1);
        var b = Go(2);
        Assert.True(a.Records[^1].Strings > 32768, "large enough for the parallel paths");
        AssertIdentical(a.Records, b.Records);
    }

    [Fact]
    public void Resume_AfterSimulatedKill_GivesBitIdenticalResults()
    {
        // A run stopped abruptly after a checkpoint and resumed must equal an uninterrupted run bit for bit.
        int n = 20;
        var h = MixedFieldIsing(n);
        var problem = Problem(h, PauliString.Single(n, 9, 'Z'));
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-resume-" + Guid.NewGuid().ToString("N"));
        try
        {
            var policy = new TruncationPolicy { MaxStrings = 3000, MemoryBytes = 1L << 30 };
            var baseOpts = new EvolutionOptions { Method = IntegrationMethod.Trotter4, Dt = 0.1, Time = 2.0, RecordEvery = 2, Threads = 2, Truncation = policy, CheckpointInterval = TimeSpan.Zero };
            var straight = RunEngine<Pauli64>(problem, baseOpts);
            var killed = baseOpts with { CheckpointDirectory = dir, HaltAtStep = 8 };
            Assert.Throws<SimulatedKillException>(() => RunEngine<Pauli64>(problem, killed));
            Assert.True(File.Exists(Path.Combine(dir, "checkpoint-budget0.bin")));
            var resumed = RunEngine<Pauli64>(problem, baseOpts with { CheckpointDirectory = dir, Resume = true, Threads = 1 });
            Assert.True(resumed.Series.Completed);
            Assert.Equal(12, resumed.Series.StepsThisSession);
            AssertIdentical(straight.Series.Records, resumed.Series.Records);
            var x = straight.Engine.Operator;
            var y = resumed.Engine.Operator;
            Assert.Equal(x.Count, y.Count);
            for (int i = 0; i < x.Count; i++)
            {
                Assert.Equal(x.Keys[i], y.Keys[i]);
                Assert.True(Same(x.Coefficients[i], y.Coefficients[i]));
            }
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void Interrupt_BetweenPasses_WritesCheckpointAndResumesBitIdentically()
    {
        // Ctrl-C or SIGTERM cancels the token: the engine stops at the next pass boundary (inside a segment
        // between two records), writes a checkpoint there, and a resumed run equals an uninterrupted one bit for bit.
        int n = 16;
        var problem = Problem(MixedFieldIsing(n), PauliString.Single(n, 7, 'Z'));
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-interrupt-" + Guid.NewGuid().ToString("N"));
        try
        {
            var policy = new TruncationPolicy { MaxStrings = 2000, MemoryBytes = 1L << 30 };
            var baseOpts = new EvolutionOptions { Method = IntegrationMethod.Trotter2, Dt = 0.1, Time = 2.0, RecordEvery = 4, Threads = 2, Truncation = policy };
            var straight = RunEngine<Pauli64>(problem, baseOpts);
            using var cts = new CancellationTokenSource();
            var interrupted = baseOpts with { CheckpointDirectory = dir, CheckpointInterval = TimeSpan.FromHours(1) };
            var budgets = OperatorEvolution.ResolveBudgets(problem, interrupted, out _);
            var engine = new EvolutionEngine<Pauli64>(problem, interrupted, budgets[0], OperatorEvolution.Fingerprint(problem, interrupted, budgets[0]), null);
            // Cancel once step 6 has closed: inside the segment from step 4 to step 8.
            var progress = new SyncProgress(p => { if (p.Step == 6) cts.Cancel(); });
            var first = engine.Run(0, 1, progress, cts.Token);
            Assert.False(first.Completed);
            Assert.Equal("interrupted", first.StopReason);
            Assert.True(File.Exists(Path.Combine(dir, "checkpoint-budget0.bin")));
            var resumed = RunEngine<Pauli64>(problem, baseOpts with { CheckpointDirectory = dir, Resume = true });
            Assert.True(resumed.Series.Completed);
            AssertIdentical(straight.Series.Records, resumed.Series.Records);
            Assert.Equal(straight.Series.Steps.Count, resumed.Series.Steps.Count);
            for (int i = 0; i < straight.Series.Steps.Count; i++) Assert.True(Same(straight.Series.Steps[i].DiscardedTotal, resumed.Series.Steps[i].DiscardedTotal));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    /// <summary>An IProgress that calls back on the reporting thread (Progress&lt;T&gt; would post to the thread pool).</summary>
    private sealed class SyncProgress(Action<EvolutionProgress> onReport) : IProgress<EvolutionProgress>
    {
        public void Report(EvolutionProgress value) => onReport(value);
    }

    [Fact]
    public void Resume_WithDifferentOptions_IsRejected()
    {
        int n = 10;
        var problem = Problem(MixedFieldIsing(n), PauliString.Single(n, 4, 'Z'));
        string dir = Path.Combine(Path.GetTempPath(), "opgrowth-resume-" + Guid.NewGuid().ToString("N"));
        try
        {
            var opts = new EvolutionOptions { Dt = 0.1, Time = 0.4, Threads = 1, CheckpointDirectory = dir, CheckpointInterval = TimeSpan.Zero, Truncation = new TruncationPolicy { MaxStrings = 500, MemoryBytes = 1L << 30 } };
            RunEngine<Pauli64>(problem, opts);
            var ex = Assert.Throws<OpGrowth.IO.InputException>(() => RunEngine<Pauli64>(problem, opts with { Dt = 0.05, Resume = true }));
            Assert.Contains("different model or options", ex.Message);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, true);
        }
    }

    [Fact]
    public void ThresholdRun_BeyondMemoryBudget_HoldsTheBudget()
    {
        // The requested accuracy (threshold 1e-12) cannot fit 160 MiB on 40 qubits. The engine applies the
        // passes in parts and prunes branches harder (booked as discarded weight, ||O||^2 + discarded = 1 to
        // rounding), or stops cleanly, flagged as resource-limited, keeping the records it finished: either way
        // its arrays never exceed the budget.
        int n = 40;
        var problem = Problem(MixedFieldIsing(n), PauliString.Single(n, 20, 'Z'));
        var opts = new EvolutionOptions { Dt = 0.1, Time = 3, RecordEvery = 2, Threads = 2, Truncation = new TruncationPolicy { Threshold = 1e-12, MemoryBytes = 160L << 20 } };
        var result = OperatorEvolution.Run(problem, opts);
        Assert.True(result.Main.PeakTrackedBytes <= 160L << 20, $"tracked peak {result.Main.PeakTrackedBytes}");
        Assert.True(result.Main.Records.Count >= 2);
        var last = result.Main.Records[^1];
        Assert.Equal(1.0, last.NormSquared + last.DiscardedTotal, 8);
        if (result.Completed) Assert.True(last.DiscardedTotal > 0, "the budget was held by dropping weight, booked as discarded weight");
        else
        {
            Assert.True(result.ResourceLimited);
            Assert.Contains("memory budget", result.StopReason);
        }
    }

    [Fact]
    public void BudgetSeries_ThreeBudgets_ReportsMovementPerFigure()
    {
        int n = 16;
        var problem = Problem(MixedFieldIsing(n), PauliString.Single(n, 8, 'Z'));
        var opts = new EvolutionOptions { Dt = 0.1, Time = 4.5, RecordEvery = 2, Threads = 2, BudgetCount = 3, Truncation = new TruncationPolicy { MaxStrings = 4000, MemoryBytes = 1L << 30 } };
        var result = OperatorEvolution.Run(problem, opts, OpGrowth.Analysis.LatticeGeometry.Chain(n));
        Assert.True(result.Completed);
        Assert.Equal(3, result.Runs.Count);
        Assert.Equal(new long?[] { 4000, 2000, 1000 }, result.Runs.Select(r => r.Budget.MaxStrings).ToArray());
        var vb = Assert.Single(result.Convergence, c => c.Figure == "butterflyVelocity");
        Assert.Equal(3, vb.Values.Length);
        Assert.NotNull(vb.Values[0]);
        Assert.Contains(result.Convergence, c => c.Movement is not null);
        Assert.All(result.Convergence, c => Assert.Equal(c.Converged, c.Note is null));
        Assert.True(result.Runs[0].Records[^1].DiscardedTotal <= result.Runs[2].Records[^1].DiscardedTotal);
    }
}
