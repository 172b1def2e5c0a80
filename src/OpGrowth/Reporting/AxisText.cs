namespace OpGrowth.Reporting;

/// <summary>Default axis labels (with units) shared by the charts; every data record can override its own.</summary>
public static class AxisText
{
    /// <summary>Time in the units of the model file: hbar = 1, J the energy unit its couplings are written in.</summary>
    public const string Time = "time t (1/J)";

    /// <summary>Time of a Floquet model, counted in drive periods.</summary>
    public const string Periods = "time t (drive periods)";

    /// <summary>"operator size k (qubits)" or "(Majoranas)".</summary>
    public static string Size(string unit) => $"operator size k ({unit})";
}

/// <summary>
/// Units of times, rates and velocities as every output names them: for a Hamiltonian the time unit is 1/J, with J
/// the energy unit the model file's couplings are written in (hbar = 1), so rates are in J and velocities in
/// sites x J; for a periodic drive time counts periods.
/// </summary>
public sealed record TimeUnits(string Time, string Rate, string Velocity)
{
    /// <summary>A size (in <paramref name="sizeUnit"/>, e.g. "Majoranas") per unit time: the unit of dn/dt.</summary>
    public string SizePerTime(string sizeUnit) => Velocity.Replace("sites", sizeUnit, StringComparison.Ordinal);

    /// <summary>Hamiltonian models.</summary>
    public static readonly TimeUnits Hamiltonian = new("1/J", "J", "sites·J");

    /// <summary>Periodic drives.</summary>
    public static readonly TimeUnits Drive = new("periods", "1/period", "sites/period");

    /// <summary>The units of a model (driven or not).</summary>
    public static TimeUnits For(bool driven) => driven ? Drive : Hamiltonian;
}
