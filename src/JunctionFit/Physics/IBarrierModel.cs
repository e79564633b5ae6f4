namespace JunctionFit.Physics;

/// <summary>
/// A tunnel-barrier model: current density J(V; θ) in A/m² and its derivatives ∂J/∂θₖ.
/// Implementations are immutable and thread-safe; options such as temperature are fixed at construction.
/// Parameters are SI and ordered as <see cref="Parameters"/>.
/// </summary>
public interface IBarrierModel
{
    /// <summary>Name used by <c>--model</c> (for example <c>simmons</c>).</summary>
    string Name { get; }

    /// <summary>One line naming the model and its source.</summary>
    string Description { get; }

    /// <summary>The model's parameters in the order used by every span argument.</summary>
    IReadOnlyList<ParameterDefinition> Parameters { get; }

    /// <summary>Current density in A/m² at <paramref name="voltageV"/>.</summary>
    /// <param name="voltageV">Bias of the top electrode against the bottom one, in volt.</param>
    /// <param name="parameters">SI parameter values, in <see cref="Parameters"/> order.</param>
    /// <returns>J in A/m², with the sign of the current.</returns>
    double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters);

    /// <summary>Current density in A/m² and its analytic derivatives with respect to each parameter.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="parameters">SI parameter values.</param>
    /// <param name="gradient">Receives ∂J/∂θₖ in A/m² per SI unit of θₖ; length ≥ parameter count.</param>
    /// <returns>J in A/m².</returns>
    double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient);

    /// <summary>Words describing where the model is valid, for reports.</summary>
    string ValidityRange { get; }

    /// <summary>Checks the model's validity over a bias range for fitted parameters; returns warnings in words.</summary>
    /// <param name="maxAbsVoltageV">Largest |V| used in the fit.</param>
    /// <param name="parameters">Fitted SI parameters.</param>
    IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters);
}
