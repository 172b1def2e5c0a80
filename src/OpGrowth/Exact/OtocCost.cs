namespace OpGrowth.Exact;

/// <summary>Work and resources of a run.</summary>
public sealed record OtocCost(long RealTimePropagations, long ImaginaryTimePropagations, long MatrixVectorProducts, double WallSeconds, long PeakWorkingSetBytes, double PropagationErrorBound);
