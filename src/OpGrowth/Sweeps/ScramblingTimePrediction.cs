using System.Globalization;

namespace OpGrowth.Sweeps;

/// <summary>
/// Predicts t* at a size N from t* measured at smaller members of the same family: for short-range models through
/// the operator front (t* = front arrival at the half-volume distance + an offset calibrated on the members, so that
/// t* grows like N/v with v tied to the measured v_B), for all-to-all models through the two scaling laws
/// t* = a + b ln N and t* = a + N/v, model-averaged with their Akaike weights.
/// </summary>
public static class ScramblingTimePrediction
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>
    /// The distance d from the probe at which half of the sites are reached: each site at distance r counts linearly
    /// from d = r - 1/2 to d = r + 1/2, and d solves (count) = N/2. A symmetric front whose midpoint (site weight 3/8) is
    /// at d gives mean size (3/4) x count, so the mean size reaches 3N/8 when the front reaches this distance
    /// (chain, probe at one end: d = (N - 1)/2; probe in the middle: about N/4).
    /// </summary>
    public static double HalfDistance(IReadOnlyList<int> distances)
    {
        ArgumentNullException.ThrowIfNull(distances);
        if (distances.Count == 0) throw new ArgumentException("No sites.", nameof(distances));
        double half = distances.Count / 2.0;
        double Count(double d) => distances.Sum(r => Math.Clamp(d - r + 0.5, 0, 1));
        double lo = -0.5, hi = distances.Max() + 0.5;
        for (int i = 0; i < 100; i++)
        {
            double mid = 0.5 * (lo + hi);
            if (Count(mid) < half) lo = mid;
            else hi = mid;
        }
        return 0.5 * (lo + hi);
    }

    /// <summary>The front's arrival time at a fractional distance and its uncertainty.</summary>
    /// <param name="Time">Arrival time.</param>
    /// <param name="Error">Uncertainty: the budget series' movement, plus the v_B error over an extrapolated stretch.</param>
    /// <param name="Extrapolated">True when <paramref name="Time"/> lies beyond the distances the budget series agrees on.</param>
    public readonly record struct Arrival(double Time, double Error, bool Extrapolated);

    /// <summary>
    /// Arrival at distance <paramref name="d"/>: linear between the integer distances the budgets agree on (up to
    /// <paramref name="converged"/>); beyond, extrapolated from there with v_B: t = t(d_c) + (d - d_c)/v_B, error
    /// adding (d - d_c) sigma_vB / v_B^2.
    /// </summary>
    public static Arrival ArrivalAt(double d, IReadOnlyList<double> arrival, IReadOnlyList<double> uncertainty, int converged, double vB, double vBError)
    {
        ArgumentNullException.ThrowIfNull(arrival);
        ArgumentNullException.ThrowIfNull(uncertainty);
        double U(int k) => k < uncertainty.Count && double.IsFinite(uncertainty[k]) ? uncertainty[k] : 0;
        int dc = Math.Min(converged, arrival.Count - 1);
        while (dc > 0 && double.IsNaN(arrival[dc])) dc--;
        if (d <= 0) return new Arrival(0, 0, false);
        if (d <= dc)
        {
            int k = (int)Math.Floor(d);
            if (k >= dc) return new Arrival(arrival[dc], U(dc), false);
            double f = d - k;
            return new Arrival((1 - f) * arrival[k] + f * arrival[k + 1], Math.Max(U(k), U(k + 1)), false);
        }
        if (!(vB > 0)) return new Arrival(double.NaN, double.NaN, true);
        double extra = d - dc;
        double e = Math.Sqrt(U(dc) * U(dc) + Math.Pow(extra * vBError / (vB * vB), 2));
        return new Arrival(arrival[dc] + extra / vB, e, true);
    }

    /// <summary>
    /// Front route: t*(N) = arrival(d_half(N)) + delta(N), with delta_i = t*_i - arrival(d_half(N_i)) at the members,
    /// carried to N by a straight line in N over the largest three members (error: its covariance and its difference to
    /// the line over all members), with three or more members; a constant with its scatter below that.
    /// Uncertainty: the fit's covariance error at N and the arrival's own, in quadrature.
    /// </summary>
    public static ScramblingTimeStatement FromFront(int n, double halfDistance, Arrival target, IReadOnlyList<ScramblingTimeMember> members, double vB, string frontSource)
    {
        ArgumentNullException.ThrowIfNull(members);
        var ms = members.Where(m => m.FrontArrival is double a && double.IsFinite(a)).ToArray();
        if (ms.Length == 0 || !double.IsFinite(target.Time)) throw new ArgumentException("The front route needs members with front arrivals and a finite arrival at N.", nameof(members));
        var delta = ms.Select(m => m.TStar - m.FrontArrival!.Value).ToArray();
        double mean = delta.Average();
        double sd = delta.Length > 1 ? Math.Sqrt(delta.Sum(x => (x - mean) * (x - mean)) / (delta.Length - 1)) : ms[0].Error;
        double offset, offsetError;
        string offsetText;
        var also = new List<string>();
        if (ms.Length >= 3)
        {
            // The offset drifts with N (the region behind the front saturates more slowly than the front moves: weight
            // lingers on slow, conserved densities), so it is carried to N by a straight line in N: fitted over the
            // largest three members (the local trend, where the behaviour is most asymptotic) and over all members; the
            // value is the local one, its error the local fit's covariance error (scaled by sqrt(chi^2/dof) when the
            // members scatter more than their errors) and the difference between the two lines, in quadrature.
            ScalingFit Line(IEnumerable<(ScramblingTimeMember m, double d)> pts)
            {
                var p = pts.ToArray();
                return ScalingFit.Fit("linear", p.Select(x => (double)x.m.N).ToArray(), p.Select(x => x.d).ToArray(), p.Select(x => Math.Max(x.m.Error, 1e-9)).ToArray());
            }
            var pairs = ms.Select((m, i) => (m, d: delta[i])).OrderBy(x => x.m.N).ToArray();
            var local = Line(pairs.Skip(pairs.Length - 3));
            var all = Line(pairs);
            offset = local.Evaluate(n);
            double model = Math.Abs(all.Evaluate(n) - offset);
            offsetError = Math.Sqrt(Math.Pow(local.PredictionError(n), 2) + model * model);
            offsetText = FormattableString.Invariant($"offset t* - arrival = {local.A:0.###} + {local.Slope:0.####} N over N = {pairs[^3].m.N}..{pairs[^1].m.N}: {offset:0.###} +- {local.PredictionError(n):0.###} at N = {n}, {all.Evaluate(n):0.###} from the line over all members (difference {model:0.###} counted as model uncertainty)");
            also.Add(FormattableString.Invariant($"with a constant offset (mean {mean:0.###}, scatter {sd:0.###}) instead: {target.Time + mean:0.###}"));
            var lin = ScalingFit.Fit("linear", ms.Select(m => (double)m.N).ToArray(), ms.Select(m => m.TStar).ToArray(), ms.Select(m => m.Error).ToArray());
            if (lin.V is double v)
                also.Add(FormattableString.Invariant($"straight-line fit of the members alone: t* = {lin.A:0.###} + N/{v:0.###} gives {lin.Evaluate(n):0.###} +- {lin.PredictionError(n):0.###} at N = {n} (v = {v:0.###} against 2 v_B = {2 * vB:0.###})"));
        }
        else
        {
            offset = mean;
            offsetError = Math.Sqrt(sd * sd + ms.Average(m => m.Error * m.Error));
            offsetText = FormattableString.Invariant($"offset t* - arrival = {mean:0.###} (scatter {sd:0.###})");
        }
        double sigma = Math.Sqrt(offsetError * offsetError + target.Error * target.Error);
        double value = target.Time + offset;
        string range = $"N = {ms.Min(m => m.N)}..{ms.Max(m => m.N)}";
        string basis = FormattableString.Invariant(
            $"front ({frontSource}) reaches the half-volume distance d = {halfDistance:0.##} at t = {target.Time:0.###} +- {target.Error:0.###}{(target.Extrapolated ? $" (extrapolated with v_B = {vB:0.###})" : "")}; {offsetText}; exact t* at {range}");
        return ScramblingTimeStatement.Banded("predicted", n, value, sigma, $"front at d = {halfDistance.ToString("0.#", Inv)} + offset from exact t* at {range}", basis)
            with { Members = members, Also = also };
    }

    /// <summary>
    /// Scaling route: both laws fitted to the members (weights 1/error^2), each predicted at N with its covariance
    /// error, combined with their Akaike weights; the band's variance is the model-averaged one,
    /// sum_k w_k (sigma_k^2 + (mu_k - mu)^2) (Source: Burnham and Anderson, Model Selection and Multimodel Inference,
    /// Springer 2002, eq. 4.9). For a disordered model the seed-to-seed spread at the largest member is added: the
    /// prediction is for the disorder average, the model's own realisation scatters about it.
    /// </summary>
    public static ScramblingTimeStatement FromScaling(int n, IReadOnlyList<ScramblingTimeMember> members)
    {
        var sc = Scaling(n, members);
        var laws = sc.Laws;
        var cmp = sc.Comparison;
        double mu = sc.Mean;
        double sigma = Math.Sqrt(sc.FitError * sc.FitError + sc.SeedSpread * sc.SeedSpread);
        var largest = members.OrderBy(m => m.N).Last();
        string range = $"N = {members.Min(m => m.N)}..{members.Max(m => m.N)}" + (largest.Seeds > 1 ? $", {largest.Seeds} seeds each" : "");
        string lawText(ScramblingTimeLawPrediction l) => FormattableString.Invariant(
            $"{(l.Law == "log" ? "a + b ln N" : "a + N/v")}: {l.Value:0.###} +- {l.Error:0.###} (weight {l.Weight:0.00})");
        string basis = $"{cmp.Verdict}; {lawText(laws[0])}; {lawText(laws[1])}; model-averaged {mu.ToString("0.###", Inv)} +- {sc.FitError.ToString("0.###", Inv)}"
            + (sc.SeedSpread > 0 ? FormattableString.Invariant($", plus the seed-to-seed spread {sc.SeedSpread:0.###} at N = {largest.N} for this realisation") : "");
        string method = cmp.Preferred == "neither"
            ? $"t* = a + b ln N and t* = a + N/v fitted at {range} (the data cannot choose: both shown)"
            : $"{(cmp.Preferred == "log" ? "t* = a + b ln N" : "t* = a + N/v")} preferred ({cmp.Strength}) over {range}";
        return ScramblingTimeStatement.Banded("predicted", n, mu, sigma, method, basis) with { Laws = laws, Members = members };
    }

    /// <summary>The scaling route's numbers: both laws, the model-averaged mean and its error, and the seed spread at the largest member.</summary>
    /// <param name="Mean">Model-averaged prediction (the disorder average at N for a disordered model).</param>
    /// <param name="FitError">sqrt(sum_k w_k (sigma_k^2 + (mu_k - mu)^2)).</param>
    /// <param name="SeedSpread">Seed-to-seed standard deviation at the largest member (0 for a clean model).</param>
    /// <param name="Laws">Both laws' predictions.</param>
    /// <param name="Comparison">The fits and their comparison.</param>
    public sealed record ScalingPrediction(double Mean, double FitError, double SeedSpread, IReadOnlyList<ScramblingTimeLawPrediction> Laws, FitComparison Comparison);

    /// <summary>Fits both laws to the members and predicts at N (see <see cref="FromScaling"/>).</summary>
    public static ScalingPrediction Scaling(int n, IReadOnlyList<ScramblingTimeMember> members)
    {
        ArgumentNullException.ThrowIfNull(members);
        if (members.Count < 3) throw new ArgumentException("The scaling route needs at least three member sizes.", nameof(members));
        var ns = members.Select(m => (double)m.N).ToArray();
        var ys = members.Select(m => m.TStar).ToArray();
        var es = members.Select(m => m.Error).ToArray();
        var cmp = FitComparison.Compare(ns, ys, es);
        var laws = new[]
        {
            new ScramblingTimeLawPrediction("log", cmp.Log.Evaluate(n), cmp.Log.PredictionError(n), cmp.LogWeight, cmp.Log),
            new ScramblingTimeLawPrediction("linear", cmp.Linear.Evaluate(n), cmp.Linear.PredictionError(n), cmp.LinearWeight, cmp.Linear),
        };
        double mu = laws.Sum(l => l.Weight * l.Value);
        double var = laws.Sum(l => l.Weight * (l.Error * l.Error + (l.Value - mu) * (l.Value - mu)));
        double spread = members.OrderBy(m => m.N).Last().Spread ?? 0;
        return new ScalingPrediction(mu, Math.Sqrt(var), spread, laws, cmp);
    }
}
