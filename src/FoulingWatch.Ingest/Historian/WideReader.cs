using System.Buffers;
using System.Numerics;
using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;
using System.Runtime.Intrinsics;
using System.Text;
using CsvHelper;
using FoulingWatch.Ingest.Alignment;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Ingest.Historian;

public static partial class HistorianIngest
{
    /// <summary>Bytes of an export read as one part; a part is cut at the end of a record.</summary>
    private const int DefaultPartBytes = 4 << 20;

    /// <summary>Tests set a small part size on their own thread, to cut small fixtures into many parts.</summary>
    [ThreadStatic] internal static int? PartBytesForTests;

    private static int PartBytes => PartBytesForTests ?? DefaultPartBytes;

    /// <summary>Tests turn the plain-part route off on their own thread, to compare it with the CSV reader.</summary>
    [ThreadStatic] internal static bool PlainRouteOffForTests;

    /// <summary>Parts merged on this thread that were read by the plain-part route (tests and the benchmark check it is taken).</summary>
    [ThreadStatic] internal static int PlainPartsRead;

    /// <summary>Parts read (for tests: an export is cut into parts whatever its line ends).</summary>
    [ThreadStatic] internal static int PartsRead;

    /// <summary>A column's conversion resolved once: SI = reading·Scale + Offset (density folded in), and its physical range.</summary>
    private sealed class ColumnPlan(int index, Channel channel)
    {
        public readonly int Index = index;
        public readonly Channel Channel = channel;
        public readonly string Tag = channel.Reference.Tag;
        public readonly double Scale = channel.Reference.Unit.Scale * (channel.Reference.Density ?? 1.0);
        public readonly double Offset = channel.Reference.Unit.Offset * (channel.Reference.Density ?? 1.0);
        public readonly double Minimum = channel.Reference.RangeMinimum;
        public readonly double Maximum = channel.Reference.RangeMaximum;

        public double ToSi(double reading) => reading * Scale + Offset;
    }

    /// <summary>A run of whole records of one export, with the line its first record starts on.</summary>
    private sealed class FilePart(byte[] buffer, int length, long lineBefore, bool first, bool plain) : IDisposable
    {
        public readonly byte[] Buffer = buffer;
        public readonly int Length = length;
        /// <summary>Lines of the file before this part (its first record is on line LineBefore + 1).</summary>
        public readonly long LineBefore = lineBefore;
        /// <summary>The part that holds the header and the unit/description rows.</summary>
        public readonly bool First = first;
        /// <summary>
        /// Plain delimited text, where CSV's quoting rules have nothing to do: no quote anywhere, and every carriage
        /// return part of a CRLF line end (a lone CR is a line break to the CSV reader). Found while the part is cut.
        /// </summary>
        public readonly bool Plain = plain;

        public void Dispose() => ArrayPool<byte>.Shared.Return(Buffer);
    }

    /// <summary>What the rows of one part go into: ledgers and interval sums of its own, merged into the file's in file order.</summary>
    private sealed class PartTarget(ColumnPlan[] plans)
    {
        public readonly TagLedger[] Ledgers = plans.Select(p => TagLedger.Part(p.Tag)).ToArray();
        public readonly PartBins Bins = new(plans.Length);
        /// <summary>Timestamps already read: the part's own (a worker), or the file's (a part read in order).</summary>
        public TimestampSet Seen = new();
        public TimestampParser Parser = null!;
        /// <summary>For a worker's part: the timestamps it accepted, checked against the file's set when the part is merged.</summary>
        public readonly List<long> Accepted = [];
        /// <summary>The earliest of <see cref="Accepted"/>: a part wholly after the file's latest instant needs no duplicate lookups.</summary>
        public long EarliestAccepted = long.MaxValue;
        public bool Worker;
        public RawValueSink? Sink;
        public long Rows;
        /// <summary>The part was read by the plain-part route, without the CSV reader.</summary>
        public bool Plain;

        public void Clear()
        {
            for (var j = 0; j < Ledgers.Length; j++) Ledgers[j] = TagLedger.Part(Ledgers[j].Tag);
            Bins.Clear();
            Accepted.Clear();
            EarliestAccepted = long.MaxValue;
            Rows = 0;
            Plain = false;
        }
    }

