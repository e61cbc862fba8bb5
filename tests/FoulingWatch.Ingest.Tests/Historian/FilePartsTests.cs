using System.Text;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

/// <summary>
/// A wide export is cut into parts that the cores read at once and that are merged in file order. Whatever the
/// part size, the ledgers (counts, markers, examples with their lines) and the file reports must be exactly those
/// of one part holding the whole file, and the interval means the same to rounding (a mean over an interval cut by
/// a part boundary is summed in two pieces). Analytic reference: a single in-order pass over the file.
/// </summary>
public class FilePartsTests
{
    private static IngestResult Read(string configPath, int? partBytes, bool plainRoute = true)
    {
        HistorianIngest.PartBytesForTests = partBytes;
        HistorianIngest.PlainRouteOffForTests = !plainRoute;
        try { return HistorianIngest.Run(PlantConfigurationReader.Load(configPath)); }
        finally { HistorianIngest.PartBytesForTests = null; HistorianIngest.PlainRouteOffForTests = false; }
    }

    /// <summary>
    /// An export with what plain text can hold besides plain numbers: blank lines, a line of blanks, short and long
    /// records, a trailing delimiter, padded values, exponents, long digit strings, signs, markers, empty fields,
    /// out-of-range readings, unreadable timestamps, duplicates, the timestamp in the second column, and one quoted
    /// record (its part goes to the CSV reader); the last record with or without a line break after it.
    /// </summary>
    private static string Awkward(string newline, char delimiter, char separator, bool finalBreak)
    {
        var rng = new Random(11);
        string N(double v, string format) => v.ToString(format, System.Globalization.CultureInfo.InvariantCulture).Replace('.', separator);
        var d = delimiter;
        var sb = new StringBuilder($"Note{d}Timestamp{d}FI-101{d}TI-101{d}TI-102{d}FI-201{d}TI-201{d}TI-202{newline}");
        var start = new DateTime(2026, 3, 2, 0, 0, 0, DateTimeKind.Utc);
        for (var m = 0; m < 600; m++)
        {
            var ts = m % 97 == 5 ? "2026-03-02 25:00" : start.AddMinutes(m % 211 == 7 ? m - 3 : m).ToString("yyyy-MM-ddTHH:mm:ssZ", System.Globalization.CultureInfo.InvariantCulture);
            var flow = (m % 13) switch
            {
                1 => "no reading", 2 => "", 3 => " " + N(100 + rng.NextDouble(), "0.00") + " ", 4 => N(1.05, "0.00") + "e2", 5 => "0000000000000000000101" + separator + "5",
                6 => "+" + N(99.5, "0.0"), 7 => "-" + N(5, "0.0"), 8 => "link lost", 9 => N(100, "0") + separator, _ => N(100 + 10 * rng.NextDouble(), "0.000"),
            };
            string[] fields = [m % 50 == 0 ? "shift change" : "", ts, flow, N(250 + rng.NextDouble(), "0.00"), N(m % 41 == 0 ? 9999 : 180 + rng.NextDouble(), "0.0"),
                N(90 + rng.NextDouble(), "0.00"), N(40 + rng.NextDouble(), "0.00"), N(95 + rng.NextDouble(), "0.00")];
            var record = m % 37 == 3 ? string.Join(d, fields.Take(5)) // short: the last three fields missing
                : m % 43 == 4 ? string.Join(d, fields) + d + "extra" + d + "1" // long: extra fields ignored
                : m % 29 == 6 ? string.Join(d, fields) + d // trailing delimiter
                : string.Join(d, fields);
            if (m == 301) record = "\"quoted" + d + " note\"" + record; // a quote: this record's part goes to the CSV reader
            sb.Append(record).Append(newline);
            if (m % 53 == 9) sb.Append(newline); // a blank line
            if (m % 89 == 10) sb.Append("   ").Append(newline); // a line of blanks is a record of one field
        }
        return finalBreak ? sb.ToString() : sb.ToString().TrimEnd('\r', '\n');
    }

