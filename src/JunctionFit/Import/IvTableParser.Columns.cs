using System.Collections.Immutable;
using JunctionFit.Common;

namespace JunctionFit.Import;

/// <summary>The importer's pipeline, part: which column is the voltage, the current and the rest, in which unit.</summary>
internal static partial class IvTableParser
{
    private sealed partial class Context
    {
        // ---------------------------------------------------------------- columns

        private static bool IsCurrentLike(IvColumnKind k)
            => k is IvColumnKind.Current or IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrent or IvColumnKind.AbsoluteCurrentDensity;

        private static bool IsDensityLike(IvColumnKind k) => k is IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrentDensity;

        private ColumnPlan PlanColumns(List<HeaderField>? header, int? headerLine, int dataCount, MetadataSet meta)
        {
            int line = headerLine is int hl ? hl + 1 : 0;
            int columnCount = Math.Max(dataCount, header?.Count ?? 0);
            int v = options.VoltageColumn is string vc ? Resolve(vc, header, line, columnCount, "voltage") : -1;
            int c = options.CurrentColumn is string cc ? Resolve(cc, header, line, columnCount, "current") : -1;
            bool vForced = v >= 0, cForced = c >= 0;
            double? knownArea = options.AreaM2 ?? meta.AreaM2;
            string currentNote = string.Empty;
            var notes = new List<string>();

            if (header is null)
            {
                if (v < 0)
                {
                    v = c == 0 ? 1 : 0;
                }
                if (c < 0)
                {
                    c = v == 1 ? 0 : 1;
                }
                if (options.VoltageColumn is null || options.CurrentColumn is null)
                {
                    _warnings.Add($"no header row: column {v + 1} read as voltage and column {c + 1} as current (choose others with {Remedy.VoltageColumn} and {Remedy.CurrentColumn})");
                }
            }
            else
            {
                if (c < 0)
                {
                    c = ChooseCurrent(header, v, line, out currentNote, notes);
                }
                if (v < 0)
                {
                    // The gate current goes with the gate voltage when there is one.
                    if (c >= 0 && c < header.Count && HeaderParser.IsGateCurrent(header[c]))
                    {
                        HeaderField? gv = header.Find(f => HeaderParser.IsGateVoltage(f) && f.Index != c);
                        v = gv?.Index ?? -1;
                    }
                    if (v < 0)
                    {
                        v = Best(header, f => f.Kind == IvColumnKind.Voltage, "voltage", except: c, line);
                    }
                }
                if ((v < 0 || c < 0) && header.Count == 2 && (v >= 0 || c >= 0))
                {
                    int other = v < 0 ? 1 - c : 1 - v;
                    if (header[other].Kind == IvColumnKind.Unknown)
                    {
                        if (v < 0)
                        {
                            v = other;
                            _warnings.Add($"column '{header[v].Text}' is not a known voltage name; read as voltage because the other column is the current");
                        }
                        else
                        {
                            c = other;
                            _warnings.Add($"column '{header[c].Text}' is not a known current name; read as current because the other column is the voltage");
                        }
                    }
                }
                if (v < 0)
                {
                    throw new IvFormatException(path, line, $"no voltage column among {ListColumns(header)}; choose it with {Remedy.VoltageColumn} (a header name or a 1-based number)");
                }
                if (c < 0)
                {
                    HeaderField? cap = header.Find(f => f.Kind == IvColumnKind.Capacitance);
                    if (cap is not null)
                    {
                        throw new IvFormatException(path, line,
                            $"no current column among {ListColumns(header)}: this looks like a capacitance–voltage file ({cap.Name} in {cap.UnitText ?? "F"}); use {Remedy.ReadAsCv} to read it as a C–V file, or choose a current column with {Remedy.CurrentColumn}",
                            cap.Index + 1, cap.Text);
                    }
                    throw new IvFormatException(path, line, $"no current column among {ListColumns(header)}; choose it with {Remedy.CurrentColumn} (a header name or a 1-based number)");
                }
            }
            if (v == c)
            {
                throw new IvFormatException(path, line, $"voltage and current would both come from column {v + 1}; choose different columns");
            }

            HeaderField? vf = header is not null && v < header.Count ? header[v] : null;
            HeaderField? cf = header is not null && c < header.Count ? header[c] : null;

            UnitScale vUnit = UnitFor(vf, options.VoltageUnit, line, "voltage", QuantityKind.Voltage, QuantityKind.Voltage, UnitScale.Volt);
            bool densityByName = cf is not null && IsDensityLike(cf.Kind) && cf.Unit is null;
            UnitScale cUnit = UnitFor(cf, options.CurrentUnit, line, "current", QuantityKind.Current, QuantityKind.CurrentDensity,
                densityByName ? UnitScale.AmperePerSquareCentimetre : UnitScale.Ampere);
            if (densityByName && options.CurrentUnit is null)
            {
                _warnings.Add($"current density column '{cf!.Text}' has no unit; read as A/cm² (set {new Remedy(RemedyKind.CurrentUnit)} otherwise)");
            }
            bool absolute = cf is not null && cf.Kind is IvColumnKind.AbsoluteCurrent or IvColumnKind.AbsoluteCurrentDensity;
            if (absolute)
            {
                _warnings.Add($"column '{cf!.Text}' holds {HeaderParser.Describe(cf.Kind)} (no signed column is given); the sign of each point is taken from its bias");
            }

            bool density = cUnit.Kind == QuantityKind.CurrentDensity;
            double area = 0;
            if (density)
            {
                if (knownArea is not double known)
                {
                    throw new IvFormatException(path, line,
                        $"column '{cf?.Text ?? (c + 1).ToString(System.Globalization.CultureInfo.InvariantCulture)}' holds current density but the file states no area; add an 'area' line to the preamble (e.g. '# area: 100 um2'), or choose a current column with {Remedy.CurrentColumn}");
                }
                area = known;
            }

            // A current column and a density column together give the area (I/J).
            int pairI = -1, pairJ = -1;
            UnitScale pairIUnit = UnitScale.Ampere, pairJUnit = UnitScale.AmperePerSquareCentimetre;
            if (header is not null)
            {
                bool IsI(HeaderField f) => f.Kind is IvColumnKind.Current or IvColumnKind.AbsoluteCurrent && f.Index != v && f.Unit?.Kind is null or QuantityKind.Current;
                bool IsJ(HeaderField f) => IsDensityLike(f.Kind) && f.Index != v && f.Unit?.Kind is null or QuantityKind.CurrentDensity;
                if (cf is not null && !density && IsI(cf))
                {
                    pairI = c;
                }
                else
                {
                    HeaderField? fi = header.Find(f => f.Kind == IvColumnKind.Current && IsI(f)) ?? header.Find(IsI);
                    pairI = fi?.Index ?? -1;
                }
                if (cf is not null && density && IsJ(cf))
                {
                    pairJ = c;
                }
                else
                {
                    HeaderField? fj = header.Find(f => f.Kind == IvColumnKind.CurrentDensity && IsJ(f)) ?? header.Find(IsJ);
                    pairJ = fj?.Index ?? -1;
                }
                if (pairI >= 0 && pairJ >= 0 && pairI != pairJ)
                {
                    pairIUnit = pairI == c ? cUnit : header[pairI].Unit ?? UnitScale.Ampere;
                    pairJUnit = pairJ == c ? cUnit : header[pairJ].Unit ?? UnitScale.AmperePerSquareCentimetre;
                }
                else
                {
                    pairI = pairJ = -1;
                }
            }

            var columns = ImmutableArray.CreateBuilder<ImportColumn>(columnCount);
            for (int k = 0; k < columnCount; k++)
            {
                HeaderField? f = header is not null && k < header.Count ? header[k] : null;
                IvColumnRole role = k == v ? IvColumnRole.Voltage
                    : k == c ? (density ? IvColumnRole.CurrentDensity : IvColumnRole.Current)
                    : IvColumnRole.Ignored;
                string? unit = k == v ? vUnit.Symbol : k == c ? cUnit.Symbol : f?.UnitText;
                IvColumnKind kind = f?.Kind ?? (k == v ? IvColumnKind.Voltage : k == c ? IvColumnKind.Current : IvColumnKind.Unknown);
                string reason;
                if (k == v)
                {
                    reason = vForced ? $"chosen with {Remedy.VoltageColumn}" : f is null ? "by position (no header)" : f.How;
                }
                else if (k == c)
                {
                    reason = (cForced ? $"chosen with {Remedy.CurrentColumn}" : f is null ? "by position (no header)" : f.How + currentNote)
                        + (absolute ? "; sign taken from the bias" : string.Empty)
                        + (density ? string.Create(System.Globalization.CultureInfo.InvariantCulture, $"; times the area {area:G5} m²") : string.Empty);
                }
                else if (f is null)
                {
                    reason = header is null ? "no header; not used" : "no header cell; not used";
                }
                else
                {
                    reason = f.Kind switch
                    {
                        IvColumnKind.Time or IvColumnKind.Index => $"{f.How}; ignored",
                        IvColumnKind.Unknown => "name not recognised; ignored",
                        _ when IsCurrentLike(f.Kind) => $"{f.How}; not used: column {c + 1} is the current" + (k == pairI || k == pairJ ? "; used with it for the area from I/J" : string.Empty),
                        IvColumnKind.Voltage => $"{f.How}; not used: column {v + 1} is the bias",
                        _ => $"{f.How}; ignored",
                    };
                }
                if (unit is null && f is not null && IsDensityLike(f.Kind) && k != c)
                {
                    unit = "A/cm²";
                    reason += "; unit not given, A/cm² assumed";
                }
                columns.Add(new ImportColumn(k + 1, f?.Text ?? string.Empty, role, unit) { Kind = kind, Reason = reason });
            }

            // Say what was chosen when the choice was not plain.
            if (header is not null && (!vForced || !cForced))
            {
                int currentLike = header.Count(f => IsCurrentLike(f.Kind));
                int voltages = header.Count(f => f.Kind == IvColumnKind.Voltage);
                bool loose = (vf?.Loose ?? false) || (cf?.Loose ?? false);
                if (loose || currentLike > 1 || voltages > 1 || absolute)
                {
                    var ignored = new List<string>();
                    foreach (HeaderField f in header)
                    {
                        if (f.Index != v && f.Index != c && f.Text.Length > 0)
                        {
                            ignored.Add($"{f.Text} ({ShortKind(f)})");
                        }
                    }
                    _warnings.Add($"columns by name: voltage '{vf?.Text}' ({v + 1}), {(density ? "current density" : "current")} '{cf?.Text}' ({c + 1})"
                        + (ignored.Count > 0 ? "; ignored: " + string.Join(", ", ignored) : string.Empty)
                        + $"; if this is wrong, choose with {Remedy.VoltageColumn} and {Remedy.CurrentColumn}");
                }
            }
            _warnings.AddRange(notes);

            return new ColumnPlan(v, c, vUnit, cUnit, density, area, columns.MoveToImmutable())
            {
                Absolute = absolute,
                PairCurrentIndex = pairI,
                PairDensityIndex = pairJ,
                PairCurrentUnit = pairIUnit,
                PairDensityUnit = pairJUnit,
                PairText = pairI >= 0 ? $"columns '{header![pairI].Text}' ({pairI + 1}) and '{header[pairJ].Text}' ({pairJ + 1})" : string.Empty,
            };
        }

