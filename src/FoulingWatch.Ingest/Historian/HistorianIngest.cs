using System.Globalization;
using System.Text;
using CsvHelper;
using FoulingWatch.Ingest.Alignment;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Ingest.Historian;

/// <summary>The historian data aligned onto the analysis grid, with what was used and rejected.</summary>
/// <param name="GridStart">UTC start of interval 0; interval k covers [GridStart + k·Interval, GridStart + (k+1)·Interval).</param>
/// <param name="Series">SI values per tag name, one per interval; NaN marks a missing interval (never written out).</param>
public sealed record IngestResult(
    DateTimeOffset GridStart,
    TimeSpan Interval,
    int IntervalCount,
    IReadOnlyDictionary<string, double[]> Series,
    IReadOnlyDictionary<string, TagLedger> TagLedgers,
    IReadOnlyList<FileReport> Files,
    long RowsOfOtherTags)
{
    public DateTimeOffset IntervalStart(int k) => GridStart + Interval * k;

    /// <summary>Ledger of an exchanger: the sum of its tags' ledgers (a tag shared by two exchangers counts for both).</summary>
    public TagLedger ExchangerLedger(ExchangerConfiguration exchanger)
    {
        var total = new TagLedger(exchanger.Id);
        foreach (var t in exchanger.Tags().Select(t => t.Tag).Distinct(StringComparer.Ordinal))
            if (TagLedgers.TryGetValue(t, out var l))
            {
                total.Merge(l);
                total.IntervalsWithData += l.IntervalsWithData;
                total.IntervalsBridged += l.IntervalsBridged;
                total.IntervalsMissing += l.IntervalsMissing;
            }
        return total;
    }
}

/// <summary>Reads every historian export of a plant in one streaming pass per file and aligns the configured tags onto the grid.</summary>
/// <remarks>
/// Rules: values are binned by timestamp, so row order does not matter (out-of-order rows are in effect sorted);
/// the mean of the values inside an interval is its value; an empty interval is bridged linearly when the
/// intervals with data around it are at most <see cref="DataSettings.MaxGap"/> apart, else it is missing.
/// Duplicates: a second row with a timestamp already read from a file with the same columns (the same file or
/// an overlapping export) is rejected as a duplicate; the first one read is kept (files in name order).
/// </remarks>
public static partial class HistorianIngest
{
    private sealed class Channel
    {
        public required TagReference Reference;
        public readonly BinAccumulator Bins = new();
        public TagLedger Ledger = null!;
        public TimestampSet? SeenTimestamps;
    }

