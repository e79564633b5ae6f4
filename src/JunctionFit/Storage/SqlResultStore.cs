using System.Collections.Immutable;
using System.Data;
using System.Data.Common;
using System.Globalization;
using System.Text;
using JunctionFit.Common;

namespace JunctionFit.Storage;

/// <summary>An open connection and whether returning it closes it.</summary>
internal readonly struct ConnectionLease(DbConnection connection, bool owned) : IDisposable
{
    /// <summary>The open connection.</summary>
    public DbConnection Connection { get; } = connection;

    /// <summary>Closes the connection when the lease owns it.</summary>
    public void Dispose()
    {
        if (owned) Connection.Dispose();
    }
}

/// <summary>Column kinds, mapped to engine types by each store.</summary>
internal enum ColumnKind
{
    Text,
    Int,
    Real,
    Bool,
    Time,
}

/// <summary>
/// The engine-neutral part of the results database: the SQL (identical on SQLite and PostgreSQL apart from the DDL),
/// migrations, chunked upserts, reads and checks. Every statement takes its values as parameters; the only text put
/// into SQL is this class's own column names. Subclasses say how to connect, how to lock, which errors are transient,
/// and how times are stored.
/// </summary>
internal abstract class SqlResultStore : IResultStore
{
    /// <summary>Number of file hashes per <c>IN (…)</c> list in <see cref="ExistingKeys"/>.</summary>
    private const int KeyQueryChunk = 200;

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly ImmutableArray<StoredColumn> ResultColumns = StoredColumns.Result;

    private static readonly string InsertColumnList = string.Join(", ", ResultColumns.Select(c => c.Name));
    private static readonly string InsertValueList = string.Join(", ", ResultColumns.Select(c => "@" + c.Name));

    private static readonly string UpsertSql =
        $"INSERT INTO fit_result ({InsertColumnList}) VALUES ({InsertValueList}) " +
        "ON CONFLICT (file_sha256, model, options_hash) DO UPDATE SET " +
        string.Join(", ", ResultColumns.Skip(3).Select(c => $"{c.Name} = excluded.{c.Name}")) +
        " RETURNING id";

    private static readonly string InsertIfAbsentSql =
        $"INSERT INTO fit_result ({InsertColumnList}) VALUES ({InsertValueList}) " +
        "ON CONFLICT (file_sha256, model, options_hash) DO NOTHING RETURNING id";

    private static readonly string SelectColumns = StoredColumns.SelectList;

    private readonly TransientRetry _retry;
    private bool _disposed;

    /// <summary>Creates the store (not yet migrated).</summary>
    /// <param name="options">Timeouts and retries.</param>
    /// <param name="description">Where the database is, without a password.</param>
    protected SqlResultStore(ResultStoreOptions options, string description)
    {
        Options = options;
        Description = description;
        _retry = new TransientRetry(options.TransientRetries, e => IsTransient(e), Wrap);
    }

    /// <inheritdoc />
    public abstract ResultStoreKind Kind { get; }

    /// <inheritdoc />
    public string Description { get; }

    /// <inheritdoc />
    public int SchemaVersion { get; private set; }

    /// <summary>Timeouts and retries.</summary>
    protected ResultStoreOptions Options { get; }

    /// <summary>Text appended to a text expression in ORDER BY so that both engines sort by code point.</summary>
    protected abstract string BinaryCollation { get; }

    /// <summary>An open connection for one operation.</summary>
    protected abstract ConnectionLease Lease();

    /// <summary>Begins a transaction that holds the write lock from its start (so two writers queue rather than deadlock).</summary>
    protected abstract DbTransaction BeginWrite(DbConnection connection);

    /// <summary>Takes the lock that serialises migrations, inside <paramref name="transaction"/>.</summary>
    protected abstract void LockForMigration(DbConnection connection, DbTransaction transaction);

    /// <summary>True when <paramref name="exception"/> is worth retrying the transaction for (lock, deadlock, lost connection).</summary>
    protected abstract bool IsTransient(Exception exception);

    /// <summary>The DDL of a migration for this engine.</summary>
    protected abstract IReadOnlyList<string> MigrationSql(Migration migration);

