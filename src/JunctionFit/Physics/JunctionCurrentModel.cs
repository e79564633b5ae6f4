namespace JunctionFit.Physics;

/// <summary>
/// The measurable current of one junction: I(V) = A · J(V; θ) with A the effective conducting area in m², optionally with
/// parasitic elements (<see cref="ParasiticOptions"/>). Parameters are the barrier model's, then the area, then the enabled
/// parasitics in the order R_s, G_leak, V₀, I₀.
/// <para>
/// With parasitics: I_meas = I + I₀, where I solves H(I) = I − A·J(V_j) − G·V_j = 0, V_j = V − V₀ − I·R_s.
/// H is increasing in I (∂H/∂I = D = 1 + (A·J′(V_j) + G)·R_s ≥ 1 for J′ ≥ 0), and J(0) = 0 with sign J = sign V, so the root
/// lies between 0 and (V − V₀)/R_s; it is found per point by Newton steps safeguarded by bisection on that bracket.
/// Derivatives by implicit differentiation, dI/dθ = −(∂H/∂θ)/D: dI/dθ_b = A·∂J/∂θ_b / D, dI/dA = J / D, dI/dG = V_j / D,
/// dI/dR_s = −(A·J′ + G)·I / D, dI/dV₀ = −(A·J′ + G) / D, dI/dI₀ = 1. J′ = ∂J/∂V is analytic for the models of this library
/// and a central difference otherwise.
/// </para>
/// </summary>
public sealed class JunctionCurrentModel
{
    private const int MaxNewtonIterations = 100;
    private readonly ParameterDefinition[] _parameters;
    private readonly int _barrierCount;
    private readonly int _seriesIndex = -1, _leakIndex = -1, _voltageOffsetIndex = -1, _currentOffsetIndex = -1;
    private readonly IBiasDerivative? _bias;

    /// <summary>Creates the junction model around a barrier model.</summary>
    /// <param name="barrier">The barrier model giving J(V).</param>
    public JunctionCurrentModel(IBarrierModel barrier)
        : this(barrier, ParasiticOptions.None)
    {
    }

    /// <summary>Creates the junction model with the parasitic elements of <paramref name="parasitics"/>.</summary>
    /// <param name="barrier">The barrier model giving J(V).</param>
    /// <param name="parasitics">Which parasitic parameters to add.</param>
    public JunctionCurrentModel(IBarrierModel barrier, ParasiticOptions parasitics)
    {
        ArgumentNullException.ThrowIfNull(barrier);
        ArgumentNullException.ThrowIfNull(parasitics);
        Barrier = barrier;
        Parasitics = parasitics;
        _bias = barrier as IBiasDerivative;
        var list = new List<ParameterDefinition>(barrier.Parameters) { StandardParameters.Area };
        _barrierCount = barrier.Parameters.Count;
        AreaIndex = _barrierCount;
        if (parasitics.SeriesResistance) { _seriesIndex = list.Count; list.Add(StandardParameters.SeriesResistance); }
        if (parasitics.LeakageConductance) { _leakIndex = list.Count; list.Add(StandardParameters.LeakageConductance); }
        if (parasitics.VoltageOffset) { _voltageOffsetIndex = list.Count; list.Add(StandardParameters.VoltageOffset); }
        if (parasitics.CurrentOffset) { _currentOffsetIndex = list.Count; list.Add(StandardParameters.CurrentOffset); }
        _parameters = [.. list];
    }

    private JunctionCurrentModel(JunctionCurrentModel model, ParameterDefinition[] parameters)
    {
        Barrier = model.Barrier;
        Parasitics = model.Parasitics;
        _bias = model._bias;
        _barrierCount = model._barrierCount;
        AreaIndex = model.AreaIndex;
        _seriesIndex = model._seriesIndex;
        _leakIndex = model._leakIndex;
        _voltageOffsetIndex = model._voltageOffsetIndex;
        _currentOffsetIndex = model._currentOffsetIndex;
        _parameters = parameters;
    }