        private static string ShortKind(HeaderField f)
        {
            string unit = f.UnitText ?? f.Kind switch
            {
                IvColumnKind.Current or IvColumnKind.AbsoluteCurrent => "A",
                IvColumnKind.CurrentDensity or IvColumnKind.AbsoluteCurrentDensity => "A/cm²",
                IvColumnKind.Time => "s",
                IvColumnKind.Voltage => "V",
                IvColumnKind.Capacitance => "F",
                _ => string.Empty,
            };
            string what = f.Kind switch
            {
                IvColumnKind.Current => HeaderParser.IsTerminalCurrent(f) ? "terminal current" : "I",
                IvColumnKind.CurrentDensity => "J",
                IvColumnKind.AbsoluteCurrent => "|I|",
                IvColumnKind.AbsoluteCurrentDensity => "|J|",
                IvColumnKind.Voltage => "voltage",
                _ => HeaderParser.Describe(f.Kind),
            };
            return unit.Length > 0 ? $"{what}, {unit}" : what;
        }

        /// <summary>
        /// The current column: the signed current (the gate current among transistor terminal currents),
        /// else |I|, else the signed density when the area is known, else |J| likewise, else any density.
        /// </summary>
        private int ChooseCurrent(List<HeaderField> header, int v, int line, out string note, List<string> notes)
        {
            note = string.Empty;
            var signed = header.FindAll(f => f.Kind == IvColumnKind.Current && f.Index != v);
            if (signed.Count > 0)
            {
                var terminals = signed.FindAll(HeaderParser.IsTerminalCurrent);
                var gates = signed.FindAll(HeaderParser.IsGateCurrent);
                if (gates.Count == 1 && terminals.Count >= 2)
                {
                    HeaderField g = gates[0];
                    note = "; the gate current, preferred among the terminal currents";
                    notes.Add($"several terminal currents ({string.Join(", ", terminals.ConvertAll(t => t.Text))}): the gate current '{g.Text}' (column {g.Index + 1}) is read, the tunnelling current through a gate oxide; choose another with {Remedy.CurrentColumn}");
                    return g.Index;
                }
                int best = Best(header, f => f.Kind == IvColumnKind.Current, "current", v, line);
                if (header.Exists(f => f.Index != best && f.Index != v && IsCurrentLike(f.Kind)))
                {
                    note = "; the signed current, preferred over the other current columns";
                }
                return best;
            }
            int abs = Best(header, f => f.Kind == IvColumnKind.AbsoluteCurrent, "|I|", v, line);
            if (abs >= 0)
            {
                note = "; no signed current column";
                return abs;
            }
            // A density needs the area; without one, reading it fails below with a message that says so.
            int j = Best(header, f => f.Kind == IvColumnKind.CurrentDensity, "current density", v, line);
            if (j >= 0)
            {
                note = "; no current column";
                return j;
            }
            int absJ = Best(header, f => f.Kind == IvColumnKind.AbsoluteCurrentDensity, "|J|", v, line);
            if (absJ >= 0)
            {
                note = "; no current or signed density column";
            }
            return absJ;
        }

