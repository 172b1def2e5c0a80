namespace OpGrowth.Cli;

/// <summary>Process exit codes (documented in the README and in --help).</summary>
internal static class ExitCodes
{
    /// <summary>Success.</summary>
    public const int Ok = 0;

    /// <summary>Bad command-line usage (unknown option, missing argument, bad value).</summary>
    public const int Usage = 1;

    /// <summary>Invalid input file (model, plan) or inconsistent options.</summary>
    public const int InvalidInput = 2;

    /// <summary>A resource budget (memory, strings) cannot hold the requested accuracy; partial results kept.</summary>
    public const int ResourceLimit = 3;

    /// <summary>A check failed (e.g. a comparison beyond tolerance).</summary>
    public const int CheckFailed = 4;

    /// <summary>Interrupted by the user (Ctrl-C, SIGINT); finished results and checkpoints kept.</summary>
    public const int Interrupted = 130;

    /// <summary>Terminated by SIGTERM (e.g. a Slurm time limit); finished results and checkpoints kept.</summary>
    public const int Terminated = 143;

    /// <summary>Unexpected internal error (a bug: please report it).</summary>
    public const int Internal = 70;
}
