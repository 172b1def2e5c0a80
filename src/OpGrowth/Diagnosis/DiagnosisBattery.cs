using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Exact;
using OpGrowth.IO;
using OpGrowth.Models;

namespace OpGrowth.Diagnosis;

/// <summary>
/// The diagnosis battery: seven tests that together say whether a model scrambles and, if not, why.
/// 1 level statistics (small N), 2 Lanczos growth, 3 operator size and autocorrelation, 4 operator front,
/// 5 conserved quantities and Mazur bounds, 6 finite temperature (small N). Each test returns a verdict
/// with its figure, threshold and source; <see cref="VerdictRules"/> combines them.
/// </summary>
public static class DiagnosisBattery
{
    /// <summary>A model with no smaller member is used itself by the small-size tests when it has at most this many sites more than they ask for.</summary>
    public const int SelfCheckMargin = 4;

    /// <summary>Runs the battery on <paramref name="model"/>; <paramref name="smaller"/> builds the smaller members for tests 1, 5 and 6.</summary>
    public static DiagnosisReport Run(Model model, SmallerMember? smaller, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var log = options.Logger;
        var tests = new List<TestVerdict>();
        var caveats = new List<string>();
        double eps = OperatorAlgebra.EnergyScale(model.Hamiltonian);
        log?.LogInformation("diagnosis of {Model}: N = {N}, {Lattice}, epsilon = {Eps:0.###}; probes {Probes}", model.Name, model.N, model.Lattice.Kind, eps, string.Join(", ", LanczosGrowthCheck.ProbesOf(model)));

        Model? Small(int n, int r = 0)
        {
            if (model.N <= n && r == 0) return model;
            try
            {
                var m = smaller?.Invoke(n, r);
                // a model without a size parameter (an edge list, fixed numbers) that is small enough for the
                // exact methods is checked on itself
                if (m is null && r == 0 && model.N <= n + SelfCheckMargin) return model;
                return m;
            }
            catch (InputException ex)
            {
                log?.LogWarning("no smaller member with N = {N}: {Message}", n, ex.Message);
                return null;
            }
        }
        bool Skip(int k) => options.Skip.Contains(k);
        int levelN = model.IsDriven ? FloquetLevelStatistics.DrivenSize(options.LevelN) : options.LevelN; // drives: general (non-Hermitian) blocks, costlier

        // 7: the structure of the terms (commuting, free-fermion frustration graph, conserved strings), exact at full size.
        StructureFindings? structure = null;
        if (Skip(7)) tests.Add(TestVerdict.NotRun(StructureCheck.Number, StructureCheck.Name, "skipped"));
        else
        {
            log?.LogInformation("test 7: term structure");
            var (v, f) = Guard(StructureCheck.Number, StructureCheck.Name, () => StructureCheck.Run(model, options, ct));
            tests.Add(v);
            structure = f;
        }

        // 5: conserved quantities first (test 3 compares with its Mazur bounds).
        ConservedFindings? conserved = null;
        if (Skip(5)) tests.Add(TestVerdict.NotRun(5, ConservationCheck.Name, "skipped"));
        else
        {
            log?.LogInformation("test 5/6: conserved quantities");
            var cluster = Small(options.ClusterN);
            if (cluster is null) tests.Add(TestVerdict.NotRun(5, ConservationCheck.Name, $"no member of the family with at most {options.ClusterN} sites (the model has {model.N} sites and no size parameter; name one with size = \"...\" in the model file)"));
            else
            {
                var (v, f) = Guard(5, ConservationCheck.Name, () => ConservationCheck.Run(model, cluster, options, ct));
                tests.Add(v);
                conserved = f;
            }
        }

        // 1: level statistics (the member size is chosen inside, to fit the symmetry blocks to the budget).
        LevelFindings? levels = null;
        if (Skip(1)) tests.Add(TestVerdict.NotRun(1, LevelStatisticsCheck.Name, "skipped"));
        else
        {
            log?.LogInformation("test 1/6: level statistics");
            var (v, f) = Guard(1, LevelStatisticsCheck.Name, () => LevelStatisticsCheck.Run(model, (n, r) => Small(n, r), options, ct));
            tests.Add(v);
            levels = f;
        }

        // 2: Lanczos growth.
        LanczosFindings? lanczos = null;
        if (Skip(2)) tests.Add(TestVerdict.NotRun(2, LanczosGrowthCheck.Name, "skipped"));
        else
        {
            log?.LogInformation("test 2/6: Lanczos growth");
            var (v, f) = Guard(2, LanczosGrowthCheck.Name, () => LanczosGrowthCheck.Run(model, options, ct));
            tests.Add(v);
            lanczos = f;
        }

        // 3 and 4: operator size, autocorrelation and front.
        SpreadingFindings? spreading = null;
        if (Skip(3) && Skip(4))
        {
            tests.Add(TestVerdict.NotRun(3, SpreadingCheck.SizeName, "skipped"));
            tests.Add(TestVerdict.NotRun(4, SpreadingCheck.FrontName, "skipped"));
        }
        else
        {
            log?.LogInformation("tests 3-4/6: operator size and front");
            try
            {
                // a model only a few sites above the exact size is evolved exactly at its own size (no truncated run needed)
                var smallSize = model.N <= options.SizeN + SelfCheckMargin ? model : Small(options.SizeN);
                var fullConserved = ConservationCheck.KnownConserved(model);
                var smallConserved = smallSize is null ? [] : ConservationCheck.KnownConserved(smallSize);
                double Bound(IReadOnlyList<(string Label, IReadOnlyList<Pauli.PauliTerm> Q)> cq, Model m, string p)
                    => ConservationCheck.MazurOf(cq, Pauli.PauliString.Parse(p, m.N)).Bound;
                var (vs, vf, f) = SpreadingCheck.Run(model, smallSize,
                    p => Bound(fullConserved, model, p), p => Bound(smallConserved, smallSize!, p), options, ct);
                tests.Add(Skip(3) ? TestVerdict.NotRun(3, SpreadingCheck.SizeName, "skipped") : vs);
                tests.Add(Skip(4) ? TestVerdict.NotRun(4, SpreadingCheck.FrontName, "skipped") : vf);
                spreading = f;
            }
            catch (Exception ex) when (ex is ResourceLimitException or ArgumentException or InputException)
            {
                tests.Add(TestVerdict.NotRun(3, SpreadingCheck.SizeName, $"the evolution could not run: {ex.Message}"));
                tests.Add(TestVerdict.NotRun(4, SpreadingCheck.FrontName, $"the evolution could not run: {ex.Message}"));
            }
        }

        // 6: finite temperature.
        ThermalFindings? thermal = null;
        if (Skip(6)) tests.Add(TestVerdict.NotRun(6, FiniteTemperatureCheck.Name, "skipped"));
        else
        {
            log?.LogInformation("test 6/6: finite temperature");
            var small = Small(options.ThermalN);
            if (small is null) tests.Add(TestVerdict.NotRun(6, FiniteTemperatureCheck.Name, $"no member of the family with at most {options.ThermalN} sites (the model has {model.N} sites and no size parameter; name one with size = \"...\" in the model file)"));
            else
            {
                var extra = options.ThermalExtraSizes.Where(n => n != small.N).Select(n => Small(n)).Where(m => m is not null).Select(m => m!).ToArray();
                var (v, f) = Guard(6, FiniteTemperatureCheck.Name, () => FiniteTemperatureCheck.Run(small, extra, options, ct));
                tests.Add(v);
                thermal = f;
            }
        }

        tests.Sort((a, b) => a.Number.CompareTo(b.Number));
        bool disorderedShortRange = model.IsDisordered && model.Lattice.Kind != "all-to-all";
        var overall = VerdictRules.Decide(tests, spreading, model.IsDriven, conserved, disorderedShortRange);
        if (model.IsDisordered) caveats.Add("random couplings: one disorder realisation per size, and the smaller members draw their own couplings");
        caveats.Add($"tests 1, 5 and 6 and the operator-size saturation of test 3 use smaller members of the family (N = {Math.Min(model.N, levelN)}, {Math.Min(model.N, options.ClusterN)}, {Math.Min(model.N, options.ThermalN)}, {Math.Min(model.N, options.SizeN)}); finite-size effects are strong there");
        if (spreading is not null && spreading.Runs.Any(r => r.Discarded[^1] > 0)) caveats.Add("tests 3 and 4 keep the top strings of the evolving operator; the discarded weight is reported per probe");
        if (lanczos is not null && lanczos.Probes.Any(p => p.DiscardedWeight > 0)) caveats.Add("test 2 truncated the Krylov vectors; coefficients whose budget spread exceeds 10% were not used");
        if (model.Lattice.Kind == "all-to-all") caveats.Add("all-to-all model: there is no front; fast-scrambling signatures (exponential size growth, t* ~ ln N) need several N to confirm");
        log?.LogInformation("diagnosis of {Model}: {Outcome}, leading mechanism {Mechanism} ({S:F0} s)", model.Name, MechanismNames.Of(overall.Outcome), overall.LeadingName, sw.Elapsed.TotalSeconds);
        return new DiagnosisReport
        {
            Model = model.Name,
            N = model.N,
            Lattice = model.Lattice.Kind,
            Epsilon = eps,
            MotionScale = OperatorAlgebra.MotionScale(model.Hamiltonian),
            Probes = LanczosGrowthCheck.ProbesOf(model).Select(p => p.ToString()).ToArray(),
            Tests = tests,
            Overall = overall,
            Caveats = caveats,
            Settings = new DiagnosisSettings(Math.Min(model.N, levelN), Math.Min(model.N, options.ClusterN), options.MaxWeight, Math.Min(model.N, options.SizeN), Math.Min(model.N, options.ThermalN), options.BetaEpsilon,
                options.LanczosDepth, options.LanczosMaxStrings, options.EvolutionMaxStrings, options.EvolutionTime, options.EffectiveThreads),
            Seconds = sw.Elapsed.TotalSeconds,
            Levels = levels,
            Lanczos = lanczos,
            Spreading = spreading,
            Conserved = conserved,
            Thermal = thermal,
            Structure = structure,
        };
    }

    private static (TestVerdict, T?) Guard<T>(int number, string name, Func<(TestVerdict, T?)> run) where T : class
    {
        var sw = Stopwatch.StartNew();
        try
        {
            return run();
        }
        catch (Exception ex) when (ex is ResourceLimitException or ArgumentException or InputException or ArithmeticException)
        {
            return (TestVerdict.NotRun(number, name, $"could not run: {ex.Message}", sw.Elapsed.TotalSeconds), null);
        }
    }
}
