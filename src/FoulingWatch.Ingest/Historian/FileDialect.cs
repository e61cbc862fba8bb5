using System.Globalization;
using System.Text;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Ingest.Historian;

/// <summary>How an export file is written: encoding, delimiter, decimal separator, where the header is and how many unit/description rows follow it.</summary>
/// <param name="HeaderLine">1-based line of the header (lines before it are a preamble).</param>
/// <param name="HeaderByteOffset">Byte offset in the file where the header line starts.</param>
public sealed record FileDialect(Encoding Encoding, string EncodingName, char Delimiter, char DecimalSeparator, int HeaderLine, long HeaderByteOffset, int MetadataRows, IReadOnlyList<string> Header);

/// <summary>Detects a file's dialect from its first 64 KiB, honouring what the source configuration fixes.</summary>
public static class FileDialectDetector
{
    private const int SampleBytes = 64 * 1024;
    private static readonly char[] Delimiters = [',', ';', '\t', '|'];

    static FileDialectDetector() => Encoding.RegisterProvider(CodePagesEncodingProvider.Instance);

    public static Encoding Windows1252 => Encoding.GetEncoding(1252);

    public static FileDialect Detect(string file, HistorianSource source)
    {
        byte[] sample;
        using (var fs = ExportStream.Open(file))
        {
            var buffer = new byte[SampleBytes];
            var filled = 0;
            int read;
            while (filled < buffer.Length && (read = fs.Read(buffer, filled, buffer.Length - filled)) > 0) filled += read;
            sample = buffer[..filled];
        }
        if (sample.Length == 0) throw new IngestException(file, null, null, "the file is empty; export the tags again.");

        var bom = sample.Length >= 3 && sample[0] == 0xEF && sample[1] == 0xBB && sample[2] == 0xBF ? 3 : 0;
        Encoding encoding;
        string encodingName;
        switch (source.Encoding?.ToLowerInvariant())
        {
            case "utf-8": encoding = new UTF8Encoding(false); encodingName = bom > 0 ? "utf-8 (BOM)" : "utf-8"; break;
            case "windows-1252": encoding = Windows1252; encodingName = "windows-1252"; break;
            default:
                if (bom > 0 || IsValidUtf8(sample)) { encoding = new UTF8Encoding(false); encodingName = bom > 0 ? "utf-8 (BOM)" : "utf-8"; }
                else { encoding = Windows1252; encodingName = "windows-1252 (detected)"; }
                break;
        }

        // Split the sample into lines, remembering byte offsets, and drop a last partial line. A line ends at LF, CRLF
        // or a lone CR, as the CSV reader reads them.
        var lines = new List<(string Text, long Offset)>();
        var start = bom;
        for (var i = bom; i < sample.Length; i++)
        {
            if (sample[i] != (byte)'\n' && sample[i] != (byte)'\r') continue;
            if (sample[i] == (byte)'\r' && i + 1 < sample.Length && sample[i + 1] == (byte)'\n') continue; // the LF ends it
            if (sample[i] == (byte)'\r' && i + 1 == sample.Length && sample.Length == SampleBytes) break; // perhaps a CRLF cut by the sample
            var end = sample[i] == (byte)'\n' && i > start && sample[i - 1] == (byte)'\r' ? i - 1 : i;
            lines.Add((encoding.GetString(sample, start, end - start), start));
            start = i + 1;
        }
        if (start < sample.Length && sample.Length < SampleBytes) lines.Add((encoding.GetString(sample, start, sample.Length - start).TrimEnd('\r'), start));
        if (lines.Count == 0) throw new IngestException(file, 1, null, "no complete line in the first 64 KiB; is this a CSV export?");

        var delimiter = source.Delimiter ?? DetectDelimiter(lines.Select(l => l.Text).Take(60).ToList());
        int headerIndex;
        if (source.HeaderLine is { } hl)
        {
            headerIndex = hl - 1;
            if (headerIndex >= lines.Count) throw new IngestException(file, hl, null, $"headerLine {hl} is beyond the first {lines.Count} lines of the file.");
        }
        else headerIndex = DetectHeader(lines.Select(l => l.Text).Take(80).ToList(), delimiter, source);
        if (headerIndex < 0)
            throw new IngestException(file, null, null, $"no header line found in the first {Math.Min(80, lines.Count)} lines; set {source.Path}.headerLine (and delimiter if it is not '{delimiter}').");
        var header = SplitLine(lines[headerIndex].Text, delimiter);

        var metadata = source.MetadataRows ?? DetectMetadataRows(lines, headerIndex, header, delimiter, source);
        var dataSample = lines.Skip(headerIndex + 1 + metadata).Take(200).Select(l => SplitLine(l.Text, delimiter)).ToList();
        var decimalSeparator = source.DecimalSeparator ?? DetectDecimal(dataSample, delimiter);
        if (decimalSeparator == delimiter)
            throw new IngestException(file, headerIndex + 1, null, $"the fields are split by '{delimiter}', which {source.Path}.decimal also names as the decimal separator; set {source.Path}.delimiter to the export's delimiter (\";\", \"\\t\" or \"|\").");
        return new FileDialect(encoding, encodingName, delimiter, decimalSeparator, headerIndex + 1, lines[headerIndex].Offset, metadata, header);
    }

