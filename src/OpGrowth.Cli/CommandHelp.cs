namespace OpGrowth.Cli;

/// <summary>
/// The help text the commands share: the one-line summary of each command (the top-level list) and the
/// usage examples printed at the end of every command's --help. The top-level help shows only a few
/// examples; each command shows its own.
/// </summary>
internal static class CommandHelp
{
    /// <summary>One line per command for the top-level list, in the order the list shows them.</summary>
    public static readonly IReadOnlyList<(string Name, string Summary)> Summaries =
    [
        ("run", "the whole job: model -> scrambling report (evolution, light cone, Lanczos, exact check, diagnosis)"),
        ("models", "list the shipped models"),
        ("check", "validate a model file and summarise it"),
        ("evolve", "Heisenberg evolution in the Pauli-string basis with accounted truncation"),
        ("lanczos", "Lanczos coefficients b_n, growth class, C(t) and Krylov complexity K(t)"),
        ("exact", "exact state-vector engine at small N: OTOCs, finite temperature, level statistics"),
        ("compare", "the Pauli engine against the exact engine at small N (exit 4 on disagreement)"),
        ("diagnose", "why a model does (not) scramble: the seven-test diagnosis battery"),
        ("front", "the operator front on chains of any length (matrix-product engine, budget series of bond dimensions)"),
        ("ensemble", "random circuits and Brownian counterparts at any N: size growth, light cone, t*(N)"),
        ("sweep", "t*(N) over sizes, parameters, seeds and probes; local or as a Slurm job array"),
        ("collect", "merge a sweep's results: tables, disorder averages, t*(N) fits"),
    ];

    /// <summary>Examples shown under the top-level help.</summary>
    public static readonly string[] RootExamples =
    [
        "opgrowth run                                      # the demo model: report in ./opgrowth-report/demo-tilted-chain",
        "opgrowth run my-model.toml --effort quick         # a first look at your own model",
        "opgrowth models                                   # the shipped models",
        "opgrowth run --help                               # every option of a command, with examples",
    ];

    /// <summary>Examples per command (shown at the end of that command's --help).</summary>
    public static readonly IReadOnlyDictionary<string, string[]> Examples = new Dictionary<string, string[]>
    {
        ["run"] =
        [
            "opgrowth run                                      # demo model, standard effort",
            "opgrowth run mixed-field-ising --set N=10 --effort quick --out runs/mfi",
            "opgrowth run demo/heisenberg-cluster --sweep 8,10,12   # adds t*(N) and both scaling fits",
            "opgrowth run kicked-ising --time 20               # a drive: --time counts periods",
        ],
        ["models"] =
        [
            "opgrowth models                                   # list the shipped models",
            "opgrowth models --json                            # the same list as JSON",
        ],
        ["check"] =
        [
            "opgrowth check mixed-field-ising                  # validate a shipped model and summarise it",
            "opgrowth check models/xxz.toml --set N=24 --set W=8   # override parameters from the command line",
            "opgrowth check demo/tilted-chain --json           # summary as JSON on stdout",
        ],
        ["evolve"] =
        [
            "opgrowth evolve mixed-field-ising                 # default budget (100,000 strings here), t = 10",
            "opgrowth evolve mixed-field-ising --set N=128 --probe Z_64 --time 12 --max-strings 1000000 --budgets 3",
            "opgrowth evolve kicked-ising --time 40 --memory 4GiB --out runs/kicked   # a drive: 40 periods",
            "opgrowth evolve mixed-field-ising --out runs/mfi --resume   # continue an interrupted run",
        ],
        ["lanczos"] =
        [
            "opgrowth lanczos mixed-field-ising                # default: 30 coefficients, at most 2,000,000 strings per vector",
            "opgrowth lanczos mixed-field-ising --mode infinite-chain --depth 60",
            "opgrowth lanczos xxz --mode truncated --max-strings 100000 400000 --depth 40",
        ],
        ["exact"] =
        [
            "opgrowth exact mixed-field-ising --set N=12 --probe Z_0 --times 0:6:31",
            "opgrowth exact mixed-field-ising --set N=10 --mode thermal --beta 0.2,0.5 --sites 5",
            "opgrowth exact mixed-field-ising --set N=12 --mode levels",
            "opgrowth exact heisenberg-all-to-all --set N=16 --mode tstar --samples 1   # t* by search, cost logged first",
        ],
        ["front"] =
        [
            "opgrowth front mixed-field-ising --set N=200 --probe Z_0 --time 125 --bond-dimensions 16,32,64",
            "opgrowth front demo/tilted-chain --time 10 --bond-dimensions 8,16,32",
        ],
        ["ensemble"] =
        [
            "opgrowth ensemble demo/device-brickwork          # a shipped random-circuit file",
            "opgrowth ensemble circuits/all-to-all-pairs.toml --sweep 16,64,256,1024,4096,16384",
            "opgrowth ensemble demo/tilted-chain --effort quick   # the model's Brownian counterpart",
        ],
        ["compare"] =
        [
            "opgrowth compare mixed-field-ising",
            "opgrowth compare kicked-ising --size 8 --time 10 --out runs/compare   # a drive: 10 periods",
        ],
        ["sweep"] =
        [
            "opgrowth sweep models/sweeps/demo-chains.sweep --jobs 2",
            "opgrowth sweep --model mixed-field-ising --sizes 8:24:4 --probe Z_0 --out out/ising",
            "opgrowth sweep plan.toml --slurm-script sweep.sbatch --submit --wait",
            "opgrowth sweep plan.toml --out /shared/run1 --task-index 7",
        ],
        ["collect"] =
        [
            "opgrowth collect results/demo-chains",
            "opgrowth collect /shared/run1 --no-figures",
        ],
    };

    /// <summary>The exit codes, as printed in the top-level help and documented in the README.</summary>
    public const string ExitCodeText =
        "Exit codes: 0 ok, 1 usage, 2 invalid input, 3 resource limit, 4 check failed, 70 internal error, 130 interrupted (Ctrl-C), 143 terminated (SIGTERM).";
}
