using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Analysis;
using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>Options of <see cref="FrontEvolution"/>.</summary>
public sealed record FrontEvolutionOptions
{
    /// <summary>Final time.</summary>
    public required double Time { get; init; }

    /// <summary>Time step of the second-order sweep (bonds left to right with dt/2, then right to left with dt/2).</summary>
    public double Dt { get; init; } = 0.1;

    /// <summary>Record the site weights every this many steps.</summary>
    public int RecordEvery { get; init; } = 1;

    /// <summary>Bond dimensions of the budget series, ascending; the largest is the main run.</summary>
    public IReadOnlyList<int> BondDimensions { get; init; } = [16, 32, 64];

    /// <summary>Singular values whose square is below this fraction of the bond's weight are dropped (keeps the region ahead of the front thin). Errors of the site weights grow like the square root of it (measured: 1.7e-5 at 1e-12, 3e-6 at 1e-16 on 8 sites to t = 3, where dt = 0.005 leaves 3e-6).</summary>
    public double Cutoff { get; init; } = 1e-16;

    /// <summary>Front threshold as a fraction of the scrambled site weight 3/4.</summary>
    public double FrontFraction { get; init; } = 0.5;

    /// <summary>Two budgets agree on the arrival at a distance when their times differ by at most this fraction of the time (or 1.5 record spacings, whichever is larger).</summary>
    public double ArrivalTolerance { get; init; } = 0.02;

    /// <summary>Budgets run in parallel on this many threads.</summary>
    public int Threads { get; init; } = Environment.ProcessorCount;

    public ILogger? Logger { get; init; }
}

/// <summary>One run of the budget series.</summary>
public sealed record FrontRun
{
    public int BondDimension { get; init; }
    public required double[] Times { get; init; }
    /// <summary>Site weights rho_j per record (normalised by the kept norm).</summary>
    public required double[][] SiteWeights { get; init; }
    public required double[] MeanSize { get; init; }
    /// <summary>Kept norm ||O||^2 per record (1 minus the weight dropped so far).</summary>
    public required double[] NormSquared { get; init; }
    /// <summary>Raw overlap (O(0)|O(t)).</summary>
    public required double[] Autocorrelation { get; init; }
    /// <summary>Largest bond dimension in use per record.</summary>
    public required int[] MaxBond { get; init; }
    /// <summary>The derived figures (front, v_B, growth, t* on this chain).</summary>
    public required ScramblingFigures Figures { get; init; }
    public double WallSeconds { get; init; }
}

/// <summary>
/// What <see cref="FrontEvolution"/> found: the runs of the budget series (largest bond dimension last), the arrival
/// time of the front at every distance from the probe with its budget uncertainty, and the distance at which the
/// budget-series curves part.
/// </summary>
public sealed record FrontEvolutionResult
{
    public int N { get; init; }
    public required string Probe { get; init; }
    public required int[] ProbeSites { get; init; }
    /// <summary>Site weight that defines the front.</summary>
    public double Threshold { get; init; }
    /// <summary>Runs in ascending bond dimension.</summary>
    public required IReadOnlyList<FrontRun> Runs { get; init; }
    /// <summary>Arrival time of the front at distance d = 0..max (largest budget; NaN where not reached).</summary>
    public required double[] Arrival { get; init; }
    /// <summary>|arrival(largest) - arrival(next largest)| per distance (NaN where either is missing).</summary>
    public required double[] ArrivalUncertainty { get; init; }
    /// <summary>First distance at which the two largest budgets disagree (null: they agree wherever the front arrived).</summary>
    public int? PartDistance { get; init; }
    /// <summary>Time at which the two largest budgets' fronts part (arrival at <see cref="PartDistance"/> in the larger budget), null if they never part.</summary>
    public double? PartTime { get; init; }
    /// <summary>Largest distance whose arrival the budget series agrees on.</summary>
    public int ConvergedDistance { get; init; }
    /// <summary>Largest distance from the probe on the chain (the far end).</summary>
    public int MaxDistance { get; init; }
    /// <summary>How v_B and the other figures moved across the budgets (full budget first).</summary>
    public required IReadOnlyList<FigureConvergence> Convergence { get; init; }
    public double WallSeconds { get; init; }
}

