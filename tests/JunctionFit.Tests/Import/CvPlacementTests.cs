using JunctionFit.Import;
using Xunit;

namespace JunctionFit.Tests.Import;

public class CvPlacementTests
{
    private const string Table = "vg,c (pF)\n-1,20\n0,60\n1,100\n1.5,100\n";

    [Fact]
    public void Parse_LotAndWaferLines_AreRead()
    {
        var c = CvFileReader.Parse("cap.csv", ("# lot: KM-G01\n# Wafer ID: W02\n# area: 10000 um2\n" + Table).Split('\n'));

        Assert.Equal("KM-G01", c.Lot);
        Assert.Equal("W02", c.Wafer);
        Assert.Equal(1.0, c.AreaM2!.Value / 1e-8, 12);
        Assert.Equal(1.0, c.CapacitanceF.Max() / 100e-12, 12);
    }

    [Fact]
    public void Read_PathPattern_WinsOverTheLinesWithANote()
    {
        using var dir = new TempFolder();
        string folder = Path.Combine(dir.Path, "KM-G02", "W01");
        Directory.CreateDirectory(folder);
        string file = Path.Combine(folder, "cap.csv");
        File.WriteAllText(file, "# lot: KM-G09\n# area: 10000 um2\n" + Table);

        var c = CvFileReader.Read(file, "{lot}/{wafer}/*.csv");

        Assert.Equal("KM-G02", c.Lot);
        Assert.Equal("W01", c.Wafer);
        Assert.Contains(c.Notes, n => n.Contains("'KM-G09' in the file but 'KM-G02' in the path", StringComparison.Ordinal));
    }

    [Fact]
    public void Read_PathNotMatchingThePattern_KeepsTheLinesWithANote()
    {
        using var dir = new TempFolder();
        string file = Path.Combine(dir.Path, "cap.txt");
        File.WriteAllText(file, "# lot: KM-G01\n# wafer: W01\n" + Table);

        var c = CvFileReader.Read(file, "{lot}/{wafer}/*.csv");

        Assert.Equal(("KM-G01", "W01"), (c.Lot, c.Wafer));
        Assert.Contains(c.Notes, n => n.Contains("does not match", StringComparison.Ordinal));
    }
}
