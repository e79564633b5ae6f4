namespace JunctionFit.Storage;

/// <summary>
/// Collects results of a streaming batch and stores them in chunks of <see cref="ChunkSize"/>, each chunk one transaction
/// (<see cref="IResultStore.StoreBatch"/>). Call <see cref="Flush"/> at the end of the batch; disposing does not store
/// what is pending (a batch that fails part-way keeps the chunks already written, and the next run completes it).
/// </summary>
public sealed class ChunkedResultWriter
{
    private readonly IResultStore _store;
    private readonly bool _replaceExisting;
    private readonly List<StoredResult> _pending;
    private readonly WorkerIdentity? _worker;

    /// <summary>Creates the writer.</summary>
    /// <param name="store">The database.</param>
    /// <param name="chunkSize">Results per transaction (1 to 100 000; default 200).</param>
    /// <param name="replaceExisting">Passed to <see cref="IResultStore.StoreBatch"/>.</param>
    /// <param name="claimsOf">When set, the results are files this worker claimed: each chunk is stored with
    /// <see cref="IResultStore.StoreClaimed"/> (results and claims done in one transaction; a result whose claim was taken
    /// over is dropped and counted in <see cref="Dropped"/>).</param>
    /// <exception cref="ArgumentNullException"><paramref name="store"/> is null.</exception>
    /// <exception cref="ArgumentOutOfRangeException"><paramref name="chunkSize"/> is out of range.</exception>
    public ChunkedResultWriter(IResultStore store, int chunkSize = 200, bool replaceExisting = true, WorkerIdentity? claimsOf = null)
    {
        _worker = claimsOf;
        ArgumentNullException.ThrowIfNull(store);
        ArgumentOutOfRangeException.ThrowIfLessThan(chunkSize, 1);
        ArgumentOutOfRangeException.ThrowIfGreaterThan(chunkSize, 100_000);
        _store = store;
        ChunkSize = chunkSize;
        _replaceExisting = replaceExisting;
        _pending = new List<StoredResult>(chunkSize);
    }

    /// <summary>Results per transaction.</summary>
    public int ChunkSize { get; }

    /// <summary>Results added and not yet stored.</summary>
    public int Pending => _pending.Count;

    /// <summary>Rows inserted or replaced so far.</summary>
    public long Written { get; private set; }

    /// <summary>Results not stored because their claim had been taken over by another worker.</summary>
    public long Dropped { get; private set; }

    /// <summary>Adds a result; stores a chunk when <see cref="ChunkSize"/> are pending.</summary>
    /// <param name="result">The result.</param>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    /// <exception cref="ResultStoreException">A chunk could not be stored (it stays pending).</exception>
    public void Add(StoredResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        _pending.Add(result);
        if (_pending.Count >= ChunkSize) Flush();
    }

    /// <summary>Stores what is pending as one chunk.</summary>
    /// <exception cref="ResultStoreException">The chunk could not be stored (it stays pending).</exception>
    public void Flush()
    {
        if (_pending.Count == 0) return;
        if (_worker is null)
        {
            Written += _store.StoreBatch(_pending, _replaceExisting);
        }
        else
        {
            int distinct = _pending.Select(r => r.Key).Distinct().Count();
            int stored = _store.StoreClaimed(_pending, _worker, _replaceExisting).Count;
            Written += stored;
            Dropped += distinct - stored;
        }
        _pending.Clear();
    }
}
