using System.Text;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

public class TimestampParserTests
{
    private static (TimestampOutcome, DateTimeOffset) Parse(string text, string zone = "UTC", string? format = null)
    {
        var p = new TimestampParser(new TimestampSettings(null, format, false), TimeZoneInfo.FindSystemTimeZoneById(zone));
        var outcome = p.Parse(Encoding.UTF8.GetBytes(text), out var ticks);
        return (outcome, new DateTimeOffset(ticks, TimeSpan.Zero));
    }

    // Source: ISO 8601-1:2019 extended format; an offset is subtracted to give UTC.
    [Theory]
    [InlineData("2025-06-01T12:00:00Z", "2025-06-01T12:00:00Z")]
    [InlineData("2025-06-01T12:00:00+02:00", "2025-06-01T10:00:00Z")]
    [InlineData("2025-06-01 12:00:00-0500", "2025-06-01T17:00:00Z")]
    [InlineData("2025-06-01T12:00:00.250Z", "2025-06-01T12:00:00.25Z")]
    [InlineData("2025/06/01 12:00", "2025-06-01T12:00:00Z")]
    public void Iso_timestamps_convert_to_utc(string text, string expected)
    {
        var (o, t) = Parse(text);
        Assert.Equal(TimestampOutcome.Ok, o);
        Assert.Equal(DateTimeOffset.Parse(expected, System.Globalization.CultureInfo.InvariantCulture), t);
    }

    [Theory]
    [InlineData("2025-02-30 12:00")]
    [InlineData("2025-06-01 25:00")]
    [InlineData("yesterday")]
    [InlineData("")]
    public void Impossible_timestamps_are_bad(string text) => Assert.Equal(TimestampOutcome.Bad, Parse(text).Item1);

    // Reference: the IANA database via TimeZoneInfo: America/Chicago is UTC−6 in January (CST).
    [Fact]
    public void Local_time_uses_the_site_zone()
    {
        var (o, t) = Parse("2025-01-15 08:00", "America/Chicago");
        Assert.Equal(TimestampOutcome.Ok, o);
        Assert.Equal(new DateTimeOffset(2025, 1, 15, 14, 0, 0, TimeSpan.Zero), t);
    }

    [Fact]
    public void A_custom_format_is_honoured()
    {
        var (o, t) = Parse("15.01.2025 08:30", "UTC", "dd.MM.yyyy HH:mm");
        Assert.Equal(TimestampOutcome.Ok, o);
        Assert.Equal(new DateTimeOffset(2025, 1, 15, 8, 30, 0, TimeSpan.Zero), t);
    }
}