    private sealed record WideFile(string Name, HistorianSource Source, FileDialect Dialect, PlantConfiguration Config, ColumnPlan[] Plans, int TimestampColumn,
        long Interval, long? WindowStart, long? WindowEnd, Dictionary<string, string> Markers, bool PlainRoute)
    {
        private readonly System.Collections.Concurrent.ConcurrentBag<PartTarget> _spare = [];

        /// <summary>A worker's target: its own duplicate set and clock (reused from a merged part when one is spare).</summary>
        public PartTarget Rent()
        {
            // Cleared here, on the worker's thread, not at the merge.
            if (_spare.TryTake(out var target)) target.Clear();
            else target = new PartTarget(Plans);
            target.Seen.Clear();
            target.Parser = new TimestampParser(Source.Timestamp, Config.Site.TimeZone);
            target.Worker = true;
            target.Sink = null;
            return target;
        }

        public void Return(PartTarget target) => _spare.Add(target);
    }

    /// <summary>The file's own state: ledgers and bins per tag, the timestamps read, the clock carried from part to part.</summary>
    private sealed record FileState(TagLedger[] Ledgers, BinAccumulator[] Bins, TimestampSet Seen, TimestampParser Parser, RawValueSink? Sink)
    {
        public long Rows;
    }

    /// <remarks>
    /// The file is cut into parts of whole records (<see cref="PartBytes"/>), which the cores read at the same time
    /// into parts of their own (ledgers, bins); the parts are merged in file order, so the result is the same for any
    /// number of cores. Two things need what came before in the file and are settled at the merge: a timestamp already
    /// read in an earlier part (a duplicate) and a local time in the repeated autumn hour (resolved by the instants read
    /// before it). A part with either is read again, in order, straight into the file's own state; that is rare (an
    /// overlapping export, once a year) and gives exactly the single-pass result. With a raw-value sink (the watch
    /// service keeps every value) the parts are read in order on one thread.
    /// </remarks>
    private static FileReport ReadWide(string file, HistorianSource source, FileDialect dialect, PlantConfiguration config,
        Dictionary<string, Channel> channels, Dictionary<string, TimestampSet> signatures, Dictionary<string, List<string>> foundIn,
        long interval, long? windowStart, long? windowEnd, RawValueSink? sink)
    {
        var header = dialect.Header;
        var tsColumn = FileDialectDetector.TimestampColumnIndex(header, source);
        if (tsColumn < 0)
            throw new IngestException(file, dialect.HeaderLine, null, $"no timestamp column '{source.Timestamp.Column}' in the header ({string.Join(", ", header.Take(8))}…); set {source.Path}.timestamp.column.");
        var plans = new List<ColumnPlan>();
        for (var i = 0; i < header.Count; i++)
        {
            if (i == tsColumn || !channels.TryGetValue(header[i], out var c)) continue;
            if (c.Reference.Source is not null && c.Reference.Source != source.Id) continue;
            // Two columns of one tag would be merged into one series and counted twice: refuse, naming both.
            if (plans.FirstOrDefault(p => p.Channel == c) is { } earlier)
                throw new IngestException(file, dialect.HeaderLine, null,
                    $"the header has tag '{header[i]}' in columns {earlier.Index + 1} and {i + 1}; a tag must have one column. " +
                    "Remove or rename one of them in the export (or export the tag once).");
            plans.Add(new ColumnPlan(i, c));
            (foundIn.TryGetValue(c.Reference.Tag, out var l) ? l : foundIn[c.Reference.Tag] = []).Add(file);
        }
        // Files with the same columns share one set of timestamps read, so overlapping exports are deduplicated.
        var signature = string.Join("\u0001", plans.Select(p => p.Tag).Order(StringComparer.Ordinal));
        if (!signatures.TryGetValue(signature, out var seen)) signatures[signature] = seen = new TimestampSet();

        // The plain-part route reads UTF-8 bytes in place with single-byte delimiter and separator; the raw-value sink
        // (watch service) keeps the CSV reader's route.
        var plainRoute = !PlainRouteOffForTests && sink is null && dialect.Encoding is UTF8Encoding
            && dialect.Delimiter < 128 && dialect.DecimalSeparator < 128 && dialect.Delimiter != dialect.DecimalSeparator;
        var wide = new WideFile(Path.GetFileName(file), source, dialect, config, plans.ToArray(), tsColumn, interval, windowStart, windowEnd, MarkerSet(source), plainRoute);
        var whole = new FileState(wide.Plans.Select(p => p.Channel.Ledger).ToArray(), wide.Plans.Select(p => p.Channel.Bins).ToArray(), seen,
            new TimestampParser(source.Timestamp, config.Site.TimeZone), sink);
        var workers = Math.Clamp(Environment.ProcessorCount, 1, 8);
        var pending = new Queue<(FilePart Part, Task<PartTarget>? Work)>();
        try
        {
            foreach (var part in Parts(file, dialect))
            {
                // With a raw-value sink every value is handed over in file order, so the parts are read in order.
                pending.Enqueue((part, sink is not null ? null : Task.Run(() =>
                {
                    var target = wide.Rent();
                    ReadPart(part, wide, target);
                    return target;
                })));
                // One part more than there are cores keeps every core busy while this thread reads the next one.
                while (pending.Count > (sink is null ? workers : 0)) MergeNext(pending, wide, whole);
            }
            while (pending.Count > 0) MergeNext(pending, wide, whole);
        }
        finally
        {
            foreach (var (part, work) in pending)
            {
                try { work?.Wait(); } catch (AggregateException) { /* the first failure is already on its way up */ }
                part.Dispose();
            }
        }
        return new FileReport(file, dialect.EncodingName, dialect.Delimiter, dialect.DecimalSeparator, dialect.HeaderLine, dialect.MetadataRows,
            whole.Rows, whole.Parser.AmbiguousAsDaylight, whole.Parser.AmbiguousAsStandard, header.ToList());
    }

