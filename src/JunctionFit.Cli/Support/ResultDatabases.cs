using JunctionFit.Storage;

namespace JunctionFit.Cli.Support;

/// <summary>Opens the results database a <c>--db</c> option names; a failure is a usage error naming <c>--db</c>.</summary>
internal static class ResultDatabases
{
    /// <summary>
    /// Opens a database for a command that only reads it (results, drift, thickness): a SQLite file that does not exist is
    /// a usage error naming the path, and nothing is created (a mistyped path must not leave an empty database behind).
    /// </summary>
    public static IResultStore OpenExisting(string database)
    {
        if (!string.IsNullOrWhiteSpace(database) && ResultStore.KindOf(database) == ResultStoreKind.Sqlite && !File.Exists(database))
        {
            throw new UsageException(Directory.Exists(database)
                ? $"--db: {database} is a folder, not a results database file"
                : $"--db: no results database at {Path.GetFullPath(database)} (reading commands never create one; give the file that batch wrote)");
        }
        return Open(database);
    }

    public static IResultStore Open(string database)
    {
        try
        {
            return ResultStore.Open(database);
        }
        catch (ResultStoreException e)
        {
            throw new UsageException($"--db: {e.Message}");
        }
        catch (ArgumentException e)
        {
            throw new UsageException($"--db: {ConnectionStrings.Redact(database)}: {e.Message}");
        }
    }
}
