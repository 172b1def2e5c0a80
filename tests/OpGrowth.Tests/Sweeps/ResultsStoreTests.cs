using System.Collections.Concurrent;
using OpGrowth.IO;
using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>Point files, corruption handling, the local scheduler and collection, with the synthetic runner.</summary>
public class ResultsStoreTests
{
    [Fact]
    public void Save_ThenLoad_RoundTripsEveryField()
    {
        using var kit = new SweepTestKit();
        var p = kit.LoadPlan(SweepTestKit.SyntheticPlan()).Expand()[5];
        var r = new SyntheticPointRunner().Run(p, default) with { Note = "quote \" and newline \n inside", VB = null };
        var store = new PointStore(kit.Path("out"));
        store.Save(p, r);
        var back = store.Load(p.Id, out var bad);
        Assert.Null(bad);
        Assert.NotNull(back);
        Assert.Equal(r, back!.Result);
        Assert.Equal(p.N, back.N);
        Assert.Equal(p.Seed, back.Seed);
        Assert.Equal(p.GroupKey, back.Group);
    }

    public static TheoryData<string> Damages => new() { "truncate", "flip-digit", "empty", "rename", "garbage", "schema" };

    [Theory]
    [MemberData(nameof(Damages))]
    public void Load_DamagedFile_IsReportedMovedAsideAndNotReturned(string damage)
    {
        using var kit = new SweepTestKit();
        var points = kit.LoadPlan(SweepTestKit.SyntheticPlan()).Expand();
        var store = new PointStore(kit.Path("out"));
        var p = points[0];
        store.Save(p, new SyntheticPointRunner().Run(p, default));
        string path = store.PathOf(p.Id);
        string text = File.ReadAllText(path);
        string id = p.Id;
        switch (damage)
        {
            case "truncate": File.WriteAllText(path, text[..(text.Length / 2)]); break;
            case "flip-digit":
            {
                // Change one digit of t* inside the payload: still valid JSON, but the checksum no longer matches.
                int i = text.IndexOf("\"tStar\": ", StringComparison.Ordinal) + 9;
                char c = text[i] == '9' ? '8' : (char)(text[i] + 1);
                File.WriteAllText(path, text[..i] + c + text[(i + 1)..]);
                break;
            }
            case "empty": File.WriteAllText(path, ""); break;
            case "rename":
                // A sound file under another point's name must not be taken for that point.
                id = points[1].Id;
                File.Move(path, store.PathOf(id));
                path = store.PathOf(id);
                break;
            case "garbage": File.WriteAllBytes(path, [0xFF, 0x00, 0x7B, 0x22]); break;
            case "schema": File.WriteAllText(path, text.Replace(PointIdentity.SchemaVersion, "opgrowth.sweep-point/0", StringComparison.Ordinal)); break;
        }
        var loaded = store.Load(id, out var corrupt);
        Assert.Null(loaded);
        Assert.NotNull(corrupt);
        Assert.False(File.Exists(path));
        Assert.True(File.Exists(corrupt!.MovedTo));
        Assert.StartsWith(store.CorruptDirectory, corrupt.MovedTo, StringComparison.Ordinal);
    }

    [Fact]
    public void Run_CorruptPointFile_IsRecomputedAndNeverMerged()
    {
        using var kit = new SweepTestKit();
        var plan = kit.LoadPlan(SweepTestKit.SyntheticPlan());
        var points = plan.Expand();
        string dir = kit.Path("out");
        var store = new PointStore(dir);
        SweepManifest.From(plan, points).Save(store.ManifestPath);
        var exec = new SweepExecutor(store, new SyntheticPointRunner());
        exec.Run(points, new SweepExecution(2, 1L << 40), default);
        string reference = File.ReadAllText(store.PathOf(points[3].Id));

        // Damage one file (a wrong t*, checksum left as it was) and truncate another.
        string p3 = store.PathOf(points[3].Id), p7 = store.PathOf(points[7].Id);
        File.WriteAllText(p3, reference.Replace("\"tStar\": ", "\"tStar\": 1", StringComparison.Ordinal));
        File.WriteAllText(p7, File.ReadAllText(p7)[..40]);

        // Collect first: the damaged points are reported, moved aside, and missing from the table.
        var c = SweepCollector.Collect(dir);
        Assert.Equal(2, c.Corrupt.Count);
        Assert.Equal(points.Count - 2, c.Points.Count);
        Assert.DoesNotContain(c.Points, sp => sp.Id == points[3].Id || sp.Id == points[7].Id);
        Assert.Equal(new[] { points[3].Id, points[7].Id }.Order(), c.Missing.Select(m => m.Id).Order());
        Assert.Contains("corrupt", c.Summary(), StringComparison.Ordinal);

        // Rerun: only the two are recomputed, with the same results as before.
        var counting = new CountingRunner(new SyntheticPointRunner());
        var outcome = new SweepExecutor(store, counting).Run(points, new SweepExecution(2, 1L << 40), default);
        Assert.Equal(2, outcome.Computed);
        Assert.Equal(points.Count - 2, outcome.Skipped);
        Assert.Equal(2, counting.Calls);
        var again = store.Load(points[3].Id, out _);
        Assert.Equal(store.TryRead(p3, out _)!.Result with { WallSeconds = 0 }, again!.Result with { WallSeconds = 0 });
        Assert.Equal(points.Count, SweepCollector.Collect(dir).Points.Count);
    }