    private static void MergeNext(Queue<(FilePart Part, Task<PartTarget>? Work)> pending, WideFile wide, FileState whole)
    {
        var (part, work) = pending.Dequeue();
        using (part)
        {
            var read = work?.GetAwaiter().GetResult();
            if (read is null || read.Parser.AmbiguousAsDaylight + read.Parser.AmbiguousAsStandard > 0 || (read.EarliestAccepted <= whole.Seen.Latest && read.Accepted.Exists(whole.Seen.Contains)))
            {
                // Read in order against the file's own timestamps and clock: exactly what one pass would do.
                if (read is not null) wide.Return(read);
                read = new PartTarget(wide.Plans) { Seen = whole.Seen, Parser = whole.Parser, Sink = whole.Sink };
                ReadPart(part, wide, read);
            }
            else
            {
                foreach (var utc in read.Accepted) whole.Seen.Add(utc);
                whole.Parser.Observe(read.Parser.LatestUtc);
            }
            for (var j = 0; j < wide.Plans.Length; j++) whole.Ledgers[j].Merge(read.Ledgers[j]);
            read.Bins.MergeInto(whole.Bins);
            whole.Rows += read.Rows;
            if (read.Plain) PlainPartsRead++;
            PartsRead++;
            if (read.Worker) wide.Return(read);
        }
    }

    /// <summary>Cuts the export (from its header on) into parts of whole records: at a line break outside quotes.</summary>
    private static IEnumerable<FilePart> Parts(string file, FileDialect dialect)
    {
        using var stream = ExportStream.OpenAt(file, dialect.HeaderByteOffset);
        var buffer = ArrayPool<byte>.Shared.Rent(PartBytes);
        var length = 0;
        var end = false;
        long lineBefore = dialect.HeaderLine - 1;
        var first = true;
        try
        {
            while (true)
            {
                while (!end && length < buffer.Length)
                {
                    var n = stream.Read(buffer, length, buffer.Length - length);
                    if (n == 0) end = true;
                    else length += n;
                }
                if (length == 0) yield break;
                // cut only where the quotes are decided (a stray quote's line is known only with the lines after it)
                var decided = BalanceQuotesPerLine(buffer.AsSpan(0, length), end, (byte)dialect.Delimiter);
                var lines = 0;
                var plain = false;
                var cut = end ? length : RecordsEnd(buffer.AsSpan(0, decided), out lines, out plain);
                if (end)
                {
                    var (breaks, quotes, loneReturns) = CountBreaksAndQuotes(buffer.AsSpan(0, length));
                    (lines, plain) = (breaks, quotes == 0 && loneReturns == 0);
                }
                // The first part holds the header and the unit rows whole; a record longer than the buffer grows it.
                if (!end && (cut < 0 || (first && lines <= dialect.MetadataRows)))
                {
                    var larger = ArrayPool<byte>.Shared.Rent(buffer.Length * 2);
                    buffer.AsSpan(0, length).CopyTo(larger);
                    ArrayPool<byte>.Shared.Return(buffer);
                    buffer = larger;
                    continue;
                }
                var next = ArrayPool<byte>.Shared.Rent(Math.Max(PartBytes, 2 * (length - cut)));
                buffer.AsSpan(cut, length - cut).CopyTo(next);
                var part = new FilePart(buffer, cut, lineBefore, first, plain);
                lineBefore += lines;
                first = false;
                length -= cut;
                buffer = next;
                yield return part;
            }
        }
        finally
        {
            ArrayPool<byte>.Shared.Return(buffer);
        }
    }

