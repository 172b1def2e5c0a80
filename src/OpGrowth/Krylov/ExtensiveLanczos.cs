using Microsoft.Extensions.Logging;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Lanczos coefficients of an extensive operator O = sum_x T^x O_loc (the momentum-zero sum over all
/// translates of a local operator) in a translation-invariant 1D model, storing one representative per
/// translation class. This cuts memory by about the support length of the strings compared with storing
/// every translate. Norms are per unit length on the infinite line (||O||^2 / sites), and b_n do not
/// depend on that normalisation.
/// </summary>
/// <remarks>Source: Parker, Cao, Avdoshkin, Scaffidi, Altman, PRX 9, 041017 (2019), methods (translation-invariant storage).</remarks>
public static class ExtensiveLanczos
{
    /// <summary>
    /// Infinite line. The key width is chosen so that the strings of O_{depth-1} (bounded by the
    /// <see cref="LightCone"/>) plus r sites of margin on each side fit; the span is checked each step.
    /// </summary>
    public static LanczosResult RunLine(TranslationCell cell, string probeLetters, LanczosOptions options)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate();
        var layout = InfiniteChainLanczos.Layout(cell, probeLetters, options.Depth);
        // Strings are stored from site 0 and moved up by r before a commutator: span + 2r sites needed,
        // and the window must hold every placement: layout.Sites already counts w + reach + 2r.
        int need = Math.Max(layout.Sites, probeLetters.Length + 2 * cell.Range + 1);
        if (need > PauliWidth.MaxQubits) throw new ArgumentOutOfRangeException(nameof(options), need, $"Strings would need {need} sites; at most {PauliWidth.MaxQubits} are supported (lower the depth).");
        options.Logger?.LogInformation("extensive operator on the infinite line: one key per translation class, window {Need} sites", need);
        var warnings = new List<string>();
        int window = 0;
        var res = PauliWidth.Dispatch<LanczosResult, LineRun>(need, new LineRun(cell, probeLetters, options, warnings, w => window = w));
        return res with { Warnings = warnings, Sites = window };
    }

    /// <summary>Ring of <paramref name="ringSites"/> sites (rotation classes; norm of the full sum, b_n do not depend on it).</summary>
    public static LanczosResult RunRing(TranslationCell cell, int ringSites, string probeLetters, LanczosOptions options)
    {
        ArgumentNullException.ThrowIfNull(cell);
        ArgumentNullException.ThrowIfNull(options);
        options.Validate();
        if (ringSites > PauliWidth.MaxQubits) throw new ArgumentOutOfRangeException(nameof(ringSites), ringSites, $"At most {PauliWidth.MaxQubits} sites are supported.");
        return PauliWidth.Dispatch<LanczosResult, RingRun>(ringSites, new RingRun(cell, ringSites, probeLetters, options));
    }

    private readonly struct LineRun(TranslationCell cell, string probe, LanczosOptions options, List<string> warnings, Action<int> setWindow) : IWidthFunc<LanczosResult>
    {
        public LanczosResult Invoke<T>() where T : unmanaged, IPauliKey<T>
        {
            int cap = T.Capacity;
            setWindow(cap);
            int r = cell.Range;
            var basis = new LineClassBasis<T>(cell);
            var o0 = PauliOperator<T>.Single(TranslationCell.Place(probe, 0, cap, false));
            var warn = warnings;
            var opt = options;
            var stopper = new CancellationTokenSource();
            using var linked = CancellationTokenSource.CreateLinkedTokenSource(opt.Cancellation, stopper.Token);
            var result = LanczosEngine.Run(basis, o0, opt with { Cancellation = linked.Token },
                $"extensive (translation classes on the infinite line, {cap}-site key window; norms per unit length)", cap,
                (step, _) =>
                {
                    if (step.MaxSpan + 2 * r > cap)
                    {
                        warn.Add($"strings of O_{step.N} span {step.MaxSpan} sites; with the 2r = {2 * r} margin they no longer fit the {cap}-site window: stopped");
                        stopper.Cancel();
                    }
                });
            if (stopper.IsCancellationRequested)
                result = result with { StopReason = LanczosStopReason.WindowExceeded, StopMessage = warn[^1] };
            return result;
        }
    }

    private readonly struct RingRun(TranslationCell cell, int sites, string probe, LanczosOptions options) : IWidthFunc<LanczosResult>
    {
        public LanczosResult Invoke<T>() where T : unmanaged, IPauliKey<T>
        {
            var basis = new RingClassBasis<T>(cell, sites);
            var s = T.From(TranslationCell.Place(probe, 0, sites, true));
            var o0 = new PauliOperator<T>(sites, [RingClassBasis<T>.Canonical(s, sites, out _)], [1.0], 1);
            return LanczosEngine.Run(basis, o0, options, $"extensive (rotation classes on a ring of {sites} sites)", sites);
        }
    }
}
