using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.StoreCrashHelper;
using Microsoft.Data.Sqlite;
using Xunit;

namespace JunctionFit.Tests.Storage;

/// <summary>The results database on a SQLite file.</summary>
public sealed class DatabaseSqliteTests : IDisposable
{
    private readonly TempFolder _folder = new();
    private readonly string _db;

    public DatabaseSqliteTests()
    {
        _db = _folder.File("lots/junctionfit.db");
    }

    public void Dispose() => _folder.Dispose();

    private IResultStore Open() => ResultStore.Open(_db);

    [Fact]
    public void StoreBatch_ThenQuery_RoundTripsEveryField() => DatabaseStoreContract.StoreThenQuery_RoundTripsEveryField(Open);

    [Fact]
    public void StoreBatch_SameKeyAgain_ReplacesOrKeeps() => DatabaseStoreContract.StoreSameKeyAgain_ReplaceOrKeep(Open);

    [Fact]
    public void StoreBatch_SameKeyTwiceInOneChunk_LastWins() => DatabaseStoreContract.SameKeyTwiceInOneChunk_LastWins(Open);

    [Fact]
    public void ExistingKeys_MixOfStoredAndNew_ReturnsStoredSubset() => DatabaseStoreContract.ExistingKeys_ReturnsStoredSubset(Open);

    [Fact]
    public void Query_WithFilters_FiltersAndOrdersByLotWaferFile() => DatabaseStoreContract.Query_Filters_AndOrdersByLotWaferFile(Open);

    [Fact]
    public void Open_ExistingDatabase_MigrationsRunOnce() => DatabaseStoreContract.Reopen_MigrationsRunOnce(Open);

    [Fact]
    public void Open_FromManyThreadsAtOnce_AllSucceed() => DatabaseStoreContract.OpenFromManyThreadsAtOnce_AllSucceed(Open);

    [Fact]
    public void StoreBatch_TwoThreadsOverlapping_LoseNoRow() => DatabaseStoreContract.TwoThreadsWritingOverlappingChunks_LoseNoRow(Open);

    [Fact]
    public void StoreBatch_AwkwardTextAndSpecialNumbers_StoredAsGiven() => DatabaseStoreContract.AwkwardTextAndSpecialNumbers_StoredAsGiven(Open);

    [Fact]
    public void StoreBatch_WriterKilledMidRun_DatabaseConsistentAndSecondRunCompletes()
        => DatabaseStoreContract.KilledWriter_LeavesWholeChunks_SecondRunCompletes(_db, Open, total: 6000, chunk: 200);

    [Fact]
    public void StoreBatch_TwoProcessesAtOnce_LoseNoRow() => DatabaseStoreContract.TwoProcessesWritingAtOnce_LoseNoRow(_db, Open);

    [Fact]
    public void Claim_TwoWorkersAtOnce_NeverHoldTheSameFile() => DatabaseStoreContract.TwoClaimers_NeverHoldTheSameFile_AndTogetherCoverAll(Open);

    [Fact]
    public void Claim_HeldByOther_TakenOverAfterLease() => DatabaseStoreContract.Claim_HeldByOther_NotGrantedUntilLeaseExpires_ThenTakenOver(Open);

    [Fact]
    public void RenewClaims_BeforeLeaseEnds_KeepsClaim() => DatabaseStoreContract.RenewClaims_KeepsTheClaimPastTheFirstLease(Open);

    [Fact]
    public void Claim_DoneFile_NotGrantedUnlessForced() => DatabaseStoreContract.DoneClaims_NotGrantedAgain_UnlessDoneBeforeTheForceTime(Open);

    [Fact]
    public void ReleaseClaims_Released_OthersMayClaim() => DatabaseStoreContract.ReleaseClaims_OthersMayClaimAtOnce(Open);

    [Fact]
    public void StoreBatch_FittedByAndAt_RoundTrip() => DatabaseStoreContract.FittedByAndAt_StoredAndReadBack_DefaultsToHostAndWriteTime(Open);

    [Fact]
    public void Open_NewFile_IsWalWithSchemaVersionTable()
    {
        using (var store = Open())
        {
            Assert.Equal(ResultStoreKind.Sqlite, store.Kind);
            Assert.Equal(_db, store.Description);
        }
        using var c = Raw();
        Assert.Equal("wal", Scalar(c, "PRAGMA journal_mode"));
        Assert.Equal(Migrations.All.Count.ToString(System.Globalization.CultureInfo.InvariantCulture), Scalar(c, "SELECT COUNT(*) FROM schema_version")); // one row per migration step
        Assert.Equal(ResultStore.CurrentSchemaVersion.ToString(System.Globalization.CultureInfo.InvariantCulture), Scalar(c, "SELECT MAX(version) FROM schema_version"));
    }