    /// <summary>Most line breaks a quoted field may hold (RFC 4180 allows them; a note in an export has one or two).</summary>
    public const int MaxLineBreaksInField = 2;

    /// <summary>
    /// Quotes made to mean what the CSV reader will take them for, line by line. A quote that opens a field (at the
    /// start of a field) and that no line within the next <see cref="MaxLineBreaksInField"/> closes is a stray character
    /// (a damaged value such as <c>"150</c>), not the start of a field running on to the next quote in the file, which
    /// would swallow every row up to it into one value: its line's quotes become apostrophes, the line still splits at
    /// its delimiters, the damaged value is rejected as text and counted, and no other row is lost. A quote inside an
    /// unquoted field (<c>12"5</c>), which the reader keeps as a plain character, becomes an apostrophe too, so that
    /// every quote left opens, closes or doubles inside a quoted field and the cutter's quote count agrees with the
    /// reader. Quoted fields that close within the allowance, line breaks and all, are left as they are. Lines still
    /// undecided at the end of <paramref name="data"/> (more to read) are left for the next pass. Returns the length
    /// decided.
    /// </summary>
    internal static int BalanceQuotesPerLine(Span<byte> data, bool atEnd, byte delimiter)
    {
        if (data.IndexOf((byte)'"') < 0) return data.Length; // nothing to decide
        var start = 0;
        while (start < data.Length)
        {
            var (end, next) = NextBreak(data, start, atEnd);
            if (end < 0) return start;
            var line = data[start..end];
            if (Walk(line, inQuotes: false, delimiter, fix: true))
            {
                // look for the line that closes the field within the allowance
                var closedAt = -1;
                var pos = next;
                var inQuotes = true;
                for (var k = 0; k < MaxLineBreaksInField && closedAt < 0; k++)
                {
                    if (pos >= data.Length) { if (!atEnd) return start; break; }
                    var (_, after) = NextBreak(data, pos, atEnd);
                    if (after < 0) return start;
                    inQuotes = Walk(data[pos..after], inQuotes, delimiter, fix: false);
                    if (!inQuotes) closedAt = after;
                    pos = after;
                }
                if (closedAt >= 0)
                {
                    Walk(data[next..closedAt], inQuotes: true, delimiter, fix: true);
                    start = closedAt;
                    continue;
                }
                line.Replace((byte)'"', (byte)'\'');
            }
            start = next;
        }
        return start;
    }

    /// <summary>The end of the line starting at <paramref name="from"/> and the start of the next (LF, CRLF or a lone CR
    /// end a line, as the CSV reader reads them), or (-1, -1) when its end is not in the data yet.</summary>
    private static (int End, int Next) NextBreak(ReadOnlySpan<byte> data, int from, bool atEnd)
    {
        var i = data[from..].IndexOfAny((byte)'\n', (byte)'\r');
        if (i < 0) return atEnd ? (data.Length, data.Length) : (-1, -1);
        i += from;
        if (data[i] == (byte)'\n') return (i, i + 1);
        if (i + 1 < data.Length) return (i, data[i + 1] == (byte)'\n' ? i + 2 : i + 1);
        return atEnd ? (i, i + 1) : (-1, -1);
    }

    /// <summary>
    /// Walks bytes as the CSV reader reads them (RFC 4180, leniently): a quote at the start of a field opens it, inside
    /// it a doubled quote is one quote and a single one closes it; any other quote is a plain character. Returns whether
    /// the walk ends inside a quoted field; with <paramref name="fix"/> the plain-character quotes become apostrophes.
    /// </summary>
    private static bool Walk(Span<byte> s, bool inQuotes, byte delimiter, bool fix)
    {
        var fieldStart = !inQuotes;
        for (var i = 0; i < s.Length; i++)
        {
            var c = s[i];
            if (inQuotes)
            {
                if (c != (byte)'"') continue;
                if (i + 1 < s.Length && s[i + 1] == (byte)'"') { i++; continue; }
                inQuotes = false;
                fieldStart = false;
            }
            else if (c == (byte)'"')
            {
                if (fieldStart) { inQuotes = true; fieldStart = false; }
                else if (fix) s[i] = (byte)'\'';
            }
            else fieldStart = c == delimiter || c == (byte)'\n' || c == (byte)'\r';
        }
        return inQuotes;
    }

