using JunctionFit.Physics;

namespace JunctionFit.Cli;

/// <summary>Maps <c>--model</c> names to barrier models.</summary>
public static class ModelResolver
{
    /// <summary>Model names accepted by <c>--model</c>.</summary>
    public static IReadOnlyList<string> Names { get; } = ["simmons"];

    /// <summary>The barrier model for a name.</summary>
    /// <exception cref="UsageException">Unknown name.</exception>
    public static IBarrierModel Resolve(string name)
    {
        return name switch
        {
            "simmons" => SimmonsRectangularModel.Instance,
            _ => throw new UsageException($"--model: unknown model '{name}'; choose one of: {string.Join(", ", Names)}"),
        };
    }
}