    /// <param name="requireAllTags">False when one file of many is read (the watch service): tags absent from it are not an error.</param>
    public static IngestResult Run(PlantConfiguration config, IProgress<(string File, double Fraction)>? progress = null, RawValueSink? sink = null, bool requireAllTags = true)
    {
        var channels = new Dictionary<string, Channel>(StringComparer.Ordinal);
        var conflicts = new List<ConfigurationError>();
        foreach (var x in config.Exchangers)
        foreach (var t in x.Tags())
        {
            if (channels.TryGetValue(t.Tag, out var existing))
            {
                if (existing.Reference.Unit.Scale != t.Unit.Scale || existing.Reference.Unit.Offset != t.Unit.Offset || existing.Reference.Density != t.Density)
                    conflicts.Add(new ConfigurationError($"{t.Path}.unit", $"tag '{t.Tag}' is also used at {existing.Reference.Path} with another unit; one tag has one unit."));
                continue;
            }
            channels[t.Tag] = new Channel { Reference = t, Ledger = new TagLedger(t.Tag) };
        }
        if (conflicts.Count > 0) throw new ConfigurationException(config.File, conflicts);

        var interval = config.Data.Interval.Ticks;
        long? windowStart = config.Data.WindowStart?.UtcTicks;
        long? windowEnd = config.Data.WindowEnd?.UtcTicks;
        var files = new List<FileReport>();
        var foundIn = new Dictionary<string, List<string>>(StringComparer.Ordinal);
        long otherRows = 0;
        var allFiles = config.Data.Sources.SelectMany(s => s.Files.Select(f => (Source: s, File: f))).ToList();
        var done = 0;
        foreach (var source in config.Data.Sources)
        {
            var signatures = new Dictionary<string, TimestampSet>(StringComparer.Ordinal);
            foreach (var file in source.Files)
            {
                FileReport report;
                try
                {
                    var dialect = FileDialectDetector.Detect(file, source);
                    report = source.Layout == HistorianLayout.Wide
                        ? ReadWide(file, source, dialect, config, channels, signatures, foundIn, interval, windowStart, windowEnd, sink)
                        : ReadLong(file, source, dialect, config, channels, foundIn, interval, windowStart, windowEnd, ref otherRows, sink);
                }
                catch (Exception ex) when (ex is InvalidDataException or EndOfStreamException)
                {
                    // (the runtime words a failed CRC-32 as "an unsupported compression method": not shown)
                    var detail = ex.Data.Contains(CompleteGzipStream.SizeCheck) ? ex.Message : "its data or CRC-32 do not check";
                    throw new IngestException(file, null, null,
                        $"the compressed stream is damaged or incomplete ({detail}); copy or export the file again, or unpack it and point the source at the CSV.");
                }
                files.Add(report);
                progress?.Report((file, ++done / (double)allFiles.Count));
            }
        }

        var missingTags = channels.Values.Where(c => !foundIn.ContainsKey(c.Reference.Tag)).ToList();
        if (missingTags.Count > 0 && requireAllTags)
            throw new ConfigurationException(config.File, missingTags.Select(c => new ConfigurationError($"{c.Reference.Path}.tag",
                $"'{c.Reference.Tag}' is not in the data: no column or row of that tag in {string.Join(", ", allFiles.Select(f => Path.GetFileName(f.File)))}. Check the tag name against the export header.")).ToList());

        long first, last;
        if (windowStart is not null && windowEnd is not null)
        {
            first = windowStart.Value / interval;
            last = (windowEnd.Value - 1) / interval;
        }
        else
        {
            var (bulkFirst, bulkLast) = PlausibleSpan.Of(channels.Values.Select(c => c.Bins).ToList(), interval);
            first = windowStart is not null ? windowStart.Value / interval : bulkFirst;
            last = windowEnd is not null ? (windowEnd.Value - 1) / interval : bulkLast;
            foreach (var c in channels.Values)
                if (c.Bins.ValuesOutside(first, last) is var stray and > 0) c.Ledger.Reclassify(stray, RejectReason.OutsidePlausibleSpan);
        }
        var budget = PlausibleSpan.MaximumValues / Math.Max(1, channels.Count);
        if (last - first + 1 > budget)
            throw new IngestException(allFiles.Count > 0 ? allFiles[0].File : config.File, null, null, FormattableString.Invariant(
                $"the data span {(last - first + 1) * (double)interval / TimeSpan.TicksPerDay / 365.25:0.#} years at {config.Data.Interval.TotalMinutes:0.##}-minute intervals for {channels.Count} tags, more than this run holds ({budget:N0} intervals per tag); set data.window to the period to analyse, or a longer data.interval."));
        var count = (int)Math.Max(0, last - first + 1);
        var maxGapIntervals = (int)Math.Max(1, config.Data.MaxGap.Ticks / interval);
        // Each tag's means and gaps are its own: the tags are finished on all cores at once.
        var finished = channels.Values.AsParallel().AsOrdered().Select(c =>
        {
            var means = c.Bins.Means(first, count);
            c.Bins.Release();
            var (withData, bridged, missing) = GapBridge.Bridge(means, maxGapIntervals);
            c.Ledger.IntervalsWithData = withData;
            c.Ledger.IntervalsBridged = bridged;
            c.Ledger.IntervalsMissing = missing;
            return (c.Reference.Tag, Means: means);
        }).ToList();
        var series = new Dictionary<string, double[]>(StringComparer.Ordinal);
        foreach (var (tag, means) in finished) series[tag] = means;
        return new IngestResult(new DateTimeOffset(first * interval, TimeSpan.Zero), config.Data.Interval, count, series,
            channels.ToDictionary(kv => kv.Key, kv => kv.Value.Ledger, StringComparer.Ordinal), files, otherRows);
    }

