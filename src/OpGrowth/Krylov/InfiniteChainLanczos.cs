using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Lanczos coefficients of a local operator on the infinite chain of a translation-invariant 1D model,
/// computed exactly on an open chain long enough that the support of every Krylov vector used stays away
/// from both ends. On an open chain the b_n equal the infinite-chain values while O_{n-1} has not come
/// within r sites of a boundary (conventions.md: a chain of 2nr+1 sites always suffices for a one-site
/// probe). The length is chosen from <see cref="LightCone"/> (often about half the generic bound) and
/// each O_k is checked at run time; a violation is reported, never silently accepted.
/// </summary>
public static class InfiniteChainLanczos
{
    /// <summary>Chain length and probe position used for a requested depth.</summary>
    public readonly record struct ChainLayout(int Sites, int ProbeOffset, int GenericSites);

    /// <summary>Chooses the chain: probe width w, light-cone reach on both sides after depth-1 steps, plus r margin each side.</summary>
    public static ChainLayout Layout(TranslationCell cell, string probeLetters, int depth)
    {
        ArgumentNullException.ThrowIfNull(cell);
        int r = cell.Range;
        int k = Math.Max(0, depth - 1);
        int right = LightCone.RightReach(cell, probeLetters, k)[k];
        int left = LightCone.LeftReach(cell, probeLetters, k)[k];
        int w = probeLetters.Length;
        int sites = w + left + right + 2 * r;
        int generic = w + 2 * depth * r;
        return new ChainLayout(Math.Max(sites, r + 1), left + r, generic);
    }

    /// <summary>
    /// Runs the recursion for the probe (dense letters from its first site, e.g. "Z" or "XZX") on an open
    /// chain. <paramref name="sites"/> overrides the chosen length (the probe is then centred); the run-time
    /// check still decides which coefficients are infinite-chain values. With <paramref name="useReflection"/>
    /// one key is stored per mirror pair of strings (about half the memory and work); this needs a cell that
    /// is its own mirror image and a palindromic probe. <paramref name="probeSite"/> places the probe's first
    /// letter at a given site instead of the centre (not with reflection).
    /// </summary>
    public static LanczosResult Run(TranslationCell cell, string probeLetters, LanczosOptions options, int? sites = null, bool useReflection = false, int? probeSite = null)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate();
        if (probeLetters.Length == 0 || probeLetters[0] == 'I' || probeLetters[^1] == 'I' || probeLetters.Any(c => c is not ('I' or 'X' or 'Y' or 'Z')))
            throw new ArgumentException($"Probe '{probeLetters}' must be IXYZ letters starting and ending with a non-identity letter.", nameof(probeLetters));
        var layout = Layout(cell, probeLetters, options.Depth);
        int n = layout.Sites, offset = layout.ProbeOffset;
        if (sites is int s)
        {
            ArgumentOutOfRangeException.ThrowIfLessThan(s, probeLetters.Length + 2 * cell.Range, nameof(sites));
            n = s;
            offset = (s - probeLetters.Length) / 2;
        }
        if (probeSite is int ps)
        {
            if (useReflection) throw new ArgumentException("The reflection reduction needs the probe at the centre; do not set probeSite.", nameof(probeSite));
            ArgumentOutOfRangeException.ThrowIfNegative(ps, nameof(probeSite));
            ArgumentOutOfRangeException.ThrowIfGreaterThan(ps, n - probeLetters.Length, nameof(probeSite));
            offset = ps;
        }
        if (useReflection)
        {
            string why = ReflectionProblem(cell, probeLetters, n);
            if (why.Length > 0) throw new ArgumentException($"Reflection reduction is not possible: {why}.", nameof(useReflection));
        }
        if (n > PauliWidth.MaxQubits) throw new ArgumentOutOfRangeException(nameof(sites), n, $"The chain would need {n} sites; at most {PauliWidth.MaxQubits} are supported (lower the depth).");
        var h = cell.OpenChain(n);
        var probe = TranslationCell.Place(probeLetters, offset, n, false);
        int r = cell.Range;
        var warnings = new List<string>();
        int verified = -1;
        var log = options.Logger;
        log?.LogInformation("infinite chain: open chain of {Sites} sites, probe {Probe} at site {Offset} (light-cone choice; generic bound {Generic} sites)",
            n, probeLetters, offset, layout.GenericSites);
        void Check(LanczosStep step)
        {
            if (verified >= 0 || step.SupportFirst < 0 || step.N >= options.Depth) return; // O_depth is never used for a b_n
            if (step.SupportFirst < r || step.SupportLast > n - 1 - r)
            {
                verified = step.N; // O_N touches the margin: b_{N+1} onward may feel the boundary
                string msg = $"support of O_{step.N} reached sites [{step.SupportFirst}, {step.SupportLast}] of an open chain of {n} (safe region [{r}, {n - 1 - r}]): b_n for n > {step.N} are finite-chain values, not infinite-chain values";
                warnings.Add(msg);
                log?.LogWarning("{Message}", msg);
            }
        }
        var result = ChainWidth.Dispatch<LanczosResult, ChainRun>(n, new ChainRun(h, probe, options, Check,
            $"infinite chain (open chain of {n} sites, probe at site {offset}; light-cone length, generic bound {layout.GenericSites}{(useReflection ? "; one key per mirror pair" : "")})",
            useReflection));
        return result with
        {
            VerifiedDepth = verified < 0 ? result.B.Count : Math.Min(verified, result.B.Count),
            Warnings = warnings,
        };
    }

    /// <summary>Empty when reflection reduction applies; otherwise why not.</summary>
    public static string ReflectionProblem(TranslationCell cell, string probeLetters, int sites)
    {
        ArgumentNullException.ThrowIfNull(cell);
        string rev = new(probeLetters.Reverse().ToArray());
        if (rev != probeLetters) return $"the probe {probeLetters} is not its own mirror image";
        var terms = cell.Terms.Select(t => (t.Letters, t.Coefficient)).ToHashSet();
        if (!cell.Reflected().Terms.All(t => terms.Contains((t.Letters, t.Coefficient)))) return $"the Hamiltonian cell ({cell}) is not its own mirror image";
        if ((sites - probeLetters.Length) % 2 != 0) return $"the probe cannot sit at the centre of {sites} sites";
        return "";
    }

    private readonly struct ChainRun(Hamiltonian h, PauliString probe, LanczosOptions options, Action<LanczosStep> check, string representation, bool reflect) : IWidthFunc<LanczosResult>
    {
        public LanczosResult Invoke<T>() where T : unmanaged, IPauliKey<T>
        {
            var c = check;
            var hc = h.Compile<T>();
            if (reflect)
            {
                var basis = new ReflectionBasis<T>(hc);
                var o0 = new PauliOperator<T>(h.N, [basis.Canonical(T.From(probe), out _)], [1.0], 1);
                return LanczosEngine.Run(basis, o0, options, representation, h.N, (step, _) => c(step));
            }
            return LanczosEngine.Run(new PlainBasis<T>(hc), PauliOperator<T>.Single(probe), options, representation, h.N,
                (step, _) => c(step));
        }
    }
}