    private static bool IsValidUtf8(byte[] bytes)
    {
        // A multi-byte sequence cut at the sample's end is not an error.
        var length = bytes.Length;
        var cut = Math.Max(0, length - 4);
        var status = System.Text.Unicode.Utf8.ToUtf16(bytes, new char[bytes.Length], out var read, out _, replaceInvalidSequences: false);
        return status == System.Buffers.OperationStatus.Done || (status == System.Buffers.OperationStatus.NeedMoreData && read >= cut);
    }

    internal static char DetectDelimiter(IReadOnlyList<string> lines)
    {
        var best = ',';
        var bestScore = -1.0;
        foreach (var d in Delimiters)
        {
            var counts = lines.Where(l => l.Length > 0).Select(l => CountOutsideQuotes(l, d)).ToList();
            if (counts.Count == 0) continue;
            var tail = counts.Skip(counts.Count / 2).ToList();
            var mode = tail.GroupBy(c => c).OrderByDescending(g => g.Count()).ThenByDescending(g => g.Key).First();
            if (mode.Key == 0) continue;
            // Consistency of the field count first, then how many fields read as numbers (this separates ';' from a decimal comma).
            var numeric = lines.Skip(lines.Count / 2).Where(l => l.Length > 0).SelectMany(l => SplitLine(l, d)).Count(f => LooksNumeric(f));
            var score = mode.Count() / (double)tail.Count * 1000 + numeric + mode.Key * 0.001;
            if (score > bestScore) { bestScore = score; best = d; }
        }
        return best;
    }

    private static int CountOutsideQuotes(string line, char d)
    {
        var n = 0;
        var quoted = false;
        foreach (var c in line)
        {
            if (c == '"') quoted = !quoted;
            else if (c == d && !quoted) n++;
        }
        return n;
    }

    /// <summary>Splits one line by RFC 4180 rules (for detection only; reading uses CsvHelper).</summary>
    public static List<string> SplitLine(string line, char d)
    {
        var fields = new List<string>();
        var sb = new StringBuilder();
        var quoted = false;
        for (var i = 0; i < line.Length; i++)
        {
            var c = line[i];
            if (quoted)
            {
                if (c == '"' && i + 1 < line.Length && line[i + 1] == '"') { sb.Append('"'); i++; }
                else if (c == '"') quoted = false;
                else sb.Append(c);
            }
            else if (c == '"') quoted = true;
            else if (c == d) { fields.Add(sb.ToString().Trim()); sb.Clear(); }
            else sb.Append(c);
        }
        fields.Add(sb.ToString().Trim());
        return fields;
    }

