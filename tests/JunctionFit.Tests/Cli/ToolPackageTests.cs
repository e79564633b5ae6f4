using System.Diagnostics;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// The .NET tool package end to end, as a user meets it: <c>dotnet pack</c> of the CLI project into a folder,
/// <c>dotnet tool install --tool-path DIR --add-source FOLDER junctionfit</c>, then <c>junctionfit demo</c> in an empty
/// folder far from the project. Offline: the install restores from the packed folder (and the configured registry for
/// nothing else). The build goes to its own artifacts folder, so the project's bin/obj are left alone.
/// </summary>
[Collection(MachineBoundCollection.Name)]
public class ToolPackageTests
{
    [Fact]
    public void PackInstallDemo_EmptyFolder_RunsTheWholeFlowOnThePackagedData()
    {
        using var temp = new TempFolder();
        string root = RepositoryRoot();
        string packages = temp.File("packages"), tools = temp.File("tools"), work = temp.File("empty");
        Directory.CreateDirectory(work);

        var pack = Run("dotnet", root, "pack", Path.Combine(root, "src", "JunctionFit.Cli"), "-c", "Release", "-o", packages,
            "--artifacts-path", temp.File("artifacts"));
        Assert.True(pack.Code == 0, "dotnet pack failed:\n" + pack.Out + pack.Err);
        Assert.Single(Directory.GetFiles(packages, "junctionfit.*.nupkg"));

        var install = Run("dotnet", temp.Path, "tool", "install", "--tool-path", tools, "--add-source", packages, "junctionfit");
        Assert.True(install.Code == 0, "dotnet tool install failed:\n" + install.Out + install.Err);

        string shim = Path.Combine(tools, OperatingSystem.IsWindows() ? "junctionfit.exe" : "junctionfit");
        var demo = Run(shim, work, "demo");
        Assert.True(demo.Code == 0, "demo failed:\n" + demo.Err);

        // The data came from inside the installed package, not from the working folder or the project.
        Assert.False(Directory.Exists(Path.Combine(work, "sample-data")));
        Assert.Contains(Path.Combine(tools, ".store"), demo.Err, StringComparison.Ordinal);
        string outDir = Path.Combine(work, "junctionfit-demo");
        Assert.True(new FileInfo(Path.Combine(outDir, "report.html")).Length > 0);
        // sample-data/README.md: three lots × two wafers × 13 dies = 78 files, one results.csv row and one plot each.
        Assert.Equal(1 + 78, File.ReadAllLines(Path.Combine(outDir, "results.csv")).Length);
        Assert.Equal(78, Directory.GetFiles(Path.Combine(outDir, "plots"), "*.png").Length);
        Assert.NotEmpty(Directory.GetFiles(Path.Combine(outDir, "maps"), "wafer-*.png"));
        // sample-data/README.md: the planted +0.15 eV shift of KM-A02 and the +0.25 nm ellipsometry offset of KM-A03/W02.
        Assert.Contains("1 lot parameter(s) flagged", demo.Err, StringComparison.Ordinal);
        Assert.Contains("1 wafer(s) flagged", demo.Err, StringComparison.Ordinal);
    }

    private static string RepositoryRoot()
    {
        for (var dir = new DirectoryInfo(AppContext.BaseDirectory); dir is not null; dir = dir.Parent)
        {
            if (File.Exists(Path.Combine(dir.FullName, "JunctionFit.sln"))) return dir.FullName;
        }
        throw new InvalidOperationException($"no JunctionFit.sln above {AppContext.BaseDirectory}");
    }

    private static (int Code, string Out, string Err) Run(string program, string workingDirectory, params string[] args)
    {
        var info = new ProcessStartInfo(program)
        {
            WorkingDirectory = workingDirectory,
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        foreach (string a in args) info.ArgumentList.Add(a);
        // The installed shim finds the runtime through DOTNET_ROOT when dotnet is not in a standard place.
        if (Environment.GetEnvironmentVariable("DOTNET_ROOT") is null && Environment.ProcessPath is string host
            && Path.GetFileNameWithoutExtension(host).Equals("dotnet", StringComparison.OrdinalIgnoreCase))
        {
            info.Environment["DOTNET_ROOT"] = Path.GetDirectoryName(host);
        }
        info.Environment["DOTNET_CLI_TELEMETRY_OPTOUT"] = "1";
        info.Environment["DOTNET_NOLOGO"] = "1";
        using var p = Process.Start(info) ?? throw new InvalidOperationException($"{program} did not start");
        var stderr = p.StandardError.ReadToEndAsync();
        string stdout = p.StandardOutput.ReadToEnd();
        if (!p.WaitForExit(TimeSpan.FromMinutes(20)))
        {
            p.Kill(entireProcessTree: true);
            throw new InvalidOperationException($"{program} {string.Join(' ', args)} did not finish");
        }
        return (p.ExitCode, stdout, stderr.Result);
    }
}
