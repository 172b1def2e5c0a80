namespace OpGrowth.Diagnosis;

/// <summary>Why a model does (or does not) scramble: the mechanisms the battery can name.</summary>
public enum Mechanism
{
    /// <summary>No mechanism singled out.</summary>
    Undetermined,

    /// <summary>Generic scrambling: chaotic spectrum, linear Lanczos growth, saturated operator size.</summary>
    Scrambles,

    /// <summary>Quadratic (free-fermion) structure: some local operator keeps bounded Lanczos coefficients.</summary>
    FreeFermions,

    /// <summary>Interacting but integrable: Poisson levels, sqrt(n) Lanczos growth, ballistic spreading.</summary>
    InteractingIntegrable,

    /// <summary>Anderson or many-body localization: no front (or a logarithmic one) and a memory plateau.</summary>
    Localized,

    /// <summary>Frozen, glass-like dynamics: autocorrelations stay high far beyond the local time scale without a conservation law that explains it.</summary>
    Frozen,

    /// <summary>The probe overlaps conserved quantities: its autocorrelation cannot decay below the Mazur bound.</summary>
    ConservationLaws,

    /// <summary>Every term of H commutes with every other: each term (and every local conserved string) is conserved, operators stay within a neighbourhood of their support.</summary>
    Commuting,
}

/// <summary>Display names of <see cref="Mechanism"/> in the trade's words.</summary>
public static class MechanismNames
{
    /// <summary>"free fermions", "interacting integrable", ... .</summary>
    public static string Of(Mechanism m) => m switch
    {
        Mechanism.Scrambles => "scrambles",
        Mechanism.FreeFermions => "free fermions",
        Mechanism.InteractingIntegrable => "interacting integrable",
        Mechanism.Localized => "Anderson/many-body localized",
        Mechanism.Frozen => "frozen (glass-like)",
        Mechanism.ConservationLaws => "conservation laws",
        Mechanism.Commuting => "commuting terms (frozen)",
        _ => "undetermined",
    };

    /// <summary>Lower-case name of an outcome: "scrambles", "fails", "inconclusive".</summary>
    public static string Of(TestOutcome o) => o switch
    {
        TestOutcome.Scrambles => "scrambles",
        TestOutcome.Fails => "fails",
        TestOutcome.NotRun => "not run",
        _ => "inconclusive",
    };
}
