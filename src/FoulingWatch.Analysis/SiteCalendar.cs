using System.Globalization;

namespace FoulingWatch.Analysis;

/// <summary>The one rule for dates a person reads: the calendar day in the site's time zone.</summary>
public static class SiteCalendar
{
    public static string Date(DateTimeOffset? t, TimeZoneInfo zone) =>
        t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-dd", CultureInfo.InvariantCulture) : "beyond the horizon";
}
