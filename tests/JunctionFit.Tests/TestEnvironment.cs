namespace JunctionFit.Tests;

/// <summary>
/// What the tests may assume about the machine. Under continuous integration (<c>JUNCTIONFIT_CI=1</c>, set by .ci/run) no
/// test may skip: a test that needs a program or a server that is missing fails, saying what is missing, instead of being
/// reported as skipped.
/// </summary>
public static class TestEnvironment
{
    /// <summary>The environment variable that marks a CI run.</summary>
    public const string CiVariable = "JUNCTIONFIT_CI";

    /// <summary>True when <c>JUNCTIONFIT_CI=1</c>: skipping is not allowed.</summary>
    public static bool NoSkips => Environment.GetEnvironmentVariable(CiVariable) == "1";

    /// <summary>The reason to skip, or null under CI (where the test runs and fails on the missing piece).</summary>
    /// <param name="reason">Why the test cannot run here.</param>
    /// <returns><paramref name="reason"/>, or null when <see cref="NoSkips"/>.</returns>
    public static string? SkipUnlessCi(string reason) => NoSkips ? null : reason;
}