    [Theory]
    [InlineData("\n", ',', '.', true)]
    [InlineData("\n", ',', '.', false)]
    [InlineData("\r\n", ',', '.', true)]
    [InlineData("\r\n", ';', ',', true)]
    [InlineData("\r\n", ';', ',', false)]
    [InlineData("\n", '\t', '.', true)]
    public void Plain_parts_read_in_place_give_what_the_csv_reader_gives(string newline, char delimiter, char separator, bool finalBreak)
    {
        // Reference: the CSV reader (RFC 4180 rules) on the same parts; the plain route must be taken for most of them.
        var source = $$"""{ "files": ["awkward.csv"], "delimiter": "{{(delimiter == '\t' ? "\\t" : delimiter.ToString())}}", "decimal": "{{separator}}", "timestamp": { "column": "Timestamp" } }""";
        using var plant = new TestPlant().WithFile("awkward.csv", Awkward(newline, delimiter, separator, finalBreak))
            .WithConfig(source, data: "\"interval\": \"10 min\"");
        foreach (var size in new[] { 64, 300, 2000 })
        {
            HistorianIngest.PlainPartsRead = 0;
            var csv = Read(plant.ConfigPath, size, plainRoute: false);
            Assert.Equal(0, HistorianIngest.PlainPartsRead);
            var plain = Read(plant.ConfigPath, size);
            Assert.True(HistorianIngest.PlainPartsRead > 10, $"parts of {size} bytes: {HistorianIngest.PlainPartsRead} read by the plain route");
            AssertSame(csv, plain);
            var flow = plain.TagLedgers["FI-101"];
            Assert.Equal(flow.Read, flow.Used + flow.RejectedTotal);
            Assert.True(flow.Rejected[(int)RejectReason.TextMarker] > 0 && flow.Rejected[(int)RejectReason.Empty] > 0 && flow.Rejected[(int)RejectReason.BadTimestamp] > 0
                && flow.Rejected[(int)RejectReason.Duplicate] > 0 && plain.TagLedgers["TI-102"].Rejected[(int)RejectReason.OutOfRange] > 0, "every kind of rejection occurs");
        }
    }

    // A stray quote opening a field (a damaged value, '"150') must not swallow the rows after it into one field up to
    // the next quote: every row is read, the damaged value alone is rejected (as text) and counted, whatever the part size.
    [Theory]
    [InlineData(false)]
    [InlineData(true)]
    public void A_stray_quote_loses_one_value_not_the_rows_after_it(bool laterQuotedRecord)
    {
        var sb = new StringBuilder("Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\n");
        var start = new DateTime(2026, 3, 2, 0, 0, 0, DateTimeKind.Utc);
        for (var m = 0; m < 2880; m++)
        {
            var t = start.AddMinutes(m).ToString("yyyy-MM-ddTHH:mm:ssZ", System.Globalization.CultureInfo.InvariantCulture);
            var hot = m == 10 ? "\"150.5" : "150.5";
            var note = laterQuotedRecord && m == 2000 ? ",\"a, quoted note\"" : "";
            sb.Append(System.Globalization.CultureInfo.InvariantCulture, $"{t},100.{m % 10},{hot},90.1,120.2,30.3,60.4{note}\n");
        }
        using var plant = new TestPlant().WithFile("stray.csv", sb.ToString())
            .WithConfig("""{ "files": ["stray.csv"], "timestamp": { "column": "Timestamp" } }""", data: "\"interval\": \"10 min\"");
        var whole = Read(plant.ConfigPath, null);
        Assert.Equal(2880, whole.Files.Single().DataRows);
        var ti = whole.TagLedgers["TI-101"];
        Assert.Equal(2880, ti.Read);
        Assert.Equal(2879, ti.Used);
        Assert.Equal(1, ti.Rejected[(int)RejectReason.TextMarker]);
        Assert.Equal(2880, whole.TagLedgers["TI-102"].Used);
        foreach (var size in new[] { 100, 4096 }) AssertSame(whole, Read(plant.ConfigPath, size));
    }

    // A tag in two header columns would be merged and counted twice: the export is refused with both columns named.
    [Fact]
    public void A_tag_in_two_header_columns_is_refused_naming_both()
    {
        var csv = "Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202,TI-101\n2026-03-02T00:00:00Z,100,150,90,120,30,60,151\n";
        using var plant = new TestPlant().WithFile("twice.csv", csv)
            .WithConfig("""{ "files": ["twice.csv"] }""", data: "\"interval\": \"10 min\"");
        var ex = Assert.Throws<IngestException>(() => Read(plant.ConfigPath, null));
        Assert.Contains("twice.csv", ex.Message);
        Assert.Contains("the header has tag 'TI-101' in columns 3 and 8; a tag must have one column.", ex.Message);
    }

