using BenchmarkDotNet.Running;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Entry point: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*'</c> runs BenchmarkDotNet;
/// <c>-- --check</c> prints the optima of the solver comparison, <c>-- --profile</c> where the time of one fit goes.
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
        BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
    }
}
