using JunctionFit.Reporting;
using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.StoreCrashHelper;
using Xunit;

namespace JunctionFit.Tests.Storage;

/// <summary>
/// Behaviour every results store must show, written once and run against SQLite (DatabaseSqliteTests) and PostgreSQL
/// (DatabasePostgresTests). Each check opens stores through <c>open</c>, which names one empty database.
/// </summary>
internal static class DatabaseStoreContract
{
    public static void StoreThenQuery_RoundTripsEveryField(Func<IResultStore> open)
    {
        var run = RunInfo.StartNew("9.9.9-test");
        var rows = Enumerable.Range(0, 120).Select(i => DemoResults.Row(i, run)).ToList();
        using (var store = open())
        {
            Assert.Equal(120, store.StoreBatch(rows));
        }
        using var reopened = open();
        var back = reopened.Query();
        Assert.Equal(120, back.Count);
        var byKey = back.ToDictionary(r => r.Key);
        foreach (var row in rows)
        {
            var got = byKey[row.Key];
            // The JSON line covers every field of the result (parameters, quality, correlation, warnings, die, lot).
            Assert.Equal(FitJsonFormatter.Format(row.Result), FitJsonFormatter.Format(got.Result));
            Assert.Equal(row.Result.Parameters.ToArray(), got.Result.Parameters.ToArray());
            Assert.Equal(row.OptionsText, got.OptionsText);
            Assert.Equal(run.RunId, got.Run.RunId);
            Assert.Equal(run.ToolVersion, got.Run.ToolVersion);
            Assert.Equal(run.Host, got.Run.Host);
            Assert.True(Math.Abs((run.StartedUtc - got.Run.StartedUtc).TotalMilliseconds) < 1, "start time kept to the millisecond");
            Assert.NotNull(got.StoredUtc);
        }
        Assert.Empty(reopened.CheckConsistency());
    }

    public static void StoreSameKeyAgain_ReplaceOrKeep(Func<IResultStore> open)
    {
        using var store = open();
        var first = RunInfo.StartNew("1.0");
        var second = RunInfo.StartNew("2.0");
        store.StoreBatch([DemoResults.Row(5, first), DemoResults.Row(6, first)]);

        Assert.Equal(0, store.StoreBatch([DemoResults.Row(5, second, variant: 1)], replaceExisting: false));
        Assert.Equal(2.005, Phi(store, 5), 12);

        Assert.Equal(1, store.StoreBatch([DemoResults.Row(5, second, variant: 1)]));
        Assert.Equal(2.105, Phi(store, 5), 12);
        Assert.Equal(2, store.Count());
        var five = store.Query().Single(r => r.Key == DemoResults.Key(5));
        Assert.Equal("2.0", five.Run.ToolVersion);
        Assert.Empty(store.CheckConsistency());
    }

    public static void SameKeyTwiceInOneChunk_LastWins(Func<IResultStore> open)
    {
        using var store = open();
        var run = RunInfo.StartNew("1.0");
        Assert.Equal(1, store.StoreBatch([DemoResults.Row(7, run), DemoResults.Row(7, run, variant: 2)]));
        Assert.Equal(1, store.Count());
        Assert.Equal(2.207, Phi(store, 7), 12);
    }

    public static void ExistingKeys_ReturnsStoredSubset(Func<IResultStore> open)
    {
        using var store = open();
        var run = RunInfo.StartNew("1.0");
        store.StoreBatch(Enumerable.Range(0, 500).Where(i => i % 2 == 0).Select(i => DemoResults.Row(i, run)).ToList());
        var candidates = Enumerable.Range(0, 500).Select(DemoResults.Key).ToList();
        var otherOptions = new ResultKey(DemoResults.FileSha256(0), "simmons", ResultIdentity.OptionsHash("something else"));
        var otherModel = new ResultKey(DemoResults.FileSha256(0), "bdr", DemoResults.Key(0).OptionsHash);
        candidates.Add(otherOptions);
        candidates.Add(otherModel);

        var existing = store.ExistingKeys(candidates);

        Assert.Equal(250, existing.Count);
        Assert.All(existing, k => Assert.Contains(k, candidates));
        Assert.DoesNotContain(otherOptions, existing);
        Assert.DoesNotContain(otherModel, existing);
        Assert.True(store.Contains(DemoResults.Key(4)));
        Assert.False(store.Contains(DemoResults.Key(5)));
        Assert.False(store.Contains(otherOptions));
        Assert.Empty(store.ExistingKeys([]));
    }

