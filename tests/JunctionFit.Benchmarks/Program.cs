using BenchmarkDotNet.Running;

namespace JunctionFit.Benchmarks;

/// <summary>Entry point: <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*'</c>.</summary>
public static class Program
{
    public static void Main(string[] args) => BenchmarkSwitcher.FromAssembly(typeof(Program).Assembly).Run(args);
}
