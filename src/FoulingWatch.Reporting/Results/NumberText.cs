using System.Globalization;

namespace FoulingWatch.Reporting.Results;

/// <summary>Numbers as they leave the program: invariant culture, 9 significant digits, empty (CSV) or null (JSON) for undefined — never NaN.</summary>
public static class NumberText
{
    public static string Csv(double v) => double.IsFinite(v) ? v.ToString("G9", CultureInfo.InvariantCulture) : "";

    /// <summary>The value rounded to 9 significant digits (so JSON and CSV agree), or null when undefined.</summary>
    public static double? Json(double v) => double.IsFinite(v) ? double.Parse(v.ToString("G9", CultureInfo.InvariantCulture), CultureInfo.InvariantCulture) : null;

    public static string Utc(DateTimeOffset t) => t.UtcDateTime.ToString("yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);
}
