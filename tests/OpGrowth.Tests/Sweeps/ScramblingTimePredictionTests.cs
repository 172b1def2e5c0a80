using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>The prediction arithmetic against hand-derived values.</summary>
public class ScramblingTimePredictionTests
{
    [Fact]
    public void HalfDistance_ChainEndAndCentre_MatchCounting()
    {
        // End of an N-chain: distances 0..N-1 each once; half-counting gives count(d) = d + 1/2 at integer d, so N/2 is
        // reached at d = (N - 1)/2. Centre of an odd chain (N = 25, site 12): count(d) = 2d, reaching 12.5 at d = 6.25.
        Assert.Equal(11.5, ScramblingTimePrediction.HalfDistance(Enumerable.Range(0, 24).ToArray()), 9);
        var centre = Enumerable.Range(0, 25).Select(j => Math.Abs(j - 12)).ToArray();
        Assert.Equal(6.25, ScramblingTimePrediction.HalfDistance(centre), 9);
    }

    [Fact]
    public void Statement_Text_BandHasTheValuesDecimals()
    {
        // 6.51 +- 0.10: two-sigma band 6.31..6.71, both ends to the two decimals of the value (a trailing zero kept).
        var st = ScramblingTimeStatement.Banded("predicted", 22, 6.51, 0.10, "front", "basis");
        Assert.Contains("6.51 ± 0.10, band 6.31..6.71", st.Text(), StringComparison.Ordinal);
        var round = ScramblingTimeStatement.Banded("predicted", 22, 6.50, 0.10, "front", "basis");
        Assert.Contains("band 6.30..6.70", round.Text(), StringComparison.Ordinal);
    }

    [Fact]
    public void ArrivalAt_InterpolatesInsideAndExtrapolatesWithVb()
    {
        // Arrivals 0, 1, 2, 3 (converged to distance 3) with uncertainty 0.1: d = 2.5 -> 2.5; d = 5 -> 3 + 2/v_B with
        // error sqrt(0.1^2 + (2 sigma_v / v^2)^2).
        double[] a = [0, 1, 2, 3, double.NaN];
        double[] u = [0, 0.1, 0.1, 0.1, double.NaN];
        var inside = ScramblingTimePrediction.ArrivalAt(2.5, a, u, 3, 2.0, 0.1);
        Assert.Equal(2.5, inside.Time, 12);
        Assert.False(inside.Extrapolated);
        var outside = ScramblingTimePrediction.ArrivalAt(5, a, u, 3, 2.0, 0.1);
        Assert.Equal(4.0, outside.Time, 12);
        Assert.Equal(Math.Sqrt(0.01 + Math.Pow(2 * 0.1 / 4, 2)), outside.Error, 12);
        Assert.True(outside.Extrapolated);
    }

    [Fact]
    public void FromFront_ConstantOffset_IsCarriedToN()
    {
        // Members with t* = arrival + 0.3 exactly (errors 0.01): both offset lines are flat, so the prediction is
        // arrival(N) + 0.3; its uncertainty holds the arrival's 0.02 and the line's covariance error at N = 24 for
        // points at N = 10..14 with errors 0.01 (a straight line through three points: about 0.05 at that distance).
        var members = new[] { 8, 10, 12, 14 }.Select(n => new ScramblingTimeMember(n, 0.5 * n + 0.3, 0.01, null, 1, n / 2.0 - 0.5, 0.5 * n)).ToList();
        var st = ScramblingTimePrediction.FromFront(24, 11.5, new ScramblingTimePrediction.Arrival(12.0, 0.02, false), members, 2.0, "test front");
        Assert.Equal("predicted", st.Route);
        Assert.Equal(12.3, st.Value!.Value, 9);
        Assert.InRange(st.Uncertainty!.Value, 0.02, 0.1);
        Assert.Equal(st.Value.Value - 2 * st.Uncertainty.Value, st.Low!.Value, 12);
    }

    [Fact]
    public void FromFront_DriftingOffset_FollowsTheLargestMembers()
    {
        // Offsets 0, 0, 0.1, 0.2 at N = 8..14: the local line over the largest three (slope 0.05 per unit N) reaches 0.7 at
        // N = 24; the line over all four reaches a lower value, and the difference enters the uncertainty.
        double[] off = [0, 0, 0.1, 0.2];
        var members = new[] { 8, 10, 12, 14 }.Select((n, i) => new ScramblingTimeMember(n, 0.5 * n + off[i], 0.001, null, 1, n / 2.0 - 0.5, 0.5 * n)).ToList();
        var st = ScramblingTimePrediction.FromFront(24, 11.5, new ScramblingTimePrediction.Arrival(12.0, 0.0, false), members, 2.0, "test front");
        Assert.Equal(12.0 + 0.7, st.Value!.Value, 6);
        Assert.True(st.Uncertainty > 0.1, $"uncertainty {st.Uncertainty}");
    }

    [Fact]
    public void Scaling_ExactLogLaw_PredictsTheLawAndPrefersIt()
    {
        // t* = 0.2 + 0.3 ln N exactly at N = 8..16 with errors 0.001: the log fit is exact, the linear one is not
        // (curvature), so the log law carries the weight and the prediction at N = 24 is 0.2 + 0.3 ln 24.
        var members = new[] { 8, 10, 12, 14, 16 }.Select(n => new ScramblingTimeMember(n, 0.2 + 0.3 * Math.Log(n), 0.001, null, 1)).ToList();
        var p = ScramblingTimePrediction.Scaling(24, members);
        Assert.Equal("log", p.Comparison.Preferred);
        Assert.True(p.Comparison.LogWeight > 0.999);
        Assert.Equal(0.2 + 0.3 * Math.Log(24), p.Mean, 4);
        var st = ScramblingTimePrediction.FromScaling(24, members);
        Assert.Equal(2, st.Laws.Count);
    }

    [Fact]
    public void Scaling_Undecided_BandCoversBothLaws()
    {
        // Model averaging (Burnham and Anderson 2002, eq. 4.9): the variance holds the spread of the two laws'
        // predictions, so the band reaches both when the weights are comparable.
        var rng = new Random(2);
        var members = new[] { 8, 9, 10 }.Select(n => new ScramblingTimeMember(n, 1 + 0.05 * n + 0.02 * (rng.NextDouble() - 0.5), 0.05, null, 1)).ToList();
        var p = ScramblingTimePrediction.Scaling(40, members);
        Assert.Equal("neither", p.Comparison.Preferred);
        foreach (var l in p.Laws) Assert.InRange(l.Value, p.Mean - 2 * p.FitError, p.Mean + 2 * p.FitError);
    }
}
