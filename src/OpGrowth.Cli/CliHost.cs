using Microsoft.Extensions.Logging;
using OpGrowth.IO;

namespace OpGrowth.Cli;

/// <summary>
/// What every command shares: logging to stderr (stdout stays clean for data), the top-level
/// error policy (one line, no stack trace, documented exit codes) and Ctrl-C cancellation.
/// </summary>
internal static class CliHost
{
    private static readonly AsyncLocal<TextWriter?> OutWriter = new();
    private static readonly AsyncLocal<TextWriter?> ErrWriter = new();

    /// <summary>Where commands write data (stdout unless a caller such as a test redirected it with <see cref="UseWriters"/>).</summary>
    public static TextWriter Out => OutWriter.Value ?? Console.Out;

    /// <summary>Where commands write error lines (stderr unless redirected).</summary>
    public static TextWriter Err => ErrWriter.Value ?? Console.Error;

    /// <summary>Redirects <see cref="Out"/> and <see cref="Err"/> for the current call flow only (parallel-safe, unlike Console.SetOut).</summary>
    public static void UseWriters(TextWriter output, TextWriter error)
    {
        OutWriter.Value = output;
        ErrWriter.Value = error;
    }

    /// <summary>Creates the logger factory: console logger on stderr, plain single lines.</summary>
    public static ILoggerFactory CreateLoggerFactory(LogLevel level)
        => LoggerFactory.Create(b =>
        {
            b.SetMinimumLevel(level);
            b.AddSimpleConsole(o =>
            {
                o.SingleLine = true;
                o.TimestampFormat = "HH:mm:ss ";
                o.ColorBehavior = Microsoft.Extensions.Logging.Console.LoggerColorBehavior.Disabled;
            });
            b.AddConsole(o => o.LogToStandardErrorThreshold = LogLevel.Trace);
        });

    /// <summary>Runs a command body with the shared error policy; returns the exit code.</summary>
    public static int Run(Func<CancellationToken, int> body)
    {
        using var cts = new CancellationTokenSource();
        ConsoleCancelEventHandler onCancel = (_, e) =>
        {
            e.Cancel = true;
            cts.Cancel();
        };
        Console.CancelKeyPress += onCancel;
        try
        {
            return body(cts.Token);
        }
        catch (InputException ex)
        {
            Err.WriteLine($"error: {ex.Message}");
            return ExitCodes.InvalidInput;
        }
        catch (ResourceLimitException ex)
        {
            Err.WriteLine($"resource limit: {ex.Message}");
            return ExitCodes.ResourceLimit;
        }
        catch (OperationCanceledException)
        {
            Err.WriteLine("interrupted: finished results were kept");
            return ExitCodes.Interrupted;
        }
        catch (OutOfMemoryException ex)
        {
            Err.WriteLine($"resource limit: out of memory ({ex.Message}); lower the budget with --memory");
            return ExitCodes.ResourceLimit;
        }
        catch (Exception ex) when (ex is IOException or UnauthorizedAccessException)
        {
            Err.WriteLine($"error: {ex.Message}");
            return ExitCodes.InvalidInput;
        }
        catch (Exception ex)
        {
            Err.WriteLine($"internal error: {ex.GetType().Name}: {ex.Message} (this is a bug; rerun with OPGROWTH_DEBUG=1 for the stack trace)");
            if (Environment.GetEnvironmentVariable("OPGROWTH_DEBUG") == "1") Err.WriteLine(ex);
            return ExitCodes.Internal;
        }
        finally
        {
            Console.CancelKeyPress -= onCancel;
        }
    }
}
