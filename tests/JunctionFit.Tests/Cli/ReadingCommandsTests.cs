using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// Commands that only read a results database (results, drift, thickness) never create one: a mistyped <c>--db</c> path is
/// exit 2 naming the path, and no file or folder appears. And with only a database to read, the charts go where
/// <c>--out</c> says, never silently into the working folder.
/// </summary>
public class ReadingCommandsTests
{
    public static TheoryData<string[]> ReadingCommands => new()
    {
        new[] { "results", "--db", "{db}" },
        new[] { "results", "--db", "{db}", "--json" },
        new[] { "drift", "--db", "{db}", "--reference", "KM-A01", "--out", "{out}" },
        new[] { "thickness", "--db", "{db}", "{ell}", "--out", "{out}" },
    };

    [Theory]
    [MemberData(nameof(ReadingCommands))]
    public void ReadingCommand_MissingDatabase_Exit2NamesThePathAndCreatesNothing(string[] template)
    {
        using var dir = new TempFolder();
        string db = Path.Combine(dir.Path, "typo", "junctionfit.db");
        string ell = dir.File("ellipsometry.csv");
        File.WriteAllText(ell, "lot,wafer,thickness_nm\nKM-A01,W01,1.50\n");
        string[] args = template.Select(a => a.Replace("{db}", db, StringComparison.Ordinal)
            .Replace("{ell}", ell, StringComparison.Ordinal).Replace("{out}", dir.File("out"), StringComparison.Ordinal)).ToArray();

        var (code, _, err) = CliRunner.Run(args);

        Assert.Equal(2, code);
        Assert.Contains("--db", err, StringComparison.Ordinal);
        Assert.Contains(db, err, StringComparison.Ordinal);
        Assert.False(File.Exists(db));
        Assert.False(Directory.Exists(Path.GetDirectoryName(db)));
        Assert.DoesNotContain("   at ", err, StringComparison.Ordinal); // no stack trace
    }

    [Fact]
    public void Results_MissingFileInExistingFolder_Exit2AndNoFile()
    {
        using var dir = new TempFolder();
        string db = dir.File("junctionfit.db");
        var (code, _, err) = CliRunner.Run("results", "--db", db);
        Assert.Equal(2, code);
        Assert.Contains(db, err, StringComparison.Ordinal);
        Assert.False(File.Exists(db));
        Assert.Empty(Directory.GetFileSystemEntries(dir.Path));
    }

    [Fact]
    public void Results_DatabaseWrittenByBatch_IsRead()
    {
        // Invented data (sample-data/README.md's scenario): one Simmons die, 2 eV, 1.5 nm, 100 µm².
        using var dir = new TempFolder();
        Directory.CreateDirectory(dir.File("lot"));
        var (simCode, csv, simErr) = CliRunner.Run("simulate", "--barrier-height", "2", "--thickness", "1.5", "--area", "100",
            "--from", "-0.8", "--to", "0.8", "--points", "81", "--noise", "0.01", "--seed", "3");
        Assert.True(simCode == 0, simErr);
        File.WriteAllText(Path.Combine(dir.File("lot"), "die_1_1.csv"), csv);
        var (batchCode, _, batchErr) = CliRunner.Run("batch", dir.File("lot"), "--out", dir.File("out"), "--area", "100", "--no-plots");
        Assert.True(batchCode == 0, batchErr);

        var (code, output, err) = CliRunner.Run("results", "--db", Path.Combine(dir.File("out"), "junctionfit.db"));
        Assert.True(code == 0, err);
        Assert.Equal(2, output.Split('\n', StringSplitOptions.RemoveEmptyEntries).Length); // header + one die
    }

    [Fact]
    public void Drift_DatabaseWithoutOut_Exit2AsksForOutAndWritesNothing()
    {
        using var dir = new TempFolder();
        string db = dir.File("junctionfit.db");
        File.WriteAllBytes(db, []);
        var (code, _, err) = CliRunner.Run("drift", "--db", db, "--reference", "KM-A01");
        Assert.Equal(2, code);
        Assert.Contains("--out", err, StringComparison.Ordinal);
        Assert.Equal(0, new FileInfo(db).Length);
    }

    [Fact]
    public void Thickness_DatabaseWithoutOut_Exit2AsksForOut()
    {
        using var dir = new TempFolder();
        string db = dir.File("junctionfit.db");
        File.WriteAllBytes(db, []);
        File.WriteAllText(dir.File("ell.csv"), "lot,wafer,thickness_nm\nKM-A01,W01,1.50\n");
        var (code, _, err) = CliRunner.Run("thickness", "--db", db, dir.File("ell.csv"));
        Assert.Equal(2, code);
        Assert.Contains("--out", err, StringComparison.Ordinal);
    }
}
