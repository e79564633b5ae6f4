using JunctionFit.Physics;

namespace JunctionFit.Fitting;

/// <summary>
/// Maps between a physical parameter θ and the unbounded solver variable x (bounds by transformation).
/// <list type="bullet">
/// <item>Identity: θ = x.</item>
/// <item>Log (lower bound lo, usually 0): θ = lo + eˣ, dθ/dx = θ − lo.</item>
/// <item>Logistic (lo, hi): θ = lo + (hi − lo)/(1 + e⁻ˣ), dθ/dx = (θ − lo)(hi − θ)/(hi − lo).</item>
/// </list>
/// Every interval computed in x and mapped back therefore stays above lo (and below hi for the logistic transform;
/// <see cref="WaldInterval"/> clips an end beyond a finite hi of the log transform).
/// </summary>
internal static class ParameterTransforms
{
    public static double ToSolver(ParameterDefinition def, double theta) => def.Transform switch
    {
        ParameterTransform.Log => Math.Log(Math.Max(theta - LowerOf(def), double.Epsilon)),
        ParameterTransform.Logistic => Math.Log((theta - def.LowerSi) / (def.UpperSi - theta)),
        _ => theta,
    };

    public static double FromSolver(ParameterDefinition def, double x) => def.Transform switch
    {
        ParameterTransform.Log => LowerOf(def) + Math.Exp(x),
        ParameterTransform.Logistic => def.LowerSi + (def.UpperSi - def.LowerSi) / (1.0 + Math.Exp(-x)),
        _ => x,
    };

    /// <summary>dθ/dx at θ.</summary>
    public static double Derivative(ParameterDefinition def, double theta) => def.Transform switch
    {
        ParameterTransform.Log => theta - LowerOf(def),
        ParameterTransform.Logistic => (theta - def.LowerSi) * (def.UpperSi - theta) / (def.UpperSi - def.LowerSi),
        _ => 1.0,
    };

    /// <summary>
    /// Wald interval in the solver variable, mapped back: x̂ ± t·se_x through <see cref="FromSolver"/>, so it stays above
    /// the lower bound; an end beyond a finite upper bound that the transform does not enforce (the log transform of φ ≤ 20 eV,
    /// d ≤ 100 nm) is clipped to that bound, as the profile-likelihood and bootstrap ends are. The standard error by the delta
    /// method, |dθ/dx|·se_x. All three in the display unit.
    /// </summary>
    public static (double StandardError, double Lower, double Upper) WaldInterval(ParameterDefinition def, double thetaSi, double seX, double t)
    {
        double x = ToSolver(def, thetaSi);
        double se = Math.Abs(def.ToDisplay(Derivative(def, thetaSi) * seX));
        double a = ClipToUpper(def, FromSolver(def, x - t * seX));
        double b = ClipToUpper(def, FromSolver(def, x + t * seX));
        a = def.ToDisplay(a);
        b = def.ToDisplay(b);
        return (se, Math.Min(a, b), Math.Max(a, b));
    }

    private static double ClipToUpper(ParameterDefinition def, double thetaSi) =>
        double.IsFinite(def.UpperSi) && thetaSi > def.UpperSi ? def.UpperSi : thetaSi;

    /// <summary>Clamps a start value strictly inside the bounds so that its transform is finite.</summary>
    public static double Inside(ParameterDefinition def, double theta)
    {
        switch (def.Transform)
        {
            case ParameterTransform.Log:
                {
                    double lo = LowerOf(def);
                    return theta > lo ? theta : lo + Math.Max(Math.Abs(def.DefaultSi - lo), 1e-300);
                }
            case ParameterTransform.Logistic:
                {
                    double span = def.UpperSi - def.LowerSi;
                    return Math.Clamp(theta, def.LowerSi + 1e-9 * span, def.UpperSi - 1e-9 * span);
                }
            default:
                return theta;
        }
    }

    private static double LowerOf(ParameterDefinition def) => double.IsFinite(def.LowerSi) ? def.LowerSi : 0.0;

    /// <summary>Solver variables of the parameters <paramref name="index"/> of θ; false when any is not finite.</summary>
    public static bool TryToSolver(IReadOnlyList<ParameterDefinition> defs, int[] index, double[] theta, out double[] x)
    {
        x = new double[index.Length];
        bool finite = true;
        for (int j = 0; j < index.Length; j++)
        {
            x[j] = ToSolver(defs[index[j]], theta[index[j]]);
            finite &= double.IsFinite(x[j]);
        }
        return finite;
    }
}