    [Fact]
    public void Open_SchemaNewerThanProgram_ThrowsWithVersions()
    {
        using (Open())
        {
        }
        using (var c = Raw())
        {
            Scalar(c, "INSERT INTO schema_version (version, applied_utc, description) VALUES (99, '2030-01-01', 'future')");
        }
        var e = Assert.Throws<ResultStoreException>(Open);
        Assert.Contains("99", e.Message, StringComparison.Ordinal);
        Assert.Contains("newer", e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void CheckConsistency_ParameterRowMissing_ReportsTheResult()
    {
        using (var store = Open())
        {
            store.StoreBatch([DemoResults.Row(1, RunInfo.StartNew("1.0")), DemoResults.Row(2, RunInfo.StartNew("1.0"))]);
            Assert.Empty(store.CheckConsistency());
        }
        using (var c = Raw())
        {
            Scalar(c, "DELETE FROM fit_parameter WHERE ordinal = 1 AND result_id = (SELECT MIN(id) FROM fit_result)");
        }
        using var again = Open();
        var problem = Assert.Single(again.CheckConsistency());
        Assert.Contains("parameter rows", problem, StringComparison.Ordinal);
    }

    [Fact]
    public void Open_NotADatabase_ThrowsResultStoreException()
    {
        Directory.CreateDirectory(Path.GetDirectoryName(_db)!);
        File.WriteAllText(_db, "Voltage (V),Current (A)\n0.1,1e-9\n");
        var e = Assert.Throws<ResultStoreException>(Open);
        Assert.Contains(_db, e.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Open_PathWithSemicolonAndQuote_UsedAsFileName()
    {
        string odd = _folder.File("a;b='c'.db");
        using (var store = ResultStore.Open(odd))
        {
            store.StoreBatch([DemoResults.Row(1, RunInfo.StartNew("1.0"))]);
        }
        Assert.True(File.Exists(odd));
        using var again = ResultStore.Open(odd);
        Assert.Equal(1, again.Count());
    }

    [Fact]
    public void Open_Version1Database_MigratesKeepingRowsWithHostAsFittedBy()
    {
        // A database as version 1 left it: its DDL and one result row written by hand.
        Directory.CreateDirectory(Path.GetDirectoryName(_db)!);
        using (var c = Raw())
        {
            void Exec(string sql)
            {
                using var cmd = c.CreateCommand();
                cmd.CommandText = sql;
                cmd.ExecuteNonQuery();
            }
            Exec(Migrations.CreateVersionTable);
            foreach (string sql in Migrations.All[0].Sqlite) Exec(sql);
            Exec("INSERT INTO schema_version VALUES (1, '2025-03-14T10:00:00Z', 'v1')");
            var key = DemoResults.Key(3);
            string options = DemoResults.Options.Replace("'", "''", StringComparison.Ordinal);
            Exec("INSERT INTO fit_result (file_sha256, model, options_hash, options_text, file_path, status, warnings_json, correlation_json, " +
                 "parameter_count, run_id, run_started_utc, tool_version, host, stored_utc) VALUES " +
                 $"('{key.FileSha256}', 'simmons', '{key.OptionsHash}', '{options}', 'KM-A01/W00/die_03_00.csv', 'failed', '[]', " +
                 "'{\"keys\": [], \"matrix\": []}', 0, 'run-1', '2025-03-14T10:15:00.0000000Z', '0.9', 'probe-7', '2025-03-14T10:16:00.0000000Z')");
        }
        using var store = Open();
        Assert.Equal(Migrations.Latest, store.SchemaVersion);
        var row = Assert.Single(store.Query());
        Assert.Equal("probe-7", row.FittedBy);
        Assert.Equal(new DateTimeOffset(2025, 3, 14, 10, 16, 0, TimeSpan.Zero), row.FittedAt);
        Assert.Empty(store.Claims([row.Key]));
        Assert.Empty(store.CheckConsistency());
    }

    [Fact]
    public void Open_Version2Database_MigratesToOptionsIndexKeepingTheOptionSetOfEachRow()
    {
        // A database as version 2 left it, with one row written by the store of that version (its DDL, then a write).
        Directory.CreateDirectory(Path.GetDirectoryName(_db)!);
        using (var c = Raw())
        {
            void Exec(string sql)
            {
                using var cmd = c.CreateCommand();
                cmd.CommandText = sql;
                cmd.ExecuteNonQuery();
            }
            Exec(Migrations.CreateVersionTable);
            foreach (var step in Migrations.All.Take(2))
            {
                foreach (string sql in step.Sqlite) Exec(sql);
                Exec($"INSERT INTO schema_version VALUES ({step.Version}, '2025-03-14T10:00:00Z', 'v{step.Version}')");
            }
            var key = DemoResults.Key(4);
            string options = DemoResults.Options.Replace("'", "''", StringComparison.Ordinal);
            Exec("INSERT INTO fit_result (file_sha256, model, options_hash, options_text, file_path, status, warnings_json, correlation_json, " +
                 "parameter_count, run_id, run_started_utc, tool_version, host, stored_utc, fitted_by, fitted_at) VALUES " +
                 $"('{key.FileSha256}', 'simmons', '{key.OptionsHash}', '{options}', 'KM-A01/W00/die_04_00.csv', 'failed', '[]', " +
                 "'{\"keys\": [], \"matrix\": []}', 0, 'run-1', '2025-03-14T10:15:00.0000000Z', '0.9', 'probe-7', '2025-03-14T10:16:00.0000000Z', " +
                 "'probe-7:1', '2025-03-14T10:16:00.0000000Z')");
        }
        using (var store = Open())
        {
            Assert.Equal(Migrations.Latest, store.SchemaVersion);
            var row = Assert.Single(store.Query()).ToRow();
            Assert.Equal(DemoResults.Options, row.OptionSet); // readable, not only the hash
            Assert.Single(OptionSets.Of([row]));
        }
        using var check = Raw();
        Assert.Equal("fit_result_options", Scalar(check, "SELECT name FROM sqlite_master WHERE type = 'index' AND name = 'fit_result_options'"));
    }

    [Fact]
    public void Open_Version3Database_MigratesKeepingRows_NewTextColumnsEmptyUntilRefit()
    {
        // A database as version 3 left it, with one poor fit written by hand: after migration 4 the row reads back with
        // no status reason, validity or diagnoses (they were never stored), and a refit of the same key stores them.
        Directory.CreateDirectory(Path.GetDirectoryName(_db)!);
        using (var c = Raw())
        {
            void Exec(string sql)
            {
                using var cmd = c.CreateCommand();
                cmd.CommandText = sql;
                cmd.ExecuteNonQuery();
            }
            Exec(Migrations.CreateVersionTable);
            foreach (var step in Migrations.All.Take(3))
            {
                foreach (string sql in step.Sqlite) Exec(sql);
                Exec($"INSERT INTO schema_version VALUES ({step.Version}, '2025-03-14T10:00:00Z', 'v{step.Version}')");
            }
            var key = DemoResults.Key(11);
            string options = DemoResults.Options.Replace("'", "''", StringComparison.Ordinal);
            Exec("INSERT INTO fit_result (file_sha256, model, options_hash, options_text, file_path, status, warnings_json, correlation_json, " +
                 "parameter_count, run_id, run_started_utc, tool_version, host, stored_utc, fitted_by, fitted_at) VALUES " +
                 $"('{key.FileSha256}', 'simmons', '{key.OptionsHash}', '{options}', 'KM-A01/W00/die_11_00.csv', 'poor-fit', '[\"misfit\"]', " +
                 "'{\"keys\": [], \"matrix\": []}', 0, 'run-1', '2025-03-14T10:15:00.0000000Z', '0.9', 'probe-7', '2025-03-14T10:16:00.0000000Z', " +
                 "'probe-7:1', '2025-03-14T10:16:00.0000000Z')");
        }
        using var store = Open();
        Assert.Equal(4, Migrations.Latest);
        Assert.Equal(Migrations.Latest, store.SchemaVersion);
        var old = Assert.Single(store.Query()).Result;
        Assert.Equal(FitStatus.PoorFit, old.Status);
        Assert.Equal(["misfit"], old.Warnings.ToArray());
        Assert.Null(old.StatusReason);
        Assert.Null(old.ModelValidity);
        Assert.Empty(old.Diagnoses);

        var refit = DemoResults.Row(11, RunInfo.StartNew("9.9.9-test"));
        Assert.Equal(1, store.StoreBatch([refit]));
        var back = Assert.Single(store.Query()).Result;
        Assert.Equal(refit.Result.StatusReason, back.StatusReason);
        Assert.Equal(refit.Result.ModelValidity, back.ModelValidity);
        Assert.Equal(refit.Result.Diagnoses.ToArray(), back.Diagnoses.ToArray());
        Assert.NotEmpty(back.Diagnoses);
        Assert.Empty(store.CheckConsistency());
    }

    private SqliteConnection Raw()
    {
        var c = new SqliteConnection(new SqliteConnectionStringBuilder { DataSource = _db, Pooling = false }.ConnectionString);
        c.Open();
        return c;
    }

    private static string? Scalar(SqliteConnection c, string sql)
    {
        using var cmd = c.CreateCommand();
        cmd.CommandText = sql;
        return cmd.ExecuteScalar()?.ToString();
    }
}
