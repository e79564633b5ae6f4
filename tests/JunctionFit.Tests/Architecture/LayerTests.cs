using System.Reflection;
using JunctionFit.Cli;
using JunctionFit.Fitting;
using NetArchTest.Rules;
using Xunit;

namespace JunctionFit.Tests.Architecture;

/// <summary>
/// The one-way flow of DEVELOPERS.md ("Layout: data flows one way"), checked on the compiled assemblies with NetArchTest:
/// each namespace of the library may use only the namespaces listed for it in <see cref="MayUse"/>; any other edge
/// between the project's namespaces is a backward edge and fails the build's tests, naming the types that hold it. The
/// pure namespaces do no I/O. The rules are shown to be able to fail: every namespace they name exists, every dependency
/// they forbid is one the checker does see somewhere, and a rule pointed at a deliberately wider set of types reports the
/// known holders of that edge (common practice, no source: a rule that cannot fail proves nothing).
/// </summary>
public class LayerTests
{
    private static readonly Assembly Core = typeof(FitOptions).Assembly;
    private static readonly Assembly Cli = typeof(CliApp).Assembly;

    /// <summary>The layers of the library, leaves first.</summary>
    private static readonly string[] Layers =
    [
        "JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results", "JunctionFit.Fitting", "JunctionFit.Planning",
        "JunctionFit.Lots", "JunctionFit.Reporting", "JunctionFit.Storage", "JunctionFit.Batch",
    ];

    /// <summary>Which namespace may use which (the picture in DEVELOPERS.md); every other edge between layers is backward.</summary>
    internal static readonly Dictionary<string, string[]> MayUse = new()
    {
        ["JunctionFit.Common"] = [],
        ["JunctionFit.Import"] = ["JunctionFit.Common"],
        ["JunctionFit.Physics"] = ["JunctionFit.Common"],
        ["JunctionFit.Results"] = ["JunctionFit.Common", "JunctionFit.Physics"],
        ["JunctionFit.Fitting"] = ["JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results"],
        ["JunctionFit.Planning"] = ["JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results", "JunctionFit.Fitting"],
        ["JunctionFit.Lots"] = ["JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results"],
        ["JunctionFit.Reporting"] =
        [
            "JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results", "JunctionFit.Fitting", "JunctionFit.Planning",
            "JunctionFit.Lots",
        ],
        ["JunctionFit.Storage"] = ["JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results"],
        ["JunctionFit.Batch"] =
        [
            "JunctionFit.Common", "JunctionFit.Import", "JunctionFit.Physics", "JunctionFit.Results", "JunctionFit.Fitting", "JunctionFit.Planning",
            "JunctionFit.Lots", "JunctionFit.Reporting", "JunctionFit.Storage",
        ],
    };

    /// <summary>Namespaces of pure computation: no files, folders, streams, console, processes or databases.</summary>
    internal static readonly string[] Pure = ["JunctionFit.Physics", "JunctionFit.Fitting", "JunctionFit.Lots", "JunctionFit.Planning"];

    /// <summary>
    /// Results writes its one table schema to a stream the caller opened (results.csv, summary.csv) but opens nothing itself:
    /// no files, folders, console, processes or databases.
    /// </summary>
    internal static readonly string[] FileTypes =
    [
        "System.IO.File", "System.IO.Directory", "System.IO.Path", "System.IO.FileStream", "System.Console", "System.Diagnostics.Process",
        "Microsoft.Data.Sqlite", "Npgsql", "JunctionFit.Common.AtomicFile",
    ];

    /// <summary>
    /// Types that do I/O. What pure code may still name from System.IO are plain types with no I/O of their own
    /// (<c>IOException</c>, <c>InvalidDataException</c>), so the list names the I/O types rather than the namespace.
    /// </summary>
    internal static readonly string[] IoTypes =
    [
        "System.IO.File", "System.IO.Directory", "System.IO.Path", "System.IO.Stream", "System.IO.FileStream", "System.IO.TextReader",
        "System.IO.TextWriter", "System.Console", "System.Diagnostics.Process", "Microsoft.Data.Sqlite", "Npgsql", "JunctionFit.Common.AtomicFile",
    ];

    public static TheoryData<string> LayerNames() => [.. Layers];

