using System.Collections.Concurrent;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Results;

namespace JunctionFit.Fitting;

/// <summary>How the 95 % intervals of a fit are computed.</summary>
public enum IntervalMethod
{
    /// <summary>Wald intervals in the transformed parameters, mapped back (the default; coverage measured in the tests).</summary>
    Wald,

    /// <summary>Profile-likelihood intervals (refits with each parameter fixed; slower).</summary>
    Profile,

    /// <summary>Residual-bootstrap percentile intervals with a fixed seed (slowest).</summary>
    Bootstrap,
}

/// <summary>
/// Everything needed to fit any curve of a run: the model name(s), model options, parasitic elements, the temperature
/// policy and the fit options. Builds the model per curve when the temperature comes from the file, and caches models
/// by temperature. Immutable apart from its thread-safe model cache; pure computation.
/// </summary>
public sealed class FitPlan
{
    /// <summary>Models tried by <c>--model auto</c> (wkb is left out: it is a slow numerical reference).</summary>
    public static IReadOnlyList<string> AutoCandidates { get; } = ["simmons", "simmons-image", "bdr", "fowler-nordheim"];

    private readonly ConcurrentDictionary<double, JunctionCurrentModel[]> _models = new();

    /// <summary>Creates a plan.</summary>
    /// <param name="modelNames">One model, or several to choose from by AICc.</param>
    /// <param name="modelOptions">Model options (temperature here is the explicit one, applied to every curve).</param>
    /// <param name="parasitics">Parasitic elements to include.</param>
    /// <param name="options">Fit options.</param>
    /// <param name="temperatureFromFile">Use a curve's stated temperature when no explicit temperature is given.</param>
    public FitPlan(IReadOnlyList<string> modelNames, BarrierModelOptions modelOptions, ParasiticOptions parasitics, FitOptions options,
        bool temperatureFromFile = true)
    {
        ArgumentNullException.ThrowIfNull(modelNames);
        if (modelNames.Count == 0) throw new ArgumentException("at least one model", nameof(modelNames));
        ModelNames = modelNames;
        ModelOptions = modelOptions ?? throw new ArgumentNullException(nameof(modelOptions));
        Parasitics = parasitics ?? throw new ArgumentNullException(nameof(parasitics));
        Options = options ?? throw new ArgumentNullException(nameof(options));
        TemperatureFromFile = temperatureFromFile;
        foreach (string name in modelNames) _ = BarrierModelCatalog.Create(name, modelOptions); // validate names now
    }

    /// <summary>Model names.</summary>
    public IReadOnlyList<string> ModelNames { get; }

    /// <summary>Model options.</summary>
    public BarrierModelOptions ModelOptions { get; }

    /// <summary>Parasitic elements.</summary>
    public ParasiticOptions Parasitics { get; }

    /// <summary>Fit options.</summary>
    public FitOptions Options { get; }

    /// <summary>Whether a curve's stated temperature applies when none is given explicitly.</summary>
    public bool TemperatureFromFile { get; }

    /// <summary>Interval method.</summary>
    public IntervalMethod Intervals { get; init; } = IntervalMethod.Wald;

    /// <summary>Bootstrap replicates (for <see cref="IntervalMethod.Bootstrap"/>).</summary>
    public int BootstrapReplicates { get; init => field = Common.Guard.AtLeast(value, BootstrapIntervals.MinimumReplicates); } = BootstrapIntervals.DefaultReplicates;

    /// <summary>Bootstrap seed (same seed, same intervals).</summary>
    public int BootstrapSeed { get; init; } = 1;

    /// <summary>Name shown for the run (the model, or "auto").</summary>
    public string DisplayName => ModelNames.Count == 1 ? ModelNames[0] : "auto";

    /// <summary>The junction model(s) for a curve.</summary>
    public IReadOnlyList<JunctionCurrentModel> ModelsFor(IvCurve curve)
    {
        ArgumentNullException.ThrowIfNull(curve);
        double? t = ModelOptions.TemperatureK ?? (TemperatureFromFile ? curve.TemperatureK : null);
        double key = t ?? -1.0;
        return _models.GetOrAdd(key, _ =>
        {
            var options = ModelOptions with { TemperatureK = t };
            return ModelNames.Select(n => new JunctionCurrentModel(BarrierModelCatalog.Create(n, options), Parasitics)).ToArray();
        });
    }

    /// <summary>Fits one curve.</summary>
    public FitResult Fit(IvCurve curve)
    {
        var models = ModelsFor(curve);
        var options = Options;
        if (models.Count == 1 && models[0].Barrier is MosGateStackModel mos) (curve, options) = MosBranch.Apply(curve, mos, options);
        var fit = models.Count == 1 ? JunctionFitter.Fit(curve, models[0], options) : ModelSelection.FitBest(curve, models, options);
        if (Intervals == IntervalMethod.Wald || fit.Status == FitStatus.Failed) return fit;
        var model = models.FirstOrDefault(m => m.Barrier.Name == fit.Model) ?? models[0];
        return Intervals == IntervalMethod.Profile
            ? ProfileLikelihoodIntervals.Compute(curve, model, options, fit)
            : BootstrapIntervals.Compute(curve, model, options, fit, BootstrapReplicates, BootstrapSeed);
    }

    /// <summary>A copy with other fit options (same models, temperature policy and interval method).</summary>
    public FitPlan WithOptions(FitOptions options) => new(ModelNames, ModelOptions, Parasitics, options, TemperatureFromFile)
    {
        Intervals = Intervals,
        BootstrapReplicates = BootstrapReplicates,
        BootstrapSeed = BootstrapSeed,
    };
}
