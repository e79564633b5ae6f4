using System.Collections.Immutable;
using System.Runtime.InteropServices;

namespace JunctionFit.Import;

/// <summary>The importer's pipeline, part: segments, compliance, area and the curve.</summary>
internal static partial class IvTableParser
{
    private sealed partial class Context
    {
        // ---------------------------------------------------------------- rows

        // ---------------------------------------------------------------- path, finish

        private ParseOutcome Finish(TableRows data, ColumnPlan plan, MetadataSet meta, string encodingName, int dataStart,
            int? headerLine, bool headerInComment, int? unitsLine)
        {
            int n = data.Count;
            ReadOnlySpan<double> v = data.V.AsSpan(0, n);
            ReadOnlySpan<double> c = data.I.AsSpan(0, n);
            int[] segments = SweepAnalysis.Segments(v);
            int totalSegments = n == 0 ? 0 : segments[n - 1] + 1;
            _ = SweepAnalysis.Traces(v, out int traceCount);
            double startV = data.V[0]; // before a segment selection compacts the arrays
            (double? areaM2, string? areaSource) = TableArea.Resolve(data, plan, meta, options.AreaM2, _warnings);
            bool[] mask;
            int masked = 0;
            if (options.MaskCompliance)
            {
                mask = SweepAnalysis.ComplianceMask(c, meta.ComplianceA, out masked);
            }
            else
            {
                mask = new bool[n];
            }

            double[] vOut = data.V, cOut = data.I;
            int[] lOut = data.Lines;
            int kept = n;
            if (options.Segments is ImmutableArray<int> wanted)
            {
                foreach (int s in wanted)
                {
                    if (s >= totalSegments)
                    {
                        throw new IvFormatException(path, 0,
                            $"segment {s} was selected but the sweep has {totalSegments} segment{(totalSegments == 1 ? string.Empty : "s")} (numbered from 0)");
                    }
                }
                var keep = new bool[totalSegments];
                foreach (int s in wanted)
                {
                    keep[s] = true;
                }
                kept = 0;
                for (int k = 0; k < n; k++)
                {
                    if (keep[segments[k]])
                    {
                        vOut[kept] = vOut[k];
                        cOut[kept] = cOut[k];
                        lOut[kept] = lOut[k];
                        segments[kept] = segments[k];
                        mask[kept] = mask[k];
                        kept++;
                    }
                }
                if (kept < 2)
                {
                    throw new IvFormatException(path, 0, $"the selected segments hold {kept} point{(kept == 1 ? string.Empty : "s")}; at least two are needed");
                }
                masked = 0;
                for (int k = 0; k < kept; k++)
                {
                    masked += mask[k] ? 1 : 0;
                }
            }

            if (masked > 0)
            {
                _warnings.Add(meta.ComplianceA is double ca
                    ? $"{masked} point{(masked == 1 ? string.Empty : "s")} at the stated compliance of {ca:G4} A masked"
                    : $"{masked} point{(masked == 1 ? string.Empty : "s")} in flat runs at the largest current (compliance) masked");
            }

            ImmutableArray<double> vArr = Exact(vOut, kept);
            ImmutableArray<double> cArr = Exact(cOut, kept);
            var curve = new IvCurve(path, vArr, cArr)
            {
                SourceLines = Exact(lOut, kept),
                Segments = Exact(segments, kept),
                ImportMask = Exact(mask, kept),
                AreaM2 = areaM2,
                TemperatureK = meta.TemperatureK,
                ComplianceA = meta.ComplianceA,
                Lot = meta.Lot,
                Wafer = meta.Wafer,
                DieX = meta.DieX,
                DieY = meta.DieY,
                Metadata = meta.Raw.ToImmutableDictionary(StringComparer.Ordinal),
                Warnings = [.. _warnings],
            };

            int preamble = 0;
            int end = headerLine ?? dataStart;
            for (int i = 0; i < end; i++)
            {
                preamble += _table.IsBlank(i) ? 0 : 1;
            }

            return new ParseOutcome(
                curve,
                encodingName,
                lines.LineEndName(),
                _delimiter,
                _usedComma,
                preamble,
                meta.FreeTextLines,
                headerLine + 1,
                headerInComment,
                unitsLine + 1,
                dataStart + 1,
                data.LastDataLine,
                plan.Columns,
                plan.VoltageIndex + 1,
                plan.CurrentIndex + 1,
                plan.VoltageUnit.Symbol,
                plan.CurrentUnit.Symbol,
                data.Skipped,
                masked,
                totalSegments,
                traceCount,
                areaSource,
                startV);
        }

        private static ImmutableArray<T> Exact<T>(T[] array, int count)
        {
            if (array.Length != count)
            {
                Array.Resize(ref array, count);
            }
            return ImmutableCollectionsMarshal.AsImmutableArray(array);
        }
    }
}
