using System.Globalization;
using System.Text;
using BenchmarkDotNet.Attributes;
using JunctionFit.Import;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Importer speed on a million-row <c>Voltage (V),Current (A)</c> file (about 40 MB). Target: under
/// one second per file on a 2-core laptop. Run with
/// <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*ImportBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
public class ImportBenchmarks
{
    private string _path = string.Empty;
    private string _text = string.Empty;

    [GlobalSetup]
    public void Setup()
    {
        _path = Path.Combine(Path.GetTempPath(), $"jf-bench-million-{Environment.ProcessId}.csv");
        var sb = new StringBuilder(48_000_000);
        sb.Append("# lot: KM-A01\n# area: 100 um2\nVoltage (V),Current (A)\n");
        for (int k = 0; k < 1_000_000; k++)
        {
            double v = -1.0 + (2.0 * k / 999_999);
            double i = 1e-9 * Math.Sinh(3 * v);
            sb.Append(v.ToString("R", CultureInfo.InvariantCulture)).Append(',')
              .Append(i.ToString("R", CultureInfo.InvariantCulture)).Append('\n');
        }
        _text = sb.ToString();
        File.WriteAllText(_path, _text, new UTF8Encoding(false));
    }

    [GlobalCleanup]
    public void Cleanup() => File.Delete(_path);

    /// <summary>Whole path: read the bytes, decode, detect, parse.</summary>
    [Benchmark]
    public int ReadFile_MillionRows() => IvFileReader.ReadFile(_path).Count;

    /// <summary>Parsing only, from text already in memory.</summary>
    [Benchmark]
    public int Parse_MillionRows() => IvFileReader.Parse(_text, "bench.csv").Count;
}