        private UnitScale UnitFor(HeaderField? f, string? optionUnit, int line, string what, QuantityKind a, QuantityKind b, UnitScale fallback)
        {
            if (optionUnit is not null)
            {
                _ = UnitParser.TryParse(optionUnit, out UnitScale forced);
                return forced;
            }
            if (f is null || f.UnitText is null)
            {
                return fallback;
            }
            if (f.Unit is not UnitScale u)
            {
                throw new IvFormatException(path, line,
                    $"unknown unit '{MetadataParser.Short(f.UnitText)}' in {what} column '{MetadataParser.Short(f.Text)}'; units read are V with p/n/u/µ/m/k prefixes, A likewise, A/cm², mA/cm², A/m² (or set {new Remedy(a == QuantityKind.Voltage ? RemedyKind.VoltageUnit : RemedyKind.CurrentUnit)})",
                    f.Index + 1, f.Text);
            }
            if (u.Kind != a && u.Kind != b)
            {
                throw new IvFormatException(path, line,
                    $"{what} column '{MetadataParser.Short(f.Text)}' has unit '{f.UnitText}', which is not a {what} unit", f.Index + 1, f.Text);
            }
            return u;
        }

        private int Resolve(string choice, List<HeaderField>? header, int line, int columnCount, string what)
        {
            if (IvReadOptions.IsNumber(choice))
            {
                int n = int.Parse(choice, System.Globalization.CultureInfo.InvariantCulture);
                if (n > columnCount)
                {
                    throw new IvFormatException(path, line, $"{what} column {n} was chosen but the table has {columnCount} columns");
                }
                return n - 1;
            }
            if (header is null)
            {
                throw new IvFormatException(path, 0, $"{what} column '{choice}' was chosen by name but the file has no header row; choose it by number");
            }
            int found = -1;
            string norm = HeaderParser.NormalizeName(choice);
            foreach (HeaderField f in header)
            {
                bool match = f.Text.Equals(choice, StringComparison.OrdinalIgnoreCase)
                    || f.Name.Equals(choice, StringComparison.OrdinalIgnoreCase)
                    || (norm.Length > 0 && HeaderParser.NormalizeName(f.Name) == norm);
                if (match)
                {
                    if (found >= 0)
                    {
                        throw new IvFormatException(path, line, $"{what} column '{choice}' matches columns {found + 1} and {f.Index + 1}; choose it by number");
                    }
                    found = f.Index;
                }
            }
            if (found < 0)
            {
                throw new IvFormatException(path, line, $"no column named '{choice}' for the {what}; columns are {ListColumns(header)}");
            }
            return found;
        }

        private int Best(List<HeaderField> header, Predicate<HeaderField> match, string what, int except, int line)
        {
            int best = -1;
            foreach (HeaderField f in header)
            {
                if (!match(f) || f.Index == except)
                {
                    continue;
                }
                if (best < 0 || f.Rank < header[best].Rank)
                {
                    best = f.Index;
                }
                else if (f.Rank == header[best].Rank)
                {
                    throw new IvFormatException(path, line,
                        $"columns {best + 1} ('{header[best].Text}') and {f.Index + 1} ('{f.Text}') could both be the {what}; choose one with {(what == "voltage" ? Remedy.VoltageColumn : Remedy.CurrentColumn)}",
                        f.Index + 1, f.Text);
                }
            }
            return best;
        }

        private static string ListColumns(List<HeaderField> header)
        {
            var names = new List<string>();
            foreach (HeaderField f in header)
            {
                names.Add($"'{MetadataParser.Short(f.Text)}'");
                if (names.Count == 12)
                {
                    names.Add("…");
                    break;
                }
            }
            return string.Join(", ", names);
        }
    }
}