    /// <summary>
    /// This model with the fit bounds of the parameters named in <paramref name="bounds"/> narrowed
    /// (<see cref="ParameterDefinition.WithBounds"/>); keys the model does not have are ignored. The current is unchanged.
    /// </summary>
    /// <param name="bounds">Bounds in SI by key.</param>
    /// <returns>The bounded model, or this one when no bound applies.</returns>
    /// <exception cref="ArgumentException">A bound leaves nothing of its parameter's range.</exception>
    public JunctionCurrentModel WithBounds(IReadOnlyDictionary<ParameterKey, ParameterBounds> bounds)
    {
        ArgumentNullException.ThrowIfNull(bounds);
        if (bounds.Count == 0) return this;
        var parameters = (ParameterDefinition[])_parameters.Clone();
        bool any = false;
        for (int k = 0; k < parameters.Length; k++)
        {
            if (!bounds.TryGetValue(parameters[k].Id, out var b)) continue;
            var bounded = parameters[k].WithBounds(b);
            if (bounded == parameters[k]) continue;
            parameters[k] = bounded;
            any = true;
        }
        return any ? new JunctionCurrentModel(this, parameters) : this;
    }

    /// <summary>The barrier model.</summary>
    public IBarrierModel Barrier { get; }

    /// <summary>The parasitic elements in the model.</summary>
    public ParasiticOptions Parasitics { get; }

    /// <summary>All parameters: the barrier's, then the area, then the enabled parasitics.</summary>
    public IReadOnlyList<ParameterDefinition> Parameters => _parameters;

    /// <summary>Index of the area in the parameter vector (equal to the number of barrier parameters).</summary>
    public int AreaIndex { get; }

    /// <summary>Index of R_s, or null when not enabled.</summary>
    public int? SeriesResistanceIndex => _seriesIndex >= 0 ? _seriesIndex : null;

    /// <summary>Index of G_leak, or null when not enabled.</summary>
    public int? LeakageConductanceIndex => _leakIndex >= 0 ? _leakIndex : null;

    /// <summary>Index of V₀, or null when not enabled.</summary>
    public int? VoltageOffsetIndex => _voltageOffsetIndex >= 0 ? _voltageOffsetIndex : null;

    /// <summary>Index of I₀, or null when not enabled.</summary>
    public int? CurrentOffsetIndex => _currentOffsetIndex >= 0 ? _currentOffsetIndex : null;

    /// <summary>Index of the parameter with <paramref name="key"/>, or −1.</summary>
    public int IndexOf(string key)
    {
        for (int i = 0; i < _parameters.Length; i++)
        {
            if (string.Equals(_parameters[i].Key, key, StringComparison.Ordinal)) return i;
        }
        return -1;
    }

    /// <summary>Index of the parameter with <paramref name="key"/>, or −1.</summary>
    public int IndexOf(ParameterKey key)
    {
        ArgumentNullException.ThrowIfNull(key);
        return IndexOf(key.Name);
    }

    /// <summary>Current in ampere.</summary>
    public double Current(double voltageV, ReadOnlySpan<double> parameters)
    {
        if (!Parasitics.Any)
        {
            return parameters[AreaIndex] * Barrier.CurrentDensity(voltageV, parameters[..AreaIndex]);
        }
        double current = Solve(voltageV, parameters, out _, out _);
        return _currentOffsetIndex >= 0 ? current + parameters[_currentOffsetIndex] : current;
    }

