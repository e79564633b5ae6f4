using JunctionFit.Storage;
using Xunit;

namespace JunctionFit.Tests.Storage;

/// <summary>
/// The results database on the PostgreSQL test server named by <c>JUNCTIONFIT_TEST_PG</c> (see .ci/postgres-setup.sh);
/// skipped, saying why, without it. Each test works in its own schema.
/// </summary>
public sealed class DatabasePostgresTests : IDisposable
{
    private readonly Lazy<PostgresSchema> _schema = new(() => new PostgresSchema());

    /// <summary>
    /// Runs only for a test that is not skipped: without a server (under CI) the test fails here, on its own thread, rather
    /// than on a worker thread of the contract, where the failed assertion would crash the test host.
    /// </summary>
    public DatabasePostgresTests() => _ = PostgresFactAttribute.ConnectionString;

    public void Dispose()
    {
        if (_schema.IsValueCreated) _schema.Value.Dispose();
    }

    private string Db => _schema.Value.ConnectionString;

    private IResultStore Open() => ResultStore.Open(Db);

    [PostgresFact]
    public void StoreBatch_ThenQuery_RoundTripsEveryField() => DatabaseStoreContract.StoreThenQuery_RoundTripsEveryField(Open);

    [PostgresFact]
    public void StoreBatch_SameKeyAgain_ReplacesOrKeeps() => DatabaseStoreContract.StoreSameKeyAgain_ReplaceOrKeep(Open);

    [PostgresFact]
    public void StoreBatch_SameKeyTwiceInOneChunk_LastWins() => DatabaseStoreContract.SameKeyTwiceInOneChunk_LastWins(Open);

    [PostgresFact]
    public void ExistingKeys_MixOfStoredAndNew_ReturnsStoredSubset() => DatabaseStoreContract.ExistingKeys_ReturnsStoredSubset(Open);

    [PostgresFact]
    public void Query_WithFilters_FiltersAndOrdersByLotWaferFile() => DatabaseStoreContract.Query_Filters_AndOrdersByLotWaferFile(Open);

    [PostgresFact]
    public void Open_ExistingDatabase_MigrationsRunOnce() => DatabaseStoreContract.Reopen_MigrationsRunOnce(Open);

    [PostgresFact]
    public void Open_FromManyThreadsAtOnce_AllSucceed() => DatabaseStoreContract.OpenFromManyThreadsAtOnce_AllSucceed(Open);

    [PostgresFact]
    public void StoreBatch_TwoThreadsOverlapping_LoseNoRow() => DatabaseStoreContract.TwoThreadsWritingOverlappingChunks_LoseNoRow(Open);

    [PostgresFact]
    public void StoreBatch_AwkwardTextAndSpecialNumbers_StoredAsGiven() => DatabaseStoreContract.AwkwardTextAndSpecialNumbers_StoredAsGiven(Open);

    [PostgresFact]
    public void StoreBatch_WriterKilledMidRun_DatabaseConsistentAndSecondRunCompletes()
        => DatabaseStoreContract.KilledWriter_LeavesWholeChunks_SecondRunCompletes(Db, Open, total: 3000, chunk: 100);

    [PostgresFact]
    public void StoreBatch_TwoProcessesAtOnce_LoseNoRow() => DatabaseStoreContract.TwoProcessesWritingAtOnce_LoseNoRow(Db, Open);

    [PostgresFact]
    public void Claim_TwoWorkersAtOnce_NeverHoldTheSameFile() => DatabaseStoreContract.TwoClaimers_NeverHoldTheSameFile_AndTogetherCoverAll(Open);

    [PostgresFact]
    public void Claim_HeldByOther_TakenOverAfterLease() => DatabaseStoreContract.Claim_HeldByOther_NotGrantedUntilLeaseExpires_ThenTakenOver(Open);

    [PostgresFact]
    public void RenewClaims_BeforeLeaseEnds_KeepsClaim() => DatabaseStoreContract.RenewClaims_KeepsTheClaimPastTheFirstLease(Open);

    [PostgresFact]
    public void Claim_DoneFile_NotGrantedUnlessForced() => DatabaseStoreContract.DoneClaims_NotGrantedAgain_UnlessDoneBeforeTheForceTime(Open);

    [PostgresFact]
    public void ReleaseClaims_Released_OthersMayClaim() => DatabaseStoreContract.ReleaseClaims_OthersMayClaimAtOnce(Open);

    [PostgresFact]
    public void StoreBatch_FittedByAndAt_RoundTrip() => DatabaseStoreContract.FittedByAndAt_StoredAndReadBack_DefaultsToHostAndWriteTime(Open);

    [PostgresFact]
    public void Open_Server_DescriptionHasNoPassword()
    {
        using var store = Open();
        Assert.Equal(ResultStoreKind.PostgreSql, store.Kind);
        string? password = new Npgsql.NpgsqlConnectionStringBuilder(Db).Password;
        Assert.False(string.IsNullOrEmpty(password), "the test server uses a password");
        Assert.DoesNotContain(password!, store.Description, StringComparison.Ordinal);
        Assert.Contains("PostgreSQL", store.Description, StringComparison.Ordinal);
    }

    [PostgresFact]
    public void Open_WrongPassword_MessageHasNoPassword()
    {
        var b = new Npgsql.NpgsqlConnectionStringBuilder(Db) { Password = "wrong-Kestrel-7731" };
        var e = Assert.Throws<ResultStoreException>(() => ResultStore.Open(b.ConnectionString));
        Assert.DoesNotContain("wrong-Kestrel-7731", e.Message, StringComparison.Ordinal);
    }

    [PostgresFact]
    public void Open_UriForm_ConnectsToTheSameDatabase()
    {
        var b = new Npgsql.NpgsqlConnectionStringBuilder(Db);
        using (var store = Open())
        {
            store.StoreBatch([JunctionFit.StoreCrashHelper.DemoResults.Row(1, RunInfo.StartNew("1.0"))]);
        }
        string uri = $"postgresql://{Uri.EscapeDataString(b.Username!)}:{Uri.EscapeDataString(b.Password!)}@{b.Host}:{b.Port}/{Uri.EscapeDataString(b.Database!)}?options={Uri.EscapeDataString("-c search_path=" + _schema.Value.Name)}";
        using var viaUri = ResultStore.Open(uri);
        Assert.Equal(1, viaUri.Count());
    }
}
