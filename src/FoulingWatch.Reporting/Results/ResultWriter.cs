using System.Text.Encodings.Web;
using System.Text.Json;
using FoulingWatch.Analysis;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Reporting.Results;

/// <summary>Writes the result files of a run: per exchanger timeseries.csv, and summary.json for the plant.</summary>
public static class ResultWriter
{
    public static readonly JsonSerializerOptions Json = new()
    {
        WriteIndented = true,
        Encoder = JavaScriptEncoder.UnsafeRelaxedJsonEscaping,
        DefaultIgnoreCondition = System.Text.Json.Serialization.JsonIgnoreCondition.Never,
    };

    public const string Caution =
        "FoulingWatch advises; it does not operate plant. Results depend on the quality of the instruments behind the historian tags: " +
        "a drifting sensor reads as fouling or hides it. Cleaning, isolation and operating changes of pressure equipment follow site procedures, " +
        "local codes and licensed engineering practice.";

    public static void Write(PlantResult result, string outDirectory)
    {
        Directory.CreateDirectory(outDirectory);
        foreach (var x in result.Exchangers)
            TimeSeriesWriter.Write(Path.Combine(outDirectory, SafeName(x.History.Exchanger.Id), "timeseries.csv"), x.History,
                x.History.Samples.Select(smp => smp.Status == Analysis.BackCalculation.SampleStatus.Ok ? x.Trend.Fitted(smp.Timestamp) : double.NaN).ToList());
        AtomicFile.WriteAllText(Path.Combine(outDirectory, "summary.json"), JsonSerializer.Serialize(Summary(result), Json) + "\n");
    }

    /// <summary>A file-system-safe folder name for an exchanger id.</summary>
    public static string SafeName(string id) => string.Concat(id.Select(c => char.IsLetterOrDigit(c) || c is '-' or '_' or '.' ? c : '_'));

    public static object Summary(PlantResult r) => new
    {
        tool = "FoulingWatch",
        caution = Caution,
        site = r.Configuration.Site.Name,
        grid = new
        {
            start = NumberText.Utc(r.Ingest.GridStart),
            interval_s = r.Ingest.Interval.TotalSeconds,
            intervals = r.Ingest.IntervalCount,
        },
        exchangers = r.Exchangers.Select(x => new
        {
            id = x.History.Exchanger.Id,
            service = x.History.Exchanger.Service,
            arrangement = x.History.Exchanger.Arrangement.Name,
            area_m2 = x.History.Exchanger.Area,
            refusal = x.History.Refusal,
            clean_reference = new
            {
                method = x.History.CleanReference.Method,
                description = x.History.CleanReference.Description,
                calibration_samples = x.History.CleanReference.CalibrationSamples,
                residual_sd_m2K_per_W = x.History.CleanReference.ResidualStandardDeviation is { } sd ? NumberText.Json(sd) : null,
            },
            current = new
            {
                last_usable = x.Current.LastUsable is { } t ? NumberText.Utc(t) : null,
                samples_last_day = x.Current.Samples,
                u_actual_W_per_m2K = NumberText.Json(x.Current.UActual),
                u_clean_W_per_m2K = NumberText.Json(x.Current.UClean),
                rf_m2K_per_W = NumberText.Json(x.Current.FoulingResistance),
                rf_sigma_m2K_per_W = NumberText.Json(x.Current.FoulingResistanceSigma),
                cleanliness = NumberText.Json(x.Current.Cleanliness),
                duty_W = NumberText.Json(x.Current.Duty),
                lost_duty_W = NumberText.Json(x.Current.LostDuty),
            },
            sensor_check = new
            {
                statement = x.History.SensorCheck.Statement,
                likely_fault = x.History.SensorCheck.LikelyFault,
                sensor = x.History.SensorCheck.LikelySensor,
                tag = x.History.SensorCheck.Tag,
                bias = x.History.SensorCheck.Bias is { } b ? NumberText.Json(b) : null,
                bias_unit = x.History.SensorCheck.BiasUnit,
                fraction_failing_balance_test = NumberText.Json(x.History.SensorCheck.FractionFailingGlobalTest),
            },
            trend = Trend(x.Trend, r.Configuration.Site.TimeZone),
            samples = new
            {
                analysed = x.History.Samples.Count,
                by_status = x.StatusCounts,
            },
            ledger = Ledger(r.Ingest.ExchangerLedger(x.History.Exchanger)),
        }),
        quality_ledger = new
        {
            files = r.Ingest.Files.Select(f => new
            {
                file = Path.GetFileName(f.File),
                encoding = f.Encoding,
                delimiter = f.Delimiter == '\t' ? "tab" : f.Delimiter.ToString(),
                decimal_separator = f.DecimalSeparator.ToString(),
                header_line = f.HeaderLine,
                unit_rows = f.MetadataRows,
                data_rows = f.DataRows,
                repeated_hour_as_daylight = f.AmbiguousLocalTimesAsDaylight,
                repeated_hour_as_standard = f.AmbiguousLocalTimesAsStandard,
            }),
            rows_of_other_tags = r.Ingest.RowsOfOtherTags,
            tags = r.Ingest.TagLedgers.OrderBy(kv => kv.Key, StringComparer.Ordinal).Select(kv => new { tag = kv.Key, ledger = Ledger(kv.Value) }),
        },
    };

