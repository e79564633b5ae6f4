using System.Globalization;

namespace JunctionFit.Storage;

/// <summary>
/// Who fits: one batch process. <see cref="FittedBy"/> is what each stored result records (<c>host:pid</c>, or
/// <c>NAME@host:pid</c> with a worker name); <see cref="ClaimedBy"/> adds a random instance id, so that a restarted process
/// that happens to get the same pid never mistakes its dead predecessor's claims for its own.
/// </summary>
public sealed record WorkerIdentity
{
    /// <summary>Creates an identity.</summary>
    /// <param name="name">Optional worker name (letters, digits, <c>-</c>, <c>_</c>, <c>.</c>; at most 64 characters); null for none.</param>
    /// <param name="host">Machine name.</param>
    /// <param name="processId">Process id.</param>
    /// <param name="instanceId">Random id of this process instance (8 lowercase hexadecimal digits).</param>
    /// <exception cref="ArgumentException">A part is empty or malformed.</exception>
    public WorkerIdentity(string? name, string host, int processId, string instanceId)
    {
        if (name is not null) CheckName(name);
        ArgumentException.ThrowIfNullOrWhiteSpace(host);
        ArgumentException.ThrowIfNullOrWhiteSpace(instanceId);
        if (host.Length > 200) throw new ArgumentException("at most 200 characters", nameof(host));
        if (instanceId.Length > 32) throw new ArgumentException("at most 32 characters", nameof(instanceId));
        Name = name;
        Host = host;
        ProcessId = processId;
        InstanceId = instanceId;
    }

    /// <summary>The worker name given with <c>--worker-name</c>, or null.</summary>
    public string? Name { get; }

    /// <summary>Machine name.</summary>
    public string Host { get; }

    /// <summary>Process id.</summary>
    public int ProcessId { get; }

    /// <summary>Random id of this process instance.</summary>
    public string InstanceId { get; }

    /// <summary>The text stored as <c>fitted_by</c>: <c>host:pid</c> or <c>NAME@host:pid</c>.</summary>
    public string FittedBy => (Name is null ? "" : Name + "@") + Host + ":" + ProcessId.ToString(CultureInfo.InvariantCulture);

    /// <summary>The text stored as <c>claimed_by</c>: <see cref="FittedBy"/>, <c>#</c>, the instance id.</summary>
    public string ClaimedBy => FittedBy + "#" + InstanceId;

    /// <summary>This process on this machine, with a fresh instance id.</summary>
    /// <param name="name">Optional worker name (see the constructor).</param>
    /// <returns>The identity.</returns>
    /// <exception cref="ArgumentException"><paramref name="name"/> is malformed.</exception>
    public static WorkerIdentity Current(string? name = null)
        => new(name, Environment.MachineName, Environment.ProcessId, Guid.NewGuid().ToString("N")[..8]);

    /// <summary>Checks a worker name: 1 to 64 characters, each a letter, digit, <c>-</c>, <c>_</c> or <c>.</c>.</summary>
    /// <param name="name">The name.</param>
    /// <exception cref="ArgumentException">The name is empty, too long, or has another character.</exception>
    public static void CheckName(string name)
    {
        ArgumentException.ThrowIfNullOrWhiteSpace(name);
        if (name.Length > 64) throw new ArgumentException($"'{name}' is longer than 64 characters", nameof(name));
        foreach (char c in name)
        {
            if (!(char.IsAsciiLetterOrDigit(c) || c is '-' or '_' or '.'))
            {
                throw new ArgumentException($"'{name}' has '{c}'; use letters, digits, '-', '_' and '.'", nameof(name));
            }
        }
    }

    /// <inheritdoc />
    public override string ToString() => ClaimedBy;
}

/// <summary>A file a worker asks to fit: the key of its result and its path (stored for people reading the claims table).</summary>
/// <param name="Key">The result identity.</param>
/// <param name="FilePath">The file as given on the command line.</param>
public readonly record struct ClaimRequest(ResultKey Key, string FilePath);

/// <summary>State of a claim row.</summary>
public enum ClaimState
{
    /// <summary>A worker holds the file until <see cref="ClaimInfo.LeaseExpiresUtc"/>.</summary>
    Claimed,

    /// <summary>The result is stored (the claim was completed in the same transaction).</summary>
    Done,
}

/// <summary>One row of the claims table (<c>work_claim</c>).</summary>
/// <param name="Key">The result identity.</param>
/// <param name="FilePath">The path the claiming worker was given.</param>
/// <param name="State">Claimed or done.</param>
/// <param name="ClaimedBy">The worker (<see cref="WorkerIdentity.ClaimedBy"/>) that claimed it last.</param>
/// <param name="ClaimedUtc">When it was claimed (database clock).</param>
/// <param name="LeaseExpiresUtc">When the claim may be taken over unless renewed (database clock).</param>
/// <param name="DoneUtc">When it was completed; null while claimed.</param>
/// <param name="TakenOverFrom">The worker whose lapsed claim <paramref name="ClaimedBy"/> took over; null when it claimed a free file.</param>
public sealed record ClaimInfo(ResultKey Key, string FilePath, ClaimState State, string ClaimedBy, DateTimeOffset ClaimedUtc,
    DateTimeOffset LeaseExpiresUtc, DateTimeOffset? DoneUtc, string? TakenOverFrom);
