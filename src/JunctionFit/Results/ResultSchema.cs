using System.Collections.Immutable;
using System.Globalization;

namespace JunctionFit.Results;

/// <summary>How a column's value is typed (and so written: text, number, true/false, a list of texts).</summary>
public enum ResultValueKind
{
    /// <summary>Free text; null when unknown.</summary>
    Text,

    /// <summary>A whole number; null when unknown.</summary>
    [System.Diagnostics.CodeAnalysis.SuppressMessage("Naming", "CA1720", Justification = "The kinds name the data a column holds.")]
    Integer,

    /// <summary>A real number in the column's unit; null (or not finite) when unknown.</summary>
    Number,

    /// <summary>true or false; null when unknown.</summary>
    Boolean,

    /// <summary>A list of texts (the warnings).</summary>
    TextList,
}

/// <summary>Optional groups of columns; each table names the groups it has (the core columns are always there).</summary>
[Flags]
public enum ResultColumnGroups
{
    /// <summary>Only the core columns.</summary>
    Core = 0,

    /// <summary><c>K_fixed</c> after each parameter's interval.</summary>
    Fixed = 1,

    /// <summary><c>points_used, points_masked</c> after <c>reduced_chi2</c>.</summary>
    Points = 2,

    /// <summary><c>fitted_by, fitted_at</c>: who fitted the row and when.</summary>
    Work = 4,

    /// <summary><c>option_set</c>: the options that made the row.</summary>
    OptionSet = 8,

    /// <summary><c>plot</c>: the row's plot file, relative to the output folder.</summary>
    Plot = 16,
}

/// <summary>One column of a results table.</summary>
/// <param name="Name">Column name in CSV headers and key in JSON.</param>
/// <param name="Kind">How the value is typed.</param>
/// <param name="Unit">Unit of the value (SI or the unit the key names), null for text and counts.</param>
/// <param name="Display">What the column holds, in words (for documentation and help).</param>
/// <param name="Value">The value of a row: a string, int?, double?, bool? or the warnings, as <paramref name="Kind"/> says.</param>
public sealed record ResultColumn(string Name, ResultValueKind Kind, string? Unit, string Display, Func<ResultRow, object?> Value);

/// <summary>
/// The one schema of result tables. One ordered list of columns from which results.csv, summary.csv and the stored
/// results (CSV and JSON lines) are written, one ordering of parameter keys (the fit JSON uses it too), one status codec.
/// <para>Columns, in order (a group in brackets is there when the table asks for it):</para>
/// <list type="number">
/// <item><c>file, lot, wafer, die_x, die_y, model, status</c> (status: <c>ok</c>, <c>poor-fit</c>, <c>failed</c>);</item>
/// <item>per parameter key K (<see cref="StandardKeys"/> first, then others in order of first appearance):
/// <c>K, K_stderr, K_lo, K_hi</c> in the unit the key names, [<c>K_fixed</c>];</item>
/// <item><c>reduced_chi2</c>, [<c>points_used, points_masked</c>], <c>transition_voltage_V, warnings, error</c>;</item>
/// <item>[<c>fitted_by, fitted_at</c>], [<c>option_set</c>], [<c>plot</c>].</item>
/// </list>
/// New columns are added at the end, so that scripts reading earlier columns by position keep working.
/// </summary>
public static class ResultSchema
{
    /// <summary>The four standard keys in the order every table uses: φ, d, area, m*/mₑ.</summary>
    public static ImmutableArray<string> StandardKeys { get; } = ["barrier_height_eV", "thickness_nm", "area_m2", "mass_ratio"];

    /// <summary>Key under which the transition voltage (V) is offered to the lot statistics.</summary>
    public const string TransitionVoltageKey = "transition_voltage_V";

    /// <summary>Separator of the warnings inside one cell of a text table.</summary>
    public const string WarningSeparator = " | ";

    /// <summary>Separator of the lines of the options text inside one cell of a text table.</summary>
    public const string OptionLineSeparator = "; ";

    /// <summary>Suffixes of the four columns every parameter has, in order: value, standard error, 95 % interval ends.</summary>
    public static ImmutableArray<string> ParameterSuffixes { get; } = ["", "_stderr", "_lo", "_hi"];

    /// <summary>Suffix of the optional "held fixed" column of a parameter.</summary>
    public const string FixedSuffix = "_fixed";

    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    private static readonly ResultColumn[] Leading =
    [
        new("file", ResultValueKind.Text, null, "the I–V file as given", r => r.File),
        new("lot", ResultValueKind.Text, null, "lot", r => r.Lot),
        new("wafer", ResultValueKind.Text, null, "wafer", r => r.Wafer),
        new("die_x", ResultValueKind.Integer, null, "die column", r => r.DieX),
        new("die_y", ResultValueKind.Integer, null, "die row", r => r.DieY),
        new("model", ResultValueKind.Text, null, "model name (one of the barrier model catalog's names)", r => r.Model),
        new("status", ResultValueKind.Text, null, "ok, poor-fit or failed", r => StatusText(r.Status)),
    ];

