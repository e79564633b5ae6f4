using JunctionFit.Batch;
using Xunit;

namespace JunctionFit.Tests.Batch;

public class FileProgressTests
{
    [Fact]
    public void SmallFile_ShowsNoProgress()
    {
        string path = Path.Combine(Path.GetTempPath(), $"jf-progress-small-{Guid.NewGuid():N}.csv");
        File.WriteAllText(path, "Voltage (V),Current (A)\n0.1,1e-9\n");
        try
        {
            Assert.Null(FileProgress.Start(new StringWriter(), path, "reading"));
            Assert.Null(FileProgress.Start(null, path, "reading"));
        }
        finally
        {
            File.Delete(path);
        }
    }

    [Fact]
    public void LargeSlowFile_SaysWhatItDoesAndWhenItIsDone()
    {
        string path = Path.Combine(Path.GetTempPath(), $"jf-progress-large-{Guid.NewGuid():N}.csv");
        File.WriteAllBytes(path, new byte[FileProgress.MinimumBytes]);
        var writer = new StringWriter();
        try
        {
            using (var progress = FileProgress.Start(writer, path, "reading"))
            {
                Assert.NotNull(progress);
                progress.Stage("fitting 7000 points (simmons)");
                // Wait (bounded) for the first line instead of assuming how fast the timer fires.
                for (int k = 0; k < 600; k++)
                {
                    lock (writer) { if (writer.ToString().Length > 0) break; }
                    Thread.Sleep(50);
                }
            }
            string text = writer.ToString();
            Assert.Contains($"junctionfit: {path}: fitting 7000 points (simmons) (", text, StringComparison.Ordinal);
            Assert.Contains($"junctionfit: {path}: done in ", text, StringComparison.Ordinal);
        }
        finally
        {
            File.Delete(path);
        }
    }
}
