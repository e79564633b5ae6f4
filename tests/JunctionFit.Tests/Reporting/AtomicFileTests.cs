using System.Text;
using JunctionFit.Common;
using Xunit;

namespace JunctionFit.Tests.Reporting;

public sealed class AtomicFileTests : IDisposable
{
    private readonly string _dir = Path.Combine(Path.GetTempPath(), "jf-atomic-" + Guid.NewGuid().ToString("N"));

    public void Dispose()
    {
        if (Directory.Exists(_dir)) Directory.Delete(_dir, recursive: true);
    }

    [Fact]
    public void WriteAllText_MissingDirectory_CreatesItAndLeavesNoTempFile()
    {
        string path = Path.Combine(_dir, "a", "b", "out.txt");
        AtomicFile.WriteAllText(path, "héllo");
        Assert.Equal("héllo", File.ReadAllText(path, Encoding.UTF8));
        Assert.Equal([path], Directory.GetFiles(Path.GetDirectoryName(path)!));
    }

    [Fact]
    public void WriteAllBytes_ExistingFile_IsReplaced()
    {
        Directory.CreateDirectory(_dir);
        string path = Path.Combine(_dir, "out.bin");
        File.WriteAllBytes(path, new byte[1000]);
        AtomicFile.WriteAllBytes(path, [1, 2, 3]);
        Assert.Equal(new byte[] { 1, 2, 3 }, File.ReadAllBytes(path));
        Assert.Single(Directory.GetFiles(_dir));
    }

    [Fact]
    public void Write_CallbackThrows_KeepsOldContentAndRemovesTemp()
    {
        Directory.CreateDirectory(_dir);
        string path = Path.Combine(_dir, "keep.txt");
        File.WriteAllText(path, "old");
        Assert.Throws<InvalidOperationException>(() => AtomicFile.Write(path, s =>
        {
            s.Write("partial"u8);
            throw new InvalidOperationException("crash half-way");
        }));
        Assert.Equal("old", File.ReadAllText(path));
        Assert.Single(Directory.GetFiles(_dir));
    }

    [Fact]
    public void WriteAllText_TextFile_HasNoByteOrderMark()
    {
        string path = Path.Combine(_dir, "nobom.txt");
        AtomicFile.WriteAllText(path, "x");
        Assert.Equal(new byte[] { (byte)'x' }, File.ReadAllBytes(path));
    }

    [Fact]
    public void WriteAllBytes_PathIsDirectory_Throws()
    {
        Directory.CreateDirectory(_dir);
        Assert.Throws<ArgumentException>(() => AtomicFile.WriteAllBytes(_dir, [1]));
    }

    [Fact]
    public void WriteAllText_ParallelWritersToOneFile_LeaveOneCompleteVersion()
    {
        string path = Path.Combine(_dir, "race.txt");
        string[] versions = [.. Enumerable.Range(0, 8).Select(k => new string((char)('a' + k), 100_000))];
        Parallel.ForEach(versions, v => AtomicFile.WriteAllText(path, v));
        Assert.Contains(File.ReadAllText(path), versions);
        Assert.Single(Directory.GetFiles(_dir));
    }
}
