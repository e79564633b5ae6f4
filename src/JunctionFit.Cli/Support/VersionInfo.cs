using System.Reflection;

namespace JunctionFit.Cli.Support;

/// <summary>The tool's version text for reports.</summary>
public static class VersionInfo
{
    /// <summary>For example "junctionfit 0.1.0".</summary>
    public static string Text { get; } = "junctionfit " +
        (typeof(VersionInfo).Assembly.GetCustomAttribute<AssemblyInformationalVersionAttribute>()?.InformationalVersion?.Split('+')[0] ?? "0.1.0");
}
