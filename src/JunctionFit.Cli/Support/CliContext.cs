namespace JunctionFit.Cli.Support;

/// <summary>Where a command writes: standard output for results, standard error for messages and progress.</summary>
/// <param name="Out">Results (tables, JSON lines, CSV).</param>
/// <param name="Error">Errors as <c>path:line: reason</c>, progress and notes.</param>
public sealed record CliContext(TextWriter Out, TextWriter Error);
