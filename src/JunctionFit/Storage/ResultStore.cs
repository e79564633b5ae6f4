namespace JunctionFit.Storage;

/// <summary>
/// Opens the results database named by a <c>--db</c> value: a PostgreSQL connection string (<c>Host=…;Database=…</c> or a
/// <c>postgresql://</c> URI, see <see cref="ConnectionStrings.IsPostgreSql"/>) opens a server, anything else is the path of a
/// SQLite file (created when missing, with its folder). Either way the schema is migrated to
/// <see cref="CurrentSchemaVersion"/> before the store is returned; two processes opening the same database at once are
/// safe (the migration runs under a lock, and each step is applied once).
/// </summary>
public static class ResultStore
{
    /// <summary>The file name of the default SQLite database inside a batch output folder.</summary>
    public const string DefaultFileName = "junctionfit.db";

    /// <summary>The schema version this library creates and reads.</summary>
    public static int CurrentSchemaVersion => Migrations.Latest;

    /// <summary>Opens (creating and migrating as needed) the database named by <paramref name="db"/>.</summary>
    /// <param name="db">A SQLite file path or a PostgreSQL connection string.</param>
    /// <param name="options">Timeouts and retries; null for <see cref="ResultStoreOptions.Default"/>.</param>
    /// <returns>The open store; dispose it when done.</returns>
    /// <exception cref="ArgumentException"><paramref name="db"/> is empty, or a malformed connection string.</exception>
    /// <exception cref="ResultStoreException">The database cannot be opened or migrated, or its schema is newer than this
    /// program knows; the message names the database without its password.</exception>
    public static IResultStore Open(string db, ResultStoreOptions? options = null)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(db);
        options ??= ResultStoreOptions.Default;
        return ConnectionStrings.IsPostgreSql(db)
            ? PostgresResultStore.Open(ConnectionStrings.ToNpgsql(db), options)
            : SqliteResultStore.Open(db, options);
    }

    /// <summary>The engine <paramref name="db"/> names, without opening anything.</summary>
    /// <param name="db">A SQLite file path or a PostgreSQL connection string.</param>
    /// <returns>The engine.</returns>
    /// <exception cref="ArgumentException"><paramref name="db"/> is empty.</exception>
    public static ResultStoreKind KindOf(string db)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(db);
        return ConnectionStrings.IsPostgreSql(db) ? ResultStoreKind.PostgreSql : ResultStoreKind.Sqlite;
    }
}
