namespace OpGrowth.Evolution;

/// <summary>Per-step bookkeeping: strings after the step, weight discarded in the step and since t = 0.</summary>
public readonly record struct StepLog(long Step, double Time, int Strings, double Discarded, double DiscardedTotal);
