using System.Diagnostics;

namespace OpGrowth.Diagnosis;

/// <summary>
/// A time limit counted in processor time rather than wall time, so that a battery on a busy (or paused)
/// machine does the same work, and reaches the same verdict, as on an idle one. The limit "S seconds on
/// T threads" is reached when the process has used S x T processor-seconds since the budget started;
/// a wall-clock backstop of <see cref="WallFactor"/> x S still ends the stage on a machine so loaded that
/// the process hardly runs. Cancels the linked token when either is reached.
/// </summary>
public sealed class WorkBudget : IDisposable
{
    /// <summary>Wall-clock backstop as a multiple of the nominal seconds.</summary>
    public const double WallFactor = 10;

    private readonly CancellationTokenSource _cts;
    private readonly Timer _timer;
    private readonly TimeSpan _startCpu;
    private readonly Stopwatch _wall = Stopwatch.StartNew();
    private readonly double _cpuSeconds;
    private readonly double _wallSeconds;
    private readonly double _nominalSeconds;
    private int _reason; // 0 running, 1 processor time, 2 wall clock, 3 nominal wall time with the processor available

    /// <summary>Starts a budget of <paramref name="seconds"/> on <paramref name="threads"/> threads, linked to <paramref name="outer"/>.</summary>
    public WorkBudget(double seconds, int threads, CancellationToken outer)
    {
        _cts = CancellationTokenSource.CreateLinkedTokenSource(outer);
        _cpuSeconds = seconds * Math.Max(1, threads);
        _wallSeconds = seconds * WallFactor;
        _nominalSeconds = seconds;
        _startCpu = ProcessorTime();
        _timer = new Timer(_ => Check(), null, TimeSpan.FromMilliseconds(200), TimeSpan.FromMilliseconds(200));
    }

    /// <summary>Token cancelled when the budget is spent (or the outer token is cancelled).</summary>
    public CancellationToken Token => _cts.Token;

    /// <summary>True when the budget (not the outer token) ended the work.</summary>
    public bool Spent => Volatile.Read(ref _reason) != 0;

    /// <summary>Processor-seconds used since the budget started.</summary>
    public double ProcessorSecondsUsed => (ProcessorTime() - _startCpu).TotalSeconds;

    /// <summary>A short description of what ended the stage, for reports ("" while running).</summary>
    public string Describe(double nominalSeconds, int threads) => Volatile.Read(ref _reason) switch
    {
        1 => FormattableString.Invariant($"work budget of {nominalSeconds:0} s on {Math.Max(1, threads)} threads ({_cpuSeconds:0} processor-seconds) spent"),
        2 => FormattableString.Invariant($"wall-clock backstop of {_wallSeconds:0} s reached (the machine is busy)"),
        3 => FormattableString.Invariant($"work budget of {nominalSeconds:0} s spent (wall time, with at least one processor available throughout)"),
        _ => string.Empty,
    };

    private void Check()
    {
        if (_reason != 0 || _cts.IsCancellationRequested) return;
        double cpu = ProcessorSecondsUsed, wall = _wall.Elapsed.TotalSeconds;
        // Rule 3: a stage that cannot use every thread (a mostly serial one) would otherwise run for
        // threads x seconds of wall time on an idle machine; once the nominal seconds have passed while
        // the process had at least a processor's worth of time (it was not starved), the budget is spent.
        int r = cpu >= _cpuSeconds ? 1 : wall >= _wallSeconds ? 2 : wall >= _nominalSeconds && cpu >= 0.9 * wall ? 3 : 0;
        if (r == 0) return;
        if (Interlocked.CompareExchange(ref _reason, r, 0) != 0) return;
        try
        {
            _cts.Cancel();
        }
        catch (ObjectDisposedException)
        {
            // Disposed concurrently: nothing left to stop.
        }
    }

    private static TimeSpan ProcessorTime()
    {
        using var p = Process.GetCurrentProcess();
        return p.TotalProcessorTime;
    }

    /// <inheritdoc />
    public void Dispose()
    {
        _timer.Dispose();
        _cts.Dispose();
    }
}
