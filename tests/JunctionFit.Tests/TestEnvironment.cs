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

    /// <summary>
    /// The first executable file named <paramref name="program"/> in a folder of <c>PATH</c>, as the shell's <c>command -v</c>
    /// finds it (.ci/run looks for the browser the same way), or null.
    /// </summary>
    /// <param name="program">A program name without a folder, such as <c>chromium</c>.</param>
    /// <returns>The full path, or null when no folder of <c>PATH</c> holds it.</returns>
    public static string? FindOnPath(string program)
    {
        string path = Environment.GetEnvironmentVariable("PATH") ?? "";
        foreach (string dir in path.Split(Path.PathSeparator, StringSplitOptions.RemoveEmptyEntries))
        {
            string candidate = Path.Combine(dir, program);
            if (File.Exists(candidate) && (OperatingSystem.IsWindows() || (File.GetUnixFileMode(candidate) & (UnixFileMode.UserExecute | UnixFileMode.GroupExecute | UnixFileMode.OtherExecute)) != 0))
            {
                return candidate;
            }
        }
        return null;
    }
}