/// <summary>
/// The operator front on chains of any length (tested to 1000 sites) from a matrix product in the Pauli basis
/// (<see cref="PauliChainOperator"/>), run as a budget series of bond dimensions so that every front arrival time
/// carries its truncation uncertainty and the distance where the budgets part is known.
/// </summary>
public static class FrontEvolution
{
    /// <summary>True when every term of <paramref name="h"/> acts within two neighbouring sites of the chain 0..N-1.</summary>
    public static bool Supports(Hamiltonian h, out string? reason) => BondGate.BondHamiltonians(h, out reason) is not null;

    /// <summary>Runs the budget series.</summary>
    public static FrontEvolutionResult Run(Hamiltonian h, PauliString probe, FrontEvolutionOptions o, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(h);
        ArgumentNullException.ThrowIfNull(probe);
        ArgumentNullException.ThrowIfNull(o);
        if (probe.N != h.N) throw new ArgumentException($"The probe acts on {probe.N} sites; the Hamiltonian on {h.N}.", nameof(probe));
        if (probe.IsIdentity) throw new ArgumentException("The probe must not be the identity.", nameof(probe));
        if (!(o.Time > 0) || !(o.Dt > 0) || o.RecordEvery < 1) throw new ArgumentOutOfRangeException(nameof(o), "Time and dt must be positive, records every step or more.");
        if (o.BondDimensions.Count == 0 || o.BondDimensions.Any(c => c < 1)) throw new ArgumentOutOfRangeException(nameof(o), "Bond dimensions must be positive.");
        var bondH = BondGate.BondHamiltonians(h, out string? reason) ?? throw new ArgumentException("The front engine needs a chain Hamiltonian: " + reason, nameof(h));
        int n = h.N;
        var half = bondH.Select(b => BondGate.Of(b, 0.5 * o.Dt)).ToArray();
        var full = BondGate.Of(bondH[n - 2], o.Dt);
        var sw = Stopwatch.StartNew();
        var dims = o.BondDimensions.Distinct().OrderBy(c => c).ToArray();
        var geometry = LatticeGeometry.Chain(n);
        var sites = probe.Support();
        var runs = new FrontRun[dims.Length];
        var po = new ParallelOptions { MaxDegreeOfParallelism = Math.Max(1, o.Threads), CancellationToken = ct };
        // Largest budget first: it takes longest.
        Parallel.ForEach(Enumerable.Range(0, dims.Length).Reverse(), po, i =>
            runs[i] = RunOne(probe, dims[i], half, full, o, geometry, sites, ct));
        var main = runs[^1].Figures.Butterfly?.Primary;
        var next = runs.Length > 1 ? runs[^2].Figures.Butterfly?.Primary : null;
        int rmax = ScramblingAnalysis.DistancesFromProbe(geometry, sites).Max();
        var arrival = main?.ArrivalTimes ?? Enumerable.Repeat(double.NaN, rmax + 1).ToArray();
        var other = next?.ArrivalTimes;
        var unc = new double[arrival.Length];
        double spacing = o.Dt * o.RecordEvery;
        int? part = null;
        int converged = 0;
        for (int d = 0; d < arrival.Length; d++)
        {
            double b = other is not null && d < other.Length ? other[d] : double.NaN;
            unc[d] = double.IsNaN(arrival[d]) || double.IsNaN(b) ? double.NaN : Math.Abs(arrival[d] - b);
            if (part is not null || d == 0) continue;
            if (double.IsNaN(arrival[d]) && double.IsNaN(b)) break;
            bool agree = !double.IsNaN(unc[d]) && unc[d] <= Math.Max(o.ArrivalTolerance * arrival[d], 1.5 * spacing);
            if (other is null) agree = !double.IsNaN(arrival[d]);
            if (agree) converged = d;
            else part = d;
        }
        double? partTime = part is int pd ? (double.IsNaN(arrival[pd]) ? (other is not null && pd < other.Length && !double.IsNaN(other[pd]) ? other[pd] : null) : arrival[pd]) : null;
        var conv = BudgetConvergence.Compare(runs.Reverse().Select(r => r.Figures).ToArray(), 0.05);
        o.Logger?.LogInformation("front series on {N} sites: bond dimensions {Dims}; budgets agree up to distance {D}{Part} ({Wall:0.0} s)",
            n, string.Join("/", dims), converged, part is int p2 ? $", part at {p2} (t = {partTime:0.##})" : ", never part", sw.Elapsed.TotalSeconds);
        return new FrontEvolutionResult
        {
            N = n,
            Probe = probe.ToString(),
            ProbeSites = sites,
            Threshold = o.FrontFraction * 0.75,
            Runs = runs,
            Arrival = arrival,
            ArrivalUncertainty = unc,
            PartDistance = part,
            PartTime = partTime,
            ConvergedDistance = converged,
            MaxDistance = rmax,
            Convergence = conv,
            WallSeconds = sw.Elapsed.TotalSeconds,
        };
    }

