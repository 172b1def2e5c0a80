namespace OpGrowth.Exact;

/// <summary>One evaluation of the mean size by the random-sign probe.</summary>
/// <param name="Time">Time evaluated.</param>
/// <param name="MeanSize">Mean over the random states.</param>
/// <param name="Error">Standard error over the states (several states) or the a-priori estimate (one state).</param>
/// <param name="PerSample">The value of every random state.</param>
public sealed record SizeEvaluation(double Time, double MeanSize, double Error, IReadOnlyList<double> PerSample);

/// <summary>What <see cref="ScramblingTimeSearch"/> found.</summary>
public sealed record ScramblingTimeSearchResult
{
    public int N { get; init; }

    /// <summary>The evolved operator.</summary>
    public required string Operator { get; init; }

    /// <summary>"qubits" or "majoranas".</summary>
    public required string SizeMeasure { get; init; }

    /// <summary>Mean size of a random operator (3N/4 qubits, or half the Majorana count).</summary>
    public double Saturation { get; init; }

    /// <summary>The size level that defines t*.</summary>
    public double Target { get; init; }

    /// <summary>t*, or null when the size stayed below the target up to <see cref="LowerBound"/>.</summary>
    public double? TStar { get; init; }

    /// <summary>Interpolation error of t*: difference between the quadratic and the linear crossing through the nearest evaluations.</summary>
    public double LocationError { get; init; }

    /// <summary>Statistical error of t* from the random states: size error at the crossing over the slope dn/dt.</summary>
    public double SamplingError { get; init; }

    /// <summary>How <see cref="SamplingError"/> was obtained.</summary>
    public required string SamplingErrorKind { get; init; }

    /// <summary>When t* was not reached: the latest time evaluated (t* is larger).</summary>
    public double? LowerBound { get; init; }

    /// <summary>Slope dn/dt at the crossing (sites per unit time).</summary>
    public double? Slope { get; init; }

    /// <summary>Every evaluation, in time order (t = 0 is the exact initial size).</summary>
    public required IReadOnlyList<SizeEvaluation> Evaluations { get; init; }

    public int Samples { get; init; }

    /// <summary>Probe groups per random state (each with its own signs); 0 with site blocks.</summary>
    public int ProbeGroups { get; init; }

    /// <summary>How the mean size was estimated, in words.</summary>
    public string Estimator { get; init; } = "";

    /// <summary>Applications of H over all propagations.</summary>
    public long MatrixVectorProducts { get; init; }

    /// <summary>Summed truncation bound of the Chebyshev series.</summary>
    public double PropagationError { get; init; }

    /// <summary>Spectral interval used by the propagator.</summary>
    public SpectralBounds Bounds { get; init; }

    public double WallSeconds { get; init; }

    /// <summary>Memory of the state vectors the search held (bytes).</summary>
    public long VectorBytes { get; init; }

    public long PeakWorkingSetBytes { get; init; }
}
