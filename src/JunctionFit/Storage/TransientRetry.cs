using System.Data.Common;

namespace JunctionFit.Storage;

/// <summary>
/// The retry policy of the results database: an operation that fails on a lock, a deadlock, a serialization conflict or a
/// lost connection (as the engine judges it) is run again after a growing, jittered pause, at most
/// <see cref="ResultStoreOptions.TransientRetries"/> more times; any other database failure, or the last one, is wrapped
/// once in words and thrown.
/// </summary>
internal sealed class TransientRetry(int retries, Func<Exception, bool> isTransient, Func<string, DbException, ResultStoreException> wrap)
{
    /// <summary>Runs <paramref name="attempt"/> until it succeeds, fails for good, or the retries are used up.</summary>
    /// <param name="what">What the operation does, for the message ("storing results").</param>
    /// <param name="attempt">One try of the whole operation (its own connection and transaction).</param>
    /// <exception cref="ResultStoreException">A database failure that is not transient, or the last transient one.</exception>
    public T Run<T>(string what, Func<T> attempt)
    {
        for (int tried = 0; ; tried++)
        {
            try
            {
                return attempt();
            }
            catch (Exception e) when (e is DbException && isTransient(e) && tried < retries)
            {
                Backoff(tried);
            }
            catch (DbException e)
            {
                throw wrap(what, e);
            }
        }
    }

    /// <summary>Rolls back, ignoring a transaction the engine already ended (a lost connection or an aborting error).</summary>
    public static void TryRollback(DbTransaction transaction)
    {
        try
        {
            transaction.Rollback();
        }
        catch (Exception e) when (e is DbException or InvalidOperationException)
        {
            // The engine already ended the transaction: nothing to undo.
        }
    }

    /// <summary>25 ms doubling per attempt up to 1.6 s (at most 2 s), plus up to 25 ms of jitter so that writers spread out.</summary>
    private static void Backoff(int attempt)
        => Thread.Sleep(TimeSpan.FromMilliseconds(Math.Min(2000, 25 * (1 << Math.Min(attempt, 6))) + Random.Shared.Next(25)));
}
