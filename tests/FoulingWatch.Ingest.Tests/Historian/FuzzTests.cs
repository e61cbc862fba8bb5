using System.Text;
using FoulingWatch.Fuzz;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using Xunit.Abstractions;

namespace FoulingWatch.Ingest.Tests.Historian;

/// <summary>
/// A short seeded run of the mutation fuzzer (fuzz/FoulingWatch.Fuzz; the long run is one command, see DEVELOPERS.md),
/// and each crash or accounting class it found, reduced to a small reproducer. The checks are the design's own claims:
/// only documented errors, the same result for every part size, read = used + rejected, every line a record.
/// </summary>
public class FuzzTests(ITestOutputHelper output)
{
    [Fact]
    public void A_short_seeded_fuzz_run_finds_no_crash_no_part_size_dependence_and_no_uncounted_row()
    {
        var summary = Fuzzer.Run(inputs: 2500, runSeed: 20261202, workers: 2);
        output.WriteLine($"{summary.Inputs} inputs in {summary.Elapsed.TotalSeconds:F0} s: read {summary.Read}, refused {summary.Refused}");
        foreach (var (kind, n) in summary.RefusalKinds.OrderByDescending(k => k.Value)) output.WriteLine($"  {n,6}  {kind}");
        Assert.True(summary.Failures.Count == 0, string.Join("\n", summary.Failures.Take(10).Select(f => $"#{f.Index} ({f.Seed}): {f.Detail}")));
        // the run reaches both outcomes, and every seed (a fuzzer that only produced refusals would test nothing)
        Assert.True(summary.Read > summary.Inputs / 2, $"read {summary.Read}");
        Assert.True(summary.Refused > 0);
    }

    private static IngestResult? Read(string config, int? partBytes)
    {
        HistorianIngest.PartBytesForTests = partBytes;
        try { return HistorianIngest.Run(PlantConfigurationReader.Load(config)); }
        finally { HistorianIngest.PartBytesForTests = null; }
    }

    private static string Rows(int count, DateTime start, char d = ',')
    {
        var sb = new StringBuilder();
        for (var m = 0; m < count; m++)
            sb.Append(System.Globalization.CultureInfo.InvariantCulture, $"{start.AddMinutes(m):yyyy-MM-ddTHH:mm:ssZ}{d}100.5{d}150{d}90{d}120{d}30{d}60\n");
        return sb.ToString();
    }

    private const string Header = "Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\n";

    // Found by the fuzzer: a lone quote on a line of a long export made the CSV reader run the field on to the file's
    // end (727 lines, 53 records). The long route now balances quotes per line as the wide route does.
    [Fact]
    public void A_stray_quote_in_a_long_export_loses_one_row_not_the_rest()
    {
        var sb = new StringBuilder("Tag,Timestamp,Value,Quality\n");
        for (var m = 0; m < 200; m++)
        {
            if (m == 50) sb.Append("\"\n");
            sb.Append(System.Globalization.CultureInfo.InvariantCulture, $"FI-101,2026-05-04 {m / 60:00}:{m % 60:00}:00+00:00,100.5,Good\n");
        }
        using var plant = new TestPlant().WithFile("long.csv", sb.ToString())
            .WithConfig("""{ "files": ["long.csv"], "layout": "long", "qualityColumn": "Quality" }""", data: "\"interval\": \"10 min\"");
        HistorianIngest.PartBytesForTests = null;
        var r = HistorianIngest.Run(PlantConfigurationReader.Load(plant.ConfigPath), requireAllTags: false);
        Assert.Equal(201, r.Files.Single().DataRows);                 // the quote's line is a record of its own
        Assert.Equal(200, r.TagLedgers["FI-101"].Used);
        Assert.Equal(1, r.RowsOfOtherTags);
    }

    // Found by the fuzzer: a header naming none of the configured tags crashed the in-place route of small parts
    // (an index outside an empty block) where one part gave the documented "not in the data" error.
    [Fact]
    public void A_header_without_configured_tags_gives_the_same_clear_error_for_any_part_size()
    {
        using var plant = new TestPlant().WithFile("none.csv", "Timestamp,A,B,C,D,E,F\n" + Rows(300, new DateTime(2026, 5, 4, 0, 0, 0, DateTimeKind.Utc)))
            .WithConfig("""{ "files": ["none.csv"] }""", data: "\"interval\": \"10 min\"");
        var messages = new int?[] { null, 64, 700 }.Select(size => Assert.Throws<ConfigurationException>(() => Read(plant.ConfigPath, size)).Message).ToList();
        Assert.All(messages, m => Assert.Contains("is not in the data", m));
        Assert.Single(messages.Distinct());
    }

