using BenchmarkDotNet.Running;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Entry point: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*'</c> runs BenchmarkDotNet;
/// <c>-- --check</c> prints the optima of the solver comparison, <c>-- --profile</c> where the time of one fit goes,
/// <c>-- --stages FOLDER [AREA_UM2] [PASSES]</c> the per-curve cost of each stage of the fit command on real files.
/// </summary>
public static class Program
{
    public static void Main(string[] args)
    {
        if (args is ["--check"])
        {
            foreach (string line in SolverComparisonBenchmarks.CompareOptima(BenchmarkCurves.SimmonsCurve())) Console.WriteLine(line);
            return;
        }
        if (args is ["--profile", ..])
        {
            FitProfile.Run(args.Length > 1 ? int.Parse(args[1], System.Globalization.CultureInfo.InvariantCulture) : 2000);
            return;
        }
        if (args is ["--stages", string folder, ..])
        {
            var inv = System.Globalization.CultureInfo.InvariantCulture;
            StageProfile.Run(folder, args.Length > 2 ? double.Parse(args[2], inv) : 100.0, args.Length > 3 ? int.Parse(args[3], inv) : 3);
            return;
        }
        BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
    }
}
