using System.Diagnostics;
using JunctionFit.Fitting;
using JunctionFit.Import;
using JunctionFit.Physics;
using JunctionFit.Reporting;

namespace JunctionFit.Benchmarks;

/// <summary>
/// A plain loop for profilers (<c>perf record</c> with <c>DOTNET_PerfMapEnabled=1</c>) and a first breakdown of one fit:
/// how many model values and gradients a fit asks for, what they cost at the measured per-point price, and what is left
/// for the solver's linear algebra, the covariance and the diagnostics. Not a benchmark: stopwatch figures, one process.
/// Run: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --profile [fits]</c>.
/// </summary>
internal static class FitProfile
{
    public static void Run(int fits)
    {
        var curves = new IvCurve[64];
        for (int k = 0; k < curves.Length; k++) curves[k] = BenchmarkCurves.SimmonsCurve(k + 1);
        var voltages = BenchmarkCurves.Voltages();
        foreach (var (label, options) in new[] { ("area known", BenchmarkCurves.AreaKnown), ("area free", BenchmarkCurves.AreaFree) })
        {
            var counter = new CountingBarrierModel(SimmonsRectangularModel.Instance);
            var model = new JunctionCurrentModel(counter);
            for (int k = 0; k < 200; k++) JunctionFitter.Fit(curves[k % curves.Length], model, options); // warm up (tiered JIT)
            counter.Reset();
            long t0 = Stopwatch.GetTimestamp();
            int iterations = 0;
            for (int k = 0; k < fits; k++) iterations += JunctionFitter.Fit(curves[k % curves.Length], model, options).Quality?.Iterations ?? 0;
            double fitUs = Stopwatch.GetElapsedTime(t0).TotalMicroseconds / fits;
            double values = (double)counter.Values / fits, gradients = (double)counter.Gradients / fits;

            var plain = new JunctionCurrentModel(SimmonsRectangularModel.Instance);
            var theta = BenchmarkCurves.TrueParameters(plain);
            var gradient = new double[theta.Length];
            double valueNs = PerPointNs(voltages, v => plain.Current(v, theta));
            double gradientNs = PerPointNs(voltages, v => plain.Current(v, theta, gradient));
            double modelUs = (values * valueNs + gradients * gradientNs) / 1000.0;
            Console.WriteLine($"{label}: {fitUs:F1} us per fit, {(double)iterations / fits:F1} LM iterations (all starts)");
            Console.WriteLine($"  model values per fit:    {values,8:F0} x {valueNs,5:F1} ns = {values * valueNs / 1000.0,7:F1} us" +
                              $"  (grid: {GridValues} of them)");
            Console.WriteLine($"  model gradients per fit: {gradients,8:F0} x {gradientNs,5:F1} ns = {gradients * gradientNs / 1000.0,7:F1} us");
            Console.WriteLine($"  everything else (solver algebra, covariance SVD, diagnostics, allocation): {fitUs - modelUs:F1} us");

            var result = JunctionFitter.Fit(curves[0], plain, options);
            for (int k = 0; k < 200; k++) FitJsonFormatter.Format(result);
            long t1 = Stopwatch.GetTimestamp();
            for (int k = 0; k < fits; k++) FitJsonFormatter.Format(result);
            Console.WriteLine($"  JSON line: {Stopwatch.GetElapsedTime(t1).TotalMicroseconds / fits:F1} us");
        }
    }

    /// <summary>Model values the start grid asks for: 12 × 12 cells (φ, d free) on 48 points.</summary>
    private const int GridValues = 12 * 12 * 48;

    private static double PerPointNs(double[] voltages, Func<double, double> f)
    {
        double sink = 0;
        for (int r = 0; r < 2000; r++) foreach (double v in voltages) sink += f(v);
        const int Rounds = 20000;
        long t = Stopwatch.GetTimestamp();
        for (int r = 0; r < Rounds; r++) foreach (double v in voltages) sink += f(v);
        double ns = Stopwatch.GetElapsedTime(t).TotalNanoseconds / ((double)Rounds * voltages.Length);
        return double.IsNaN(sink) ? -ns : ns;
    }

    /// <summary>Counts value and gradient calls of the wrapped barrier model (single-threaded use only).</summary>
    private sealed class CountingBarrierModel(IBarrierModel inner) : IBarrierModel
    {
        public long Values { get; private set; }

        public long Gradients { get; private set; }

        public string Name => inner.Name;

        public string Description => inner.Description;

        public IReadOnlyList<ParameterDefinition> Parameters => inner.Parameters;

        public string ValidityRange => inner.ValidityRange;

        public void Reset() => (Values, Gradients) = (0, 0);

        public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters)
        {
            Values++;
            return inner.CurrentDensity(voltageV, parameters);
        }

        public double CurrentDensity(double voltageV, ReadOnlySpan<double> parameters, Span<double> gradient)
        {
            Gradients++;
            return inner.CurrentDensity(voltageV, parameters, gradient);
        }

        public IReadOnlyList<string> CheckValidity(double maxAbsVoltageV, ReadOnlySpan<double> parameters) => inner.CheckValidity(maxAbsVoltageV, parameters);
    }
}