    // An empty line between the header and the data is skipped, not taken for a unit row: the first data row is read.
    [Theory]
    [InlineData("\n")]
    [InlineData("\r\n")]
    public void An_empty_line_after_the_header_is_not_a_unit_row(string newline)
    {
        var sb = new StringBuilder("Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202" + newline + newline);
        for (var m = 0; m < 288; m++)
            sb.Append(System.Globalization.CultureInfo.InvariantCulture,
                $"{new DateTime(2026, 3, 2, 0, 0, 0, DateTimeKind.Utc).AddMinutes(10 * m):yyyy-MM-ddTHH:mm:ssZ},{100 + m % 7},150,90,120,30,60{newline}");
        using var plant = new TestPlant().WithFile("blank.csv", sb.ToString())
            .WithConfig("""{ "files": ["blank.csv"] }""", data: "\"interval\": \"10 min\"");
        var r = Read(plant.ConfigPath, null);
        var file = r.Files.Single();
        Assert.Equal((0, 288L), (file.MetadataRows, (long)file.DataRows));
        Assert.Equal(288, r.TagLedgers["FI-101"].Used);
        Assert.Equal(100, r.Series["FI-101"][0] * 3.6, 9);
    }

    [Theory]
    [InlineData("1,2\n3,4\n", true)]
    [InlineData("1,2\r\n3,4\r\n", true)]
    [InlineData("1,2\r3,4\n", false)]      // a lone CR is a line break to the CSV reader
    [InlineData("1,2\r\n3,4\r\r\n", false)]
    [InlineData("1,\"2\"\n", false)]
    [InlineData("1,2\r\n\"3\",4\n", false)]
    public void A_part_is_plain_without_quotes_and_lone_carriage_returns(string text, bool plain)
    {
        Assert.Equal(text.Length, HistorianIngest.RecordsEnd(Encoding.ASCII.GetBytes(text), out _, out var found));
        Assert.Equal(plain, found);
    }

    /// <summary>The definition, byte by byte: no quote, and every CR followed by LF.</summary>
    private static bool IsPlain(byte[] d, int n) =>
        !d.Take(n).Contains((byte)'"') && Enumerable.Range(0, n).All(i => d[i] != '\r' || (i + 1 < n && d[i + 1] == '\n'));

    private static void AssertSame(IngestResult whole, IngestResult parts)
    {
        Assert.Equal(whole.GridStart, parts.GridStart);
        Assert.Equal(whole.IntervalCount, parts.IntervalCount);
        foreach (var (tag, a) in whole.TagLedgers)
        {
            var b = parts.TagLedgers[tag];
            Assert.Equal((a.Read, a.Used), (b.Read, b.Used));
            Assert.Equal(a.Rejected, b.Rejected);
            Assert.Equal(a.Markers, b.Markers);
            Assert.Equal(a.Examples, b.Examples);
            Assert.Equal((a.IntervalsWithData, a.IntervalsBridged, a.IntervalsMissing), (b.IntervalsWithData, b.IntervalsBridged, b.IntervalsMissing));
            var (x, y) = (whole.Series[tag], parts.Series[tag]);
            for (var k = 0; k < x.Length; k++)
                if (double.IsNaN(x[k])) Assert.True(double.IsNaN(y[k]), $"{tag}[{k}]");
                else Assert.True(Math.Abs(x[k] - y[k]) <= 1e-12 * Math.Abs(x[k]), $"{tag}[{k}]: {x[k]:R} vs {y[k]:R}");
        }
        Assert.Equal(whole.Files.Select(f => (f.DataRows, f.AmbiguousLocalTimesAsDaylight, f.AmbiguousLocalTimesAsStandard)),
            parts.Files.Select(f => (f.DataRows, f.AmbiguousLocalTimesAsDaylight, f.AmbiguousLocalTimesAsStandard)));
    }

