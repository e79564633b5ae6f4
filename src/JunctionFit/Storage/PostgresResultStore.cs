using System.Data;
using System.Data.Common;
using System.Globalization;
using Npgsql;

namespace JunctionFit.Storage;

/// <summary>
/// The results database on a PostgreSQL server, for a lab whose stations share one database. Connections come from an
/// Npgsql pool, one per operation, so a dropped connection costs one retry rather than the batch. Writes run in
/// READ COMMITTED transactions whose upserts (<c>INSERT … ON CONFLICT DO UPDATE</c>) are atomic per key even when two
/// stations store the same key at once; rows are written in key order so that two chunks never deadlock. Migrations
/// run under a transaction-scoped advisory lock.
/// </summary>
internal sealed class PostgresResultStore : SqlResultStore
{
    /// <summary>The advisory lock key that serialises migrations ("JFDB" in ASCII).</summary>
    private const long MigrationLockKey = 0x4A464442;

    private readonly NpgsqlDataSource _dataSource;

    private PostgresResultStore(NpgsqlDataSource dataSource, string description, ResultStoreOptions options)
        : base(options, description)
    {
        _dataSource = dataSource;
    }

    /// <inheritdoc />
    public override ResultStoreKind Kind => ResultStoreKind.PostgreSql;

    /// <inheritdoc />
    protected override string BinaryCollation => " COLLATE \"C\"";

    /// <summary>Connects and migrates.</summary>
    /// <param name="connectionString">An Npgsql connection string.</param>
    /// <param name="options">Timeouts and retries.</param>
    /// <returns>The store.</returns>
    /// <exception cref="ResultStoreException">The server cannot be reached, refuses the login, or the schema cannot be migrated.</exception>
    public static PostgresResultStore Open(string connectionString, ResultStoreOptions options)
    {
        var builder = new NpgsqlConnectionStringBuilder(connectionString);
        if (builder.CommandTimeout == 30) builder.CommandTimeout = (int)Math.Ceiling(options.BusyTimeout.TotalSeconds);
        if (string.IsNullOrEmpty(builder.ApplicationName)) builder.ApplicationName = "junctionfit";
        string description = string.Create(CultureInfo.InvariantCulture,
            $"PostgreSQL {builder.Host ?? "localhost"}:{builder.Port}/{builder.Database ?? "(default database)"} as {builder.Username ?? "(default user)"}");
        var dataSource = NpgsqlDataSource.Create(builder.ConnectionString);
        try
        {
            var store = new PostgresResultStore(dataSource, description, options);
            store.Migrate();
            return store;
        }
        catch (ResultStoreException)
        {
            dataSource.Dispose();
            throw;
        }
        catch (Exception e) when (e is NpgsqlException or InvalidOperationException or TimeoutException)
        {
            dataSource.Dispose();
            throw new ResultStoreException($"{description}: cannot open the results database: {ConnectionStrings.Redact(e.Message)}", e);
        }
    }

    /// <inheritdoc />
    protected override string NowSql => "now()";

    /// <inheritdoc />
    protected override string LeaseEndSql => "now() + make_interval(secs => @lease_s)";

    /// <inheritdoc />
    protected override void AddClock(DbCommand command, bool now, TimeSpan? lease)
    {
        if (lease is TimeSpan l) AddParameter(command, "@lease_s", ColumnKind.Real, l.TotalSeconds);
    }

    /// <inheritdoc />
    public override DateTimeOffset ClockUtc()
    {
        try
        {
            using var lease = Lease();
            using var cmd = Command(lease.Connection, null, "SELECT now()");
            using var reader = cmd.ExecuteReader();
            reader.Read();
            return reader.GetFieldValue<DateTimeOffset>(0).ToUniversalTime();
        }
        catch (DbException e)
        {
            throw new ResultStoreException($"{Description}: reading the server clock failed: {ConnectionStrings.Redact(e.Message)}", e);
        }
    }

    /// <inheritdoc />
    protected override ConnectionLease Lease()
    {
        try
        {
            return new ConnectionLease(_dataSource.OpenConnection(), owned: true);
        }
        catch (Exception e) when (e is not DbException and (InvalidOperationException or TimeoutException))
        {
            throw new ResultStoreException($"{Description}: cannot connect: {ConnectionStrings.Redact(e.Message)}", e);
        }
    }

    /// <inheritdoc />
    protected override DbTransaction BeginWrite(DbConnection connection)
        => ((NpgsqlConnection)connection).BeginTransaction(IsolationLevel.ReadCommitted);

    /// <inheritdoc />
    protected override void LockForMigration(DbConnection connection, DbTransaction transaction)
    {
        using var cmd = Command(connection, transaction, "SELECT pg_advisory_xact_lock(@key)");
        AddParameter(cmd, "@key", ColumnKind.Int, MigrationLockKey).DbType = DbType.Int64;
        cmd.ExecuteNonQuery();
    }

    /// <inheritdoc />
    protected override bool IsTransient(Exception exception) => exception switch
    {
        PostgresException { SqlState: "40001" or "40P01" or "55P03" } => true, // serialization failure, deadlock, lock not available
        NpgsqlException { IsTransient: true } => true,
        _ => false,
    };

    /// <inheritdoc />
    protected override IReadOnlyList<string> MigrationSql(Migration migration) => migration.PostgreSql;

    /// <inheritdoc />
    protected override DbType ParameterType(ColumnKind kind) => kind switch
    {
        ColumnKind.Int => DbType.Int32,
        ColumnKind.Real => DbType.Double,
        ColumnKind.Bool => DbType.Boolean,
        ColumnKind.Time => DbType.DateTimeOffset,
        _ => DbType.String,
    };

    /// <inheritdoc />
    protected override object TimeValue(DateTimeOffset time) => time.ToUniversalTime();

    /// <inheritdoc />
    protected override DateTimeOffset ReadTime(DbDataReader reader, int ordinal)
        => reader.GetFieldValue<DateTimeOffset>(ordinal);

    /// <inheritdoc />
    protected override void Dispose(bool disposing)
    {
        if (disposing) _dataSource.Dispose();
    }
}