    /// <summary>The parameter type and value for a column kind.</summary>
    protected abstract DbType ParameterType(ColumnKind kind);

    /// <summary>A time as a parameter value.</summary>
    protected abstract object TimeValue(DateTimeOffset time);

    /// <summary>A time read from a column.</summary>
    protected abstract DateTimeOffset ReadTime(DbDataReader reader, int ordinal);

    /// <summary>Engine-specific checks (SQLite's integrity check); adds problems in words.</summary>
    protected virtual void EngineChecks(DbConnection connection, List<string> problems)
    {
    }

    /// <summary>The current time in SQL, on the clock claims are compared against (SQLite: the parameter <c>@now</c>).</summary>
    protected virtual string NowSql => "@now";

    /// <summary>The end of a new lease in SQL (SQLite: the parameter <c>@lease_end</c>).</summary>
    protected virtual string LeaseEndSql => "@lease_end";

    /// <summary>Adds the parameters <see cref="NowSql"/> and <see cref="LeaseEndSql"/> use, from the local clock.</summary>
    /// <param name="command">The command.</param>
    /// <param name="now">The statement uses <see cref="NowSql"/>.</param>
    /// <param name="lease">The lease, when the statement uses <see cref="LeaseEndSql"/>.</param>
    protected virtual void AddClock(DbCommand command, bool now, TimeSpan? lease)
    {
        var t = DateTimeOffset.UtcNow;
        if (now) AddParameter(command, "@now", ColumnKind.Time, TimeValue(t));
        if (lease is TimeSpan l) AddParameter(command, "@lease_end", ColumnKind.Time, TimeValue(t + l));
    }

    /// <summary>Brings the schema to <see cref="Migrations.Latest"/> (see <see cref="Migrations"/>).</summary>
    /// <exception cref="ResultStoreException">The schema is newer than this program, or a step failed.</exception>
    protected void Migrate()
    {
        SchemaVersion = InWriteTransaction("migrating the schema", (connection, transaction) =>
        {
            LockForMigration(connection, transaction);
            Execute(connection, transaction, Migrations.CreateVersionTable);
            int current;
            using (var cmd = Command(connection, transaction, "SELECT COALESCE(MAX(version), 0) FROM schema_version"))
            {
                current = Convert.ToInt32(cmd.ExecuteScalar(), Inv);
            }
            if (current > Migrations.Latest)
            {
                throw new ResultStoreException(string.Create(Inv,
                    $"{Description}: the database has schema version {current}, newer than this program's {Migrations.Latest}; use a newer junctionfit"));
            }
            foreach (var step in Migrations.All)
            {
                if (step.Version <= current) continue;
                foreach (string sql in MigrationSql(step)) Execute(connection, transaction, sql);
                using var record = Command(connection, transaction,
                    "INSERT INTO schema_version (version, applied_utc, description) VALUES (@version, @applied, @description)");
                AddParameter(record, "@version", ColumnKind.Int, step.Version);
                AddParameter(record, "@applied", ColumnKind.Text, DateTimeOffset.UtcNow.ToString("O", Inv));
                AddParameter(record, "@description", ColumnKind.Text, step.Description);
                record.ExecuteNonQuery();
                current = step.Version;
            }
            return current;
        });
    }

    /// <inheritdoc />
    public bool Contains(ResultKey key)
    {
        CheckKey(key);
        return Read("looking up a result", connection =>
        {
            using var cmd = Command(connection, null,
                "SELECT 1 FROM fit_result WHERE file_sha256 = @h AND model = @m AND options_hash = @o");
            AddParameter(cmd, "@h", ColumnKind.Text, key.FileSha256);
            AddParameter(cmd, "@m", ColumnKind.Text, key.Model);
            AddParameter(cmd, "@o", ColumnKind.Text, key.OptionsHash);
            return cmd.ExecuteScalar() is not null;
        });
    }

