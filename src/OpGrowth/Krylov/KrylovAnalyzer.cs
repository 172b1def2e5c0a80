namespace OpGrowth.Krylov;

/// <summary>
/// From a coefficient estimate to physics: growth fit over the trusted coefficients, C(t) and K(t) with the
/// fitted continuation (and its sensitivity), and the continued-fraction spectral function.
/// </summary>
public static class KrylovAnalyzer
{
    /// <summary>
    /// Leading coefficients that can be used: up to the infinite-chain verified depth, and up to the first
    /// n whose uncertainty is unknown (NaN).
    /// </summary>
    public static int TrustedDepth(LanczosEstimate estimate)
    {
        ArgumentNullException.ThrowIfNull(estimate);
        int d = estimate.B.Count;
        if (estimate.Reference.VerifiedDepth is int v) d = Math.Min(d, v);
        for (int n = 0; n < d; n++)
        {
            if (double.IsNaN(estimate.Uncertainty[n])) return n;
        }
        return d;
    }

    /// <summary>Default last time: min(10 / b_1, 3 sum_n 1/(2 b_n)) over the given coefficients (10 when none).</summary>
    public static double DefaultTMax(IReadOnlyList<double> b)
    {
        ArgumentNullException.ThrowIfNull(b);
        if (b.Count == 0 || !(b[0] > 0)) return 10;
        double cross = 0;
        foreach (double v in b) cross += v > 0 ? 1 / (2 * v) : 0;
        return Math.Min(10 / b[0], 3 * cross);
    }

    public static KrylovAnalysis Analyze(LanczosEstimate estimate, KrylovAnalysisOptions options)
    {
        ArgumentNullException.ThrowIfNull(estimate);
        ArgumentNullException.ThrowIfNull(options);
        var notes = new List<string>();
        int depth = TrustedDepth(estimate);
        var b = estimate.B.Take(depth).ToArray();
        bool closed = estimate.Reference.StopReason == LanczosStopReason.KrylovSpaceClosed && depth == estimate.B.Count;
        if (depth < estimate.B.Count) notes.Add($"only b_1..b_{depth} are used (beyond: boundary-affected or of unknown uncertainty)");
        GrowthAnalysis? growth = null;
        if (depth >= 5)
        {
            int from = options.FitFrom ?? LanczosGrowth.DefaultWindow(depth).Start;
            int to = Math.Min(options.FitTo ?? depth, depth);
            growth = LanczosGrowth.Fit(b, from, to);
        }
        else notes.Add($"growth fit skipped: {depth} coefficients (at least 5 needed)");
        double tMax = options.TMax ?? DefaultTMax(b);
        var times = KrylovDynamics.Grid(tMax, Math.Max(2, options.TimePoints));
        KrylovDynamicsResult? dyn = null;
        KrylovChainResult? closedDyn = null;
        Func<int, double>? bFunc = null;
        if (closed)
        {
            // Finite Krylov space: the chain ends (b_{N+1} = 0); no continuation.
            bFunc = n => n <= b.Length ? b[n - 1] : 0;
            closedDyn = KrylovChain.Evolve(bFunc, times, options.MaxChain, options.MaxWork);
            if (closedDyn.Limit is not null) notes.Add($"dynamics stopped early: {closedDyn.Limit}");
            notes.Add($"Krylov space closed after b_{b.Length}: dynamics exact on the finite chain, no continuation");
        }
        else if (growth is not null)
        {
            var fit = options.ContinuationClass is GrowthClass c ? growth.Fits.First(f => f.Class == c) : growth.Best;
            int start = Math.Clamp(options.ContinueFrom ?? depth + 1, 2, depth + 1);
            dyn = KrylovDynamics.Compute(b, fit, times, start, options.SensitivityShift, options.MaxChain, options.MaxWork);
            bFunc = KrylovDynamics.Continue(b, fit, start);
            if (dyn.Main.Limit is not null) notes.Add($"dynamics stopped early: {dyn.Main.Limit}");
        }
        else if (b.Length > 0) notes.Add("dynamics skipped: no continuation without a growth fit");

        double[] omegas = [], spectrum = [];
        double eta = 0;
        if (bFunc is not null && options.SpectrumPoints > 1)
        {
            double wMax = 0;
            for (int n = 1; n <= Math.Max(b.Length, 1) + 1; n++) wMax = Math.Max(wMax, 2 * bFunc(n));
            wMax = Math.Max(wMax, 1e-3);
            // Broadening: a fraction of the typical coefficient, common practice for cut continued fractions.
            eta = 0.02 * (b.Length > 0 ? b.Average() : 1);
            omegas = Enumerable.Range(0, options.SpectrumPoints).Select(i => -wMax + 2 * wMax * i / (options.SpectrumPoints - 1)).ToArray();
            int levels = closed ? Math.Max(1, b.Length) : Math.Max(options.SpectrumDepth, b.Length);
            spectrum = KrylovSpectrum.SpectralFunction(bFunc, levels, omegas, eta);
        }
        return new KrylovAnalysis
        {
            TrustedDepth = depth,
            Growth = growth,
            Dynamics = dyn,
            ClosedDynamics = closedDyn,
            Omegas = omegas,
            Spectrum = spectrum,
            SpectrumBroadening = eta,
            Notes = notes,
        };
    }
}
