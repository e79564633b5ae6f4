namespace JunctionFit.Tests.Fitting;

internal delegate double NistValue(ReadOnlySpan<double> b, ReadOnlySpan<double> x);

internal delegate void NistGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g);

internal delegate DoubleDouble NistExactValue(ReadOnlySpan<double> b, ReadOnlySpan<DoubleDouble> x);

/// <summary>A NIST StRD model f(x; b) with its hand-derived gradient ∂f/∂b.</summary>
/// <param name="LogResponse">True when the certified fit is of ln y (Nelson).</param>
/// <param name="Exact">Optional double-double evaluation, for residuals below double rounding (Lanczos).</param>
internal sealed record NistModel(string Name, NistValue Value, NistGradient Gradient, bool LogResponse = false, NistExactValue? Exact = null);

/// <summary>
/// The 27 model functions of the NIST StRD nonlinear-regression datasets (formulas as listed by NIST
/// Statistical Reference Datasets, https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml), with the
/// gradients derived by hand. Parameters b1…bn are b[0]…b[n−1].
/// </summary>
internal static class NistModels
{
    public static NistModel Get(string name) => name switch
    {
        "Misra1a" or "BoxBOD" => new(name, ExpRise, ExpRiseGradient),
        "Misra1b" => new(name, Misra1b, Misra1bGradient),
        "Misra1c" => new(name, Misra1c, Misra1cGradient),
        "Misra1d" => new(name, Misra1d, Misra1dGradient),
        "Chwirut1" or "Chwirut2" => new(name, Chwirut, ChwirutGradient),
        "DanWood" => new(name, DanWood, DanWoodGradient),
        "Lanczos1" or "Lanczos2" or "Lanczos3" => new(name, Lanczos, LanczosGradient, Exact: LanczosExact),
        "Gauss1" or "Gauss2" or "Gauss3" => new(name, Gauss, GaussGradient),
        "Hahn1" or "Thurber" => new(name, CubicRational, CubicRationalGradient),
        "Kirby2" => new(name, Kirby2, Kirby2Gradient),
        "MGH09" => new(name, Mgh09, Mgh09Gradient),
        "MGH10" => new(name, Mgh10, Mgh10Gradient),
        "MGH17" => new(name, Mgh17, Mgh17Gradient),
        "Eckerle4" => new(name, Eckerle4, Eckerle4Gradient),
        "Rat42" => new(name, Rat42, Rat42Gradient),
        "Rat43" => new(name, Rat43, Rat43Gradient),
        "Bennett5" => new(name, Bennett5, Bennett5Gradient),
        "ENSO" => new(name, Enso, EnsoGradient),
        "Roszman1" => new(name, Roszman1, Roszman1Gradient),
        "Nelson" => new(name, Nelson, NelsonGradient, LogResponse: true),
        _ => throw new ArgumentOutOfRangeException(nameof(name), name, "unknown NIST dataset"),
    };

    // y = b1 (1 − e^{−b2 x})
    private static double ExpRise(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * (1 - Math.Exp(-b[1] * x[0]));

    private static void ExpRiseGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double e = Math.Exp(-b[1] * x[0]);
        g[0] = 1 - e;
        g[1] = b[0] * x[0] * e;
    }

    // y = b1 (1 − (1 + b2 x/2)^−2)
    private static double Misra1b(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double u = 1 + (b[1] * x[0] / 2);
        return b[0] * (1 - (1 / (u * u)));
    }

