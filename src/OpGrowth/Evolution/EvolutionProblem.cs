using OpGrowth.Pauli;

namespace OpGrowth.Evolution;

/// <summary>What to evolve: a Hamiltonian or a periodic drive, and the initial operator.</summary>
public sealed record EvolutionProblem
{
    /// <summary>Number of qubits (1..1024).</summary>
    public required int N { get; init; }

    /// <summary>Name used in outputs.</summary>
    public string Name { get; init; } = "model";

    /// <summary>Hamiltonian for continuous-time evolution (ignored when <see cref="Drive"/> is set).</summary>
    public Hamiltonian? Hamiltonian { get; init; }

    /// <summary>Periodic drive: evolution is stroboscopic, one step per period.</summary>
    public PeriodicDrive? Drive { get; init; }

    /// <summary>Initial operator O(0) (normalised to ||O|| = 1 by the engine), usually one Pauli string.</summary>
    public required IReadOnlyList<PauliTerm> Initial { get; init; }

    /// <summary>Also record the Majorana size (Jordan-Wigner with X strings) for fermionic models.</summary>
    public bool CountMajoranas { get; init; }

    /// <summary>Convenience: a single Pauli string as O(0).</summary>
    public static IReadOnlyList<PauliTerm> Probe(PauliString s) => [new PauliTerm(s, 1.0)];
}
