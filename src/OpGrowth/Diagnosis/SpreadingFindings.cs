namespace OpGrowth.Diagnosis;

/// <summary>One probe's Heisenberg evolution in the Pauli-string basis, reduced to what tests 3 and 4 use.</summary>
public sealed record ProbeEvolution
{
    /// <summary>The probe.</summary>
    public required string Probe { get; init; }

    /// <summary>Site the front is measured from (the probe's first site).</summary>
    public required int ProbeSite { get; init; }

    /// <summary>Recorded times.</summary>
    public required double[] Times { get; init; }

    /// <summary>Mean size n(t) in the model's size measure.</summary>
    public required double[] MeanSize { get; init; }

    /// <summary>Autocorrelation (O(0)|O(t)) with ||O(0)|| = 1.</summary>
    public required double[] Autocorrelation { get; init; }

    /// <summary>Site weights rho_j(t) per recorded time (normalised by the kept norm).</summary>
    public required double[][] SiteWeights { get; init; }

    /// <summary>Weight discarded by truncation up to each record.</summary>
    public required double[] Discarded { get; init; }

    /// <summary>String budget used.</summary>
    public required long MaxStrings { get; init; }

    /// <summary>Largest number of strings held.</summary>
    public long PeakStrings { get; init; }

    /// <summary>True when the run reached its final time.</summary>
    public bool Completed { get; init; }

    /// <summary>Why it stopped early, if it did.</summary>
    public string? StopReason { get; init; }

    /// <summary>Wall time in seconds.</summary>
    public double Seconds { get; init; }
}

/// <summary>Operator-size and autocorrelation figures of one probe (test 3).</summary>
public sealed record SizeFigures
{
    /// <summary>The probe.</summary>
    public required string Probe { get; init; }

    /// <summary>System size of the run.</summary>
    public required int N { get; init; }

    /// <summary>How the series was computed ("exact (typicality)", "Pauli strings, top-M truncation").</summary>
    public required string Engine { get; init; }

    /// <summary>True when the size is unbiased (exact or untruncated); a truncated run's late-time size is biased low.</summary>
    public required bool SizeTrusted { get; init; }

    /// <summary>Random-operator saturation value (3N/4 qubits, or half the Majoranas).</summary>
    public required double Saturation { get; init; }

    /// <summary>"qubits" or "Majoranas".</summary>
    public required string Measure { get; init; }

    /// <summary>Mean size averaged over the last fifth of the run.</summary>
    public required double LateSize { get; init; }

    /// <summary>LateSize / Saturation.</summary>
    public double Fraction => LateSize / Saturation;

    /// <summary>Growth of the mean size over the last quarter of the run, as a fraction of the saturation value.</summary>
    public required double LateGrowth { get; init; }

    /// <summary>Time at which the mean size first reaches half the saturation value (NaN if never).</summary>
    public required double HalfTime { get; init; }

    /// <summary>Exponential-regime fit of the excess size (n - n(0)) / (saturation - n(0)).</summary>
    public required ExponentialRegime EarlyGrowth { get; init; }

    /// <summary>Autocorrelation averaged over the last fifth of the run.</summary>
    public required double LateAutocorrelation { get; init; }

    /// <summary>Mazur bound of this probe (from test 5; 0 when unknown).</summary>
    public required double Mazur { get; init; }

    /// <summary>Total discarded weight at the end of the run.</summary>
    public required double Discarded { get; init; }

    /// <summary>Final time reached.</summary>
    public required double TimeReached { get; init; }
}

/// <summary>Front position and its two fits (test 4).</summary>
public sealed record FrontFigures
{
    /// <summary>The probe.</summary>
    public required string Probe { get; init; }

    /// <summary>Threshold on rho_j.</summary>
    public required double Threshold { get; init; }

    /// <summary>Largest distance from the probe on the lattice.</summary>
    public required int MaxDistance { get; init; }

    /// <summary>Largest distance the front reached during the run.</summary>
    public required int Reached { get; init; }

    /// <summary>Arrival time at each distance 0..MaxDistance (NaN when not reached).</summary>
    public required double[] ArrivalTimes { get; init; }

    /// <summary>Fit r = v t + c over the arrivals before the boundary (Slope = v_B).</summary>
    public LineFit? Linear { get; init; }

    /// <summary>Fit r = a + b ln t over the same arrivals.</summary>
    public LineFit? Logarithmic { get; init; }

    /// <summary>"ballistic", "logarithmic", "stalled", "none", "undetermined" or "not applicable".</summary>
    public required string Kind { get; init; }

    /// <summary>Final time of the run.</summary>
    public required double TimeReached { get; init; }

    /// <summary>Weight discarded by truncation over the run.</summary>
    public double Discarded { get; init; }

    /// <summary>Time of the run in units of 1/(motion scale) (see <see cref="OperatorAlgebra.MotionScale"/>).</summary>
    public required double TimeInLocalUnits { get; init; }
}

/// <summary>What tests 3 and 4 measured.</summary>
/// <param name="Runs">Pauli-string evolutions at the full size (the main probe).</param>
/// <param name="Sizes">Size and autocorrelation figures: exact runs at the smaller size first, then the full-size Pauli run.</param>
/// <param name="Front">Front of the main probe at the full size (null when not measured).</param>
public sealed record SpreadingFindings(IReadOnlyList<ProbeEvolution> Runs, IReadOnlyList<SizeFigures> Sizes, FrontFigures? Front);
