namespace OpGrowth.Exact;

/// <summary>Settings of <see cref="KrylovPropagator"/>.</summary>
public sealed record KrylovOptions
{
    /// <summary>
    /// Error budget: the estimated norm of the error of one call, relative to the norm of the input
    /// vector, summed over the internal steps (each step may use its share in proportion to its length).
    /// </summary>
    public double Tolerance { get; init; } = 1e-10;

    /// <summary>Largest Krylov dimension before a step is shortened (each basis vector holds 2^N amplitudes).</summary>
    public int MaxDimension { get; init; } = 30;

    /// <summary>Validates the settings.</summary>
    public void Validate()
    {
        if (!(Tolerance > 0 && Tolerance < 1)) throw new ArgumentOutOfRangeException(nameof(Tolerance), Tolerance, "Tolerance must lie in (0, 1).");
        ArgumentOutOfRangeException.ThrowIfLessThan(MaxDimension, 4, nameof(MaxDimension));
        ArgumentOutOfRangeException.ThrowIfGreaterThan(MaxDimension, 200, nameof(MaxDimension));
    }
}