    private static void Misra1bGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double u = 1 + (b[1] * x[0] / 2);
        g[0] = 1 - (1 / (u * u));
        g[1] = b[0] * x[0] / (u * u * u);
    }

    // y = b1 (1 − (1 + 2 b2 x)^−1/2)
    private static double Misra1c(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * (1 - (1 / Math.Sqrt(1 + (2 * b[1] * x[0]))));

    private static void Misra1cGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double u = 1 + (2 * b[1] * x[0]);
        double s = Math.Sqrt(u);
        g[0] = 1 - (1 / s);
        g[1] = b[0] * x[0] / (u * s);
    }

    // y = b1 b2 x / (1 + b2 x)
    private static double Misra1d(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * b[1] * x[0] / (1 + (b[1] * x[0]));

    private static void Misra1dGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double u = 1 + (b[1] * x[0]);
        g[0] = b[1] * x[0] / u;
        g[1] = b[0] * x[0] / (u * u);
    }

    // y = e^{−b1 x} / (b2 + b3 x)
    private static double Chwirut(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => Math.Exp(-b[0] * x[0]) / (b[1] + (b[2] * x[0]));

    private static void ChwirutGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double v = b[1] + (b[2] * x[0]);
        double f = Math.Exp(-b[0] * x[0]) / v;
        g[0] = -x[0] * f;
        g[1] = -f / v;
        g[2] = -x[0] * f / v;
    }

    // y = b1 x^b2
    private static double DanWood(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * Math.Pow(x[0], b[1]);

    private static void DanWoodGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double p = Math.Pow(x[0], b[1]);
        g[0] = p;
        g[1] = b[0] * p * Math.Log(x[0]);
    }

    // y = b1 e^{−b2 x} + b3 e^{−b4 x} + b5 e^{−b6 x}
    private static double Lanczos(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
        => (b[0] * Math.Exp(-b[1] * x[0])) + (b[2] * Math.Exp(-b[3] * x[0])) + (b[4] * Math.Exp(-b[5] * x[0]));

    private static DoubleDouble LanczosExact(ReadOnlySpan<double> b, ReadOnlySpan<DoubleDouble> x)
    {
        DoubleDouble sum = 0.0;
        for (int k = 0; k < 6; k += 2)
        {
            sum += DoubleDouble.Exp(-((DoubleDouble)b[k + 1] * x[0])) * b[k];
        }

        return sum;
    }

    private static void LanczosGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        for (int k = 0; k < 6; k += 2)
        {
            double e = Math.Exp(-b[k + 1] * x[0]);
            g[k] = e;
            g[k + 1] = -b[k] * x[0] * e;
        }
    }

    // y = b1 e^{−b2 x} + b3 e^{−(x−b4)²/b5²} + b6 e^{−(x−b7)²/b8²}
    private static double Gauss(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double t = x[0];
        double u = (t - b[3]) / b[4];
        double w = (t - b[6]) / b[7];
        return (b[0] * Math.Exp(-b[1] * t)) + (b[2] * Math.Exp(-u * u)) + (b[5] * Math.Exp(-w * w));
    }

    private static void GaussGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double t = x[0];
        double e = Math.Exp(-b[1] * t);
        g[0] = e;
        g[1] = -b[0] * t * e;
        for (int k = 2; k <= 5; k += 3)
        {
            double d = t - b[k + 1];
            double s = b[k + 2];
            double q = Math.Exp(-(d * d) / (s * s));
            g[k] = q;
            g[k + 1] = b[k] * q * 2 * d / (s * s);
            g[k + 2] = b[k] * q * 2 * d * d / (s * s * s);
        }
    }

    // y = (b1 + b2 x + b3 x² + b4 x³) / (1 + b5 x + b6 x² + b7 x³)
    private static double CubicRational(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double t = x[0];
        return (b[0] + (t * (b[1] + (t * (b[2] + (t * b[3])))))) / (1 + (t * (b[4] + (t * (b[5] + (t * b[6]))))));
    }

    private static void CubicRationalGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double t = x[0];
        double num = b[0] + (t * (b[1] + (t * (b[2] + (t * b[3])))));
        double den = 1 + (t * (b[4] + (t * (b[5] + (t * b[6])))));
        double p = 1;
        for (int k = 0; k < 4; k++)
        {
            g[k] = p / den;
            p *= t;
        }

        p = t;
        for (int k = 4; k < 7; k++)
        {
            g[k] = -num * p / (den * den);
            p *= t;
        }
    }

    // y = (b1 + b2 x + b3 x²) / (1 + b4 x + b5 x²)
    private static double Kirby2(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double t = x[0];
        return (b[0] + (b[1] * t) + (b[2] * t * t)) / (1 + (b[3] * t) + (b[4] * t * t));
    }

    private static void Kirby2Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double t = x[0];
        double num = b[0] + (b[1] * t) + (b[2] * t * t);
        double den = 1 + (b[3] * t) + (b[4] * t * t);
        g[0] = 1 / den;
        g[1] = t / den;
        g[2] = t * t / den;
        g[3] = -num * t / (den * den);
        g[4] = -num * t * t / (den * den);
    }

    // y = b1 (x² + x b2) / (x² + x b3 + b4)
    private static double Mgh09(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double t = x[0];
        return b[0] * ((t * t) + (t * b[1])) / ((t * t) + (t * b[2]) + b[3]);
    }

    private static void Mgh09Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double t = x[0];
        double num = (t * t) + (t * b[1]);
        double den = (t * t) + (t * b[2]) + b[3];
        g[0] = num / den;
        g[1] = b[0] * t / den;
        g[2] = -b[0] * num * t / (den * den);
        g[3] = -b[0] * num / (den * den);
    }

    // y = b1 e^{b2/(x + b3)}
    private static double Mgh10(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * Math.Exp(b[1] / (x[0] + b[2]));

    private static void Mgh10Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double w = x[0] + b[2];
        double e = Math.Exp(b[1] / w);
        g[0] = e;
        g[1] = b[0] * e / w;
        g[2] = -b[0] * e * b[1] / (w * w);
    }

    // y = b1 + b2 e^{−x b4} + b3 e^{−x b5}
    private static double Mgh17(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
        => b[0] + (b[1] * Math.Exp(-x[0] * b[3])) + (b[2] * Math.Exp(-x[0] * b[4]));

    private static void Mgh17Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double e4 = Math.Exp(-x[0] * b[3]);
        double e5 = Math.Exp(-x[0] * b[4]);
        g[0] = 1;
        g[1] = e4;
        g[2] = e5;
        g[3] = -b[1] * x[0] * e4;
        g[4] = -b[2] * x[0] * e5;
    }

    // y = (b1/b2) e^{−((x − b3)/b2)²/2}
    private static double Eckerle4(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double z = (x[0] - b[2]) / b[1];
        return b[0] / b[1] * Math.Exp(-0.5 * z * z);
    }

    private static void Eckerle4Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double z = (x[0] - b[2]) / b[1];
        double q = Math.Exp(-0.5 * z * z);
        g[0] = q / b[1];
        g[1] = b[0] / (b[1] * b[1]) * q * ((z * z) - 1);
        g[2] = b[0] / (b[1] * b[1]) * q * z;
    }

    // y = b1 / (1 + e^{b2 − b3 x})
    private static double Rat42(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] / (1 + Math.Exp(b[1] - (b[2] * x[0])));

    private static void Rat42Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double e = Math.Exp(b[1] - (b[2] * x[0]));
        double u = 1 + e;
        g[0] = 1 / u;
        g[1] = -b[0] * e / (u * u);
        g[2] = b[0] * e * x[0] / (u * u);
    }

    // y = b1 / (1 + e^{b2 − b3 x})^{1/b4}
    private static double Rat43(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] / Math.Pow(1 + Math.Exp(b[1] - (b[2] * x[0])), 1 / b[3]);

    private static void Rat43Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double e = Math.Exp(b[1] - (b[2] * x[0]));
        double u = 1 + e;
        double p = Math.Pow(u, -1 / b[3]);
        g[0] = p;
        g[1] = -b[0] * p * e / (b[3] * u);
        g[2] = b[0] * p * e * x[0] / (b[3] * u);
        g[3] = b[0] * p * Math.Log(u) / (b[3] * b[3]);
    }

    // y = b1 (b2 + x)^{−1/b3}
    private static double Bennett5(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] * Math.Pow(b[1] + x[0], -1 / b[2]);

    private static void Bennett5Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double w = b[1] + x[0];
        double p = Math.Pow(w, -1 / b[2]);
        g[0] = p;
        g[1] = -b[0] * p / (b[2] * w);
        g[2] = b[0] * p * Math.Log(w) / (b[2] * b[2]);
    }

    // y = b1 + b2 cos(2πx/12) + b3 sin(2πx/12) + b5 cos(2πx/b4) + b6 sin(2πx/b4) + b8 cos(2πx/b7) + b9 sin(2πx/b7)
    private static double Enso(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
    {
        double w = 2 * Math.PI * x[0];
        return b[0] + (b[1] * Math.Cos(w / 12)) + (b[2] * Math.Sin(w / 12))
            + (b[4] * Math.Cos(w / b[3])) + (b[5] * Math.Sin(w / b[3]))
            + (b[7] * Math.Cos(w / b[6])) + (b[8] * Math.Sin(w / b[6]));
    }

    private static void EnsoGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double w = 2 * Math.PI * x[0];
        g[0] = 1;
        g[1] = Math.Cos(w / 12);
        g[2] = Math.Sin(w / 12);
        for (int k = 3; k <= 6; k += 3)
        {
            double period = b[k];
            double a = w / period;
            double c = Math.Cos(a);
            double s = Math.Sin(a);
            g[k + 1] = c;
            g[k + 2] = s;
            // ∂a/∂period = −w/period²
            g[k] = ((-b[k + 1] * s) + (b[k + 2] * c)) * (-w / (period * period));
        }
    }

    // y = b1 − b2 x − arctan(b3/(x − b4))/π
    private static double Roszman1(ReadOnlySpan<double> b, ReadOnlySpan<double> x)
        => b[0] - (b[1] * x[0]) - (Math.Atan(b[2] / (x[0] - b[3])) / Math.PI);

    private static void Roszman1Gradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double w = x[0] - b[3];
        double q = b[2] / w;
        double d = Math.PI * (1 + (q * q));
        g[0] = 1;
        g[1] = -x[0];
        g[2] = -1 / (w * d);
        g[3] = -b[2] / (w * w * d);
    }

    // ln y = b1 − b2 x1 e^{−b3 x2}
    private static double Nelson(ReadOnlySpan<double> b, ReadOnlySpan<double> x) => b[0] - (b[1] * x[0] * Math.Exp(-b[2] * x[1]));

    private static void NelsonGradient(ReadOnlySpan<double> b, ReadOnlySpan<double> x, Span<double> g)
    {
        double e = Math.Exp(-b[2] * x[1]);
        g[0] = 1;
        g[1] = -x[0] * e;
        g[2] = b[1] * x[0] * x[1] * e;
    }
}