    /// <summary>The length of the run of whole records at the start of <paramref name="data"/>: up to the last line break outside quotes, or -1.</summary>
    internal static int RecordsEnd(ReadOnlySpan<byte> data) => RecordsEnd(data, out _, out _);

    /// <summary>
    /// As <see cref="RecordsEnd(ReadOnlySpan{byte})"/>, with the number of line breaks in that run and whether it is
    /// plain delimited text (<see cref="FilePart.Plain"/>; false when unsure, which only sends the run to the CSV reader).
    /// </summary>
    /// <remarks>
    /// A line break is an LF, or a CR not followed by LF (as the CSV reader reads them); a CR as the last byte of
    /// <paramref name="data"/> may be the first half of a CRLF still to be read, so the run ends before it. Parts always
    /// start outside quotes, so a line break is outside them when an even number of quotes comes before it (an escaped
    /// quote is two).
    /// </remarks>
    internal static int RecordsEnd(ReadOnlySpan<byte> data, out int lines, out bool plain)
    {
        lines = 0;
        plain = false;
        var at = LastBreak(data, data.Length);
        if (at < 0) return -1;
        var (breaks, quotes, loneReturns) = CountBreaksAndQuotes(data[..(at + 1)]);
        lines = breaks;
        plain = quotes == 0 && loneReturns == 0;
        while ((quotes & 1) == 1)
        {
            var previous = LastBreak(data, at);
            if (previous < 0) return -1;
            quotes -= data[previous..at].Count((byte)'"');
            at = previous;
            lines--;
        }
        return at + 1;
    }

    /// <summary>The last line break in <paramref name="data"/> before <paramref name="limit"/> (where it ends: the LF of a CRLF), or -1.</summary>
    private static int LastBreak(ReadOnlySpan<byte> data, int limit)
    {
        var k = limit;
        while (true)
        {
            k = data[..k].LastIndexOfAny((byte)'\n', (byte)'\r');
            // A CR followed by LF is the break that LF ends; a CR at the very end is not known to be a break yet.
            if (k < 0 || data[k] == (byte)'\n' || (k + 1 < data.Length && data[k + 1] != (byte)'\n')) return k;
        }
    }

    /// <summary>
    /// Line breaks (LF, and CR not followed by LF; a CR at the very end counts) and quotes in <paramref name="data"/>,
    /// counted in one pass (the reading thread's only look at every byte).
    /// </summary>
    internal static (int Breaks, int Quotes, int LoneReturns) CountBreaksAndQuotes(ReadOnlySpan<byte> data)
    {
        int breaks = 0, quotes = 0, loneReturns = 0, i = 0;
        if (Vector256.IsHardwareAccelerated && data.Length > Vector256<byte>.Count)
        {
            ref var start = ref MemoryMarshal.GetReference(data);
            var lf = Vector256.Create((byte)'\n');
            var cr = Vector256.Create((byte)'\r');
            var quote = Vector256.Create((byte)'"');
            // Each block's next byte is read with it (the block one byte on), so the loop stops a byte short of the end.
            for (; i < data.Length - Vector256<byte>.Count; i += Vector256<byte>.Count)
            {
                var v = Vector256.LoadUnsafe(ref start, (nuint)i);
                breaks += BitOperations.PopCount(Vector256.Equals(v, lf).ExtractMostSignificantBits());
                quotes += BitOperations.PopCount(Vector256.Equals(v, quote).ExtractMostSignificantBits());
                var crs = Vector256.Equals(v, cr).ExtractMostSignificantBits();
                if (crs != 0)
                {
                    var lfNext = Vector256.Equals(Vector256.LoadUnsafe(ref start, (nuint)(i + 1)), lf).ExtractMostSignificantBits();
                    loneReturns += BitOperations.PopCount(crs & ~lfNext);
                }
            }
        }
        for (; i < data.Length; i++)
        {
            if (data[i] == (byte)'\n') breaks++;
            else if (data[i] == (byte)'"') quotes++;
            else if (data[i] == (byte)'\r' && (i + 1 == data.Length || data[i + 1] != (byte)'\n')) loneReturns++;
        }
        return (breaks + loneReturns, quotes, loneReturns);
    }

