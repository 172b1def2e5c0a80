using Microsoft.Extensions.Logging;

namespace OpGrowth.Krylov;

/// <summary>Settings of one Lanczos (recursion-method) run.</summary>
public sealed record LanczosOptions
{
    /// <summary>Number of coefficients b_1..b_depth to compute (at most).</summary>
    public int Depth { get; init; } = 20;

    /// <summary>
    /// Memory budget in bytes for the Krylov vectors, the accumulator of the step in progress and any
    /// kept vectors. The run stops cleanly before a step that would exceed it.
    /// </summary>
    public long MemoryBudgetBytes { get; init; } = 8L << 30;

    /// <summary>Keep at most this many strings per Krylov vector (largest |c| first); 0 = no truncation (exact).</summary>
    public long MaxStrings { get; init; }

    /// <summary>
    /// Without truncation (<see cref="MaxStrings"/> = 0): stop, keeping the coefficients so far, before a step whose
    /// Krylov vector is predicted to exceed this many strings (0 = no limit). Bounds time and memory of an exact run.
    /// </summary>
    public long StopAtStrings { get; init; }

    /// <summary>
    /// Without truncation: also stop before a step that would bring the commutator products of the whole run
    /// (strings of each vector times the terms each one meets, summed over the steps) above this (0 = no limit).
    /// Bounds the time of an exact run on a Hamiltonian with many terms, where a vector of few strings already
    /// costs a lot.
    /// </summary>
    public long StopAtProducts { get; init; }

    /// <summary>Re-orthogonalization against earlier (kept, possibly truncated) Krylov vectors.</summary>
    public Reorthogonalization Reorthogonalize { get; init; } = Reorthogonalization.None;

    /// <summary>Number of most recent vectors used by <see cref="Reorthogonalization.Partial"/>.</summary>
    public int ReorthogonalizationWindow { get; init; } = 8;

    /// <summary>Worker threads for the commutator.</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>
    /// b_n below this multiple of b_1 ends the run: the Krylov space is closed. A floating-point zero test;
    /// 1e-12 sits well above accumulated rounding (about 1e-15 relative per step).
    /// </summary>
    public double ClosureTolerance { get; init; } = 1e-12;

    /// <summary>Progress log (one line per step), or null.</summary>
    public ILogger? Logger { get; init; }

    /// <summary>Cancels between chunks of a step; finished coefficients are kept.</summary>
    public CancellationToken Cancellation { get; init; }

    /// <summary>Checks the values; throws <see cref="ArgumentOutOfRangeException"/> naming the bad one.</summary>
    public void Validate()
    {
        ArgumentOutOfRangeException.ThrowIfLessThan(Depth, 1, nameof(Depth));
        ArgumentOutOfRangeException.ThrowIfLessThan(MemoryBudgetBytes, 1L << 20, nameof(MemoryBudgetBytes));
        ArgumentOutOfRangeException.ThrowIfNegative(MaxStrings, nameof(MaxStrings));
        ArgumentOutOfRangeException.ThrowIfNegative(StopAtStrings, nameof(StopAtStrings));
        ArgumentOutOfRangeException.ThrowIfNegative(StopAtProducts, nameof(StopAtProducts));
        ArgumentOutOfRangeException.ThrowIfLessThan(ReorthogonalizationWindow, 1, nameof(ReorthogonalizationWindow));
        ArgumentOutOfRangeException.ThrowIfLessThan(Threads, 1, nameof(Threads));
        ArgumentOutOfRangeException.ThrowIfNegative(ClosureTolerance, nameof(ClosureTolerance));
    }
}
