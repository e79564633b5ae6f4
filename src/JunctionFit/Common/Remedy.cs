using System.Text;

namespace JunctionFit.Common;

/// <summary>What the user can change to help a fit or a read; the command-line tool words each as its option.</summary>
public enum RemedyKind
{
    /// <summary>Give the junction area (fix it from the lithography).</summary>
    GiveArea,

    /// <summary>Fix the area at each file's stated area.</summary>
    AreaFromFile,

    /// <summary>Fit a window of the bias only.</summary>
    BiasWindow,

    /// <summary>Fit one bias polarity only.</summary>
    Polarity,

    /// <summary>Hold a parameter fixed; the argument names it and its value, for example <c>thickness=NM</c>.</summary>
    FixParameter,

    /// <summary>Free a parameter held fixed by default; the argument names it, for example <c>leakage-conductance</c>.</summary>
    FreeParameter,

    /// <summary>Set the effective-mass ratio.</summary>
    MassRatio,

    /// <summary>State the unit of the voltage column; the argument may name one.</summary>
    VoltageUnit,

    /// <summary>State the unit of the current column; the argument may name one.</summary>
    CurrentUnit,

    /// <summary>Choose the current column.</summary>
    CurrentColumn,

    /// <summary>Choose the voltage column.</summary>
    VoltageColumn,

    /// <summary>Give the file as the capacitance–voltage file of the gate stack (not as an I–V file).</summary>
    ReadAsCv,

    /// <summary>Set the tolerance on the systematic misfit.</summary>
    MisfitTolerance,

    /// <summary>State the measurement noise.</summary>
    Noise,

    /// <summary>Keep the points at the current compliance.</summary>
    KeepCompliance,

    /// <summary>Keep the settling points at the start of a trace.</summary>
    KeepSettling,

    /// <summary>Fit one sweep direction; the argument lists the choices.</summary>
    SweepDirection,

    /// <summary>Give the substrate doping.</summary>
    Doping,

    /// <summary>Place files on a wafer by a pattern of their paths.</summary>
    PathPattern,

    /// <summary>The largest bias the device may see.</summary>
    MaxBias,

    /// <summary>The largest oxide field the device may see.</summary>
    MaxField,

    /// <summary>The JSON lines written by a single-file fit (a file to read, not an option to change).</summary>
    FitJsonOutput,

    /// <summary>Refit files whose result is already stored for the same content, model and options.</summary>
    Refit,

    /// <summary>Hold a worker's claims on files longer without renewal (several workers on one database).</summary>
    Lease,
}

/// <summary>
/// A structured remedy inside a message. The library writes a remedy into its text as a placeholder (<see cref="ToString"/>,
/// <c>{{remedy:Kind}}</c> or <c>{{remedy:Kind:argument}}</c>) and never the command-line option itself; whoever shows the
/// text words each placeholder (<see cref="Word"/>) — the command-line tool with its option names — and can list the
/// remedies a message holds (<see cref="Find"/>).
/// </summary>
/// <param name="Kind">What to change.</param>
/// <param name="Argument">A parameter, value or choice that goes with it; null for none. Holds no <c>}</c>.</param>
public readonly record struct Remedy(RemedyKind Kind, string? Argument = null)
{
    private const string Open = "{{remedy:";
    private const string Close = "}}";

    /// <summary>Give the area.</summary>
    public static Remedy GiveArea => new(RemedyKind.GiveArea);

    /// <summary>Fix the area at each file's stated area.</summary>
    public static Remedy AreaFromFile => new(RemedyKind.AreaFromFile);

    /// <summary>Choose the voltage column.</summary>
    public static Remedy VoltageColumn => new(RemedyKind.VoltageColumn);

    /// <summary>Choose the current column.</summary>
    public static Remedy CurrentColumn => new(RemedyKind.CurrentColumn);

    /// <summary>Read the file as a capacitance–voltage file.</summary>
    public static Remedy ReadAsCv => new(RemedyKind.ReadAsCv);

    /// <summary>Fit a bias window.</summary>
    public static Remedy BiasWindow => new(RemedyKind.BiasWindow);

    /// <summary>Hold <paramref name="parameterAndValue"/> fixed (for example <c>thickness=NM</c>; null for any parameter).</summary>
    /// <param name="parameterAndValue">The parameter and its value as the user would give them.</param>
    /// <returns>The remedy.</returns>
    public static Remedy Fix(string? parameterAndValue = null) => new(RemedyKind.FixParameter, parameterAndValue);

    /// <summary>Free <paramref name="parameter"/> (for example <c>leakage-conductance</c>).</summary>
    /// <param name="parameter">The parameter as the user would name it.</param>
    /// <returns>The remedy.</returns>
    public static Remedy Free(string parameter) => new(RemedyKind.FreeParameter, parameter);

    /// <summary>The placeholder written into messages.</summary>
    /// <returns><c>{{remedy:Kind}}</c> or <c>{{remedy:Kind:argument}}</c>.</returns>
    public override string ToString() => Argument is null ? Open + Kind + Close : Open + Kind + ":" + Argument + Close;

    /// <summary>The remedies in <paramref name="text"/>, in order.</summary>
    /// <param name="text">A message.</param>
    /// <returns>The remedies its placeholders name.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="text"/> is null.</exception>
    public static IReadOnlyList<Remedy> Find(string text)
    {
        ArgumentNullException.ThrowIfNull(text);
        var found = new List<Remedy>();
        int at = 0;
        while (Next(text, at, out _, out int end, out var remedy))
        {
            found.Add(remedy);
            at = end;
        }
        return found;
    }

    /// <summary>Replaces every placeholder in <paramref name="text"/> by <paramref name="words"/> of its remedy.</summary>
    /// <param name="text">A message; null gives null.</param>
    /// <param name="words">How to word a remedy (for the command line: its option).</param>
    /// <returns>The worded text; <paramref name="text"/> itself when it holds no placeholder.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="words"/> is null.</exception>
    public static string? Word(string? text, Func<Remedy, string> words)
    {
        ArgumentNullException.ThrowIfNull(words);
        if (text is null || !text.Contains(Open, StringComparison.Ordinal)) return text;
        var sb = new StringBuilder(text.Length);
        int at = 0;
        while (Next(text, at, out int start, out int end, out var remedy))
        {
            sb.Append(text, at, start - at).Append(words(remedy));
            at = end;
        }
        return sb.Append(text, at, text.Length - at).ToString();
    }

    private static bool Next(string text, int from, out int start, out int end, out Remedy remedy)
    {
        while (true)
        {
            start = text.IndexOf(Open, from, StringComparison.Ordinal);
            end = 0;
            remedy = default;
            if (start < 0) return false;
            int close = text.IndexOf(Close, start + Open.Length, StringComparison.Ordinal);
            if (close < 0) return false;
            string body = text[(start + Open.Length)..close];
            int colon = body.IndexOf(':', StringComparison.Ordinal);
            string kind = colon < 0 ? body : body[..colon];
            if (Enum.TryParse(kind, ignoreCase: false, out RemedyKind k) && Enum.IsDefined(k) && !kind.AsSpan().ContainsAnyInRange('0', '9'))
            {
                remedy = new Remedy(k, colon < 0 ? null : body[(colon + 1)..]);
                end = close + Close.Length;
                return true;
            }
            from = start + Open.Length;
        }
    }
}