    private static readonly ResultColumn ReducedChi2 = new("reduced_chi2", ResultValueKind.Number, null, "reduced chi-square of the fit", r => r.ReducedChiSquare);

    private static readonly ResultColumn[] Points =
    [
        new("points_used", ResultValueKind.Integer, null, "points that entered the fit", r => r.PointsUsed),
        new("points_masked", ResultValueKind.Integer, null, "points left out of the fit", r => r.PointsMasked),
    ];

    private static readonly ResultColumn[] Trailing =
    [
        new(TransitionVoltageKey, ResultValueKind.Number, "V", "transition voltage for positive bias", r => r.TransitionVoltageV),
        new("warnings", ResultValueKind.TextList, null, "warnings in words", r => r.Warnings),
        new("error", ResultValueKind.Text, null, "why the fit failed", r => r.Error),
    ];

    private static readonly ResultColumn[] Work =
    [
        new("fitted_by", ResultValueKind.Text, null, "the worker that fitted the row (host:pid or NAME@host:pid)", r => r.FittedBy),
        new("fitted_at", ResultValueKind.Text, null, "when the row was fitted (ISO 8601, UTC)", r => r.FittedAt is DateTimeOffset t ? TimeText(t) : null),
    ];

    private static readonly ResultColumn OptionSetColumn =
        new("option_set", ResultValueKind.Text, null, "the options that made the row: the canonical options text, lines separated by '; '", r => OptionSetCell(r.OptionSet));

    private static readonly ResultColumn PlotColumn = new("plot", ResultValueKind.Text, null, "the row's plot file, relative to the output folder", r => r.Plot);

    /// <summary>Where the die is: <c>lot, wafer, die_x, die_y</c> (the fit JSON ends with them).</summary>
    public static ImmutableArray<ResultColumn> PlacementColumns { get; } = [.. Leading[1..5]];

    /// <summary>A row with only the file, model, status and placement of <paramref name="result"/> (for <see cref="PlacementColumns"/>).</summary>
    /// <param name="result">The fit.</param>
    /// <returns>The row.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="result"/> is null.</exception>
    public static ResultRow Placement(FitResult result)
    {
        ArgumentNullException.ThrowIfNull(result);
        return new ResultRow
        {
            File = result.SourcePath, Model = result.Model, Status = result.Status,
            Lot = result.Lot, Wafer = result.Wafer, DieX = result.DieX, DieY = result.DieY,
        };
    }

    /// <summary>The columns before the parameters.</summary>
    public static ImmutableArray<string> LeadingNames { get; } = [.. Leading.Select(c => c.Name)];

    /// <summary>Names of the core columns after the parameters.</summary>
    public static ImmutableArray<string> TrailingNames { get; } = [ReducedChi2.Name, .. Trailing.Select(c => c.Name)];

    /// <summary>The columns of a table with <paramref name="parameterKeys"/> and the optional <paramref name="groups"/>, in order.</summary>
    /// <param name="parameterKeys">Parameter keys in column order (see <see cref="ParameterKeys"/>).</param>
    /// <param name="groups">Optional groups the table has.</param>
    /// <returns>The columns.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="parameterKeys"/> is null.</exception>
    public static ImmutableArray<ResultColumn> Columns(IReadOnlyList<string> parameterKeys, ResultColumnGroups groups)
    {
        ArgumentNullException.ThrowIfNull(parameterKeys);
        var columns = new List<ResultColumn>(Leading.Length + 5 * parameterKeys.Count + 12);
        columns.AddRange(Leading);
        foreach (string key in parameterKeys)
        {
            string? unit = UnitOfKey(key);
            columns.Add(new(key, ResultValueKind.Number, unit, $"{key}: estimate (or the fixed value)", r => r.Find(key)?.Value));
            columns.Add(new(key + "_stderr", ResultValueKind.Number, unit, $"{key}: standard error", r => r.Find(key)?.StandardError));
            columns.Add(new(key + "_lo", ResultValueKind.Number, unit, $"{key}: lower end of the 95 % interval", r => r.Find(key)?.Lower95));
            columns.Add(new(key + "_hi", ResultValueKind.Number, unit, $"{key}: upper end of the 95 % interval", r => r.Find(key)?.Upper95));
            if (groups.HasFlag(ResultColumnGroups.Fixed))
            {
                columns.Add(new(key + FixedSuffix, ResultValueKind.Boolean, null, $"{key}: held fixed", r => r.Find(key)?.IsFixed));
            }
        }
        columns.Add(ReducedChi2);
        if (groups.HasFlag(ResultColumnGroups.Points)) columns.AddRange(Points);
        columns.AddRange(Trailing);
        if (groups.HasFlag(ResultColumnGroups.Work)) columns.AddRange(Work);
        if (groups.HasFlag(ResultColumnGroups.OptionSet)) columns.Add(OptionSetColumn);
        if (groups.HasFlag(ResultColumnGroups.Plot)) columns.Add(PlotColumn);
        return [.. columns];
    }

