using System.Collections.Immutable;
using System.Text;
using JunctionFit.Common;
using JunctionFit.Import;
using Xunit;

namespace JunctionFit.Tests.Import;

/// <summary>One test per accepted layout; the files are written here (invented Kestrel Microsystems data).</summary>
public class IvFileReaderLayoutTests
{
    private static readonly double[] V = [-0.2, -0.1, 0, 0.1, 0.2];
    private static readonly double[] I = [-4.2e-9, -2e-9, 0, 2e-9, 4.2e-9];

    private static void AssertPoints(IvCurve c, double[]? v = null, double[]? i = null, double rel = 0)
    {
        v ??= V;
        i ??= I;
        Assert.Equal(v.Length, c.Count);
        for (int k = 0; k < v.Length; k++)
        {
            Assert.Equal(v[k], c.VoltageV[k], Math.Abs(v[k]) * rel + (rel > 0 ? 1e-300 : 0));
            Assert.Equal(i[k], c.CurrentA[k], Math.Abs(i[k]) * rel + (rel > 0 ? 1e-300 : 0));
        }
    }

    private static string Table(string header, string delim, Func<double, string> fv, Func<double, string> fi, string nl = "\n")
    {
        var sb = new StringBuilder(header).Append(nl);
        for (int k = 0; k < V.Length; k++)
        {
            sb.Append(fv(V[k])).Append(delim).Append(fi(I[k])).Append(nl);
        }
        return sb.ToString();
    }

    private static string R(double x) => x.ToString("R", System.Globalization.CultureInfo.InvariantCulture);

    private static string Comma(double x) => R(x).Replace('.', ',');

    [Fact]
    public void Parse_RunsOfSpaces_ReadsColumns()
    {
        string text = "   V        I\n" + string.Join("\n", V.Select((v, k) => $"  {R(v)}    {R(I[k])}  ")) + "\n";
        ImportDescription d = IvFileReader.DescribeText(text, "ws.dat");
        Assert.Equal(' ', d.Delimiter);
        AssertPoints(d.Curve);
    }

    [Fact]
    public void Parse_SpacesAndTabsMixed_ReadsColumns()
    {
        string text = "V (V) \t I (A)\n" + string.Join("\n", V.Select((v, k) => $"  {R(v)}\t   {R(I[k])}  ")) + "\n";
        AssertPoints(IvFileReader.Parse(text, "ws.dat"));
    }

    [Theory]
    [InlineData(";")]
    [InlineData("\t")]
    [InlineData(" ")]
    public void Parse_DecimalComma_ReadsNumbers(string delim)
    {
        string text = Table($"U (V){delim}I (A)", delim, Comma, Comma);
        ImportDescription d = IvFileReader.DescribeText(text, "dc.csv");
        Assert.Equal(',', d.DecimalSeparator);
        AssertPoints(d.Curve);
    }

    [Fact]
    public void Parse_QuotedFields_ReadsNumbersAndHeader()
    {
        string text = Table("\"Voltage (V)\",\"Current (A)\"", ",", x => $"\"{R(x)}\"", x => $"\"{R(x)}\"");
        AssertPoints(IvFileReader.Parse(text, "q.csv"));
    }

    [Fact]
    public void Parse_QuotedDecimalCommaInCommaFile_ReadsNumbers()
    {
        string text = Table("\"V\",\"I\"", ",", x => $"\"{Comma(x)}\"", x => $"\"{Comma(x)}\"");
        AssertPoints(IvFileReader.Parse(text, "q.csv"));
    }

    public static TheoryData<string> Encodings => new() { "utf8", "utf8bom", "utf16le", "utf16be", "utf16lebom", "utf16bebom", "latin1" };

