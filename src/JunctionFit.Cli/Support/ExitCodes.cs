namespace JunctionFit.Cli.Support;

/// <summary>Process exit codes (documented in docs/cli.md; scripts rely on them).</summary>
public static class ExitCodes
{
    /// <summary>Every input was fitted with status ok.</summary>
    public const int Success = 0;

    /// <summary>Some inputs failed or fitted poorly (each reported), while others were processed.</summary>
    public const int SomeFailed = 1;

    /// <summary>Bad usage (unknown option, bad value), no input could be read, or the results database failed.</summary>
    public const int UsageOrInput = 2;
}