/// <summary>Residuals rᵢ = f(xᵢ; b) − yᵢ (ln yᵢ for Nelson) of a NIST dataset.</summary>
internal sealed class NistProblem(NistDataset data, NistModel model, bool analytic = true) : JunctionFit.Fitting.ILeastSquaresProblem
{
    private readonly double[] _response = Response(data, model);
    private readonly DoubleDouble[]? _exactResponse = model.Exact is null ? null : Array.ConvertAll(data.YText, DoubleDouble.Parse);
    private readonly DoubleDouble[]? _exactPredictors = model.Exact is null ? null : Array.ConvertAll(data.PredictorText, DoubleDouble.Parse);

    public int ResidualCount => data.ObservationCount;
    public int ParameterCount => data.ParameterCount;
    public bool HasAnalyticJacobian => analytic;

    public void Evaluate(ReadOnlySpan<double> x, Span<double> residuals)
    {
        int p = data.PredictorCount;
        if (model.Exact is { } exact && _exactResponse is not null && _exactPredictors is not null)
        {
            // Residual formed in double-double and rounded once: |r| ~ 1e-13 for Lanczos1, far below ε·|y|.
            for (int i = 0; i < residuals.Length; i++)
            {
                residuals[i] = (exact(x, _exactPredictors.AsSpan(i * p, p)) - _exactResponse[i]).ToDouble();
            }

            return;
        }

        for (int i = 0; i < residuals.Length; i++)
        {
            residuals[i] = model.Value(x, data.Predictors.AsSpan(i * p, p)) - _response[i];
        }
    }

    public void Jacobian(ReadOnlySpan<double> x, Span<double> jacobian)
    {
        int p = data.PredictorCount;
        int n = data.ParameterCount;
        for (int i = 0; i < data.ObservationCount; i++)
        {
            model.Gradient(x, data.Predictors.AsSpan(i * p, p), jacobian.Slice(i * n, n));
        }
    }

    private static double[] Response(NistDataset data, NistModel model)
    {
        var r = (double[])data.Y.Clone();
        if (model.LogResponse)
        {
            for (int i = 0; i < r.Length; i++)
            {
                r[i] = Math.Log(r[i]);
            }
        }

        return r;
    }
}
