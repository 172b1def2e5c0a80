namespace OpGrowth.Ensembles;

/// <summary>One batch of samples (sample index modulo the batch count): its mean size and site weights, for jackknife errors.</summary>
/// <param name="Samples">Samples in the batch.</param>
/// <param name="MeanSize">Mean size per record.</param>
/// <param name="SiteWeights">Site occupation per record and site.</param>
public sealed record EnsembleBatch(long Samples, double[] MeanSize, double[][] SiteWeights);