    private static int DetectHeader(IReadOnlyList<string> lines, char delimiter, HistorianSource source)
    {
        var counts = lines.Select(l => CountOutsideQuotes(l, delimiter)).ToList();
        var tail = counts.Skip(counts.Count / 2).Where(c => c > 0).ToList();
        var modal = tail.Count == 0 ? counts.Max() : tail.GroupBy(c => c).OrderByDescending(g => g.Count()).First().Key;
        var wanted = source.Layout == HistorianLayout.Long ? source.TagColumn : source.Timestamp.Column;
        for (var i = 0; i < lines.Count; i++)
        {
            if (counts[i] != modal) continue;
            var fields = SplitLine(lines[i], delimiter);
            if (wanted is not null && fields.Any(f => f.Equals(wanted, StringComparison.OrdinalIgnoreCase))) return i;
            if (wanted is null && fields.Count(f => f.Length > 0 && !LooksNumeric(f)) >= Math.Max(1, fields.Count / 2)) return i;
        }
        return counts.FindIndex(c => c == modal);
    }

    private static int DetectMetadataRows(List<(string Text, long Offset)> lines, int headerIndex, List<string> header, char delimiter, HistorianSource source)
    {
        var tsColumn = TimestampColumnIndex(header, source);
        var n = 0;
        for (var i = headerIndex + 1; i < lines.Count && n < 20; i++, n++)
        {
            // The readers skip empty lines, so an empty line is no unit row: counting it would skip the first data row.
            if (lines[i].Text.Length == 0) { n--; continue; }
            var fields = SplitLine(lines[i].Text, delimiter);
            var ts = tsColumn >= 0 && tsColumn < fields.Count ? fields[tsColumn] : "";
            if (TimestampParser.LooksLikeTimestamp(ts, source.Timestamp)) break;
            // A row whose other fields are mostly numbers is data even when its timestamp format is not known yet.
            var others = fields.Where((_, j) => j != tsColumn && fields[j].Length > 0).ToList();
            if (others.Count > 0 && others.Count(LooksNumeric) * 2 > others.Count) break;
        }
        return n >= 20 ? 0 : n;
    }

    public static int TimestampColumnIndex(IReadOnlyList<string> header, HistorianSource source)
    {
        var name = source.Timestamp.Column;
        if (name is not null)
        {
            for (var i = 0; i < header.Count; i++)
                if (header[i].Equals(name, StringComparison.OrdinalIgnoreCase)) return i;
            return -1;
        }
        string[] usual = ["timestamp", "time", "date", "datetime", "date/time", "time stamp", "zeit", "tijd"];
        for (var i = 0; i < header.Count; i++)
            if (usual.Contains(header[i].Trim().ToLowerInvariant())) return i;
        return source.Layout == HistorianLayout.Long ? -1 : 0;
    }

    private static char DetectDecimal(List<List<string>> rows, char delimiter)
    {
        if (delimiter == ',') return '.';
        int comma = 0, dot = 0;
        foreach (var row in rows)
        foreach (var f in row.Skip(1))
        {
            if (f.Length == 0 || !char.IsDigit(f[^1])) continue;
            if (f.Contains(',') && !f.Contains('.')) comma++;
            else if (f.Contains('.') && !f.Contains(',') && f.Count(c => c == '.') == 1) dot++;
        }
        return comma > dot ? ',' : '.';
    }

    private static bool LooksNumeric(string f) =>
        double.TryParse(f.Replace(',', '.'), NumberStyles.Float, CultureInfo.InvariantCulture, out _);
}

/// <summary>Opens an export for sequential reading; a name ending in .gz is decompressed on the fly (historian exports are often archived so).</summary>
public static class ExportStream
{
    public static Stream Open(string file)
    {
        var fs = new FileStream(file, FileMode.Open, FileAccess.Read, FileShare.ReadWrite, 1 << 16, FileOptions.SequentialScan);
        return file.EndsWith(".gz", StringComparison.OrdinalIgnoreCase) ? new CompleteGzipStream(fs) : fs;
    }

