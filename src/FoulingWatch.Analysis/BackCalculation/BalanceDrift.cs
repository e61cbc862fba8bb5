using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>A lasting change of the heat-balance mismatch: when it began, how large and how fast it grew, and the
/// sensor whose bias explains it best (or that no single sensor does).</summary>
/// <param name="Onset">First day of the change (site data from then on are not used for fouling).</param>
/// <param name="Alarm">Day the CUSUM first signalled.</param>
/// <param name="Shift">Change of the relative mismatch (Q_hot − Q_cold)/Q̄ from before the onset to the last day.</param>
/// <param name="RatePerDay">Growth of the relative mismatch per day after the onset (0 for a step).</param>
/// <param name="SingleSensor">One sensor's bias explains at least <see cref="BalanceDriftDetector.ExplainedNeeded"/> of it.</param>
public sealed record BalanceDrift(DateTimeOffset Onset, DateTimeOffset Alarm, double Shift, double RatePerDay, string Form,
    int Sensor, string Tag, double Bias, double BiasRatePerDay, string BiasUnit, double Explained, bool SingleSensor,
    IReadOnlyList<string> Suspects, string Statement);

/// <summary>Watches the heat-balance mismatch over the whole record for a drift (a slowly biasing instrument) and
/// dates it.</summary>
/// <remarks>
/// The mismatch does not depend on fouling (both duties are measured), so a lasting change in it is an instrument. Daily
/// medians of the relative mismatch of every sample with both duties (including those the balance tolerance rejects)
/// are tested with a two-sided tabular CUSUM (<see cref="TabularCusum"/>, Page 1954) against the first
/// <see cref="ReferenceDays"/> days: K = σ/2, H = 5σ, σ the robust spread of the reference days widened by
/// √((1+ρ)/(1−ρ)) for their lag-1 autocorrelation ρ (common practice for autocorrelated data). The onset is then
/// located by least squares over a two-phase model, level then ramp (levelling off or not) or level then step
/// (two-phase regression, Hinkley 1971, from memory), with at least <see cref="MinimumDaysBefore"/> days before it. Changes smaller than <see cref="MinimumShift"/> of the duty
/// are not reported (calibration drift below that is within what a heat balance resolves; common practice). The sensor
/// is found with <see cref="BiasAttribution"/> on the samples after the onset, with a bias growing linearly from it.
/// </remarks>
public static class BalanceDriftDetector
{
    public const int ReferenceDays = 30, MinimumDays = 28, MinimumDaysBefore = 14, MinimumSamplesPerDay = 6, MaximumAttributionSamples = 4000;
    public const double MinimumShift = 0.005, MinimumSigma = 0.001, ExplainedNeeded = 0.6;

    public static BalanceDrift? Detect(IngestResult data, SampleColumns evaluations, SampleEvaluator evaluator, IReadOnlyList<string> tags,
        TimeZoneInfo? zone = null)
    {
        zone ??= TimeZoneInfo.Utc;
        var (days, values) = DailyMismatch(data, evaluations);
        if (values.Length < MinimumDays) return null;
        var reference = Math.Clamp(values.Length / 4, 14, ReferenceDays);
        var refValues = values[..reference].Sorted();
        var mu = Median(refValues);
        var sigma = Math.Max(MinimumSigma, 1.4826 * Median(refValues.Select(v => Math.Abs(v - mu)).Sorted()));
        var widen = Math.Sqrt(WilsonPlot.SerialInflation(values[..reference].Select(v => v - mu).ToArray()));
        var alarm = TabularCusum.FirstAlarm(values, mu, 0.5 * sigma * widen, 5 * sigma * widen);
        if (!alarm.Found) return null;
        var (onset, form, level, rate) = ChangePoint(days, values, MinimumDaysBefore);
        var shift = form == "ramp" ? Median(values[^Math.Min(7, values.Length - onset)..].Sorted()) - level : rate;
        if (Math.Abs(shift) < MinimumShift) return null;
        var onsetTime = data.GridStart.AddDays(days[onset]);
        var alarmTime = data.GridStart.AddDays(days[alarm.AlarmIndex]);
        var (ranked, suspects) = Attribute(data, evaluations, evaluator, tags, onsetTime, level);
        var best = ranked.MaxBy(r => r.Explained);
        var single = best.Explained >= ExplainedNeeded;
        var statement = single
            ? FormattableString.Invariant(
                $"instrument drift from {SiteCalendar.Date(onsetTime, zone)}: the heat balance moved by {shift:+0.0%;-0.0%} of the duty; it is explained ({best.Explained:P0}) by {string.Join(" or ", suspects)} at the last sample. Data from the onset are not used for fouling; check or recalibrate the instrument.")
            : FormattableString.Invariant(
                $"persistent heat-balance change from {SiteCalendar.Date(onsetTime, zone)} ({shift:+0.0%;-0.0%} of the duty) that no single sensor explains (best {Measurement.Names[best.Sensor]} {tags[best.Sensor]}, {best.Explained:P0}): check the instruments, fluid data and any bypass or leak. Data from the onset are not used for fouling.");
        return new BalanceDrift(onsetTime, alarmTime, shift, form == "ramp" ? rate : 0, form, best.Sensor, tags[best.Sensor],
            best.Bias, best.RatePerDay, BiasAttribution.UnitOf(best.Sensor), best.Explained, single, suspects, statement);
    }