    /// <summary>
    /// The CSV reader over a part. The reader takes bytes FF FE, FE FF or EF BB BF at the start of what it is given for
    /// a byte-order mark and decodes the whole part by it (FF FE: as UTF-16), so a part that merely starts with such
    /// bytes (a damaged row) would read as nonsense while the same bytes inside a part read as text. Such a part is
    /// given with an empty line in front (skipped, and taken off the line numbers: <paramref name="shift"/>).
    /// </summary>
    private static CsvReader OpenPart(FilePart part, FileDialect dialect, out int shift)
    {
        var options = ReaderOptions(dialect, hasHeader: part.First);
        var data = part.Buffer.AsMemory(0, part.Length);
        var span = data.Span;
        shift = span.Length >= 2 && (span[0], span[1]) is (0xFF, 0xFE) or (0xFE, 0xFF) or (0xEF, 0xBB) ? 1 : 0;
        if (shift == 1)
        {
            var copy = new byte[data.Length + 1];
            copy[0] = (byte)'\n';
            span.CopyTo(copy.AsSpan(1));
            data = copy;
        }
        // UTF-8 is read in place; another encoding (Windows-1252) is transcoded by the reader.
        return options.Encoding is null
            ? CsvReader.Create(data, options)
            : CsvReader.Create(shift == 0 ? new MemoryStream(part.Buffer, 0, part.Length, writable: false) : new MemoryStream(data.ToArray(), writable: false),
                options, leaveOpen: false);
    }

    private static void ReadPart(FilePart part, WideFile wide, PartTarget target)
    {
        if (wide.PlainRoute && !part.First && part.Plain)
        {
            ReadPlainPart(part, wide, target);
            target.Plain = true;
        }
        else ReadCsvPart(part, wide, target);
    }

    /// <summary>The rows of a part read by the CSV reader (quoting, other encodings, the header part).</summary>
    private static void ReadCsvPart(FilePart part, WideFile wide, PartTarget target)
    {
        using var reader = OpenPart(part, wide.Dialect, out var shift);
        if (part.First) reader.ReadHeader();
        var skip = part.First ? wide.Dialect.MetadataRows : 0;
        var plans = wide.Plans;
        var ledgers = target.Ledgers;
        var decimalByte = (byte)wide.Dialect.DecimalSeparator;
        var sink = target.Sink;
        var failed = new int[plans.Length];
        long rows = 0;
        while (reader.Read())
        {
            if (skip > 0) { skip--; continue; }
            rows++;
            var line = part.LineBefore + reader.LineNumber - shift;
            if (!AcceptRow(wide, target, reader.GetSpan(wide.TimestampColumn), line, out var utc)) continue;
            var (sums, counts, cell) = target.Bins.Cells(utc / wide.Interval);
            if (sink is not null)
            {
                ReadRowInto(reader, line, wide, ledgers, sums, counts, cell, utc, sink);
                continue;
            }
            var failedCount = AddRow(reader, plans, decimalByte, sums, counts, cell, failed);
            for (var f = 0; f < failedCount; f++)
            {
                var j = failed[f];
                if (SlowValue(plans[j], ledgers[j], reader.GetSpan(plans[j].Index), plans[j].Index, decimalByte, wide.Markers, wide.Name, line, out var slow))
                {
                    sums[cell + j * PartBins.Stride] += slow;
                    counts[cell + j * PartBins.Stride]++;
                }
            }
        }
        CountUsed(target, rows);
    }