    [Theory]
    [InlineData("wide-artefacts.csv", "{ \"files\": [\"wide-artefacts.csv\"] }", "UTC", "\"interval\": \"10 min\"")]
    [InlineData("local-dst.csv", "{ \"files\": [\"local-dst.csv\"] }", "Europe/Amsterdam", "\"interval\": \"30 min\", \"maxGap\": \"0 min\"")]
    [InlineData("wide-1252-semicolon.csv", "{ \"files\": [\"wide-1252-semicolon.csv\"], \"timestamp\": { \"format\": \"dd.MM.yyyy HH:mm:ss\" } }", "Europe/Amsterdam", "\"interval\": \"10 min\"")]
    [InlineData("serial-dates.csv", "{ \"files\": [\"serial-dates.csv\"], \"timestamp\": { \"format\": \"serial\" } }", "UTC", "\"interval\": \"6 h\"")]
    public void Every_fixture_reads_the_same_in_parts_of_any_size(string fixture, string source, string zone, string data)
    {
        using var plant = new TestPlant().WithFixture(fixture).WithConfig(source, timeZone: zone, data: data);
        var whole = Read(plant.ConfigPath, null);
        foreach (var size in new[] { 16, 64, 200, 1000 })
            AssertSame(whole, Read(plant.ConfigPath, size));
    }

    [Fact]
    public void Duplicates_across_parts_quoted_line_breaks_and_the_repeated_hour_read_as_in_one_pass()
    {
        // Two days at 5 min in local time over the autumn change, every 7th row quoted with a line break in a quoted
        // note column, a block of rows exported twice further down (duplicates in another part), markers and blanks.
        var sb = new StringBuilder("Timestamp,Note,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\n");
        var start = new DateTime(2025, 10, 25, 12, 0, 0);
        var rng = new Random(5);
        var lines = new List<string>();
        for (var m = 0; m < 2 * 24 * 12; m++)
        {
            var local = start.AddMinutes(5 * m);
            var note = m % 7 == 0 ? "\"operator note,\nsecond line \"\"quoted\"\"\"" : "";
            var reading = m % 31 == 0 ? "no reading" : m % 37 == 0 ? "" : (100 + 10 * rng.NextDouble()).ToString("0.000", System.Globalization.CultureInfo.InvariantCulture);
            lines.Add($"{local:yyyy-MM-dd HH:mm},{note},{reading},{250 + rng.NextDouble():0.00}, {180 + rng.NextDouble():0.00} ,{90 + rng.NextDouble():0.0},{40 + rng.NextDouble():0.00},{95 + rng.NextDouble():0.00}");
        }
        // The autumn hour 02:00-03:00 on 26 October appears twice in a local-time export: as written by the clock.
        var repeated = lines.Where(l => l.StartsWith("2025-10-26 02:", StringComparison.Ordinal)).ToList();
        var at = lines.FindIndex(l => l.StartsWith("2025-10-26 03:00", StringComparison.Ordinal));
        lines.InsertRange(at, repeated);
        lines.AddRange(lines.Skip(100).Take(40)); // exported twice: duplicates of rows far back
        foreach (var l in lines) sb.Append(l).Append('\n');
        using var plant = new TestPlant().WithFile("dup-dst.csv", sb.ToString())
            .WithConfig("{ \"files\": [\"dup-dst.csv\"] }", timeZone: "Europe/Amsterdam", data: "\"interval\": \"15 min\"");
        var whole = Read(plant.ConfigPath, null);
        var flow = whole.TagLedgers["FI-101"];
        Assert.Equal(40, flow.Rejected[(int)RejectReason.Duplicate]);
        Assert.True(whole.Files[0].AmbiguousLocalTimesAsStandard == 12 && whole.Files[0].AmbiguousLocalTimesAsDaylight >= 12);
        Assert.Equal(flow.Read, flow.Used + flow.RejectedTotal);
        foreach (var size in new[] { 100, 700, 4096 })
            AssertSame(whole, Read(plant.ConfigPath, size));
    }

