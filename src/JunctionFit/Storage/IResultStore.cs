namespace JunctionFit.Storage;

/// <summary>The database engine behind a <see cref="IResultStore"/>.</summary>
public enum ResultStoreKind
{
    /// <summary>A SQLite file (embedded, the default).</summary>
    Sqlite,

    /// <summary>A PostgreSQL server shared by several stations.</summary>
    PostgreSql,
}

/// <summary>
/// The results database: one schema (see docs/database.md) on SQLite or PostgreSQL, migrated when opened. Open one with
/// <see cref="ResultStore.Open(string, ResultStoreOptions?)"/>. Every <see cref="StoreBatch"/> call is one transaction:
/// after a crash the database holds each chunk entirely or not at all. Rows are unique per <see cref="ResultKey"/>,
/// enforced by the schema, so concurrent writers (processes or threads with their own store) cannot create duplicates.
/// An instance is not safe for use by several threads at once; give each thread its own.
/// </summary>
public interface IResultStore : IDisposable
{
    /// <summary>The engine.</summary>
    ResultStoreKind Kind { get; }

    /// <summary>Where the database is, for messages: the file path, or the connection string without its password.</summary>
    string Description { get; }

    /// <summary>The schema version after the migrations that ran on open.</summary>
    int SchemaVersion { get; }

    /// <summary>True when a result with <paramref name="key"/> is stored.</summary>
    /// <param name="key">The identity.</param>
    /// <returns>Whether it is stored.</returns>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    bool Contains(ResultKey key);

    /// <summary>Those of <paramref name="keys"/> that are stored (so that a batch can skip them).</summary>
    /// <param name="keys">Candidate keys, in any number (queried in chunks).</param>
    /// <returns>The stored subset.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="keys"/> is null.</exception>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    IReadOnlySet<ResultKey> ExistingKeys(IEnumerable<ResultKey> keys);

    /// <summary>
    /// Stores <paramref name="results"/> in one transaction (a chunk). A result whose key is already stored replaces the
    /// stored row when <paramref name="replaceExisting"/> is true (<c>--force</c> and ordinary reruns), and is left alone
    /// otherwise. When several results in the chunk share a key, the last one counts. A transaction that fails because of
    /// a lock or a deadlock is retried a few times before giving up.
    /// </summary>
    /// <param name="results">The chunk; an empty chunk does nothing.</param>
    /// <param name="replaceExisting">Replace stored rows with the same key (upsert) or keep them.</param>
    /// <returns>The number of rows inserted or replaced.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="results"/> or one of its items is null.</exception>
    /// <exception cref="ResultStoreException">The chunk could not be written; nothing of it is stored.</exception>
    int StoreBatch(IReadOnlyList<StoredResult> results, bool replaceExisting = true);

    /// <summary>
    /// Stored results that match every given filter (null: any), ordered by lot, wafer, file path and key (the same order
    /// on both engines).
    /// </summary>
    /// <param name="lot">Lot, exact match.</param>
    /// <param name="wafer">Wafer, exact match.</param>
    /// <param name="model">Model name.</param>
    /// <param name="runId">Run id.</param>
    /// <returns>The rows.</returns>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    IReadOnlyList<StoredResult> Query(string? lot = null, string? wafer = null, string? model = null, string? runId = null);

    /// <summary>The number of stored results.</summary>
    /// <returns>The count.</returns>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    long Count();

    /// <summary>
    /// Checks the database: the engine's own check where there is one (SQLite <c>PRAGMA integrity_check</c> and
    /// <c>foreign_key_check</c>), that every result has all the parameter rows it was stored with, and that no key occurs twice.
    /// </summary>
    /// <returns>Problems in words; empty when the database is consistent.</returns>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    IReadOnlyList<string> CheckConsistency();
}