    // Found by the fuzzer: the CSV reader takes bytes FF FE at the start of what it is given for a UTF-16 byte-order
    // mark, so a part that happened to start with a damaged row of those bytes read as nonsense and a row was lost.
    [Theory]
    [InlineData(new byte[] { 0xFF, 0xFE })]
    [InlineData(new byte[] { 0xFE, 0xFF })]
    [InlineData(new byte[] { 0xEF, 0xBB, 0xBF })]
    public void A_row_starting_with_byte_order_mark_bytes_is_one_rejected_row_wherever_the_file_is_cut(byte[] mark)
    {
        var start = new DateTime(2026, 5, 4, 0, 0, 0, DateTimeKind.Utc);
        var text = Encoding.ASCII.GetBytes(Header + "2026-05-04T00:00:00Z,100.5,150,90,120,30,\"60\"\n" + Rows(40, start.AddMinutes(1)));
        var bytes = text.Concat(mark).Concat(Encoding.ASCII.GetBytes("\n" + Rows(40, start.AddMinutes(41)))).ToArray();
        using var plant = new TestPlant().WithConfig("""{ "files": ["bom.csv"] }""", data: "\"interval\": \"10 min\"");
        File.WriteAllBytes(Path.Combine(plant.Directory, "bom.csv"), bytes);
        foreach (var size in new int?[] { null }.Concat(Enumerable.Range(40, 120).Select(i => (int?)i)))
        {
            var r = Read(plant.ConfigPath, size)!;
            Assert.Equal(82, r.Files.Single().DataRows);
            Assert.Equal(81, r.TagLedgers["FI-101"].Used);
            Assert.Equal(1, r.TagLedgers["FI-101"].Rejected[(int)RejectReason.BadTimestamp]);
        }
    }

    // Found by the fuzzer: data dated in year 1 (a generator with an unset start) crashed the in-place route of small
    // parts; they read as one part does.
    [Fact]
    public void Data_in_year_one_read_the_same_in_small_parts()
    {
        using var plant = new TestPlant().WithFile("year1.csv", Header + Rows(300, new DateTime(1, 1, 1, 0, 0, 0, DateTimeKind.Utc)))
            .WithConfig("""{ "files": ["year1.csv"] }""", data: "\"interval\": \"10 min\"");
        var whole = Read(plant.ConfigPath, null)!;
        foreach (var size in new[] { 64, 300, 1000 })
        {
            var parts = Read(plant.ConfigPath, size)!;
            Assert.Equal(whole.TagLedgers["FI-101"].Used, parts.TagLedgers["FI-101"].Used);
            Assert.Equal(whole.IntervalCount, parts.IntervalCount);
        }
        Assert.Equal(300, whole.TagLedgers["FI-101"].Used);
    }

    // Found by the long fuzz run: a quote inside an unquoted field ("120"open…) is a plain character to the CSV reader,
    // but the line-by-line balancing counted it as opening a field that a later stray quote "closed"; the reader then
    // ran that later quote's field on to the end of the file when read in one part (148 of 241 rows), not in small parts.
    [Fact]
    public void A_quote_inside_an_unquoted_field_does_not_pair_with_a_stray_quote_two_lines_on()
    {
        var start = new DateTime(2026, 5, 4, 0, 0, 0, DateTimeKind.Utc);
        var lines = Rows(240, start).Split('\n', StringSplitOptions.RemoveEmptyEntries);
        lines[100] = lines[100].Replace(",100.5,", ",100\"open.5,");
        lines[102] = lines[102].Replace(",150,", ",\"open150,");
        using var plant = new TestPlant().WithFile("quotes.csv", Header + string.Join("\n", lines) + "\n")
            .WithConfig("""{ "files": ["quotes.csv"] }""", data: "\"interval\": \"10 min\"");
        foreach (var size in new int?[] { null, 300, 4096 })
        {
            var r = Read(plant.ConfigPath, size)!;
            Assert.Equal(240, r.Files.Single().DataRows);
            Assert.Equal(239, r.TagLedgers["FI-101"].Used);
            Assert.Equal(239, r.TagLedgers["TI-101"].Used);
            Assert.Equal(240, r.TagLedgers["TI-102"].Used);
        }
    }
}