    private static FrontRun RunOne(PauliString probe, int chi, BondGate[] half, BondGate full, FrontEvolutionOptions o, LatticeGeometry geometry, int[] sites, CancellationToken ct)
    {
        var sw = Stopwatch.StartNew();
        int n = probe.N;
        var op = PauliChainOperator.FromString(probe, seed: 1000 + chi);
        long steps = (long)Math.Ceiling(o.Time / o.Dt - 1e-9);
        var times = new List<double>();
        var weights = new List<double[]>();
        var size = new List<double>();
        var norm = new List<double>();
        var auto = new List<double>();
        var bonds = new List<int>();
        void Record(double t)
        {
            var (w, nrm) = op.SiteWeights();
            times.Add(t);
            weights.Add(w);
            size.Add(w.Sum());
            norm.Add(nrm);
            auto.Add(op.Coefficient(probe));
            bonds.Add(op.MaxBond);
        }
        Record(0);
        for (long s = 1; s <= steps; s++)
        {
            ct.ThrowIfCancellationRequested();
            for (int b = 0; b < n - 2; b++) op.ApplyBond(b, half[b], chi, o.Cutoff, moveRight: true);
            op.ApplyBond(n - 2, full, chi, o.Cutoff, moveRight: false);
            for (int b = n - 3; b >= 0; b--) op.ApplyBond(b, half[b], chi, o.Cutoff, moveRight: false);
            if (s % o.RecordEvery == 0 || s == steps)
            {
                Record(s * o.Dt);
                o.Logger?.LogDebug("front chi = {Chi}: t = {T:0.##}, max bond {B}, dropped {D:E2}", chi, s * o.Dt, op.MaxBond, op.Discarded);
            }
        }
        var input = new ScramblingInput
        {
            N = n,
            Times = [.. times],
            MeanSize = [.. size],
            SiteWeights = [.. weights],
            ProbeSites = sites,
            Geometry = geometry,
        };
        var figures = ScramblingAnalysis.Analyze(input, new ScramblingAnalysisOptions { FrontFraction = o.FrontFraction });
        return new FrontRun
        {
            BondDimension = chi,
            Times = input.Times,
            SiteWeights = input.SiteWeights,
            MeanSize = input.MeanSize,
            NormSquared = [.. norm],
            Autocorrelation = [.. auto],
            MaxBond = [.. bonds],
            Figures = figures,
            WallSeconds = sw.Elapsed.TotalSeconds,
        };
    }
}