    /// <summary>Current in ampere and ∂I/∂θₖ for every parameter (SI).</summary>
    public double Current(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
    {
        double area = parameters[AreaIndex];
        if (!Parasitics.Any)
        {
            double j = Barrier.CurrentDensity(voltageV, parameters[..AreaIndex], gradient[..AreaIndex]);
            for (int k = 0; k < AreaIndex; k++) gradient[k] *= area;
            gradient[AreaIndex] = j;
            return area * j;
        }
        double current = Solve(voltageV, parameters, out double vj, out double slope);
        var barrierParameters = parameters[.._barrierCount];
        double jj = Barrier.CurrentDensity(vj, barrierParameters, gradient[.._barrierCount]);
        double rs = _seriesIndex >= 0 ? parameters[_seriesIndex] : 0.0;
        double dH = 1.0 + slope * rs; // slope = A·J′(V_j) + G
        for (int k = 0; k < _barrierCount; k++) gradient[k] *= area / dH;
        gradient[AreaIndex] = jj / dH;
        if (_seriesIndex >= 0) gradient[_seriesIndex] = -slope * current / dH;
        if (_leakIndex >= 0) gradient[_leakIndex] = vj / dH;
        if (_voltageOffsetIndex >= 0) gradient[_voltageOffsetIndex] = -slope / dH;
        if (_currentOffsetIndex >= 0)
        {
            gradient[_currentOffsetIndex] = 1.0;
            current += parameters[_currentOffsetIndex];
        }
        return current;
    }

    /// <summary>
    /// Solves I = A·J(V_j) + G·V_j, V_j = V − V₀ − I·R_s (without I₀). Returns I, the junction bias V_j and the small-signal
    /// conductance A·J′(V_j) + G at the solution.
    /// </summary>
    private double Solve(double voltageV, ReadOnlySpan<double> p, out double junctionV, out double slope)
    {
        var barrier = p[.._barrierCount];
        double area = p[AreaIndex];
        double g = _leakIndex >= 0 ? p[_leakIndex] : 0.0;
        double v = voltageV - (_voltageOffsetIndex >= 0 ? p[_voltageOffsetIndex] : 0.0);
        double rs = _seriesIndex >= 0 ? p[_seriesIndex] : 0.0;
        if (rs <= 0)
        {
            junctionV = v;
            slope = area * BiasDerivative(v, barrier) + g;
            return area * Barrier.CurrentDensity(v, barrier) + g * v;
        }
        double lo = Math.Min(0.0, v / rs), hi = Math.Max(0.0, v / rs);
        // Start from the current without R_s, clipped into the bracket.
        double current = Math.Clamp(area * Barrier.CurrentDensity(v, barrier) + g * v, lo, hi);
        for (int iteration = 0; iteration < MaxNewtonIterations; iteration++)
        {
            double vj = v - current * rs;
            double h = current - area * Barrier.CurrentDensity(vj, barrier) - g * vj;
            if (h == 0) break;
            if (h > 0) hi = current; else lo = current;
            double s = area * BiasDerivative(vj, barrier) + g;
            double next = current - h / (1.0 + s * rs);
            if (!(next > lo && next < hi)) next = 0.5 * (lo + hi); // bisection when Newton leaves the bracket
            double step = Math.Abs(next - current);
            current = next;
            if (step <= 1e-15 * Math.Abs(current) || hi - lo <= 1e-15 * Math.Max(Math.Abs(lo), Math.Abs(hi))) break;
        }
        junctionV = v - current * rs;
        slope = area * BiasDerivative(junctionV, barrier) + g;
        return current;
    }

    private double BiasDerivative(double voltageV, ReadOnlySpan<double> barrier)
    {
        if (_bias is not null) return _bias.CurrentDensityBiasDerivative(voltageV, barrier);
        double h = 1e-5 * Math.Max(Math.Abs(voltageV), 0.05);
        return (Barrier.CurrentDensity(voltageV + h, barrier) - Barrier.CurrentDensity(voltageV - h, barrier)) / (2.0 * h);
    }

    /// <summary>
    /// The barrier model's validity warnings for the fitted range, plus a warning when the series resistance takes a large
    /// share of the bias at the largest |V|.
    /// </summary>
    /// <param name="maxAbsVoltageV">Largest |V| used in the fit.</param>
    /// <param name="parameters">Fitted SI parameters in <see cref="Parameters"/> order.</param>
    public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters)
    {
        var warnings = new List<string>(Barrier.CheckValidity(maxAbsVoltageV, parameters[.._barrierCount]));
        if (_seriesIndex >= 0 && maxAbsVoltageV > 0)
        {
            double i = Solve(maxAbsVoltageV, parameters, out double vj, out _);
            double share = (maxAbsVoltageV - vj) / maxAbsVoltageV;
            if (Math.Abs(i) > 0 && share > 0.2)
            {
                warnings.Add($"the series resistance takes {share:P0} of the bias at |V| = {maxAbsVoltageV:0.###} V: the barrier parameters are " +
                             "then strongly correlated with R_s; measure R_s separately (four-point contacts) or fix it");
            }
        }
        return warnings;
    }
}
