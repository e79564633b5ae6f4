using System.Globalization;

namespace JunctionFit.Tests.Fitting;

/// <summary>One NIST StRD nonlinear-regression dataset read from the project's plain-text copy.</summary>
internal sealed class NistDataset
{
    private static readonly Dictionary<string, NistDataset> Cache = new(StringComparer.Ordinal);
    private static readonly Lock CacheLock = new();

    public required string Name { get; init; }
    public required double[] Start1 { get; init; }
    public required double[] Start2 { get; init; }
    public required double[] CertifiedValues { get; init; }
    public required double[] CertifiedStandardDeviations { get; init; }
    public required double CertifiedResidualSumOfSquares { get; init; }
    public required double[] Y { get; init; }

    /// <summary>Predictors, row-major: Predictors[i * PredictorCount + k].</summary>
    public required double[] Predictors { get; init; }
    public required int PredictorCount { get; init; }

    /// <summary>The responses and predictors as written in the data file, for exact double-double conversion.</summary>
    public required string[] YText { get; init; }

    public required string[] PredictorText { get; init; }

    public int ParameterCount => CertifiedValues.Length;
    public int ObservationCount => Y.Length;

    public static readonly string[] Names =
    [
        "Misra1a", "Chwirut2", "Chwirut1", "Lanczos3", "Gauss1", "Gauss2", "DanWood", "Misra1b",
        "Kirby2", "Hahn1", "Nelson", "MGH17", "Lanczos1", "Lanczos2", "Gauss3", "Misra1c", "Misra1d",
        "Roszman1", "ENSO", "MGH09", "Thurber", "BoxBOD", "Rat42", "MGH10", "Eckerle4", "Rat43", "Bennett5",
    ];

    public static NistDataset Load(string name)
    {
        lock (CacheLock)
        {
            if (!Cache.TryGetValue(name, out var data))
            {
                data = Parse(name, File.ReadAllLines(Path.Combine(AppContext.BaseDirectory, "Reference", "NistStrd", name + ".txt")));
                Cache[name] = data;
            }

            return data;
        }
    }

    private static double D(string s) => double.Parse(s, NumberStyles.Float, CultureInfo.InvariantCulture);

    private static NistDataset Parse(string name, string[] lines)
    {
        var s1 = new List<double>();
        var s2 = new List<double>();
        var cv = new List<double>();
        var csd = new List<double>();
        double rss = double.NaN;
        var y = new List<double>();
        var x = new List<double>();
        var yText = new List<string>();
        var xText = new List<string>();
        int predictors = 0;
        int rows = -1;
        foreach (string line in lines)
        {
            if (line.Length == 0 || line[0] == '#')
            {
                continue;
            }

            string[] t = line.Split(' ', StringSplitOptions.RemoveEmptyEntries);
            if (rows >= 0)
            {
                y.Add(D(t[0]));
                yText.Add(t[0]);
                for (int k = 1; k <= predictors; k++)
                {
                    x.Add(D(t[k]));
                    xText.Add(t[k]);
                }

                continue;
            }

            switch (t[0])
            {
                case "parameter":
                    s1.Add(D(t[2]));
                    s2.Add(D(t[3]));
                    cv.Add(D(t[4]));
                    csd.Add(D(t[5]));
                    break;
                case "certified_rss":
                    rss = D(t[1]);
                    break;
                case "data":
                    rows = int.Parse(t[1], CultureInfo.InvariantCulture);
                    predictors = int.Parse(t[2], CultureInfo.InvariantCulture);
                    break;
                default:
                    break;
            }
        }

        if (y.Count != rows)
        {
            throw new InvalidDataException($"{name}: expected {rows} rows, read {y.Count}");
        }

        return new NistDataset
        {
            Name = name,
            Start1 = [.. s1],
            Start2 = [.. s2],
            CertifiedValues = [.. cv],
            CertifiedStandardDeviations = [.. csd],
            CertifiedResidualSumOfSquares = rss,
            Y = [.. y],
            Predictors = [.. x],
            PredictorCount = predictors,
            YText = [.. yText],
            PredictorText = [.. xText],
        };
    }
}
