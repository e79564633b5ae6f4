using System.Collections.Immutable;
using System.Data.Common;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// Reads results back from the columns of <c>SqlResultStore</c>'s select list, by position: 0 result id; 1–3 the key
/// (file hash, model, options hash); 4 options text; 5–11 file, lot, wafer, die x, die y, status, error; 12–20 the fit
/// quality; 21 transition voltage; 22 warnings; 23 correlation; 24 parameter count; 25–28 the run; 29 stored at;
/// 30–31 fitted by and at; 32 the parameter ordinal (NULL when the result has none); 33–40 the parameter (key, symbol,
/// unit, value, standard error, interval ends, fixed).
/// </summary>
/// <param name="readTime">How the engine's time columns are read.</param>
internal sealed class StoredRowReader(Func<DbDataReader, int, DateTimeOffset> readTime)
{
    /// <summary>
    /// Every result in <paramref name="reader"/>: the query joins each result's row with its parameter rows, ordered by
    /// result id, so one result's rows arrive together (a result without parameters has NULLs in the parameter columns).
    /// </summary>
    public List<StoredResult> ReadAll(DbDataReader reader)
    {
        var rows = new List<StoredResult>();
        long currentId = long.MinValue;
        DbDataReaderRow? pending = null;
        while (reader.Read())
        {
            long id = reader.GetInt64(0);
            if (id != currentId)
            {
                if (pending is not null) rows.Add(pending.Build());
                pending = new DbDataReaderRow(readTime, reader);
                currentId = id;
            }
            if (!reader.IsDBNull(32)) pending!.AddParameter(reader);
        }
        if (pending is not null) rows.Add(pending.Build());
        return rows;
    }

    /// <summary>One result being read: its own columns, then its parameter rows.</summary>
    private sealed class DbDataReaderRow
    {
        private readonly ResultKey _key;
        private readonly string _optionsText;
        private readonly RunInfo _run;
        private readonly DateTimeOffset _storedUtc;
        private readonly string? _fittedBy;
        private readonly DateTimeOffset? _fittedAt;
        private readonly FitResult _result;
        private readonly ImmutableArray<ParameterEstimate>.Builder _parameters;

        public DbDataReaderRow(Func<DbDataReader, int, DateTimeOffset> readTime, DbDataReader r)
        {
            _key = new ResultKey(r.GetString(1), r.GetString(2), r.GetString(3));
            _optionsText = r.GetString(4);
            FitQuality? quality = r.IsDBNull(12) ? null : new FitQuality(
                r.GetInt32(12), IntOr(r, 13) ?? 0, IntOr(r, 14) ?? 0, DoubleOr(r, 15) ?? double.NaN, DoubleOr(r, 16),
                !r.IsDBNull(17) && r.GetBoolean(17), TextOr(r, 18) ?? "", TextOr(r, 19) ?? "", TextOr(r, 20) ?? "");
            var (corrKeys, corr) = StoredColumnCodecs.ParseCorrelation(r.GetString(23));
            _result = new FitResult
            {
                SourcePath = r.GetString(5),
                Lot = TextOr(r, 6),
                Wafer = TextOr(r, 7),
                DieX = IntOr(r, 8),
                DieY = IntOr(r, 9),
                Model = _key.Model,
                Status = StoredColumnCodecs.ParseStatus(r.GetString(10)),
                Error = TextOr(r, 11),
                Quality = quality,
                TransitionVoltageV = DoubleOr(r, 21),
                Warnings = StoredColumnCodecs.ParseWarnings(r.GetString(22)),
                CorrelationKeys = corrKeys,
                CorrelationRowMajor = corr,
            };
            _parameters = ImmutableArray.CreateBuilder<ParameterEstimate>(r.GetInt32(24));
            _run = new RunInfo(r.GetString(25), readTime(r, 26), r.GetString(27), TextOr(r, 28));
            _storedUtc = readTime(r, 29);
            _fittedBy = TextOr(r, 30) is { Length: > 0 } by ? by : null;
            _fittedAt = r.IsDBNull(31) ? null : readTime(r, 31);
        }

        public void AddParameter(DbDataReader r) => _parameters.Add(new ParameterEstimate(
            r.GetString(33), r.GetString(34), r.GetString(35), DoubleOr(r, 36) ?? double.NaN,
            DoubleOr(r, 37), DoubleOr(r, 38), DoubleOr(r, 39), r.GetBoolean(40)));

        public StoredResult Build()
            => new(_key, _optionsText, _run, _result with { Parameters = _parameters.ToImmutable() }, _storedUtc)
            {
                FittedBy = _fittedBy,
                FittedAt = _fittedAt,
            };
    }

    private static string? TextOr(DbDataReader r, int i) => r.IsDBNull(i) ? null : r.GetString(i);

    private static int? IntOr(DbDataReader r, int i) => r.IsDBNull(i) ? null : r.GetInt32(i);

    private static double? DoubleOr(DbDataReader r, int i) => r.IsDBNull(i) ? null : r.GetDouble(i);
}
