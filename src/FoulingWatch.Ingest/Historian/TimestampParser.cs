using System.Globalization;
using System.Text;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Ingest.Historian;

public enum TimestampOutcome { Ok, Bad, NonexistentLocalTime }

internal static class Blanks
{
    /// <summary>The field without leading and trailing spaces and tabs (a plain loop: Span.Trim with a set of values is several times slower here).</summary>
    public static ReadOnlySpan<byte> TrimBlanks(this ReadOnlySpan<byte> s)
    {
        int a = 0, b = s.Length;
        while (a < b && (s[a] == (byte)' ' || s[a] == (byte)'\t')) a++;
        while (b > a && (s[b - 1] == (byte)' ' || s[b - 1] == (byte)'\t')) b--;
        return s[a..b];
    }
}

/// <summary>
/// Turns historian timestamps into UTC. Formats: ISO 8601 with offset or Z (taken as written); ISO-like local
/// times "yyyy-MM-dd[ T]HH:mm[:ss[.fff]]" in the site time zone; a configured .NET format string; or
/// spreadsheet serial days ("serial", days since 1899-12-30).
/// </summary>
/// <remarks>
/// Daylight-saving rules for local times (the IANA rules as the time-zone database gives them):
/// a time in the skipped spring hour cannot come from a correct clock and is rejected (counted);
/// a time in the repeated autumn hour is read as the earlier (daylight) instant unless the file has already
/// passed that instant, in which case it is the later (standard) instant — so an export written in time order
/// gets both copies of the hour right. Each choice is counted. Create one parser per file.
/// </remarks>
public sealed class TimestampParser
{
    private static readonly DateTime SerialEpoch = new(1899, 12, 30, 0, 0, 0, DateTimeKind.Unspecified);
    private readonly TimestampSettings _settings;
    private readonly TimeZoneInfo _zone;
    private readonly bool _local;
    private readonly string? _format;
    private readonly bool _formatHasOffset;
    private long _lastUtc = long.MinValue;

    public TimestampParser(TimestampSettings settings, TimeZoneInfo zone)
    {
        _settings = settings;
        _zone = zone;
        _local = !settings.AssumeUtc && (zone.BaseUtcOffset != TimeSpan.Zero || zone.SupportsDaylightSavingTime);
        _format = settings.Format is null or "iso" or "serial" ? null : settings.Format;
        _formatHasOffset = _format is not null && (_format.Contains('z') || _format.Contains('K'));
    }

    public long AmbiguousAsDaylight { get; private set; }
    public long AmbiguousAsStandard { get; private set; }

    /// <summary>The latest instant read so far: the state that a time in the repeated autumn hour is resolved with.</summary>
    public long LatestUtc => _lastUtc;

    /// <summary>Carries on after an earlier part of the same file, whose latest instant was <paramref name="utcTicks"/>.</summary>
    public void Observe(long utcTicks) => _lastUtc = Math.Max(_lastUtc, utcTicks);

    public TimestampOutcome Parse(ReadOnlySpan<byte> field, out long utcTicks)
    {
        utcTicks = 0;
        field = field.TrimBlanks();
        if (field.Length >= 2 && field[0] == (byte)'"' && field[^1] == (byte)'"') field = field[1..^1];
        if (field.IsEmpty) return TimestampOutcome.Bad;

        long localTicks;
        if (_settings.Format == "serial")
        {
            if (!csFastFloat.FastDoubleParser.TryParseDouble(field, out int used, out double days) || used != field.Length || !(days > 0 && days < 2_958_465))
                return TimestampOutcome.Bad;
            localTicks = SerialEpoch.Ticks + (long)Math.Round(days * TimeSpan.TicksPerDay / TimeSpan.TicksPerMillisecond) * TimeSpan.TicksPerMillisecond;
        }
        else if (_format is not null)
        {
            var text = Encoding.UTF8.GetString(field);
            if (_formatHasOffset)
            {
                if (!DateTimeOffset.TryParseExact(text, _format, CultureInfo.InvariantCulture, DateTimeStyles.AllowWhiteSpaces, out var dto)) return TimestampOutcome.Bad;
                utcTicks = dto.UtcTicks;
                _lastUtc = Math.Max(_lastUtc, utcTicks);
                return TimestampOutcome.Ok;
            }
            if (!DateTime.TryParseExact(text, _format, CultureInfo.InvariantCulture, DateTimeStyles.AllowWhiteSpaces, out var dt)) return TimestampOutcome.Bad;
            localTicks = dt.Ticks;
        }
        else
        {
            if (!TryParseIso(field, out localTicks, out var offsetMinutes)) return TimestampOutcome.Bad;
            if (offsetMinutes is { } off)
            {
                utcTicks = localTicks - off * TimeSpan.TicksPerMinute;
                _lastUtc = Math.Max(_lastUtc, utcTicks);
                return TimestampOutcome.Ok;
            }
        }
        return LocalToUtc(localTicks, out utcTicks);
    }

