using Xunit;
using JunctionFit.Import;

namespace JunctionFit.Tests.Import;

public class IvFileReaderPlainTests
{
    private const string Plain = "Voltage (V),Current (A)\n-0.5,-2.5e-9\n0,0\n0.5,2.5e-9\n1.0,1.1e-8\n";

    [Fact]
    public void Parse_PlainCommaTable_ReadsVoltageAndCurrentInSi()
    {
        IvCurve c = IvFileReader.Parse(Plain, "km-a01.csv");
        Assert.Equal([-0.5, 0, 0.5, 1.0], c.VoltageV.ToArray());
        Assert.Equal([-2.5e-9, 0, 2.5e-9, 1.1e-8], c.CurrentA.ToArray());
        Assert.Equal([2, 3, 4, 5], c.SourceLines.ToArray());
        Assert.Equal("km-a01.csv", c.SourcePath);
    }

    [Theory]
    [InlineData('\t')]
    [InlineData(';')]
    public void Parse_TabOrSemicolonDelimiter_ReadsSameNumbers(char d)
    {
        string text = Plain.Replace(',', d);
        IvCurve c = IvFileReader.Parse(text, "x.txt");
        Assert.Equal([-0.5, 0, 0.5, 1.0], c.VoltageV.ToArray());
        Assert.Equal([-2.5e-9, 0, 2.5e-9, 1.1e-8], c.CurrentA.ToArray());
    }

    [Theory]
    [InlineData("mV", "A", 1e-3, 1.0)]
    [InlineData("V", "µA", 1.0, 1e-6)]
    [InlineData("V", "uA", 1.0, 1e-6)]
    [InlineData("mV", "nA", 1e-3, 1e-9)]
    [InlineData("V", "pA", 1.0, 1e-12)]
    [InlineData("V", "mA", 1.0, 1e-3)]
    public void Parse_PrefixedUnitsInHeader_ConvertsToSi(string vUnit, string iUnit, double vScale, double iScale)
    {
        string text = $"Voltage ({vUnit}),Current ({iUnit})\n2,3\n4,5\n";
        IvCurve c = IvFileReader.Parse(text, "u.csv");
        Assert.Equal(2 * vScale, c.VoltageV[0], 15);
        Assert.Equal(3 * iScale, c.CurrentA[0], 1e-12 * iScale);
        Assert.Equal(5 * iScale, c.CurrentA[1], 1e-12 * iScale);
    }

    [Fact]
    public void Parse_HashPreamble_ReadsMetadata()
    {
        string text = """
            # Kestrel Microsystems probe station 2
            # lot: KM-A01
            # Wafer: W07
            # die: 3,4
            # area: 100 um2
            # temperature: 25 °C
            # operator: R. Quill
            Voltage (V),Current (A)
            0,0
            0.1,1e-9
            0.2,2.1e-9
            """;
        IvCurve c = IvFileReader.Parse(text, "p.csv");
        Assert.Equal("KM-A01", c.Lot);
        Assert.Equal("W07", c.Wafer);
        Assert.Equal(3, c.DieX);
        Assert.Equal(4, c.DieY);
        Assert.Equal(100e-12, c.AreaM2!.Value, 1e-24);
        Assert.Equal(298.15, c.TemperatureK!.Value, 1e-9);
        Assert.Equal("R. Quill", c.Metadata["operator"]);
        Assert.Equal(3, c.Count);
    }

    [Fact]
    public void Parse_TextOnly_ThrowsWithPathAndLine()
    {
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.Parse("hello\nworld\n", "t.txt"));
        Assert.StartsWith("t.txt:0: ", e.Message);
    }

    [Fact]
    public void ReadFile_MissingFile_ThrowsFormatException()
    {
        var e = Assert.Throws<IvFormatException>(() => IvFileReader.ReadFile("/nonexistent/km/none.csv"));
        Assert.StartsWith("/nonexistent/km/none.csv:0: ", e.Message);
    }

    [Fact]
    public void ReadFile_PlainFile_DoesNotModifyInput()
    {
        using var dir = new TempFolder();
        string p = dir.Write("a.csv", Plain);
        DateTime before = File.GetLastWriteTimeUtc(p);
        IvCurve c = IvFileReader.ReadFile(p);
        Assert.Equal(4, c.Count);
        Assert.Equal(Plain, File.ReadAllText(p));
        Assert.Equal(before, File.GetLastWriteTimeUtc(p));
    }
}
