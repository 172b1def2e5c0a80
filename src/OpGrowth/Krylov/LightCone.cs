namespace OpGrowth.Krylov;

/// <summary>
/// A sound, tight bound on how far the support of L^k O can reach beyond a local operator's edges on an
/// infinite chain, from an automaton on the edge letters. State: the frame end e (no support beyond it)
/// and the r letters just below it; a cell term placed at offset p acts when it anticommutes with the
/// string. When the term lies inside the known window the test is exact; when it also covers unknown
/// letters further in, both outcomes are allowed (over-approximation). Letters combine by the product
/// rule without phase. Each step also keeps every old state (terms acting elsewhere), so the bound after
/// k steps covers all Krylov vectors O_0..O_k.
/// </summary>
/// <remarks>
/// Example: mixed-field Ising, Z probe: the edge needs an X field (Z -> Y) before a ZZ bond can extend
/// it, so the support grows one site per two steps on each side; the generic bound 2nr+1 of
/// conventions.md assumes one site per step.
/// </remarks>
public static class LightCone
{
    /// <summary>
    /// Largest extension (sites) of the support beyond the probe's right end after k = 0..steps
    /// applications of the Liouvillian (index k).
    /// </summary>
    public static int[] RightReach(TranslationCell cell, string probeLetters, int steps)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentOutOfRangeException.ThrowIfNegative(steps);
        int r = Math.Max(1, cell.Range);
        int w = probeLetters.Length;
        var terms = cell.Terms.Select(t => t.Letters.Select(Code).ToArray()).ToArray();
        // A state packs the frame end (relative to the probe's last site) and the window letters.
        var states = new HashSet<(int E, int Window)>();
        int win = 0;
        for (int i = 0; i < r; i++)
        {
            int pos = w - 1 - i; // window slot i = frame end minus i
            if (pos >= 0) win |= Code(probeLetters[pos]) << (2 * i);
        }
        states.Add((0, win));
        var reach = new int[steps + 1];
        for (int k = 1; k <= steps; k++)
        {
            var next = new HashSet<(int, int)>(states);
            foreach (var (e, window) in states)
            {
                foreach (var t in terms)
                {
                    int s = t.Length;
                    // Placement p (relative to the frame end at 0): term covers p..p+s-1; must reach the window (p+s-1 >= -(r-1)) and start at or below the frame end.
                    for (int p = -(r - 1) - (s - 1); p <= 0; p++)
                    {
                        int parity = 0;
                        bool unknown = false;
                        int newWindowLow = window; // letters at relative positions 0, -1, .. -(r-1)
                        int high = 0;              // letters above the frame: bit slots for positions 1..s-1
                        int top = 0;               // highest position above the frame with a letter
                        for (int i = 0; i < s; i++)
                        {
                            int pos = p + i;
                            int tl = t[i];
                            if (tl == 0) continue;
                            if (pos > 0)
                            {
                                high |= tl << (2 * (pos - 1));
                                top = Math.Max(top, pos);
                            }
                            else if (pos >= -(r - 1))
                            {
                                int slot = -pos;
                                int sl = (window >> (2 * slot)) & 3;
                                if (sl != 0 && sl != tl) parity ^= 1;
                                newWindowLow ^= tl << (2 * slot);
                            }
                            else unknown = true;
                        }
                        if (!unknown && parity == 0) continue; // commutes: no product
                        if (top == 0)
                        {
                            next.Add((e, newWindowLow));
                            continue;
                        }
                        // Frame moves up by 'top': new window slot i = position top - i.
                        int nw = 0;
                        for (int i = 0; i < r; i++)
                        {
                            int pos = top - i;
                            int letter = pos > 0 ? (high >> (2 * (pos - 1))) & 3 : (-pos <= r - 1 ? (newWindowLow >> (2 * -pos)) & 3 : 0);
                            nw |= letter << (2 * i);
                        }
                        next.Add((e + top, nw));
                    }
                }
            }
            states = next;
            reach[k] = states.Max(st => st.E);
        }
        return reach;
    }

    /// <summary>Largest extension beyond the probe's left end after k = 0..steps applications.</summary>
    public static int[] LeftReach(TranslationCell cell, string probeLetters, int steps)
        => RightReach(cell.Reflected(), new string(probeLetters.Reverse().ToArray()), steps);

    /// <summary>Generic bound of conventions.md: r sites per step on each side.</summary>
    public static int GenericReach(TranslationCell cell, int steps) => cell.Range * steps;

    private static int Code(char c) => c switch
    {
        'I' => 0,
        'X' => 1,
        'Z' => 2,
        'Y' => 3,
        _ => throw new ArgumentException($"bad Pauli letter '{c}'"),
    };
}
