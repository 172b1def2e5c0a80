using OpGrowth.Analysis;

namespace OpGrowth.Ensembles;

/// <summary>
/// The scrambling figures of an ensemble series (from the project's <see cref="ScramblingAnalysis"/>) with their
/// sampling errors: jackknife over the sample batches for sampled series (null where there are no batches or the
/// figure is missing in a batch), and the mean-size error propagated to t* (sigma_n(t*) / |dn/dt|).
/// </summary>
public sealed record EnsembleFigures
{
    /// <summary>The figures of the full average.</summary>
    public required ScramblingFigures Figures { get; init; }

    /// <summary>Sampling error of v_B (jackknife over batches).</summary>
    public double? VBSamplingError { get; init; }

    /// <summary>Sampling error of t*: jackknife where batches exist, else the mean-size error over the slope at t*.</summary>
    public double? TStarSamplingError { get; init; }

    /// <summary>Sampling error of the growth rate of the regime the analysis chose (jackknife).</summary>
    public double? GrowthRateSamplingError { get; init; }

    /// <summary>Growth rate of the chosen regime: exponential rate, or linear slope on one-dimensional lattices.</summary>
    public double? GrowthRate => Figures.Growth.Regime == "exponential" ? Figures.Growth.SizeExponential.Rate : Figures.Growth.SizeLinear.Rate;

    /// <summary>Fit error of that growth rate.</summary>
    public double? GrowthRateFitError => Figures.Growth.Regime == "exponential" ? Figures.Growth.SizeExponential.RateError : Figures.Growth.SizeLinear.RateError;

    /// <summary>Derives the figures and their sampling errors.</summary>
    public static EnsembleFigures Of(EnsembleSeries series, ScramblingAnalysisOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(series);
        var full = ScramblingAnalysis.Analyze(series.ToInput(), options);
        double? vbErr = null, tsErr = null, grErr = null;
        int b = series.Batches.Count;
        if (b >= 2)
        {
            long total = series.Batches.Sum(x => x.Samples);
            var vb = new double?[b];
            var ts = new double?[b];
            var gr = new double?[b];
            for (int leave = 0; leave < b; leave++)
            {
                long m = total - series.Batches[leave].Samples;
                var mean = new double[series.Times.Length];
                var rho = new double[series.Times.Length][];
                for (int r = 0; r < mean.Length; r++)
                {
                    rho[r] = new double[series.N];
                    for (int k = 0; k < b; k++)
                    {
                        if (k == leave) continue;
                        double w = (double)series.Batches[k].Samples / m;
                        mean[r] += w * series.Batches[k].MeanSize[r];
                        var br = series.Batches[k].SiteWeights[r];
                        for (int j = 0; j < series.N; j++) rho[r][j] += w * br[j];
                    }
                }
                var f = ScramblingAnalysis.Analyze(series.ToInput() with { MeanSize = mean, SiteWeights = rho }, options);
                vb[leave] = f.Butterfly?.Primary.Velocity;
                ts[leave] = f.ScramblingTime.Value;
                gr[leave] = full.Growth.Regime == "exponential" ? f.Growth.SizeExponential.Rate : f.Growth.SizeLinear.Rate;
            }
            vbErr = Jackknife(vb);
            tsErr = Jackknife(ts);
            grErr = Jackknife(gr);
        }
        if (tsErr is null && full.ScramblingTime.Value is double t && series.MeanSizeError.Length == series.Times.Length)
            tsErr = PropagatedError(series, t);
        return new EnsembleFigures { Figures = full, VBSamplingError = vbErr, TStarSamplingError = tsErr, GrowthRateSamplingError = grErr };
    }

    /// <summary>Jackknife standard error of leave-one-out estimates (null when any is missing).</summary>
    // Source: B. Efron, C. Stein, Ann. Stat. 9, 586 (1981) (jackknife variance).
    internal static double? Jackknife(double?[] values)
    {
        if (values.Any(v => v is null)) return null;
        int b = values.Length;
        double mean = values.Average(v => v!.Value);
        double s = values.Sum(v => (v!.Value - mean) * (v.Value - mean));
        return Math.Sqrt((b - 1.0) / b * s);
    }

    private static double PropagatedError(EnsembleSeries s, double tStar)
    {
        int i = Array.FindIndex(s.Times, x => x >= tStar);
        if (i <= 0) i = 1;
        if (i >= s.Times.Length) i = s.Times.Length - 1;
        double slope = (s.MeanSize[i] - s.MeanSize[i - 1]) / (s.Times[i] - s.Times[i - 1]);
        double sigma = Math.Max(s.MeanSizeError[i], s.MeanSizeError[i - 1]);
        return slope > 0 ? sigma / slope : double.NaN;
    }
}