    [Fact]
    public void Line_breaks_and_quotes_are_counted_as_one_by_one()
    {
        // Reference: counting byte by byte (a break is LF, or CR not followed by LF); lengths around the vector width,
        // random bytes rich in LF, CR, CRLF and quotes.
        var rng = new Random(3);
        static int Breaks(byte[] d, int n) => Enumerable.Range(0, n).Count(i => d[i] == '\n' || (d[i] == '\r' && (i + 1 == n || d[i + 1] != '\n')));
        for (var length = 0; length < 300; length++)
        {
            var data = Enumerable.Range(0, length).Select(_ => "\n\"a,1\r\r"[rng.Next(7)]).Select(c => (byte)c).ToArray();
            var (breaks, quotes, _) = HistorianIngest.CountBreaksAndQuotes(data);
            Assert.Equal((Breaks(data, data.Length), data.Count(b => b == '"')), (breaks, quotes));
            var end = HistorianIngest.RecordsEnd(data, out var lines, out var plain);
            if (end < 0) continue;
            Assert.Equal(Breaks(data, end), lines);
            // Plain when found so is plain by definition (unsure is allowed only when a quote had to be stepped over).
            if (plain) Assert.True(IsPlain(data, end), $"length {length}: run of {end} called plain");
            else if (data.Take(end).Count(b => b == '"') == 0) Assert.False(IsPlain(data, end) && !data.Skip(end).Contains((byte)'"'), $"length {length}: plain run of {end} not found plain");
            Assert.True(data[end - 1] == '\n' || (data[end - 1] == '\r' && end < data.Length && data[end] != '\n'), $"length {length}: the run ends at {end}, not after a line break");
            Assert.Equal(0, data.Take(end).Count(b => b == '"') % 2);
        }
    }

    [Theory]
    [InlineData("\r")]     // classic Mac line ends only
    [InlineData("mixed")]  // mostly LF, some records ended by a lone CR, some by CRLF
    public void Lone_carriage_returns_end_records_in_parts_as_in_one_pass(string ends)
    {
        // Reference: the CSV reader over the whole file in one part (a lone CR ends a record; line numbers count it).
        var rng = new Random(17);
        var sb = new StringBuilder("Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202");
        var start = new DateTime(2026, 5, 4, 0, 0, 0, DateTimeKind.Utc);
        for (var m = 0; m < 400; m++)
        {
            sb.Append(ends == "\r" ? "\r" : (m % 7) switch { 2 => "\r", 5 => "\r\n", _ => "\n" });
            var flow = m > 300 && m % 11 == 4 ? "no reading" : (100 + rng.NextDouble()).ToString("0.00", System.Globalization.CultureInfo.InvariantCulture);
            sb.Append(System.Globalization.CultureInfo.InvariantCulture,
                $"{start.AddMinutes(m):yyyy-MM-ddTHH:mm:ssZ},{flow},{250 + rng.NextDouble():0.00},{180 + rng.NextDouble():0.00},{90 + rng.NextDouble():0.00},{40 + rng.NextDouble():0.00},{95 + rng.NextDouble():0.00}");
        }
        sb.Append('\r');
        using var plant = new TestPlant().WithFile("cr.csv", sb.ToString()).WithConfig("{ \"files\": [\"cr.csv\"] }", data: "\"interval\": \"10 min\"");
        var whole = Read(plant.ConfigPath, null);
        var flowLedger = whole.TagLedgers["FI-101"];
        // The markers are far into the file, so their examples' line numbers depend on every part's count of lines.
        Assert.Equal((400, 9), (flowLedger.Read, flowLedger.Rejected[(int)RejectReason.TextMarker]));
        Assert.Contains(flowLedger.Examples, e => e.Contains("line 303", StringComparison.Ordinal));
        foreach (var size in new[] { 64, 300, 2000 })
        {
            HistorianIngest.PartsRead = 0;
            AssertSame(whole, Read(plant.ConfigPath, size));
            // Cut into parts like any other export: memory does not grow with the file.
            Assert.True(HistorianIngest.PartsRead >= sb.Length / (2 * size), $"parts of {size} bytes: {HistorianIngest.PartsRead} parts");
        }
    }

    [Theory]
    [InlineData("a,b\n1,2\n", 8)]
    [InlineData("a,b\r1,2\r3", 8)]
    [InlineData("a,b\r1,2\r", 4)]       // a CR at the end may be the first half of a CRLF still to be read
    [InlineData("a,b\r\n1,2\r\n", 10)]
    [InlineData("a,b\n1,2", 4)]
    [InlineData("a,\"x\ny\"\n1,2\n", 12)]
    [InlineData("a,\"x\ny\"\n1,\"2\n", 8)]
    [InlineData("\"only\nquoted", -1)]
    [InlineData("no line break", -1)]
    public void Parts_end_at_a_line_break_outside_quotes(string text, int expected) =>
        Assert.Equal(expected, HistorianIngest.RecordsEnd(Encoding.ASCII.GetBytes(text)));
}
