namespace OpGrowth.Ensembles;

/// <summary>Sampling choices of the ensemble engines (each one is stated in the results).</summary>
public sealed record EnsembleOptions
{
    /// <summary>Samples (random circuits or noise trajectories) to average.</summary>
    public int Samples { get; init; } = 1000;

    /// <summary>Seed: sample s draws from a stream fixed by (seed, s) alone.</summary>
    public long Seed { get; init; } = 1;

    /// <summary>Worker threads (results do not depend on it).</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>Circuits: record every this many layers.</summary>
    public int RecordEvery { get; init; } = 1;

    /// <summary>Brownian models: final time.</summary>
    public double Time { get; init; } = 10;

    /// <summary>Brownian models: time between records.</summary>
    public double RecordInterval { get; init; } = 0.1;

    /// <summary>
    /// Brownian models: the noise time tau in E[J_a(t) J_a(t')] = J_a^2 tau delta(t - t') (units of the model's time;
    /// default 1). The string-hopping rate of term a is 4 J_a^2 tau (docs/ensembles.md).
    /// </summary>
    public double NoiseTime { get; init; } = 1;

    /// <summary>Stops the sampling (throws <see cref="OperationCanceledException"/>).</summary>
    public CancellationToken Cancellation { get; init; }

    /// <summary>Checks the options and the probe of a system of <paramref name="n"/> qubits (<paramref name="what"/>: "circuit", "model").</summary>
    internal void Validate(OpGrowth.Pauli.PauliString probe, int n, string what)
    {
        ArgumentNullException.ThrowIfNull(probe);
        Validate();
        if (probe.N != n) throw new IO.InputException($"probe on {probe.N} qubits for a {what} of {n}; expected the same number");
        if (probe.IsIdentity) throw new IO.InputException("the identity as probe; expected a non-identity Pauli string");
    }

    internal void Validate()
    {
        if (Samples < 2) throw new IO.InputException($"samples {Samples}; expected at least 2 (the sampling error needs two)");
        if (Threads < 1) throw new IO.InputException($"threads {Threads}; expected at least 1");
        if (RecordEvery < 1) throw new IO.InputException($"record every {RecordEvery}; expected at least 1 layer");
        if (!(Time > 0 && double.IsFinite(Time))) throw new IO.InputException($"time {Time}; expected a positive time");
        if (!(RecordInterval > 0 && RecordInterval <= Time)) throw new IO.InputException($"record interval {RecordInterval}; expected a positive interval no longer than the time {Time}");
        if (!(NoiseTime > 0 && double.IsFinite(NoiseTime))) throw new IO.InputException($"noise time {NoiseTime}; expected a positive time");
    }
}
