using System.Diagnostics;
using Microsoft.Extensions.Logging;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Structure;
using OpGrowth.Symmetry;

namespace OpGrowth.Diagnosis;

/// <summary>
/// Test 7: what the terms alone decide, exactly and at the full size. (a) Commuting terms: every term is
/// conserved and no operator spreads beyond the terms touching it. (b) The frustration graph (one vertex
/// per term, an edge per anticommuting pair) is a line graph: a generalised Jordan-Wigner map sends every
/// term to a Majorana bilinear, so the model is free fermions (Chapman and Flammia, Quantum 4, 278
/// (2020)); claw-free with a simplicial clique: free fermions in a non-local form (Elman, Chapman, Flammia,
/// arXiv:2012.07857; Fendley, J. Phys. A 52, 335002 (2019)); claw-free only: a hierarchy of commuting
/// conserved charges (integrable, arXiv:2012.07857). (c) A claw (a term anticommuting with three mutually
/// commuting terms) is the certificate that none of these structures exists; it says nothing about chaos.
/// Also counts the conserved Pauli strings (GF(2) null space) at the full size.
/// </summary>
public static class StructureCheck
{
    /// <summary>Test number (listed after the six original tests).</summary>
    public const int Number = 7;

    /// <summary>Test name.</summary>
    public const string Name = "term structure";

