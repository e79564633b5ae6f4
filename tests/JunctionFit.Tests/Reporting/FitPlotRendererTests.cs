using JunctionFit.Reporting;
using SkiaSharp;
using Xunit;

namespace JunctionFit.Tests.Reporting;

public class FitPlotRendererTests
{
    private static readonly byte[] PngSignature = [0x89, 0x50, 0x4E, 0x47, 0x0D, 0x0A, 0x1A, 0x0A];

    [Fact]
    public void RenderPng_OkResult_StartsWithPngSignature()
    {
        byte[] png = FitPlotRenderer.RenderPng(ReportingFixtures.OkResult());
        Assert.True(png.AsSpan().StartsWith(PngSignature));
    }

    [Theory]
    [InlineData(900, 700)]
    [InlineData(640, 480)]
    [InlineData(1600, 1200)]
    public void RenderPng_RequestedSize_DecodesToThatSize(int width, int height)
    {
        using var bitmap = SKBitmap.Decode(FitPlotRenderer.RenderPng(ReportingFixtures.OkResult(), width, height));
        Assert.NotNull(bitmap);
        Assert.Equal(width, bitmap.Width);
        Assert.Equal(height, bitmap.Height);
    }

    [Fact]
    public void RenderPng_OkResult_IsNotBlank()
    {
        using var bitmap = SKBitmap.Decode(FitPlotRenderer.RenderPng(ReportingFixtures.OkResult()));
        Assert.True(DistinctColours(bitmap) > 50, "the figure should contain many colours (markers, line, anti-aliased text)");
        Assert.Equal(SKColors.White, bitmap.GetPixel(1, 1));
    }

    [Fact]
    public void RenderPng_FailedResultWithoutCurve_RendersBannerNamingTheError()
    {
        using var bitmap = SKBitmap.Decode(FitPlotRenderer.RenderPng(ReportingFixtures.FailedResult(), 900, 700));
        Assert.Equal(900, bitmap.Width);
        Assert.Equal(FitPlotRenderer.FailureBannerMaxHeightPx, bitmap.Height);
        Assert.True(DistinctColours(bitmap) > 10);
    }

    [Fact]
    public void RenderPng_SizeOutOfRange_Throws()
    {
        Assert.Throws<ArgumentOutOfRangeException>(() => FitPlotRenderer.RenderPng(ReportingFixtures.OkResult(), 10, 700));
    }

    [Fact]
    public void RenderPng_ParallelCalls_GiveIdenticalImages()
    {
        var result = ReportingFixtures.OkResult();
        byte[] reference = FitPlotRenderer.RenderPng(result);
        var images = new byte[8][];
        Parallel.For(0, images.Length, k => images[k] = FitPlotRenderer.RenderPng(result));
        foreach (var image in images) Assert.Equal(reference, image);
    }

    [Fact]
    public void WritePng_NewDirectory_WritesDecodableFile()
    {
        string dir = Path.Combine(Path.GetTempPath(), "jf-png-" + Guid.NewGuid().ToString("N"));
        try
        {
            string path = Path.Combine(dir, "sub", "fit.png");
            FitPlotRenderer.WritePng(ReportingFixtures.OkResult(), path);
            using var bitmap = SKBitmap.Decode(path);
            Assert.Equal(900, bitmap.Width);
            Assert.Single(Directory.GetFiles(Path.Combine(dir, "sub")));
        }
        finally
        {
            if (Directory.Exists(dir)) Directory.Delete(dir, recursive: true);
        }
    }

    [Fact]
    public void BoxLines_FixedMassRatio_SaysFixedAndShowsAreaInSquareMicrometres()
    {
        var lines = FitPlotRenderer.BoxLines(ReportingFixtures.OkResult());
        Assert.Contains(lines, l => l.Text.StartsWith("m*/mₑ = 1", StringComparison.Ordinal) && l.Text.Contains("fixed", StringComparison.Ordinal));
        Assert.Contains(lines, l => l.Text == "A = 101.0 µm²");
        Assert.Contains(lines, l => l.Text == "φ = 2.0041 eV");
        Assert.Contains(lines, l => l.Text == "reduced χ² = 1.03");
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
}
