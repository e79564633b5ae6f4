using System.Text.Json;
using JunctionFit.Common;
using JunctionFit.Import;
using JunctionFit.Tests.Cli;
using Xunit;

namespace JunctionFit.Tests.Import;

/// <summary>
/// Real measured files read as they are, with no column option. The files are byte-identical copies in
/// Reference/RealData (see the SOURCE.md and LICENSE beside them):
/// molecular-sam-ag — ddomlab "Metadata Analysis to Reveal Environmental Effects in Large-Area Molecular
/// Tunneling Junctions" data set, datasets/raw, MIT licence; gate-oxide-nmos — IHP Open PDK SG13G2 MOS
/// measurement data, Apache-2.0 licence.
/// </summary>
public class RealDataImportTests
{
    private static string Ag(string name) => Path.Combine(AppContext.BaseDirectory, "Reference", "RealData", "molecular-sam-ag", name);

    private static string Nmos(string name) => Path.Combine(AppContext.BaseDirectory, "Reference", "RealData", "gate-oxide-nmos", name);

    public static TheoryData<string, double> AgTrace1Files => new()
    {
        // Expected areas: |current| / |J| of every row of the file, computed outside the importer (awk over all
        // 43 rows; the smallest and largest ratio agree to 6 digits). Data set: ddomlab molecular-sam-ag, MIT.
        { "ag_c10_trace1_data.txt", 1.25664e-5 },
        { "ag_c12_trace1_data.txt", 3.14159e-6 },
        { "ag_c14_trace1_data.txt", 1.40014e-5 },
        { "ag_c16_trace1_data.txt", 5.58505e-6 },
    };

    private static readonly string[] AgFileNames =
    [
        "ag_c10_trace1_data.txt", "ag_c12_trace1_data.txt", "ag_c14_trace1_data.txt", "ag_c16_trace1_data.txt", "ag_c10_trace2-11_data.txt",
    ];

    public static TheoryData<string> AgFiles => new(AgFileNames);

    [Theory]
    [MemberData(nameof(AgTrace1Files))]
    public void Describe_AgTrace1File_ColumnsByNameUnitsAndAreaFromIOverJ(string file, double areaCm2)
    {
        ImportDescription d = IvFileReader.Describe(Ag(file));

        // ddomlab molecular-sam-ag (MIT), README of shared/real-data: tab-separated, a header row with a
        // trailing tab, columns voltage, |J|, J (A/cm²), current (A), time (s); 43 data rows (lines 2–44).
        Assert.Equal('\t', d.Delimiter);
        Assert.Equal(1, d.HeaderLine);
        Assert.Equal(43, d.Curve.Count);
        Assert.Equal(2, d.FirstDataLine);
        Assert.Equal(44, d.LastDataLine);
        Assert.Equal(1, d.VoltageColumn);
        Assert.Equal(4, d.CurrentColumn);
        Assert.Equal("V", d.VoltageUnit);
        Assert.Equal("A", d.CurrentUnit);
        Assert.Equal(
            [IvColumnKind.Voltage, IvColumnKind.AbsoluteCurrentDensity, IvColumnKind.CurrentDensity, IvColumnKind.Current, IvColumnKind.Time],
            d.Columns.Select(c => c.Kind).ToArray());
        Assert.Equal(
            [IvColumnRole.Voltage, IvColumnRole.Ignored, IvColumnRole.Ignored, IvColumnRole.Current, IvColumnRole.Ignored],
            d.Columns.Select(c => c.Role).ToArray());
        Assert.Equal("A/cm²", d.Columns[2].Unit);
        Assert.Contains(d.Curve.Warnings, w => w.StartsWith("columns by name: voltage 'voltage_1_1' (1), current 'current_1_1' (4); ignored: absJ_1_1 (|J|, A/cm²), J_1_1 (J, A/cm²), time_1_1 (time, s)", StringComparison.Ordinal));

        // Area: I/J of the file's own columns (computed independently above), in m².
        Assert.NotNull(d.Curve.AreaM2);
        Assert.Equal(areaCm2 * 1e-4, d.Curve.AreaM2!.Value, areaCm2 * 1e-4 * 1e-5);
        Assert.StartsWith("I/J of columns 'current_1_1' (4) and 'J_1_1' (3)", d.AreaSource, StringComparison.Ordinal);

        // Sweep 0 → +0.5 → 0 → −0.5 → 0 V in 0.05 V steps (README): one trace, three monotonic segments.
        Assert.Equal(1, d.TraceCount);
        Assert.Equal(3, d.TotalSegments);
        Assert.Equal(["up", "down", "up"], d.Segments.Select(s => s.Direction).ToArray());
        Assert.Equal(0.5, d.Curve.VoltageV.Max());
        Assert.Equal(-0.5, d.Curve.VoltageV.Min());
    }