    public static void Query_Filters_AndOrdersByLotWaferFile(Func<IResultStore> open)
    {
        using var store = open();
        var run = RunInfo.StartNew("1.0");
        var other = RunInfo.StartNew("1.0") with { RunId = "other-run" };
        var rows = new List<StoredResult>();
        for (int i = 0; i < 30; i++)
        {
            var fit = DemoResults.Fit(i);
            fit = fit with { Lot = i % 3 == 0 ? "KM-A02" : i % 3 == 1 ? "KM-A01" : null, Wafer = i % 2 == 0 ? "W02" : "W01" };
            rows.Add(StoredResult.Create(fit, DemoResults.FileSha256(i), DemoResults.Options, i < 10 ? other : run));
        }
        store.StoreBatch(rows);

        var a01 = store.Query(lot: "KM-A01");
        Assert.Equal(10, a01.Count);
        Assert.All(a01, r => Assert.Equal("KM-A01", r.Result.Lot));
        Assert.Equal(5, store.Query(lot: "KM-A01", wafer: "W01").Count);
        Assert.Equal(10, store.Query(runId: "other-run").Count);
        Assert.Empty(store.Query(model: "bdr"));
        Assert.Empty(store.Query(lot: "KM-Z99"));

        var all = store.Query();
        var expected = all
            .OrderBy(r => r.Result.Lot ?? "", StringComparer.Ordinal)
            .ThenBy(r => r.Result.Wafer ?? "", StringComparer.Ordinal)
            .ThenBy(r => r.Result.SourcePath, StringComparer.Ordinal)
            .Select(r => r.Key).ToList();
        Assert.Equal(expected, all.Select(r => r.Key).ToList());
    }

    public static void Reopen_MigrationsRunOnce(Func<IResultStore> open)
    {
        using (var store = open())
        {
            Assert.Equal(ResultStore.CurrentSchemaVersion, store.SchemaVersion);
            store.StoreBatch([DemoResults.Row(1, RunInfo.StartNew("1.0"))]);
        }
        for (int k = 0; k < 3; k++)
        {
            using var again = open();
            Assert.Equal(ResultStore.CurrentSchemaVersion, again.SchemaVersion);
            Assert.Equal(1, again.Count());
            Assert.Empty(again.CheckConsistency());
        }
    }

    public static void OpenFromManyThreadsAtOnce_AllSucceed(Func<IResultStore> open)
    {
        using var go = new Barrier(6);
        var versions = new int[6];
        var threads = Enumerable.Range(0, 6).Select(t => new Thread(() =>
        {
            go.SignalAndWait();
            using var s = open();
            versions[t] = s.SchemaVersion;
        })).ToList();
        threads.ForEach(t => t.Start());
        threads.ForEach(t => t.Join());
        Assert.All(versions, v => Assert.Equal(ResultStore.CurrentSchemaVersion, v));
        using var store = open();
        Assert.Empty(store.CheckConsistency());
    }

