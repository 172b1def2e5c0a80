namespace OpGrowth.Reporting;

/// <summary>Default axis labels (with units) shared by the charts; every data record can override its own.</summary>
public static class AxisText
{
    /// <summary>Time in the units of the model file (hbar = 1: the inverse of its energy unit).</summary>
    public const string Time = "time t (1/energy)";

    /// <summary>Time of a Floquet model, counted in drive periods.</summary>
    public const string Periods = "time t (drive periods)";

    /// <summary>"operator size k (qubits)" or "(Majoranas)".</summary>
    public static string Size(string unit) => $"operator size k ({unit})";
}
