namespace JunctionFit.Physics;

/// <summary>
/// The barrier models selectable by <c>--model</c>, built by name with their options.
/// </summary>
public static class BarrierModelCatalog
{
    /// <summary>Rectangular barrier, intermediate and high-voltage forms (Simmons 1963).</summary>
    public const string Simmons = "simmons";

    /// <summary>Image-force rounded barrier (Simmons 1963).</summary>
    public const string SimmonsImage = "simmons-image";

    /// <summary>Asymmetric trapezoid (Brinkman, Dynes and Rowell 1970).</summary>
    public const string Bdr = "bdr";

    /// <summary>High-field triangular barrier (Lenzlinger and Snow 1969).</summary>
    public const string FowlerNordheim = "fowler-nordheim";

    /// <summary>Numerical Tsu–Esaki current with WKB transmission.</summary>
    public const string Wkb = "wkb";

    /// <summary>MOS gate stack: exact electrostatics and Lee–Hu direct tunnelling.</summary>
    public const string Mos = "mos";

    /// <summary>All model names, in the order of the documentation.</summary>
    public static IReadOnlyList<string> Names { get; } = [Simmons, SimmonsImage, Bdr, FowlerNordheim, Wkb, Mos];

    /// <summary>Builds the model called <paramref name="name"/>.</summary>
    /// <param name="name">One of <see cref="Names"/> (case-insensitive).</param>
    /// <param name="options">Temperature, permittivity, Fermi energy and the like; null for <see cref="BarrierModelOptions.Default"/>.</param>
    /// <returns>The model; analytic models with a positive temperature come wrapped in a <see cref="ThermallyCorrectedModel"/>.</returns>
    /// <exception cref="ArgumentException">The name is not a known model.</exception>
    public static IBarrierModel Create(string name, BarrierModelOptions? options = null)
    {
        ArgumentNullException.ThrowIfNull(name);
        options ??= BarrierModelOptions.Default;
        IBarrierModel model = name.Trim().ToLowerInvariant() switch
        {
            Simmons => SimmonsRectangularModel.Instance,
            SimmonsImage => new SimmonsImageForceModel(options.RelativePermittivity),
            Bdr => BrinkmanDynesRowellModel.Instance,
            FowlerNordheim => FowlerNordheimModel.Instance,
            Wkb => new WkbModel(options),
            Mos => new MosGateStackModel(options.Mos, options.TemperatureK),
            _ => throw new ArgumentException($"unknown model '{name}'; known models: {string.Join(", ", Names)}", nameof(name)),
        };
        if (model is IThermalDecay && options.TemperatureK is { } t && t > 0)
        {
            model = new ThermallyCorrectedModel(model, t);
        }
        return model;
    }
}
