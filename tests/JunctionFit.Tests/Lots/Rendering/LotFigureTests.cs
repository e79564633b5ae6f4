using JunctionFit.Import;
using JunctionFit.Lots;
using JunctionFit.Reporting;
using JunctionFit.Results;
using SkiaSharp;
using Xunit;

namespace JunctionFit.Tests.Lots.Rendering;

/// <summary>Wafer map, trend chart and Bland–Altman PNGs: valid, of the asked size, and not blank.</summary>
public class LotFigureTests
{
    private static List<ResultRow> OneWafer()
    {
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01") { Wafers = 1, GridX = 9, GridY = 8, FailedDies = 3, PoorFitDies = 2 }, 11);
        // Make it round: drop corner dies outside a circle, as on a real wafer.
        return rows.Where(r => Math.Pow(r.DieX!.Value - 4, 2) + Math.Pow(r.DieY!.Value - 3.5, 2) <= 4.6 * 4.6).ToList();
    }

    private static ThicknessComparisonResult Comparison()
    {
        var results = LotSimulation.ThreeLotsWithPlantedShift();
        var ellipsometry = new List<EllipsometryRow>();
        foreach (string lot in new[] { "KM-A01", "KM-A02", "KM-A03" })
        {
            ellipsometry.Add(new EllipsometryRow(lot, "W01", null, null, 1.25));
            ellipsometry.Add(new EllipsometryRow(lot, "W02", null, null, 1.26));
        }
        return ThicknessComparison.Compare(results, ellipsometry);
    }

    [Theory]
    [InlineData("barrier_height_eV")]
    [InlineData("thickness_nm")]
    [InlineData("area_m2")]
    public void WaferMapRenderPng_OneWafer_DecodesAndIsNotBlank(string key)
    {
        byte[] png = WaferMapRenderer.RenderPng(OneWafer(), key, 820, 720);

        using var bitmap = SKBitmap.Decode(png);
        Assert.NotNull(bitmap);
        Assert.Equal((820, 720), (bitmap.Width, bitmap.Height));
        Assert.True(DistinctColours(bitmap) > 100, "dies in many colours plus the colour scale");
        Dump($"wafer-{key}.png", png);
    }

    [Fact]
    public void WaferMapRenderPng_TwoWafers_Throws()
    {
        var rows = LotSimulation.Lot(new LotSimulation.LotSpec("KM-A01"), 1);
        Assert.Throws<ArgumentException>(() => WaferMapRenderer.RenderPng(rows, "barrier_height_eV"));
    }

    [Fact]
    public void WaferMapFileName_ContainsWaferAndIsSafe()
    {
        Assert.Equal("wafer-KM-A01-W_07-barrier_height_eV.png", WaferMapRenderer.FileName("KM-A01", "W/07", "barrier_height_eV"));
    }

    [Fact]
    public void TrendChartRenderPng_PlantedShift_DecodesAndShowsAlarmColour()
    {
        var chart = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), new DriftOptions("KM-A01")).Charts[0];

        byte[] png = TrendChartRenderer.RenderPng(chart, 900, 560);

        using var bitmap = SKBitmap.Decode(png);
        Assert.Equal((900, 560), (bitmap.Width, bitmap.Height));
        Assert.True(DistinctColours(bitmap) > 30);
        Assert.True(CountNear(bitmap, new SKColor(0xB0, 0x2E, 0x2E)) > 50, "the out-of-control marker and limits are drawn in red");
        Dump("trend-barrier_height_eV.png", png);
    }

    [Fact]
    public void TrendChartRenderPng_NoLimits_StillRenders()
    {
        var rows = new List<ResultRow> { LotSimulation.Row("KM-A01", FitStatus.Ok, 2.0), LotSimulation.Row("KM-A02", FitStatus.Ok, 2.1) };
        var chart = DriftAnalysis.Compute(rows, new DriftOptions("KM-A01") { ParameterKeys = ["barrier_height_eV"] }).Charts[0];
        Assert.Equal(ControlLimitBasis.None, chart.Basis);

        using var bitmap = SKBitmap.Decode(TrendChartRenderer.RenderPng(chart));
        Assert.True(DistinctColours(bitmap) > 10);
    }

    [Fact]
    public void BlandAltmanRenderPng_PlantedOffset_DecodesAndIsNotBlank()
    {
        byte[] png = BlandAltmanRenderer.RenderPng(Comparison(), 900, 620);

        using var bitmap = SKBitmap.Decode(png);
        Assert.Equal((900, 620), (bitmap.Width, bitmap.Height));
        Assert.True(DistinctColours(bitmap) > 30);
        Assert.Equal(SKColors.White, bitmap.GetPixel(2, 2));
        Dump("bland-altman.png", png);
    }

    [Fact]
    public void WritePng_AllThree_WriteDecodableFiles()
    {
        string dir = Path.Combine(Path.GetTempPath(), "jf-lotpng-" + Guid.NewGuid().ToString("N"));
        try
        {
            var wafer = OneWafer();
            WaferMapRenderer.WritePng(wafer, "thickness_nm", Path.Combine(dir, WaferMapRenderer.FileName("KM-A01", "W01", "thickness_nm")));
            var chart = DriftAnalysis.Compute(LotSimulation.ThreeLotsWithPlantedShift(), new DriftOptions("KM-A01")).Charts[0];
            TrendChartRenderer.WritePng(chart, Path.Combine(dir, TrendChartRenderer.FileName(chart.Key)));
            BlandAltmanRenderer.WritePng(Comparison(), Path.Combine(dir, BlandAltmanRenderer.DefaultFileName));

            var files = Directory.GetFiles(dir);
            Assert.Equal(3, files.Length);
            foreach (string f in files)
            {
                using var bitmap = SKBitmap.Decode(f);
                Assert.NotNull(bitmap);
            }
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    private static void Dump(string name, byte[] png)
    {
        string? dump = Environment.GetEnvironmentVariable("JUNCTIONFIT_PLOT_DUMP");
        if (!string.IsNullOrEmpty(dump)) File.WriteAllBytes(Path.Combine(dump, name), png);
    }

    private static int DistinctColours(SKBitmap bitmap)
    {
        var colours = new HashSet<uint>();
        for (int y = 0; y < bitmap.Height; y += 2)
        {
            for (int x = 0; x < bitmap.Width; x += 2) colours.Add((uint)bitmap.GetPixel(x, y));
        }
        return colours.Count;
    }

    private static int CountNear(SKBitmap bitmap, SKColor target)
    {
        int n = 0;
        for (int y = 0; y < bitmap.Height; y++)
        {
            for (int x = 0; x < bitmap.Width; x++)
            {
                var c = bitmap.GetPixel(x, y);
                if (Math.Abs(c.Red - target.Red) < 24 && Math.Abs(c.Green - target.Green) < 24 && Math.Abs(c.Blue - target.Blue) < 24) n++;
            }
        }
        return n;
    }
}
