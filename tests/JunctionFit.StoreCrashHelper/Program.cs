using System.Globalization;
using JunctionFit.Storage;
using JunctionFit.StoreCrashHelper;

// Usage: JunctionFit.StoreCrashHelper DB FIRST COUNT CHUNK [PAUSE_MS]
// Stores demo results FIRST .. FIRST+COUNT-1 into DB in chunks of CHUNK, printing "stored N" after each committed chunk.
if (args.Length < 4)
{
    Console.Error.WriteLine("usage: JunctionFit.StoreCrashHelper DB FIRST COUNT CHUNK [PAUSE_MS]");
    return 2;
}
var inv = CultureInfo.InvariantCulture;
int first = int.Parse(args[1], inv);
int count = int.Parse(args[2], inv);
int chunk = int.Parse(args[3], inv);
int pause = args.Length > 4 ? int.Parse(args[4], inv) : 0;
var run = RunInfo.StartNew("crash-helper");
using var store = ResultStore.Open(args[0]);
var writer = new ChunkedResultWriter(store, chunk);
for (int i = first; i < first + count; i++)
{
    writer.Add(DemoResults.Row(i, run));
    if (writer.Pending == 0)
    {
        Console.Out.WriteLine(string.Create(inv, $"stored {i - first + 1}"));
        Console.Out.Flush();
        if (pause > 0) Thread.Sleep(pause);
    }
}
writer.Flush();
Console.Out.WriteLine(string.Create(inv, $"done {count}"));
return 0;
