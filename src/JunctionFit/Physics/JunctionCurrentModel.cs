namespace JunctionFit.Physics;

/// <summary>
/// The measurable current of one junction: I(V) = A · J(V; θ) with A the effective conducting area in m².
/// Parameters are the barrier model's, followed by the area. Parasitic elements extend this later.
/// </summary>
public sealed class JunctionCurrentModel
{
    private readonly ParameterDefinition[] _parameters;

    /// <summary>Creates the junction model around a barrier model.</summary>
    /// <param name="barrier">The barrier model giving J(V).</param>
    public JunctionCurrentModel(IBarrierModel barrier)
    {
        ArgumentNullException.ThrowIfNull(barrier);
        Barrier = barrier;
        _parameters = [.. barrier.Parameters, StandardParameters.Area];
        AreaIndex = _parameters.Length - 1;
    }

    /// <summary>The barrier model.</summary>
    public IBarrierModel Barrier { get; }

    /// <summary>All parameters: the barrier's, then the area.</summary>
    public IReadOnlyList<ParameterDefinition> Parameters => _parameters;

    /// <summary>Index of the area in the parameter vector.</summary>
    public int AreaIndex { get; }

    /// <summary>Index of the parameter with <paramref name="key"/>, or −1.</summary>
    public int IndexOf(string key)
    {
        for (int i = 0; i < _parameters.Length; i++)
        {
            if (string.Equals(_parameters[i].Key, key, StringComparison.Ordinal)) return i;
        }
        return -1;
    }

    /// <summary>Current in ampere.</summary>
    public double Current(double voltageV, ReadOnlySpan<double> parameters)
        => parameters[AreaIndex] * Barrier.CurrentDensity(voltageV, parameters[..AreaIndex]);

    /// <summary>Current in ampere and ∂I/∂θₖ for every parameter (SI).</summary>
    public double Current(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        double area = parameters[AreaIndex];
        double j = Barrier.CurrentDensity(voltageV, parameters[..AreaIndex], gradient[..AreaIndex]);
        for (int k = 0; k < AreaIndex; k++) gradient[k] *= area;
        gradient[AreaIndex] = j;
        return area * j;
    }
}