    /// <summary>Aligns values already ingested (e.g. from the watch service's store) onto the grid, with the given ledgers.</summary>
    public static IngestResult Align(PlantConfiguration config, IEnumerable<(string Tag, long UtcTicks, double Value)> values,
        IReadOnlyDictionary<string, TagLedger> ledgers, IReadOnlyList<FileReport> files)
    {
        var interval = config.Data.Interval.Ticks;
        var bins = new Dictionary<string, BinAccumulator>(StringComparer.Ordinal);
        foreach (var t in config.Exchangers.SelectMany(x => x.Tags()).Select(t => t.Tag).Distinct()) bins[t] = new BinAccumulator();
        foreach (var (tag, ticks, value) in values)
            if (bins.TryGetValue(tag, out var b)) b.Add(ticks / interval, value);
        var (bulkFirst, bulkLast) = PlausibleSpan.Of(bins.Values.ToList(), interval);
        var first = config.Data.WindowStart is { } ws ? ws.UtcTicks / interval : bulkFirst;
        var last = config.Data.WindowEnd is { } we ? (we.UtcTicks - 1) / interval : bulkLast;
        var count = (int)Math.Max(0, last - first + 1);
        var maxGap = (int)Math.Max(1, config.Data.MaxGap.Ticks / interval);
        var series = new Dictionary<string, double[]>(StringComparer.Ordinal);
        var outLedgers = new Dictionary<string, TagLedger>(StringComparer.Ordinal);
        foreach (var (tag, b) in bins)
        {
            var means = b.Means(first, count);
            var ledger = new TagLedger(tag);
            if (ledgers.TryGetValue(tag, out var l)) ledger.Merge(l);
            if (config.Data.WindowStart is null || config.Data.WindowEnd is null)
                if (b.ValuesOutside(first, last) is var stray and > 0) ledger.Reclassify(stray, RejectReason.OutsidePlausibleSpan);
            (ledger.IntervalsWithData, ledger.IntervalsBridged, ledger.IntervalsMissing) = GapBridge.Bridge(means, maxGap);
            series[tag] = means;
            outLedgers[tag] = ledger;
        }
        return new IngestResult(new DateTimeOffset(first * interval, TimeSpan.Zero), config.Data.Interval, count, series, outLedgers, files, 0);
    }

    /// <summary>The reader positioned on each data row in turn: after the header and the unit/description rows.</summary>
    private static IEnumerable<CsvReader> DataRows(string file, FileDialect dialect)
    {
        using var reader = OpenReader(file, dialect);
        reader.ReadHeader();
        var skip = dialect.MetadataRows;
        while (reader.Read())
        {
            if (skip > 0) { skip--; continue; }
            yield return reader;
        }
    }

    private static CsvReader OpenReader(string file, FileDialect dialect) =>
        CsvReader.Create(new QuoteBalancingStream(ExportStream.OpenAt(file, dialect.HeaderByteOffset), dialect.Delimiter), ReaderOptions(dialect, hasHeader: true), leaveOpen: false);

    /// <summary>How every export is read: the dialect's separator and encoding, line numbers kept for the messages.</summary>
    private static CsvReaderOptions ReaderOptions(FileDialect dialect, bool hasHeader) => new()
    {
        Separator = dialect.Delimiter,
        HasHeader = hasHeader,
        // UTF-8 is the reader's native input; naming it would make the reader transcode.
        Encoding = dialect.Encoding is UTF8Encoding ? null : dialect.Encoding,
        // Trimming in the reader costs more than all the number parsing; fields are trimmed where they are used.
        TrimWhitespace = false,
        TrackLineNumbers = true,
        FieldCountMismatch = CsvFieldCountHandling.Allow,
        SkipEmptyLines = true,
    };

