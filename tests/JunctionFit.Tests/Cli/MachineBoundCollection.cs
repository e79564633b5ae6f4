using Xunit;

namespace JunctionFit.Tests.Cli;

/// <summary>
/// Tests that start whole processes and need the machine's cores to themselves: the two-worker share test measures how
/// the work splits between two batch processes, which a concurrent `dotnet pack` of the tool-package test can starve; the
/// killed-batch test must see the batch's progress lines while it runs, which other tests' parallel fits delayed on CI.
/// Classes in this collection run one after another (xunit runs tests of one collection serially).
/// </summary>
[CollectionDefinition(Name, DisableParallelization = true)]
public sealed class MachineBoundCollection
{
    /// <summary>Name of the collection.</summary>
    public const string Name = "machine-bound processes";
}
