using OpGrowth.Pauli;

namespace OpGrowth.Ensembles;

/// <summary>
/// Continuous-time Monte Carlo of the noise-averaged master equation of a <see cref="BrownianModel"/>: each
/// trajectory is one Pauli string that jumps from S to P_a S at rate Gamma_a for every term P_a anticommuting with S
/// (Gillespie's direct method). The average over trajectories of any function of the string equals its average
/// over the weights of the master equation; records are taken on a fixed time grid.
/// Source: D. T. Gillespie, J. Comput. Phys. 22, 403 (1976) (direct method).
/// </summary>
/// <remarks>
/// Rates are held as 40-bit fixed-point integers (relative quantisation below 1e-12) in a Fenwick tree, so the
/// total rate is exact, never drifts and the choice of term costs O(log T); a jump re-examines only the terms
/// that touch the sites it changed. Any N and connectivity; cost per jump O(degree x log T).
/// </remarks>
public static class BrownianSampler
{
    private const double FixedScale = 1L << 40;

    /// <summary>Samples the model's first probe.</summary>
    public static EnsembleSeries Run(BrownianModel model, EnsembleOptions options)
        => Run(model, model.Probes.Count > 0 ? model.Probes[0] : PauliString.Single(model.N, 0, 'Z'), options);

    /// <summary>Samples <paramref name="probe"/>.</summary>
    public static EnsembleSeries Run(BrownianModel model, PauliString probe, EnsembleOptions options)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate(probe, model.N, "model");
        if (Math.Abs(model.NoiseTime - options.NoiseTime) > 1e-15 * model.NoiseTime)
            throw new ArgumentException($"the model was built with noise time {model.NoiseTime} and the options ask for {options.NoiseTime}", nameof(options));
        int n = model.N;
        int records = (int)Math.Floor(options.Time / options.RecordInterval + 1e-9) + 1;
        int batches = SampleTally.BatchesFor(n, records, options.Samples);
        bool letters = SampleTally.LettersFor(n, records);
        double maxRate = model.TermCount > 0 ? model.Rates.Max() : 1;
        var rateQ = model.Rates.Select(r => (long)Math.Round(r / maxRate * FixedScale)).ToArray();
        double unit = maxRate / FixedScale;
        int threads = Math.Min(options.Threads, options.Samples);
        var tallies = new SampleTally[threads];
        var ct = options.Cancellation;
        Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads, CancellationToken = ct }, w =>
        {
            var tally = new SampleTally(n, records, batches, letters, ends: false);
            var codes = new ulong[PackedCodes.WordCount(n)];
            var active = new bool[model.TermCount];
            var tree = new long[model.TermCount + 1];
            for (int s = w; s < options.Samples; s += threads)
            {
                ct.ThrowIfCancellationRequested();
                var rng = new SampleRandom(options.Seed, s);
                Trajectory(model, probe, rateQ, unit, records, options.RecordInterval, ref rng, tally, s % batches, codes, active, tree);
            }
            tallies[w] = tally;
        });
        var total = tallies[0];
        for (int i = 1; i < tallies.Length; i++) total.Add(tallies[i]);
        return total.ToSeries(new EnsembleSeries
        {
            Kind = "Brownian (trajectories)",
            Engine = "brownian",
            Name = model.Name,
            Method = $"{options.Samples} continuous-time trajectories of the noise-averaged master equation (rates 4 J_a^2 tau, tau = {model.NoiseTime}), seed {options.Seed}",
            N = n,
            Seed = options.Seed,
            Times = Enumerable.Range(0, records).Select(r => r * options.RecordInterval).ToArray(),
            TimeUnit = "time",
            ProbeSites = probe.Support(),
            Probe = probe.ToString(),
            Geometry = model.Geometry,
        });
    }

    private static void Trajectory(BrownianModel m, PauliString probe, long[] rateQ, double unit, int records, double interval, ref SampleRandom rng,
        SampleTally tally, int batch, ulong[] codes, bool[] active, long[] tree)
    {
        int size = PackedCodes.Load(probe, codes);
        Array.Clear(active);
        Array.Clear(tree);
        long total = 0;
        int lastWord = codes.Length - 1;
        foreach (int j in probe.Support()) Refresh(m, j, codes, rateQ, active, tree, ref total);
        double time = 0;
        int r = 0;
        while (r < records)
        {
            double next = total == 0 ? double.PositiveInfinity : time - Math.Log(rng.NextOpenDouble()) / (total * unit);
            while (r < records && r * interval < next)
            {
                tally.Record(r, batch, codes, size, 0, lastWord, 0);
                r++;
            }
            if (r >= records) break;
            long target = (long)(((UInt128)rng.Next() * (ulong)total) >> 64);
            int t = Find(tree, target);
            for (int p = m.TermStart[t]; p < m.TermStart[t + 1]; p++)
            {
                int site = m.TermSites[p];
                int old = PackedCodes.Get(codes, site);
                int now = old ^ m.TermCodes[p];
                PackedCodes.Set(codes, site, now);
                size += (now != 0 ? 1 : 0) - (old != 0 ? 1 : 0);
            }
            for (int p = m.TermStart[t]; p < m.TermStart[t + 1]; p++) Refresh(m, m.TermSites[p], codes, rateQ, active, tree, ref total);
            time = next;
        }
        tally.EndSample(batch);
    }

    /// <summary>Re-examines every term touching <paramref name="site"/>.</summary>
    private static void Refresh(BrownianModel m, int site, ulong[] codes, long[] rateQ, bool[] active, long[] tree, ref long total)
    {
        for (int q = m.SiteStart[site]; q < m.SiteStart[site + 1]; q++)
        {
            int t = m.SiteTerms[q];
            bool anti = m.Anticommutes(t, codes);
            if (anti == active[t]) continue;
            active[t] = anti;
            long delta = anti ? rateQ[t] : -rateQ[t];
            total += delta;
            for (int i = t + 1; i < tree.Length; i += i & -i) tree[i] += delta;
        }
    }

    /// <summary>The term whose cumulative rate interval holds <paramref name="target"/> (0 &lt;= target &lt; total).</summary>
    private static int Find(long[] tree, long target)
    {
        int pos = 0;
        int step = 1;
        while (step * 2 < tree.Length) step *= 2;
        for (; step > 0; step >>= 1)
        {
            int next = pos + step;
            if (next < tree.Length && tree[next] <= target)
            {
                pos = next;
                target -= tree[next];
            }
        }
        return pos; // 0-based term index = (1-based position) - 1 + 1
    }
}
