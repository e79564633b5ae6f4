using JunctionFit.Reporting;
using JunctionFit.Results;
using Xunit;

namespace JunctionFit.Tests.Reporting;

/// <summary>Plot file names keep lot, wafer and die wherever the input lies, and stay unique within a run.</summary>
public class PlotNameTests
{
    [Fact]
    public void UniquePlotName_PlacedResultOutsideTheWorkingFolder_NamesLotWaferDie()
    {
        // The installed tool reads its demo data beside the program: the path says nothing about the die, the metadata does.
        var result = FitResult.Failed("/opt/tool/sample-data/lots/KM-A01/W01/die_3_4.csv", "simmons", "x") with
        {
            Lot = "KM-A01", Wafer = "W01", DieX = 3, DieY = 4,
        };
        var used = new HashSet<string>(StringComparer.Ordinal);
        Assert.Equal("KM-A01_W01_die_3_4.png", PlotFileNames.Unique(result, used));
        Assert.Equal("KM-A01_W01_die_3_4-2.png", PlotFileNames.Unique(result, used));
    }

    [Fact]
    public void UniquePlotName_NoPlacement_FileNameOfAFileOutsideTheWorkingFolder()
    {
        var result = FitResult.Failed("/somewhere/else/sweep.csv", "simmons", "x");
        Assert.Equal("sweep.png", PlotFileNames.Unique(result, new HashSet<string>(StringComparer.Ordinal)));
    }
}
