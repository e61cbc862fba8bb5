using System.Globalization;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

public class HistorianIngestTests
{
    private static IngestResult Ingest(TestPlant plant) => HistorianIngest.Run(PlantConfigurationReader.Load(plant.ConfigPath));

    private static void AssertLedgersBalance(IngestResult r)
    {
        foreach (var l in r.TagLedgers.Values)
        {
            Assert.Equal(l.Read, l.Used + l.RejectedTotal);
            Assert.Equal(r.IntervalCount, l.IntervalsWithData + l.IntervalsBridged + l.IntervalsMissing);
        }
    }

    private static long Rejected(TagLedger l, RejectReason r) => l.Rejected[(int)r];

    [Fact]
    public void Every_artefact_in_a_wide_export_is_counted_with_its_reason()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }");
        var r = Ingest(plant);
        var flow = r.TagLedgers["FI-101"];
        Assert.Equal(10, flow.Read);
        Assert.Equal(4, flow.Used);
        Assert.Equal(1, Rejected(flow, RejectReason.TextMarker));
        Assert.Equal(1, Rejected(flow, RejectReason.Empty));
        Assert.Equal(1, Rejected(flow, RejectReason.NotANumber));
        Assert.Equal(1, Rejected(flow, RejectReason.Duplicate));
        Assert.Equal(1, Rejected(flow, RejectReason.OutOfRange));
        Assert.Equal(1, Rejected(flow, RejectReason.BadTimestamp));
        Assert.Equal(1, flow.Markers["no reading"]);
        Assert.Equal(1, r.TagLedgers["TI-101"].Markers["link lost"]);
        AssertLedgersBalance(r);
        var report = Assert.Single(r.Files);
        Assert.Equal(10, report.DataRows);
        Assert.Equal(',', report.Delimiter);
    }

    [Fact]
    public void Rejection_examples_name_file_line_and_column()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }");
        var flow = Ingest(plant).TagLedgers["FI-101"];
        Assert.Contains("wide-artefacts.csv: line 6, column 2 (FI-101): '12x3' is not a number; the value is counted as rejected. Check the source's decimal and delimiter settings, or how the historian exports this tag.", flow.Examples);
        Assert.Contains("wide-artefacts.csv: line 4, column 2 (FI-101): 'no reading' is text where a value belongs; the value is counted as rejected and the text tallied.", flow.Examples);
    }

    [Fact]
    public void Out_of_order_rows_land_in_their_interval_and_short_gaps_only_are_bridged()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }");
        var r = Ingest(plant);
        Assert.Equal(new DateTimeOffset(2025, 1, 1, 0, 0, 0, TimeSpan.Zero), r.GridStart);
        Assert.Equal(8, r.IntervalCount); // 00:00 … 01:10
        var flow = r.Series["FI-101"];
        Assert.Equal(125 / 3.6, flow[5], 9); // the 00:50 row came after 01:00 in the file
        Assert.True(double.IsNaN(flow[2]) && double.IsNaN(flow[3]) && double.IsNaN(flow[4])); // 40 min gap > 30 min default
        var l = r.TagLedgers["FI-101"];
        Assert.Equal((4, 0, 4), (l.IntervalsWithData, l.IntervalsBridged, l.IntervalsMissing));
    }

    [Fact]
    public void A_gap_within_the_maximum_is_bridged_linearly()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv")
            .WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }", data: "\"interval\": \"10 min\", \"maxGap\": \"40 min\"");
        var r = Ingest(plant);
        var flow = r.Series["FI-101"];
        Assert.Equal((121 + (125 - 121) * 1.0 / 4) / 3.6, flow[2], 9);
        Assert.Equal(3, r.TagLedgers["FI-101"].IntervalsBridged);
        AssertLedgersBalance(r);
    }

    [Fact]
    public void A_windows_1252_semicolon_export_with_preamble_unit_row_and_decimal_comma_is_read()
    {
        using var plant = new TestPlant().WithFixture("wide-1252-semicolon.csv")
            .WithConfig("{ \"files\": [\"wide-1252-semicolon.csv\"], \"timestamp\": { \"format\": \"dd.MM.yyyy HH:mm:ss\" } }", timeZone: "Europe/Amsterdam");
        var r = Ingest(plant);
        var f = Assert.Single(r.Files);
        Assert.Equal((';', ',', 4, 1), (f.Delimiter, f.DecimalSeparator, f.HeaderLine, f.MetadataRows));
        Assert.StartsWith("windows-1252", f.Encoding);
        Assert.Equal(3, f.DataRows);
        // 1 Feb 2025 00:00 in Amsterdam is 31 Jan 23:00 UTC (CET, UTC+1), by the tz database.
        Assert.Equal(new DateTimeOffset(2025, 1, 31, 23, 0, 0, TimeSpan.Zero), r.GridStart);
        Assert.Equal(120.5 / 3.6, r.Series["FI-101"][0], 9);
        Assert.Equal(250.0 + 273.15, r.Series["TI-101"][0], 9);
        Assert.Equal(1, r.TagLedgers["FI-101"].Markers["no reading"]);
        AssertLedgersBalance(r);
    }

    [Fact]
    public void Ingest_is_the_same_under_a_decimal_comma_culture()
    {
        var saved = CultureInfo.CurrentCulture;
        try
        {
            using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }");
            CultureInfo.CurrentCulture = CultureInfo.InvariantCulture;
            var a = Ingest(plant);
            CultureInfo.CurrentCulture = new CultureInfo("de-DE");
            var b = Ingest(plant);
            Assert.Equal(a.Series["FI-101"], b.Series["FI-101"]);
            Assert.Equal(a.TagLedgers["FI-101"].Used, b.TagLedgers["FI-101"].Used);
        }
        finally { CultureInfo.CurrentCulture = saved; }
    }

    [Fact]
    public void A_long_export_honours_quality_and_offsets_and_counts_other_tags()
    {
        using var plant = new TestPlant().WithFixture("long-quality.csv").WithFixture("wide-artefacts.csv");
        plant.WithConfig("""
            { "id": "wide", "files": ["wide-artefacts.csv"] },
            { "id": "lab", "files": ["long-quality.csv"], "layout": "long", "qualityColumn": "Quality" }
            """, TestPlant.Interchanger()
                .Replace("\"tag\": \"FI-101\"", "\"tag\": \"FI-101\", \"source\": \"lab\"")
                .Replace("\"tag\": \"TI-101\"", "\"tag\": \"TI-101\", \"source\": \"lab\""),
            data: "\"interval\": \"10 min\", \"window\": { \"start\": \"2025-02-28T23:00:00Z\", \"end\": \"2025-03-01T00:00:00Z\" }");
        var r = Ingest(plant);
        var flow = r.TagLedgers["FI-101"];
        Assert.Equal((3, 1), (flow.Read, flow.Used));
        Assert.Equal(1, Rejected(flow, RejectReason.BadQuality));
        Assert.Equal(1, Rejected(flow, RejectReason.Duplicate));
        Assert.Equal(2, r.TagLedgers["TI-101"].Used);
        Assert.Equal(201.5 + 273.15, r.Series["TI-101"][1], 9);
        Assert.Equal(1, r.RowsOfOtherTags);
        // the wide file lies outside the window: every value of its tags is counted so
        Assert.Equal(r.TagLedgers["FI-201"].Read, Rejected(r.TagLedgers["FI-201"], RejectReason.OutsideWindow) + Rejected(r.TagLedgers["FI-201"], RejectReason.BadTimestamp));
        AssertLedgersBalance(r);
    }

    // Reference: the IANA time-zone database through TimeZoneInfo (Europe/Amsterdam: 03:00 → 02:00 on 26 October 2025).
    // A long export sorted by tag runs through the repeated hour once per tag: every tag gets both passes (daylight, then
    // standard time), none is counted as a duplicate, and the six readings land in six distinct UTC half-hours.
    [Fact]
    public void A_long_export_sorted_by_tag_reads_the_repeated_autumn_hour_right_for_every_tag()
    {
        using var plant = new TestPlant().WithFixture("long-by-tag-dst.csv");
        plant.WithConfig("""{ "id": "lab", "files": ["long-by-tag-dst.csv"], "layout": "long" }""", timeZone: "Europe/Amsterdam",
            data: "\"interval\": \"30 min\", \"maxGap\": \"0 min\"");
        var r = Ingest(plant);
        foreach (var tag in new[] { "FI-101", "TI-101", "TI-102", "FI-201", "TI-201", "TI-202" })
        {
            var l = r.TagLedgers[tag];
            Assert.Equal((6, 6), (l.Read, l.Used));
            Assert.Equal(0, Rejected(l, RejectReason.Duplicate));
        }
        var file = Assert.Single(r.Files);
        Assert.Equal((12, 12), (file.AmbiguousLocalTimesAsDaylight, file.AmbiguousLocalTimesAsStandard));
        // 01:30 CEST = 23:30Z … 03:00 CET = 02:00Z: six half-hours 23:30Z to 02:00Z, each holding one reading
        var first = (int)((new DateTimeOffset(2025, 10, 25, 23, 30, 0, TimeSpan.Zero) - r.GridStart).Ticks / r.Interval.Ticks);
        var kelvin = Enumerable.Range(first, 6).Select(k => Math.Round(r.Series["TI-101"][k] - 273.15, 9));
        Assert.Equal([201.0, 202, 203, 204, 205, 206], kelvin);
    }

    // Reference: the IANA time-zone database through TimeZoneInfo. Europe/Amsterdam 2025: clocks go 02:00 → 03:00 on
    // 30 March and 03:00 → 02:00 on 26 October.
    [Fact]
    public void Local_times_follow_the_daylight_saving_rules_of_the_time_zone_database()
    {
        using var plant = new TestPlant().WithFixture("local-dst.csv")
            .WithConfig("{ \"files\": [\"local-dst.csv\"] }", timeZone: "Europe/Amsterdam", data: "\"interval\": \"30 min\", \"maxGap\": \"0 min\"");
        var config = PlantConfigurationReader.Load(plant.ConfigPath);
        var r = HistorianIngest.Run(config);
        var flow = r.TagLedgers["FI-101"];
        Assert.Equal(2, Rejected(flow, RejectReason.NonexistentLocalTime));
        Assert.Equal(10, flow.Used);
        Assert.Equal(0, Rejected(flow, RejectReason.Duplicate));
        var file = Assert.Single(r.Files);
        Assert.Equal((2, 2), (file.AmbiguousLocalTimesAsDaylight, file.AmbiguousLocalTimesAsStandard));

        var zone = TimeZoneInfo.FindSystemTimeZoneById("Europe/Amsterdam");
        DateTimeOffset Utc(int month, int day, int h, int m, TimeSpan offset) => new(2025, month, day, h, m, 0, offset);
        var expected = new[]
        {
            Utc(3, 30, 1, 0, zone.GetUtcOffset(new DateTime(2025, 3, 30, 1, 0, 0))),
            Utc(3, 30, 3, 0, zone.GetUtcOffset(new DateTime(2025, 3, 30, 3, 0, 0))),
            Utc(10, 26, 2, 0, TimeSpan.FromHours(2)), // first 02:00 is daylight time
            Utc(10, 26, 2, 0, TimeSpan.FromHours(1)), // the repeated 02:00 is standard time
            Utc(10, 26, 3, 0, zone.GetUtcOffset(new DateTime(2025, 10, 26, 3, 0, 0))),
        };
        Assert.True(zone.IsAmbiguousTime(new DateTime(2025, 10, 26, 2, 0, 0)));
        Assert.True(zone.IsInvalidTime(new DateTime(2025, 3, 30, 2, 30, 0)));
        foreach (var t in expected)
        {
            var k = (int)((t - r.GridStart).Ticks / r.Interval.Ticks);
            Assert.False(double.IsNaN(r.Series["FI-101"][k]), $"no value at {t:u}");
        }
        AssertLedgersBalance(r);
    }

    // Spreadsheet serial dates count days from 1899-12-30 (the 1900 date system with its leap-year quirk absorbed):
    // 45658 is 2025-01-01 (common practice; from memory, confirmed by DateTime.FromOADate which uses the same epoch).
    [Fact]
    public void Spreadsheet_serial_dates_are_read()
    {
        using var plant = new TestPlant().WithFixture("serial-dates.csv")
            .WithConfig("{ \"files\": [\"serial-dates.csv\"], \"timestamp\": { \"format\": \"serial\" } }", data: "\"interval\": \"6 h\"");
        var r = HistorianIngest.Run(PlantConfigurationReader.Load(plant.ConfigPath));
        Assert.Equal(new DateTimeOffset(DateTime.FromOADate(45658), TimeSpan.Zero), r.GridStart);
        Assert.Equal(new DateTimeOffset(2025, 1, 1, 0, 0, 0, TimeSpan.Zero), r.GridStart);
        Assert.Equal(10 / 3.6, r.Series["FI-101"][0], 9);
        Assert.Equal(20 / 3.6, r.Series["FI-101"][2], 9);  // 12:00
        Assert.Equal(30 / 3.6, r.Series["FI-101"][5], 9);  // next day 06:00
    }

    [Fact]
    public void A_tag_missing_from_the_data_names_the_key_and_the_files()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv")
            .WithConfig("{ \"files\": [\"wide-artefacts.csv\"] }", TestPlant.Interchanger().Replace("TI-202", "TI-299"));
        var ex = Assert.Throws<ConfigurationException>(() => Ingest(plant));
        var e = Assert.Single(ex.Errors);
        Assert.Equal("exchangers[0].cold.outlet.tag", e.Path);
        Assert.Equal("'TI-299' is not in the data: no column or row of that tag in wide-artefacts.csv. Check the tag name against the export header.", e.Message);
    }

    // Source: RFC 4180 §2 rules 5–7: fields may be enclosed in double quotes; quoted fields may hold commas and line
    // breaks; a double quote inside a quoted field is escaped by another double quote.
    [Fact]
    public void Quoted_fields_follow_RFC_4180()
    {
        var csv = "Timestamp,Note,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\r\n" +
                  "2025-01-01T00:00:00Z,\"aaa\",\"120\",250,180,90,40,95\r\n" +
                  "2025-01-01T00:10:00Z,\"b\"\"bb, with a comma\",121,251,181,91,41,96\r\n" +
                  "2025-01-01T00:20:00Z,\"two\r\nlines\",122,252,182,92,42,97\r\n";
        using var plant = new TestPlant().WithFile("quoted.csv", csv).WithConfig("{ \"files\": [\"quoted.csv\"] }");
        var r = Ingest(plant);
        Assert.Equal(3, Assert.Single(r.Files).DataRows);
        Assert.Equal(3, r.TagLedgers["FI-101"].Used);
        Assert.Equal(122 / 3.6, r.Series["FI-101"][2], 9);
        Assert.Equal(["aaa", "b\"bb, with a comma", "ccc"], FileDialectDetector.SplitLine("\"aaa\",\"b\"\"bb, with a comma\",\"ccc\"", ','));
    }

    [Fact]
    public void Overlapping_monthly_exports_are_deduplicated()
    {
        var header = "Timestamp,FI-101,TI-101,TI-102,FI-201,TI-201,TI-202\n";
        string Row(int min) => $"2025-01-01T00:{min:00}:00Z,{100 + min},250,180,90,40,95\n";
        using var plant = new TestPlant()
            .WithFile("export-01.csv", header + Row(0) + Row(10) + Row(20))
            .WithFile("export-02.csv", header + Row(20) + Row(30))
            .WithConfig("{ \"files\": [\"export-*.csv\"] }");
        var r = Ingest(plant);
        var flow = r.TagLedgers["FI-101"];
        Assert.Equal((5, 4, 1L), (flow.Read, flow.Used, Rejected(flow, RejectReason.Duplicate)));
        Assert.Equal(120 / 3.6, r.Series["FI-101"][2], 9);
    }

    [Fact]
    public void A_decimal_comma_set_for_a_comma_delimited_export_names_the_file_line_and_key()
    {
        using var plant = new TestPlant().WithFixture("wide-artefacts.csv").WithConfig("{ \"files\": [\"wide-artefacts.csv\"], \"decimal\": \",\" }");
        var ex = Assert.Throws<IngestException>(() => HistorianIngest.Run(PlantConfigurationReader.Load(plant.ConfigPath)));
        Assert.Equal("wide-artefacts.csv: line 1: the fields are split by ',', which data.sources[0].decimal also names as the decimal separator; set data.sources[0].delimiter to the export's delimiter (\";\", \"\\t\" or \"|\").", ex.Message);
    }
}
