using System.Globalization;
using System.Text;
using BenchmarkDotNet.Attributes;
using BenchmarkDotNet.Engines;
using JunctionFit.Import;
using JunctionFit.Physics;

namespace JunctionFit.Benchmarks;

/// <summary>
/// Importer speed. Three files: a million-row <c>Voltage (V),Current (A)</c> file (about 40 MB; target: under one second
/// per file on a 2-core laptop); a typical probe-station file of about 1 MB (metadata preamble, then a noisy simulated
/// sweep written with round-trip precision), for the time per MB; and a typical 201-point file (about 8 KB), the per-file
/// cost that the <c>fit</c> command pays for each die. Sizes are printed in the setup.
/// Run with <c>dotnet run -c Release --project tests/JunctionFit.Benchmarks -- --filter '*ImportBenchmarks*'</c>.
/// </summary>
[MemoryDiagnoser]
[SimpleJob(RunStrategy.Throughput, launchCount: 1, warmupCount: 3, iterationCount: 8)]
public class ImportBenchmarks
{
    /// <summary>Target size of the typical large file: 1 MB (10⁶ bytes).</summary>
    public const int TypicalBytes = 1_000_000;

    private string _path = string.Empty;
    private string _text = string.Empty;
    private string _typicalPath = string.Empty;
    private string _typicalText = string.Empty;
    private string _smallPath = string.Empty;

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

        _typicalText = TypicalFile(TypicalBytes);
        _typicalPath = Path.Combine(Path.GetTempPath(), $"jf-bench-typical-{Environment.ProcessId}.csv");
        File.WriteAllText(_typicalPath, _typicalText, new UTF8Encoding(false));
        _smallPath = Path.Combine(Path.GetTempPath(), $"jf-bench-201-{Environment.ProcessId}.csv");
        File.WriteAllText(_smallPath, TypicalFile(0, BenchmarkCurves.Points), new UTF8Encoding(false));
        Console.WriteLine($"// million-row file {new FileInfo(_path).Length} bytes; typical file {new FileInfo(_typicalPath).Length} bytes, " +
                          $"{IvFileReader.ReadFile(_typicalPath).Count} points; 201-point file {new FileInfo(_smallPath).Length} bytes");
    }

    [GlobalCleanup]
    public void Cleanup()
    {
        File.Delete(_path);
        File.Delete(_typicalPath);
        File.Delete(_smallPath);
    }

    /// <summary>Whole path: read the bytes, decode, detect, parse.</summary>
    [Benchmark]
    public int ReadFile_MillionRows() => IvFileReader.ReadFile(_path).Count;

    /// <summary>Parsing only, from text already in memory.</summary>
    [Benchmark]
    public int Parse_MillionRows() => IvFileReader.Parse(_text, "bench.csv").Count;

    /// <summary>Whole path for a typical 1 MB file: the time per MB.</summary>
    [Benchmark]
    public int ReadFile_Typical1MB() => IvFileReader.ReadFile(_typicalPath).Count;

    /// <summary>Parsing only, typical 1 MB file from memory.</summary>
    [Benchmark]
    public int Parse_Typical1MB() => IvFileReader.Parse(_typicalText, "typical.csv").Count;

    /// <summary>Whole path for one typical 201-point die file.</summary>
    [Benchmark]
    public int ReadFile_Typical201Points() => IvFileReader.ReadFile(_smallPath).Count;

    /// <summary>
    /// A probe-station-like file: a metadata preamble as the sample lot has, then a Simmons sweep over ±1.2 V with 1 % noise,
    /// with enough points to reach <paramref name="minimumBytes"/> (or exactly <paramref name="points"/> when given).
    /// </summary>
    internal static string TypicalFile(int minimumBytes, int? points = null)
    {
        const string Preamble = "# lab: benchmark (simulated, invented)\n# lot: BENCH-01\n# wafer: W01\n# die: 3,4\n# area: 100 um2\n" +
                                "# temperature: 295 K\n# note: simulated: simmons phi=2.0 eV d=1.5 nm area=100 um2 noise=1%\nVoltage (V),Current (A)\n";
        int n = points ?? Math.Max(2, (minimumBytes - Preamble.Length) / 40);
        while (true)
        {
            var model = BenchmarkCurves.Model(BarrierModelCatalog.Simmons);
            var spec = new SimulationSpec(BenchmarkCurves.FromV, BenchmarkCurves.ToV, n) { RelativeNoise = BenchmarkCurves.RelativeNoise, Seed = 7 };
            var (v, i) = IvSimulator.Simulate(model, BenchmarkCurves.TrueParameters(model), spec);
            var sb = new StringBuilder(Preamble, Preamble.Length + (48 * n));
            for (int k = 0; k < n; k++)
            {
                sb.Append(v[k].ToString("R", CultureInfo.InvariantCulture)).Append(',')
                  .Append(i[k].ToString("R", CultureInfo.InvariantCulture)).Append('\n');
            }
            if (points is not null || sb.Length >= minimumBytes) return sb.ToString();
            n += Math.Max(1, (minimumBytes - sb.Length) / 30);
        }
    }
}