    [Theory]
    [MemberData(nameof(Encodings))]
    public void ReadFile_Encoding_ReadsTableAndMicroSign(string encoding)
    {
        string text = Table("# operator: Zoë\nV (V)\tI (µA)", "\t", R, x => R(x * 1e6));
        byte[] bytes = encoding switch
        {
            "utf8" => new UTF8Encoding(false).GetBytes(text),
            "utf8bom" => [.. new UTF8Encoding(true).GetPreamble(), .. Encoding.UTF8.GetBytes(text)],
            "utf16le" => Encoding.Unicode.GetBytes(text),
            "utf16be" => Encoding.BigEndianUnicode.GetBytes(text),
            "utf16lebom" => [.. Encoding.Unicode.GetPreamble(), .. Encoding.Unicode.GetBytes(text)],
            "utf16bebom" => [.. Encoding.BigEndianUnicode.GetPreamble(), .. Encoding.BigEndianUnicode.GetBytes(text)],
            _ => Encoding.Latin1.GetBytes(text),
        };
        using var dir = new TempFolder();
        string p = dir.WriteBytes("e.txt", bytes);
        ImportDescription d = IvFileReader.Describe(p);
        AssertPoints(d.Curve, rel: 1e-15);
        Assert.Equal("Zoë", d.Curve.Metadata["operator"]);
        Assert.Equal("µA", d.CurrentUnit);
    }

    [Theory]
    [InlineData("\n", "LF")]
    [InlineData("\r\n", "CRLF")]
    [InlineData("\r", "CR")]
    public void Parse_LineEnds_ReadsAllRowsWithLineNumbers(string nl, string name)
    {
        string text = "# lot: KM-A01" + nl + Table("V,I", ",", R, R, nl);
        ImportDescription d = IvFileReader.DescribeText(text, "nl.csv");
        AssertPoints(d.Curve);
        Assert.Equal(name, d.LineEnd);
        Assert.Equal([3, 4, 5, 6, 7], d.Curve.SourceLines.ToArray());
        Assert.Equal("KM-A01", d.Curve.Lot);
    }

    [Fact]
    public void Parse_MixedPreambleStyles_ReadsEveryKnownKey()
    {
        string text = """
            Kestrel Microsystems - parameter analyzer export

            LOT = KM-B17
            Wafer: w03
            Die X = -2
            DIE Y: 5
            Site: centre
            Device: TJ-40
            Area (um^2) = 400
            Temperature = 77 K
            Compliance: 1 mA
            Recipe: iv_sweep_v3

            Bias,Imeas
            """ + "\n" + string.Join("\n", V.Select((v, k) => $"{R(v)},{R(I[k])}"));
        IvCurve c = IvFileReader.Parse(text, "m.csv");
        AssertPoints(c);
        Assert.Equal("KM-B17", c.Lot);
        Assert.Equal("w03", c.Wafer);
        Assert.Equal(-2, c.DieX);
        Assert.Equal(5, c.DieY);
        Assert.Equal(400e-12, c.AreaM2!.Value, 1e-25);
        Assert.Equal(77, c.TemperatureK);
        Assert.Equal(1e-3, c.ComplianceA!.Value, 1e-18);
        Assert.Equal("centre", c.Metadata["site"]);
        Assert.Equal("TJ-40", c.Metadata["device"]);
        Assert.Equal("iv_sweep_v3", c.Metadata["recipe"]);
    }

    [Theory]
    [InlineData("die: (3, 4)", 3, 4)]
    [InlineData("die = x3y4", 3, 4)]
    [InlineData("# Die: X=-1 Y=2", -1, 2)]
    [InlineData("die: 7 8", 7, 8)]
    public void Parse_DieForms_ReadsCoordinates(string line, int x, int y)
    {
        IvCurve c = IvFileReader.Parse(line + "\n" + Table("V,I", ",", R, R), "d.csv");
        Assert.Equal(x, c.DieX);
        Assert.Equal(y, c.DieY);
    }

    [Theory]
    [InlineData("# area: 1e-6 cm2", 1e-10)]
    [InlineData("# area: 1e-10 m²", 1e-10)]
    [InlineData("# area = 100 µm²", 1e-10)]
    [InlineData("# Area [mm2]: 1e-4", 1e-10)]
    [InlineData("# area: 100", 1e-10)]
    public void Parse_AreaForms_ReadsSquareMetres(string line, double expected)
    {
        IvCurve c = IvFileReader.Parse(line + "\n" + Table("V,I", ",", R, R), "a.csv");
        Assert.Equal(expected, c.AreaM2!.Value, expected * 1e-12);
    }

    [Theory]
    [InlineData("# temperature: 300 K", 300)]
    [InlineData("# temp: 300K", 300)]
    [InlineData("# T = 25 °C", 298.15)]
    [InlineData("# Chuck temperature: -40 degC", 233.15)]
    [InlineData("# temperature (°C): 100", 373.15)]
    public void Parse_TemperatureForms_ReadsKelvin(string line, double expected)
    {
        IvCurve c = IvFileReader.Parse(line + "\n" + Table("V,I", ",", R, R), "t.csv");
        Assert.Equal(expected, c.TemperatureK!.Value, 1e-9);
    }

