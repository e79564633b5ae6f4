using System.Diagnostics;
using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using JunctionFit.Physics;
using JunctionFit.Storage;
using JunctionFit.Tests.Storage;
using Microsoft.Data.Sqlite;
using Npgsql;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// Two <c>batch</c> processes on one database share a lot: worker A is killed with SIGKILL while it holds claims and
/// started again; every file ends up stored exactly once, the files A held when it died are fitted by another process, and
/// each worker (by the name in <c>fitted_by</c>) did at least a fifth of the lot. On the PostgreSQL test server and on
/// SQLite. The 3000-file version of this run is tests/JunctionFit.Benchmarks/run-shared-workers.sh.
/// </summary>
[Collection(MachineBoundCollection.Name)]
public partial class BatchSharedWorkTests
{
    private const int Files = 1500;

    [GeneratedRegex(@"(\d+) taken over")]
    private static partial Regex TakenOver();

    private static void MakeFiles(string folder, string lot)
    {
        // Invented data (sample-data/README.md's scenario): Simmons, 1.5 nm, area fixed at 100 µm² in the fit.
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        for (int k = 0; k < Files; k++)
        {
            double[] theta = [(1.9 + 0.0001 * k) * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 100e-12];
            var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-0.8, 0.8, 41) { RelativeNoise = 0.01, Seed = k + 1 });
            var sb = new StringBuilder($"# lot: {lot}\n# wafer: W{k / 400:00}\n# die: {k % 20},{k / 20 % 20}\nVoltage (V),Current (A)\n");
            for (int p = 0; p < v.Length; p++) sb.Append(v[p].ToString("R", CultureInfo.InvariantCulture)).Append(',').Append(i[p].ToString("R", CultureInfo.InvariantCulture)).Append('\n');
            string sub = Path.Combine(folder, $"part{k / 100:00}");
            Directory.CreateDirectory(sub);
            File.WriteAllText(Path.Combine(sub, $"die_{k:D4}.csv"), sb.ToString());
        }
    }

    private sealed class Worker : IDisposable
    {
        private readonly StringBuilder _err = new();

        public Worker(string input, string outDir, string db, string name)
        {
            string tool = Path.Combine(AppContext.BaseDirectory, "junctionfit.dll");
            var info = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
            foreach (var a in new[] { tool, "batch", input, "--out", outDir, "--db", db, "--no-plots", "--area", "100", "--lease", "2s", "--worker-name", name })
            {
                info.ArgumentList.Add(a);
            }
            Process = Process.Start(info)!;
            Process.ErrorDataReceived += (_, e) => { lock (_err) _err.Append(e.Data).Append('\n'); };
            Process.OutputDataReceived += (_, _) => { };
            Process.BeginErrorReadLine();
            Process.BeginOutputReadLine();
        }

        public Process Process { get; }

        public string Error
        {
            get { lock (_err) return _err.ToString(); }
        }

        public int Finish()
        {
            Assert.True(Process.WaitForExit(TimeSpan.FromMinutes(5)), "the worker finished within 5 minutes");
            Process.WaitForExit(); // drains the output readers
            return Process.ExitCode;
        }

        public void Dispose()
        {
            if (!Process.HasExited) Process.Kill(entireProcessTree: true);
            Process.Dispose();
        }
    }

    /// <summary>Rows of the lot stored so far by one worker process (0 while the database cannot be read).</summary>
    private static int StoredBy(string db, string lot, string fittedBy)
    {
        try
        {
            using var store = ResultStore.Open(db);
            return store.Query(lot: lot).Count(r => string.Equals(r.FittedBy, fittedBy, StringComparison.Ordinal));
        }
        catch (System.Data.Common.DbException)
        {
            return 0;
        }
    }

    /// <summary>Sends the signal <paramref name="name"/> (STOP, CONT, …) to process <paramref name="pid"/> with kill(1).</summary>
    internal static void Signal(string name, int pid)
    {
        using var kill = Process.Start(new ProcessStartInfo("kill", ["-" + name, pid.ToString(CultureInfo.InvariantCulture)]) { UseShellExecute = false })!;
        kill.WaitForExit();
    }

    /// <summary>Runs the scenario; <paramref name="activeClaimsOf"/> lists the files a fitted_by prefix holds claimed now.</summary>
    private static void TwoWorkersOneKilled(string db, string lot, TempFolder dir, Func<string, List<string>> activeClaimsOf)
    {
        string input = dir.File("in");
        MakeFiles(input, lot);
        List<string> frozen;
        string killedFittedBy;
        Worker b;
        using (var a = new Worker(input, dir.File("out-a"), db, "A"))
        {
            killedFittedBy = $"A@{Environment.MachineName}:{a.Process.Id}";
            var clock = Stopwatch.StartNew(); // a deadline for the polls and the 1 s before the kill, not a timed assertion
            // B starts once A has stored 5 % of the lot, so that A's share does not hang on how fast each process starts
            // (B alone can take every file in the seconds A needs to start again).
            int storedByA = 0;
            while (!a.Process.HasExited && clock.Elapsed < TimeSpan.FromSeconds(120) && (storedByA = StoredBy(db, lot, killedFittedBy)) < Files / 20)
            {
                Thread.Sleep(50);
            }
            Assert.True(storedByA >= Files / 20, $"worker A stored {storedByA} of {Files} before B started: " + a.Error);
            b = new Worker(input, dir.File("out-b"), db, "B");
            while (clock.Elapsed < TimeSpan.FromSeconds(1)) Thread.Sleep(20);
            // The kill must find A holding claims. A is stopped (SIGSTOP) while its claims are read, so they cannot change
            // between the read and the SIGKILL; when it holds none (between two chunks) it goes on (SIGCONT) and is tried again.
            frozen = [];
            while (!a.Process.HasExited && clock.Elapsed < TimeSpan.FromSeconds(120))
            {
                Signal("STOP", a.Process.Id);
                try { frozen = activeClaimsOf(killedFittedBy); } catch (System.Data.Common.DbException) { frozen = []; }
                if (frozen.Count > 0) break;
                Signal("CONT", a.Process.Id);
                Thread.Sleep(5);
            }
            Assert.False(a.Process.HasExited, "worker A was still running when it was to be killed: " + a.Error);
            a.Process.Kill(entireProcessTree: true); // SIGKILL on Linux
            a.Process.WaitForExit();
            Assert.Equal(frozen, activeClaimsOf(killedFittedBy)); // what the dead worker held: taken over later
        }
        using var bWorker = b;
        Assert.NotEmpty(frozen);
        using var a2 = new Worker(input, dir.File("out-a"), db, "A");
        Assert.True(a2.Finish() == 0, a2.Error);
        Assert.True(b.Finish() == 0, b.Error);

        using var store = ResultStore.Open(db);
        var rows = store.Query(lot: lot);
        Assert.Equal(Files, rows.Count); // every file stored …
        Assert.Equal(Files, rows.Select(r => r.Result.SourcePath).Distinct(StringComparer.Ordinal).Count()); // … exactly once
        Assert.Empty(store.CheckConsistency());
        int byA = rows.Count(r => r.FittedBy!.StartsWith("A@", StringComparison.Ordinal));
        int byB = rows.Count(r => r.FittedBy!.StartsWith("B@", StringComparison.Ordinal));
        Assert.Equal(Files, byA + byB);
        // Both workers did real shares of the work. The share depends on timing (how fast fits are against the kill at 1 s),
        // so the suite asks for 5 % each; the 20 % criterion of the issue is measured by run-shared-workers.sh on 3000 files.
        Assert.True(byA >= Files / 20, $"worker A (both runs) fitted {byA} of {Files}");
        Assert.True(byB >= Files / 20, $"worker B fitted {byB} of {Files}");
        Assert.All(rows, r => Assert.NotNull(r.FittedAt));
        // The files the killed worker held were fitted by another process, after their lease lapsed.
        var byPath = rows.ToDictionary(r => r.Result.SourcePath, StringComparer.Ordinal);
        Assert.All(frozen, f => Assert.NotEqual(killedFittedBy, byPath[f].FittedBy));
        int takenOver = TakenOver().Matches(a2.Error + b.Error).Sum(m => int.Parse(m.Groups[1].Value, CultureInfo.InvariantCulture));
        Assert.Equal(frozen.Count, takenOver);
        Assert.Empty(activeClaimsOf("")); // no claim left open

        // Each worker's results.csv lists the whole lot once, in input order, and results --csv adds fitted_by, fitted_at.
        string[] a2Lines = File.ReadAllLines(dir.File("out-a/results.csv"));
        string[] bLines = File.ReadAllLines(dir.File("out-b/results.csv"));
        Assert.Equal(Files + 1, a2Lines.Length);
        Assert.Equal(a2Lines.Select(l => l.Split(',')[0]), bLines.Select(l => l.Split(',')[0]));
        Assert.Equal(Files, a2Lines.Skip(1).Select(l => l.Split(',')[0]).Distinct(StringComparer.Ordinal).Count());
        var (code, csv, err) = CliRunner.Run("results", "--db", db, "--lot", lot, "--csv");
        Assert.True(code == 0, err);
        var csvLines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.EndsWith(",error,fitted_by,fitted_at,option_set", csvLines[0], StringComparison.Ordinal);
        Assert.Equal(byB, csvLines.Count(l => l.Contains(",B@", StringComparison.Ordinal)));
    }

    [Theory]
    [InlineData("--lease", "0.5s", "outside 1 s to 1 h")]
    [InlineData("--lease", "2 days", "is not a duration")]
    [InlineData("--lease", "2h", "outside 1 s to 1 h")]
    [InlineData("--worker-name", "node 1", "has ' '")]
    public void Batch_BadLeaseOrWorkerName_ExitCode2WithMessage(string option, string value, string expected)
    {
        using var dir = new TempFolder();
        Directory.CreateDirectory(dir.File("in"));
        var (code, _, err) = CliRunner.Run("batch", dir.File("in"), "--out", dir.File("out"), option, value);
        Assert.Equal(2, code);
        Assert.Contains(option + ":", err, StringComparison.Ordinal);
        Assert.Contains(expected, err, StringComparison.Ordinal);
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal);
    }

    [Theory]
    [InlineData("30s", 30.0)]
    [InlineData("2m", 120.0)]
    [InlineData("1500ms", 1.5)]
    [InlineData("45", 45.0)]
    [InlineData("1h", 3600.0)]
    public void ParseLease_Units_Seconds(string text, double seconds)
        => Assert.Equal(TimeSpan.FromSeconds(seconds), JunctionFit.Cli.Commands.BatchCommand.ParseLease(text));

    [Fact]
    public void Batch_OneWorkerNamed_FittedByInResultsCsvExportAndNoClaimLeftOpen()
    {
        using var dir = new TempFolder();
        string input = dir.File("in");
        Directory.CreateDirectory(input);
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        for (int k = 0; k < 5; k++)
        {
            double[] theta = [1.9 * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 100e-12];
            var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-0.8, 0.8, 41) { RelativeNoise = 0.01, Seed = k + 1 });
            File.WriteAllText(Path.Combine(input, $"die_{k}.csv"),
                "Voltage (V),Current (A)\n" + string.Concat(v.Select((x, p) => string.Create(CultureInfo.InvariantCulture, $"{x:R},{i[p]:R}\n"))));
        }
        string db = dir.File("lab.db");
        var before = DateTimeOffset.UtcNow;
        var (code, _, err) = CliRunner.Run("batch", input, "--out", dir.File("out"), "--db", db, "--no-plots", "--area", "100", "--worker-name", "node-1");
        Assert.True(code == 0, err);
        Assert.DoesNotContain("taken from other workers", err, StringComparison.Ordinal); // one worker: the usual messages only
        using (var store = ResultStore.Open(db))
        {
            var rows = store.Query();
            Assert.Equal(5, rows.Count);
            Assert.All(rows, r => Assert.Equal($"node-1@{Environment.MachineName}:{Environment.ProcessId}", r.FittedBy));
            Assert.All(rows, r => Assert.InRange(r.FittedAt!.Value, before.AddSeconds(-1), r.StoredUtc!.Value.AddSeconds(1)));
            var claims = store.Claims(rows.Select(r => r.Key));
            Assert.Equal(5, claims.Count);
            Assert.All(claims.Values, c => Assert.Equal(ClaimState.Done, c.State));
        }
        var (rc, csv, rerr) = CliRunner.Run("results", "--db", db, "--csv");
        Assert.True(rc == 0, rerr);
        var lines = csv.Split('\n', StringSplitOptions.RemoveEmptyEntries);
        Assert.EndsWith(",fitted_by,fitted_at,option_set", lines[0], StringComparison.Ordinal);
        Assert.All(lines.Skip(1), l => Assert.Contains($",node-1@{Environment.MachineName}:{Environment.ProcessId},", l, StringComparison.Ordinal));
        // The batch's own results.csv keeps exactly its columns.
        Assert.EndsWith(",warnings,error,option_set,plot", File.ReadLines(dir.File("out/results.csv")).First(), StringComparison.Ordinal);
    }

    [PostgresFact]
    public void Batch_TwoWorkersOneKilledAndRestarted_PostgresStoresEachFileOnce()
    {
        using var dir = new TempFolder();
        using var schema = new PostgresSchema();
        TwoWorkersOneKilled(schema.ConnectionString, "SW-P01", dir, prefix =>
        {
            try
            {
                using var c = new NpgsqlConnection(schema.ConnectionString);
                c.Open();
                using var cmd = c.CreateCommand();
                cmd.CommandText = "SELECT file_path FROM work_claim WHERE state = 'claimed' AND claimed_by LIKE @p";
                cmd.Parameters.AddWithValue("p", prefix + "%");
                using var r = cmd.ExecuteReader();
                var paths = new List<string>();
                while (r.Read()) paths.Add(r.GetString(0));
                return paths;
            }
            catch (PostgresException e) when (e.SqlState == "42P01")
            {
                return []; // the table does not exist yet
            }
        });
    }

    [Fact]
    public void Batch_TwoWorkersOneKilledAndRestarted_SqliteStoresEachFileOnce()
    {
        using var dir = new TempFolder();
        string db = dir.File("lab.db");
        TwoWorkersOneKilled(db, "SW-S01", dir, prefix =>
        {
            if (!File.Exists(db)) return [];
            try
            {
                using var c = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = db, Mode = SqliteOpenMode.ReadOnly, Pooling = false }.ConnectionString);
                c.Open();
                using var cmd = c.CreateCommand();
                cmd.CommandText = "SELECT file_path FROM work_claim WHERE state = 'claimed' AND claimed_by LIKE $p";
                cmd.Parameters.AddWithValue("$p", prefix + "%");
                using var r = cmd.ExecuteReader();
                var paths = new List<string>();
                while (r.Read()) paths.Add(r.GetString(0));
                return paths;
            }
            catch (SqliteException)
            {
                return []; // not created or not migrated yet, or busy
            }
        });
    }
}
