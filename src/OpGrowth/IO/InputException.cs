namespace OpGrowth.IO;

/// <summary>
/// Bad user input (a model file, a sweep plan, an option value). The message is one line that
/// names the place (file:line when known), what was found and what is expected. The CLI prints
/// it without a stack trace and exits with code 2.
/// </summary>
public sealed class InputException : Exception
{
    /// <summary>File the error is in, if any.</summary>
    public string? File { get; }

    /// <summary>1-based line, or 0 when unknown.</summary>
    public int Line { get; }

    /// <summary>The problem without the location prefix.</summary>
    public string Problem { get; }

    public InputException(string? file, int line, string problem)
        : base(Format(file, line, problem))
    {
        File = file;
        Line = line;
        Problem = problem;
    }

    public InputException(string problem) : this(null, 0, problem)
    {
    }

    public InputException() : this(null, 0, "invalid input")
    {
    }

    public InputException(string message, Exception inner) : base(message, inner)
    {
        Problem = message;
    }

    private static string Format(string? file, int line, string problem)
        => file is null ? problem : line > 0 ? $"{file}:{line}: {problem}" : $"{file}: {problem}";
}

/// <summary>
/// A run could not fit in its resource budget (memory, strings, time). Carries what was finished
/// so the caller can keep partial results. The CLI exits with code 3.
/// </summary>
public sealed class ResourceLimitException : Exception
{
    public ResourceLimitException(string message) : base(message)
    {
    }

    public ResourceLimitException() : base("resource limit reached")
    {
    }

    public ResourceLimitException(string message, Exception inner) : base(message, inner)
    {
    }
}
