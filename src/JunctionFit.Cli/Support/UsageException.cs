namespace JunctionFit.Cli.Support;

/// <summary>A command-line value that cannot be used; printed as one line, exit code 2.</summary>
public sealed class UsageException(string message) : Exception(message)
{
    /// <summary>
    /// The library's refusal of a value the user gave with <paramref name="option"/>, in the user's words:
    /// <c>--option: value reason</c> (the value when the refusal carries it), without the exception's parameter name.
    /// </summary>
    public static UsageException ForOption(string option, ArgumentException refusal)
    {
        ArgumentNullException.ThrowIfNull(refusal);
        string reason = WithoutParameterName(refusal.Message);
        return new UsageException(refusal is ArgumentOutOfRangeException { ActualValue: { } value }
            ? string.Create(System.Globalization.CultureInfo.InvariantCulture, $"{option}: {value} {reason}")
            : $"{option}: {reason}");
    }

    /// <summary>An exception message without .NET's " (Parameter 'x')" suffix.</summary>
    public static string WithoutParameterName(string message)
    {
        ArgumentNullException.ThrowIfNull(message);
        int at = message.LastIndexOf(" (Parameter '", StringComparison.Ordinal);
        return at > 0 ? message[..at] : message;
    }
}
