using System.Text.Encodings.Web;
using System.Text.Json;
using FoulingWatch.Analysis;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Analysis.Economics;
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

    /// <param name="written">Charts of the exchangers whose own files <see cref="WriteExchanger"/> wrote already (by
    /// id); the others are written here.</param>
    public static void Write(PlantResult result, string outDirectory,
        IReadOnlyDictionary<string, IReadOnlyList<Charts.Chart>>? written = null)
    {
        Directory.CreateDirectory(outDirectory);
        var charts = new Dictionary<string, IReadOnlyList<Charts.Chart>>();
        var drawn = new IReadOnlyList<Charts.Chart>[result.Exchangers.Count];
        Parallel.For(0, drawn.Length, i =>
        {
            var x = result.Exchangers[i];
            drawn[i] = written?.GetValueOrDefault(x.History.Exchanger.Id) ?? WriteExchanger(x, outDirectory);
        });
        for (var i = 0; i < drawn.Length; i++) charts[result.Exchangers[i].History.Exchanger.Id] = drawn[i];
        // The site's files are independent of each other: summary and plan beside the site charts and the report (the
        // summary's first serialisation is mostly compilation, ~0.3 s, which the other core would otherwise wait out).
        Parallel.Invoke(
            () => StageClock.Time("write summary and plan", () =>
            {
                AtomicFile.WriteAllText(Path.Combine(outDirectory, "summary.json"), JsonSerializer.Serialize(Summary(result), Json) + "\n");
                PlanWriter.Write(Path.Combine(outDirectory, "plan.csv"), result);
            }),
            () => WriteReport(result, outDirectory, charts));
    }

    /// <summary>What belongs to one exchanger alone: &lt;id&gt;/timeseries.csv and its charts (PNG and SVG under
    /// charts/); returns the charts for the report. Needs the exchanger's samples (not released).</summary>
    public static IReadOnlyList<Charts.Chart> WriteExchanger(ExchangerResult x, string outDirectory)
    {
        if (x.History.Columns.IsReleased)
            throw new InvalidOperationException($"the samples of {x.History.Exchanger.Id} were released before its files were written");
        StageClock.Time("write time series", () =>
        {
            var c = x.History.Columns;
            var fitted = new double[c.Count];
            for (var k = 0; k < c.Count; k++)
                fitted[k] = c.Status[k] == Analysis.BackCalculation.SampleStatus.Ok ? x.Trend.Fitted(c.Timestamp(k)) : double.NaN;
            TimeSeriesWriter.Write(Path.Combine(outDirectory, SafeName(x.History.Exchanger.Id), "timeseries.csv"), x.History,
                fitted, x.Economics.Pricing?.MoneyPerJoule, x.PressureDrops);
        });
        return StageClock.Time("charts", () =>
        {
            var drawn = Charts.ReportCharts.ForExchanger(x);
            SaveCharts(drawn, outDirectory);
            return drawn;
        });
    }

    private static void SaveCharts(IEnumerable<Charts.Chart> charts, string outDirectory)
    {
        var folder = Path.Combine(outDirectory, "charts");
        foreach (var c in charts)
        {
            AtomicFile.WriteAllBytes(Path.Combine(folder, c.Name + ".png"), c.Png);
            AtomicFile.WriteAllText(Path.Combine(folder, c.Name + ".svg"), c.Svg);
        }
    }

    /// <summary>The site charts and the self-contained report.html, with the exchangers' charts already drawn.</summary>
    private static void WriteReport(PlantResult result, string outDirectory, Dictionary<string, IReadOnlyList<Charts.Chart>> charts)
    {
        IReadOnlyList<Charts.Chart> site = [];
        StageClock.Time("charts", () =>
        {
            site = [Charts.ReportCharts.CostRanking(result), Charts.ReportCharts.PlanTimeline(result)];
            SaveCharts(site, outDirectory);
        });
        StageClock.Time("report", () =>
            AtomicFile.WriteAllText(Path.Combine(outDirectory, "report.html"), Html.HtmlReport.Build(result, charts, site)));
    }

    /// <summary>A file-system-safe folder name for an exchanger id.</summary>
    public static string SafeName(string id) => Ingest.Configuration.ExchangerConfiguration.FolderNameOf(id);

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
                after_each_cleaning = x.History.CleanReference.Cycles?.Select(c => new
                {
                    cleaning = Date(c.Start, r.Configuration.Site.TimeZone),
                    samples = c.Samples,
                    u_clean_W_per_m2K = c.CleanU is { } u ? NumberText.Json(u) : null,
                    sigma_W_per_m2K = c.Sigma is { } su ? NumberText.Json(su) : null,
                    refusal = c.Refusal,
                }),
                after_each_cleaning_statement = x.History.CleanReference.CycleStatement,
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
            what_if = x.WhatIf.Select(w => new
            {
                arrangement = w.Arrangement,
                as_built = w.Actual,
                clean_duty_w = NumberText.Json(w.CleanDuty),
                duty_now_w = NumberText.Json(w.DutyNow),
            }),
            pressure_drop = x.PressureDrops.Select(p => new
            {
                side = p.Side,
                tag = p.Tag,
                reference_flow_kg_s = NumberText.Json(p.ReferenceFlow),
                from = SiteCalendar.Date(p.From, r.Configuration.Site.TimeZone),
                first_pa = NumberText.Json(p.First),
                to = SiteCalendar.Date(p.To, r.Configuration.Site.TimeZone),
                last_pa = NumberText.Json(p.Last),
                change = NumberText.Json(p.Change),
                deposit_m_from_drop = p.DepositFromDrop is { } dd ? NumberText.Json(dd) : null,
                deposit_m_from_rf = p.DepositFromRf is { } dr ? NumberText.Json(dr) : null,
                measured_over_clean = p.CleanRatio is { } cr ? NumberText.Json(cr) : null,
                ratio_basis = p.RatioBasis,
                ratio_slope_per_day = p.RatioSlopePerDay is { } rs ? NumberText.Json(rs) : null,
                ratio_slope_sigma_per_day = p.RatioSlopeSigma is { } rsg ? NumberText.Json(rsg) : null,
                statement = p.Statement,
            }),
            instrument_drift = x.History.Drift is not { } d ? null : new
            {
                statement = d.Statement,
                onset = SiteCalendar.Date(d.Onset, r.Configuration.Site.TimeZone),
                alarm = SiteCalendar.Date(d.Alarm, r.Configuration.Site.TimeZone),
                form = d.Form,
                balance_shift = NumberText.Json(d.Shift),
                balance_shift_per_day = NumberText.Json(d.RatePerDay),
                single_sensor = d.SingleSensor,
                sensor = FoulingWatch.Analysis.BackCalculation.Measurement.Names[d.Sensor],
                tag = d.Tag,
                suspects = d.Suspects,
                bias_at_end = NumberText.Json(d.Bias),
                bias_per_day = NumberText.Json(d.BiasRatePerDay),
                bias_unit = d.BiasUnit,
                explained = NumberText.Json(d.Explained),
            },
            trend = Trend(x.Trend, r.Configuration.Site.TimeZone),
            economics = Economics(x.Economics, r.Configuration.Site.TimeZone),
            samples = new
            {
                analysed = x.History.Columns.Count,
                by_status = x.StatusCounts,
                no_usable_interval = PlantAnalysis.NoUsableIntervals(x.StatusCounts),
            },
            ledger = Ledger(r.Ingest.ExchangerLedger(x.History.Exchanger)),
        }),
        energy_audit = Audit(r),
        cleaning_plan = Plan(r),
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

    /// <summary>An instant in the site's local time with its offset, e.g. 2026-08-05T02:00:00+02:00.</summary>
    private static string? LocalTime(DateTimeOffset? t, TimeZoneInfo zone) =>
        t is { } v ? TimeZoneInfo.ConvertTime(v, zone).ToString("yyyy-MM-ddTHH:mm:sszzz", System.Globalization.CultureInfo.InvariantCulture) : null;

    public static object Trend(TrendResult t, TimeZoneInfo zone) => new
    {
        daily_points = t.Daily.Count,
        cleanings = t.Cleanings.Select(c => new
        {
            date = Date(c.Cleaning.Date, zone),
            source = c.Cleaning.Source == CleaningSource.Logged ? "logged" : "detected",
            outage_start = LocalTime(c.Cleaning.OutageStart, zone),
            outage_end = LocalTime(c.Cleaning.OutageEnd, zone),
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
                akaike_weight = NumberText.Json(m.AkaikeWeight),
                residual_autocorrelation_per_day = m.Fit is null ? null : NumberText.Json(m.Fit.Autocorrelation),
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
        forecast_withheld = t.Withheld,
        forecast = t.Forecast is null ? null : new
        {
            limit_m2K_per_W = NumberText.Json(t.Forecast.Limit),
            limit_source = t.Forecast.LimitSource,
            state = t.Forecast.State switch
            {
                ForecastState.Reached => "reached", ForecastState.AtLimit => "at-limit-within-uncertainty",
                ForecastState.BeyondHorizon => "beyond-horizon", _ => "forecast",
            },
            probability_reached_now = NumberText.Json(t.Forecast.ProbabilityReachedNow),
            p10 = Date(t.Forecast.P10, zone),
            p50 = Date(t.Forecast.Date, zone),
            p90 = Date(t.Forecast.P90, zone),
            interval_90_low = Date(t.Forecast.Low, zone),
            interval_90_high = Date(t.Forecast.High, zone),
            already_reached = t.Forecast.AlreadyReached,
            beyond_horizon = t.Forecast.BeyondHorizon,
            fraction_beyond_horizon = NumberText.Json(t.Forecast.FractionBeyondHorizon),
            horizon = Date(t.Forecast.Horizon, zone),
            systematic_sigma_m2K_per_W = t.Draws is null ? null : NumberText.Json(t.Draws.SystematicSigma),
            windows = t.Forecast.Windows.Select(w => new
            {
                window = w.Window,
                start = Date(w.Start, zone),
                probability_limit_reached_before = NumberText.Json(w.ProbabilityReachedBefore),
            }),
            statement = t.Forecast.Statement,
        },
    };

    /// <summary>The fleet cleaning plan section of summary.json.</summary>
    public static object Plan(PlantResult r) => new
    {
        method = r.Plan.Method,
        currency = r.Configuration.Economics.Currency,
        total_saving = NumberText.Json(r.Plan.TotalSaving),
        windows = r.Configuration.ShutdownWindows.Select(w => new { name = w.Name, start = Date(w.Start, r.Configuration.Site.TimeZone), end = Date(w.End, r.Configuration.Site.TimeZone), capacity = w.Capacity }),
        entries = r.Plan.Entries.Select(p => new
        {
            rank = p.Rank,
            exchanger = p.ExchangerId,
            action = p.Option?.Kind,
            window = p.Window?.Name,
            date = Date(p.Option?.Date, r.Configuration.Site.TimeZone),
            net_saving = p.Option is null ? null : NumberText.Json(p.Option.Saving),
            net_saving_90_low = p.Option is null ? null : NumberText.Json(p.Option.SavingLow),
            net_saving_90_high = p.Option is null ? null : NumberText.Json(p.Option.SavingHigh),
            probability_saving = p.Option is null ? null : NumberText.Json(p.Option.ProbabilitySaving),
            probability_best = NumberText.Json(p.ProbabilityBest),
            uncertain = p.Uncertain,
            payback_days = p.Option is null ? null : NumberText.Json(p.Option.PaybackDays),
            energy_avoided_GJ = p.Option is null ? null : NumberText.Json(p.Option.EnergyAvoided / 1e9),
            co2_avoided_t = p.Option is null ? null : NumberText.Json(p.Option.Co2Avoided / 1000),
            probability_unplanned_stop = p.Option is null ? null : NumberText.Json(p.Option.ProbabilityUnplannedStop),
            warning = p.Warning,
            note = p.Note,
        }),
    };

    private static object? Totals(CostTotals? t) => t is null ? null : new
    {
        from = NumberText.Utc(t.From),
        to = NumberText.Utc(t.To),
        lost_heat_GJ = NumberText.Json(t.LostEnergy / 1e9),
        lost_heat_MWh = NumberText.Json(t.LostEnergy / 3.6e9),
        fuel_GJ = NumberText.Json(t.Fuel / 1e9),
        co2_t = NumberText.Json(t.Co2 / 1000),
        cost = NumberText.Json(t.Money),
    };

    public static object Economics(ExchangerEconomics e, TimeZoneInfo zone) => new
    {
        pricing = e.Pricing?.Description,
        basis = e.Pricing?.Basis,
        currency = e.Pricing?.Currency,
        not_priced = e.NotPriced,
        cost_per_day_now = NumberText.Json(e.CostPerDayNow),
        co2_t_per_day_now = NumberText.Json(e.Co2PerDayNow / 1000),
        current_cycle = Totals(e.CurrentCycle),
        last_12_months = Totals(e.LastYear),
        whole_record = Totals(e.WholeRecord),
        optimal_interval_days = e.OptimalIntervalDays is { } d ? NumberText.Json(d) : null,
        optimal_average_cost_per_day = e.OptimalCostRatePerDay is { } c ? NumberText.Json(c) : null,
        unconstrained_optimum = Date(e.UnconstrainedOptimum, zone),
        decision = e.Decision is not { } dec ? null : new
        {
            horizon_days = NumberText.Json(dec.HorizonDays),
            reference = dec.Reference.Kind,
            downtime_cost_per_day = NumberText.Json(dec.DowntimeCostPerDay),
            path_cost_per_day_now = NumberText.Json(dec.PathCostPerDayNow),
            unplanned_stop_cost = NumberText.Json(dec.UnplannedStopCost),
            recommended = dec.Recommended.Kind,
            recommended_window = dec.Recommended.Window?.Name,
            probability_best = NumberText.Json(dec.ProbabilityRecommendedBest),
            uncertain = dec.Uncertain,
            settle = dec.Settle,
            break_even_rf_rate_m2K_per_W_per_day = dec.BreakEvenRate is { } be ? NumberText.Json(be) : null,
            options = dec.Options.Select(o => new
            {
                kind = o.Kind,
                label = o.Label,
                date = Date(o.Date, zone),
                expected_cost_over_horizon = NumberText.Json(o.Cost),
                net_saving = NumberText.Json(o.Saving),
                net_saving_90_low = NumberText.Json(o.SavingLow),
                net_saving_90_high = NumberText.Json(o.SavingHigh),
                probability_saving = NumberText.Json(o.ProbabilitySaving),
                payback_days = NumberText.Json(o.PaybackDays),
                energy_avoided_GJ = NumberText.Json(o.EnergyAvoided / 1e9),
                co2_avoided_t = NumberText.Json(o.Co2Avoided / 1000),
                probability_unplanned_stop = NumberText.Json(o.ProbabilityUnplannedStop),
            }),
        },
        statement = e.Statement,
    };

    /// <summary>Energy audit over the last 12 months of data: lost heat recovery, fuel, CO2 and money per exchanger and for the site.</summary>
    public static object Audit(PlantResult r)
    {
        var rows = new List<(string Id, CostTotals T)>();
        foreach (var x in r.Exchangers)
        {
            if (x.Economics.Pricing is not { } pricing || x.Economics.LastYear is not { } lastYear) continue;
            var (from, to) = r.AuditPeriod ?? (lastYear.From, lastYear.To);
            rows.Add((x.History.Exchanger.Id, FoulingEconomics.Totals(x.History, FoulingEconomics.LostEnergyPerInterval(x.History, r.Ingest.Interval), pricing, from, to)));
        }
        return new
        {
            period = rows.Count > 0 ? new { from = NumberText.Utc(rows[0].T.From), to = NumberText.Utc(rows[0].T.To) } : null,
            site = new
            {
                lost_heat_GJ = NumberText.Json(rows.Sum(x => x.T.LostEnergy) / 1e9),
                lost_heat_MWh = NumberText.Json(rows.Sum(x => x.T.LostEnergy) / 3.6e9),
                fuel_GJ = NumberText.Json(rows.Sum(x => x.T.Fuel) / 1e9),
                co2_t = NumberText.Json(rows.Sum(x => x.T.Co2) / 1000),
                cost = NumberText.Json(rows.Sum(x => x.T.Money)),
            },
            exchangers = rows.Select(x => new { id = x.Id, totals = Totals(x.T) }),
        };
    }

    public static object Ledger(TagLedger l) => new
    {
        read = l.Read,
        used = l.Used,
        rejected = RejectReasons.All.ToDictionary(r => r.Key(), r => l.Rejected[(int)r]),
        markers = l.TopMarkers(10).ToDictionary(m => m.Key, m => m.Value),
        intervals_with_data = l.IntervalsWithData,
        intervals_bridged = l.IntervalsBridged,
        intervals_missing = l.IntervalsMissing,
        examples = l.Examples,
    };
}
