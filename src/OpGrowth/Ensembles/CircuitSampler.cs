using OpGrowth.Pauli;

namespace OpGrowth.Ensembles;

/// <summary>
/// Haar-averaged operator growth in a random circuit, exact up to sampling error, at any N: each sample follows
/// the probe through a circuit of uniformly random two-qubit Clifford gates, under which it stays a single Pauli
/// string (weight 1), updated only where a gate touches its support.
/// </summary>
/// <remarks>
/// Why Clifford samples give Haar averages: every quantity reported (Pauli weights c_S^2, hence the size
/// distribution, the site weights and the infinite-temperature OTOCs F = sum_S c_S^2 e_S(V)) is a polynomial of
/// degree (2, 2) in each gate and its conjugate, so its average over independent gates needs only a unitary
/// 2-design per gate, and the Clifford group is one (a 3-design for qubits).
/// Source: Z. Webb, arXiv:1510.02769 (2015); H. Zhu, PRA 96, 062336 (2017).
/// A uniformly random two-qubit Clifford maps a fixed non-identity Pauli to each of the 15 non-identity Paulis
/// with probability 1/15 (its symplectic part acts transitively on the non-zero vectors of F_2^4; the sign is
/// irrelevant for c_S^2), so the sampler draws that image directly instead of a gate; a single-qubit Clifford
/// likewise maps X, Y, Z to a uniformly random one of the three. The tests check the claim on the full
/// symplectic group Sp(4, 2) and the averages against Haar circuits on the dense route.
/// Cost: O(gates touching the support) per layer on an open-chain brickwork, O(N) per layer otherwise (the layer
/// itself is visited, or, for random pairs, drawn); no allocation per gate.
/// </remarks>
public static class CircuitSampler
{
    /// <summary>Samples the circuit's first probe (or Z_0).</summary>
    public static EnsembleSeries Run(Circuit circuit, EnsembleOptions options) => Run(circuit, circuit.Probe, options);

    /// <summary>Samples <paramref name="probe"/> through <paramref name="circuit"/>.</summary>
    public static EnsembleSeries Run(Circuit circuit, PauliString probe, EnsembleOptions options)
    {
        ArgumentNullException.ThrowIfNull(circuit);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate(probe, circuit.N, "circuit");
        if (circuit.Layers < 1) throw new IO.InputException($"layers {circuit.Layers}; expected at least 1");
        var schedule = new GateSchedule(circuit);
        int n = circuit.N;
        int recordEvery = options.RecordEvery;
        int records = circuit.Layers / recordEvery + 1;
        int batches = SampleTally.BatchesFor(n, records, options.Samples);
        bool letters = SampleTally.LettersFor(n, records);
        int threads = Math.Min(options.Threads, options.Samples);
        var tallies = new SampleTally[threads];
        var ct = options.Cancellation;
        Parallel.For(0, threads, new ParallelOptions { MaxDegreeOfParallelism = threads, CancellationToken = ct }, w =>
        {
            var tally = new SampleTally(n, records, batches, letters, schedule.IsChainBrickwork);
            var codes = new ulong[PackedCodes.WordCount(n)];
            var pairs = new int[Math.Max(2, schedule.MaxPairEntries)];
            var scratch = new int[Math.Max(1, schedule.ScratchLength)];
            var stamp = new int[n];
            int stampValue = 0;
            for (int s = w; s < options.Samples; s += threads)
            {
                ct.ThrowIfCancellationRequested();
                var rng = new SampleRandom(options.Seed, s);
                RunSample(circuit, schedule, probe, recordEvery, ref rng, tally, s % batches, codes, pairs, scratch, stamp, ref stampValue);
            }
            tallies[w] = tally;
        });
        var total = tallies[0];
        for (int i = 1; i < tallies.Length; i++) total.Add(tallies[i]);
        var template = new EnsembleSeries
        {
            Kind = "random circuit",
            Engine = "circuit",
            Name = circuit.Name,
            Method = $"{options.Samples} samples of uniformly random Clifford gates (a unitary 2-design: equal to the Haar average), seed {options.Seed}",
            N = n,
            Seed = options.Seed,
            Times = Enumerable.Range(0, records).Select(r => (double)(r * recordEvery)).ToArray(),
            TimeUnit = "layers",
            ProbeSites = probe.Support(),
            Probe = probe.ToString(),
            Geometry = circuit.Geometry,
        };
        return total.ToSeries(template);
    }

