using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Results;
using MathNet.Numerics.LinearAlgebra;
using MathNet.Numerics.Optimization;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Issue 3 item 8 and issue 6 item 6: our <see cref="LevenbergMarquardtSolver"/> against MathNet.Numerics 5.0.0's
/// <see cref="LevenbergMarquardtMinimizer"/> on the same 201-point three-parameter Simmons fit (φ, d and area free,
/// m*/mₑ = 1; see <see cref="SimmonsLogProblem"/>), from the same start, in the same run. MathNet is the baseline, so the
/// Ratio column is ours / MathNet's (target: at most 0.05, i.e. 20× faster).
/// <list type="bullet">
/// <item>MathNet: <c>ObjectiveFunction.NonlinearModel</c> over (V, ln|I|) with weights 1/s², central-difference
/// derivatives (its default accuracy order 2), default minimizer settings.</item>
/// <item>Ours, analytic Jacobian: the identical residuals with the model's analytic ∂I/∂θ.</item>
/// <item>Ours, finite differences: the identical problem with the Jacobian left to the solver's forward differences
/// (the like-for-like derivative method).</item>
/// <item>Ours, area profiled out: the same weighted least-squares problem with the area eliminated in closed form
/// (variable projection, the fitter's internal <see cref="LogCurrentProblem"/>), φ and d from the same start. Same optimum,
/// two variables instead of three: this is where most of the fitter's speed on area-free fits comes from.</item>
/// <item>The whole <see cref="JunctionFitter.Fit"/> on the same curve, area free (grid start, two starts, polish,
/// covariance, diagnostics), for scale.</item>
/// </list>
/// Both optima (RSS and parameters) are printed in the setup; <c>-- --check</c> prints them without timing.
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*SolverComparison*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class SolverComparisonBenchmarks
{
    /// <summary>The common start: φ = 1.5 eV, d = 2.0 nm, A = 100 µm² (a nominal stack and the drawn area).</summary>
    public static readonly double[] Start = SimmonsLogProblem.ToVariables(1.5, 2.0, 100.0);

    private IvCurve _curve = null!;
    private SimmonsLogProblem _analytic = null!;
    private SimmonsLogProblem _differenced = null!;
    private LogCurrentProblem _profiled = null!;
    private double[] _profiledStart = [];
    private IObjectiveModel _mathNetObjective = null!;
    private Vector<double> _mathNetStart = null!;

    [GlobalSetup]
    public void Setup()
    {
        _curve = BenchmarkCurves.SimmonsCurve();
        _analytic = new SimmonsLogProblem(_curve, BenchmarkCurves.RelativeNoise);
        _differenced = new SimmonsLogProblem(_curve, BenchmarkCurves.RelativeNoise, analyticJacobian: false);
        (_profiled, _profiledStart) = AreaProfiledOut(_analytic);
        _mathNetObjective = MathNetObjective(new SimmonsLogProblem(_curve, BenchmarkCurves.RelativeNoise));
        _mathNetStart = Vector<double>.Build.DenseOfArray(Start);
        foreach (string line in CompareOptima(_curve)) Console.WriteLine("// " + line);
    }

    [Benchmark(Baseline = true)]
    public NonlinearMinimizationResult MathNet_LevenbergMarquardt_NumericalDerivatives() =>
        new LevenbergMarquardtMinimizer().FindMinimum(_mathNetObjective, _mathNetStart);

    [Benchmark]
    public LeastSquaresSolution Ours_LevenbergMarquardt_AnalyticJacobian() =>
        LevenbergMarquardtSolver.Minimize(_analytic, Start, FitOptions.DefaultSolver);

    [Benchmark]
    public LeastSquaresSolution Ours_LevenbergMarquardt_FiniteDifferences() =>
        LevenbergMarquardtSolver.Minimize(_differenced, Start, FitOptions.DefaultSolver);

    [Benchmark]
    public LeastSquaresSolution Ours_LevenbergMarquardt_AreaProfiledOut() =>
        LevenbergMarquardtSolver.Minimize(_profiled, _profiledStart, FitOptions.DefaultSolver);

    [Benchmark]
    public FitResult Ours_JunctionFitter_Fit_AreaFree() => JunctionFitter.Fit(_curve, BenchmarkCurves.Model(Physics.BarrierModelCatalog.Simmons), BenchmarkCurves.AreaFree);

    /// <summary>
    /// The problem of <paramref name="problem"/> with the area profiled out: same points, same weights 1/s², variables
    /// ln φ and ln d (SI), m*/mₑ = 1; and the common start in those variables.
    /// </summary>
    internal static (LogCurrentProblem Problem, double[] Start) AreaProfiledOut(SimmonsLogProblem problem)
    {
        var model = BenchmarkCurves.Model(Physics.BarrierModelCatalog.Simmons);
        var inverseSigma = new double[problem.ResidualCount];
        Array.Fill(inverseSigma, problem.InverseSigma);
        var profiled = new LogCurrentProblem(model, problem.VoltageV, problem.LogAbsCurrent, inverseSigma,
            [Physics.SimmonsRectangularModel.BarrierHeightIndex, Physics.SimmonsRectangularModel.ThicknessIndex],
            BenchmarkCurves.TrueParameters(model), profileArea: true);
        var (phiEv, dNm, _) = SimmonsLogProblem.FromVariables(Start);
        return (profiled, [Math.Log(phiEv * Physics.PhysicalConstants.JoulePerElectronVolt), Math.Log(dNm * 1e-9)]);
    }

    /// <summary>
    /// MathNet's objective for the problem, written as a user of MathNet would: the model function ln|I(V; p)| over the
    /// observed voltages, the observed ln|I|, weights 1/s², numerical derivatives.
    /// </summary>
    internal static IObjectiveModel MathNetObjective(SimmonsLogProblem problem)
    {
        var x = Vector<double>.Build.DenseOfArray(problem.VoltageV);
        var y = Vector<double>.Build.DenseOfArray(problem.LogAbsCurrent);
        var w = Vector<double>.Build.Dense(problem.ResidualCount, problem.InverseSigma * problem.InverseSigma);
        Vector<double> Model(Vector<double> p, Vector<double> v)
        {
            var result = new double[v.Count];
            problem.LogModel(p.AsArray() ?? p.ToArray(), v.AsArray() ?? v.ToArray(), result);
            return Vector<double>.Build.DenseOfArray(result);
        }
        return ObjectiveFunction.NonlinearModel(Model, x, y, w);
    }

    /// <summary>Runs both solvers once from <see cref="Start"/> and says where they ended (printed, not asserted).</summary>
    internal static IEnumerable<string> CompareOptima(IvCurve curve)
    {
        var problem = new SimmonsLogProblem(curve, BenchmarkCurves.RelativeNoise);
        var ours = LevenbergMarquardtSolver.Minimize(problem, Start, FitOptions.DefaultSolver);
        var oursFd = LevenbergMarquardtSolver.Minimize(new SimmonsLogProblem(curve, BenchmarkCurves.RelativeNoise, false), Start, FitOptions.DefaultSolver);
        var mathNet = new LevenbergMarquardtMinimizer().FindMinimum(MathNetObjective(new SimmonsLogProblem(curve, BenchmarkCurves.RelativeNoise)),
            Vector<double>.Build.DenseOfArray(Start));
        double[] pm = mathNet.MinimizingPoint.ToArray();
        var (profiled, profiledStart) = AreaProfiledOut(problem);
        var oursVp = LevenbergMarquardtSolver.Minimize(profiled, profiledStart, FitOptions.DefaultSolver);
        double[] thetaVp = profiled.ToTheta(oursVp.Parameters.AsSpan());
        double[] pVp = SimmonsLogProblem.ToVariables(thetaVp[0] / Physics.PhysicalConstants.JoulePerElectronVolt, thetaVp[1] * 1e9, thetaVp[3] * 1e12);
        double rssOurs = problem.ResidualSumOfSquares(ours.Parameters.AsSpan());
        double rssFd = problem.ResidualSumOfSquares(oursFd.Parameters.AsSpan());
        double rssMathNet = problem.ResidualSumOfSquares(pm);
        var fit = JunctionFitter.Fit(curve, BenchmarkCurves.Model(Physics.BarrierModelCatalog.Simmons), BenchmarkCurves.AreaFree);
        yield return $"start:                {Point(Start)}";
        yield return $"ours (analytic J):    {Point(ours.Parameters.AsSpan())}  rss {rssOurs:G12}  iterations {ours.Iterations}, evaluations {ours.FunctionEvaluations}, {ours.Termination}";
        yield return $"ours (finite diff.):  {Point(oursFd.Parameters.AsSpan())}  rss {rssFd:G12}  iterations {oursFd.Iterations}, evaluations {oursFd.FunctionEvaluations}, {oursFd.Termination}";
        yield return $"ours (area profiled): {Point(pVp)}  rss {problem.ResidualSumOfSquares(pVp):G12}  iterations {oursVp.Iterations}, evaluations {oursVp.FunctionEvaluations}, {oursVp.Termination}";
        yield return $"MathNet LM:           {Point(pm)}  rss {rssMathNet:G12}  iterations {mathNet.Iterations}, {mathNet.ReasonForExit}";
        yield return $"JunctionFitter.Fit:   {FitBenchmarks.Describe(fit)}";
        var (a, b, c) = SimmonsLogProblem.FromVariables(ours.Parameters.AsSpan());
        var (d, e, f) = SimmonsLogProblem.FromVariables(pm);
        yield return $"relative differences ours vs MathNet: rss {(rssMathNet - rssOurs) / rssOurs:G3}, phi {(d - a) / a:G3}, d {(e - b) / b:G3}, area {(f - c) / c:G3}";
    }

    private static string Point(ReadOnlySpan<double> p)
    {
        var (phi, d, area) = SimmonsLogProblem.FromVariables(p);
        return $"phi {phi:F6} eV, d {d:F6} nm, area {area:F4} um2";
    }
}