    private TimestampOutcome LocalToUtc(long localTicks, out long utcTicks)
    {
        if (!_local)
        {
            utcTicks = localTicks;
            _lastUtc = Math.Max(_lastUtc, utcTicks);
            return TimestampOutcome.Ok;
        }
        var dt = new DateTime(localTicks, DateTimeKind.Unspecified);
        if (_zone.IsInvalidTime(dt)) { utcTicks = 0; return TimestampOutcome.NonexistentLocalTime; }
        if (_zone.IsAmbiguousTime(dt))
        {
            var offsets = _zone.GetAmbiguousTimeOffsets(dt);
            var daylight = offsets.Max().Ticks;
            var standard = offsets.Min().Ticks;
            var earlier = localTicks - daylight;
            if (_lastUtc >= earlier) { utcTicks = localTicks - standard; AmbiguousAsStandard++; }
            else { utcTicks = earlier; AmbiguousAsDaylight++; }
        }
        else utcTicks = localTicks - _zone.GetUtcOffset(dt).Ticks;
        _lastUtc = Math.Max(_lastUtc, utcTicks);
        return TimestampOutcome.Ok;
    }

    /// <summary>Reads yyyy-MM-dd or yyyy/MM/dd, then 'T' or ' ', HH:mm[:ss[.f…]], then optional Z or ±hh[:mm].</summary>
    internal static bool TryParseIso(ReadOnlySpan<byte> s, out long ticks, out int? offsetMinutes)
    {
        ticks = 0;
        offsetMinutes = null;
        if (s.Length < 16) return false;
        if (!Digits(s, 0, 4, out var year) || (s[4] != '-' && s[4] != '/') || !Digits(s, 5, 2, out var month) || s[7] != s[4] ||
            !Digits(s, 8, 2, out var day) || (s[10] != 'T' && s[10] != ' ') || !Digits(s, 11, 2, out var hour) || s[13] != ':' ||
            !Digits(s, 14, 2, out var minute))
            return false;
        var i = 16;
        var second = 0;
        long fraction = 0;
        if (i < s.Length && s[i] == ':')
        {
            if (!Digits(s, i + 1, 2, out second)) return false;
            i += 3;
            if (i < s.Length && (s[i] == '.' || s[i] == ','))
            {
                i++;
                var scale = TimeSpan.TicksPerSecond;
                var any = false;
                while (i < s.Length && s[i] >= '0' && s[i] <= '9')
                {
                    scale /= 10;
                    fraction += (s[i] - '0') * scale;
                    i++;
                    any = true;
                }
                if (!any) return false;
            }
        }
        if (month is < 1 or > 12 || day < 1 || day > DateTime.DaysInMonth(Math.Clamp(year, 1, 9999), month) || hour > 23 || minute > 59 || second > 59 || year < 1)
            return false;
        ticks = new DateTime(year, month, day, hour, minute, second).Ticks + fraction;
        if (i == s.Length) return true;
        if (s[i] == 'Z' && i + 1 == s.Length) { offsetMinutes = 0; return true; }
        if (s[i] == ' ' && i + 1 < s.Length && s[i + 1] is (byte)'+' or (byte)'-') i++;
        if (s[i] is (byte)'+' or (byte)'-')
        {
            var sign = s[i] == '+' ? 1 : -1;
            if (!Digits(s, i + 1, 2, out var oh)) return false;
            var om = 0;
            var j = i + 3;
            if (j < s.Length && s[j] == ':') j++;
            if (j < s.Length && !Digits(s, j, 2, out om)) return false;
            if (j < s.Length) j += 2;
            if (j != s.Length || oh > 14 || om > 59) return false;
            offsetMinutes = sign * (oh * 60 + om);
            return true;
        }
        return false;
    }

    private static bool Digits(ReadOnlySpan<byte> s, int at, int count, out int value)
    {
        value = 0;
        if (at + count > s.Length) return false;
        for (var k = 0; k < count; k++)
        {
            var c = s[at + k];
            if (c < '0' || c > '9') return false;
            value = value * 10 + (c - '0');
        }
        return true;
    }

    /// <summary>Whether a text field reads as a timestamp under the settings (used to find where data rows begin).</summary>
    public static bool LooksLikeTimestamp(string text, TimestampSettings settings)
    {
        var bytes = Encoding.UTF8.GetBytes(text.Trim().Trim('"'));
        if (settings.Format == "serial") return csFastFloat.FastDoubleParser.TryParseDouble(bytes, out double d) && d > 0;
        if (settings.Format is not null && settings.Format != "iso")
            return DateTime.TryParseExact(text.Trim().Trim('"'), settings.Format, CultureInfo.InvariantCulture, DateTimeStyles.AllowWhiteSpaces, out _)
                   || DateTimeOffset.TryParseExact(text.Trim().Trim('"'), settings.Format, CultureInfo.InvariantCulture, DateTimeStyles.AllowWhiteSpaces, out _);
        return TryParseIso(bytes, out _, out _);
    }
}
