namespace OpGrowth.Krylov;

/// <summary>Record of one Lanczos step n (producing b_n and O_n).</summary>
public sealed record LanczosStep
{
    /// <summary>Step index n (1-based).</summary>
    public required int N { get; init; }

    /// <summary>b_n = ||A_n||, computed before O_n is truncated.</summary>
    public required double B { get; init; }

    /// <summary>Strings of A_n before truncation.</summary>
    public required long StringsBeforeTruncation { get; init; }

    /// <summary>Strings kept in O_n.</summary>
    public required long Strings { get; init; }

    /// <summary>Fraction of ||O_n||^2 = 1 removed by truncation at this step (0 in exact mode).</summary>
    public required double DiscardedWeight { get; init; }

    /// <summary>Wall time of the step in seconds.</summary>
    public required double Seconds { get; init; }

    /// <summary>Processor time of the whole process during the step (all threads, GC included), in seconds: independent of machine load.</summary>
    public double CpuSeconds { get; init; }

    /// <summary>Bytes held at the end of the step's accumulation (vectors + accumulator + kept vectors), by our own accounting.</summary>
    public required long AccountedBytes { get; init; }

    /// <summary>Accumulator bytes per string of A_n, measured (dense arrays with growth slack plus index).</summary>
    public required double AccumulatorBytesPerString { get; init; }

    /// <summary>Lowest site used by O_n (-1 when empty or not meaningful).</summary>
    public int SupportFirst { get; init; } = -1;

    /// <summary>Highest site used by O_n (-1 when empty or not meaningful).</summary>
    public int SupportLast { get; init; } = -1;

    /// <summary>Largest number of sites a string of O_n spans (last - first + 1).</summary>
    public int MaxSpan { get; init; }

    /// <summary>Largest |(O_k|A_n)|/||A_n|| against kept vectors before re-orthogonalization (null when not measured).</summary>
    public double? OrthogonalityLoss { get; init; }
}