    /// <inheritdoc />
    public IReadOnlySet<ResultKey> ExistingKeys(IEnumerable<ResultKey> keys)
    {
        ArgumentNullException.ThrowIfNull(keys);
        var wanted = new HashSet<ResultKey>();
        foreach (var k in keys)
        {
            CheckKey(k);
            wanted.Add(k);
        }
        var found = new HashSet<ResultKey>();
        if (wanted.Count == 0) return found;
        var hashes = wanted.Select(k => k.FileSha256).Distinct(StringComparer.Ordinal).ToList();
        return Read("looking up stored results", connection =>
        {
            for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
            {
                int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                var sql = new StringBuilder("SELECT file_sha256, model, options_hash FROM fit_result WHERE file_sha256 IN (");
                for (int i = 0; i < n; i++) sql.Append(i == 0 ? "" : ", ").Append("@h").Append(i.ToString(Inv));
                sql.Append(')');
                using var cmd = Command(connection, null, sql.ToString());
                for (int i = 0; i < n; i++) AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, hashes[start + i]);
                using var reader = cmd.ExecuteReader();
                while (reader.Read())
                {
                    var k = new ResultKey(reader.GetString(0), reader.GetString(1), reader.GetString(2));
                    if (wanted.Contains(k)) found.Add(k);
                }
            }
            return found;
        });
    }

    /// <inheritdoc />
    public int StoreBatch(IReadOnlyList<StoredResult> results, bool replaceExisting = true)
    {
        ArgumentNullException.ThrowIfNull(results);
        ObjectDisposedException.ThrowIf(_disposed, this);
        // Last one wins per key; a fixed order (by key) makes concurrent writers take row locks in the same order.
        var byKey = new Dictionary<ResultKey, StoredResult>(results.Count);
        foreach (var r in results)
        {
            ArgumentNullException.ThrowIfNull(r, nameof(results));
            byKey[r.Key] = r;
        }
        if (byKey.Count == 0) return 0;
        var ordered = byKey.Values
            .OrderBy(r => r.Key.FileSha256, StringComparer.Ordinal)
            .ThenBy(r => r.Key.Model, StringComparer.Ordinal)
            .ThenBy(r => r.Key.OptionsHash, StringComparer.Ordinal)
            .ToList();
        return InWriteTransaction("storing results", (connection, transaction) => WriteChunk(connection, transaction, ordered, replaceExisting));
    }

    /// <inheritdoc />
    public IReadOnlyList<StoredResult> Query(string? lot = null, string? wafer = null, string? model = null, string? runId = null)
    {
        var where = new List<string>();
        var values = new List<(string Name, string Value)>();
        void Filter(string column, string name, string? value)
        {
            if (value is null) return;
            where.Add($"r.{column} = {name}");
            values.Add((name, value));
        }
        Filter("lot", "@lot", lot);
        Filter("wafer", "@wafer", wafer);
        Filter("model", "@model", model);
        Filter("run_id", "@run", runId);
        string c = BinaryCollation;
        string sql = $"SELECT {SelectColumns} FROM fit_result r LEFT JOIN fit_parameter p ON p.result_id = r.id" +
            (where.Count > 0 ? " WHERE " + string.Join(" AND ", where) : "") +
            $" ORDER BY COALESCE(r.lot, ''){c}, COALESCE(r.wafer, ''){c}, r.file_path{c}, r.file_sha256{c}, r.model{c}, r.options_hash{c}, r.id, p.ordinal";
        return Read("reading results", connection =>
        {
            using var cmd = Command(connection, null, sql);
            foreach (var (name, value) in values) AddParameter(cmd, name, ColumnKind.Text, value);
            using var reader = cmd.ExecuteReader();
            return new StoredRowReader(ReadTime).ReadAll(reader);
        });
    }

    /// <inheritdoc />
    public IReadOnlyList<StoredResult> QueryKeys(IEnumerable<ResultKey> keys)
    {
        var groups = GroupKeys(keys);
        var rows = new List<StoredResult>();
        if (groups.Count == 0) return rows;
        return Read("reading results", connection =>
        {
            rows.Clear();
            foreach (var ((model, options), hashes) in groups)
            {
                var wanted = new HashSet<string>(hashes, StringComparer.Ordinal);
                for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
                {
                    int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                    string sql = $"SELECT {SelectColumns} FROM fit_result r LEFT JOIN fit_parameter p ON p.result_id = r.id " +
                                 "WHERE r.model = @m AND r.options_hash = @o AND r.file_sha256 IN (" + HashList(n) + ") ORDER BY r.id, p.ordinal";
                    using var cmd = Command(connection, null, sql);
                    AddParameter(cmd, "@m", ColumnKind.Text, model);
                    AddParameter(cmd, "@o", ColumnKind.Text, options);
                    for (int i = 0; i < n; i++) AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, hashes[start + i]);
                    using var reader = cmd.ExecuteReader();
                    rows.AddRange(new StoredRowReader(ReadTime).ReadAll(reader));
                }
            }
            return (IReadOnlyList<StoredResult>)rows;
        });
    }

    /// <inheritdoc />
    public virtual DateTimeOffset ClockUtc() => DateTimeOffset.UtcNow;

    /// <inheritdoc />
    public IReadOnlyDictionary<ResultKey, string?> Claim(IReadOnlyList<ClaimRequest> requests, WorkerIdentity worker, TimeSpan lease, DateTimeOffset? reclaimDoneBefore = null)
    {
        ArgumentNullException.ThrowIfNull(requests);
        ArgumentNullException.ThrowIfNull(worker);
        CheckLease(lease);
        var paths = new Dictionary<ResultKey, string>();
        foreach (var r in requests)
        {
            CheckKey(r.Key);
            ArgumentException.ThrowIfNullOrEmpty(r.FilePath, nameof(requests));
            paths[r.Key] = r.FilePath;
        }
        var granted = new Dictionary<ResultKey, string?>();
        if (paths.Count == 0) return granted;
        var groups = GroupKeys(paths.Keys);
        return InWriteTransaction("claiming files", (connection, transaction) =>
        {
            granted.Clear();
            foreach (var ((model, options), hashes) in groups)
            {
                for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
                {
                    int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                    var sql = new StringBuilder(
                        "INSERT INTO work_claim (file_sha256, model, options_hash, file_path, state, claimed_by, claimed_at, lease_expires_at, done_at, taken_over_from) VALUES ");
                    for (int i = 0; i < n; i++)
                    {
                        string k = i.ToString(Inv);
                        sql.Append(i == 0 ? "" : ", ").Append("(@h").Append(k).Append(", @m, @o, @p").Append(k)
                           .Append(", 'claimed', @by, ").Append(NowSql).Append(", ").Append(LeaseEndSql).Append(", NULL, NULL)");
                    }
                    sql.Append(" ON CONFLICT (file_sha256, model, options_hash) DO UPDATE SET file_path = excluded.file_path, state = 'claimed', " +
                               "claimed_by = excluded.claimed_by, claimed_at = excluded.claimed_at, lease_expires_at = excluded.lease_expires_at, done_at = NULL, " +
                               // The worker whose lapsed claim is taken over (null when the claim is new, renewed or of a done file).
                               "taken_over_from = CASE WHEN work_claim.state = 'claimed' AND work_claim.claimed_by <> excluded.claimed_by THEN work_claim.claimed_by END " +
                               "WHERE (work_claim.state = 'claimed' AND (work_claim.lease_expires_at < ").Append(NowSql)
                       .Append(" OR work_claim.claimed_by = excluded.claimed_by)) OR (work_claim.state = 'done' AND work_claim.done_at < @since) RETURNING file_sha256, taken_over_from");
                    using var cmd = Command(connection, transaction, sql.ToString());
                    AddParameter(cmd, "@m", ColumnKind.Text, model);
                    AddParameter(cmd, "@o", ColumnKind.Text, options);
                    AddParameter(cmd, "@by", ColumnKind.Text, worker.ClaimedBy);
                    AddParameter(cmd, "@since", ColumnKind.Time, reclaimDoneBefore is DateTimeOffset t ? TimeValue(t) : null);
                    AddClock(cmd, now: true, lease);
                    for (int i = 0; i < n; i++)
                    {
                        string h = hashes[start + i];
                        AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, h);
                        AddParameter(cmd, "@p" + i.ToString(Inv), ColumnKind.Text, paths[new ResultKey(h, model, options)]);
                    }
                    using var reader = cmd.ExecuteReader();
                    while (reader.Read()) granted[new ResultKey(reader.GetString(0), model, options)] = reader.IsDBNull(1) ? null : reader.GetString(1);
                }
            }
            return (IReadOnlyDictionary<ResultKey, string?>)granted;
        });
    }

    /// <inheritdoc />
    public IReadOnlyDictionary<ResultKey, ClaimInfo> Claims(IEnumerable<ResultKey> keys)
    {
        var groups = GroupKeys(keys);
        var found = new Dictionary<ResultKey, ClaimInfo>();
        if (groups.Count == 0) return found;
        return Read("reading claims", connection =>
        {
            found.Clear();
            foreach (var ((model, options), hashes) in groups)
            {
                for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
                {
                    int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                    using var cmd = Command(connection, null,
                        "SELECT file_sha256, file_path, state, claimed_by, claimed_at, lease_expires_at, done_at, taken_over_from FROM work_claim " +
                        "WHERE model = @m AND options_hash = @o AND file_sha256 IN (" + HashList(n) + ")");
                    AddParameter(cmd, "@m", ColumnKind.Text, model);
                    AddParameter(cmd, "@o", ColumnKind.Text, options);
                    for (int i = 0; i < n; i++) AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, hashes[start + i]);
                    using var reader = cmd.ExecuteReader();
                    while (reader.Read())
                    {
                        var key = new ResultKey(reader.GetString(0), model, options);
                        var state = reader.GetString(2) == "done" ? ClaimState.Done : ClaimState.Claimed;
                        found[key] = new ClaimInfo(key, reader.GetString(1), state, reader.GetString(3), ReadTime(reader, 4), ReadTime(reader, 5),
                            reader.IsDBNull(6) ? null : ReadTime(reader, 6), reader.IsDBNull(7) ? null : reader.GetString(7));
                    }
                }
            }
            return (IReadOnlyDictionary<ResultKey, ClaimInfo>)found;
        });
    }

    /// <inheritdoc />
    public int RenewClaims(WorkerIdentity worker, TimeSpan lease)
    {
        ArgumentNullException.ThrowIfNull(worker);
        CheckLease(lease);
        return InWriteTransaction("renewing claims", (connection, transaction) =>
        {
            using var cmd = Command(connection, transaction,
                $"UPDATE work_claim SET lease_expires_at = {LeaseEndSql} WHERE claimed_by = @by AND state = 'claimed'");
            AddParameter(cmd, "@by", ColumnKind.Text, worker.ClaimedBy);
            AddClock(cmd, now: LeaseEndSql.Contains(NowSql, StringComparison.Ordinal), lease);
            return cmd.ExecuteNonQuery();
        });
    }

    /// <inheritdoc />
    public int ReleaseClaims(WorkerIdentity worker, IEnumerable<ResultKey>? keys = null)
    {
        ArgumentNullException.ThrowIfNull(worker);
        var groups = keys is null ? null : GroupKeys(keys);
        if (groups is { Count: 0 }) return 0;
        return InWriteTransaction("releasing claims", (connection, transaction) =>
        {
            const string Delete = "DELETE FROM work_claim WHERE claimed_by = @by AND state = 'claimed'";
            if (groups is null)
            {
                using var all = Command(connection, transaction, Delete);
                AddParameter(all, "@by", ColumnKind.Text, worker.ClaimedBy);
                return all.ExecuteNonQuery();
            }
            int released = 0;
            foreach (var ((model, options), hashes) in groups)
            {
                for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
                {
                    int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                    using var cmd = Command(connection, transaction, Delete + " AND model = @m AND options_hash = @o AND file_sha256 IN (" + HashList(n) + ")");
                    AddParameter(cmd, "@by", ColumnKind.Text, worker.ClaimedBy);
                    AddParameter(cmd, "@m", ColumnKind.Text, model);
                    AddParameter(cmd, "@o", ColumnKind.Text, options);
                    for (int i = 0; i < n; i++) AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, hashes[start + i]);
                    released += cmd.ExecuteNonQuery();
                }
            }
            return released;
        });
    }

    /// <inheritdoc />
    public IReadOnlyList<ResultKey> StoreClaimed(IReadOnlyList<StoredResult> results, WorkerIdentity worker, bool replaceExisting = true)
    {
        ArgumentNullException.ThrowIfNull(results);
        ArgumentNullException.ThrowIfNull(worker);
        ObjectDisposedException.ThrowIf(_disposed, this);
        var byKey = new Dictionary<ResultKey, StoredResult>(results.Count);
        foreach (var r in results)
        {
            ArgumentNullException.ThrowIfNull(r, nameof(results));
            byKey[r.Key] = r;
        }
        if (byKey.Count == 0) return [];
        var groups = GroupKeys(byKey.Keys);
        return InWriteTransaction("storing claimed results", (connection, transaction) =>
        {
            // First complete the claims this worker still holds; a file whose claim another worker took over is left to it.
            var held = new List<StoredResult>(byKey.Count);
            foreach (var ((model, options), hashes) in groups)
            {
                for (int start = 0; start < hashes.Count; start += KeyQueryChunk)
                {
                    int n = Math.Min(KeyQueryChunk, hashes.Count - start);
                    using var cmd = Command(connection, transaction,
                        $"UPDATE work_claim SET state = 'done', done_at = {NowSql} WHERE claimed_by = @by AND state = 'claimed' " +
                        "AND model = @m AND options_hash = @o AND file_sha256 IN (" + HashList(n) + ") RETURNING file_sha256");
                    AddParameter(cmd, "@by", ColumnKind.Text, worker.ClaimedBy);
                    AddParameter(cmd, "@m", ColumnKind.Text, model);
                    AddParameter(cmd, "@o", ColumnKind.Text, options);
                    AddClock(cmd, now: true, null);
                    for (int i = 0; i < n; i++) AddParameter(cmd, "@h" + i.ToString(Inv), ColumnKind.Text, hashes[start + i]);
                    using var reader = cmd.ExecuteReader();
                    while (reader.Read()) held.Add(byKey[new ResultKey(reader.GetString(0), model, options)]);
                }
            }
            held.Sort((a, b) => CompareKeys(a.Key, b.Key));
            WriteChunk(connection, transaction, held, replaceExisting);
            return (IReadOnlyList<ResultKey>)[.. held.Select(r => r.Key)];
        });
    }

    /// <inheritdoc />
    public long Count() => Read("counting results", connection =>
    {
        using var cmd = Command(connection, null, "SELECT COUNT(*) FROM fit_result");
        return Convert.ToInt64(cmd.ExecuteScalar(), Inv);
    });

    /// <inheritdoc />
    public IReadOnlyList<string> CheckConsistency() => Read("checking the database", connection =>
    {
        var problems = new List<string>();
        EngineChecks(connection, problems);
        using (var cmd = Command(connection, null, "SELECT COALESCE(MAX(version), 0) FROM schema_version"))
        {
            int version = Convert.ToInt32(cmd.ExecuteScalar(), Inv);
            if (version != Migrations.Latest) problems.Add(string.Create(Inv, $"schema version is {version}, expected {Migrations.Latest}"));
        }
        using (var cmd = Command(connection, null,
            "SELECT r.file_path, r.parameter_count, COUNT(p.result_id) FROM fit_result r LEFT JOIN fit_parameter p ON p.result_id = r.id " +
            "GROUP BY r.id, r.file_path, r.parameter_count HAVING COUNT(p.result_id) <> r.parameter_count"))
        using (var reader = cmd.ExecuteReader())
        {
            while (reader.Read())
            {
                problems.Add(string.Create(Inv,
                    $"result for '{reader.GetString(0)}' has {reader.GetInt64(2)} parameter rows, stored with {reader.GetInt32(1)}"));
            }
        }
        using (var cmd = Command(connection, null,
            "SELECT file_sha256, model, options_hash, COUNT(*) FROM fit_result GROUP BY file_sha256, model, options_hash HAVING COUNT(*) > 1"))
        using (var reader = cmd.ExecuteReader())
        {
            while (reader.Read())
            {
                problems.Add(string.Create(Inv, $"key {reader.GetString(0)}/{reader.GetString(1)}/{reader.GetString(2)} occurs {reader.GetInt64(3)} times"));
            }
        }
        using (var cmd = Command(connection, null,
            "SELECT COUNT(*) FROM fit_parameter p WHERE NOT EXISTS (SELECT 1 FROM fit_result r WHERE r.id = p.result_id)"))
        {
            long orphans = Convert.ToInt64(cmd.ExecuteScalar(), Inv);
            if (orphans > 0) problems.Add(string.Create(Inv, $"{orphans} parameter rows belong to no result"));
        }
        return (IReadOnlyList<string>)problems;
    });

    /// <summary>Releases the connection or the connection pool.</summary>
    public void Dispose()
    {
        if (_disposed) return;
        _disposed = true;
        Dispose(true);
        GC.SuppressFinalize(this);
    }

    /// <summary>Releases engine resources.</summary>
    /// <param name="disposing">True from <see cref="Dispose()"/>.</param>
    protected abstract void Dispose(bool disposing);

    /// <summary>A command on <paramref name="connection"/> in <paramref name="transaction"/> (which may be null).</summary>
    protected static DbCommand Command(DbConnection connection, DbTransaction? transaction, string sql)
    {
        var cmd = connection.CreateCommand();
        cmd.Transaction = transaction;
        // CA2100: every caller passes SQL built from this class's constants; values go in as parameters.
#pragma warning disable CA2100
        cmd.CommandText = sql;
#pragma warning restore CA2100
        return cmd;
    }

    /// <summary>Runs one statement without results.</summary>
    protected static void Execute(DbConnection connection, DbTransaction? transaction, string sql)
    {
        using var cmd = Command(connection, transaction, sql);
        cmd.ExecuteNonQuery();
    }

    /// <summary>Adds a typed parameter (null becomes SQL NULL).</summary>
    protected DbParameter AddParameter(DbCommand command, string name, ColumnKind kind, object? value)
    {
        var p = command.CreateParameter();
        p.ParameterName = name;
        p.DbType = ParameterType(kind);
        p.Value = value ?? DBNull.Value;
        command.Parameters.Add(p);
        return p;
    }

    private int WriteChunk(DbConnection connection, DbTransaction transaction, List<StoredResult> ordered, bool replaceExisting)
    {
        using var upsert = Command(connection, transaction, replaceExisting ? UpsertSql : InsertIfAbsentSql);
        var p = new DbParameter[ResultColumns.Length];
        for (int i = 0; i < ResultColumns.Length; i++) p[i] = AddParameter(upsert, "@" + ResultColumns[i].Name, ResultColumns[i].Kind, null);
        var children = new Dictionary<int, (DbCommand Command, DbParameter Id, DbParameter[] Values)>();
        try
        {
            var storedUtc = DateTimeOffset.UtcNow;
            int written = 0;
            foreach (var row in ordered)
            {
                var r = row.Result;
                for (int i = 0; i < ResultColumns.Length; i++)
                {
                    object? value = ResultColumns[i].Value(row, storedUtc);
                    p[i].Value = value is DateTimeOffset time ? TimeValue(time) : value ?? DBNull.Value;
                }
                object? id = upsert.ExecuteScalar();
                if (id is null || id is DBNull) continue;
                written++;
                int n = r.Parameters.Length;
                if (!children.TryGetValue(n, out var child))
                {
                    child = ChildCommand(connection, transaction, n);
                    children.Add(n, child);
                }
                child.Id.Value = Convert.ToInt64(id, Inv);
                int f = 0;
                for (int j = 0; j < n; j++)
                {
                    var e = r.Parameters[j];
                    child.Values[f++].Value = j;
                    child.Values[f++].Value = e.Key;
                    child.Values[f++].Value = e.Symbol;
                    child.Values[f++].Value = e.Unit;
                    child.Values[f++].Value = StoredColumnCodecs.Finite(e.Value) ?? (object)DBNull.Value;
                    child.Values[f++].Value = StoredColumnCodecs.Finite(e.StandardError) ?? (object)DBNull.Value;
                    child.Values[f++].Value = StoredColumnCodecs.Finite(e.Lower95) ?? (object)DBNull.Value;
                    child.Values[f++].Value = StoredColumnCodecs.Finite(e.Upper95) ?? (object)DBNull.Value;
                    child.Values[f++].Value = e.IsFixed;
                }
                child.Command.ExecuteNonQuery();
            }
            return written;
        }
        finally
        {
            foreach (var c in children.Values) c.Command.Dispose();
        }
    }

    /// <summary>"Delete this result's parameter rows, insert <paramref name="count"/> new ones" as one command.</summary>
    private (DbCommand, DbParameter, DbParameter[]) ChildCommand(DbConnection connection, DbTransaction transaction, int count)
    {
        var sql = new StringBuilder("DELETE FROM fit_parameter WHERE result_id = @rid");
        if (count > 0)
        {
            sql.Append("; INSERT INTO fit_parameter (result_id, ")
               .Append(string.Join(", ", StoredColumns.Parameter.Select(c => c.Name)))
               .Append(") VALUES ");
            for (int j = 0; j < count; j++)
            {
                sql.Append(j == 0 ? "(@rid" : ", (@rid");
                foreach (var c in StoredColumns.Parameter) sql.Append(", @").Append(c.Name).Append(j.ToString(Inv));
                sql.Append(')');
            }
        }
        var cmd = Command(connection, transaction, sql.ToString());
        var id = AddParameter(cmd, "@rid", ColumnKind.Int, null);
        id.DbType = DbType.Int64;
        var values = new DbParameter[count * StoredColumns.Parameter.Length];
        int f = 0;
        for (int j = 0; j < count; j++)
        {
            foreach (var c in StoredColumns.Parameter) values[f++] = AddParameter(cmd, "@" + c.Name + j.ToString(Inv), c.Kind, null);
        }
        return (cmd, id, values);
    }

    private T Read<T>(string what, Func<DbConnection, T> work)
    {
        ObjectDisposedException.ThrowIf(_disposed, this);
        return _retry.Run(what, () =>
        {
            using var lease = Lease();
            return work(lease.Connection);
        });
    }

    private T InWriteTransaction<T>(string what, Func<DbConnection, DbTransaction, T> work)
    {
        ObjectDisposedException.ThrowIf(_disposed, this);
        return _retry.Run(what, () =>
        {
            using var lease = Lease();
            using var transaction = BeginWrite(lease.Connection);
            try
            {
                T value = work(lease.Connection, transaction);
                transaction.Commit();
                return value;
            }
            catch
            {
                TransientRetry.TryRollback(transaction);
                throw;
            }
        });
    }

    private ResultStoreException Wrap(string what, DbException e)
        => new($"{Description}: {what} failed: {ConnectionStrings.Redact(e.Message)}", e);

    private static void CheckKey(ResultKey key)
    {
        if (key.Model is null) throw new ArgumentException("the key is empty (default)", nameof(key));
    }

    private static void CheckLease(TimeSpan lease) => Guard.Duration(lease, TimeSpan.FromDays(1));

    private static int CompareKeys(ResultKey a, ResultKey b)
    {
        int c = string.CompareOrdinal(a.FileSha256, b.FileSha256);
        if (c == 0) c = string.CompareOrdinal(a.Model, b.Model);
        return c != 0 ? c : string.CompareOrdinal(a.OptionsHash, b.OptionsHash);
    }

    /// <summary>Keys grouped by (model, options hash), file hashes sorted and distinct in each group (a fixed lock order).</summary>
    private static List<KeyValuePair<(string Model, string Options), List<string>>> GroupKeys(IEnumerable<ResultKey> keys)
    {
        ArgumentNullException.ThrowIfNull(keys);
        var groups = new Dictionary<(string, string), SortedSet<string>>();
        foreach (var k in keys)
        {
            CheckKey(k);
            if (!groups.TryGetValue((k.Model, k.OptionsHash), out var set))
            {
                set = new SortedSet<string>(StringComparer.Ordinal);
                groups.Add((k.Model, k.OptionsHash), set);
            }
            set.Add(k.FileSha256);
        }
        return [.. groups.OrderBy(g => g.Key.Item1, StringComparer.Ordinal).ThenBy(g => g.Key.Item2, StringComparer.Ordinal)
            .Select(g => new KeyValuePair<(string, string), List<string>>(g.Key, [.. g.Value]))];
    }

    /// <summary><c>@h0, @h1, …</c> for <paramref name="n"/> hashes.</summary>
    private static string HashList(int n)
    {
        var sb = new StringBuilder(n * 6);
        for (int i = 0; i < n; i++) sb.Append(i == 0 ? "@h" : ", @h").Append(i.ToString(Inv));
        return sb.ToString();
    }


}
