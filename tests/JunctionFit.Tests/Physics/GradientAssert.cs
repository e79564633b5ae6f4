using JunctionFit.Physics;
using Xunit;

namespace JunctionFit.Tests.Physics;

/// <summary>Checks analytic derivatives against central finite differences (common practice, no source).</summary>
internal static class GradientAssert
{
    /// <summary>Relative step of the central difference.</summary>
    public const double RelativeStep = 1e-6;

    /// <summary>
    /// Asserts ∂J/∂θₖ of <paramref name="model"/> at <paramref name="voltageV"/> against (J(θ + hₖ) − J(θ − hₖ)) / 2hₖ,
    /// hₖ = 1e-6·|θₖ| (or <paramref name="absoluteSteps"/> when θₖ = 0), to <paramref name="relativeTolerance"/> of the larger of
    /// |∂J/∂θₖ| and |J|/|θₖ|.
    /// </summary>
    public static void Barrier(IBarrierModel model, double voltageV, double[] parameters, double relativeTolerance = 1e-6, double[]? absoluteSteps = null)
    {
        var grad = new double[parameters.Length];
        double j = model.CurrentDensity(voltageV, parameters, grad);
        Assert.Equal(model.CurrentDensity(voltageV, parameters), j, 12);
        Check(parameters, grad, j, p => model.CurrentDensity(voltageV, p), relativeTolerance, absoluteSteps, model.Name, voltageV);
    }

    /// <summary>Same check for the junction current I(V; θ) including area and parasitics.</summary>
    public static void Junction(JunctionCurrentModel model, double voltageV, double[] parameters, double relativeTolerance = 1e-6, double[]? absoluteSteps = null)
    {
        var grad = new double[parameters.Length];
        double i = model.Current(voltageV, parameters, grad);
        Assert.Equal(model.Current(voltageV, parameters), i, 15);
        Check(parameters, grad, i, p => model.Current(voltageV, p), relativeTolerance, absoluteSteps, model.Barrier.Name + "+junction", voltageV);
    }

    private static void Check(double[] parameters, double[] grad, double value, Func<double[], double> f, double tol, double[]? absoluteSteps, string name, double v)
    {
        for (int k = 0; k < parameters.Length; k++)
        {
            double h = parameters[k] != 0 ? RelativeStep * Math.Abs(parameters[k]) : (absoluteSteps?[k] ?? 1e-9);
            if (absoluteSteps is not null && absoluteSteps[k] > 0) h = absoluteSteps[k];
            var plus = (double[])parameters.Clone();
            var minus = (double[])parameters.Clone();
            plus[k] += h;
            minus[k] -= h;
            double fd = (f(plus) - f(minus)) / (2 * h);
            double typical = parameters[k] != 0 ? Math.Abs(value / parameters[k]) : Math.Abs(value / h) * 1e-9;
            double scale = Math.Max(Math.Abs(grad[k]), typical);
            Assert.True(Math.Abs(grad[k] - fd) <= tol * scale + 1e-300,
                $"{name}: d/dθ[{k}] at V = {v}: analytic {grad[k]:R}, central difference {fd:R}, scale {scale:R}");
        }
    }

    /// <summary>Relative difference |a − b| / max(|a|, |b|).</summary>
    public static double Relative(double a, double b) => a == b ? 0 : Math.Abs(a - b) / Math.Max(Math.Abs(a), Math.Abs(b));
}
