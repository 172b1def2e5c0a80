using OpGrowth.Models;
using OpGrowth.Pauli;

namespace OpGrowth.Ensembles;

/// <summary>
/// A random-circuit ensemble: qubits on a lattice (the coupling graph), a gate layout, the number of layers and
/// whether each two-qubit layer is followed by a layer of single-qubit gates. Every gate is Haar random; averages
/// over the ensemble are computed by sampling random Clifford gates (<see cref="CircuitSampler"/>). Time is
/// counted in layers: one layer is one unit of time (a layer of single-qubit gates does not count).
/// </summary>
public sealed record Circuit
{
    /// <summary>Short name (as in model files).</summary>
    public required string Name { get; init; }

    /// <summary>One line saying what the circuit is.</summary>
    public string Description { get; init; } = "";

    /// <summary>Number of qubits.</summary>
    public required int N { get; init; }

    /// <summary>Qubits and the bonds gates may act on; null: all-to-all (no bond list is built, so any N works).</summary>
    public Lattice? Lattice { get; init; }

    /// <summary>Gate placement.</summary>
    public required CircuitLayout Layout { get; init; }

    /// <summary>Two-qubit gate layers to apply (the final time).</summary>
    public required int Layers { get; init; }

    /// <summary>A layer of Haar-random single-qubit gates after every two-qubit layer.</summary>
    public bool SingleQubitLayers { get; init; }

    /// <summary>Operators to evolve (default: Z on the lattice's first site).</summary>
    public IReadOnlyList<PauliString> Probes { get; init; } = [];

    /// <summary>Parameters as evaluated (from a circuit file), for the report.</summary>
    public IReadOnlyDictionary<string, double> Parameters { get; init; } = new Dictionary<string, double>();

    /// <summary>Lattice kind: chain, ring, ladder, square, edges or all-to-all.</summary>
    public string Topology => Lattice?.Kind ?? "all-to-all";

    /// <summary>Distances for the analysis.</summary>
    public OpGrowth.Analysis.LatticeGeometry Geometry => Lattice is { } l
        ? new(N, l.Distance, l.IsOneDimensional, l.Kind)
        : OpGrowth.Analysis.LatticeGeometry.AllToAll(N);

    /// <summary>The layout's name as written in circuit files.</summary>
    public string LayoutName => Layout == CircuitLayout.Brickwork ? "brickwork" : "random-pairs";

    /// <summary>One line for summaries.</summary>
    public string Summary => $"{LayoutName} circuit of Haar two-qubit gates on {(Lattice?.ToString() ?? $"all-to-all, {N} qubits")}{(SingleQubitLayers ? ", Haar single-qubit layers" : "")}, {Layers} layers";

    /// <summary>The same circuit at another size (for t*(N)): a chain, ring or all-to-all of <paramref name="n"/> qubits.</summary>
    public Circuit Resized(int n, int layers)
    {
        var lattice = Topology switch
        {
            "chain" => Lattice.Chain(n),
            "ring" => Lattice.Chain(n, periodic: true),
            "all-to-all" => null,
            _ => throw new NotSupportedException($"a {Topology} lattice has no one-parameter family of sizes; expected chain, ring or all-to-all"),
        };
        return this with { N = n, Lattice = lattice, Layers = layers, Probes = [] };
    }

    /// <summary>Probe to evolve: the first of <see cref="Probes"/>, else Z on site 0.</summary>
    public PauliString Probe => Probes.Count > 0 ? Probes[0] : PauliString.Single(N, 0, 'Z');
}