    private static FileReport ReadLong(string file, HistorianSource source, FileDialect dialect, PlantConfiguration config,
        Dictionary<string, Channel> channels, Dictionary<string, List<string>> foundIn, long interval, long? windowStart, long? windowEnd, ref long otherRows,
        RawValueSink? sink)
    {
        var header = dialect.Header;
        int Find(string name) => header.ToList().FindIndex(h => h.Equals(name, StringComparison.OrdinalIgnoreCase));
        var tagColumn = Find(source.TagColumn);
        var valueColumn = Find(source.ValueColumn);
        var tsColumn = FileDialectDetector.TimestampColumnIndex(header, source);
        var qualityColumn = source.QualityColumn is null ? -1 : Find(source.QualityColumn);
        foreach (var (col, what, key) in new[] { (tagColumn, source.TagColumn, "tagColumn"), (valueColumn, source.ValueColumn, "valueColumn"), (tsColumn, source.Timestamp.Column ?? "Timestamp", "timestamp.column") })
            if (col < 0)
                throw new IngestException(file, dialect.HeaderLine, null, $"no column '{what}' in the header ({string.Join(", ", header)}); set {source.Path}.{key}.");
        if (source.QualityColumn is not null && qualityColumn < 0)
            throw new IngestException(file, dialect.HeaderLine, null, $"no quality column '{source.QualityColumn}' in the header ({string.Join(", ", header)}); set {source.Path}.qualityColumn or remove it.");

        var good = new HashSet<string>(source.GoodQuality, StringComparer.OrdinalIgnoreCase);
        // One parser per tag: the repeated autumn hour is resolved by each tag's own time order, so an export sorted by tag
        // (every tag running through the hour in turn) gets both passes right for every tag, not only the first.
        var parsers = new Dictionary<string, TimestampParser>(StringComparer.Ordinal);
        var decimalByte = (byte)dialect.DecimalSeparator;
        var markers = MarkerSet(source);
        var byName = channels.Values.Where(c => c.Reference.Source is null || c.Reference.Source == source.Id)
            .ToDictionary(c => c.Reference.Tag, StringComparer.OrdinalIgnoreCase);
        var plans = byName.Values.ToDictionary(c => c.Reference.Tag, c => new ColumnPlan(valueColumn, c), StringComparer.Ordinal);
        long rows = 0;
        var name = Path.GetFileName(file);
        foreach (var reader in DataRows(file, dialect))
        {
            rows++;
            var tag = Encoding.UTF8.GetString(reader.GetSpan(tagColumn).TrimBlanks());
            if (!byName.TryGetValue(tag, out var c)) { otherRows++; continue; }
            if (!foundIn.ContainsKey(c.Reference.Tag)) foundIn[c.Reference.Tag] = [];
            if (foundIn[c.Reference.Tag].Count == 0 || foundIn[c.Reference.Tag][^1] != file) foundIn[c.Reference.Tag].Add(file);
            var line = dialect.HeaderLine - 1 + reader.LineNumber;
            if (!parsers.TryGetValue(c.Reference.Tag, out var parser))
                parsers[c.Reference.Tag] = parser = new TimestampParser(source.Timestamp, config.Site.TimeZone);
            var reason = TimeReason(parser, reader.GetSpan(tsColumn), windowStart, windowEnd, out var utc);
            if (reason is null && qualityColumn >= 0 && !good.Contains(Encoding.UTF8.GetString(reader.GetSpan(qualityColumn).TrimBlanks()))) reason = RejectReason.BadQuality;
            c.SeenTimestamps ??= new TimestampSet();
            if (reason is null && !c.SeenTimestamps.Add(utc)) reason = RejectReason.Duplicate;
            if (reason is { } r)
            {
                var detail = r switch
                {
                    RejectReason.BadTimestamp or RejectReason.NonexistentLocalTime => Encoding.UTF8.GetString(reader.GetSpan(tsColumn)),
                    RejectReason.BadQuality => Encoding.UTF8.GetString(reader.GetSpan(qualityColumn)),
                    _ => null,
                };
                var col = r == RejectReason.BadQuality ? qualityColumn + 1 : tsColumn + 1;
                c.Ledger.CountRejected(r, () => Example(name, line, col, c.Reference.Tag, r, detail));
                continue;
            }
            if (SlowValue(plans[c.Reference.Tag], c.Ledger, reader.GetSpan(valueColumn), valueColumn, decimalByte, markers, name, line, out var si))
            {
                c.Ledger.CountUsed();
                c.Bins.Add(utc / interval, si);
                sink?.Add(c.Reference.Tag, utc, si);
            }
        }
        return new FileReport(file, dialect.EncodingName, dialect.Delimiter, dialect.DecimalSeparator, dialect.HeaderLine, dialect.MetadataRows,
            rows, parsers.Values.Sum(p => p.AmbiguousAsDaylight), parsers.Values.Sum(p => p.AmbiguousAsStandard), header.ToList());
    }

    /// <summary>Why a row's timestamp makes it unusable (unreadable, in the skipped hour, outside the window), or null with its UTC ticks.</summary>
    private static RejectReason? TimeReason(TimestampParser parser, ReadOnlySpan<byte> field, long? windowStart, long? windowEnd, out long utc) =>
        parser.Parse(field, out utc) switch
        {
            TimestampOutcome.Bad => RejectReason.BadTimestamp,
            TimestampOutcome.NonexistentLocalTime => RejectReason.NonexistentLocalTime,
            _ when (windowStart is not null && utc < windowStart) || (windowEnd is not null && utc >= windowEnd) => RejectReason.OutsideWindow,
            _ => null,
        };

    private static Dictionary<string, string> MarkerSet(HistorianSource source) =>
        source.Markers.Distinct(StringComparer.OrdinalIgnoreCase).ToDictionary(m => m, m => m, StringComparer.OrdinalIgnoreCase);