    public static void TwoThreadsWritingOverlappingChunks_LoseNoRow(Func<IResultStore> open)
    {
        using (var init = open())
        {
        }
        using var go = new Barrier(2);
        var errors = new List<Exception>();
        void Writer(int first, int count)
        {
            try
            {
                using var s = open();
                var run = RunInfo.StartNew("1.0");
                var w = new ChunkedResultWriter(s, chunkSize: 25);
                go.SignalAndWait();
                for (int i = first; i < first + count; i++) w.Add(DemoResults.Row(i, run));
                w.Flush();
            }
            catch (Exception e)
            {
                lock (errors) errors.Add(e);
            }
        }
        var a = new Thread(() => Writer(0, 600));
        var b = new Thread(() => Writer(300, 600));
        a.Start();
        b.Start();
        a.Join();
        b.Join();
        Assert.Empty(errors);
        using var store = open();
        Assert.Equal(900, store.Count());
        Assert.Equal(900, store.Query().Select(r => r.Key).Distinct().Count());
        Assert.Empty(store.CheckConsistency());
    }

    public static void AwkwardTextAndSpecialNumbers_StoredAsGiven(Func<IResultStore> open)
    {
        string path = "KM-A01/W01/die 'x'; DROP TABLE fit_result; --\"φ\".csv";
        var fit = DemoResults.Fit(3) with
        {
            SourcePath = path,
            Lot = "KM-A01'); DELETE FROM fit_parameter; --",
            Parameters =
            [
                new ParameterEstimate("barrier_height_eV", "φ", "eV", 2.0, 0.1, 1.8, double.PositiveInfinity, false),
                new ParameterEstimate("thickness_nm", "d", "nm", double.NaN, null, double.NegativeInfinity, null, false),
            ],
            Warnings = ["line one\nline two", ""],
        };
        using (var store = open())
        {
            store.StoreBatch([StoredResult.Create(fit, DemoResults.FileSha256(3), DemoResults.Options, RunInfo.StartNew("1.0"))]);
        }
        using var again = open();
        var got = Assert.Single(again.Query());
        Assert.Equal(path, got.Result.SourcePath);
        Assert.Equal(fit.Lot, got.Result.Lot);
        Assert.Equal(fit.Warnings.ToArray(), got.Result.Warnings.ToArray());
        var phi = got.Result.Find("barrier_height_eV")!;
        Assert.Equal(double.PositiveInfinity, phi.Upper95);
        var d = got.Result.Find("thickness_nm")!;
        Assert.True(double.IsNaN(d.Value), "NaN is stored as NULL and read back as NaN");
        Assert.Equal(double.NegativeInfinity, d.Lower95);
        Assert.Null(d.StandardError);
        Assert.Empty(again.CheckConsistency());
    }

    /// <summary>
    /// Kills a writer mid-run (SIGKILL) twice, checking the database after each kill, then lets a third run finish: the
    /// database is consistent after every kill, holds whole chunks only, and in the end holds every key exactly once.
    /// </summary>
    public static void KilledWriter_LeavesWholeChunks_SecondRunCompletes(string db, Func<IResultStore> open, int total, int chunk)
    {
        using (var init = open())
        {
        }
        var random = new Random(20250314);
        for (int round = 0; round < 2; round++)
        {
            string diagnosis;
            using (var p = StoreHelperProcess.Start(db, 0, total, chunk, pauseMs: 25))
            {
                var clock = System.Diagnostics.Stopwatch.StartNew();
                var timeline = new System.Text.StringBuilder();
                int committed = 0;
                string? line;
                while ((line = p.StandardOutput.ReadLine()) is not null)
                {
                    timeline.Append(clock.ElapsedMilliseconds).Append(':').Append(line).Append(' ');
                    if (line.StartsWith("stored ", StringComparison.Ordinal) && ++committed >= 3) break;
                }
                if (committed < 3) Assert.Fail("the helper stopped before committing 3 chunks: " + p.StandardError.ReadToEnd());
                Thread.Sleep(random.Next(0, 40)); // land in a pause or inside a transaction
                p.Kill(); // SIGKILL on Unix (kill -9): no clean-up code runs in the helper
                Assert.True(p.WaitForExit(TimeSpan.FromSeconds(30)), "the helper ended after the kill");
                diagnosis = $"round {round + 1}: killed after {clock.ElapsedMilliseconds} ms, exit code {p.ExitCode}, {timeline}";
                Assert.True(p.ExitCode == 128 + 9, "the helper died of SIGKILL: " + diagnosis);
            }

            using var store = open();
            Assert.Empty(store.CheckConsistency());
            long n = store.Count();
            Assert.True(n >= 3 * chunk && n < total, $"after kill {round + 1} a part of the set is stored: {n} of {total} ({diagnosis})");
            Assert.True(n % chunk == 0, $"whole chunks only: {n} is not a multiple of {chunk}");
            foreach (var row in store.Query())
            {
                Assert.Equal(DemoResults.Fit(IndexOf(row)).Parameters.Length, row.Result.Parameters.Length);
            }
        }

        StoreHelperProcess.Run(db, 0, total, chunk);

        using var done = open();
        Assert.Empty(done.CheckConsistency());
        Assert.Equal(total, done.Count());
        var rows = done.Query();
        Assert.Equal(total, rows.Select(r => r.Key).Distinct().Count());
        foreach (var row in rows)
        {
            var expected = DemoResults.Fit(IndexOf(row));
            Assert.Equal(FitJsonFormatter.Format(expected), FitJsonFormatter.Format(row.Result));
        }
    }

