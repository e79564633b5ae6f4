using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Benchmarks;

/// <summary>
/// The three-parameter Simmons fit that the solver comparison runs, written once and handed to both solvers.
/// <para>
/// Variables p = (ln φ/eV, ln d/nm, ln A/µm²) — log variables keep φ, d and A positive, and natural units keep them of
/// order one, as a careful user would set the problem up. m*/mₑ = 1 fixed.
/// Residuals rᵢ(p) = (yᵢ − ln|I(Vᵢ; p)|)/s, yᵢ = ln|Iᵢ| measured, s = 0.01 (the 1 % relative noise of the curve, so
/// 1/s² is the weight); the zero-bias point is dropped (ln 0). Where the model current vanishes or has the wrong sign,
/// ln|I| is replaced by −700 (large but finite), as the fitter does.
/// Jacobian: ∂rᵢ/∂pⱼ = −(1/s) (∂I/∂θₖ)/I · θₖ, because θₖ = cₖ e^{pⱼ}.
/// </para>
/// </summary>
internal sealed class SimmonsLogProblem : ILeastSquaresProblem
{
    public const int Size = 3;
    private const double Ev = PhysicalConstants.JoulePerElectronVolt;
    private static readonly int[] ThetaIndex = [SimmonsRectangularModel.BarrierHeightIndex, SimmonsRectangularModel.ThicknessIndex, 3];
    private static readonly double[] Unit = [Ev, 1e-9, 1e-12];

    private readonly JunctionCurrentModel _model = BenchmarkCurves.Model(BarrierModelCatalog.Simmons);
    private readonly double[] _theta = [0, 0, 1.0, 0];
    private readonly double[] _gradient = new double[4];

    public SimmonsLogProblem(IvCurve curve, double relativeNoise, bool analyticJacobian = true)
    {
        var v = new List<double>(curve.Count);
        var y = new List<double>(curve.Count);
        for (int i = 0; i < curve.Count; i++)
        {
            double vi = curve.VoltageV[i], ci = curve.CurrentA[i];
            if (vi == 0 || ci == 0 || Math.Sign(vi) != Math.Sign(ci)) continue;
            v.Add(vi);
            y.Add(Math.Log(Math.Abs(ci)));
        }
        VoltageV = [.. v];
        LogAbsCurrent = [.. y];
        InverseSigma = 1.0 / relativeNoise;
        HasAnalyticJacobian = analyticJacobian;
    }

    /// <summary>Bias of the points used, in volt.</summary>
    public double[] VoltageV { get; }

    /// <summary>ln|I| of the points used (I in ampere).</summary>
    public double[] LogAbsCurrent { get; }

    /// <summary>1/s, the square root of every weight.</summary>
    public double InverseSigma { get; }

    public int ResidualCount => VoltageV.Length;

    public int ParameterCount => Size;

    public bool HasAnalyticJacobian { get; }

    /// <summary>p for φ in eV, d in nm and A in µm².</summary>
    public static double[] ToVariables(double barrierHeightEv, double thicknessNm, double areaUm2) =>
        [Math.Log(barrierHeightEv), Math.Log(thicknessNm), Math.Log(areaUm2)];

    /// <summary>(φ/eV, d/nm, A/µm²) for p.</summary>
    public static (double BarrierHeightEv, double ThicknessNm, double AreaUm2) FromVariables(ReadOnlySpan<double> p) =>
        (Math.Exp(p[0]), Math.Exp(p[1]), Math.Exp(p[2]));

    /// <summary>
    /// The model values ln|I(Vᵢ; p)| (with the −700 penalty) at <paramref name="voltageV"/>: the function MathNet's
    /// objective wraps.
    /// </summary>
    public void LogModel(ReadOnlySpan<double> p, ReadOnlySpan<double> voltageV, Span<double> logAbsCurrent)
    {
        Load(p);
        for (int i = 0; i < voltageV.Length; i++)
        {
            logAbsCurrent[i] = LogCurrentProblem.LogModel(_model.Current(voltageV[i], _theta), voltageV[i]);
        }
    }

    public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
    {
        Load(x);
        for (int i = 0; i < VoltageV.Length; i++)
        {
            double vi = VoltageV[i];
            residuals[i] = (LogAbsCurrent[i] - LogCurrentProblem.LogModel(_model.Current(vi, _theta), vi)) * InverseSigma;
        }
    }

    public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
    {
        Load(x);
        for (int i = 0; i < VoltageV.Length; i++)
        {
            double vi = VoltageV[i];
            double current = _model.Current(vi, _theta, _gradient);
            bool valid = current != 0 && double.IsFinite(current) && Math.Sign(current) == Math.Sign(vi);
            double scale = valid ? -InverseSigma / current : 0.0;
            for (int j = 0; j < Size; j++)
            {
                int k = ThetaIndex[j];
                jacobian[(i * Size) + j] = scale * _gradient[k] * _theta[k];
            }
        }
    }

    /// <summary>Σ rᵢ² at p.</summary>
    public double ResidualSumOfSquares(ReadOnlySpan<double> p)
    {
        Span<double> r = new double[ResidualCount];
        Evaluate(p, r);
        double s = 0;
        foreach (double ri in r) s += ri * ri;
        return s;
    }

    private void Load(ReadOnlySpan<double> p)
    {
        for (int j = 0; j < Size; j++) _theta[ThetaIndex[j]] = Unit[j] * Math.Exp(p[j]);
    }
}