    [Fact]
    public void Parse_AgC10Trace1_FirstPointsAreTheFileValues()
    {
        IvCurve c = IvFileReader.ReadFile(Ag("ag_c10_trace1_data.txt"));
        // ag_c10_trace1_data.txt lines 2 and 3 (ddomlab molecular-sam-ag, MIT): voltage column 1, current column 4.
        Assert.Equal(0.0, c.VoltageV[0]);
        Assert.Equal(1.527598E-11, c.CurrentA[0]);
        Assert.Equal(5.000000E-2, c.VoltageV[1]);
        Assert.Equal(5.855725E-9, c.CurrentA[1]);
        // The 40 µm contact of the README: π (20 µm)² = 1.2566e-9 m² (geometry, from memory of the formula).
        Assert.Equal(Math.PI * 20e-6 * 20e-6, c.AreaM2!.Value, 1.2566e-9 * 1e-5);
    }

    [Theory]
    [MemberData(nameof(AgFiles))]
    public void Parse_AgFileWithExplicitColumns_GivesTheSameCurveAsAutomatic(string file)
    {
        // ddomlab molecular-sam-ag (MIT): the columns the README names, chosen by hand, must give what detection gives.
        IvCurve auto = IvFileReader.ReadFile(Ag(file));
        IvCurve byHand = IvFileReader.ReadFile(Ag(file), new IvReadOptions { VoltageColumn = "1", CurrentColumn = "4" });
        Assert.Equal(auto.VoltageV.ToArray(), byHand.VoltageV.ToArray());
        Assert.Equal(auto.CurrentA.ToArray(), byHand.CurrentA.ToArray());
        Assert.Equal(auto.SourceLines.ToArray(), byHand.SourceLines.ToArray());
        Assert.Equal(auto.Segments.ToArray(), byHand.Segments.ToArray());
        Assert.Equal(auto.ImportMask.ToArray(), byHand.ImportMask.ToArray());
        Assert.Equal(auto.AreaM2, byHand.AreaM2);
    }

    [Fact]
    public void Describe_AgStackedTraces_FindsTenTracesOfThreeSegments()
    {
        ImportDescription d = IvFileReader.Describe(Ag("ag_c10_trace2-11_data.txt"));
        // ddomlab molecular-sam-ag (MIT), README: ten consecutive traces of one junction, each
        // 0 → +0.5 → 0 → −0.5 → 0 V; 430 rows = 10 × 43, the start bias 0 V measured twice between traces.
        Assert.Equal(430, d.Curve.Count);
        Assert.Equal(1, d.VoltageColumn);
        Assert.Equal(4, d.CurrentColumn);
        Assert.Equal("voltage_1_2_11", d.Columns[0].Header);
        Assert.Equal(10, d.TraceCount);
        Assert.Equal(30, d.TotalSegments);
        for (int t = 0; t < 10; t++)
        {
            ImportSegment up = d.Segments[3 * t], down = d.Segments[(3 * t) + 1], back = d.Segments[(3 * t) + 2];
            Assert.Equal(("up", "down", "up"), (up.Direction, down.Direction, back.Direction));
            // Each trace starts on its own line 2 + 43 t and holds 43 points, like the single-trace files.
            Assert.Equal(2 + (43 * t), up.FirstLine);
            Assert.Equal(43, up.Points + down.Points + back.Points);
            Assert.Equal((0.0, 0.5), (up.FromV, up.ToV));
            Assert.Equal(0.0, back.ToV);
        }
        Assert.Contains(d.ToTextLines(), l => l.StartsWith("traces: 10 ", StringComparison.Ordinal));
        Assert.Equal(1.25664e-9, d.Curve.AreaM2!.Value, 1.25664e-9 * 1e-5); // same junction as ag_c10_trace1 (awk I/J above)
    }

