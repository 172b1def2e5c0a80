namespace OpGrowth.Analysis;

/// <summary>
/// Derives the scrambling figures from recorded series: butterfly velocity from the front of the
/// site weights, early growth rates from the mean size and the OTOC, the saturation plateau and the
/// scrambling time. Every figure states its window and rule; see docs/evolution.md.
/// </summary>
public static class ScramblingAnalysis
{
    /// <summary>Derives every figure.</summary>
    public static ScramblingFigures Analyze(ScramblingInput input, ScramblingAnalysisOptions? options = null)
    {
        options ??= new ScramblingAnalysisOptions();
        var geometry = input.Geometry ?? LatticeGeometry.Chain(input.N);
        var tstar = ScramblingTimeOf(input.Times, input.MeanSize, 3.0 * input.N / 8,
            "first time the mean size n(t) reaches 3N/8 (half of the random-operator value 3N/4), linear interpolation between recorded times");
        ScramblingTime? tstarMaj = null;
        if (input.MeanMajoranaSize is not null)
        {
            tstarMaj = ScramblingTimeOf(input.Times, input.MeanMajoranaSize, input.N / 2.0,
                "first time the mean Majorana size reaches N/2 (half of the random value N on 2N Majoranas), linear interpolation");
        }
        var bv = Butterfly(input, geometry, options, out string? note);
        return new ScramblingFigures
        {
            Butterfly = bv,
            ButterflyNote = note,
            Growth = Growth(input, geometry, options, tstar.Value),
            ScramblingTime = tstar,
            MajoranaScramblingTime = tstarMaj,
            // a random operator on 2N Majoranas has mean Majorana size N 4^N / (4^N - 1)
            MajoranaGrowth = input.MeanMajoranaSize is { } mm ? Growth(input, geometry, options, tstarMaj?.Value, mm, input.N / (1 - Math.Pow(4, -input.N)), "N (of 2N Majoranas)") : null,
        };
    }

    // ------------------------------------------------------------------ front

    /// <summary>Distances of every site from the nearest probe site.</summary>
    public static int[] DistancesFromProbe(LatticeGeometry geometry, IReadOnlyList<int> probeSites)
    {
        var d = new int[geometry.N];
        for (int j = 0; j < geometry.N; j++)
        {
            int best = int.MaxValue;
            foreach (int p in probeSites) best = Math.Min(best, geometry.Distance(p, j));
            d[j] = best;
        }
        return d;
    }

    private static ButterflyVelocity? Butterfly(ScramblingInput input, LatticeGeometry geometry, ScramblingAnalysisOptions options, out string? note)
    {
        note = null;
        if (input.ProbeSites.Length == 0)
        {
            note = "the initial operator has no sites";
            return null;
        }
        var d = DistancesFromProbe(geometry, input.ProbeSites);
        int rmax = d.Max();
        if (rmax < 3)
        {
            note = $"the largest distance from the probe is {rmax}: no front to follow on this lattice ({geometry.Kind})";
            return null;
        }
        var primary = FitFront(input, d, rmax, options.FrontFraction, options);
        var sens = options.SensitivityFractions.Select(f => FitFront(input, d, rmax, f, options)).ToList();
        var vs = sens.Where(s => s.Velocity is not null).Select(s => s.Velocity!.Value).ToList();
        double thr = options.FrontFraction * 0.75;
        var front = new int[input.Times.Length];
        for (int i = 0; i < front.Length; i++)
        {
            int r = 0;
            var rho = input.SiteWeights[i];
            for (int j = 0; j < rho.Length; j++) if (rho[j] >= thr && d[j] > r) r = d[j];
            front[i] = r;
        }
        return new ButterflyVelocity
        {
            Primary = primary,
            Sensitivity = sens,
            ThresholdSpread = vs.Count >= 2 ? vs.Max() - vs.Min() : null,
            Front = front,
            MaxDistance = rmax,
        };
    }

