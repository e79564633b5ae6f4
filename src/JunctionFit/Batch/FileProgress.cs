using System.Diagnostics;
using System.Globalization;

namespace JunctionFit.Batch;

/// <summary>
/// Progress on standard error for one large input file that takes longer than <see cref="DelaySeconds"/>: a line
/// <c>junctionfit: PATH: STAGE (N s)</c> after the first second and every <see cref="PeriodSeconds"/> after it, and
/// <c>junctionfit: PATH: done in N s</c> at the end when anything was shown. Files below <see cref="MinimumBytes"/>
/// (about 7000 rows) never show progress, so that a slow machine does not add lines to small runs.
/// </summary>
public sealed class FileProgress : IDisposable
{
    /// <summary>Seconds before the first progress line.</summary>
    public const double DelaySeconds = 1.0;

    /// <summary>Seconds between progress lines.</summary>
    public const double PeriodSeconds = 2.0;

    /// <summary>Smallest file (bytes) that can show progress.</summary>
    public const long MinimumBytes = 256 * 1024;

    private readonly TextWriter _writer;
    private readonly string _path;
    private readonly Stopwatch _clock = Stopwatch.StartNew();
    private readonly Timer _timer;
    private readonly object _gate = new();
    private string _stage;
    private bool _shown;
    private bool _disposed;

    private FileProgress(TextWriter writer, string path, string stage)
    {
        _writer = writer;
        _path = path;
        _stage = stage;
        _timer = new Timer(_ => Show(), null, TimeSpan.FromSeconds(DelaySeconds), TimeSpan.FromSeconds(PeriodSeconds));
    }

    /// <summary>Starts watching <paramref name="path"/> when it is large enough and a writer is given; otherwise null.</summary>
    public static FileProgress? Start(TextWriter? writer, string path, string stage)
    {
        if (writer is null) return null;
        long bytes;
        try { bytes = new FileInfo(path).Length; }
        catch (Exception e) when (e is IOException or UnauthorizedAccessException or ArgumentException or NotSupportedException) { return null; }
        return bytes >= MinimumBytes ? new FileProgress(writer, path, $"{stage} {bytes / 1e6:0.#} MB") : null;
    }

    /// <summary>Names the stage now running (shown with the next progress line).</summary>
    public void Stage(string stage)
    {
        lock (_gate) _stage = stage;
    }

    private void Show()
    {
        lock (_gate)
        {
            if (_disposed) return;
            lock (_writer)
            {
                _writer.WriteLine(string.Create(CultureInfo.InvariantCulture, $"junctionfit: {_path}: {_stage} ({_clock.Elapsed.TotalSeconds:0} s)"));
                _writer.Flush();
            }
            _shown = true;
        }
    }

    /// <summary>Stops the timer and, when progress was shown, says how long the file took.</summary>
    public void Dispose()
    {
        _timer.Dispose();
        lock (_gate)
        {
            if (_disposed) return;
            _disposed = true;
            if (!_shown) return;
            lock (_writer)
            {
                _writer.WriteLine(string.Create(CultureInfo.InvariantCulture, $"junctionfit: {_path}: done in {_clock.Elapsed.TotalSeconds:0.0} s"));
                _writer.Flush();
            }
        }
    }
}