    /// <summary>
    /// A value the quick route did not take (blanks, exponent, long digit strings, empty, marker, text, out of range):
    /// its SI value when it is usable, else false with the reason counted in the ledger. The caller counts a usable one.
    /// </summary>
    private static bool SlowValue(ColumnPlan plan, TagLedger ledger, ReadOnlySpan<byte> field, int column, byte decimalByte,
        Dictionary<string, string> markers, string file, long line, out double si)
    {
        var span = field.TrimBlanks();
        if (TryReadNumber(span, decimalByte, out var reading))
        {
            si = plan.ToSi(reading);
            if (si >= plan.Minimum && si <= plan.Maximum) return true;
            RejectValue(ledger, plan.Tag, RejectReason.OutOfRange, reading.ToString(CultureInfo.InvariantCulture), file, line, column);
            return false;
        }
        si = double.NaN;
        if (span.IsEmpty) { RejectValue(ledger, plan.Tag, RejectReason.Empty, null, file, line, column); return false; }
        var text = Encoding.UTF8.GetString(span).Trim();
        if (markers.TryGetValue(text, out var marker) || !StartsLikeNumber(span, decimalByte))
        {
            ledger.CountMarker(marker ?? text);
            RejectValue(ledger, plan.Tag, RejectReason.TextMarker, text, file, line, column);
        }
        else RejectValue(ledger, plan.Tag, RejectReason.NotANumber, text, file, line, column);
        return false;
    }

    /// <summary>Whether a field opens like a number (a digit, or a sign or decimal separator followed by a digit): such text
    /// that fails to parse is a malformed number; any other text is a marker, whatever its words.</summary>
    private static bool StartsLikeNumber(ReadOnlySpan<byte> span, byte decimalByte)
    {
        var i = span.Length > 0 && span[0] is (byte)'+' or (byte)'-' ? 1 : 0;
        if (i < span.Length && span[i] == decimalByte) i++;
        return i < span.Length && span[i] is >= (byte)'0' and <= (byte)'9';
    }

    /// <summary>A finite number filling the whole field: the plain-decimal route first, then the general parser (exponents, long digit strings).</summary>
    private static bool TryReadNumber(ReadOnlySpan<byte> span, byte decimalByte, out double reading)
    {
        if (PlainDecimal.TryParse(span, decimalByte, out reading)) return true;
        return !span.IsEmpty && csFastFloat.FastDoubleParser.TryParseDouble(span, out int consumed, out reading, NumberStyles.Float, decimalByte)
            && consumed == span.Length && double.IsFinite(reading);
    }

    private static void RejectValue(TagLedger ledger, string tag, RejectReason reason, string? text, string file, long line, int column) =>
        ledger.CountRejected(reason, () => Example(file, line, column + 1, tag, reason, text));

    /// <summary>One rejection described for a person: where, what, and what to do.</summary>
    public static string Example(string file, long line, int column, string tag, RejectReason reason, string? text) => reason switch
    {
        RejectReason.Empty => $"{file}: line {line}, column {column} ({tag}): the field is empty; the value is counted as rejected.",
        RejectReason.TextMarker => $"{file}: line {line}, column {column} ({tag}): '{text}' is text where a value belongs; the value is counted as rejected and the text tallied.",
        RejectReason.NotANumber => $"{file}: line {line}, column {column} ({tag}): '{text}' is not a number; the value is counted as rejected. Check the source's decimal and delimiter settings, or how the historian exports this tag.",
        RejectReason.OutOfRange => $"{file}: line {line}, column {column} ({tag}): {text} is outside the tag's physical range; the value is counted as rejected. Widen the tag's range if the reading is real.",
        RejectReason.BadTimestamp => $"{file}: line {line}, column {column} ({tag}): '{text}' is not a timestamp; the row is counted as rejected. Set the source's timestamp.format if the export uses another format.",
        RejectReason.NonexistentLocalTime => $"{file}: line {line}, column {column} ({tag}): '{text}' falls in the skipped daylight-saving hour; the row is counted as rejected.",
        RejectReason.BadQuality => $"{file}: line {line}, column {column} ({tag}): quality '{text}' is not good; the value is counted as rejected.",
        RejectReason.Duplicate => $"{file}: line {line} ({tag}): this timestamp was already read; the first value is kept and this one counted as a duplicate.",
        RejectReason.OutsideWindow => $"{file}: line {line} ({tag}): the timestamp is outside the analysis window; counted as outside-window.",
        _ => $"{file}: line {line}, column {column} ({tag}): {reason.Key()}",
    };
}