    [Theory]
    [InlineData("Voltage (V),Current (A)")]
    [InlineData("Bias [V],Imeas [A]")]
    [InlineData("Vbias/V,Id/A")]
    [InlineData("U_V,I_A")]
    [InlineData("Vd,Id")]
    [InlineData("V,I")]
    [InlineData("VOLTAGE,CURRENT")]
    public void Parse_HeaderNames_FindVoltageAndCurrent(string header)
        => AssertPoints(IvFileReader.Parse(Table(header, ",", R, R), "h.csv"));

    [Fact]
    public void Parse_ColumnsInAnyOrderWithExtras_PicksRoles()
    {
        var sb = new StringBuilder("Index,Time (s),Current (nA),Status,Voltage (mV),Comment\n");
        for (int k = 0; k < V.Length; k++)
        {
            sb.Append($"{k},{k * 0.5},{R(I[k] * 1e9)},OK,{R(V[k] * 1e3)},\n");
        }
        ImportDescription d = IvFileReader.DescribeText(sb.ToString(), "o.csv");
        AssertPoints(d.Curve, rel: 1e-15);
        Assert.Equal(5, d.VoltageColumn);
        Assert.Equal(3, d.CurrentColumn);
        Assert.Equal(IvColumnRole.Ignored, d.Columns[0].Role);
        Assert.Equal(IvColumnRole.Ignored, d.Columns[3].Role);
    }

    [Theory]
    [InlineData("V [mV],I [nA]")]
    [InlineData("V/mV,I/nA")]
    [InlineData("V_mV,I_nA")]
    [InlineData("Bias mV,Current nA")]
    [InlineData("mV,nA")]
    [InlineData("V (mV),I (nA)")]
    public void Parse_UnitNotations_AreUnderstood(string header)
        => AssertPoints(IvFileReader.Parse(Table(header, ",", x => R(x * 1e3), x => R(x * 1e9)), "un.csv"), rel: 1e-15);

    [Fact]
    public void Parse_SeparateUnitsRow_AppliesUnits()
    {
        string text = Table("Voltage,Current\nmV,pA", ",", x => R(x * 1e3), x => R(x * 1e12));
        ImportDescription d = IvFileReader.DescribeText(text, "ur.csv");
        AssertPoints(d.Curve, rel: 1e-15);
        Assert.Equal(1, d.HeaderLine);
        Assert.Equal(2, d.UnitsLine);
        Assert.Equal(3, d.FirstDataLine);
    }

    [Fact]
    public void Parse_HeaderInComment_IsUsed()
    {
        string text = Table("# Current (nA)\tVoltage (V)", "\t", x => R(x), x => R(x));
        // Columns are swapped by the header: column 1 is current in nA.
        IvCurve c = IvFileReader.Parse(text, "hc.txt");
        Assert.Equal(I[0], c.VoltageV[0]);
        Assert.Equal(V[0] * 1e-9, c.CurrentA[0], 1e-20);
    }

    [Theory]
    [InlineData("J (A/cm2)", 1e4)]
    [InlineData("J (mA/cm²)", 10)]
    [InlineData("Current density (A/m^2)", 1)]
    public void Parse_CurrentDensity_ConvertedWithArea(string header, double toSiDensity)
    {
        const double areaM2 = 1e-10;
        string text = "# area: 100 um2\n" + Table("V (V)," + header, ",", R, x => R(x / areaM2 / toSiDensity));
        ImportDescription d = IvFileReader.DescribeText(text, "j.csv");
        AssertPoints(d.Curve, rel: 1e-12);
        Assert.Equal(IvColumnRole.CurrentDensity, d.Columns[1].Role);
    }

