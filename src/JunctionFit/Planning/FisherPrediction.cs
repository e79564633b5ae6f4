using System.Collections.Immutable;
using JunctionFit.Common;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Planning;

/// <summary>
/// What a planned measurement is predicted for: the junction model, the nominal parameters, which of them the fit will
/// leave free, and the noise model σ_I² = (r·I)² + σ_floor² of the instrument. Immutable; validated on construction.
/// </summary>
public sealed record PlanningSetup
{
    /// <summary>Creates a setup.</summary>
    /// <param name="model">The junction model the fit will use.</param>
    /// <param name="nominalSi">Nominal SI parameters in the model's order, each inside its physical bounds.</param>
    /// <param name="freeKeys">Keys of the parameters the fit leaves free; null for the fitter's default (all but those fixed by default).</param>
    /// <param name="relativeNoise">Relative current noise r, positive.</param>
    /// <exception cref="ArgumentException">Wrong number of parameters, a value outside its bounds, an unknown key or no free parameter.</exception>
    public PlanningSetup(JunctionCurrentModel model, IReadOnlyList<double> nominalSi, IEnumerable<string>? freeKeys, double relativeNoise)
    {
        Model = model ?? throw new ArgumentNullException(nameof(model));
        ArgumentNullException.ThrowIfNull(nominalSi);
        var defs = model.Parameters;
        if (nominalSi.Count != defs.Count) throw new ArgumentException($"expected {defs.Count} parameters, got {nominalSi.Count}", nameof(nominalSi));
        for (int k = 0; k < defs.Count; k++)
        {
            double v = nominalSi[k];
            if (!double.IsFinite(v)) throw new ArgumentException($"{defs[k].Key} is not finite", nameof(nominalSi));
            if (defs[k].Transform != ParameterTransform.Identity && !(v > defs[k].LowerSi && v <= defs[k].UpperSi))
            {
                throw new ArgumentException($"{defs[k].Key} = {defs[k].ToDisplay(v):G4} {defs[k].DisplayUnit} is outside its physical range", nameof(nominalSi));
            }
        }
        NominalSi = [.. nominalSi];
        var free = ImmutableHashSet.CreateBuilder<string>(StringComparer.Ordinal);
        if (freeKeys is null)
        {
            foreach (var def in defs) if (!def.FixedByDefault) free.Add(def.Key);
        }
        else
        {
            foreach (string key in freeKeys)
            {
                if (model.IndexOf(key) < 0) throw new ArgumentException($"model '{model.Barrier.Name}' has no parameter '{key}'", nameof(freeKeys));
                free.Add(key);
            }
        }
        if (free.Count == 0) throw new ArgumentException("at least one parameter must be free", nameof(freeKeys));
        FreeKeys = free.ToImmutable();
        RelativeNoise = Guard.Positive(relativeNoise);
    }

    /// <summary>The junction model.</summary>
    public JunctionCurrentModel Model { get; }

    /// <summary>Nominal SI parameters in the model's order.</summary>
    public ImmutableArray<double> NominalSi { get; }

    /// <summary>Keys of the free parameters.</summary>
    public ImmutableHashSet<string> FreeKeys { get; }

    /// <summary>Relative current noise r of σ_I² = (r·I)² + σ_floor².</summary>
    public double RelativeNoise { get; }

    /// <summary>Current noise floor σ_floor in ampere (0: none); points with |I| ≤ 3·σ_floor are left out, as in a fit.</summary>
    public double NoiseFloorA { get; init => field = Guard.NonNegative(value); }

    /// <summary>Current compliance in ampere; points with |I| ≥ 0.999·compliance are left out, as in a fit. Null: none.</summary>
    public double? ComplianceA { get; init => field = value is double v ? Guard.Positive(v) : null; }

    /// <summary>Indices of the free parameters in model order.</summary>
    public int[] FreeIndex()
    {
        var defs = Model.Parameters;
        var list = new List<int>();
        for (int k = 0; k < defs.Count; k++) if (FreeKeys.Contains(defs[k].Key)) list.Add(k);
        return [.. list];
    }

