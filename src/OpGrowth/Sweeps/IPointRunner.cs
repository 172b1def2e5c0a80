namespace OpGrowth.Sweeps;

/// <summary>
/// Runs one sweep point. Implementations must be deterministic (the same point gives the same figures)
/// and must not write results themselves: the sweep stores them (<see cref="PointStore"/>). A runner is
/// used from several threads at once when points run in parallel.
/// </summary>
public interface IPointRunner
{
    /// <summary>Estimated peak memory of running <paramref name="point"/> (bytes), for the scheduler's memory budget.</summary>
    long EstimateMemoryBytes(SweepPoint point);

    /// <summary>Estimated wall time of running <paramref name="point"/> (seconds), or null when the engine has no cost model.</summary>
    double? EstimateSeconds(SweepPoint point) => null;

    /// <summary>Runs the point and returns its figures. Throws <see cref="OperationCanceledException"/> when cancelled.</summary>
    PointResult Run(SweepPoint point, CancellationToken cancellationToken);
}