    /// <summary>
    /// The rows of a plain part (<see cref="FilePart.Plain"/>) read in place, field by field, each number parsed as its
    /// field is found: the same fields the CSV reader gives (delimiter-separated, untrimmed, a missing field empty,
    /// empty lines skipped), without finding every field's ends first.
    /// </summary>
    // Compiled optimized at once: a command-line run reads each file once, and the plain route carries almost all of it
    // (with tiered compilation the first few parts would run unoptimized code).
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static unsafe void ReadPlainPart(FilePart part, WideFile wide, PartTarget target)
    {
        var plans = wide.Plans;
        var ledgers = target.Ledgers;
        var delimiter = (byte)wide.Dialect.Delimiter;
        var decimalByte = (byte)wide.Dialect.DecimalSeparator;
        var declined = new (int Plan, int Start, int End)[plans.Length];
        var line = part.LineBefore;
        long rows = 0;
        var length = part.Length;
        // Every record but perhaps the file's last ends in a line break; a last one without it is read from a copy
        // that has one, so that the number loops always stop on a byte that is not a digit.
        var whole = length > 0 && part.Buffer[length - 1] != (byte)'\n' ? part.Buffer.AsSpan(0, length).LastIndexOf((byte)'\n') + 1 : length;
        var data = part.Buffer.AsSpan(0, whole);
        while (!data.IsEmpty)
        {
            var lineEnd = data.IndexOf((byte)'\n');
            var record = data[..lineEnd];
            data = data[(lineEnd + 1)..];
            ReadPlainRecord(record, ++line, ref rows);
        }
        if (whole < length)
        {
            var tail = new byte[length - whole + 1];
            part.Buffer.AsSpan(whole, length - whole).CopyTo(tail);
            tail[^1] = (byte)'\n';
            ReadPlainRecord(tail.AsSpan(0, tail.Length - 1), ++line, ref rows);
        }
        CountUsed(target, rows);

        // The record's bytes are followed in memory by its line break (the number loops stop on it).
        [MethodImpl(MethodImplOptions.AggressiveOptimization)]
        void ReadPlainRecord(ReadOnlySpan<byte> record, long line, ref long rows)
        {
            if (!record.IsEmpty && record[^1] == (byte)'\r') record = record[..^1];
            if (record.IsEmpty) return;
            rows++;
            if (!AcceptRow(wide, target, Field(record, wide.TimestampColumn, delimiter), line, out var utc)) return;
            if (plans.Length == 0) return; // a header naming no configured tag: the rows are counted, nothing is written
            var (sums, counts, cell) = target.Bins.Cells(utc / wide.Interval);
            // The hot loop writes a record's cells without bounds checks: the last column's cell must be inside.
            if ((uint)(cell + (plans.Length - 1) * PartBins.Stride) >= (uint)Math.Min(sums.Length, counts.Length))
                throw new InvalidOperationException("Interval cells outside their block.");
            int declinedCount;
            fixed (byte* start = record)
                declinedCount = AddPlainRecord(start, start + record.Length, plans, delimiter, decimalByte,
                    ref sums[cell], ref counts[cell], declined);
            for (var f = 0; f < declinedCount; f++)
            {
                var (j, from, to) = declined[f];
                if (SlowValue(plans[j], ledgers[j], record[from..to], plans[j].Index, decimalByte, wide.Markers, wide.Name, line, out var slow))
                {
                    sums[cell + j * PartBins.Stride] += slow;
                    counts[cell + j * PartBins.Stride]++;
                }
            }
        }
    }

    /// <summary>Field <paramref name="index"/> of a plain record; empty when the record has fewer fields (as the CSV reader gives it).</summary>
    private static ReadOnlySpan<byte> Field(ReadOnlySpan<byte> record, int index, byte delimiter)
    {
        for (var k = 0; k < index; k++)
        {
            var next = record.IndexOf(delimiter);
            if (next < 0) return default;
            record = record[(next + 1)..];
        }
        var end = record.IndexOf(delimiter);
        return end < 0 ? record : record[..end];
    }

    /// <summary>
    /// The hot loop over one plain record [<paramref name="record"/>, <paramref name="end"/>), where the byte at
    /// <paramref name="end"/> is a line end: walk to each planned column, parse its number up to the delimiter,
    /// convert, range-check, add to the interval (column j's cells <see cref="PartBins.Stride"/> · j after
    /// <paramref name="sum"/> and <paramref name="count"/>). Fields the quick route declines are listed
    /// (plan, start, end) for the caller.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveOptimization)]
    private static unsafe int AddPlainRecord(byte* record, byte* end, ColumnPlan[] plans, byte delimiter, byte decimalByte,
        ref double sum, ref int count, (int Plan, int Start, int End)[] declined)
    {
        var declinedCount = 0;
        var at = record; // where field `column` starts; past the end when the record has no such field
        var column = 0;
        for (var j = 0; j < plans.Length; j++)
        {
            var plan = plans[j];
            while (column < plan.Index && at <= end)
            {
                var next = new ReadOnlySpan<byte>(at, (int)(end - at)).IndexOf(delimiter);
                at = next < 0 ? end + 1 : at + next + 1;
                column++;
            }
            if (at > end)
            {
                declined[declinedCount++] = (j, 0, 0);
                continue;
            }
            var after = PlainDecimal.ParseTerminated(at, decimalByte, out var reading);
            if (after != null && (*after == delimiter || after == end)
                && (reading = reading * plan.Scale + plan.Offset) >= plan.Minimum && reading <= plan.Maximum)
            {
                Unsafe.Add(ref sum, j * PartBins.Stride) += reading;
                Unsafe.Add(ref count, j * PartBins.Stride)++;
            }
            else
            {
                var length = new ReadOnlySpan<byte>(at, (int)(end - at)).IndexOf(delimiter);
                after = length < 0 ? end : at + length;
                declined[declinedCount++] = (j, (int)(at - record), (int)(after - record));
            }
            at = after + 1;
            column++;
        }
        return declinedCount;
    }