    [Fact]
    public void Run_FinishedPoints_AreSkipped()
    {
        using var kit = new SweepTestKit();
        var points = kit.LoadPlan(SweepTestKit.SyntheticPlan()).Expand();
        var store = new PointStore(kit.Path("out"));
        var first = new CountingRunner(new SyntheticPointRunner());
        new SweepExecutor(store, first).Run(points.Take(5).ToList(), new SweepExecution(2, 1L << 40), default);
        var second = new CountingRunner(new SyntheticPointRunner());
        var outcome = new SweepExecutor(store, second).Run(points, new SweepExecution(2, 1L << 40), default);
        Assert.Equal(5, first.Calls);
        Assert.Equal(points.Count - 5, second.Calls);
        Assert.Equal(5, outcome.Skipped);
    }

    [Fact]
    public void Run_MemoryBudget_LimitsPointsInFlight()
    {
        using var kit = new SweepTestKit();
        var points = kit.LoadPlan(SweepTestKit.SyntheticPlan(delay: 0.05)).Expand();
        var store = new PointStore(kit.Path("out"));
        // Each point declares 64 MiB (synthetic default); a 150 MiB budget allows two at once although 4 jobs are allowed.
        var runner = new CountingRunner(new SyntheticPointRunner()) { HoldUntil = 3 };
        new SweepExecutor(store, runner).Run(points, new SweepExecution(4, 150L << 20), default);
        Assert.Equal(points.Count, runner.Calls);
        Assert.Equal(2, runner.MaxInFlight);

        // A point larger than the whole budget is an input error before anything runs.
        var ex = Assert.Throws<InputException>(() => new SweepExecutor(new PointStore(kit.Path("out2")), runner).Run(points, new SweepExecution(1, 10L << 20), default));
        Assert.Contains("more than the memory budget", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Run_JobsLimit_IsHonoured()
    {
        using var kit = new SweepTestKit();
        var points = kit.LoadPlan(SweepTestKit.SyntheticPlan(delay: 0.05)).Expand();
        var runner = new CountingRunner(new SyntheticPointRunner()) { HoldUntil = 4 };
        new SweepExecutor(new PointStore(kit.Path("out")), runner).Run(points, new SweepExecution(3, 1L << 40), default);
        Assert.Equal(3, runner.MaxInFlight);
    }

    [Fact]
    public void Run_FailingPoint_IsRecordedOthersFinish()
    {
        using var kit = new SweepTestKit();
        var points = kit.LoadPlan(SweepTestKit.SyntheticPlan()).Expand();
        var store = new PointStore(kit.Path("out"));
        var runner = new CountingRunner(new SyntheticPointRunner()) { FailIndex = 4 };
        var outcome = new SweepExecutor(store, runner).Run(points, new SweepExecution(2, 1L << 40), default);
        Assert.Single(outcome.Failed);
        Assert.Equal("resource-limit", outcome.Failed[0].Kind);
        Assert.Equal(points.Count - 1, outcome.Computed);
        Assert.False(File.Exists(store.PathOf(points[4].Id)));
    }

    [Fact]
    public void Collect_WithoutManifest_MergesAllInSeriesOrder_AndIgnoresOtherPlansWithManifest()
    {
        using var kit = new SweepTestKit();
        var planA = kit.LoadPlan(SweepTestKit.SyntheticPlan());
        var planB = planA with { Engine = planA.Engine with { Time = 30 } };
        string dir = kit.Path("out");
        var store = new PointStore(dir);
        var a = planA.Expand();
        var b = planB.Expand();
        new SweepExecutor(store, new SyntheticPointRunner()).Run(a, new SweepExecution(2, 1L << 40), default);
        new SweepExecutor(store, new SyntheticPointRunner()).Run(b, new SweepExecution(2, 1L << 40), default);
        Assert.Equal(a.Count + b.Count, SweepCollector.Collect(dir).Points.Count);
        SweepManifest.From(planB, b).Save(store.ManifestPath);
        var c = SweepCollector.Collect(dir);
        Assert.Equal(b.Select(p => p.Id), c.Points.Select(p => p.Id));
        Assert.Equal(a.Count, c.Stale);
    }

    /// <summary>Counts calls and the largest number of points in flight; can fail one point.</summary>
    private sealed class CountingRunner(IPointRunner inner) : IPointRunner
    {
        private int _calls;
        private int _inFlight;
        private int _max;
        private readonly ConcurrentBag<int> _seen = [];

        public int Calls => _calls;

        public int MaxInFlight => _max;

        public int? FailIndex { get; init; }

        /// <summary>
        /// Each call waits (at most 1 s) until this many points are in flight, so that the concurrency the
        /// scheduler allows is actually reached on a loaded machine, where 50 ms points may not overlap.
        /// </summary>
        public int? HoldUntil { get; init; }

        public long EstimateMemoryBytes(SweepPoint point) => inner.EstimateMemoryBytes(point);

        public PointResult Run(SweepPoint point, CancellationToken cancellationToken)
        {
            Interlocked.Increment(ref _calls);
            int now = Interlocked.Increment(ref _inFlight);
            int m;
            while ((m = Volatile.Read(ref _max)) < now && Interlocked.CompareExchange(ref _max, now, m) != m)
            {
            }
            try
            {
                _seen.Add(point.Index);
                if (HoldUntil is int hold)
                {
                    var wait = System.Diagnostics.Stopwatch.StartNew();
                    while (Volatile.Read(ref _inFlight) < hold && wait.ElapsedMilliseconds < 1000) Thread.Sleep(1);
                }
                if (point.Index == FailIndex) throw new ResourceLimitException("budget too small for this point (test)");
                return inner.Run(point, cancellationToken);
            }
            finally
            {
                Interlocked.Decrement(ref _inFlight);
            }
        }
    }
}
