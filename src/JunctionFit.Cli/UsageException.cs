namespace JunctionFit.Cli;

/// <summary>A command-line value that cannot be used; printed as one line, exit code 2.</summary>
public sealed class UsageException(string message) : Exception(message)
{
    /// <summary>
    /// The library's refusal of a value the user gave with <paramref name="option"/>, in the user's words:
    /// <c>--option: reason</c>, without the exception's parameter name.
    /// </summary>
    public static UsageException ForOption(string option, ArgumentException refusal)
    {
        ArgumentNullException.ThrowIfNull(refusal);
        return new UsageException($"{option}: {CliApp.WithoutParameterName(refusal.Message)}");
    }
}