    /// <summary>A row's timestamp read and checked (window, duplicate); a rejected row is counted against every tag of the file.</summary>
    private static bool AcceptRow(WideFile wide, PartTarget target, ReadOnlySpan<byte> timestamp, long line, out long utc)
    {
        var reason = TimeReason(target.Parser, timestamp, wide.WindowStart, wide.WindowEnd, out utc);
        if (reason is null && !target.Seen.Add(utc)) reason = RejectReason.Duplicate;
        if (reason is { } rr)
        {
            var text = rr is RejectReason.BadTimestamp or RejectReason.NonexistentLocalTime ? Encoding.UTF8.GetString(timestamp) : null;
            for (var j = 0; j < wide.Plans.Length; j++)
            {
                var tag = wide.Plans[j].Tag;
                target.Ledgers[j].CountRejected(rr, () => Example(wide.Name, line, wide.TimestampColumn + 1, tag, rr, text));
            }
            return false;
        }
        if (target.Worker)
        {
            target.Accepted.Add(utc);
            if (utc < target.EarliestAccepted) target.EarliestAccepted = utc;
        }
        return true;
    }

    /// <summary>Each row is one read of every column: those not rejected (row or value) were used.</summary>
    private static void CountUsed(PartTarget target, long rows)
    {
        for (var j = 0; j < target.Ledgers.Length; j++) target.Ledgers[j].CountUsed(rows - target.Ledgers[j].Read);
        target.Rows += rows;
    }

    /// <summary>
    /// The hot loop over one record's columns, kept small so that its state stays in registers: parse, convert with
    /// the column's resolved scale and offset, range-check, add to the interval. Returns how many columns the quick
    /// route declined, listed in <paramref name="failed"/> for the caller to read the long way.
    /// </summary>
    private static int AddRow(CsvReader reader, ColumnPlan[] plans, byte decimalByte, double[] sums, int[] counts, int cell, int[] failed)
    {
        var failedCount = 0;
        for (var j = 0; j < plans.Length; j++)
        {
            var plan = plans[j];
            if (PlainDecimal.TryParse(reader.GetSpan(plan.Index), decimalByte, out var reading)
                && (reading = reading * plan.Scale + plan.Offset) >= plan.Minimum && reading <= plan.Maximum)
            {
                sums[cell + j * PartBins.Stride] += reading;
                counts[cell + j * PartBins.Stride]++;
            }
            else failed[failedCount++] = j;
        }
        return failedCount;
    }

    /// <summary>One record's values, each also handed to the raw-value sink (the watch service): the plain loop.</summary>
    private static void ReadRowInto(CsvReader reader, long line, WideFile wide, TagLedger[] ledgers, double[] sums, int[] counts, int cell, long utc, RawValueSink sink)
    {
        var decimalByte = (byte)wide.Dialect.DecimalSeparator;
        for (var j = 0; j < wide.Plans.Length; j++)
        {
            var plan = wide.Plans[j];
            if (!PlainDecimal.TryParse(reader.GetSpan(plan.Index), decimalByte, out var reading)
                || !((reading = plan.ToSi(reading)) >= plan.Minimum && reading <= plan.Maximum))
            {
                if (!SlowValue(plan, ledgers[j], reader.GetSpan(plan.Index), plan.Index, decimalByte, wide.Markers, wide.Name, line, out var slow)) continue;
                reading = slow;
            }
            sums[cell + j * PartBins.Stride] += reading;
            counts[cell + j * PartBins.Stride]++;
            sink.Add(plan.Tag, utc, reading);
        }
    }
}
