using System.Data;
using System.Data.Common;
using System.Globalization;
using Microsoft.Data.Sqlite;

namespace JunctionFit.Storage;

/// <summary>
/// The results database in a SQLite file. One connection for the store's lifetime, in WAL mode (readers never block the
/// writer, and a killed process leaves the last committed state: the write-ahead log is replayed or ignored on the next
/// open), <c>synchronous=FULL</c> (a commit is on disk before it returns), foreign keys on, and a busy timeout so that a
/// second writer waits for the lock instead of failing. Write transactions are <c>BEGIN IMMEDIATE</c>: they take the
/// write lock at the start, so two writers queue and never fail to upgrade a read lock.
/// </summary>
internal sealed class SqliteResultStore : SqlResultStore
{
    private readonly SqliteConnection _connection;

    private SqliteResultStore(SqliteConnection connection, string path, ResultStoreOptions options)
        : base(options, path)
    {
        _connection = connection;
    }

    /// <inheritdoc />
    public override ResultStoreKind Kind => ResultStoreKind.Sqlite;

    /// <inheritdoc />
    protected override string BinaryCollation => "";

    /// <summary>Opens or creates the file (and its folder) and migrates it.</summary>
    /// <param name="path">The file path as given.</param>
    /// <param name="options">Timeouts and retries.</param>
    /// <returns>The store.</returns>
    /// <exception cref="ResultStoreException">The file cannot be opened, is not a SQLite database, or cannot be migrated.</exception>
    public static SqliteResultStore Open(string path, ResultStoreOptions options)
    {
        SqliteConnection? connection = null;
        try
        {
            if (path != ":memory:")
            {
                string? folder = Path.GetDirectoryName(Path.GetFullPath(path));
                if (!string.IsNullOrEmpty(folder)) Directory.CreateDirectory(folder);
            }
            var builder = new SqliteConnectionStringBuilder
            {
                DataSource = path,
                Mode = SqliteOpenMode.ReadWriteCreate,
                Pooling = false,
                ForeignKeys = true,
                DefaultTimeout = (int)Math.Ceiling(options.BusyTimeout.TotalSeconds),
            };
            connection = new SqliteConnection(builder.ConnectionString);
            connection.Open();
            int busyMs = (int)options.BusyTimeout.TotalMilliseconds;
            Pragma(connection, "PRAGMA busy_timeout = " + busyMs.ToString(CultureInfo.InvariantCulture));
            string? mode = Pragma(connection, "PRAGMA journal_mode = WAL");
            if (!string.Equals(mode, "wal", StringComparison.OrdinalIgnoreCase) && path != ":memory:")
            {
                throw new ResultStoreException($"{path}: SQLite would not switch to WAL mode (journal mode is '{mode}'); is the file on a network share?");
            }
            Pragma(connection, "PRAGMA synchronous = FULL");
            var store = new SqliteResultStore(connection, path, options);
            store.Migrate();
            connection = null;
            return store;
        }
        catch (SqliteException e)
        {
            throw new ResultStoreException($"{path}: cannot open the SQLite results database: {e.Message}", e);
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            throw new ResultStoreException($"{path}: cannot create the folder of the results database: {e.Message}", e);
        }
        finally
        {
            connection?.Dispose();
        }
    }

    /// <inheritdoc />
    protected override ConnectionLease Lease() => new(_connection, owned: false);

    /// <inheritdoc />
    protected override DbTransaction BeginWrite(DbConnection connection)
        => ((SqliteConnection)connection).BeginTransaction(deferred: false);

    /// <inheritdoc />
    protected override void LockForMigration(DbConnection connection, DbTransaction transaction)
    {
        // BEGIN IMMEDIATE already holds the database's only write lock.
    }

    /// <inheritdoc />
    protected override bool IsTransient(Exception exception)
        => exception is SqliteException { SqliteErrorCode: 5 or 6 }; // SQLITE_BUSY, SQLITE_LOCKED

    /// <inheritdoc />
    protected override IReadOnlyList<string> MigrationSql(Migration migration) => migration.Sqlite;

    /// <inheritdoc />
    protected override DbType ParameterType(ColumnKind kind) => kind switch
    {
        ColumnKind.Int => DbType.Int64,
        ColumnKind.Real => DbType.Double,
        ColumnKind.Bool => DbType.Boolean,
        _ => DbType.String,
    };

    /// <inheritdoc />
    protected override object TimeValue(DateTimeOffset time)
        => time.ToUniversalTime().ToString("yyyy-MM-dd'T'HH:mm:ss.fffffff'Z'", CultureInfo.InvariantCulture);

    /// <inheritdoc />
    protected override DateTimeOffset ReadTime(DbDataReader reader, int ordinal)
        => DateTimeOffset.Parse(reader.GetString(ordinal), CultureInfo.InvariantCulture, DateTimeStyles.AssumeUniversal | DateTimeStyles.AdjustToUniversal);

    /// <inheritdoc />
    protected override void EngineChecks(DbConnection connection, List<string> problems)
    {
        using (var cmd = Command(connection, null, "PRAGMA integrity_check"))
        using (var reader = cmd.ExecuteReader())
        {
            while (reader.Read())
            {
                string line = reader.GetString(0);
                if (!string.Equals(line, "ok", StringComparison.Ordinal)) problems.Add("integrity_check: " + line);
            }
        }
        using (var cmd = Command(connection, null, "PRAGMA foreign_key_check"))
        using (var reader = cmd.ExecuteReader())
        {
            while (reader.Read()) problems.Add($"foreign_key_check: table {reader.GetString(0)} row {reader.GetValue(1)} has no parent in {reader.GetString(2)}");
        }
    }

    /// <inheritdoc />
    protected override void Dispose(bool disposing)
    {
        if (disposing) _connection.Dispose();
    }

    private static string? Pragma(SqliteConnection connection, string sql)
    {
        using var cmd = Command(connection, null, sql);
        return cmd.ExecuteScalar()?.ToString();
    }
}
