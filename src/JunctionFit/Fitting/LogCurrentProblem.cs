using JunctionFit.Physics;

namespace JunctionFit.Fitting;

/// <summary>
/// The least-squares problem of a junction fit in the solver's variables.
/// <para>
/// Residuals: rᵢ(x) = (ln|Iᵢ| − ln|I_model(Vᵢ; θ(x))|) / sᵢ, where sᵢ = σ_I,ᵢ/|Iᵢ| is the relative standard deviation
/// from the noise model σ_I² = (r·I)² + σ_floor² (first-order error propagation into ln|I|).
/// Variables: xⱼ = ln θₖ for every free positive parameter (bounds by transformation), so θ stays inside (0, ∞).
/// Jacobian: ∂rᵢ/∂xⱼ = −(1/sᵢ) · (∂I/∂θₖ / I) · θₖ.
/// </para>
/// Holds private copies of the data; not shared between threads.
/// </summary>
internal sealed class LogCurrentProblem : ILeastSquaresProblem
{
    /// <summary>Residual used where the model current vanishes or changes sign: large but finite.</summary>
    internal const double PenaltyLogCurrent = 700.0;

    private readonly JunctionCurrentModel _model;
    private readonly double[] _voltageV;
    private readonly double[] _logAbsCurrent;
    private readonly double[] _inverseSigma;
    private readonly int[] _freeIndex;
    private readonly double[] _theta;
    private readonly double[] _gradient;

    public LogCurrentProblem(JunctionCurrentModel model, double[] voltageV, double[] logAbsCurrent, double[] inverseSigma,
        int[] freeIndex, double[] thetaTemplate)
    {
        _model = model;
        _voltageV = voltageV;
        _logAbsCurrent = logAbsCurrent;
        _inverseSigma = inverseSigma;
        _freeIndex = freeIndex;
        _theta = (double[])thetaTemplate.Clone();
        _gradient = new double[thetaTemplate.Length];
    }

    public int ResidualCount => _voltageV.Length;

    public int ParameterCount => _freeIndex.Length;

    public bool HasAnalyticJacobian => true;

    /// <summary>θ for solver variables x (fixed parameters from the template).</summary>
    public double[] ToTheta(ReadOnlySpan<double> x)
    {
        var theta = (double[])_theta.Clone();
        for (int j = 0; j < _freeIndex.Length; j++) theta[_freeIndex[j]] = Math.Exp(x[j]);
        return theta;
    }

    private void Load(ReadOnlySpan<double> x)
    {
        for (int j = 0; j < _freeIndex.Length; j++) _theta[_freeIndex[j]] = Math.Exp(x[j]);
    }

    public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
    {
        Load(x);
        ReadOnlySpan<double> theta = _theta;
        for (int i = 0; i < _voltageV.Length; i++)
        {
            double current = _model.Current(_voltageV[i], theta);
            double logModel = LogModel(current, _voltageV[i]);
            residuals[i] = (_logAbsCurrent[i] - logModel) * _inverseSigma[i];
        }
    }

    public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
    {
        Load(x);
        ReadOnlySpan<double> theta = _theta;
        Span<double> gradient = _gradient;
        int n = _freeIndex.Length;
        for (int i = 0; i < _voltageV.Length; i++)
        {
            double current = _model.Current(_voltageV[i], theta, gradient);
            bool valid = current != 0 && double.IsFinite(current) && Math.Sign(current) == Math.Sign(_voltageV[i]);
            double scale = valid ? -_inverseSigma[i] / current : 0.0;
            for (int j = 0; j < n; j++)
            {
                int k = _freeIndex[j];
                jacobian[i * n + j] = scale * gradient[k] * theta[k];
            }
        }
    }

    /// <summary>ln|I| of the model, or a finite penalty where the model has the wrong sign or vanishes.</summary>
    internal static double LogModel(double current, double voltageV)
    {
        if (current == 0 || !double.IsFinite(current) || Math.Sign(current) != Math.Sign(voltageV))
        {
            return -PenaltyLogCurrent;
        }
        return Math.Log(Math.Abs(current));
    }
}
