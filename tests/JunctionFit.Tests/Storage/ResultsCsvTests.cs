using JunctionFit.Lots;
using JunctionFit.Results;
using JunctionFit.Storage;
using JunctionFit.Tests.Reporting;
using Xunit;

namespace JunctionFit.Tests.Storage;

public class ResultsCsvTests
{
    private const string Path = "lot/results.csv";

    private static List<ResultRow> SampleRows()
    {
        var ok = ResultRow.FromFitResult(ReportingFixtures.OkResult("KM-A01/W07/die, \"odd\" name.csv"));
        var poor = ResultRow.FromFitResult(ReportingFixtures.PoorResult());
        var failed = ResultRow.FromFitResult(ReportingFixtures.FailedResult());
        var extra = ok with
        {
            File = "KM-A02/W01/die_00_00.csv",
            Lot = "KM-A02",
            Parameters = [.. ok.Parameters, new RowParameter("asymmetry_eV", 0.12, 0.01, 0.10, 0.14)],
            Warnings = ["first\nsecond line", "has | a bar"],
            TransitionVoltageV = null,
        };
        return [ok, poor, failed, extra];
    }

    [Fact]
    public void FromFitResult_ParametersInTableOrder()
    {
        var row = ResultRow.FromFitResult(ReportingFixtures.OkResult());

        // The fixture lists mass_ratio before area_m2; the table order is φ, d, area, m*/mₑ.
        Assert.Equal(["barrier_height_eV", "thickness_nm", "area_m2", "mass_ratio"], row.Parameters.Select(p => p.Key));
        Assert.Equal(1.03, row.ReducedChiSquare);
        Assert.Equal(0.781, row.TransitionVoltageV);
        Assert.Equal(("KM-A01", "W07", 3, 5), (row.Lot, row.Wafer, row.DieX, row.DieY));
    }

    [Fact]
    public void Format_Header_HasDocumentedColumnsInOrder()
    {
        string header = ResultsCsv.Format(SampleRows()).Split('\n')[0];

        Assert.Equal(
            "file,lot,wafer,die_x,die_y,model,status," +
            "barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi," +
            "thickness_nm,thickness_nm_stderr,thickness_nm_lo,thickness_nm_hi," +
            "area_m2,area_m2_stderr,area_m2_lo,area_m2_hi," +
            "mass_ratio,mass_ratio_stderr,mass_ratio_lo,mass_ratio_hi," +
            "asymmetry_eV,asymmetry_eV_stderr,asymmetry_eV_lo,asymmetry_eV_hi," +
            "reduced_chi2,transition_voltage_V,warnings,error,option_set,plot",
            header);
    }

    [Fact]
    public void Format_AllFailed_StillHasStandardParameterColumns()
    {
        string header = ResultsCsv.Format([ResultRow.FromFitResult(ReportingFixtures.FailedResult())]).Split('\n')[0];

        Assert.Contains("barrier_height_eV_hi,thickness_nm,", header, StringComparison.Ordinal);
        Assert.Contains("mass_ratio_hi,reduced_chi2", header, StringComparison.Ordinal);
    }

    [Fact]
    public void WriteThenRead_SampleRows_RoundTripsEveryField()
    {
        string dir = System.IO.Path.Combine(System.IO.Path.GetTempPath(), "jf-results-" + Guid.NewGuid().ToString("N"));
        try
        {
            string path = System.IO.Path.Combine(dir, "out", ResultsCsv.FileName);
            var rows = SampleRows();
            ResultsCsv.Write(path, rows);

            var back = ResultsCsv.Read(path);

            Assert.Equal(rows.Count, back.Length);
            for (int i = 0; i < rows.Count; i++)
            {
                var (a, b) = (rows[i], back[i]);
                Assert.Equal(a.File, b.File);
                Assert.Equal((a.Lot, a.Wafer, a.DieX, a.DieY, a.Model, a.Status), (b.Lot, b.Wafer, b.DieX, b.DieY, b.Model, b.Status));
                // Exact doubles: shortest round-trip text. results.csv has no K_fixed column, so "held fixed" reads back as unknown.
                Assert.Equal(a.Parameters.Select(p => p with { IsFixed = null }).ToArray(), b.Parameters.ToArray());
                Assert.Equal(a.ReducedChiSquare, b.ReducedChiSquare);
                Assert.Equal(a.TransitionVoltageV, b.TransitionVoltageV);
                Assert.Equal(a.Error, b.Error);
            }
            Assert.Equal(rows[1].Warnings.ToArray(), back[1].Warnings.ToArray());
            // Line breaks become spaces and the separator inside a warning becomes " / ", so the cell splits back cleanly.
            Assert.Equal(["first second line", "has / a bar"], back[3].Warnings.ToArray());
            Assert.Empty(back[2].Parameters);
            Assert.Equal(FitStatus.Failed, back[2].Status);
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void Read_MissingStatusColumn_ThrowsNamingFileAndLine()
    {
        string text = ResultsCsv.Format(SampleRows()).Replace(",status,", ",state,", StringComparison.Ordinal);

        var ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(text), Path));

        Assert.StartsWith("lot/results.csv:1: missing column 'status'", ex.Message, StringComparison.Ordinal);
        Assert.Equal(Path, ex.FilePath);
        Assert.Equal(1, ex.Line);
    }

