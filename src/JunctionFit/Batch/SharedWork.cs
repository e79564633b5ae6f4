using System.Globalization;
using JunctionFit.Storage;

namespace JunctionFit.Batch;

/// <summary>
/// How a batch with a database shares a lot with other batch processes on the same database (docs/database.md, "Several
/// workers on one lot"). Files are walked in input order in blocks (an eighth of the lot, 64 to <see cref="MaxBlock"/>
/// files); before a block is fitted its files are claimed (<see cref="IResultStore.Claim"/>) in one transaction, only the
/// granted ones are fitted, and the block's results are stored with their claims marked done in one transaction — two
/// transactions per block, fewer than a batch without claims had per 100 files. Files held by another worker are deferred; when the walk is
/// over, the worker takes the deferred files from the database as the others store them, and takes over any whose
/// lease expired (a worker that died). A heartbeat thread renews this worker's leases. With one worker every file is
/// granted, so the order of work and the output are those of a batch without claims.
/// </summary>
public sealed class SharedWork
{
    /// <summary>The most files claimed and stored per transaction.</summary>
    public const int MaxBlock = 256;

    /// <summary>The default lease.</summary>
    public static readonly TimeSpan DefaultLease = TimeSpan.FromSeconds(30);

    /// <summary>Leases without a finished file after which the heartbeat stops renewing: a worker whose fitting thread hangs
    /// (a frozen file store) lets its claims lapse even though its heartbeat thread still runs.</summary>
    public const int StallLeases = 10;

    private readonly IResultStore _store;
    private readonly WorkerIdentity _worker;
    private readonly TimeSpan _lease;
    private readonly bool _force;
    private readonly IReadOnlyList<string> _files;
    private readonly ResultKey?[] _keys;
    private readonly TextWriter _error;
    private readonly int _block;
    private long _lastProgressTicks = Environment.TickCount64;

    /// <summary>Creates the work of one batch.</summary>
    /// <param name="store">The database.</param>
    /// <param name="worker">This worker.</param>
    /// <param name="lease">How long a claim holds without renewal.</param>
    /// <param name="force">Refit stored results (claims completed before this worker started are taken again).</param>
    /// <param name="files">The input files.</param>
    /// <param name="keys">Their result keys (null: the file could not be hashed).</param>
    /// <param name="error">Where messages go.</param>
    public SharedWork(IResultStore store, WorkerIdentity worker, TimeSpan lease, bool force, IReadOnlyList<string> files, ResultKey?[] keys, TextWriter error)
    {
        _store = store;
        _worker = worker;
        _lease = lease;
        _force = force;
        _files = files;
        _keys = keys;
        _error = error;
        Claimed = new bool[files.Count];
        _block = Math.Clamp(files.Count / 8, 64, MaxBlock);
    }

    /// <summary>True for the files this worker claimed and fitted: their results are to be stored.</summary>
    public bool[] Claimed { get; }

    /// <summary>Files taken over from a worker whose lease had expired.</summary>
    public int TakenOver { get; private set; }

    /// <summary>Files stored by other workers and taken from the database.</summary>
    public int FromOthers { get; private set; }

    /// <summary>
    /// Runs the batch: <paramref name="process"/> fits (or takes from the store) file k, <paramref name="consume"/> receives
    /// every file's outcome once (in input order within a chunk; deferred files later), <paramref name="flush"/> stores what
    /// was consumed.
    /// </summary>
    /// <param name="isLocal">True for files fitted here without a claim (not hashable, a repeat of an earlier file's
    /// content, or already stored and not refitted).</param>
    /// <param name="process">Fits file k.</param>
    /// <param name="jobs">Parallel fits.</param>
    /// <param name="consume">Takes file k's outcome.</param>
    /// <param name="flush">Stores the results consumed so far (claims done in the same transaction).</param>
    /// <param name="openHeartbeatStore">Opens a second connection to the database for the heartbeat thread.</param>
    public void Run(Func<int, bool> isLocal, Func<int, CurveOutcome> process, int jobs, Action<int, CurveOutcome> consume, Action flush,
        Func<IResultStore> openHeartbeatStore)
    {
        DateTimeOffset? since = _force ? _store.ClockUtc() : null;
        var seen = new HashSet<ResultKey>();
        var local = new bool[_files.Count];
        for (int k = 0; k < _files.Count; k++)
        {
            local[k] = isLocal(k) || _keys[k] is not ResultKey key || !seen.Add(key);
        }
        var deferred = new List<int>();
        using var heartbeat = new Heartbeat(openHeartbeatStore, _worker, _lease, _error,
            () => TimeSpan.FromMilliseconds(Environment.TickCount64 - Interlocked.Read(ref _lastProgressTicks)) < _lease * StallLeases);
        try
        {
            var todo = new List<int>(_block);
            for (int start = 0; start < _files.Count; start += _block)
            {
                int end = Math.Min(_files.Count, start + _block);
                var want = new List<int>(_block);
                for (int k = start; k < end; k++) if (!local[k]) want.Add(k);
                var granted = Grant(want, since);
                todo.Clear();
                for (int k = start; k < end; k++)
                {
                    if (local[k] || granted.Contains(_keys[k]!.Value)) todo.Add(k);
                    else deferred.Add(k);
                }
                Fit(todo, process, jobs, consume, flush);
            }
            if (deferred.Count > 0) Finish(deferred, since, process, jobs, consume, flush);
        }
        finally
        {
            heartbeat.Dispose();
            try
            {
                _store.ReleaseClaims(_worker);
            }
            catch (ResultStoreException e)
            {
                _error.WriteLine($"junctionfit batch: warning: could not release this worker's claims ({e.Message}); they lapse after the lease");
            }
        }
    }

