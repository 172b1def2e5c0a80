namespace OpGrowth.Evolution;

/// <summary>Numerical options of an evolution run.</summary>
public sealed record EvolutionOptions
{
    /// <summary>Integrator (ignored for periodic drives, which are applied exactly period by period).</summary>
    public IntegrationMethod Method { get; init; } = IntegrationMethod.Trotter2;

    /// <summary>Time step (Hamiltonian evolution).</summary>
    public double Dt { get; init; } = 0.05;

    /// <summary>Final time; rounded up to a whole number of steps (or periods).</summary>
    public double Time { get; init; } = 10;

    /// <summary>Record the observables every this many steps (periods); the final time is always recorded.</summary>
    public int RecordEvery { get; init; } = 1;

    /// <summary>Truncation.</summary>
    public TruncationPolicy Truncation { get; init; } = new();

    /// <summary>Worker threads.</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    /// <summary>
    /// Number of budgets in the budget series (1: only the given budget; 2 or 3: reruns at half and a quarter
    /// of it too). How far each figure moves between the two largest budgets is its truncation uncertainty.
    /// </summary>
    public int BudgetCount { get; init; } = 1;

    /// <summary>The former name of <see cref="BudgetCount"/> (kept for the diagnosis battery until it uses BudgetCount).</summary>
    public int LadderRungs
    {
        get => BudgetCount;
        init => BudgetCount = value;
    }

    /// <summary>Relative movement of a derived figure between the two largest budgets above which it is flagged as not converged.</summary>
    public double ConvergenceTolerance { get; init; } = 0.05;

    /// <summary>Folder for checkpoints (null: no checkpoints).</summary>
    public string? CheckpointDirectory { get; init; }

    /// <summary>Wall time between checkpoints (taken at record times; the end of each budget's run and an interruption are always checkpointed).</summary>
    public TimeSpan CheckpointInterval { get; init; } = TimeSpan.FromMinutes(5);

    /// <summary>Continue from the checkpoints in <see cref="CheckpointDirectory"/> when present.</summary>
    public bool Resume { get; init; }

    /// <summary>Testing hook: stop abruptly (as if killed) once this step has been reached and checkpointed.</summary>
    internal long? HaltAtStep { get; init; }
}
