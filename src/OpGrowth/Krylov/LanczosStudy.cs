using Microsoft.Extensions.Logging;
using OpGrowth.IO;
using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Krylov;

/// <summary>
/// Runs the recursion for a model and a probe in one of the <see cref="LanczosMode"/>s and returns the
/// coefficients with uncertainties (the command line's entry into the library).
/// </summary>
public static class LanczosStudy
{
    /// <summary>Budgets actually used: none for exact runs; at least two for truncated ones (M/4 added when only one is given).</summary>
    public static IReadOnlyList<long> EffectiveBudgets(LanczosMode mode, IReadOnlyList<long> budgets)
    {
        ArgumentNullException.ThrowIfNull(budgets);
        var b = budgets.Where(m => m > 0).Distinct().OrderBy(m => m).ToList();
        if (mode == LanczosMode.Exact) return [0];
        if (mode == LanczosMode.Truncated && b.Count == 0)
            throw new InputException(null, 0, "found no --max-strings for truncated mode; expected one or more budgets such as --max-strings 100000 400000");
        if (b.Count == 1) b.Insert(0, Math.Max(1, b[0] / 4));
        return b.Count == 0 ? [0] : b;
    }

    /// <summary>
    /// Runs the recursion. <paramref name="budgets"/> are string budgets per Krylov vector (ignored in exact
    /// mode); <paramref name="sites"/> overrides the infinite-chain length; <paramref name="useReflection"/>
    /// stores one key per mirror pair in infinite-chain mode (mirror-symmetric cell and probe only).
    /// </summary>
    public static LanczosEstimate Run(Model model, PauliString probe, LanczosMode mode, LanczosOptions options, IReadOnlyList<long> budgets, int? sites = null, bool useReflection = false)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(probe);
        ArgumentNullException.ThrowIfNull(options);
        if (probe.N != model.N) throw new InputException(model.SourceFile, 0, $"found a probe on {probe.N} qubits; expected {model.N}");
        if (probe.IsIdentity) throw new InputException(model.SourceFile, 0, "found the identity as probe; expected a non-identity Pauli string");
        if (useReflection && mode != LanczosMode.InfiniteChain)
            throw new InputException(model.SourceFile, 0, "found the reflection reduction outside infinite-chain mode; expected --mode infinite-chain");
        var use = EffectiveBudgets(mode, budgets);
        if (use.Count > 1 || use[0] > 0) options.Logger?.LogInformation("string budgets per Krylov vector: {Budgets}", string.Join(", ", use));
        Func<long, LanczosResult> run;
        switch (mode)
        {
            case LanczosMode.Exact:
            case LanczosMode.Truncated:
                run = m => LanczosRecursion.Run(model.Hamiltonian, probe, options with { MaxStrings = m });
                break;
            case LanczosMode.InfiniteChain:
            case LanczosMode.Extensive:
            {
                var (cell, periodic) = CellOf(model, mode);
                var (_, letters) = TranslationCell.LocalPattern(probe, periodic);
                if (mode == LanczosMode.InfiniteChain)
                {
                    if (useReflection)
                    {
                        int n = sites ?? InfiniteChainLanczos.Layout(cell, letters, options.Depth).Sites;
                        string why = InfiniteChainLanczos.ReflectionProblem(cell, letters, n);
                        if (why.Length > 0) throw new InputException(model.SourceFile, 0, $"found {why}; expected a mirror-symmetric model and probe for the reflection reduction");
                    }
                    run = m => InfiniteChainLanczos.Run(cell, letters, options with { MaxStrings = m }, sites, useReflection);
                }
                else if (periodic)
                {
                    run = m => ExtensiveLanczos.RunRing(cell, model.N, letters, options with { MaxStrings = m });
                }
                else
                {
                    run = m => ExtensiveLanczos.RunLine(cell, letters, options with { MaxStrings = m });
                }
                break;
            }
            default:
                throw new ArgumentOutOfRangeException(nameof(mode), mode, null);
        }
        var runs = new List<LanczosResult>();
        foreach (long m in use)
        {
            var r = run(m);
            runs.Add(r);
            if (r.StopReason == LanczosStopReason.Cancelled) break;
        }
        return TruncatedLanczos.Combine(use.Take(runs.Count).ToArray(), runs);
    }

    /// <summary>The unit cell of a translation-invariant chain or ring model; an InputException says why a model does not qualify.</summary>
    public static (TranslationCell Cell, bool Periodic) CellOf(Model model, LanczosMode mode)
    {
        ArgumentNullException.ThrowIfNull(model);
        string what = mode == LanczosMode.Extensive ? "extensive mode" : "infinite-chain mode";
        if (model.Lattice.Kind is not ("chain" or "ring"))
            throw new InputException(model.SourceFile, 0, $"found a {model.Lattice.Kind} lattice; {what} expects a chain or ring with a one-site unit cell (use --mode exact or truncated)");
        if (!model.IsTranslationInvariant)
            throw new InputException(model.SourceFile, 0, $"found non-uniform couplings (model is not translation invariant); {what} expects uniform couplings (use --mode exact or truncated)");
        if (model.IsDriven)
            throw new InputException(model.SourceFile, 0, $"found a driven model; {what} expects a Hamiltonian model (use --mode exact or truncated, which use the period-averaged generator)");
        bool periodic = model.Lattice.Kind == "ring";
        return (TranslationCell.FromHamiltonian(model.Hamiltonian, periodic, model.SourceFile), periodic);
    }
}