    /// <summary>Runs the test on the full model's terms (for a drive, every layer's generators).</summary>
    public static (TestVerdict Verdict, StructureFindings? Findings) Run(Model model, DiagnosisOptions options, CancellationToken ct = default)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(options);
        var sw = Stopwatch.StartNew();
        var terms = model.Drive is null
            ? model.Hamiltonian.Terms.Where(t => !t.String.IsIdentity).ToList()
            : model.Drive.Layers.SelectMany(l => l).Select(r => new PauliTerm(r.Generator, r.Angle)).DistinctBy(t => t.String).ToList();
        var strings = terms.Select(t => t.String).ToList();
        if (strings.Count > FrustrationGraph.MaxTerms)
        {
            return (TestVerdict.NotRun(Number, Name, $"{strings.Count} terms: the frustration graph is limited to {FrustrationGraph.MaxTerms} (budget)", sw.Elapsed.TotalSeconds), null);
        }
        ct.ThrowIfCancellationRequested();
        var conserved = PauliCommutant.Generators(model.N, strings);
        bool commuting = PauliCommutant.AllCommute(strings);
        var g = FrustrationGraph.Of(strings);
        var notes = new List<string>();
        string cls;
        IReadOnlyList<string>? claw = null;
        int? modes = null;
        double? spMin = null, spMax = null;
        var map = new List<string>();
        if (commuting)
        {
            cls = "no edges (commuting)";
        }
        else if (g.FindClaw() is { } k0)
        {
            // line graphs (and every claw-free class) have no claw: the certificate settles it at once
            cls = "claw";
            claw = [g.Terms[k0.Centre].ToString(), g.Terms[k0.A].ToString(), g.Terms[k0.B].ToString(), g.Terms[k0.C].ToString()];
        }
        else
        {
            var h = new Hamiltonian(model.N, terms);
            var ff = FreeFermionSolution.TryBuild(h, out string why);
            if (ff is not null)
            {
                cls = "line graph";
                modes = ff.Modes;
                if (ff.SingleParticleEnergies.Count > 0) (spMin, spMax) = (ff.SingleParticleEnergies[0], ff.SingleParticleEnergies[^1]);
                map.AddRange(ff.Terms.Zip(ff.Edges).Take(8).Select(x => $"{x.First.String} -> {(x.Second.Sign < 0 ? "-" : "")}i g_{x.Second.A} g_{x.Second.B}"));
                notes.AddRange(ff.Notes);
                if (model.IsDriven) notes.Add("a drive whose generators form a line graph: every layer is a Gaussian (free-fermion) unitary, and so is the period map");
            }
            else
            {
                var simplicial = g.FindSimplicialClique();
                cls = simplicial is not null ? "claw-free with a simplicial clique" : "claw-free";
                if (simplicial is null) notes.Add("no simplicial clique found by the greedy search (not exhaustive)");
                var (hole, complete) = g.FindEvenHole();
                notes.Add(hole is not null ? $"even hole of length {hole.Count} found" : complete ? "no even hole up to length 8" : "even-hole search ran out of its budget");
                notes.Add($"not a line graph: {why}");
            }
        }
        var findings = new StructureFindings
        {
            Terms = strings.Count,
            AnticommutingPairs = g.EdgeCount,
            Commuting = commuting,
            ConservedStrings = conserved.Count,
            LocalConservedStrings = conserved.Count(s => s.Weight <= 4),
            ConservedExamples = conserved.Take(6).Select(s => s.ToString()).ToArray(),
            GraphClass = cls,
            Claw = claw,
            MajoranaModes = modes,
            SingleParticleMin = spMin,
            SingleParticleMax = spMax,
            MajoranaMap = map,
            Notes = notes,
        };
        var verdict = Judge(findings, model.N) with { Seconds = sw.Elapsed.TotalSeconds };
        options.Logger?.LogInformation("term structure: {Class}; {Conserved} conserved Pauli strings ({Local} local) ({S:F1} s)", cls, conserved.Count, findings.LocalConservedStrings, sw.Elapsed.TotalSeconds);
        return (verdict, findings);
    }

    /// <summary>The verdict (pure).</summary>
    public static TestVerdict Judge(StructureFindings f, int n)
    {
        ArgumentNullException.ThrowIfNull(f);
        string figure = $"{f.Terms} terms, {f.AnticommutingPairs} anticommuting pairs; frustration graph: {f.GraphClass}"
            + (f.Claw is not null ? $" ({f.Claw[0]} anticommutes with {f.Claw[1]}, {f.Claw[2]}, {f.Claw[3]}, which commute)" : string.Empty)
            + $"; {f.ConservedStrings} conserved Pauli strings ({f.LocalConservedStrings} of weight <= 4)";
        const string threshold = "commuting terms; a line graph (free fermions); claw-free with a simplicial clique (free fermions); claw-free (integrable); a claw rules these out";
        const string source = "Chapman and Flammia, Quantum 4, 278 (2020); Elman, Chapman, Flammia, arXiv:2012.07857; Chapman, Elman, Mann, arXiv:2305.15625; Fendley, J. Phys. A 52, 335002 (2019)";
        var notes = new List<string>(f.Notes);
        if (f.MajoranaModes is int m) notes.Add(FormattableString.Invariant($"free-fermion map: {m} Majorana modes; single-particle energies {f.SingleParticleMin:G4} to {f.SingleParticleMax:G4}; {string.Join("; ", f.MajoranaMap)}{(f.Terms > f.MajoranaMap.Count ? "; ..." : string.Empty)}"));
        if (f.ConservedExamples.Count > 0) notes.Add($"conserved strings: {string.Join(", ", f.ConservedExamples)}{(f.ConservedStrings > f.ConservedExamples.Count ? ", ..." : string.Empty)}");
        TestVerdict V(TestOutcome o, string reason, params Mechanism[] ev) => TestVerdict.Of(Number, Name, figure, threshold, source, notes, o, reason, ev);
        if (f.Commuting)
            return V(TestOutcome.Fails, "every term commutes with every other: each term is conserved and an operator only ever reaches the terms that touch it", Mechanism.Commuting);
        if (f.GraphClass == "line graph")
            return V(TestOutcome.Fails, "the frustration graph is a line graph: a generalised Jordan-Wigner map makes every term a Majorana bilinear (free fermions)", Mechanism.FreeFermions);
        if (f.GraphClass == "claw-free with a simplicial clique")
            return V(TestOutcome.Fails, "the frustration graph is claw-free with a simplicial clique: free fermions in a non-local form", Mechanism.FreeFermions);
        if (f.GraphClass == "claw-free")
            return V(TestOutcome.Fails, "the frustration graph is claw-free: a hierarchy of commuting conserved charges (integrable)", Mechanism.InteractingIntegrable);
        if (f.LocalConservedStrings >= Math.Max(2, n / 2))
            return V(TestOutcome.Fails, $"{f.LocalConservedStrings} local conserved Pauli strings: an extensive set of local integrals of motion", Mechanism.InteractingIntegrable, Mechanism.Commuting);
        return V(TestOutcome.Inconclusive, f.GraphClass == "claw"
            ? "no free-fermion structure (a claw rules it out); the terms alone say nothing more about chaos"
            : "the structure of the terms decides nothing here");
    }
}