    /// <summary>Two processes storing overlapping ranges at once: every key exactly once.</summary>
    public static void TwoProcessesWritingAtOnce_LoseNoRow(string db, Func<IResultStore> open)
    {
        using (var init = open())
        {
        }
        using var a = StoreHelperProcess.Start(db, 0, 1500, 40);
        using var b = StoreHelperProcess.Start(db, 700, 1500, 40);
        var outA = a.StandardOutput.ReadToEndAsync();
        var outB = b.StandardOutput.ReadToEndAsync();
        var errA = a.StandardError.ReadToEndAsync();
        var errB = b.StandardError.ReadToEndAsync();
        Assert.True(a.WaitForExit(TimeSpan.FromMinutes(3)) && b.WaitForExit(TimeSpan.FromMinutes(3)), "both writers finished");
        Assert.True(a.ExitCode == 0, "writer A: " + errA.Result);
        Assert.True(b.ExitCode == 0, "writer B: " + errB.Result);
        Assert.Contains("done", outA.Result, StringComparison.Ordinal);
        Assert.Contains("done", outB.Result, StringComparison.Ordinal);

        using var store = open();
        Assert.Empty(store.CheckConsistency());
        Assert.Equal(2200, store.Count());
        Assert.Equal(2200, store.Query().Select(r => r.Key).Distinct().Count());
    }

    private static readonly Lazy<Dictionary<string, int>> DemoIndex =
        new(() => Enumerable.Range(0, 7000).ToDictionary(DemoResults.FileSha256, i => i, StringComparer.Ordinal));

    private static int IndexOf(StoredResult row) => DemoIndex.Value[row.Key.FileSha256];

    private static double Phi(IResultStore store, int i)
        => store.Query().Single(r => r.Key == DemoResults.Key(i)).Result.Find("barrier_height_eV")!.Value;
    private static WorkerIdentity Worker(string name) => WorkerIdentity.Current(name);

    private static List<ClaimRequest> Requests(IEnumerable<int> dies)
        => [.. dies.Select(i => new ClaimRequest(DemoResults.Key(i), DemoResults.Fit(i).SourcePath))];

