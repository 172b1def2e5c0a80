using System.Diagnostics;
using System.Globalization;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Sweeps;

/// <summary>
/// Runs the points of a sweep on this machine: skips points whose result file is already sound,
/// recomputes points whose file is corrupt, and runs the rest in parallel, at most
/// <see cref="SweepExecution.Jobs"/> at a time and never more at once than the memory budget holds
/// (each point declares its estimate through <see cref="IPointRunner.EstimateMemoryBytes"/>). Each
/// finished point is written at once (atomically), so a killed sweep loses only the points in flight.
/// </summary>
public sealed class SweepExecutor
{
    private readonly PointStore _store;
    private readonly IPointRunner _runner;
    private readonly ILogger? _logger;

    public SweepExecutor(PointStore store, IPointRunner runner, ILogger? logger = null)
    {
        _store = store;
        _runner = runner;
        _logger = logger;
    }

    /// <summary>Runs every point of the list that has no sound result yet.</summary>
    public SweepOutcome Run(IReadOnlyList<SweepPoint> points, SweepExecution execution, CancellationToken cancellationToken)
    {
        ArgumentNullException.ThrowIfNull(points);
        ArgumentNullException.ThrowIfNull(execution);
        int jobs = Math.Max(1, execution.Jobs);
        long budget = execution.MemoryBytes;
        var corrupt = new List<CorruptPoint>();
        var pending = new List<(SweepPoint Point, long Memory)>();
        int skipped = 0;
        foreach (var p in points)
        {
            if (_store.Load(p.Id, out var bad) is not null)
            {
                skipped++;
                continue;
            }
            if (bad is not null) corrupt.Add(bad);
            long mem = Math.Max(1, _runner.EstimateMemoryBytes(p));
            if (mem > budget)
            {
                throw new InputException(
                    $"point {p.Index} ({p}) needs about {FormatBytes(mem)}, more than the memory budget {FormatBytes(budget)}; expected a larger --memory or a smaller string budget (max_strings) in the plan");
            }
            pending.Add((p, mem));
        }
        _logger?.LogInformation("sweep: {Total} points, {Done} already done, {Todo} to run ({Jobs} at a time, memory budget {Budget})",
            points.Count, skipped, pending.Count, jobs, FormatBytes(budget));

        var failed = new List<PointFailure>();
        var running = new List<(Task<PointResult> Task, SweepPoint Point, long Memory)>();
        using var linked = CancellationTokenSource.CreateLinkedTokenSource(cancellationToken);
        long used = 0;
        int computed = 0;
        double busySeconds = 0;
        var clock = Stopwatch.StartNew();
        Exception? fatal = null;
        while ((pending.Count > 0 && fatal is null && !linked.IsCancellationRequested) || running.Count > 0)
        {
            // First fit in plan order: start every pending point the job and memory limits allow.
            for (int i = 0; i < pending.Count && running.Count < jobs && fatal is null && !linked.IsCancellationRequested;)
            {
                var (p, mem) = pending[i];
                if (used + mem > budget && running.Count > 0)
                {
                    i++;
                    continue;
                }
                used += mem;
                pending.RemoveAt(i);
                if (_runner.EstimateSeconds(p) is double est)
                    _logger?.LogInformation("point {Index} {Point}: estimated {Time} and {Memory} before it starts", p.Index, p, FormatDuration(est), FormatBytes(mem));
                var token = linked.Token;
                var task = Task.Factory.StartNew(() => _runner.Run(p, token), token, TaskCreationOptions.LongRunning, TaskScheduler.Default);
                running.Add((task, p, mem));
                _logger?.LogDebug("started point {Index}: {Point}", p.Index, p);
            }
            if (running.Count == 0) break;
            int done = Task.WaitAny(running.Select(r => (Task)r.Task).ToArray());
            var (t, point, m) = running[done];
            running.RemoveAt(done);
            used -= m;
            if (m >= LargePointBytes) ReleaseMemory(running.Count == 0);
            try
            {
                var result = t.GetAwaiter().GetResult();
                _store.Save(point, result);
                computed++;
                busySeconds += result.WallSeconds;
                int left = pending.Count + running.Count;
                double eta = computed > 0 ? busySeconds / computed * left / jobs : 0;
                _logger?.LogInformation("[{Done}/{Todo}] point {Index} {Point}: t* = {TStar} ({Wall:0.0} s); {Left} left{Eta}",
                    computed + failed.Count, computed + failed.Count + left, point.Index, point, FormatTStar(result), result.WallSeconds, left,
                    left > 0 ? $", about {FormatDuration(eta)} to go" : "");
            }
            catch (OperationCanceledException)
            {
                // Cancelled: the point stays missing and is rerun next time.
            }
            catch (InputException ex)
            {
                fatal ??= ex;
                linked.Cancel();
            }
            catch (Exception ex) when (ex is not OutOfMemoryException)
            {
                failed.Add(new PointFailure(point.Index, point.Id, point.ToString(), ex is ResourceLimitException ? "resource-limit" : "error", ex.Message));
                _logger?.LogError("point {Index} ({Point}) failed: {Message}", point.Index, point, ex.Message);
            }
        }
        if (fatal is not null) throw fatal;
        cancellationToken.ThrowIfCancellationRequested();
        _logger?.LogInformation("sweep finished: {Computed} computed, {Skipped} skipped, {Failed} failed, {Corrupt} corrupt files replaced, {Wall:0.0} s",
            computed, skipped, failed.Count, corrupt.Count, clock.Elapsed.TotalSeconds);
        return new SweepOutcome(points.Count, skipped, computed, corrupt, failed);
    }

    /// <summary>Estimated memory from which a finished point's garbage is collected at once.</summary>
    private const long LargePointBytes = 256L << 20;

    /// <summary>
    /// Returns a finished large point's memory to the system before the next point starts. Without it the
    /// workstation collector left it to be collected later: one process running the cluster at N = 22 point after
    /// point (5.2 GiB of vectors each) held 16 GiB after four points. With no other point running, the
    /// process's peak resident set is also reset (Linux: /proc/self/clear_refs), so each point's memory_bytes
    /// is its own peak rather than the largest so far.
    /// </summary>
    private static void ReleaseMemory(bool alone)
    {
        GC.Collect(2, GCCollectionMode.Aggressive, blocking: true, compacting: true);
        if (!alone || !OperatingSystem.IsLinux()) return;
        try
        {
            File.WriteAllText("/proc/self/clear_refs", "5");
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            // Not available (older kernels, restricted /proc): the peak stays the process's.
        }
    }

    internal static string FormatTStar(PointResult r)
        => r.TStar is double t ? t.ToString("0.###", CultureInfo.InvariantCulture) : $"> {r.FinalTime.ToString("0.##", CultureInfo.InvariantCulture)} (not reached)";

    /// <summary>Bytes as MiB or GiB.</summary>
    public static string FormatBytes(long bytes)
        => bytes >= 1L << 60 ? "unlimited" : bytes >= 1L << 30 ? $"{(bytes / (double)(1L << 30)).ToString("0.##", CultureInfo.InvariantCulture)} GiB"
            : $"{(bytes / (double)(1L << 20)).ToString("0.#", CultureInfo.InvariantCulture)} MiB";

    /// <summary>Seconds as s, min or h.</summary>
    public static string FormatDuration(double seconds)
        => seconds < 120 ? $"{seconds:0} s" : seconds < 7200 ? $"{seconds / 60:0} min" : $"{seconds / 3600:0.#} h";
}