    /// <summary>Opens the export positioned at a byte offset of its (decompressed) content.</summary>
    public static Stream OpenAt(string file, long offset)
    {
        var s = Open(file);
        if (s.CanSeek) { s.Position = offset; return s; }
        var skip = new byte[64 * 1024];
        while (offset > 0)
        {
            var n = s.Read(skip, 0, (int)Math.Min(skip.Length, offset));
            if (n == 0) break;
            offset -= n;
        }
        return s;
    }
}

/// <summary>A data problem that stops reading a file (unreadable, not a CSV, a timestamp column missing); names file, line and column.</summary>
public sealed class IngestException : Exception
{
    public IngestException(string file, long? line, int? column, string message)
        : base($"{Path.GetFileName(file)}{(line is null ? "" : $": line {line}")}{(column is null ? "" : $", column {column}")}: {message}")
    {
        File = file;
    }

    public string File { get; }
}

/// <summary>Decompresses a gzip file and, at its end, checks that the data read match the size in the gzip trailer, so a
/// file cut short (a copy still running, a broken transfer) is refused rather than half read.</summary>
/// <remarks>RFC 1952, 2.3.1: the last four bytes of a member are ISIZE, the uncompressed size modulo 2³². The runtime's
/// decompressor stops quietly at the end of a truncated file; this check catches it. A file of several concatenated
/// members is checked against the last member's size only, which would refuse it; such exports are not known here.</remarks>
internal sealed class CompleteGzipStream : Stream
{
    private readonly FileStream _file;
    private readonly System.IO.Compression.GZipStream _gzip;
    private long _read;
    private bool _checked;

    public CompleteGzipStream(FileStream file)
    {
        _file = file;
        _gzip = new System.IO.Compression.GZipStream(file, System.IO.Compression.CompressionMode.Decompress);
    }

    public override int Read(byte[] buffer, int offset, int count) => Read(buffer.AsSpan(offset, count));

    public override int Read(Span<byte> buffer)
    {
        var n = _gzip.Read(buffer);
        _read += n;
        if (n == 0 && buffer.Length > 0 && !_checked) Check();
        return n;
    }

    private void Check()
    {
        _checked = true;
        using var tail = new FileStream(_file.Name, FileMode.Open, FileAccess.Read, FileShare.ReadWrite);
        if (tail.Length < 18) throw Incomplete("the file is shorter than a gzip header and trailer");
        tail.Position = tail.Length - 4;
        Span<byte> size = stackalloc byte[4];
        tail.ReadExactly(size);
        if (BitConverter.ToUInt32(size) != (uint)_read)
            throw Incomplete($"the data end after {_read:N0} bytes, before the size its trailer states");
    }

    /// <summary>Marks the size check's own errors (their words say what is wrong; the runtime's may not).</summary>
    public const string SizeCheck = "FoulingWatch.SizeCheck";

    private static InvalidDataException Incomplete(string message)
    {
        var e = new InvalidDataException(message);
        e.Data[SizeCheck] = true;
        return e;
    }

    protected override void Dispose(bool disposing)
    {
        if (disposing) _gzip.Dispose();
        base.Dispose(disposing);
    }

    public override bool CanRead => true;
    public override bool CanSeek => false;
    public override bool CanWrite => false;
    public override long Length => throw new NotSupportedException();
    public override long Position { get => _read; set => throw new NotSupportedException(); }
    public override void Flush() { }
    public override long Seek(long offset, SeekOrigin origin) => throw new NotSupportedException();
    public override void SetLength(long value) => throw new NotSupportedException();
    public override void Write(byte[] buffer, int offset, int count) => throw new NotSupportedException();
}
