using OpGrowth.Sweeps;

namespace OpGrowth.Tests.Sweeps;

/// <summary>
/// A fact that runs only when a Slurm cluster answers on this machine (sbatch on the PATH and sinfo
/// showing a node that takes jobs); otherwise xunit reports it as skipped with the reason. Start one
/// with .ci/slurm/start-cluster.sh (the CI does before the tests) and stop it with stop-cluster.sh.
/// </summary>
public sealed class SlurmFactAttribute : FactAttribute
{
    private static readonly Lazy<string?> Unavailable = new(Probe);

    public SlurmFactAttribute()
    {
        if (Unavailable.Value is string why) Skip = why;
    }

    private static string? Probe()
    {
        if (SlurmArray.FindOnPath("sbatch") is null || SlurmArray.FindOnPath("sinfo") is not string sinfo)
        {
            return "no Slurm client programs on the PATH (run .ci/slurm/start-cluster.sh to install and start a one-node cluster)";
        }
        try
        {
            var (code, stdout, _) = SlurmArray.RunProcess(sinfo, ["-h", "-o", "%T"], TimeSpan.FromSeconds(15));
            if (code != 0) return "Slurm is installed but no controller answers (run .ci/slurm/start-cluster.sh)";
            bool up = stdout.Split('\n', StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries)
                .Any(s => s is "idle" or "mixed" or "allocated");   // a trailing '*' means the node does not respond
            return up ? null : $"the Slurm controller answers but no node takes jobs (sinfo: {stdout.Trim()})";
        }
        catch (Exception ex) when (ex is System.ComponentModel.Win32Exception or InvalidOperationException or IOException)
        {
            return $"sinfo could not be run ({ex.Message})";
        }
    }
}
