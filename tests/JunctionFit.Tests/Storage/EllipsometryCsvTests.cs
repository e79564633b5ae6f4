using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.Tests.Lots;
using Xunit;

namespace JunctionFit.Tests.Storage;

public class EllipsometryCsvTests
{
    private const string Path = "ellipsometry.csv";

    private static System.Collections.Immutable.ImmutableArray<EllipsometryRow> Read(string text) => EllipsometryCsv.Read(new StringReader(text), Path);

    [Fact]
    public void Read_PerWafer_RowsWithoutDieAndWithLineNumbers()
    {
        var rows = Read("# Kestrel Microsystems ellipsometer export\nlot,wafer,thickness_nm,gof\nKM-A01,W01,1.25,0.99\n\nKM-A01,W02,1.27,0.98\n");

        Assert.Equal(2, rows.Length);
        Assert.Equal(new EllipsometryRow("KM-A01", "W01", null, null, 1.25, 3), rows[0]);
        Assert.Equal(5, rows[1].SourceLine);
        Assert.False(rows[0].IsSite);
    }

    [Fact]
    public void Read_PerSiteWithDieXY_HeaderCaseInsensitive()
    {
        var rows = Read("Lot,Wafer,Die_X,Die_Y,Thickness_nm\nKM-A01,W01,3,5,1.26\n");

        Assert.Equal(new EllipsometryRow("KM-A01", "W01", 3, 5, 1.26, 2), Assert.Single(rows));
    }

    [Fact]
    public void Read_PerSiteWithXY_Accepted()
    {
        var row = Assert.Single(Read("lot,wafer,x,y,thickness_nm\nKM-A01,W01,-2,4,1.26\n"));
        Assert.Equal((-2, 4), (row.DieX!.Value, row.DieY!.Value));
    }

    [Theory]
    [InlineData("3_5")]
    [InlineData("\"3,5\"")]
    [InlineData("\"(3, 5)\"")]
    [InlineData("3x5")]
    [InlineData("3/5")]
    public void Read_DieColumn_ParsesCommonForms(string die)
    {
        var row = Assert.Single(Read($"lot,wafer,die,thickness_nm\nKM-A01,W01,{die},1.26\n"));
        Assert.Equal((3, 5), (row.DieX!.Value, row.DieY!.Value));
    }

    [Fact]
    public void Read_SemicolonDelimited_Accepted()
    {
        var row = Assert.Single(Read("lot;wafer;thickness_nm\nKM-A03;W11;1.31\n"));
        Assert.Equal(1.31, row.ThicknessNm);
    }

    [Fact]
    public void Read_MissingThicknessColumn_ThrowsNamingFileAndLine()
    {
        var ex = Assert.Throws<ResultsFormatException>(() => Read("# export\nlot,wafer,thickness_A\nKM-A01,W01,12.5\n"));
        Assert.StartsWith("ellipsometry.csv:2: missing column 'thickness_nm'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_NegativeThickness_ThrowsNamingLineAndColumn()
    {
        var ex = Assert.Throws<ResultsFormatException>(() => Read("lot,wafer,thickness_nm\nKM-A01,W01,1.2\nKM-A01,W02,-1.2\n"));
        Assert.StartsWith("ellipsometry.csv:3:3: thickness -1.2 nm", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_UnparseableDie_Throws()
    {
        var ex = Assert.Throws<ResultsFormatException>(() => Read("lot,wafer,die,thickness_nm\nKM-A01,W01,centre,1.2\n"));
        Assert.StartsWith("ellipsometry.csv:2:3: die 'centre'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_SiteRowWithoutDie_Throws()
    {
        var ex = Assert.Throws<ResultsFormatException>(() => Read("lot,wafer,die_x,die_y,thickness_nm\nKM-A01,W01,,,1.2\n"));
        Assert.StartsWith("ellipsometry.csv:2:3: the 'die_x' cell is empty", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void ReadThenCompare_PlantedOffset_FoundPerWaferWithUnmatchedListed()
    {
        // Electrical d ≈ 1.5 nm per die; ellipsometry planted 0.25 nm thinner on every wafer; one extra wafer W09
        // has no results and the W02 row of KM-A03 is missing from the ellipsometry.
        var results = LotSimulation.ThreeLotsWithPlantedShift();
        string text = "lot,wafer,thickness_nm\n" +
                      "KM-A01,W01,1.25\nKM-A01,W02,1.25\nKM-A02,W01,1.25\nKM-A02,W02,1.25\nKM-A03,W01,1.25\nKM-A01,W09,1.25\n";

        var c = ThicknessComparison.Compare(results, Read(text));

        Assert.Equal(5, c.Pairs.Length);
        Assert.InRange(c.Agreement!.BiasNm, 0.24, 0.26);
        Assert.True(c.Agreement.BiasLower95Nm < 0.25 && c.Agreement.BiasUpper95Nm > 0.25);
        Assert.Equal("W09", Assert.Single(c.UnmatchedEllipsometry).Row.Wafer);
        Assert.Contains(c.UnmatchedResults, u => u.Lot == "KM-A03" && u.Wafer == "W02" && u.Reason.StartsWith("no ellipsometry", StringComparison.Ordinal));
        Assert.Contains(c.UnmatchedResults, u => u.Reason.Contains("failed", StringComparison.Ordinal));
        int used = c.Pairs.Sum(p => p.DieCount);
        Assert.Equal(results.Count, used + c.UnmatchedResults.Length); // nothing dropped silently
        Assert.Equal(FitStatus.Ok, results[10].Status);
    }
}