    public static void TwoClaimers_NeverHoldTheSameFile_AndTogetherCoverAll(Func<IResultStore> open)
    {
        const int Dies = 640; // 40 chunks of 16
        using (open())
        {
        }
        var workers = new[] { Worker("a"), Worker("b") };
        var got = new[] { new List<ResultKey>(), new List<ResultKey>() };
        using var start = new Barrier(2);
        var threads = Enumerable.Range(0, 2).Select(w => new Thread(() =>
        {
            using var store = open();
            start.SignalAndWait();
            // Both walk the same list in the same order in chunks of 16, as batch workers do.
            for (int first = 0; first < Dies; first += 16)
            {
                var granted = store.Claim(Requests(Enumerable.Range(first, 16)), workers[w], TimeSpan.FromMinutes(5));
                got[w].AddRange(granted.Keys);
                Assert.All(granted.Values, from => Assert.Null(from)); // long leases: nothing is taken over
            }
        })).ToList();
        threads.ForEach(t => t.Start());
        threads.ForEach(t => t.Join());
        Assert.Empty(got[0].Intersect(got[1]));
        Assert.Equal(Dies, got[0].Count + got[1].Count);
        Assert.Equal(Dies, got[0].Union(got[1]).Count());
        using var check = open();
        var claims = check.Claims(Enumerable.Range(0, Dies).Select(DemoResults.Key));
        Assert.Equal(Dies, claims.Count);
        Assert.All(got[0], k => Assert.Equal(workers[0].ClaimedBy, claims[k].ClaimedBy));
        Assert.All(got[1], k => Assert.Equal(workers[1].ClaimedBy, claims[k].ClaimedBy));
        Assert.All(claims.Values, c => Assert.Equal(ClaimState.Claimed, c.State));
    }

    public static void Claim_HeldByOther_NotGrantedUntilLeaseExpires_ThenTakenOver(Func<IResultStore> open)
    {
        using var store = open();
        var a = Worker("a");
        var b = Worker("b");
        var run = RunInfo.StartNew("1.0");
        Assert.Equal(3, store.Claim(Requests([1, 2, 3]), a, TimeSpan.FromSeconds(1)).Count);
        Assert.Equal(3, store.Claim(Requests([1, 2, 3]), a, TimeSpan.FromSeconds(1)).Count); // its own claims again: still granted
        Assert.Empty(store.Claim(Requests([1, 2, 3]), b, TimeSpan.FromMinutes(1)));
        Thread.Sleep(TimeSpan.FromSeconds(1.5)); // past a's lease
        var taken = store.Claim(Requests([1, 2, 3, 4]), b, TimeSpan.FromMinutes(1));
        Assert.Equal(4, taken.Count);
        Assert.Equal(a.ClaimedBy, taken[DemoResults.Key(1)]); // taken over from a
        Assert.Null(taken[DemoResults.Key(4)]); // a new claim
        Assert.Equal(a.ClaimedBy, store.Claims([DemoResults.Key(2)])[DemoResults.Key(2)].TakenOverFrom);
        // a comes back late: its claims are b's now, so a stores nothing and b's results count.
        Assert.Empty(store.StoreClaimed([DemoResults.Row(1, run, variant: 1)], a));
        Assert.Equal(0, store.Count());
        var stored = store.StoreClaimed([DemoResults.Row(1, run) with { FittedBy = b.FittedBy }, DemoResults.Row(2, run) with { FittedBy = b.FittedBy }], b);
        Assert.Equal(2, stored.Count);
        Assert.Equal(2, store.Count());
        Assert.All(store.Query(), r => Assert.Equal(b.FittedBy, r.FittedBy));
        var claims = store.Claims([DemoResults.Key(1), DemoResults.Key(3)]);
        Assert.Equal(ClaimState.Done, claims[DemoResults.Key(1)].State);
        Assert.NotNull(claims[DemoResults.Key(1)].DoneUtc);
        Assert.Equal(ClaimState.Claimed, claims[DemoResults.Key(3)].State);
        Assert.Empty(store.CheckConsistency());
    }

    public static void RenewClaims_KeepsTheClaimPastTheFirstLease(Func<IResultStore> open)
    {
        using var store = open();
        var a = Worker("a");
        var b = Worker("b");
        Assert.Equal(2, store.Claim(Requests([7, 8]), a, TimeSpan.FromSeconds(1)).Count);
        Thread.Sleep(TimeSpan.FromSeconds(0.5));
        Assert.Equal(2, store.RenewClaims(a, TimeSpan.FromSeconds(30)));
        Thread.Sleep(TimeSpan.FromSeconds(1)); // past the first lease, well inside the renewed one
        Assert.Empty(store.Claim(Requests([7, 8]), b, TimeSpan.FromSeconds(30)));
        Assert.Equal(0, store.RenewClaims(b, TimeSpan.FromSeconds(30)));
    }

