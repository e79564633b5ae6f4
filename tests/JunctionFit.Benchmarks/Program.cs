namespace JunctionFit.Benchmarks; public static class Program { public static void Main(string[] args) {} }
