namespace OpGrowth.Ensembles;

/// <summary>How the two-qubit gates of a random circuit are placed, layer by layer.</summary>
public enum CircuitLayout
{
    /// <summary>
    /// A fixed cycle of gate layers: the lattice's bonds split into sets with no shared qubit (on a chain the even
    /// bonds, then the odd bonds), one set per layer.
    /// </summary>
    Brickwork,

    /// <summary>
    /// Each layer a fresh random matching of the coupling graph (on an all-to-all lattice a uniformly random
    /// pairing of all qubits; on another graph a random maximal matching of its bonds).
    /// </summary>
    RandomPairs,
}