    public static TheoryData<string> PureNames() => [.. Pure];

    private static string[] Forbidden(string layer) => [.. Layers.Where(l => l != layer && !MayUse[layer].Contains(l)), "JunctionFit.Cli"];

    private static TestResult Forbid(PredicateList types, string[] forbidden) => types.ShouldNot().HaveDependencyOnAny(forbidden).GetResult();

    private static string Names(TestResult r) => string.Join(", ", r.FailingTypeNames ?? []);

    [Theory]
    [MemberData(nameof(LayerNames))]
    public void Layer_UsesOnlyTheLayersItMay_NoBackwardEdge(string layer)
    {
        var result = Forbid(Types.InAssembly(Core).That().ResideInNamespace(layer), Forbidden(layer));
        Assert.True(result.IsSuccessful, $"{layer} may use only {string.Join(", ", MayUse[layer])}; backward edges in: {Names(result)}");
    }

    [Theory]
    [MemberData(nameof(PureNames))]
    public void PureLayer_DoesNoIo(string layer)
    {
        var result = Forbid(Types.InAssembly(Core).That().ResideInNamespace(layer), IoTypes);
        Assert.True(result.IsSuccessful, $"{layer} is pure computation and may not do I/O; I/O in: {Names(result)}");
    }

    [Fact]
    public void Results_OpensNoFile()
    {
        var result = Forbid(Types.InAssembly(Core).That().ResideInNamespace("JunctionFit.Results"), FileTypes);
        Assert.True(result.IsSuccessful, $"JunctionFit.Results writes only to streams it is given; files opened in: {Names(result)}");
    }

    [Fact]
    public void Library_NeverUsesTheCli()
    {
        var result = Types.InAssembly(Core).ShouldNot().HaveDependencyOn("JunctionFit.Cli").GetResult();
        Assert.True(result.IsSuccessful, Names(result));
    }

    [Fact]
    public void Rules_EveryNamespaceTheyName_HoldsTypes()
    {
        // A misspelt namespace would make its rule pass on no types at all.
        foreach (string layer in Layers)
        {
            Assert.True(Types.InAssembly(Core).That().ResideInNamespace(layer).GetTypes().Any(), $"no types in {layer}");
        }
        Assert.True(Types.InAssembly(Cli).That().ResideInNamespace("JunctionFit.Cli").GetTypes().Any());
        Assert.True(Types.InAssembly(Cli).That().ResideInNamespace(CliSupport).GetTypes().Any(), $"no types in {CliSupport}");
        Assert.True(Types.InAssembly(Cli).That().ResideInNamespace(CliCommands).GetTypes().Any(), $"no types in {CliCommands}");
        Assert.Equal(Layers.Order(StringComparer.Ordinal), MayUse.Keys.Order(StringComparer.Ordinal));
    }

    [Fact]
    public void Rules_EveryDependencyTheyForbid_IsSeenWhereItExists()
    {
        // Each forbidden target is used somewhere (by a later layer or the CLI): the checker must report that use, or the
        // rules above would pass whatever the code did.
        var everything = new[] { Core, Cli };
        foreach (string target in Layers.Append("JunctionFit.Cli.Commands"))
        {
            var result = Types.InAssemblies(everything).That().DoNotResideInNamespace(target).ShouldNot().HaveDependencyOn(target).GetResult();
            Assert.False(result.IsSuccessful, $"nothing outside {target} is seen to use it");
        }
        foreach (string io in IoTypes.Where(t => !t.StartsWith("System.Diagnostics", StringComparison.Ordinal)))
        {
            var result = Types.InAssemblies(everything).ShouldNot().HaveDependencyOn(io).GetResult();
            Assert.False(result.IsSuccessful, $"nothing is seen to use {io}");
        }
    }

    [Fact]
    public void StorageRule_WidenedToReporting_ReportsTheLotTables()
    {
        // The lot tables moved from Storage to Reporting because they write Lots types: Storage's rule, pointed at both
        // namespaces, must name them (the edge this change removed from Storage).
        var types = Types.InAssembly(Core).That().ResideInNamespace("JunctionFit.Storage").Or().ResideInNamespace("JunctionFit.Reporting");
        var result = Forbid(types, Forbidden("JunctionFit.Storage"));
        Assert.False(result.IsSuccessful);
        Assert.Contains("JunctionFit.Reporting.LotSummaryCsv", result.FailingTypeNames);
        Assert.Contains("JunctionFit.Reporting.WaferThicknessCsv", result.FailingTypeNames);
    }