    private static FrontFit FitFront(ScramblingInput input, int[] d, int rmax, double fraction, ScramblingAnalysisOptions options)
    {
        double thr = fraction * 0.75;
        var times = input.Times;
        int n = d.Length;
        // First crossing time of each site, linear interpolation between records.
        var tau = new double[n];
        for (int j = 0; j < n; j++)
        {
            tau[j] = double.NaN;
            for (int i = 0; i < times.Length; i++)
            {
                double r = input.SiteWeights[i][j];
                if (r < thr) continue;
                if (i == 0) tau[j] = times[0];
                else
                {
                    double r0 = input.SiteWeights[i - 1][j];
                    tau[j] = times[i - 1] + (thr - r0) / (r - r0) * (times[i] - times[i - 1]);
                }
                break;
            }
        }
        // Arrival at distance r: first time any site at distance >= r crosses.
        var arrival = new double[rmax + 1];
        for (int r = 0; r <= rmax; r++)
        {
            double best = double.NaN;
            for (int j = 0; j < n; j++)
            {
                if (d[j] >= r && !double.IsNaN(tau[j]) && (double.IsNaN(best) || tau[j] < best)) best = tau[j];
            }
            arrival[r] = best;
        }
        int hi = rmax - 1;
        int lo = hi - 1 + 1 >= options.MinFitPoints + 1 ? 2 : 1;
        var xs = new List<double>();
        var ys = new List<double>();
        for (int r = lo; r <= hi; r++)
        {
            if (double.IsNaN(arrival[r])) break;
            xs.Add(arrival[r]);
            ys.Add(r);
        }
        var fit = new FrontFit
        {
            ThresholdFraction = fraction,
            Threshold = thr,
            ArrivalTimes = arrival,
            MinDistance = lo,
            MaxDistance = xs.Count > 0 ? lo + xs.Count - 1 : lo,
        };
        if (xs.Count < 3)
        {
            return fit with
            {
                Points = xs.Count,
                Note = $"the front reached only {xs.Count} distances in the window {lo}..{hi} at rho >= {thr:0.###}: evolve longer or lower the threshold",
            };
        }
        var lf = LinearFit.Fit(xs.ToArray(), ys.ToArray());
        return fit with
        {
            Velocity = lf.Slope,
            VelocityError = lf.SlopeError,
            Intercept = lf.Intercept,
            Points = lf.Points,
            WindowStart = xs[0],
            WindowEnd = xs[^1],
        };
    }

    // ------------------------------------------------------------------ growth

    private static GrowthRates Growth(ScramblingInput input, LatticeGeometry geometry, ScramblingAnalysisOptions options, double? tstar)
        => Growth(input, geometry, options, tstar, input.MeanSize, 0.75 * input.N / (1 - Math.Pow(4, -input.N)), "3N/4");

    private static GrowthRates Growth(ScramblingInput input, LatticeGeometry geometry, ScramblingAnalysisOptions options, double? tstar, double[] n, double expected, string expectedName)
    {
        var t = input.Times;
        int nq = input.N;
        double n0 = n[0];
        double excessMax = options.GrowthMaxFraction * (expected - n0);
        string rule = $"from the first record with n(t) - n(0) >= {options.GrowthMinExcess} (past the t^2 onset) to the last record before n(t) - n(0) exceeds {options.GrowthMaxFraction} of the saturation excess {expectedName} - n(0) = {expected - n0:0.###}";
        var (s, e) = Window(n, v => v - n0 >= options.GrowthMinExcess, v => v - n0 > excessMax);
        GrowthFit expFit, linFit;
        if (e - s + 1 >= options.MinFitPoints)
        {
            var xs = t[s..(e + 1)];
            var ly = n[s..(e + 1)].Select(v => Math.Log(v - n0)).ToArray();
            var lf = LinearFit.Fit(xs, ly);
            double resE = 0;
            for (int i = s; i <= e; i++)
            {
                double p = n0 + Math.Exp(lf.Intercept + lf.Slope * t[i]);
                resE += (n[i] - p) * (n[i] - p);
            }
            expFit = new GrowthFit { Quantity = "ln(n(t) - n(0)) vs t", Rate = lf.Slope, RateError = lf.SlopeError, RSquared = lf.RSquared, SizeResidual = resE, WindowStart = t[s], WindowEnd = t[e], Points = lf.Points, Window = rule };
            var ll = LinearFit.Fit(xs, n[s..(e + 1)]);
            linFit = new GrowthFit { Quantity = "n(t) vs t", Rate = ll.Slope, RateError = ll.SlopeError, RSquared = ll.RSquared, SizeResidual = ll.ResidualSumOfSquares, WindowStart = t[s], WindowEnd = t[e], Points = ll.Points, Window = rule };
        }
        else
        {
            string why = $"only {Math.Max(0, e - s + 1)} records in the window; record more often (--record-every) or evolve longer";
            expFit = new GrowthFit { Quantity = "ln(n(t) - n(0)) vs t", Window = rule, Points = Math.Max(0, e - s + 1), Note = why };
            linFit = new GrowthFit { Quantity = "n(t) vs t", Window = rule, Points = Math.Max(0, e - s + 1), Note = why };
        }

        // OTOC: averaged squared commutator away from the probe, C = 2 (1 - Fbar) = (8/3) rho_j.
        var probe = new HashSet<int>(input.ProbeSites);
        int far = nq - probe.Count;
        var c = new double[t.Length];
        for (int i = 0; i < t.Length; i++)
        {
            double sum = 0;
            var rho = input.SiteWeights[i];
            for (int j = 0; j < nq; j++) if (!probe.Contains(j)) sum += rho[j];
            c[i] = far > 0 ? 8.0 / 3.0 * sum / far : double.NaN;
        }
        string orule = $"C(t) = mean over sites outside the probe of 2(1 - Fbar_j) = (8/3) rho_j; window from the first record with C >= {options.OtocMinFraction} x 2 to the last before C exceeds {options.OtocMaxFraction} x 2";
        var (os, oe) = Window(c, v => v >= 2 * options.OtocMinFraction, v => v > 2 * options.OtocMaxFraction);
        GrowthFit otoc;
        if (far > 0 && oe - os + 1 >= options.MinFitPoints)
        {
            var lf = LinearFit.Fit(t[os..(oe + 1)], c[os..(oe + 1)].Select(v => Math.Log(v)).ToArray());
            otoc = new GrowthFit { Quantity = "ln C(t) vs t", Rate = lf.Slope, RateError = lf.SlopeError, RSquared = lf.RSquared, WindowStart = t[os], WindowEnd = t[oe], Points = lf.Points, Window = orule };
        }
        else
        {
            otoc = new GrowthFit { Quantity = "ln C(t) vs t", Window = orule, Points = Math.Max(0, oe - os + 1), Note = $"only {Math.Max(0, oe - os + 1)} records in the window" };
        }

        string regime, reason;
        if (geometry.IsOneDimensional)
        {
            regime = "linear";
            reason = "one-dimensional lattice: the front is ballistic and the mean size grows linearly; no exponential regime is assumed (Khemani, Huse, Nahum, PRB 98, 144304 (2018))";
        }
        else if (expFit.SizeResidual is double re && linFit.SizeResidual is double rl)
        {
            regime = re < rl ? "exponential" : "linear";
            reason = $"residual sum of squares on n(t) over the window: exponential {re:g3}, linear {rl:g3}";
        }
        else
        {
            regime = "undetermined";
            reason = "too few records in the growth window";
        }

        double? sat = null, spread = null, satStart = null;
        int w0 = (int)Math.Floor(0.75 * t.Length);
        if (tstar is double ts && t.Length - w0 >= 2 && t[w0] > ts)
        {
            var win = n[w0..];
            double m = win.Average();
            sat = m;
            spread = Math.Sqrt(win.Select(v => (v - m) * (v - m)).Sum() / (win.Length - 1));
            satStart = t[w0];
        }
        return new GrowthRates
        {
            SizeExponential = expFit,
            SizeLinear = linFit,
            OtocExponential = otoc,
            Regime = regime,
            RegimeReason = reason,
            Saturation = sat,
            SaturationSpread = spread,
            SaturationExpected = expected,
            SaturationRatio = sat / expected,
            SaturationWindowStart = satStart,
        };
    }