    /// <summary>Days since the grid start (integer UTC days) and the median relative mismatch of each day with enough samples.</summary>
    public static (double[] Days, double[] Values) DailyMismatch(IngestResult data, SampleColumns evaluations)
    {
        var days = new List<double>();
        var values = new List<double>();
        var buffer = new List<double>();
        var startDay = data.GridStart.UtcDateTime.Date;
        var current = -1;
        void Flush()
        {
            if (buffer.Count >= MinimumSamplesPerDay) { buffer.Sort(); days.Add(current); values.Add(Median(buffer)); }
            buffer.Clear();
        }
        for (var k = 0; k < evaluations.Count; k++)
        {
            if (!HasBothDuties(evaluations, k)) continue;
            var day = (int)(data.IntervalStart(k).UtcDateTime.Date - startDay).TotalDays;
            if (day != current) { Flush(); current = day; }
            buffer.Add(evaluations.BalanceMismatch[k]);
        }
        Flush();
        var offset = (data.GridStart.UtcDateTime - startDay).TotalDays;
        return (days.Select(d => d - offset).ToArray(), values.ToArray());
    }

    /// <summary>Least-squares onset (index into the days), form, level before and slope (ramp, per day) or step size.</summary>
    /// <remarks>Three forms are searched: a step (two levels), and a ramp from day j that levels off at day e (e may be
    /// past the end: a ramp still running). Sums over the three stretches come from prefix sums, so the search over
    /// (j, e) is O(n²).</remarks>
    public static (int Onset, string Form, double Level, double RateOrStep) ChangePoint(double[] t, double[] y, int first)
    {
        var n = y.Length;
        var c = new double[n + 1]; var st = new double[n + 1]; var stt = new double[n + 1];
        var sy = new double[n + 1]; var sty = new double[n + 1]; var syy = new double[n + 1];
        for (var i = 0; i < n; i++)
        {
            c[i + 1] = c[i] + 1; st[i + 1] = st[i] + t[i]; stt[i + 1] = stt[i] + t[i] * t[i];
            sy[i + 1] = sy[i] + y[i]; sty[i + 1] = sty[i] + t[i] * y[i]; syy[i + 1] = syy[i] + y[i] * y[i];
        }
        var best = (Sse: double.PositiveInfinity, Onset: 0, Form: "step", Level: 0.0, Value: 0.0);
        for (var j = first; j <= n - 4; j++)
        {
            double m1 = sy[j] / j, m2 = (sy[n] - sy[j]) / (n - j);
            var sse = syy[n] - j * m1 * m1 - (n - j) * m2 * m2;
            if (sse < best.Sse) best = (sse, j, "step", m1, m2 - m1);
            for (var e = j + 1; e <= n; e++)
            {
                // x = 0 before j, t − t_j on [j, e), L = t_{e} − t_j (or none) from e on
                var l = e < n ? t[e] - t[j] : 0;
                double cnt = c[e] - c[j], s1 = st[e] - st[j], s2 = stt[e] - stt[j];
                var sx = s1 - cnt * t[j] + (n - e) * l;
                var sxx = s2 - 2 * t[j] * s1 + cnt * t[j] * t[j] + (n - e) * l * l;
                var sxy = sty[e] - sty[j] - t[j] * (sy[e] - sy[j]) + l * (sy[n] - sy[e]);
                var det = n * sxx - sx * sx;
                if (!(det > 1e-12)) continue;
                var r = (n * sxy - sx * sy[n]) / det;
                var mu = (sy[n] - r * sx) / n;
                sse = syy[n] - mu * sy[n] - r * sxy;
                if (sse < best.Sse) best = (sse, j, "ramp", mu, r);
            }
        }
        return (best.Onset, best.Form, best.Level, best.Value);
    }

    /// <summary>Whether sample k has both duties and a mismatch (usable, or out only for balance or steadiness).</summary>
    private static bool HasBothDuties(SampleColumns c, int k) =>
        c.Status[k] is SampleStatus.Ok or SampleStatus.Balance or SampleStatus.Unsteady && double.IsFinite(c.BalanceMismatch[k]);

    private static (SensorBias[] Ranked, List<string> Suspects) Attribute(IngestResult data, SampleColumns evaluations,
        SampleEvaluator evaluator, IReadOnlyList<string> tags, DateTimeOffset onset, double level)
    {
        var indexes = new List<int>();
        for (var k = 0; k < evaluations.Count; k++)
            if (data.IntervalStart(k) >= onset && HasBothDuties(evaluations, k))
                indexes.Add(k);
        var stride = Math.Max(1, indexes.Count / MaximumAttributionSamples);
        var f = new List<double>();
        var j = new List<double[]>();
        var tau = new List<double>();
        for (var s = 0; s < indexes.Count; s += stride)
        {
            var e = evaluations.Evaluation(indexes[s]);
            var sens = e.Reconciliation?.Sensitivities ?? BiasAttribution.Sensitivities(evaluator, e.Measurements);
            if (sens.Any(double.IsNaN)) continue;
            // the mismatch as it was before the onset (a constant calibration offset) is not the drift
            f.Add(e.DutyHot - e.DutyCold - level * 0.5 * (e.DutyHot + e.DutyCold));
            j.Add(sens);
            tau.Add((data.IntervalStart(indexes[s]) - onset).TotalDays);
        }
        var ranked = BiasAttribution.Rank(f, j, tau);
        return (ranked, BiasAttribution.Suspects(ranked, tags));
    }

    private static double Median(IReadOnlyList<double> sorted) =>
        sorted.Count == 0 ? double.NaN : sorted.Count % 2 == 1 ? sorted[sorted.Count / 2] : 0.5 * (sorted[sorted.Count / 2 - 1] + sorted[sorted.Count / 2]);
}
