using System.Diagnostics;
using System.Globalization;
using System.Text;
using System.Text.RegularExpressions;
using JunctionFit.Physics;
using JunctionFit.Storage;
using JunctionFit.Tests.Storage;
using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// A batch killed with SIGKILL mid-run and run twice more holds each file exactly once, in the database and in
/// results.csv, and <c>results --db</c> reads them back — on SQLite and on the PostgreSQL test server. In the machine-bound
/// collection, so the batch is not starved by the other tests' parallel fits while the test waits for its progress lines.
/// </summary>
[Collection(MachineBoundCollection.Name)]
public class BatchDatabaseTests
{
    // The batch stores in chunks of up to 256 files (SharedWork.MaxBlock) and reports progress every tenth of the files;
    // 1200 files give several chunks and progress lines before the end.
    private const int Files = 1200;

    // 801 points a file make each fit slow enough that the batch runs for seconds and its progress lines (every tenth of the
    // files) come while it runs; with 81 points the Debug build on CI fitted all 1200 files before the first line was read.
    private const int PointsPerFile = 801;

    private static void MakeFiles(string folder, string lot)
    {
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        for (int k = 0; k < Files; k++)
        {
            double[] theta = [(1.9 + 0.0005 * k) * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, 100e-12];
            var (v, i) = IvSimulator.Simulate(model, theta, new SimulationSpec(-0.8, 0.8, PointsPerFile) { RelativeNoise = 0.01, Seed = k + 1 });
            var sb = new StringBuilder($"# lot: {lot}\n# wafer: W01\n# die: {k % 20},{k / 20}\nVoltage (V),Current (A)\n");
            for (int p = 0; p < v.Length; p++) sb.Append(v[p].ToString("R", CultureInfo.InvariantCulture)).Append(',').Append(i[p].ToString("R", CultureInfo.InvariantCulture)).Append('\n');
            string sub = Path.Combine(folder, $"part{k / 100}");
            Directory.CreateDirectory(sub);
            File.WriteAllText(Path.Combine(sub, $"die_{k:D4}.csv"), sb.ToString());
        }
    }

    /// <summary>Starts a batch and kills it (SIGKILL) mid-run, then asserts that the kill really happened mid-run: exit code
    /// 137 (128 + SIGKILL) and a partial count, at least 100 and fewer than all files. At each of the batch's progress lines
    /// it is stopped (SIGSTOP) and the database is read; it goes on (SIGCONT) until 100 files are stored, and is killed while
    /// stopped, so it cannot finish between the read and the kill (reading while it ran, the kill came too late twice on the
    /// clean-clone CI: exit 0).</summary>
    private static void KillMidRun(string inputDir, string outDir, string db, Func<long> storedCount)
    {
        string tool = Path.Combine(AppContext.BaseDirectory, "junctionfit.dll");
        var info = new ProcessStartInfo("dotnet") { RedirectStandardOutput = true, RedirectStandardError = true, UseShellExecute = false };
        foreach (var a in new[] { tool, "batch", inputDir, "--out", outDir, "--db", db, "--no-plots", "--area", "100", "--jobs", "1" }) info.ArgumentList.Add(a);
        using var process = Process.Start(info)!;
        var stderr = new System.Collections.Concurrent.ConcurrentQueue<string>();
        using var stopped = new SemaphoreSlim(0);
        // Both pipes are read on threads of their own, not by the thread pool's event readers: on the clean-clone CI the
        // pool was busy with other tests' parallel fits and no progress line reached the test before the batch ended (exit 0).
        var readErr = new Thread(() =>
        {
            while (process.StandardError.ReadLine() is { } line)
            {
                stderr.Enqueue(line);
                if (!Regex.IsMatch(line, @"batch: \d+/\d+ files")) continue;
                BatchSharedWorkTests.Signal("STOP", process.Id);
                stopped.Release();
            }
        }) { IsBackground = true };
        var readOut = new Thread(() => process.StandardOutput.ReadToEnd()) { IsBackground = true };
        readErr.Start();
        readOut.Start();
        var clock = Stopwatch.StartNew(); // a deadline for the wait, not a timed assertion
        long n = 0;
        while (!process.HasExited && clock.Elapsed < TimeSpan.FromSeconds(300))
        {
            if (!stopped.Wait(TimeSpan.FromMilliseconds(200))) continue;
            try { n = storedCount(); } catch (Exception e) when (e is ResultStoreException or IOException or InvalidOperationException or System.Data.Common.DbException) { n = 0; }
            if (n >= 100) break;
            BatchSharedWorkTests.Signal("CONT", process.Id);
        }
        Assert.False(process.HasExited, "the batch finished (or failed) before it could be killed mid-run: exit "
            + (process.HasExited ? process.ExitCode.ToString(CultureInfo.InvariantCulture) : "-") + "; " + string.Join(" | ", stderr.TakeLast(5)));
        process.Kill(entireProcessTree: true); // SIGKILL on Linux, also to a stopped process
        process.WaitForExit();
        readErr.Join();
        readOut.Join();
        Assert.Equal(137, process.ExitCode);
        long stored = storedCount();
        Assert.True(stored >= 100 && stored < Files, $"stored {stored} of {Files} at the kill (read {n} while stopped); {string.Join(" | ", stderr.TakeLast(5))}");
    }

    private static void RunTwiceMoreAndCheck(TempFolder dir, string input, string outDir, string db, string lot)
    {
        for (int run = 0; run < 2; run++)
        {
            var (code, _, err) = CliRunner.Run("batch", input, "--out", outDir, "--db", db, "--no-plots", "--area", "100");
            Assert.True(code == 0, err);
        }
        var lines = File.ReadAllLines(Path.Combine(outDir, "results.csv"));
        Assert.Equal(Files + 1, lines.Length);
        Assert.Equal(Files, lines.Skip(1).Select(l => l.Split(',')[0]).Distinct(StringComparer.Ordinal).Count());
        Assert.False(File.Exists(Path.Combine(outDir, "results.csv.partial")));
        using (var store = ResultStore.Open(db))
        {
            Assert.Equal(Files, store.Query(lot: lot).Count);
            Assert.Empty(store.CheckConsistency());
        }
        var (rc, csv, rerr) = CliRunner.Run("results", "--db", db, "--lot", lot, "--csv");
        Assert.True(rc == 0, rerr);
        Assert.Equal(Files + 1, csv.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length);
        _ = dir;
    }

    [Fact]
    public void Batch_KilledMidRunThenRunTwice_SqliteHoldsEachFileOnce()
    {
        using var dir = new TempFolder();
        MakeFiles(dir.File("in"), "KM-E01");
        string db = dir.File("lab.db");
        KillMidRun(dir.File("in"), dir.File("out"), db, () =>
        {
            if (!File.Exists(db)) return 0;
            using var s = ResultStore.Open(db);
            return s.Count();
        });
        RunTwiceMoreAndCheck(dir, dir.File("in"), dir.File("out"), db, "KM-E01");
    }

    [PostgresFact]
    public void Batch_KilledMidRunThenRunTwice_PostgresHoldsEachFileOnce()
    {
        using var dir = new TempFolder();
        string lot = "KM-P" + Guid.NewGuid().ToString("N")[..8];
        MakeFiles(dir.File("in"), lot);
        string db = PostgresFactAttribute.ConnectionString;
        KillMidRun(dir.File("in"), dir.File("out"), db, () =>
        {
            using var s = ResultStore.Open(db);
            return s.Query(lot: lot).Count;
        });
        RunTwiceMoreAndCheck(dir, dir.File("in"), dir.File("out"), db, lot);
    }
}
