using System.CommandLine;
using JunctionFit.Cli.Commands;
using JunctionFit.Cli.Support;

namespace JunctionFit.Cli;

/// <summary>Builds the command tree and runs it with one top-level error handler.</summary>
public static class CliApp
{
    /// <summary>The command tree: every command with its options.</summary>
    /// <param name="context">Where the commands write.</param>
    internal static RootCommand BuildRoot(CliContext context)
    {
        var root = new RootCommand("junctionfit — barrier height, thickness and area of tunnel junctions from measured I–V sweeps.");
        root.Subcommands.Add(FitCommand.Create(context));
        root.Subcommands.Add(SimulateCommand.Create(context));
        root.Subcommands.Add(DemoCommand.Create(context));
        root.Subcommands.Add(InspectCommand.Create(context));
        root.Subcommands.Add(BatchCommand.Create(context));
        root.Subcommands.Add(DriftCommand.Create(context));
        root.Subcommands.Add(ThicknessCommand.Create(context));
        root.Subcommands.Add(TemperatureSeriesCommand.Create(context));
        root.Subcommands.Add(ResultsCommand.Create(context));
        root.Subcommands.Add(PlanCommand.Create(context));
        return root;
    }

    /// <summary>Runs the tool; returns the exit code (see <see cref="ExitCodes"/>).</summary>
    /// <param name="args">Command-line arguments.</param>
    /// <param name="stdout">Standard output.</param>
    /// <param name="stderr">Standard error.</param>
    public static int Run(string[] args, TextWriter stdout, TextWriter stderr)
    {
        ArgumentNullException.ThrowIfNull(args);
        // The library's remedies are worded as this tool's options in everything printed (OptionWords).
        stdout = new OptionWords.Writer(stdout);
        stderr = new OptionWords.Writer(stderr);
        var context = new CliContext(stdout, stderr);
        var root = BuildRoot(context);
        var parse = root.Parse(args);
        var unknownCommand = parse.CommandResult.Command == root
            ? args.TakeWhile(a => !a.StartsWith('-')).FirstOrDefault()
            : null;
        if (parse.Errors.Count > 0 || unknownCommand is not null)
        {
            var messages = parse.Errors.Select(e => e.Message).ToList();
            // 'junctionfit fitt --help' must not show the root help with exit 0 as if 'fitt' were a command.
            if (messages.Count == 0) messages.Add($"'{unknownCommand}' is not a command");
            if (messages.Count > 1) messages.RemoveAll(m => m.StartsWith("Required command was not provided", StringComparison.Ordinal));
            foreach (string message in messages) stderr.WriteLine($"junctionfit: {message}");
            stderr.WriteLine("junctionfit: run 'junctionfit --help' or 'junctionfit COMMAND --help' for usage");
            return ExitCodes.UsageOrInput;
        }
        try
        {
            return parse.Invoke(new InvocationConfiguration { Output = stdout, Error = stderr, EnableDefaultExceptionHandler = false });
        }
        catch (UsageException e)
        {
            stderr.WriteLine($"junctionfit: {e.Message}");
            return ExitCodes.UsageOrInput;
        }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException)
        {
            stderr.WriteLine($"junctionfit: {e.Message}");
            return ExitCodes.UsageOrInput;
        }
        catch (JunctionFit.Storage.ResultStoreException e)
        {
            // The results database failed mid-run (server gone, disk full): what was committed stays; a rerun completes it.
            stderr.WriteLine($"junctionfit: {e.Message}; results stored so far are kept, run the command again to complete it");
            return ExitCodes.UsageOrInput;
        }
    }
}
