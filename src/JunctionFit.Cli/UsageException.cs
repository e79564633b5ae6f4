namespace JunctionFit.Cli;

/// <summary>A command-line value that cannot be used; printed as one line, exit code 2.</summary>
public sealed class UsageException(string message) : Exception(message);
