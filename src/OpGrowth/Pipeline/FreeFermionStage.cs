using System.Globalization;
using OpGrowth.Models;
using OpGrowth.Pauli;
using OpGrowth.Structure;

namespace OpGrowth.Pipeline;

/// <summary>
/// What a run states for a model the diagnosis battery finds free: no scrambling time (a free operator's size
/// does not approach the random-operator value, so 3N/8 is not a scrambling level) but the free-fermion figures:
/// the number of Majorana modes, the single-particle energies and the exact Majorana light cone
/// |R_ab(t)|^2 = |(e^{A t})_ab|^2 from the single-particle matrix (Chapman and Flammia, Quantum 4, 278 (2020),
/// for the map; the light cone is exact at any N).
/// </summary>
public sealed record FreeFermionStage
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    /// <summary>Majorana modes of the map.</summary>
    public required int Modes { get; init; }

    /// <summary>The Majorana whose light cone is shown.</summary>
    public required int Majorana { get; init; }

    /// <summary>Why that Majorana (the probe's own pair, or the first mode).</summary>
    public required string MajoranaNote { get; init; }

    /// <summary>Single-particle energies (ascending).</summary>
    public required IReadOnlyList<double> Energies { get; init; }

    /// <summary>Times of the light cone (the evolution's record times).</summary>
    public required double[] Times { get; init; }

    /// <summary>Weights[b, i] = |R_ab(t_i)|^2 (each column sums to 1).</summary>
    public required double[,] Weights { get; init; }

    /// <summary>Why no scrambling time is stated.</summary>
    public string Reason { get; init; } = "";

    /// <summary>One line for the console and report.</summary>
    public string Text()
        => FormattableString.Invariant($"free fermions: {Modes} Majorana modes, single-particle energies {Energies[0]:G4} to {Energies[^1]:G4}; no scrambling time (a free operator does not approach a random operator); Majorana light cone of mode {Majorana} in the figure free-fermion-light-cone");

    /// <summary>
    /// Builds the stage when the model's terms map to free fermions (frustration graph a line graph) and the model
    /// is a Hamiltonian; null otherwise (a drive's period map is free too but its light cone is not computed here).
    /// </summary>
    public static FreeFermionStage? TryRun(Model model, PauliString probe, double[] times)
    {
        ArgumentNullException.ThrowIfNull(model);
        ArgumentNullException.ThrowIfNull(times);
        if (model.Drive is not null || times.Length == 0) return null;
        var ff = FreeFermionSolution.TryBuild(model.Hamiltonian, out _);
        if (ff is null || ff.Modes == 0) return null;
        int a = 0;
        string note = "the first mode of the map (the probe is not a single term of H)";
        for (int k = 0; k < ff.Terms.Count; k++)
        {
            if (ff.Terms[k].String.Equals(probe))
            {
                a = ff.Edges[k].A;
                note = FormattableString.Invariant($"one of the probe's two Majoranas ({probe} = i g_{ff.Edges[k].A} g_{ff.Edges[k].B} up to sign)");
                break;
            }
        }
        var cone = ff.LightCone(a, times);
        var w = new double[ff.Modes, times.Length];
        for (int i = 0; i < times.Length; i++)
            for (int b = 0; b < ff.Modes; b++) w[b, i] = cone[i][b];
        var energies = ff.SingleParticleEnergies.Count > 0 ? ff.SingleParticleEnergies : [0.0];
        return new FreeFermionStage
        {
            Modes = ff.Modes,
            Majorana = a,
            MajoranaNote = note,
            Energies = energies,
            Times = times,
            Weights = w,
            Reason = "the diagnosis battery finds free fermions (frustration graph of the terms is a line graph)",
        };
    }
}
