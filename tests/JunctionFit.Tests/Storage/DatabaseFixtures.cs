using System.Diagnostics;
using System.Globalization;
using JunctionFit.Storage;
using Npgsql;
using Xunit;

namespace JunctionFit.Tests.Storage;

/// <summary>
/// A fact that needs the PostgreSQL test server: skipped, saying why, when <c>JUNCTIONFIT_TEST_PG</c> is not set
/// (.ci/postgres-setup.sh starts a server and prints the variable) — except under CI (<c>JUNCTIONFIT_CI=1</c>), where it
/// runs and fails on the missing server.
/// </summary>
public sealed class PostgresFactAttribute : FactAttribute
{
    /// <summary>The environment variable with the test server's connection string.</summary>
    public const string Variable = "JUNCTIONFIT_TEST_PG";

    private const string HowTo = "Run `eval \"$(.ci/postgres-setup.sh)\"` (installs and starts a local server) and test again.";

    public PostgresFactAttribute()
    {
        if (string.IsNullOrWhiteSpace(Environment.GetEnvironmentVariable(Variable)))
        {
            Skip = TestEnvironment.SkipUnlessCi(
                $"PostgreSQL test skipped: the environment variable {Variable} is not set, so there is no test server. " + HowTo);
        }
    }

    /// <summary>The test server's connection string; fails the test, saying why, when there is none.</summary>
    public static string ConnectionString
    {
        get
        {
            string? value = Environment.GetEnvironmentVariable(Variable);
            Assert.False(string.IsNullOrWhiteSpace(value),
                $"{Variable} is not set, so there is no PostgreSQL test server, and under {TestEnvironment.CiVariable}=1 no test may skip. {HowTo}");
            return value!;
        }
    }
}

/// <summary>A temporary folder, deleted on dispose.</summary>
public sealed class TempFolder : IDisposable
{
    public TempFolder()
    {
        Path = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "junctionfit-db-" + Guid.NewGuid().ToString("N")[..12]);
        Directory.CreateDirectory(Path);
    }

    public string Path { get; }

    public string File(string name) => System.IO.Path.Combine(Path, name);

    public void Dispose()
    {
        try
        {
            Directory.Delete(Path, recursive: true);
        }
        catch (IOException)
        {
        }
    }
}

/// <summary>
/// A private schema on the PostgreSQL test server for one test: the connection string puts it first on the search path,
/// so the store's tables go there. Dropped on dispose.
/// </summary>
public sealed class PostgresSchema : IDisposable
{
    private readonly string _admin;

    public PostgresSchema()
    {
        _admin = PostgresFactAttribute.ConnectionString;
        Name = "jf_test_" + Guid.NewGuid().ToString("N")[..16];
        Exec($"CREATE SCHEMA {Name}");
        ConnectionString = new NpgsqlConnectionStringBuilder(_admin) { SearchPath = Name }.ConnectionString;
    }

    /// <summary>The schema name (letters, digits and underscores only).</summary>
    public string Name { get; }

    /// <summary>A connection string whose search path is the schema.</summary>
    public string ConnectionString { get; }

    public void Dispose()
    {
        try
        {
            Exec($"DROP SCHEMA IF EXISTS {Name} CASCADE");
        }
        catch (NpgsqlException)
        {
        }
        NpgsqlConnection.ClearAllPools();
    }

    private void Exec(string sql)
    {
        using var c = new NpgsqlConnection(_admin);
        c.Open();
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        cmd.ExecuteNonQuery();
    }
}

/// <summary>Runs the store helper (tests/JunctionFit.StoreCrashHelper) as a child process.</summary>
public static class StoreHelperProcess
{
    /// <summary>Starts the helper storing demo results <paramref name="first"/>.. into <paramref name="db"/>.</summary>
    public static Process Start(string db, int first, int count, int chunk, int pauseMs = 0)
    {
        string dll = Path.Combine(AppContext.BaseDirectory, "JunctionFit.StoreCrashHelper.dll");
        Assert.True(File.Exists(dll), $"the helper is built next to the tests: {dll}");
        var inv = CultureInfo.InvariantCulture;
        var info = new ProcessStartInfo(DotnetHost())
        {
            RedirectStandardOutput = true,
            RedirectStandardError = true,
            UseShellExecute = false,
        };
        info.ArgumentList.Add(dll);
        info.ArgumentList.Add(db);
        info.ArgumentList.Add(first.ToString(inv));
        info.ArgumentList.Add(count.ToString(inv));
        info.ArgumentList.Add(chunk.ToString(inv));
        info.ArgumentList.Add(pauseMs.ToString(inv));
        return Process.Start(info) ?? throw new InvalidOperationException("the helper did not start");
    }

    /// <summary>Runs the helper to the end and checks that it succeeded.</summary>
    public static void Run(string db, int first, int count, int chunk)
    {
        using var p = Start(db, first, count, chunk);
        var stderr = p.StandardError.ReadToEndAsync();
        string stdout = p.StandardOutput.ReadToEnd();
        Assert.True(p.WaitForExit(TimeSpan.FromMinutes(3)), "the helper finished within 3 minutes");
        Assert.True(p.ExitCode == 0, $"helper exit code {p.ExitCode}: {stderr.Result}");
        Assert.Contains("done", stdout, StringComparison.Ordinal);
    }

    private static string DotnetHost()
    {
        string? self = Environment.ProcessPath;
        if (self is not null && Path.GetFileNameWithoutExtension(self).Equals("dotnet", StringComparison.OrdinalIgnoreCase)) return self;
        string? root = Environment.GetEnvironmentVariable("DOTNET_ROOT");
        if (root is not null && File.Exists(Path.Combine(root, "dotnet"))) return Path.Combine(root, "dotnet");
        return "dotnet";
    }
}