    /// <summary>A copy with other nominal values for some parameters (by key, SI).</summary>
    /// <param name="valuesSi">New nominal values by key.</param>
    public PlanningSetup WithNominal(IReadOnlyDictionary<string, double> valuesSi)
    {
        ArgumentNullException.ThrowIfNull(valuesSi);
        var theta = NominalSi.ToArray();
        foreach (var (key, value) in valuesSi)
        {
            int k = Model.IndexOf(key);
            if (k < 0) throw new ArgumentException($"model '{Model.Barrier.Name}' has no parameter '{key}'", nameof(valuesSi));
            theta[k] = value;
        }
        return new PlanningSetup(Model, theta, FreeKeys, RelativeNoise) { NoiseFloorA = NoiseFloorA, ComplianceA = ComplianceA };
    }
}

/// <summary>The predicted uncertainty of one free parameter, in its display unit.</summary>
/// <param name="Key">Parameter key (JSON key, for example <c>barrier_height_eV</c>).</param>
/// <param name="Symbol">Symbol (φ, d, A …).</param>
/// <param name="Unit">Display unit.</param>
/// <param name="Value">Nominal value.</param>
/// <param name="StandardError">Predicted standard error (delta method from the solver variable); null when not determined.</param>
/// <param name="Lower95">Lower end of the predicted 95 % Wald interval (in the solver variable, mapped back); null when not determined.</param>
/// <param name="Upper95">Upper end; null when not determined.</param>
public sealed record ParameterPrediction(string Key, string Symbol, string Unit, double Value, double? StandardError, double? Lower95, double? Upper95)
{
    /// <summary>Half the width of the predicted 95 % interval, (upper − lower)/2; null when not determined.</summary>
    public double? HalfWidth95 => Lower95 is double lo && Upper95 is double hi ? 0.5 * (hi - lo) : null;

    /// <summary><see cref="HalfWidth95"/> over |value|; null when not determined or the value is zero.</summary>
    public double? RelativeHalfWidth95 => HalfWidth95 is double h && Value != 0 ? h / Math.Abs(Value) : null;
}

/// <summary>
/// The predicted standard errors, 95 % half-widths and correlations of the free parameters for one planned sweep at one
/// nominal point: what a fit of such a measurement would report, on average, if the model and noise model hold.
/// </summary>
/// <param name="Points">Bias points of the sweep.</param>
/// <param name="PointsUsed">Points a fit would use (the others fall at zero bias, below 3·σ_floor or at compliance).</param>
/// <param name="DegreesOfFreedom">Used points minus free parameters.</param>
/// <param name="MaxAbsVoltageV">Largest |V| of the sweep.</param>
/// <param name="MaxAbsCurrentA">Largest predicted |I| of the sweep.</param>
/// <param name="Parameters">Free parameters, in model order.</param>
/// <param name="Correlation">Correlation matrix of the free parameters (solver variables), row-major; empty when not computed.</param>
/// <param name="ConditionNumber">κ₂ of the column-equilibrated weighted Jacobian (∞ when rank deficient).</param>
/// <param name="IsIdentifiable">False when the fitter's identifiability rules would fire (rank deficiency, near-singularity, or |ρ| &gt; 0.99 with a relative error above 2 %).</param>
/// <param name="Reasons">Why not identifiable, in words; empty when identifiable.</param>
public sealed record SweepPrediction(
    int Points,
    int PointsUsed,
    int DegreesOfFreedom,
    double MaxAbsVoltageV,
    double MaxAbsCurrentA,
    ImmutableArray<ParameterPrediction> Parameters,
    ImmutableArray<double> Correlation,
    double ConditionNumber,
    bool IsIdentifiable,
    ImmutableArray<string> Reasons)
{
    /// <summary>The prediction for <paramref name="key"/>, or null when it is not free.</summary>
    public ParameterPrediction? Find(string key)
    {
        foreach (var p in Parameters) if (string.Equals(p.Key, key, StringComparison.Ordinal)) return p;
        return null;
    }
}

