using JunctionFit.Physics;

namespace JunctionFit.Cli.Support;

/// <summary>Maps <c>--model</c> names to barrier models (the catalogue in Physics).</summary>
public static class ModelResolver
{
    /// <summary>Model names accepted by <c>--model</c>.</summary>
    public static IReadOnlyList<string> Names => BarrierModelCatalog.Names;

    /// <summary>The barrier model for a name.</summary>
    /// <exception cref="UsageException">Unknown name or bad option.</exception>
    public static IBarrierModel Resolve(string name, BarrierModelOptions? options = null)
    {
        foreach (string known in Names)
        {
            if (string.Equals(known, name, StringComparison.OrdinalIgnoreCase)) return BarrierModelCatalog.Create(known, options);
        }
        throw new UsageException($"--model: unknown model '{name}'; choose one of: {string.Join(", ", Names)}");
    }
}
