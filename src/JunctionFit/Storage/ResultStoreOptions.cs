using JunctionFit.Common;

namespace JunctionFit.Storage;

/// <summary>How a results database is opened.</summary>
public sealed record ResultStoreOptions
{
    /// <summary>How long a writer waits for another writer's lock before giving up (SQLite busy timeout; PostgreSQL
    /// command timeout). Default 60 s.</summary>
    public TimeSpan BusyTimeout
    {
        get;
        init => field = Guard.Duration(value, TimeSpan.FromHours(1));
    } = TimeSpan.FromSeconds(60);

    /// <summary>How often a chunk whose transaction failed on a lock, a deadlock or a serialization conflict is tried again
    /// (so at most 1 + this many attempts). Default 5.</summary>
    public int TransientRetries
    {
        get;
        init => field = Guard.InRange(value, 0, 100);
    } = 5;

    /// <summary>Default options.</summary>
    public static ResultStoreOptions Default { get; } = new();
}