    [Fact]
    public void Describe_NmosGateFile_ReadsTheGateCurrentAndSaysSo()
    {
        ImportDescription d = IvFileReader.Describe(Nmos("nmos_gate_W10_L10_300K.csv"));
        // IHP Open PDK SG13G2 MOS data (Apache-2.0), nmos_gate_W10_L10_300K.csv: a 5-line '# key: value'
        // preamble, header 'vg,id,ig,ib,is' on line 6, 38 data rows (lines 7–44, vg −0.5 … 1.35 V in 0.05 V).
        Assert.Equal(',', d.Delimiter);
        Assert.Equal(6, d.HeaderLine);
        Assert.Equal(5, d.PreambleLines);
        Assert.Equal(38, d.Curve.Count);
        Assert.Equal(1, d.VoltageColumn);
        Assert.Equal(3, d.CurrentColumn);
        Assert.Equal("V", d.VoltageUnit);
        Assert.Equal("A", d.CurrentUnit);
        Assert.All(new[] { 1, 3, 4 }, k => Assert.Equal(IvColumnKind.Current, d.Columns[k].Kind));
        Assert.Contains(d.Curve.Warnings, w => w.Contains("the gate current 'ig' (column 3)", StringComparison.Ordinal));
        // First and last rows of the file: (−0.5 V, −4.986e-11 A) and (1.35 V, 7.6886e-08 A).
        Assert.Equal((-0.5, -4.986e-11), (d.Curve.VoltageV[0], d.Curve.CurrentA[0]));
        Assert.Equal((1.35, 7.6886e-08), (d.Curve.VoltageV[^1], d.Curve.CurrentA[^1]));
        // Preamble: 'area: 100 um2' (W = L = 10 µm), 'temperature: 300 K'.
        Assert.Equal(1e-10, d.Curve.AreaM2!.Value, 1e-22);
        Assert.Equal(300, d.Curve.TemperatureK);
        Assert.Equal("the file's area line", d.AreaSource);
        Assert.Equal(1, d.TotalSegments);
    }

    [Fact]
    public void Parse_NmosCvFile_IsRefusedAsCapacitanceVoltage()
    {
        // IHP Open PDK SG13G2 (Apache-2.0), nmos_gate_capacitor_cv_300K.csv: columns vg (V), cox (F); header on line 5.
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.ReadFile(Nmos("nmos_gate_capacitor_cv_300K.csv")));
        Assert.Equal(5, e.Line);
        Assert.Contains("no current column", e.Reason, StringComparison.Ordinal);
        Assert.Contains("capacitance–voltage file (cox in F)", e.Reason, StringComparison.Ordinal);
        Assert.Contains(Remedy.ReadAsCv, Remedy.Find(e.Reason));
    }

    [Fact]
    public void Fit_AgFileAreaFromFile_FixesTheAreaFromIOverJ()
    {
        // ddomlab molecular-sam-ag (MIT), ag_c10_trace1_data.txt: the area found from I/J is what --area-from-file fixes.
        var (code, output, err) = CliRunner.Run("fit", Ag("ag_c10_trace1_data.txt"), "--area-from-file", "--json");
        Assert.True(code is 0 or 1, err);
        using var doc = JsonDocument.Parse(output.Trim());
        JsonElement area = doc.RootElement.GetProperty("parameters").GetProperty("area_m2");
        Assert.True(area.GetProperty("fixed").GetBoolean());
        Assert.Equal(1.25664e-9, area.GetProperty("value").GetDouble(), 1.25664e-9 * 1e-5);
    }

    [Fact]
    public void Inspect_RealFiles_ReadWithNoColumnOption()
    {
        // Every I–V file of shared/real-data (copies here; ddomlab MIT, IHP Apache-2.0) reads without a column option.
        string[] files = [.. AgFileNames.Select(Ag), Nmos("nmos_gate_W10_L10_300K.csv")];
        var (code, output, err) = CliRunner.Run(["inspect", .. files]);
        Assert.Equal(0, code);
        Assert.Equal(string.Empty, err);
        Assert.Equal(files.Length, output.Split('\n').Count(l => l.StartsWith("file: ", StringComparison.Ordinal)));
        Assert.Contains("  4: 'current_1_1' -> current [A] — current by its name 'current', suffix '_1_1' dropped", output, StringComparison.Ordinal);
        Assert.Contains("  5: 'time_1_1' -> ignored — time by its name 'time', suffix '_1_1' dropped; ignored", output, StringComparison.Ordinal);
    }
}