/// <summary>
/// Predicts the uncertainty of a fit from the Fisher information of a planned sweep, with the fitter's own code paths.
/// <para>
/// For a fit of ln|I| with residuals rᵢ = (yᵢ − ln|I(Vᵢ; θ(x))|)/sᵢ and known sᵢ (the stated noise model), the Fisher
/// information of the solver variables x is F = JᵀJ with J the weighted Jacobian ∂rᵢ/∂xⱼ at the nominal point, and the
/// estimates have Cov(x̂) ≈ F⁻¹ (Cramér–Rao bound, attained asymptotically by least squares; Bates &amp; Watts, Nonlinear
/// Regression Analysis and Its Applications, Wiley 1988, §2.3). The prediction builds the noise-free curve I(Vᵢ; θ₀),
/// applies the fitter's masks and weights (<see cref="PreparedCurve"/>, sᵢ = √(r² + (σ_floor/|Iᵢ|)²)), the fitter's
/// Jacobian in the transformed variables (<see cref="LogCurrentProblem"/>, <see cref="ParameterTransforms"/>), the fitter's
/// covariance (<see cref="LinearizedCovariance"/>, unscaled as for a stated noise) and the fitter's Wald interval
/// x̂ ± t₀.₉₇₅(m − n)·se_x mapped back. The standard error in the display unit is |dθ/dx|·se_x.
/// </para>
/// Pure computation; thread-safe.
/// </summary>
public static class FisherPredictor
{
    /// <summary>Predicts for a sweep.</summary>
    /// <param name="setup">Model, nominal parameters, free parameters and noise.</param>
    /// <param name="voltagesV">Bias points in volt, finite.</param>
    /// <returns>The prediction; with fewer usable points than free parameters + 1 nothing is determined (<see cref="SweepPrediction.IsIdentifiable"/> false).</returns>
    public static SweepPrediction Predict(PlanningSetup setup, ReadOnlySpan<double> voltagesV)
    {
        ArgumentNullException.ThrowIfNull(setup);
        var model = setup.Model;
        var defs = model.Parameters;
        var theta = setup.NominalSi.ToArray();
        int count = voltagesV.Length;
        var currents = new double[count];
        double maxV = 0, maxI = 0;
        for (int i = 0; i < count; i++)
        {
            double v = Guard.Finite(voltagesV[i]);
            currents[i] = model.Current(v, theta);
            maxV = Math.Max(maxV, Math.Abs(v));
            if (double.IsFinite(currents[i])) maxI = Math.Max(maxI, Math.Abs(currents[i]));
        }
        var curve = new IvCurve("(planned sweep)", ImmutableArray.Create(voltagesV.ToArray()), ImmutableArray.Create(currents));
        // The fitter's masks and weights for a stated noise model: zero bias, wrong sign, floor, compliance (the planned
        // sweep has no settling artefact to look for).
        var options = new FitOptions
        {
            RelativeNoise = setup.RelativeNoise,
            NoiseFloorA = setup.NoiseFloorA,
            ComplianceA = setup.ComplianceA,
            KeepSettling = true,
            DirectionFits = false,
        };
        var data = PreparedCurve.From(curve, options);
        int[] freeIndex = setup.FreeIndex();
        int n = freeIndex.Length, m = data.VoltageV.Length;
        var reasons = ImmutableArray.CreateBuilder<string>();
        if (m < n + 1)
        {
            reasons.Add($"only {m} of {count} points are usable (above 3x the noise floor, below compliance, off zero bias); {n} free parameters need at least {n + 1}");
            return Undetermined(setup, freeIndex, count, m, maxV, maxI, reasons.ToImmutable());
        }
        if (!ParameterTransforms.TryToSolver(defs, freeIndex, theta, out var x))
        {
            throw new ArgumentException("a free nominal parameter has no finite solver variable", nameof(setup));
        }
        var problem = new LogCurrentProblem(model, data.VoltageV, data.LogAbsCurrent, data.InverseSigma, freeIndex, theta);
        var jacobian = new double[m * n];
        problem.Jacobian(x, jacobian);
        if (!DenseKernels.AllFinite(jacobian))
        {
            reasons.Add("the model's derivatives are not finite at the nominal point over this sweep");
            return Undetermined(setup, freeIndex, count, m, maxV, maxI, reasons.ToImmutable());
        }
        int dof = m - n;
        // The expected RSS at the truth is the degrees of freedom; it does not enter the unscaled covariance used here.
        var cov = LinearizedCovariance.Compute(jacobian, m, n, dof, JunctionFitter.ConditionWarningThreshold);
        var c = cov.UnscaledCovariance;
        double t = JunctionFitter.StudentT975(dof);
        var parameters = ImmutableArray.CreateBuilder<ParameterPrediction>(n);
        for (int j = 0; j < n; j++)
        {
            var def = defs[freeIndex[j]];
            double value = theta[freeIndex[j]];
            double? se = null, lo = null, hi = null;
            if (!cov.IsRankDeficient && c[j * n + j] >= 0 && double.IsFinite(c[j * n + j]))
            {
                (double s, double a, double b) = ParameterTransforms.WaldInterval(def, value, Math.Sqrt(c[j * n + j]), t);
                se = s;
                lo = a;
                hi = b;
            }
            parameters.Add(new ParameterPrediction(def.Key, def.Symbol, def.DisplayUnit, def.ToDisplay(value), se, lo, hi));
        }
        // The fitter's identifiability rules (JunctionFitter.BuildResult), applied to the predicted covariance.
        if (cov.IsRankDeficient)
        {
            reasons.Add($"rank deficient: only {cov.Rank} of the {n} free parameter combinations are determined by this sweep");
        }
        else
        {
            if (cov.ConditionNumber > JunctionFitter.ConditionWarningThreshold)
            {
                reasons.Add($"the scaled Jacobian is near-singular (condition number {cov.ConditionNumber:0.#e+0})");
            }
            for (int a = 0; a < n; a++)
            {
                for (int b = a + 1; b < n; b++)
                {
                    double rho = cov.Correlation[a * n + b];
                    if (Math.Abs(rho) > JunctionFitter.CorrelationWarningThreshold
                        && Math.Max(Math.Sqrt(c[a * n + a]), Math.Sqrt(c[b * n + b])) > JunctionFitter.IdentifiabilityRelativeError)
                    {
                        reasons.Add($"{defs[freeIndex[a]].Description} and {defs[freeIndex[b]].Description} cannot be separated (correlation {rho:0.0000})");
                    }
                }
            }
        }
        return new SweepPrediction(count, m, dof, maxV, maxI, parameters.ToImmutable(),
            cov.IsRankDeficient ? [] : cov.Correlation, cov.ConditionNumber, reasons.Count == 0, reasons.ToImmutable());
    }

    private static SweepPrediction Undetermined(PlanningSetup setup, int[] freeIndex, int count, int used, double maxV, double maxI, ImmutableArray<string> reasons)
    {
        var defs = setup.Model.Parameters;
        var parameters = ImmutableArray.CreateBuilder<ParameterPrediction>(freeIndex.Length);
        foreach (int k in freeIndex)
        {
            parameters.Add(new ParameterPrediction(defs[k].Key, defs[k].Symbol, defs[k].DisplayUnit, defs[k].ToDisplay(setup.NominalSi[k]), null, null, null));
        }
        return new SweepPrediction(count, used, Math.Max(used - freeIndex.Length, 0), maxV, maxI, parameters.ToImmutable(), [], double.PositiveInfinity, false, reasons);
    }
}
