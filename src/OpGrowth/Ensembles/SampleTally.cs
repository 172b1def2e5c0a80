using System.Numerics;

namespace OpGrowth.Ensembles;

/// <summary>
/// Integer counts gathered from sampled strings at the record times: size sums and squares, the size histogram,
/// per-site occupation (per batch, for the jackknife), per-site letters, and the right end of the support. Counts
/// are integers, so merging the tallies of several workers gives the same totals in any order: results are
/// bit-identical at any thread count.
/// </summary>
internal sealed class SampleTally
{
    public readonly int N, Records, Batches;
    public readonly bool Letters, Ends;
    public readonly long[] SizeSum;     // [batch * R + r]
    public readonly long[] SizeSquares; // [r]
    public readonly long[] Histogram;   // [r * (N + 1) + k]
    public readonly int[] Occupation;   // [(batch * R + r) * N + j]
    public readonly int[] LetterCount;  // [(r * N + j) * 3 + code - 1]
    public readonly long[] EndSum, EndSquares; // [r]
    public readonly long[] BatchSamples; // [batch]

    public SampleTally(int n, int records, int batches, bool letters, bool ends)
    {
        N = n;
        Records = records;
        Batches = batches;
        Letters = letters;
        Ends = ends;
        SizeSum = new long[batches * records];
        SizeSquares = new long[records];
        Histogram = new long[records * (n + 1)];
        Occupation = new int[batches * records * n];
        LetterCount = letters ? new int[records * n * 3] : [];
        EndSum = ends ? new long[records] : [];
        EndSquares = ends ? new long[records] : [];
        BatchSamples = new long[batches];
    }

    /// <summary>Counts one sampled string at record <paramref name="r"/>; sites outside words [w0, w1] are identity.</summary>
    public void Record(int r, int batch, ReadOnlySpan<ulong> codes, int size, int w0, int w1, int end)
    {
        SizeSum[batch * Records + r] += size;
        SizeSquares[r] += (long)size * size;
        Histogram[r * (N + 1) + size]++;
        if (Ends)
        {
            EndSum[r] += end;
            EndSquares[r] += (long)end * end;
        }
        int occBase = (batch * Records + r) * N;
        for (int w = w0; w <= w1; w++)
        {
            ulong word = codes[w];
            // One bit per non-identity site: (x | z) at the even bit positions.
            ulong m = (word | (word >> 1)) & 0x5555555555555555UL;
            while (m != 0)
            {
                int bit = BitOperations.TrailingZeroCount(m);
                m &= m - 1;
                int site = (w << 5) + (bit >> 1);
                Occupation[occBase + site]++;
                if (Letters) LetterCount[(r * N + site) * 3 + (int)((word >> bit) & 3) - 1]++;
            }
        }
    }

    public void EndSample(int batch) => BatchSamples[batch]++;

    public void Add(SampleTally o)
    {
        Sum(SizeSum, o.SizeSum);
        Sum(SizeSquares, o.SizeSquares);
        Sum(Histogram, o.Histogram);
        for (int i = 0; i < Occupation.Length; i++) Occupation[i] += o.Occupation[i];
        for (int i = 0; i < LetterCount.Length; i++) LetterCount[i] += o.LetterCount[i];
        Sum(EndSum, o.EndSum);
        Sum(EndSquares, o.EndSquares);
        Sum(BatchSamples, o.BatchSamples);
    }

    private static void Sum(long[] a, long[] b)
    {
        for (int i = 0; i < a.Length; i++) a[i] += b[i];
    }

    /// <summary>Batches for the jackknife: 8 when the per-batch occupation fits in 2^22 counts per batch, else 1.</summary>
    public static int BatchesFor(int n, int records, int samples) => samples >= 16 && (long)n * records <= 1L << 22 ? 8 : 1;

    /// <summary>Letters are kept when they fit in 2^22 counts.</summary>
    public static bool LettersFor(int n, int records) => (long)n * records * 3 <= 1L << 22;

    /// <summary>Means and errors as an <see cref="EnsembleSeries"/>.</summary>
    public EnsembleSeries ToSeries(EnsembleSeries template)
    {
        long m = BatchSamples.Sum();
        int R = Records;
        var mean = new double[R];
        var err = new double[R];
        var dist = new double[R][];
        var rho = new double[R][];
        double[][][]? letters = Letters ? [new double[R][], new double[R][], new double[R][]] : null;
        for (int r = 0; r < R; r++)
        {
            long s = 0;
            for (int b = 0; b < Batches; b++) s += SizeSum[b * R + r];
            mean[r] = (double)s / m;
            double var = m > 1 ? ((double)SizeSquares[r] - (double)s * s / m) / (m - 1) : double.NaN;
            err[r] = Math.Sqrt(Math.Max(0, var) / m);
            dist[r] = new double[N + 1];
            for (int k = 0; k <= N; k++) dist[r][k] = Histogram[r * (N + 1) + k] / (double)m;
            rho[r] = new double[N];
            for (int b = 0; b < Batches; b++)
            {
                int o = (b * R + r) * N;
                for (int j = 0; j < N; j++) rho[r][j] += Occupation[o + j];
            }
            for (int j = 0; j < N; j++) rho[r][j] /= m;
            if (letters is not null)
            {
                for (int c = 0; c < 3; c++)
                {
                    letters[c][r] = new double[N];
                    for (int j = 0; j < N; j++) letters[c][r][j] = LetterCount[(r * N + j) * 3 + c] / (double)m;
                }
            }
        }
        var batches = new List<EnsembleBatch>();
        if (Batches > 1)
        {
            for (int b = 0; b < Batches; b++)
            {
                long mb = BatchSamples[b];
                if (mb == 0) continue;
                var bm = new double[R];
                var br = new double[R][];
                for (int r = 0; r < R; r++)
                {
                    bm[r] = SizeSum[b * R + r] / (double)mb;
                    br[r] = new double[N];
                    int o = (b * R + r) * N;
                    for (int j = 0; j < N; j++) br[r][j] = Occupation[o + j] / (double)mb;
                }
                batches.Add(new EnsembleBatch(mb, bm, br));
            }
        }
        double[]? endMean = null, endVar = null;
        if (Ends)
        {
            endMean = new double[R];
            endVar = new double[R];
            for (int r = 0; r < R; r++)
            {
                endMean[r] = (double)EndSum[r] / m;
                endVar[r] = m > 1 ? ((double)EndSquares[r] - (double)EndSum[r] * EndSum[r] / m) / (m - 1) : double.NaN;
            }
        }
        return template with
        {
            Samples = m,
            MeanSize = mean,
            MeanSizeError = err,
            SizeDistribution = dist,
            SiteWeights = rho,
            LetterWeights = letters,
            Batches = batches,
            RightEndMean = endMean,
            RightEndVariance = endVar,
        };
    }
}
