using System.Collections.Immutable;
using System.Text.Json;
using JunctionFit.Common;
using JunctionFit.Import;

namespace JunctionFit.Storage;

/// <summary>One parameter of a fit as its JSON line gives it: the value in the key's unit and whether it was held fixed.</summary>
/// <param name="Value">Value in the unit of the key (eV, nm, m², …).</param>
/// <param name="Fixed">True when the fit held it fixed.</param>
public sealed record FittedParameter(double Value, bool Fixed);

/// <summary>What a planning run takes from a fitted result: the model, the parameters and the noise the fit used.</summary>
/// <param name="Path">File as given.</param>
/// <param name="Line">1-based line of the result used.</param>
/// <param name="Model">Model name.</param>
/// <param name="Parameters">Parameters by key.</param>
/// <param name="RelativeNoise">The relative noise the fit used (stated or estimated), if it says.</param>
/// <param name="NoiseFloorA">The noise floor the fit used, if it says.</param>
/// <param name="SourceFile">The measured file the result belongs to.</param>
public sealed record FittedResultLine(
    string Path, int Line, string Model, ImmutableDictionary<string, FittedParameter> Parameters, double? RelativeNoise, double? NoiseFloorA, string? SourceFile);

/// <summary>
/// Reads a result written by <c>fit --json</c> (one JSON object per line, docs/cli.md): the first line whose status is not
/// <c>failed</c>. Never modifies the file.
/// </summary>
public static class FitJsonLineReader
{
    /// <summary>Reads the first usable result of <paramref name="path"/>.</summary>
    /// <param name="path">A file of JSON lines from <c>fit --json</c>.</param>
    /// <returns>The result.</returns>
    /// <exception cref="IvFormatException">A line is not such a result, or no line holds a usable one (message <c>path:line: reason</c>).</exception>
    /// <exception cref="IOException">The file cannot be read.</exception>
    public static FittedResultLine ReadFirst(string path)
    {
        ArgumentNullException.ThrowIfNull(path);
        int lineNumber = 0, failed = 0;
        foreach (string raw in File.ReadLines(path))
        {
            lineNumber++;
            string line = raw.Trim();
            if (line.Length == 0) continue;
            JsonDocument doc;
            try
            {
                doc = JsonDocument.Parse(line);
            }
            catch (JsonException e)
            {
                throw new IvFormatException(path, lineNumber, $"not a JSON line from '{new Remedy(RemedyKind.FitJsonOutput)}' ({e.Message.Split('.')[0]})");
            }
            using (doc)
            {
                var root = doc.RootElement;
                if (root.ValueKind != JsonValueKind.Object || !root.TryGetProperty("parameters", out var pars) || pars.ValueKind != JsonValueKind.Object
                    || !root.TryGetProperty("model", out var model) || model.ValueKind != JsonValueKind.String)
                {
                    throw new IvFormatException(path, lineNumber, $"not a result of '{new Remedy(RemedyKind.FitJsonOutput)}' (no \"model\" and \"parameters\")");
                }
                if (root.TryGetProperty("status", out var status) && status.ValueKind == JsonValueKind.String && status.GetString() == "failed")
                {
                    failed++;
                    continue;
                }
                var parameters = ImmutableDictionary.CreateBuilder<string, FittedParameter>(StringComparer.Ordinal);
                foreach (var p in pars.EnumerateObject())
                {
                    if (p.Value.ValueKind != JsonValueKind.Object || !p.Value.TryGetProperty("value", out var v) || v.ValueKind != JsonValueKind.Number)
                    {
                        throw new IvFormatException(path, lineNumber, $"parameter \"{p.Name}\" has no numeric \"value\"");
                    }
                    bool isFixed = p.Value.TryGetProperty("fixed", out var f) && f.ValueKind == JsonValueKind.True;
                    parameters[p.Name] = new FittedParameter(v.GetDouble(), isFixed);
                }
                double? relative = null, floor = null;
                if (root.TryGetProperty("fit", out var fit) && fit.ValueKind == JsonValueKind.Object)
                {
                    if (fit.TryGetProperty("relative_noise", out var r) && r.ValueKind == JsonValueKind.Number) relative = r.GetDouble();
                    if (fit.TryGetProperty("noise_floor_A", out var fl) && fl.ValueKind == JsonValueKind.Number) floor = fl.GetDouble();
                }
                string? file = root.TryGetProperty("file", out var fn) && fn.ValueKind == JsonValueKind.String ? fn.GetString() : null;
                return new FittedResultLine(path, lineNumber, model.GetString()!, parameters.ToImmutable(), relative, floor, file);
            }
        }
        throw new IvFormatException(path, 0, failed > 0 ? $"all {failed} results in the file failed to fit: nothing to plan from" : $"the file holds no result of '{new Remedy(RemedyKind.FitJsonOutput)}'");
    }
}
