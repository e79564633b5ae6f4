using System.Collections.Immutable;
using System.Data.Common;
using JunctionFit.Results;

namespace JunctionFit.Storage;

/// <summary>
/// Reads results back from the select list of <see cref="StoredColumns.SelectList"/>, every column by its name (the
/// ordinals are looked up once per query): the result's own columns, then its parameter rows. A column added by a later
/// migration is NULL in rows stored before it.
/// </summary>
internal sealed class StoredRowReader(Func<DbDataReader, int, DateTimeOffset> readTime)
{
    /// <summary>
    /// Every result in <paramref name="reader"/>: the query joins each result's row with its parameter rows, ordered by
    /// result id, so one result's rows arrive together (a result without parameters has NULLs in the parameter columns).
    /// </summary>
    public List<StoredResult> ReadAll(DbDataReader reader)
    {
        var rows = new List<StoredResult>();
        var at = new ColumnOrdinals(reader);
        int id0 = at["id"], ordinal = at["ordinal"];
        long currentId = long.MinValue;
        DbDataReaderRow? pending = null;
        while (reader.Read())
        {
            long id = reader.GetInt64(id0);
            if (id != currentId)
            {
                if (pending is not null) rows.Add(pending.Build());
                pending = new DbDataReaderRow(readTime, reader, at);
                currentId = id;
            }
            if (!reader.IsDBNull(ordinal)) pending!.AddParameter(reader, at);
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

        public DbDataReaderRow(Func<DbDataReader, int, DateTimeOffset> readTime, DbDataReader r, ColumnOrdinals at)
        {
            _key = new ResultKey(r.GetString(at["file_sha256"]), r.GetString(at["model"]), r.GetString(at["options_hash"]));
            _optionsText = r.GetString(at["options_text"]);
            FitQuality? quality = r.IsDBNull(at["points_used"]) ? null : new FitQuality(
                r.GetInt32(at["points_used"]), IntOr(r, at["points_masked"]) ?? 0, IntOr(r, at["iterations"]) ?? 0, DoubleOr(r, at["rss"]) ?? double.NaN,
                DoubleOr(r, at["reduced_chi2"]), !r.IsDBNull(at["converged"]) && r.GetBoolean(at["converged"]), TextOr(r, at["stop_reason"]) ?? "",
                TextOr(r, at["covariance_scaling"]) ?? "", TextOr(r, at["interval_method"]) ?? "");
            var (corrKeys, corr) = StoredColumnCodecs.ParseCorrelation(r.GetString(at["correlation_json"]));
            _result = new FitResult
            {
                SourcePath = r.GetString(at["file_path"]),
                Lot = TextOr(r, at["lot"]),
                Wafer = TextOr(r, at["wafer"]),
                DieX = IntOr(r, at["die_x"]),
                DieY = IntOr(r, at["die_y"]),
                Model = _key.Model,
                Status = StoredColumnCodecs.ParseStatus(r.GetString(at["status"])),
                Error = TextOr(r, at["error"]),
                StatusReason = TextOr(r, at["status_reason"]),
                ModelValidity = TextOr(r, at["model_validity"]),
                Diagnoses = TextOr(r, at["diagnoses_json"]) is string diagnoses ? StoredColumnCodecs.ParseWarnings(diagnoses) : [],
                Quality = quality,
                TransitionVoltageV = DoubleOr(r, at["transition_voltage_v"]),
                Warnings = StoredColumnCodecs.ParseWarnings(r.GetString(at["warnings_json"])),
                CorrelationKeys = corrKeys,
                CorrelationRowMajor = corr,
            };
            _parameters = ImmutableArray.CreateBuilder<ParameterEstimate>(r.GetInt32(at["parameter_count"]));
            _run = new RunInfo(r.GetString(at["run_id"]), readTime(r, at["run_started_utc"]), r.GetString(at["tool_version"]), TextOr(r, at["host"]));
            _storedUtc = readTime(r, at["stored_utc"]);
            _fittedBy = TextOr(r, at["fitted_by"]) is { Length: > 0 } by ? by : null;
            _fittedAt = r.IsDBNull(at["fitted_at"]) ? null : readTime(r, at["fitted_at"]);
        }

        public void AddParameter(DbDataReader r, ColumnOrdinals at) => _parameters.Add(new ParameterEstimate(
            r.GetString(at["param_key"]), r.GetString(at["symbol"]), r.GetString(at["unit"]), DoubleOr(r, at["value"]) ?? double.NaN,
            DoubleOr(r, at["stderr"]), DoubleOr(r, at["lower95"]), DoubleOr(r, at["upper95"]), r.GetBoolean(at["is_fixed"])));

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
