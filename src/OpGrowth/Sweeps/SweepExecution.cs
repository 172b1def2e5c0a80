namespace OpGrowth.Sweeps;

/// <summary>How a local sweep may use the machine.</summary>
/// <param name="Jobs">Points run at the same time.</param>
/// <param name="MemoryBytes">Total memory the points running at once may declare.</param>
public sealed record SweepExecution(int Jobs, long MemoryBytes);
