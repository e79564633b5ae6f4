namespace JunctionFit.Physics;

/// <summary>
/// The thermal factor of direct tunnelling, J(V, T) = J(V, 0) · πckT / sin(πckT), with c the energy decay constant of the
/// transmission at the Fermi level. For a rectangular barrier c = d √(2m*) / (ħ √φ̄).
/// Sources: R. Stratton, J. Phys. Chem. Solids 23, 1177 (1962); J. G. Simmons, J. Appl. Phys. 35, 2655 (1964).
/// It follows from ∫ e^{cε} (−∂f/∂ε) dε = πckT / sin(πckT) for the Fermi function f; valid for πckT &lt; 1
/// (it diverges at πckT = π, where the exponential expansion of the transmission breaks down).
/// </summary>
public static class ThermalFactor
{
    /// <summary>Largest x = πckT evaluated; larger arguments are held there (the factor is then 3/sin 3 ≈ 21).</summary>
    public const double MaxArgument = 3.0;

    /// <summary>g(x) = x / sin x, for 0 ≤ x ≤ <see cref="MaxArgument"/> (clamped).</summary>
    /// <param name="x">πckT (dimensionless).</param>
    public static double Evaluate(double x) => Evaluate(x, out _);

    /// <summary>g(x) = x / sin x and its derivative g′(x) = (sin x − x cos x) / sin² x (zero where x is clamped).</summary>
    /// <param name="x">πckT (dimensionless).</param>
    /// <param name="derivative">g′(x).</param>
    public static double Evaluate(double x, out double derivative)
    {
        x = Math.Abs(x);
        if (x > MaxArgument)
        {
            derivative = 0.0;
            return MaxArgument / Math.Sin(MaxArgument);
        }
        if (x < 1e-4)
        {
            derivative = x / 3.0;
            return 1.0 + x * x / 6.0;
        }
        double s = Math.Sin(x);
        derivative = (s - x * Math.Cos(x)) / (s * s);
        return x / s;
    }

    /// <summary>The argument πckT for a decay constant <paramref name="decayPerJoule"/> (J⁻¹) at <paramref name="temperatureK"/>.</summary>
    /// <param name="decayPerJoule">c in J⁻¹.</param>
    /// <param name="temperatureK">T in kelvin.</param>
    public static double Argument(double decayPerJoule, double temperatureK) => Math.PI * decayPerJoule * PhysicalConstants.BoltzmannJPerK * temperatureK;

    /// <summary>c = d √(2 r mₑ) / (ħ √φ̄) for a rectangular barrier, in J⁻¹.</summary>
    /// <param name="meanBarrierHeightJ">φ̄ in joule.</param>
    /// <param name="thicknessM">d in metre.</param>
    /// <param name="massRatio">m*/mₑ.</param>
    public static double RectangularDecay(double meanBarrierHeightJ, double thicknessM, double massRatio)
        => thicknessM * Math.Sqrt(2.0 * massRatio * PhysicalConstants.ElectronMassKg) / (PhysicalConstants.ReducedPlanckJs * Math.Sqrt(meanBarrierHeightJ));
}

/// <summary>
/// An analytic barrier model at a finite temperature: J(V, T) = J(V, 0) · g(πckT), g(x) = x / sin x, with the inner model's
/// own decay constant c(V; θ). Derivatives: ∂J/∂θ = g ∂J₀/∂θ + J₀ g′(x) πkT ∂c/∂θ. Name, parameters and units are the inner model's.
/// </summary>
public sealed class ThermallyCorrectedModel : IBarrierModel
{
    private readonly IBarrierModel _inner;
    private readonly IThermalDecay _decay;

    /// <summary>Wraps <paramref name="inner"/> at <paramref name="temperatureK"/>.</summary>
    /// <param name="inner">An analytic model of this library (simmons, simmons-image, bdr, fowler-nordheim).</param>
    /// <param name="temperatureK">T in kelvin, finite and not negative.</param>
    /// <exception cref="ArgumentException">The inner model does not provide a decay constant.</exception>
    /// <exception cref="ArgumentOutOfRangeException">The temperature is negative or not finite.</exception>
    public ThermallyCorrectedModel(IBarrierModel inner, double temperatureK)
    {
        ArgumentNullException.ThrowIfNull(inner);
        _decay = inner as IThermalDecay ?? throw new ArgumentException($"model '{inner.Name}' has no thermal decay constant; it cannot take the thermal factor", nameof(inner));
        _inner = inner;
        TemperatureK = Common.Guard.NonNegative(temperatureK);
    }

    /// <summary>The zero-temperature model.</summary>
    public IBarrierModel Inner => _inner;

    /// <summary>Temperature in kelvin.</summary>
    public double TemperatureK { get; }

    /// <inheritdoc />
    public string Name => _inner.Name;

    /// <inheritdoc />
    public string Description => $"{_inner.Description}, with the thermal factor pi*c*kT/sin(pi*c*kT) at {TemperatureK:0.##} K (Stratton 1962; Simmons 1964)";

    /// <inheritdoc />
    public IReadOnlyList<ParameterDefinition> Parameters => _inner.Parameters;

    /// <inheritdoc />
    public string ValidityRange => _inner.ValidityRange + "; thermal factor valid while pi*c*kT < 1";

    /// <summary>The thermal argument πckT at <paramref name="voltageV"/>.</summary>
    /// <param name="voltageV">Bias in volt.</param>
    /// <param name="parameters">SI parameters.</param>
    public double ThermalArgument(double voltageV, ReadOnlySpan<double> parameters)
    {
        Span<double> scratch = stackalloc double[parameters.Length];
        return ThermalFactor.Argument(_decay.EnergyDecay(voltageV, parameters, scratch), TemperatureK);
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
    {
        double j0 = _inner.CurrentDensity(voltageV, parameters);
        return j0 * ThermalFactor.Evaluate(ThermalArgument(voltageV, parameters));
    }

    /// <inheritdoc />
    public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        int n = parameters.Length;
        double j0 = _inner.CurrentDensity(voltageV, parameters, gradient);
        Span<double> dc = stackalloc double[n];
        double c = _decay.EnergyDecay(voltageV, parameters, dc);
        double scale = Math.PI * PhysicalConstants.BoltzmannJPerK * TemperatureK;
        double g = ThermalFactor.Evaluate(scale * c, out double gp);
        for (int k = 0; k < n; k++) gradient[k] = g * gradient[k] + j0 * gp * scale * dc[k];
        return j0 * g;
    }

    /// <inheritdoc />
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>(_inner.CheckValidity(maxAbsVoltageV, parameters));
        double x = Math.Max(ThermalArgument(0.0, parameters), ThermalArgument(maxAbsVoltageV, parameters));
        if (x >= 1.0)
        {
            warnings.Add($"the thermal argument pi*c*kT reaches {x:0.##} at {TemperatureK:0.#} K (it must stay below 1): the barrier is too thick or too low " +
                         "for the thermal factor; use the wkb model, which integrates the Fermi functions directly");
        }
        return warnings;
    }
}
