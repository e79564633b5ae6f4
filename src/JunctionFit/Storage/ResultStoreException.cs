namespace JunctionFit.Storage;

/// <summary>
/// The results database could not be opened, migrated, read or written. The message says what went wrong in words
/// a user can act on and never contains a password.
/// </summary>
public sealed class ResultStoreException : Exception
{
    /// <summary>Creates the exception.</summary>
    public ResultStoreException()
    {
    }

    /// <summary>Creates the exception with a message.</summary>
    /// <param name="message">What went wrong.</param>
    public ResultStoreException(string message) : base(message)
    {
    }

    /// <summary>Creates the exception with a message and its cause.</summary>
    /// <param name="message">What went wrong.</param>
    /// <param name="innerException">The driver's exception.</param>
    public ResultStoreException(string message, Exception innerException) : base(message, innerException)
    {
    }
}
