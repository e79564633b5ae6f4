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

    /// <summary>The stored results with the given keys (keys not stored are left out), in no particular order.</summary>
    /// <param name="keys">Keys, in any number (queried in chunks).</param>
    /// <returns>The rows.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="keys"/> is null.</exception>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    IReadOnlyList<StoredResult> QueryKeys(IEnumerable<ResultKey> keys);

    /// <summary>The time on the clock that claims and leases are measured by: the server's on PostgreSQL (so that workers
    /// on machines whose clocks disagree still agree on leases), this machine's on SQLite.</summary>
    /// <returns>The time, UTC.</returns>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    DateTimeOffset ClockUtc();

    /// <summary>
    /// Claims files for <paramref name="worker"/> in one transaction (see docs/database.md, "Several workers"). A file is
    /// granted when no claim exists for its key, when the worker already holds it, when another worker's lease has expired
    /// (the claim is taken over), or when its claim is done and was completed before <paramref name="reclaimDoneBefore"/>
    /// (<c>--force</c>). A granted claim lasts <paramref name="lease"/> unless renewed. Two workers never hold the same key:
    /// each key is one row, and the insert-or-take-over is atomic per row on both engines.
    /// </summary>
    /// <param name="requests">Files to claim.</param>
    /// <param name="worker">The claiming worker.</param>
    /// <param name="lease">How long the claim holds without renewal (more than zero, at most one day).</param>
    /// <param name="reclaimDoneBefore">Completed claims done before this time may be claimed again; null: never.</param>
    /// <returns>The keys granted, each with the <see cref="WorkerIdentity.ClaimedBy"/> of the worker whose lapsed claim was
    /// taken over, or null when the claim is new (or the worker's own, or of a done file).</returns>
    /// <exception cref="ArgumentNullException">An argument is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="lease"/> is out of range.</exception>
    /// <exception cref="ResultStoreException">The database cannot be written.</exception>
    IReadOnlyDictionary<ResultKey, string?> Claim(IReadOnlyList<ClaimRequest> requests, WorkerIdentity worker, TimeSpan lease, DateTimeOffset? reclaimDoneBefore = null);

    /// <summary>The claim rows of the given keys (keys without a claim are left out).</summary>
    /// <param name="keys">Keys, in any number.</param>
    /// <returns>The rows by key.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="keys"/> is null.</exception>
    /// <exception cref="ResultStoreException">The database cannot be read.</exception>
    IReadOnlyDictionary<ResultKey, ClaimInfo> Claims(IEnumerable<ResultKey> keys);

    /// <summary>Extends every claim <paramref name="worker"/> holds to <paramref name="lease"/> from now (the heartbeat).</summary>
    /// <param name="worker">The worker.</param>
    /// <param name="lease">The new lease.</param>
    /// <returns>The number of claims renewed.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="worker"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="lease"/> is out of range.</exception>
    /// <exception cref="ResultStoreException">The database cannot be written.</exception>
    int RenewClaims(WorkerIdentity worker, TimeSpan lease);

    /// <summary>Gives up claims <paramref name="worker"/> holds and has not completed (all of them, or those of <paramref name="keys"/>).</summary>
    /// <param name="worker">The worker.</param>
    /// <param name="keys">The keys to release; null: every claim of the worker.</param>
    /// <returns>The number of claims released.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="worker"/> is null.</exception>
    /// <exception cref="ResultStoreException">The database cannot be written.</exception>
    int ReleaseClaims(WorkerIdentity worker, IEnumerable<ResultKey>? keys = null);

    /// <summary>
    /// Stores results that <paramref name="worker"/> claimed and marks their claims done, in one transaction: a result whose
    /// claim the worker no longer holds (its lease expired and another worker took it over) is not stored, so the file is
    /// stored by whoever holds it. Otherwise as <see cref="StoreBatch"/>, including the retries.
    /// </summary>
    /// <param name="results">The chunk.</param>
    /// <param name="worker">The worker that claimed them.</param>
    /// <param name="replaceExisting">Replace stored rows with the same key (upsert) or keep them.</param>
    /// <returns>The keys stored (those whose claim the worker still held).</returns>
    /// <exception cref="ArgumentNullException">An argument or a result is null.</exception>
    /// <exception cref="ResultStoreException">The chunk could not be written; nothing of it is stored and no claim is completed.</exception>
    IReadOnlyList<ResultKey> StoreClaimed(IReadOnlyList<StoredResult> results, WorkerIdentity worker, bool replaceExisting = true);

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