    /// <summary>First contiguous run of records from the first that satisfies <paramref name="start"/> up to (excluding) the first after it that satisfies <paramref name="stop"/>.</summary>
    private static (int Start, int End) Window(double[] y, Func<double, bool> start, Func<double, bool> stop)
    {
        int s = -1;
        for (int i = 0; i < y.Length; i++)
        {
            if (start(y[i]))
            {
                s = i;
                break;
            }
        }
        if (s < 0) return (0, -1);
        int e = s - 1;
        for (int i = s; i < y.Length && !stop(y[i]); i++) e = i;
        return (s, e);
    }

    // ------------------------------------------------------------------ t*

    /// <summary>First crossing of <paramref name="target"/>, linear interpolation, with a quadratic-interpolation grid uncertainty.</summary>
    public static ScramblingTime ScramblingTimeOf(double[] t, double[] n, double target, string definition)
    {
        int i = Array.FindIndex(n, v => v >= target);
        if (i < 0) return new ScramblingTime { Target = target, Definition = definition };
        if (i == 0) return new ScramblingTime { Target = target, Value = t[0], GridUncertainty = 0, BracketLow = t[0], BracketHigh = t[0], Definition = definition };
        double t0 = t[i - 1], t1 = t[i], y0 = n[i - 1], y1 = n[i];
        double lin = t0 + (target - y0) / (y1 - y0) * (t1 - t0);
        double grid = (t1 - t0) / 2;
        int a = i + 1 < t.Length ? i - 1 : i - 2;
        if (a >= 0 && a + 2 < t.Length)
        {
            double Q(double x)
            {
                double s = 0;
                for (int p = a; p < a + 3; p++)
                {
                    double l = n[p];
                    for (int q = a; q < a + 3; q++) if (q != p) l *= (x - t[q]) / (t[p] - t[q]);
                    s += l;
                }
                return s - target;
            }
            double lo = t0, hi = t1, flo = Q(lo), fhi = Q(hi);
            if (flo <= 0 && fhi >= 0)
            {
                for (int it = 0; it < 200; it++)
                {
                    double mid = 0.5 * (lo + hi);
                    if (Q(mid) < 0) lo = mid;
                    else hi = mid;
                }
                grid = Math.Abs(0.5 * (lo + hi) - lin);
            }
        }
        return new ScramblingTime { Target = target, Value = lin, GridUncertainty = grid, BracketLow = t0, BracketHigh = t1, Definition = definition };
    }
}