    private static void RunSample(Circuit circuit, GateSchedule schedule, PauliString probe, int recordEvery, ref SampleRandom rng, SampleTally tally, int batch,
        ulong[] codes, int[] pairs, int[] scratch, int[] stamp, ref int stampValue)
    {
        int n = circuit.N;
        int size = PackedCodes.Load(probe, codes);
        int lo = probe.FirstSite, hi = probe.LastSite;
        bool chain = schedule.IsChainBrickwork;
        int lastWord = codes.Length - 1;
        tally.Record(0, batch, codes, size, chain ? lo >> 5 : 0, chain ? hi >> 5 : lastWord, hi);
        for (int layer = 1; layer <= circuit.Layers; layer++)
        {
            if (chain)
            {
                // Bonds (a, a+1) of this layer's parity that touch [lo, hi].
                int parity = (layer - 1) & 1;
                int a = Math.Max(0, lo - 1);
                if ((a & 1) != parity) a++;
                for (; a <= hi && a + 1 < n; a += 2) size += Gate(codes, a, a + 1, ref rng);
                int newLo = Math.Max(0, lo - 1), newHi = Math.Min(n - 1, hi + 1);
                while (PackedCodes.Get(codes, newLo) == 0) newLo++;
                while (PackedCodes.Get(codes, newHi) == 0) newHi--;
                lo = newLo;
                hi = newHi;
            }
            else
            {
                int[] list;
                int count;
                if (circuit.Layout == CircuitLayout.Brickwork)
                {
                    list = schedule.BrickworkClass(layer);
                    count = list.Length;
                }
                else
                {
                    count = schedule.RandomLayer(ref rng, pairs, scratch, stamp, ++stampValue);
                    list = pairs;
                }
                for (int i = 0; i < count; i += 2) size += Gate(codes, list[i], list[i + 1], ref rng);
            }
            if (circuit.SingleQubitLayers) SingleQubitLayer(codes, chain ? lo >> 5 : 0, chain ? hi >> 5 : lastWord, ref rng);
            if (layer % recordEvery == 0)
                tally.Record(layer / recordEvery, batch, codes, size, chain ? lo >> 5 : 0, chain ? hi >> 5 : lastWord, hi);
        }
        tally.EndSample(batch);
    }

    /// <summary>A Haar gate on (a, b), sampled: identity stays identity, anything else becomes a uniformly random non-identity pair. Returns the size change.</summary>
    private static int Gate(ulong[] codes, int a, int b, ref SampleRandom rng)
    {
        int ca = PackedCodes.Get(codes, a), cb = PackedCodes.Get(codes, b);
        if ((ca | cb) == 0) return 0;
        int r = rng.NextNonIdentityPair();
        int na = r & 3, nb = r >> 2;
        PackedCodes.Set(codes, a, na);
        PackedCodes.Set(codes, b, nb);
        return (na != 0 ? 1 : 0) + (nb != 0 ? 1 : 0) - (ca != 0 ? 1 : 0) - (cb != 0 ? 1 : 0);
    }

    private static void SingleQubitLayer(ulong[] codes, int w0, int w1, ref SampleRandom rng)
    {
        for (int w = w0; w <= w1; w++)
        {
            ulong word = codes[w];
            ulong m = (word | (word >> 1)) & 0x5555555555555555UL;
            while (m != 0)
            {
                int bit = System.Numerics.BitOperations.TrailingZeroCount(m);
                m &= m - 1;
                word = (word & ~(3UL << bit)) | ((ulong)rng.NextNonIdentitySingle() << bit);
            }
            codes[w] = word;
        }
    }
}
