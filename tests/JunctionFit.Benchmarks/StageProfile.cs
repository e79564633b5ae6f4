using System.Collections.Immutable;
using System.Diagnostics;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Reporting;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Where the per-curve time of <c>fit FOLDER --area A --json</c> goes, stage by stage, on real files in memory after a
/// warm-up (so without process start and JIT): decode and parse, the whole fit, the parts of it (masks and noise estimate,
/// transition voltage) and the JSON line, against the model floor (one residual and one Jacobian evaluation of the
/// fit's problem at the optimum). Stopwatch figures in one process, single thread.
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --stages FOLDER [AREA_UM2] [PASSES]</c>.
/// </summary>
internal static class StageProfile
{
    public static void Run(string folder, double areaUm2, int passes)
    {
        var files = Directory.GetFiles(folder, "*.csv").Order(StringComparer.Ordinal).ToArray();
        var bytes = files.Select(File.ReadAllBytes).ToArray();
        var model = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
        var options = FitOptions.Default with
        {
            FixedValues = ImmutableDictionary<ParameterKey, double>.Empty.Add(ParameterKey.Area, areaUm2 * 1e-12).Add(ParameterKey.MassRatio, 1.0),
        };
        var curves = new IvCurve[files.Length];
        var results = new Results.FitResult[files.Length];
        double Time(string label, Action<int> body, double floorUs = 0)
        {
            // Warm up, give the background tier-1 compilation time, warm up again: the figures are of optimised code.
            for (int k = 0; k < files.Length; k++) body(k);
            Thread.Sleep(500);
            for (int k = 0; k < files.Length; k++) body(k);
            long a0 = GC.GetAllocatedBytesForCurrentThread();
            long t0 = Stopwatch.GetTimestamp();
            for (int p = 0; p < passes; p++)
            for (int k = 0; k < files.Length; k++) body(k);
            double us = Stopwatch.GetElapsedTime(t0).TotalMicroseconds / (passes * files.Length);
            double kb = (GC.GetAllocatedBytesForCurrentThread() - a0) / 1024.0 / (passes * files.Length);
            Console.WriteLine(floorUs > 0 ? $"  {label,-46} {us,9:F1} us  {kb,7:F1} KB  ({us / floorUs:F1}x the floor)" : $"  {label,-46} {us,9:F1} us  {kb,7:F1} KB");
            return us;
        }
        Console.WriteLine($"{files.Length} files from {folder}, {passes} passes, per curve:");
        Time("read: decode + parse (from bytes in memory)", k => curves[k] = IvFileReader.ParseBytes(bytes[k], files[k], files[k], IvReadOptions.Default).Curve);
        var texts = bytes.Select(b => TextDecoder.Decode(b, out _)).ToArray();
        Time("  longest line", k => TextDecoder.LongestByteRun(bytes[k]));
        Time("  decode", k => TextDecoder.Decode(bytes[k], out _));
        Time("  split lines", k => LineTable.Build(texts[k], IvReadOptions.Default.MaxLineLength));
        Time("  parse text", k => IvTableParser.Parse(texts[k], files[k], files[k], IvReadOptions.Default, "UTF-8"));

        // The floor: one residual and one Jacobian evaluation of the area-known problem at the optimum, times the
        // iterations the fit reports.
        var curve0 = curves[0];
        var data = PreparedCurve.From(curve0, options);
        double[] theta = [2.0 * PhysicalConstants.JoulePerElectronVolt, 1.5e-9, 1.0, areaUm2 * 1e-12];
        var problem = new LogCurrentProblem(model, data.VoltageV, data.LogAbsCurrent, data.InverseSigma, [0, 1], theta);
        var x = new double[] { Math.Log(theta[0]), Math.Log(theta[1]) };
        var r = new double[data.VoltageV.Length];
        var jac = new double[data.VoltageV.Length * 2];
        for (int k = 0; k < 2000; k++) { problem.Evaluate(x, r); x[0] += 1e-12; problem.Jacobian(x, jac); }
        long tf = Stopwatch.GetTimestamp();
        const int evals = 20000;
        for (int k = 0; k < evals; k++) { x[0] += 1e-12; problem.Evaluate(x, r); problem.Jacobian(x, jac); }
        double evalUs = Stopwatch.GetElapsedTime(tf).TotalMicroseconds / evals;
        var sample = JunctionFitter.Fit(curve0, model, options);
        int iterations = sample.Quality?.Iterations ?? 10;
        double floorUs = evalUs * iterations;
        Console.WriteLine($"  model floor: residuals + Jacobian {evalUs:F2} us x {iterations} iterations = {floorUs:F1} us");

        Time("fit: JunctionFitter.Fit (everything)", k => results[k] = JunctionFitter.Fit(curves[k], model, options), floorUs);
        Time("  masks, ln|I|, noise estimate (PreparedCurve)", k => PreparedCurve.From(curves[k], options), floorUs);
        Time("    typical step", k => NoiseFloorEstimator.TypicalStepV(curves[k].VoltageV.AsSpan()), floorUs);
        Time("    noise floor estimate", k => NoiseFloorEstimator.Estimate(curves[k].VoltageV.AsSpan(), curves[k].CurrentA.AsSpan(), default), floorUs);
        Time("    settling points", k => CurveDiagnostics.SettlingPoints(curves[k].VoltageV.AsSpan(), curves[k].CurrentA.AsSpan(), 0.012), floorUs);
        var prepared = curves.Select(c => PreparedCurve.From(c, options)).ToArray();
        Time("    relative noise (one of two)", k => NoiseEstimator.RelativeNoise(prepared[k].VoltageV, prepared[k].LogAbsCurrent), floorUs);
        double[] template = [1.0 * PhysicalConstants.JoulePerElectronVolt, 1e-9, 1.0, areaUm2 * 1e-12];
        bool[] free = [true, true, false, false];
        var starts = new List<double[]>[files.Length];
        Time("  start grid (GridStarts)", k => starts[k] = JunctionFitter.GridStarts(model, template, free, prepared[k].VoltageV, prepared[k].LogAbsCurrent, prepared[k].InverseSigma, 2), floorUs);
        var solutions = new LeastSquaresSolution[files.Length];
        Time("  one solve from the best grid cell", k =>
        {
            var pk = prepared[k];
            var prob = new LogCurrentProblem(model, pk.VoltageV, pk.LogAbsCurrent, pk.InverseSigma, [0, 1], template);
            double[] s0 = starts[k][0];
            solutions[k] = LevenbergMarquardtSolver.Minimize(prob, [ParameterTransforms.ToSolver(model.Parameters[0], s0[0]), ParameterTransforms.ToSolver(model.Parameters[1], s0[1])], options.Solver);
        }, floorUs);
        Time("  covariance", k => LinearizedCovariance.Compute(solutions[k]), floorUs);
        Time("  transition voltage", k => TransitionVoltage.Compute(curves[k].VoltageV.AsSpan(), curves[k].CurrentA.AsSpan()), floorUs);
        Time("json: FitJsonFormatter.Format", k => FitJsonFormatter.Format(results[k]), floorUs);
    }
}