    [Fact]
    public void Read_ParameterWithoutHiColumn_ThrowsNamingTheColumn()
    {
        string text = ResultsCsv.Format(SampleRows()).Replace(",thickness_nm_hi,", ",thickness_nm_high,", StringComparison.Ordinal);

        var ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(text), Path));

        Assert.StartsWith("lot/results.csv:1: parameter 'thickness_nm' lacks column 'thickness_nm_hi'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_BadNumber_ThrowsNamingLineAndColumn()
    {
        string text = "file,lot,wafer,die_x,die_y,model,status,barrier_height_eV,barrier_height_eV_stderr,barrier_height_eV_lo,barrier_height_eV_hi,reduced_chi2,transition_voltage_V,warnings\n" +
                      "a.csv,KM-A01,W01,0,0,simmons,ok,2.0,0.01,1.98,2.02,1.0,0.7,\n" +
                      "b.csv,KM-A01,W01,1,0,simmons,ok,2,0eV,0.01,1.98,2.02,1.0,0.7,\n" +
                      "c.csv,KM-A01,W01,1,0,simmons,ok,two,0.01,1.98,2.02,1.0,0.7,\n";

        var ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(text), Path));
        Assert.Equal("lot/results.csv:3: 15 fields, but the header has 14", ex.Message);

        text = text.Replace("2,0eV", "2.0", StringComparison.Ordinal);
        ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(text), Path));
        Assert.Equal("lot/results.csv:4:8: 'two' in column barrier_height_eV is not a number", ex.Message);
    }

    [Fact]
    public void Read_UnknownStatus_Throws()
    {
        string text = ResultsCsv.Format(SampleRows()).Replace(",poor-fit,", ",meh,", StringComparison.Ordinal);

        var ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(text), Path));

        Assert.Contains(":3:7: status 'meh'", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_EmptyFile_Throws()
    {
        var ex = Assert.Throws<ResultsFormatException>(() => ResultsCsv.Read(new StringReader(""), Path));
        Assert.StartsWith("lot/results.csv:1: the file is empty", ex.Message, StringComparison.Ordinal);
    }

    [Fact]
    public void Read_ExtraColumnsAndNoErrorColumn_AreAccepted()
    {
        string text = "operator,file,lot,wafer,die_x,die_y,model,status,reduced_chi2,transition_voltage_V,warnings,thickness_nm,thickness_nm_stderr,thickness_nm_lo,thickness_nm_hi\n" +
                      "K. Mills,a.csv,KM-A01,W01,0,0,simmons,ok,1.0,,,1.5,0.01,1.48,1.52\n";

        var row = Assert.Single(ResultsCsv.Read(new StringReader(text), Path));

        Assert.Equal(1.5, row.ValueOf("thickness_nm"));
        Assert.Null(row.TransitionVoltageV);
        Assert.Null(row.Error);
    }

    [Fact]
    public void ReadThenDrift_PlantedShift_SurvivesTheFile()
    {
        var rows = Tests.Lots.LotSimulation.ThreeLotsWithPlantedShift();
        var back = ResultsCsv.Read(new StringReader(ResultsCsv.Format(rows)), Path);

        var flagged = Assert.Single(DriftAnalysis.Compute(back, new DriftOptions("KM-A01")).Flagged);

        Assert.Equal(("KM-A02", "barrier_height_eV"), (flagged.Lot, flagged.Key));
    }
}
