namespace OpGrowth.Evolution;

/// <summary>One pass of a product formula: exp(-i Fraction * dt * G_Group), and how many time steps it closes.</summary>
internal readonly record struct SplitStage(int Group, double Fraction, int StepEnds);

/// <summary>
/// Trotter-Suzuki product formulas over k commuting groups G_0..G_{k-1} (H = sum of the groups).
/// Second order (symmetric): S2(s) = e^{-i G_0 s/2} ... e^{-i G_{k-2} s/2} e^{-i G_{k-1} s} e^{-i G_{k-2} s/2} ... e^{-i G_0 s/2}.
/// Source: M. Suzuki, Phys. Lett. A 146, 319 (1990).
/// Fourth order: S4(s) = S2(p s) S2(p s) S2((1 - 4p) s) S2(p s) S2(p s), p = 1/(4 - 4^{1/3}).
/// Source: M. Suzuki, J. Math. Phys. 32, 400 (1991).
/// Both are palindromes, so applying the factors left to right in the Heisenberg picture
/// (U^dagger O U with U = e^{-iH dt}) equals applying them right to left.
/// Adjacent factors of the same group are merged (e.g. the closing G_0 half step of one step with
/// the opening one of the next), which is exact because a group commutes with itself.
/// </summary>
internal static class SplittingSchedule
{
    /// <summary>Suzuki's p = 1/(4 - 4^{1/3}).</summary>
    public static readonly double SuzukiP = 1.0 / (4.0 - Math.Cbrt(4.0));

    /// <summary>The stages of <paramref name="steps"/> consecutive steps, adjacent same-group stages merged.</summary>
    public static List<SplitStage> Segment(IntegrationMethod method, int groups, int steps)
    {
        var raw = new List<SplitStage>();
        for (int s = 0; s < steps; s++)
        {
            int start = raw.Count;
            switch (method)
            {
                case IntegrationMethod.Trotter2:
                    AddS2(raw, groups, 1.0);
                    break;
                case IntegrationMethod.Trotter4:
                    double p = SuzukiP;
                    AddS2(raw, groups, p);
                    AddS2(raw, groups, p);
                    AddS2(raw, groups, 1 - 4 * p);
                    AddS2(raw, groups, p);
                    AddS2(raw, groups, p);
                    break;
                default:
                    throw new ArgumentException($"{method} is not a splitting method.", nameof(method));
            }
            raw[^1] = raw[^1] with { StepEnds = 1 };
        }
        var merged = new List<SplitStage>(raw.Count);
        foreach (var st in raw)
        {
            if (merged.Count > 0 && merged[^1].Group == st.Group)
            {
                var last = merged[^1];
                merged[^1] = new SplitStage(st.Group, last.Fraction + st.Fraction, last.StepEnds + st.StepEnds);
            }
            else merged.Add(st);
        }
        return merged;
    }

    private static void AddS2(List<SplitStage> list, int k, double s)
    {
        if (k == 1)
        {
            list.Add(new SplitStage(0, s, 0));
            return;
        }
        for (int g = 0; g < k - 1; g++) list.Add(new SplitStage(g, s / 2, 0));
        list.Add(new SplitStage(k - 1, s, 0));
        for (int g = k - 2; g >= 0; g--) list.Add(new SplitStage(g, s / 2, 0));
    }
}