    /// <summary>
    /// Parameter keys in table order: the <see cref="StandardKeys"/> first (all four when <paramref name="withStandard"/>,
    /// else those that occur), then other keys in order of first appearance.
    /// </summary>
    /// <param name="keysPerRow">The parameter keys of each row.</param>
    /// <param name="withStandard">True to list the four standard keys even when no row has them (an all-failed lot keeps its layout).</param>
    /// <returns>Keys in column order.</returns>
    /// <exception cref="ArgumentNullException"><paramref name="keysPerRow"/> is null.</exception>
    public static ImmutableArray<string> ParameterKeys(IEnumerable<IEnumerable<string>> keysPerRow, bool withStandard)
    {
        ArgumentNullException.ThrowIfNull(keysPerRow);
        var keys = new List<string>();
        var seen = new HashSet<string>(StringComparer.Ordinal);
        if (withStandard)
        {
            keys.AddRange(StandardKeys);
            seen.UnionWith(StandardKeys);
        }
        foreach (var row in keysPerRow)
        {
            foreach (string key in row)
            {
                if (seen.Add(key)) keys.Add(key);
            }
        }
        return [.. keys.OrderBy(KeyRank)];
    }

    /// <summary>Position of a key in table order: standard keys first, others after (a stable sort keeps their order).</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>0 to 3 for the standard keys, 4 for any other.</returns>
    public static int KeyRank(string key)
    {
        int i = StandardKeys.IndexOf(key, StringComparer.Ordinal);
        return i >= 0 ? i : StandardKeys.Length;
    }

    /// <summary>The unit a parameter key names (<c>thickness_nm</c> → nm, <c>area_m2</c> → m²), "1" for a ratio, null when the key names none.</summary>
    /// <param name="key">Parameter key.</param>
    /// <returns>The unit, or null.</returns>
    public static string? UnitOfKey(string key)
    {
        ArgumentNullException.ThrowIfNull(key);
        if (key.EndsWith("_ratio", StringComparison.Ordinal)) return "1";
        int underscore = key.LastIndexOf('_');
        if (underscore < 0) return null;
        return key[(underscore + 1)..] switch
        {
            "eV" => "eV",
            "nm" => "nm",
            "m2" => "m²",
            "V" => "V",
            "A" => "A",
            "S" => "S",
            "ohm" => "Ω",
            "K" => "K",
            "F" => "F",
            _ => null,
        };
    }

    /// <summary>The status word of every table and of the JSON: ok, poor-fit or failed.</summary>
    /// <param name="status">The status.</param>
    /// <returns>The word.</returns>
    public static string StatusText(FitStatus status) => status switch
    {
        FitStatus.Ok => "ok",
        FitStatus.PoorFit => "poor-fit",
        _ => "failed",
    };

    /// <summary>Reads a status word written by <see cref="StatusText"/> (any case, surrounding spaces ignored).</summary>
    /// <param name="text">The word.</param>
    /// <param name="status">The status, when the word is one.</param>
    /// <returns>True when <paramref name="text"/> is ok, poor-fit or failed.</returns>
    public static bool TryParseStatus(string? text, out FitStatus status)
    {
        switch (text?.Trim().ToLowerInvariant())
        {
            case "ok": status = FitStatus.Ok; return true;
            case "poor-fit": status = FitStatus.PoorFit; return true;
            case "failed": status = FitStatus.Failed; return true;
            default: status = FitStatus.Failed; return false;
        }
    }

    /// <summary>The options text on one line (its lines joined by <see cref="OptionLineSeparator"/>); null stays null.</summary>
    /// <param name="optionsText">Canonical options text (lines separated by line feeds).</param>
    /// <returns>The one-line form.</returns>
    public static string? OptionSetCell(string? optionsText) => optionsText?.Replace("\n", OptionLineSeparator, StringComparison.Ordinal);

    /// <summary>The options text back from its one-line form; an empty cell is null.</summary>
    /// <param name="cell">The cell as written by <see cref="OptionSetCell"/>.</param>
    /// <returns>The text with its line feeds.</returns>
    public static string? OptionSetFromCell(string? cell) => string.IsNullOrWhiteSpace(cell) ? null : cell.Trim().Replace(OptionLineSeparator, "\n", StringComparison.Ordinal);

    /// <summary>A time as every table writes it: ISO 8601 round-trip form in UTC.</summary>
    /// <param name="time">The time.</param>
    /// <returns>The text.</returns>
    public static string TimeText(DateTimeOffset time) => time.ToUniversalTime().ToString("O", Inv);
}