    /// <summary>Claims the files of <paramref name="indices"/>; without --force, gives back those already stored.</summary>
    private HashSet<ResultKey> Grant(List<int> indices, DateTimeOffset? since)
    {
        var granted = new HashSet<ResultKey>();
        if (indices.Count == 0) return granted;
        Touch();
        var requests = indices.Select(k => new ClaimRequest(_keys[k]!.Value, _files[k])).ToList();
        foreach (var (key, from) in _store.Claim(requests, _worker, _lease, since))
        {
            granted.Add(key);
            if (from is not null) TakenOver++;
        }
        if (!_force && granted.Count > 0)
        {
            // Stored since this worker looked (by another worker, or by a batch without claims): not fitted again.
            var stored = _store.ExistingKeys(granted);
            if (stored.Count > 0)
            {
                _store.ReleaseClaims(_worker, stored);
                granted.ExceptWith(stored);
            }
        }
        foreach (int k in indices) if (granted.Contains(_keys[k]!.Value)) Claimed[k] = true;
        return granted;
    }

    private void Fit(List<int> todo, Func<int, CurveOutcome> process, int jobs, Action<int, CurveOutcome> consume, Action flush)
    {
        if (todo.Count == 0) return;
        var chunk = todo.ToArray();
        CurvePipeline.Run(chunk.Length, j =>
        {
            var outcome = process(chunk[j]);
            Touch();
            return outcome;
        }, jobs, (j, outcome) => consume(chunk[j], outcome));
        flush();
    }

    private void Touch() => Interlocked.Exchange(ref _lastProgressTicks, Environment.TickCount64);

    /// <summary>The files other workers held: take them from the database as they are stored, or take over expired claims.</summary>
    private void Finish(List<int> deferred, DateTimeOffset? since, Func<int, CurveOutcome> process, int jobs, Action<int, CurveOutcome> consume, Action flush)
    {
        var poll = TimeSpan.FromTicks(Math.Clamp(_lease.Ticks / 4, TimeSpan.FromMilliseconds(100).Ticks, TimeSpan.FromSeconds(2).Ticks));
        _error.WriteLine(string.Create(CultureInfo.InvariantCulture,
            $"junctionfit batch: {deferred.Count} files are claimed by other workers; waiting for their results (claims lapse {_lease.TotalSeconds:0.###} s after a worker stops renewing them)"));
        while (deferred.Count > 0)
        {
            var keys = deferred.Select(k => _keys[k]!.Value).ToList();
            HashSet<ResultKey> finished;
            if (!_force)
            {
                finished = [.. _store.ExistingKeys(keys)];
            }
            else
            {
                finished = [.. _store.Claims(keys).Values.Where(c => c.State == ClaimState.Done && c.DoneUtc >= since).Select(c => c.Key)];
            }
            if (finished.Count > 0)
            {
                var ready = deferred.Where(k => finished.Contains(_keys[k]!.Value)).ToList();
                var rows = _store.QueryKeys(ready.Select(k => _keys[k]!.Value)).ToDictionary(r => r.Key);
                foreach (int k in ready)
                {
                    if (!rows.TryGetValue(_keys[k]!.Value, out var row)) continue; // deleted meanwhile: stays deferred
                    consume(k, new CurveOutcome(_files[k], row.Result with { SourcePath = _files[k] }, null) { FromStore = true });
                    FromOthers++;
                    deferred.Remove(k);
                }
                continue;
            }

            var granted = Grant(deferred, since);
            if (granted.Count == 0 && !_force)
            {
                // Done claims whose result is gone (deleted by hand): nobody will store them, so take them again.
                var claims = _store.Claims(keys);
                var lost = deferred.Where(k => claims.TryGetValue(_keys[k]!.Value, out var c) && c.State == ClaimState.Done).ToList();
                if (lost.Count > 0) granted = Grant(lost, _store.ClockUtc());
            }
            if (granted.Count > 0)
            {
                var todo = deferred.Where(k => granted.Contains(_keys[k]!.Value)).ToList();
                deferred.RemoveAll(k => granted.Contains(_keys[k]!.Value));
                Fit(todo, process, jobs, consume, flush);
                continue;
            }
            Thread.Sleep(poll);
        }
    }

    /// <summary>Renews this worker's leases every third of the lease, on a thread and a connection of its own, while
    /// <c>alive</c> says the fitting threads make progress.</summary>
    private sealed class Heartbeat : IDisposable
    {
        private readonly ManualResetEventSlim _stop = new(false);
        private readonly Thread _thread;
        private bool _disposed;

        public Heartbeat(Func<IResultStore> open, WorkerIdentity worker, TimeSpan lease, TextWriter error, Func<bool> alive)
        {
            var interval = lease / 3;
            _thread = new Thread(() =>
            {
                IResultStore? store = null;
                bool warned = false;
                try
                {
                    while (!_stop.Wait(interval))
                    {
                        if (!alive()) continue;
                        try
                        {
                            store ??= open();
                            store.RenewClaims(worker, lease);
                            warned = false;
                        }
                        catch (Exception e) when (e is ResultStoreException or ArgumentException)
                        {
                            if (!warned) error.WriteLine($"junctionfit batch: warning: could not renew this worker's claims: {e.Message}");
                            warned = true;
                        }
                    }
                }
                finally
                {
                    store?.Dispose();
                }
            })
            {
                IsBackground = true,
                Name = "junctionfit claim heartbeat",
            };
            _thread.Start();
        }

        public void Dispose()
        {
            if (_disposed) return;
            _disposed = true;
            _stop.Set();
            _thread.Join();
            _stop.Dispose();
        }
    }
}
