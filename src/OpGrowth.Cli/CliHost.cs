using System.Runtime.InteropServices;
using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Cli;

/// <summary>How much the commands log on stderr: -q (warnings and errors), default, -v (also per-step detail).</summary>
internal enum Verbosity
{
    Quiet,
    Normal,
    Verbose,
}

/// <summary>
/// What every command shares: logging to stderr (stdout stays clean for data) at the chosen verbosity,
/// the top-level error policy (one line, no stack trace, documented exit codes) and interruption:
/// Ctrl-C (SIGINT) and SIGTERM (what Slurm sends at a time limit) both cancel the work, keep what is
/// finished and write checkpoints, then exit with 130 or 143. A second signal ends the process at once.
/// </summary>
internal static class CliHost
{
    private static readonly AsyncLocal<TextWriter?> OutWriter = new();
    private static readonly AsyncLocal<TextWriter?> ErrWriter = new();
    private static readonly AsyncLocal<Verbosity?> Level = new();

    /// <summary>Where commands write data (stdout unless a caller such as a test redirected it with <see cref="UseWriters"/>).</summary>
    public static TextWriter Out => OutWriter.Value ?? Console.Out;

    /// <summary>Where commands write error and log lines (stderr unless redirected).</summary>
    public static TextWriter Err => ErrWriter.Value ?? Console.Error;

    /// <summary>True when this process is the opgrowth executable (Program.Main), not a host that calls Program.Run (tests).</summary>
    public static bool OwnsProcess { get; set; }

    /// <summary>The verbosity chosen with -q / -v for the current call flow.</summary>
    public static Verbosity Verbosity
    {
        get => Level.Value ?? Verbosity.Normal;
        set => Level.Value = value;
    }

    /// <summary>True when stderr is a terminal of this process (not redirected, not CI, not a test writer): progress bars are drawn.</summary>
    public static bool FancyProgress => Verbosity != Verbosity.Quiet && !Console.IsErrorRedirected
        && string.IsNullOrEmpty(Environment.GetEnvironmentVariable("CI")) && ReferenceEquals(Err, Console.Error);

    /// <summary>Redirects <see cref="Out"/> and <see cref="Err"/> for the current call flow only (parallel-safe, unlike Console.SetOut).</summary>
    public static void UseWriters(TextWriter output, TextWriter error)
    {
        OutWriter.Value = output;
        ErrWriter.Value = error;
    }

    /// <summary>
    /// Creates the logger factory: plain single lines "HH:mm:ss message" on <see cref="Err"/>. <paramref name="level"/>
    /// is the level at the default verbosity; -q raises it to warnings, -v lowers it to debug (per-step detail).
    /// </summary>
    public static ILoggerFactory CreateLoggerFactory(LogLevel level = LogLevel.Information)
    {
        var effective = Verbosity switch
        {
            Verbosity.Quiet => LogLevel.Warning,
            Verbosity.Verbose => LogLevel.Debug,
            _ => level,
        };
        var writer = Err;
        return LoggerFactory.Create(b =>
        {
            b.SetMinimumLevel(effective);
            b.AddProvider(new LineLoggerProvider(writer));
        });
    }

    /// <summary>Runs a command body with the shared error policy; returns the exit code.</summary>
    public static int Run(Func<CancellationToken, int> body)
    {
        using var cts = new CancellationTokenSource();
        int signal = 0;
        void OnSignal(PosixSignalContext c)
        {
            // First signal: stop cleanly (finished results and checkpoints are written). Second: default action.
            if (Interlocked.CompareExchange(ref signal, c.Signal == PosixSignal.SIGTERM ? 15 : 2, 0) != 0) return;
            c.Cancel = true;
            cts.Cancel();
        }
        using var sigInt = PosixSignalRegistration.Create(PosixSignal.SIGINT, OnSignal);
        using var sigTerm = PosixSignalRegistration.Create(PosixSignal.SIGTERM, OnSignal);
        int Interrupted()
        {
            bool term = Volatile.Read(ref signal) == 15;
            Err.WriteLine(term
                ? "interrupted (SIGTERM): finished results and checkpoints were kept"
                : "interrupted: finished results and checkpoints were kept");
            return term ? ExitCodes.Terminated : ExitCodes.Interrupted;
        }
        try
        {
            int code = body(cts.Token);
            return cts.IsCancellationRequested && code == ExitCodes.Ok ? Interrupted() : code;
        }
        catch (InputException ex)
        {
            Err.WriteLine($"error: {OneLine(ex.Message)}");
            return ExitCodes.InvalidInput;
        }
        catch (ResourceLimitException ex)
        {
            Err.WriteLine($"resource limit: {OneLine(ex.Message)}");
            return ExitCodes.ResourceLimit;
        }
        catch (OperationCanceledException)
        {
            return Interrupted();
        }
        catch (AggregateException ex) when (ex.Flatten().InnerExceptions.All(i => i is OperationCanceledException))
        {
            return Interrupted();
        }
        catch (Exception ex) when (ex is OutOfMemoryException || (ex is AggregateException ag && ag.Flatten().InnerExceptions.Any(i => i is OutOfMemoryException)))
        {
            Err.WriteLine("resource limit: out of memory; lower the budget (--max-strings, --depth) or give a smaller --memory so the engines plan for less");
            if (Environment.GetEnvironmentVariable("OPGROWTH_DEBUG") == "1") Err.WriteLine(ex);
            return ExitCodes.ResourceLimit;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            Err.WriteLine($"error: {OneLine(ex.Message)}");
            return ExitCodes.InvalidInput;
        }
        catch (Exception ex)
        {
            Err.WriteLine($"internal error: {ex.GetType().Name}: {OneLine(ex.Message)} (this is a bug; rerun with OPGROWTH_DEBUG=1 for the stack trace)");
            if (Environment.GetEnvironmentVariable("OPGROWTH_DEBUG") == "1") Err.WriteLine(ex);
            return ExitCodes.Internal;
        }
    }

    /// <summary>A message on one line (line breaks from nested messages become "; ").</summary>
    internal static string OneLine(string text)
        => string.Join("; ", text.Split(['\r', '\n'], StringSplitOptions.RemoveEmptyEntries | StringSplitOptions.TrimEntries));

    /// <summary>Writes "HH:mm:ss message" lines ("warning: " / "error: " before the message at those levels) to one writer.</summary>
    private sealed class LineLoggerProvider(TextWriter writer) : ILoggerProvider
    {
        private readonly Lock _gate = new();

        public ILogger CreateLogger(string categoryName) => new LineLogger(this);

        public void Dispose()
        {
        }

        private void Write(LogLevel level, string message)
        {
            string prefix = level switch
            {
                LogLevel.Warning => "warning: ",
                LogLevel.Error or LogLevel.Critical => "error: ",
                _ => "",
            };
            string line = DateTime.Now.ToString("HH:mm:ss ", System.Globalization.CultureInfo.InvariantCulture) + prefix + OneLine(message);
            lock (_gate) writer.WriteLine(line);
        }

        private sealed class LineLogger(LineLoggerProvider owner) : ILogger
        {
            public IDisposable? BeginScope<TState>(TState state) where TState : notnull => null;

            public bool IsEnabled(LogLevel logLevel) => logLevel != LogLevel.None;

            public void Log<TState>(LogLevel logLevel, EventId eventId, TState state, Exception? exception, Func<TState, Exception?, string> formatter)
            {
                if (!IsEnabled(logLevel)) return;
                owner.Write(logLevel, formatter(state, exception));
            }
        }
    }
}