    [Fact]
    public void StorageRule_WidenedToFitting_ReportsTheOptionsText()
    {
        // The canonical options text moved from Storage to Fitting: Storage's rule over both names it, since it reads
        // FitOptions, which Storage may no longer see.
        var types = Types.InAssembly(Core).That().ResideInNamespace("JunctionFit.Storage").Or().ResideInNamespace("JunctionFit.Fitting");
        var result = Forbid(types, Forbidden("JunctionFit.Storage"));
        Assert.False(result.IsSuccessful);
        Assert.Contains("JunctionFit.Fitting.FitOptionsText", result.FailingTypeNames);
    }

    [Fact]
    public void PureRule_WidenedToStorage_ReportsTheFileReaders()
    {
        var result = Forbid(Types.InAssembly(Core).That().ResideInNamespace("JunctionFit.Storage"), IoTypes);
        Assert.False(result.IsSuccessful);
        Assert.Contains("JunctionFit.Storage.ResultIdentity", result.FailingTypeNames); // hashes a file through a FileStream
        Assert.Contains("JunctionFit.Storage.EllipsometryCsv", result.FailingTypeNames); // opens a StreamReader
    }

    private const string CliSupport = "JunctionFit.Cli.Support";
    private const string CliCommands = "JunctionFit.Cli.Commands";

    /// <summary>The types of the CLI's root namespace (the command tree), which only the entry point may use.</summary>
    private static string[] CliRoot() =>
        [.. Types.InAssembly(Cli).That().ResideInNamespaceMatching(@"^JunctionFit\.Cli$").GetTypes().Select(t => t.FullName!)];

    [Fact]
    public void CliSupport_UsesNeitherTheCommandsNorTheCommandTree()
    {
        // Within the CLI the flow is one way too: the command tree (CliApp) → the commands → the support types (context,
        // exit codes, option words, quantity parsing), never back.
        var result = Forbid(Types.InAssembly(Cli).That().ResideInNamespace(CliSupport), [CliCommands, .. CliRoot()]);
        Assert.True(result.IsSuccessful, $"{CliSupport} may use only the library; backward edges in: {Names(result)}");
    }

    [Fact]
    public void CliCommands_NeverUseTheCommandTree()
    {
        var result = Forbid(Types.InAssembly(Cli).That().ResideInNamespace(CliCommands), CliRoot());
        Assert.True(result.IsSuccessful, $"{CliCommands} may not use the command tree; backward edges in: {Names(result)}");
    }

    [Fact]
    public void CliRules_WidenedToTheWholeCli_ReportTheCommandTree()
    {
        // The support rule applied to the whole CLI must name the command tree, which does use the commands, and the root
        // namespace must hold the command tree (or the rule against using it would forbid nothing).
        Assert.Contains("JunctionFit.Cli.CliApp", CliRoot());
        var result = Forbid(Types.InAssembly(Cli).That().ResideInNamespace("JunctionFit.Cli"), [CliCommands]);
        Assert.False(result.IsSuccessful);
        Assert.Contains(result.FailingTypeNames, n => n.StartsWith("JunctionFit.Cli.CliApp", StringComparison.Ordinal));
        var support = Types.InAssemblies([Cli]).That().DoNotResideInNamespace(CliSupport).ShouldNot().HaveDependencyOn(CliSupport).GetResult();
        Assert.False(support.IsSuccessful, $"nothing outside {CliSupport} is seen to use it");
    }

    [Fact]
    public void LayerRule_PointedAtTheCli_ReportsTheCommands()
    {
        // The CLI may use everything; the rule of the lowest layer, applied to it, must say so.
        var result = Forbid(Types.InAssembly(Cli).That().ResideInNamespace("JunctionFit.Cli.Commands"), Forbidden("JunctionFit.Common"));
        Assert.False(result.IsSuccessful);
        Assert.Contains(result.FailingTypeNames, n => n.StartsWith("JunctionFit.Cli.Commands.BatchCommand", StringComparison.Ordinal));
    }
}