    [Fact]
    public void Parse_CurrentDensityWithoutArea_IsRefusedAtHeader()
    {
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse(Table("V,J (A/cm2)", ",", R, R), "j.csv"));
        Assert.StartsWith("j.csv:1: ", e.Message);
        Assert.Contains("area", e.Reason);
    }

    [Fact]
    public void Parse_CurrentDensityWithAreaOption_UsesOption()
    {
        IvCurve c = IvFileReader.Parse(Table("V,J (A/m2)", ",", R, x => R(x * 1e10)), "j.csv", new IvReadOptions { AreaM2 = 1e-10 });
        AssertPoints(c, rel: 1e-12);
    }

    [Fact]
    public void Parse_NoHeader_TakesColumnsByPositionWithWarning()
    {
        string text = "# lot: KM-A01\n" + Table("", ",", R, R).TrimStart('\n');
        ImportDescription d = IvFileReader.DescribeText(text, "nh.csv");
        AssertPoints(d.Curve);
        Assert.Null(d.HeaderLine);
        Assert.Contains(d.Curve.Warnings, w => w.Contains("no header", StringComparison.Ordinal));
    }

    [Fact]
    public void Parse_LoopSweep_SplitsIntoMonotonicSegments()
    {
        double[] v = [0, 0.5, 1, 0.5, 0, -0.5, -1, -0.5, 0];
        string text = "V,I\n" + string.Join("\n", v.Select(x => $"{R(x)},{R(x * 1e-9)}"));
        ImportDescription d = IvFileReader.DescribeText(text, "loop.csv");
        Assert.Equal([0, 0, 0, 1, 1, 1, 1, 2, 2], d.Curve.Segments.ToArray());
        Assert.Equal(3, d.TotalSegments);
        Assert.Equal("up", d.Segments[0].Direction);
        Assert.Equal("down", d.Segments[1].Direction);
    }

    [Fact]
    public void Parse_SegmentSelection_KeepsOnlySelected()
    {
        double[] v = [0, 0.5, 1, 0.5, 0, -0.5, -1, -0.5, 0];
        string text = "V,I\n" + string.Join("\n", v.Select(x => $"{R(x)},{R(x * 1e-9)}"));
        IvCurve c = IvFileReader.Parse(text, "loop.csv", new IvReadOptions { Segments = [1] });
        Assert.Equal([0.5, 0, -0.5, -1], c.VoltageV.ToArray());
        Assert.Equal([1, 1, 1, 1], c.Segments.ToArray());
        Assert.Equal([5, 6, 7, 8], c.SourceLines.ToArray());
    }

    [Fact]
    public void Parse_SegmentSelectionBeyondSweep_IsRefused()
    {
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse(Table("V,I", ",", R, R), "s.csv", new IvReadOptions { Segments = [3] }));
        Assert.Contains("segment 3", e.Reason);
    }

    [Fact]
    public void Parse_FlatRunAtLargestCurrent_IsMaskedAsCompliance()
    {
        double[] v = [0, 0.2, 0.4, 0.6, 0.8, 1.0, 1.2];
        double[] i = [0, 1e-6, 1e-5, 1e-4, 1e-4, 1e-4, 1.00001e-4];
        string text = "V,I\n" + string.Join("\n", v.Select((x, k) => $"{R(x)},{R(i[k])}"));
        IvCurve c = IvFileReader.Parse(text, "comp.csv");
        Assert.Equal([false, false, false, true, true, true, true], c.ImportMask.ToArray());
        Assert.Contains(c.Warnings, w => w.StartsWith("4 points", StringComparison.Ordinal));
    }

    [Fact]
    public void Parse_StatedCompliance_MasksPointsAtIt()
    {
        double[] v = [0, 0.5, 1.0, 1.5];
        double[] i = [0, 1e-6, 1e-4, 1e-4];
        string text = "# compliance: 100 uA\nV,I\n" + string.Join("\n", v.Select((x, k) => $"{R(x)},{R(i[k])}"));
        IvCurve c = IvFileReader.Parse(text, "comp.csv");
        Assert.Equal([false, false, true, true], c.ImportMask.ToArray());
        Assert.Equal(1e-4, c.ComplianceA!.Value, 1e-18);
    }

    [Fact]
    public void Parse_MaskComplianceOff_MasksNothing()
    {
        double[] i = [0, 1e-4, 1e-4, 1e-4, 1e-4];
        string text = "V,I\n" + string.Join("\n", i.Select((x, k) => $"{k},{R(x)}"));
        IvCurve c = IvFileReader.Parse(text, "comp.csv", new IvReadOptions { MaskCompliance = false });
        Assert.DoesNotContain(true, c.ImportMask);
    }

    [Fact]
    public void Parse_NanEmptyAndTrailer_SkippedWithLineWarnings()
    {
        string text = "V,I\n0,0\n0.1,NaN\n0.2,\n0.3,3e-9\n,4e-9\n0.5,5e-9\nEnd of sweep\n";
        IvCurve c = IvFileReader.Parse(text, "sk.csv");
        Assert.Equal([0, 0.3, 0.5], c.VoltageV.ToArray());
        Assert.Contains(c.Warnings, w => w.StartsWith("line 3: ", StringComparison.Ordinal) && w.Contains("NaN", StringComparison.Ordinal));
        Assert.Contains(c.Warnings, w => w.StartsWith("line 4: ", StringComparison.Ordinal) && w.Contains("empty", StringComparison.Ordinal));
        Assert.Contains(c.Warnings, w => w.StartsWith("line 6: ", StringComparison.Ordinal));
        Assert.Contains(c.Warnings, w => w.StartsWith("line 8: ", StringComparison.Ordinal) && w.Contains("End of sweep", StringComparison.Ordinal));
    }

    [Fact]
    public void ReadFile_PathPattern_TakesLotWaferDie()
    {
        using var dir = new TempFolder();
        string p = dir.Write(Path.Combine("KM-A01", "W12", "die_-3_7.csv"), Table("V,I", ",", R, R));
        IvCurve c = IvFileReader.ReadFile(p, new IvReadOptions { PathPattern = "{lot}/{wafer}/die_{x}_{y}.csv" });
        Assert.Equal("KM-A01", c.Lot);
        Assert.Equal("W12", c.Wafer);
        Assert.Equal(-3, c.DieX);
        Assert.Equal(7, c.DieY);
    }

    [Fact]
    public void Parse_PathNotMatchingPattern_Warns()
    {
        IvCurve c = IvFileReader.Parse(Table("V,I", ",", R, R), "other.csv", new IvReadOptions { PathPattern = "{lot}/die_{x}_{y}.csv" });
        Assert.Null(c.Lot);
        Assert.Contains(c.Warnings, w => w.Contains("pattern", StringComparison.Ordinal));
    }

    [Fact]
    public void IvReadOptions_BadPathPattern_ThrowsArgumentException()
        => Assert.Throws<ArgumentException>(() => new IvReadOptions { PathPattern = "{lot}/{nonsense}.csv" });

    [Fact]
    public void Parse_ColumnOptions_OverrideDetection()
    {
        string text = "Vforce (V),Vmeas (V),I1 (A),I2 (A)\n" + string.Join("\n", V.Select((v, k) => $"{R(v)},{R(v + 1)},{R(I[k])},{R(I[k] * 2)}"));
        IvCurve c = IvFileReader.Parse(text, "oc.csv", new IvReadOptions { VoltageColumn = "vmeas", CurrentColumn = "4" });
        AssertPoints(c, [.. V.Select(v => v + 1)], [.. I.Select(i => i * 2)]);
    }

    [Fact]
    public void Parse_UnitAndDelimiterOptions_OverrideDetection()
    {
        string text = "0,1|2,5\n0,2|5,0\n";
        IvCurve c = IvFileReader.Parse(text, "o.txt", new IvReadOptions { Delimiter = '|', DecimalComma = true, VoltageUnit = "mV", CurrentUnit = "nA" });
        AssertPoints(c, [0.1e-3, 0.2e-3], [2.5e-9, 5e-9], rel: 1e-15);
    }

    [Fact]
    public void Describe_PlainFile_ListsWhatWasUnderstood()
    {
        using var dir = new TempFolder();
        string p = dir.Write("km.csv", "# lot: KM-A01\n# area: 100 um2\n" + Table("Voltage (V),Current (nA)", ",", R, x => R(x * 1e9)));
        ImportDescription d = IvFileReader.Describe(p);
        ImmutableArray<string> lines = d.ToTextLines();
        Assert.Contains(lines, l => l.StartsWith("layout: delimited (comma), header, 2-line preamble", StringComparison.Ordinal));
        Assert.Contains(lines, l => l.Contains("'Current (nA)' -> current [nA]", StringComparison.Ordinal));
        Assert.Contains(lines, l => l == "  lot = KM-A01");
        Assert.Contains(lines, l => l.StartsWith("segments: 1 kept of 1", StringComparison.Ordinal));
        Assert.Equal(3, d.HeaderLine);
    }

    // ---------------------------------------------------------------- shapes met in real files (issue 11)

    private static string Rows(string header, Func<int, string> row, string nl = "\n")
    {
        var sb = new StringBuilder(header).Append(nl);
        for (int k = 0; k < V.Length; k++)
        {
            sb.Append(row(k)).Append(nl);
        }
        return sb.ToString();
    }

    [Theory]
    [InlineData("\t")]
    [InlineData(",")]
    [InlineData(";")]
    public void Parse_HeaderWithTrailingDelimiter_IsAHeader(string d)
    {
        ImportDescription desc = IvFileReader.DescribeText(Rows($"Voltage (V){d}Current (A){d}", k => $"{R(V[k])}{d}{R(I[k])}"), "td.txt");
        Assert.Equal(1, desc.HeaderLine);
        Assert.Equal(2, desc.Columns.Length);
        AssertPoints(desc.Curve);
    }

    [Theory]
    [InlineData("voltage_1_1,current_1_1")]
    [InlineData("voltage_1_2_11,current_1_2_11")]
    [InlineData("V_2,I_2")]
    [InlineData("Voltage (V),Current (A)")]
    [InlineData("Voltage [V],Current [A]")]
    [InlineData("Voltage / V,Current / A")]
    [InlineData("Bias voltage 1,Current 1")]
    [InlineData("V_sense,I_meas_3")]
    public void Parse_SuffixedNames_FindVoltageAndCurrent(string header)
    {
        ImportDescription d = IvFileReader.DescribeText(Table(header, ",", R, R), "sx.csv");
        Assert.Equal((1, 2), (d.VoltageColumn, d.CurrentColumn));
        AssertPoints(d.Curve);
    }

    [Fact]
    public void Parse_NamesRowThenBracketedUnitsRowWhitespace_TimeIsIgnored()
    {
        string text = Rows("Time Voltage Current\n[s] [V] [uA]", k => $"{0.5 * k} {R(V[k])} {R(I[k] * 1e6)}");
        ImportDescription d = IvFileReader.DescribeText(text, "nu.txt");
        Assert.Equal(' ', d.Delimiter);
        Assert.Equal((1, 2), (d.HeaderLine, d.UnitsLine));
        Assert.Equal((2, 3), (d.VoltageColumn, d.CurrentColumn));
        Assert.Equal("uA", d.CurrentUnit);
        Assert.Equal(IvColumnKind.Time, d.Columns[0].Kind);
        Assert.Equal("s", d.Columns[0].Unit);
        AssertPoints(d.Curve, rel: 1e-15);
    }

    [Theory]
    [InlineData("V\tI\tT\n(V)\t(A)\t(s)")]
    [InlineData("V,I,t\nV,A,s")]
    public void Parse_NamesRowThenUnitsRow_UnitsApplied(string header)
    {
        string d = header.Contains('\t', StringComparison.Ordinal) ? "\t" : ",";
        ImportDescription desc = IvFileReader.DescribeText(Rows(header, k => $"{R(V[k])}{d}{R(I[k])}{d}{k}"), "nu.txt");
        Assert.Equal(2, desc.UnitsLine);
        Assert.Equal(IvColumnKind.Time, desc.Columns[2].Kind);
        AssertPoints(desc.Curve);
    }

    [Fact]
    public void Parse_CurrentDensityAbsAndTime_SignedCurrentReadAndAreaFromIOverJ()
    {
        // Invented Kestrel data in the column order of the ddomlab molecular-junction files.
        const double areaCm2 = 2.5e-5;
        string text = Rows("voltage_1_1\tabsJ_1_1\tJ_1_1\tcurrent_1_1\ttime_1_1\t",
            k => $"{R(V[k])}\t{R(Math.Abs(I[k]) / areaCm2)}\t{R(I[k] / areaCm2)}\t{R(I[k])}\t{R(0.5 * k)}");
        ImportDescription d = IvFileReader.DescribeText(text, "j.txt");
        Assert.Equal((1, 4), (d.VoltageColumn, d.CurrentColumn));
        AssertPoints(d.Curve);
        Assert.Equal(
            [IvColumnKind.Voltage, IvColumnKind.AbsoluteCurrentDensity, IvColumnKind.CurrentDensity, IvColumnKind.Current, IvColumnKind.Time],
            d.Columns.Select(c => c.Kind).ToArray());
        Assert.Equal(areaCm2 * 1e-4, d.Curve.AreaM2!.Value, areaCm2 * 1e-4 * 1e-12);
        Assert.Contains(d.Curve.Warnings, w => w.StartsWith("columns by name: voltage 'voltage_1_1' (1), current 'current_1_1' (4); ignored: absJ_1_1 (|J|, A/cm²), J_1_1 (J, A/cm²), time_1_1 (time, s)", StringComparison.Ordinal));
        Assert.Contains(d.Curve.Warnings, w => w.StartsWith("area ", StringComparison.Ordinal) && Remedy.Find(w).Contains(Remedy.AreaFromFile));
        // A column's reason is shown by inspect.
        Assert.Contains(d.ToTextLines(), l => l.StartsWith("  2: 'absJ_1_1' -> ignored [A/cm²] — |J| by its name", StringComparison.Ordinal));
    }

    [Fact]
    public void Parse_CurrentAndDensityWithVaryingRatio_WarnsAndDerivesNoArea()
    {
        string text = Rows("V,I (A),J (A/cm2)", k => $"{R(V[k])},{R(I[k])},{R(I[k] * (1 + (0.1 * k)) * 1e4)}");
        IvCurve c = IvFileReader.Parse(text, "jv.csv");
        Assert.Null(c.AreaM2);
        Assert.Contains(c.Warnings, w => w.StartsWith("area not derived from I/J", StringComparison.Ordinal) && w.Contains("varies", StringComparison.Ordinal));
        AssertPoints(c);
    }

    [Fact]
    public void Parse_StatedAreaDisagreeingWithIOverJ_KeepsStatedAndWarns()
    {
        string text = "# area: 100 um2\n" + Rows("V,I (A),J (A/cm2)", k => $"{R(V[k])},{R(I[k])},{R(I[k] / 2e-6)}");
        IvCurve c = IvFileReader.Parse(text, "ja.csv");
        Assert.Equal(1e-10, c.AreaM2!.Value, 1e-22);
        Assert.Contains(c.Warnings, w => w.Contains("but I/J gives", StringComparison.Ordinal));
    }

    [Fact]
    public void Parse_DensityWithAreaAndAbsCurrent_PrefersCurrentOverDensity()
    {
        string text = "# area: 100 um2\n" + Rows("V,J (A/m2),|I| (A)", k => $"{R(V[k])},{R(I[k] / 1e-10)},{R(Math.Abs(I[k]))}");
        ImportDescription d = IvFileReader.DescribeText(text, "ji.csv");
        Assert.Equal(3, d.CurrentColumn);
        Assert.Equal(IvColumnKind.AbsoluteCurrent, d.Columns[2].Kind);
        // The sign comes from the bias.
        AssertPoints(d.Curve);
        Assert.Contains(d.Curve.Warnings, w => w.Contains("sign of each point is taken from its bias", StringComparison.Ordinal));
    }

    [Theory]
    [InlineData("Voltage,abs(I)")]
    [InlineData("Voltage,|I| (A)")]
    [InlineData("V (V),absI_1")]
    public void Parse_OnlyAbsoluteCurrent_SignFromBias(string header)
    {
        IvCurve c = IvFileReader.Parse(Rows(header, k => $"{R(V[k])},{R(Math.Abs(I[k]))}"), "ai.csv");
        AssertPoints(c);
    }

    [Fact]
    public void Parse_IndexAndTimeColumns_AreRecognisedAndIgnored()
    {
        string text = Rows("Point,#,time (s),t,V,I", k => $"{k},{k + 1},{0.5 * k},{0.5 * k},{R(V[k])},{R(I[k])}");
        ImportDescription d = IvFileReader.DescribeText(text, "it.csv");
        Assert.Equal((5, 6), (d.VoltageColumn, d.CurrentColumn));
        Assert.Equal([IvColumnKind.Index, IvColumnKind.Index, IvColumnKind.Time, IvColumnKind.Time], d.Columns.Take(4).Select(c => c.Kind).ToArray());
        Assert.All(d.Columns.Take(4), c => Assert.Equal(IvColumnRole.Ignored, c.Role));
        AssertPoints(d.Curve);
    }

    [Fact]
    public void Parse_TerminalCurrents_ReadsTheGateCurrentAndSaysSo()
    {
        // Column names of the IHP Open PDK MOS measurement files (Apache-2.0); the values are invented.
        string text = "# area: 100 um2\n" + Rows("vd,vg,id,ig,ib,is", k => $"0.05,{R(V[k])},1e-6,{R(I[k])},1e-12,-1e-6");
        ImportDescription d = IvFileReader.DescribeText(text, "mos.csv");
        Assert.Equal((2, 4), (d.VoltageColumn, d.CurrentColumn));
        AssertPoints(d.Curve);
        Assert.Contains(d.Curve.Warnings, w => w.StartsWith("several terminal currents (id, ig, ib, is): the gate current 'ig' (column 4)", StringComparison.Ordinal));
    }

    [Fact]
    public void Parse_CapacitanceFile_RefusedPointingToCv()
    {
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse(Rows("Vg (V),C (pF)", k => $"{R(V[k])},{k + 1}"), "cv.csv"));
        Assert.Contains("capacitance–voltage", e.Reason, StringComparison.Ordinal);
        Assert.Equal([RemedyKind.ReadAsCv, RemedyKind.CurrentColumn], Remedy.Find(e.Reason).Select(r => r.Kind));
    }

    [Fact]
    public void Parse_MissingColumns_MessagesCarryTheRemedy()
    {
        // The library writes remedies, not option names (the CLI words them: OptionWords).
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse("a,b,c\n0.1,1e-9,5\n0.2,2e-9,6\n", "o.csv"));
        Assert.Equal([Remedy.VoltageColumn], Remedy.Find(e.Reason));
        e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse("V,Current (A),Current (A)\n0.1,1e-9,5\n0.2,2e-9,6\n", "o.csv"));
        Assert.Equal([Remedy.CurrentColumn], Remedy.Find(e.Reason));
        e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse("V (V),I (Zz)\n0.1,1e-9\n0.2,2e-9\n", "o.csv"));
        Assert.Equal([new Remedy(RemedyKind.CurrentUnit)], Remedy.Find(e.Reason));
    }

    [Fact]
    public void Parse_StackedTraces_SegmentsPerTraceAndTraceCount()
    {
        double[] one = [0, 0.5, 1, 0.5, 0, -0.5, -1, -0.5, 0];
        double[] v = [.. one, .. one, .. one];
        string text = "V,I\n" + string.Join("\n", v.Select(x => $"{R(x)},{R(x * 1e-9)}"));
        ImportDescription d = IvFileReader.DescribeText(text, "stack.csv");
        Assert.Equal(3, d.TraceCount);
        Assert.Equal(9, d.TotalSegments);
        Assert.Equal(["up", "down", "up", "up", "down", "up", "up", "down", "up"], d.Segments.Select(s => s.Direction).ToArray());
        // Start bias measured twice between traces: the first 0 ends a trace, the second starts the next.
        Assert.Equal([2, 11, 20], new[] { d.Segments[0].FirstLine, d.Segments[3].FirstLine, d.Segments[6].FirstLine });
    }

    [Fact]
    public void Parse_StackedTracesSharingTheStartPoint_TheSharedPointStartsTheNextTrace()
    {
        double[] v = [0, 1, 0, 1, 0, 1, 0];
        string text = "V,I\n" + string.Join("\n", v.Select(x => $"{R(x)},{R(x * 1e-9)}"));
        ImportDescription d = IvFileReader.DescribeText(text, "uni.csv");
        Assert.Equal(3, d.TraceCount);
        // Traces 0 → 1, 0 → 1, 0 → 1 → 0: the turn point ends its segment, as in one trace.
        Assert.Equal([0, 0, 1, 1, 2, 2, 3], d.Curve.Segments.ToArray());
        Assert.Equal(["up", "up", "up", "flat"], d.Segments.Select(s => s.Direction).ToArray());
    }

    [Fact]
    public void Parse_BipolarLoopReturningOnce_IsOneTrace()
    {
        double[] v = [-1, 0, 1, 0, -1];
        string text = "V,I\n" + string.Join("\n", v.Select(x => $"{R(x)},{R(x * 1e-9)}"));
        ImportDescription d = IvFileReader.DescribeText(text, "bi.csv");
        Assert.Equal(1, d.TraceCount);
        Assert.Equal(2, d.TotalSegments);
    }
}