    /// <summary>Dates of cleanings, cycles and forecasts as the site's local calendar date.</summary>
    private static string? Date(DateTimeOffset? t, TimeZoneInfo zone) =>
        t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture) : null;

    public static object Trend(TrendResult t, TimeZoneInfo zone) => new
    {
        daily_points = t.Daily.Count,
        cleanings = t.Cleanings.Select(c => new
        {
            date = Date(c.Cleaning.Date, zone),
            source = c.Cleaning.Source == CleaningSource.Logged ? "logged" : "detected",
            evidence = c.Cleaning.Source == CleaningSource.Detected
                ? new { rf_before_m2K_per_W = NumberText.Json(c.Cleaning.RfBefore!.Value), rf_after_m2K_per_W = NumberText.Json(c.Cleaning.RfAfter!.Value), drop_sigma_m2K_per_W = NumberText.Json(c.Cleaning.DropSigma!.Value) }
                : null,
            rf_before_m2K_per_W = c.RfBefore is { } b ? NumberText.Json(b) : null,
            rf_after_m2K_per_W = c.RfAfter is { } a ? NumberText.Json(a) : null,
            fraction_removed = c.FractionRemoved is { } f ? NumberText.Json(f) : null,
            rate_before_m2K_per_W_per_day = c.RateBefore is { } rb ? NumberText.Json(rb) : null,
            rate_after_m2K_per_W_per_day = c.RateAfter is { } ra ? NumberText.Json(ra) : null,
        }),
        cycles = t.Cycles.Select(c => new
        {
            start = Date(c.Start, zone),
            end = Date(c.End, zone),
            start_known = c.StartKnown,
            start_source = c.StartSource switch { CleaningSource.Logged => "logged", CleaningSource.Detected => "detected", _ => "data start" },
            days_used = c.Points.Count,
            outliers_rejected = c.OutliersRejected,
            refusal = c.Refusal,
            chosen = c.Chosen?.Model.Key,
            models = c.Candidates.Select(m => new
            {
                model = m.Model.Key,
                formula = m.Model.Formula,
                source = m.Model.Source,
                parameters = m.Fit is null ? null : m.Model.ParameterNames.Select((n, i) => (n, i)).ToDictionary(p => p.n, p => NumberText.Json(m.Fit.Parameters[p.i])),
                standard_errors = m.Fit is null ? null : m.Model.ParameterNames.Select((n, i) => (n, i)).ToDictionary(p => p.n, p => NumberText.Json(m.Fit.StandardErrors[p.i])),
                aicc = NumberText.Json(m.Aicc),
                r_squared = NumberText.Json(m.RSquared),
                skipped = m.Skipped,
            }),
        }),
        threshold_model = t.ThresholdModelNote,
        rate = t.Rate is null ? null : new
        {
            rf_rate_m2K_per_W_per_day = NumberText.Json(t.Rate.Rate),
            rf_rate_sigma_m2K_per_W_per_day = NumberText.Json(t.Rate.Sigma),
            recent_rate_m2K_per_W_per_day = t.Rate.RecentRate is { } r ? NumberText.Json(r) : null,
            earlier_rate_m2K_per_W_per_day = t.Rate.EarlierRate is { } e ? NumberText.Json(e) : null,
            rate_jump_alert = t.Rate.Jump,
            statement = t.Rate.Statement,
        },
        forecast = t.Forecast is null ? null : new
        {
            limit_m2K_per_W = NumberText.Json(t.Forecast.Limit),
            limit_source = t.Forecast.LimitSource,
            date = Date(t.Forecast.Date, zone),
            interval_90_low = Date(t.Forecast.Low, zone),
            interval_90_high = Date(t.Forecast.High, zone),
            already_reached = t.Forecast.AlreadyReached,
            beyond_horizon = t.Forecast.BeyondHorizon,
            fraction_beyond_horizon = NumberText.Json(t.Forecast.FractionBeyondHorizon),
            horizon = Date(t.Forecast.Horizon, zone),
            statement = t.Forecast.Statement,
        },
    };

    public static object Ledger(TagLedger l) => new
    {
        read = l.Read,
        used = l.Used,
        rejected = RejectReasons.All.ToDictionary(r => r.Key(), r => l.Rejected[(int)r]),
        markers = l.Markers,
        intervals_with_data = l.IntervalsWithData,
        intervals_bridged = l.IntervalsBridged,
        intervals_missing = l.IntervalsMissing,
        examples = l.Examples,
    };
}
