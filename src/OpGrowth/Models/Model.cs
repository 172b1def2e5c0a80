using OpGrowth.Pauli;

namespace OpGrowth.Models;

/// <summary>
/// A fully built model: lattice, Hamiltonian (or periodic drive), default probes, declared symmetries,
/// and the resolved parameter values. Made by <see cref="ModelLoader"/> from a file, or in code.
/// </summary>
public sealed class Model
{
    /// <summary>Short name (from the file's <c>name</c>).</summary>
    public required string Name { get; init; }

    /// <summary>One-line description.</summary>
    public required string Description { get; init; }

    /// <summary>File the model was read from, or null when built in code.</summary>
    public string? SourceFile { get; init; }

    /// <summary>Number of qubits.</summary>
    public int N => Lattice.N;

    /// <summary>The lattice (sites, bonds, graph distance).</summary>
    public required Lattice Lattice { get; init; }

    /// <summary>
    /// The Hamiltonian. For a driven (Floquet) model this is informational: the period-averaged
    /// generator sum over rotations of Angle / (2 Period) * P, which is the lowest-order
    /// Floquet-Magnus term of one period.
    /// </summary>
    public required Hamiltonian Hamiltonian { get; init; }

    /// <summary>Default operators to probe (at least one).</summary>
    public required IReadOnlyList<PauliString> Probes { get; init; }

    /// <summary>Declared symmetries (each verified when the model was built): "total-z", "spin-flip",
    /// "fermion-parity", "time-reversal", "reflection", "translation".</summary>
    public IReadOnlyList<string> Symmetries { get; init; } = [];

    /// <summary>The periodic drive, or null for a Hamiltonian model.</summary>
    public FloquetDrive? Drive { get; init; }

    /// <summary>Whether operator size counts qubits or Majoranas.</summary>
    public SizeMeasure SizeMeasure { get; init; } = SizeMeasure.Qubits;

    /// <summary>Parameter values after command-line overrides, in the file's order.</summary>
    public IReadOnlyDictionary<string, double> Parameters { get; init; } = new Dictionary<string, double>();

    /// <summary>Seeds of the random couplings that were drawn (in file order, no repeats).</summary>
    public IReadOnlyList<long> Seeds { get; init; } = [];

    /// <summary>
    /// Parameters that set the system size (the file's <c>size</c> key, else <c>N</c>, else the parameters
    /// the lattice's size keys are written with); the smaller members of the family change these.
    /// </summary>
    public IReadOnlyList<string> SizeParameters { get; init; } = [];

    /// <summary>Notes made while loading leniently (terms dropped because they place nothing at this size).</summary>
    public IReadOnlyList<string> LoadNotes { get; init; } = [];

    /// <summary>True when some coupling was drawn at random (and gave a nonzero term).</summary>
    public bool IsDisordered { get; init; }

    /// <summary>
    /// True for a chain or ring whose couplings are uniform: every term's translate by one site (that
    /// stays inside an open chain) has the same coefficient.
    /// </summary>
    public bool IsTranslationInvariant { get; init; }

    /// <summary>True for a driven (Floquet) model.</summary>
    public bool IsDriven => Drive is not null;

    /// <summary>Number of Majorana modes (2N) for a Majorana model, else 0.</summary>
    public int MajoranaCount => SizeMeasure == SizeMeasure.Majoranas ? 2 * N : 0;

    /// <summary>Operator size of a string in this model's measure.</summary>
    public int SizeOf(PauliString s)
    {
        ArgumentNullException.ThrowIfNull(s);
        return SizeMeasure == SizeMeasure.Majoranas ? JordanWigner.MajoranaWeight(s) : s.Weight;
    }

    /// <summary>
    /// A model built in code (no file): defaults to an open chain of H.N sites, Z on the central
    /// site as probe, no declared symmetries. Flags (disorder, translation invariance) are derived
    /// from the terms; pass <paramref name="disordered"/> for random couplings.
    /// </summary>
    public static Model Of(
        Hamiltonian hamiltonian,
        Lattice? lattice = null,
        string name = "in-code",
        IReadOnlyList<PauliString>? probes = null,
        FloquetDrive? drive = null,
        SizeMeasure sizeMeasure = SizeMeasure.Qubits,
        bool disordered = false)
    {
        ArgumentNullException.ThrowIfNull(hamiltonian);
        lattice ??= Lattice.Chain(hamiltonian.N);
        if (lattice.N != hamiltonian.N) throw new ArgumentException($"Lattice has {lattice.N} sites but the Hamiltonian acts on {hamiltonian.N} qubits.", nameof(lattice));
        probes ??= sizeMeasure == SizeMeasure.Majoranas
            ? [JordanWigner.Majorana(hamiltonian.N, 0).String]
            : [PauliString.Single(hamiltonian.N, lattice.Center, 'Z')];
        return new Model
        {
            Name = name,
            Description = "built in code",
            Lattice = lattice,
            Hamiltonian = hamiltonian,
            Probes = probes,
            Drive = drive,
            SizeMeasure = sizeMeasure,
            IsDisordered = disordered,
            IsTranslationInvariant = drive is null && !disordered && SymmetryCheck.IsTranslationInvariant(hamiltonian.Terms, lattice),
        };
    }

    public override string ToString() => $"{Name} (N={N}, {Hamiltonian.Terms.Count} terms)";
}