    public static void DoneClaims_NotGrantedAgain_UnlessDoneBeforeTheForceTime(Func<IResultStore> open)
    {
        using var store = open();
        var a = Worker("a");
        var b = Worker("b");
        var run = RunInfo.StartNew("1.0");
        store.Claim(Requests([10, 11]), a, TimeSpan.FromMinutes(1));
        Assert.Equal(2, store.StoreClaimed([DemoResults.Row(10, run), DemoResults.Row(11, run)], a).Count);
        Assert.Empty(store.Claim(Requests([10, 11]), b, TimeSpan.FromMinutes(1)));
        Assert.Empty(store.Claim(Requests([10, 11]), a, TimeSpan.FromMinutes(1))); // done, even for the worker that did it
        var doneAt = store.Claims([DemoResults.Key(10)])[DemoResults.Key(10)].DoneUtc!.Value;
        Assert.Empty(store.Claim(Requests([10]), b, TimeSpan.FromMinutes(1), reclaimDoneBefore: doneAt));
        Thread.Sleep(20);
        var force = store.ClockUtc();
        Assert.True(force > doneAt, "the database clock moves on");
        Assert.Equal(2, store.Claim(Requests([10, 11]), b, TimeSpan.FromMinutes(1), reclaimDoneBefore: force).Count);
        Assert.Equal(ClaimState.Claimed, store.Claims([DemoResults.Key(11)])[DemoResults.Key(11)].State);
    }

    public static void ReleaseClaims_OthersMayClaimAtOnce(Func<IResultStore> open)
    {
        using var store = open();
        var a = Worker("a");
        var b = Worker("b");
        store.Claim(Requests([20, 21, 22]), a, TimeSpan.FromMinutes(10));
        Assert.Equal(1, store.ReleaseClaims(a, [DemoResults.Key(21)]));
        Assert.Equal([DemoResults.Key(21)], store.Claim(Requests([20, 21, 22]), b, TimeSpan.FromMinutes(10)).Keys);
        Assert.Equal(2, store.ReleaseClaims(a));
        Assert.Equal(2, store.Claim(Requests([20, 22]), b, TimeSpan.FromMinutes(10)).Count);
        Assert.Empty(store.Claims([DemoResults.Key(99)]));
    }

    public static void FittedByAndAt_StoredAndReadBack_DefaultsToHostAndWriteTime(Func<IResultStore> open)
    {
        using var store = open();
        var run = RunInfo.StartNew("1.0");
        var at = new DateTimeOffset(2025, 3, 14, 10, 16, 30, 250, TimeSpan.Zero);
        store.StoreBatch([DemoResults.Row(30, run) with { FittedBy = "w1@probe-7:4242", FittedAt = at }, DemoResults.Row(31, run)]);
        var back = store.QueryKeys([DemoResults.Key(30), DemoResults.Key(31), DemoResults.Key(32)]).ToDictionary(r => r.Key);
        Assert.Equal(2, back.Count);
        Assert.Equal("w1@probe-7:4242", back[DemoResults.Key(30)].FittedBy);
        Assert.Equal(at, back[DemoResults.Key(30)].FittedAt);
        Assert.Equal(run.Host, back[DemoResults.Key(31)].FittedBy);
        Assert.Equal(back[DemoResults.Key(31)].StoredUtc, back[DemoResults.Key(31)].FittedAt);
        Assert.Equal(FitJsonFormatter.Format(DemoResults.Fit(30)), FitJsonFormatter.Format(back[DemoResults.Key(30)].Result));
    }
}
