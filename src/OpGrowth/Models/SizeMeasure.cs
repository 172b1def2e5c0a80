namespace OpGrowth.Models;

/// <summary>How operator size is counted for a model.</summary>
public enum SizeMeasure
{
    /// <summary>Number of sites where a Pauli string is not the identity.</summary>
    Qubits,

    /// <summary>Number of Majorana operators in the monomial the string stands for (Jordan-Wigner, see <see cref="JordanWigner"/>).</summary>
    Majoranas,
}
