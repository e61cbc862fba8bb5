using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;
using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.Trends;

/// <summary>One candidate model fitted to a cycle, with its Akaike weight among the cycle's candidates (NaN: not fitted).</summary>
public sealed record ModelCandidate(FoulingModel Model, FitResult? Fit, double Aicc, double RSquared, string? Skipped, double AkaikeWeight = double.NaN);

/// <summary>A fouling cycle [Start, End) between cleanings with its fitted models; the chosen one has the lowest AICc.</summary>
public sealed record FoulingCycle(
    DateTimeOffset Start, DateTimeOffset End, bool StartKnown, CleaningSource? StartSource, IReadOnlyList<DailyPoint> Points,
    IReadOnlyList<ModelCandidate> Candidates, ModelCandidate? Chosen, int OutliersRejected, string? Refusal)
{
    public double Days(DateTimeOffset t) => (t - Start).TotalDays;
}

/// <summary>What a cleaning achieved: Rf just before and after, the fraction removed, and the fouling rates of the cycles either side.</summary>
public sealed record CleaningEffect(Cleaning Cleaning, double? RfBefore, double? RfAfter, double? FractionRemoved, double? RateBefore, double? RateAfter);


/// <summary>The current fouling rate and whether it has jumped.</summary>
public sealed record FoulingRate(double Rate, double Sigma, double? RecentRate, double? EarlierRate, bool Jump, string Statement);

/// <param name="Draws">Joint draws of the current cycle's path (null: no fitted law, or withheld for a sensor fault).</param>
public sealed record TrendResult(IReadOnlyList<DailyPoint> Daily, IReadOnlyList<FoulingCycle> Cycles, IReadOnlyList<CleaningEffect> Cleanings,
    LimitForecast? Forecast, FoulingRate? Rate, string? ThresholdModelNote, JointDraws? Draws = null, string? Withheld = null)
{
    /// <summary>The chosen model's Rf at a time, or NaN where no model fits.</summary>
    public double Fitted(DateTimeOffset t)
    {
        foreach (var c in Cycles)
            if (t >= c.Start && t < c.End && c.Chosen?.Fit is { } f)
                return c.Chosen.Model.Value(f.Parameters, c.Days(t));
        return double.NaN;
    }
}

/// <summary>Cycles, fits, forecasts and rate alerts of one exchanger from its back-calculated history.</summary>
public static class TrendAnalysis
{
    public const int MinimumDays = 7;
    public const double IntervalLow = 0.05, IntervalHigh = 0.95;
    public static readonly TimeSpan Horizon = TimeSpan.FromDays(3 * 365);
    public const double RateJumpFactor = 2.0;
    public const int RecentDays = 28;

    public static readonly FoulingModel[] Models =
        [new LinearFouling(), new AsymptoticFouling(), new FallingRateFouling(), new AcceleratingFouling()];

    public const string ThresholdNote =
        "threshold (deposition minus removal, Ebert & Panchal 1995 family) model not fitted: it needs tube velocity or Reynolds number and film temperature, which the configuration does not give";

    /// <param name="zone">The site's time zone for dates in statements (UTC when not given).</param>
    public static TrendResult Run(ExchangerHistory history, IReadOnlyList<ShutdownWindow>? windows = null, TimeZoneInfo? zone = null)
    {
        var x = history.Exchanger;
        var daily = DailyFouling.Resample(history.Columns);
        var logged = x.Maintenance.Where(m => m.IsCleaning).Select(m => m.Date).ToList();
        var suppressed = x.Maintenance.Where(m => m.Action.Equals("not-cleaned", StringComparison.OrdinalIgnoreCase)).Select(m => m.Date).ToList();
        var c = history.Columns;
        var interval = c.Count > 1 ? c.Timestamp(1) - c.Timestamp(0) : TimeSpan.FromMinutes(10);
        // A detected cleaning is dated by its outage when the data show one: the restart starts the new cycle.
        var detected = CleaningDetection.Detect(daily, logged, suppressed).Select(d =>
            Outages.Near(c, d.Date - TimeSpan.FromDays(1), interval) is { } o
                ? d with { Date = o.End, OutageStart = o.Start, OutageEnd = o.End } : d).ToList();
        var cleanings = logged.Select(d => Outages.Near(c, d, interval) is { } o
                ? new Cleaning(d, CleaningSource.Logged, null, null, null, null, o.Start, o.End)
                : new Cleaning(d, CleaningSource.Logged, null, null, null, null))
            .Concat(detected).OrderBy(c => c.Date).ToList();

        var cycles = new List<FoulingCycle>();
        if (daily.Count > 0)
        {
            var dataEnd = daily[^1].Day + TimeSpan.FromDays(1);
            var boundaries = cleanings.Where(c => c.Date < dataEnd).ToList();
            var firstDay = daily[0].Day;
            if (boundaries.Count == 0 || boundaries[0].Date > firstDay)
                cycles.Add(FitCycle(firstDay, boundaries.Count > 0 ? boundaries[0].Date : dataEnd, false, null, daily, history));
            for (var i = 0; i < boundaries.Count; i++)
            {
                var end = i + 1 < boundaries.Count ? boundaries[i + 1].Date : dataEnd;
                if (end <= firstDay) continue;
                cycles.Add(FitCycle(boundaries[i].Date, end, true, boundaries[i].Source, daily, history));
            }
        }
        var effects = cleanings.Select(c => Effect(c, daily, cycles)).ToList();
        var current = cycles.Count > 0 ? cycles[^1] : null;
        var seed = StableSeed(x.Id);
        var rate = current is null ? null : Rate(current);
        var thresholdNote = x.Threshold is null ? ThresholdNote : null;
        if (history.SensorCheck.LikelyFault)
        {
            var why = $"forecast and cleaning plan withheld: {history.SensorCheck.Statement}";
            return new TrendResult(daily, cycles, effects, null, rate, thresholdNote, null, why);
        }
        var spread = current?.Chosen is null ? 1
            : ForecastDiscrepancy.Factor(p => T(current.Start, p), current.Points, pts => FitAll(current.Start, pts, null));
        var draws = current?.Chosen is null ? null : JointDraws.Draw(current.Candidates, SystematicSigma(current), seed, spread);
        var forecast = current is null || draws is null ? null : LimitForecasting.Forecast(history, current, draws, windows ?? [], zone ?? TimeZoneInfo.Utc);
        return new TrendResult(daily, cycles, effects, forecast, rate, thresholdNote, draws);
    }

    /// <summary>Systematic standard uncertainty of the cycle's Rf now: the median over its last 14 usable days.</summary>
    public static double SystematicSigma(FoulingCycle cycle)
    {
        var v = cycle.Points.TakeLast(14).Select(p => p.SigmaSystematic).Where(double.IsFinite).Sorted();
        return v.Length == 0 ? 0 : DailyFouling.Median(v);
    }

    private static FoulingCycle FitCycle(DateTimeOffset start, DateTimeOffset end, bool known, CleaningSource? source, List<DailyPoint> daily, ExchangerHistory history)
    {
        var threshold = history.Exchanger.Threshold is { } ts ? ThresholdFouling.ForCycle(history, ts, start, end) : null;
        var points = daily.Where(d => InCycle(d.Day, start, end)).ToList();
        if (points.Count < MinimumDays)
            return new FoulingCycle(start, end, known, source, points, [], null, 0,
                $"too short to fit: {points.Count} usable days, at least {MinimumDays} needed");
        var used = points;
        var outliers = 0;
        List<ModelCandidate> candidates = [];
        for (var pass = 0; pass < 3; pass++)
        {
            candidates = FitAll(start, used, threshold);
            var best = candidates.Where(c => c.Fit is not null).MinBy(c => c.Aicc);
            if (best?.Fit is null) break;
            // Iterative rejection of points more than 4 standard residuals off the best model.
            var s = best.Fit.ResidualStandardDeviation;
            var keep = used.Where(p => Math.Abs(p.FoulingResistance - best.Model.Value(best.Fit.Parameters, T(start, p))) / Sigma(p) <= 4 * Math.Max(1, s)).ToList();
            if (keep.Count == used.Count || keep.Count < MinimumDays) break;
            outliers += used.Count - keep.Count;
            used = keep;
        }
        var chosen = candidates.Where(c => c.Fit is not null).MinBy(c => c.Aicc);
        var refusal = chosen is null ? "no model could be fitted" : Insignificance(chosen, start, used);
        return new FoulingCycle(start, end, known, source, used, candidates, refusal is null ? chosen : null, outliers, refusal);
    }

    /// <summary>A day belongs to the cycle in which it ends: a day straddling a restart holds only samples after it (those
    /// before were downtime), so it opens the new cycle.</summary>
    public static bool InCycle(DateTimeOffset day, DateTimeOffset start, DateTimeOffset end) =>
        day + TimeSpan.FromDays(1) > start && day + TimeSpan.FromDays(1) <= end;

    /// <summary>Days after the data over which the implied growth is judged (a planning horizon).</summary>
    public const double SignificanceLookAheadDays = 90;

    /// <summary>Why the chosen law is not reported as fouling, or null when it is: the growth it implies from the first day
    /// of the cycle to <see cref="SignificanceLookAheadDays"/> after the data must exceed twice its standard error (serial
    /// correlation allowed for) and the systematic uncertainty of Rf.</summary>
    /// <remarks>A slope can pass 2 SE on a clean exchanger when the errors are correlated or the data long; the growth
    /// must also be larger than what a calibration error of the instruments or the clean reference could make of Rf.</remarks>
    private static string? Insignificance(ModelCandidate chosen, DateTimeOffset start, List<DailyPoint> points)
    {
        var fit = chosen.Fit!;
        var model = chosen.Model;
        double t0 = T(start, points[0]), t1 = T(start, points[^1]) + SignificanceLookAheadDays;
        var growth = model.Value(fit.Parameters, t1) - model.Value(fit.Parameters, t0);
        var k = fit.Parameters.Length;
        var g = new double[k];
        Span<double> g0 = stackalloc double[k];
        Span<double> g1 = stackalloc double[k];
        model.Gradient(fit.Parameters, t0, g0);
        model.Gradient(fit.Parameters, t1, g1);
        for (var i = 0; i < k; i++) g[i] = g1[i] - g0[i];
        var variance = 0.0;
        for (var i = 0; i < k; i++)
        for (var j = 0; j < k; j++) variance += g[i] * fit.Covariance[i, j] * g[j];
        var se = Math.Sqrt(Math.Max(0, variance));
        var systematic = DailyFouling.Median(points.Select(p => p.SigmaSystematic).Sorted());
        if (growth > 2 * se && growth > systematic) return null;
        return FormattableString.Invariant(
            $"no significant fouling: the {model.Key} law grows {growth:0.00e0} ± {se:0.0e0} m2K/W from the cycle start to {SignificanceLookAheadDays:0} days ahead, within twice its standard error or the systematic uncertainty of Rf ({systematic:0.0e0} m2K/W); Rf stays near {DailyFouling.Median(points.Select(p => p.FoulingResistance).Sorted()):0.00e0} m2K/W");
    }

    private static double T(DateTimeOffset start, DailyPoint p) => (p.Day - start).TotalDays + 0.5;
    private static double Sigma(DailyPoint p) => Math.Max(p.Sigma, 1e-7);

    private static List<ModelCandidate> FitAll(DateTimeOffset start, List<DailyPoint> points, ThresholdFouling? threshold)
    {
        var t = points.Select(p => T(start, p)).ToArray();
        var y = points.Select(p => p.FoulingResistance).ToArray();
        var w = points.Select(p => 1 / (Sigma(p) * Sigma(p))).ToArray();
        var list = new List<ModelCandidate>();
        foreach (var m in threshold is null ? Models : [.. Models, threshold])
        {
            var fit = LeastSquares.FitWithSerialCorrelation(m, t, y, w);
            if (fit is null) { list.Add(new ModelCandidate(m, null, double.PositiveInfinity, double.NaN, "the fit did not converge")); continue; }
            var n = t.Length;
            // AICc of the Gaussian likelihood with AR(1) errors: the whitened RSS plus the whitening's log-determinant;
            // parameters: the law's, the residual variance and, when estimated, φ and c (Hurvich & Tsai, Biometrika 76 (1989) 297).
            var k = m.ParameterNames.Length + 1 + (fit.Autocorrelation > 0 ? 2 : 0);
            var aicc = n * Math.Log(fit.WeightedResidualSumOfSquares / n) + fit.LogDeterminantTerm + 2 * k
                       + (n - k - 1 > 0 ? 2.0 * k * (k + 1) / (n - k - 1) : double.PositiveInfinity);
            var mean = y.Zip(w).Sum(p => p.First * p.Second) / w.Sum();
            var tss = y.Zip(w).Sum(p => p.Second * (p.First - mean) * (p.First - mean));
            var rss = t.Select((ti, i) => w[i] * Math.Pow(y[i] - m.Value(fit.Parameters, ti), 2)).Sum();
            list.Add(new ModelCandidate(m, fit, aicc, tss > 0 ? 1 - rss / tss : double.NaN, null));
        }
        var fitted = list.Where(c => c.Fit is not null && double.IsFinite(c.Aicc)).ToList();
        if (fitted.Count == 0) return list;
        var weights = JointDraws.AkaikeWeights(fitted.Select(c => c.Aicc).ToArray());
        return list.Select(c => fitted.IndexOf(c) is var i and >= 0 ? c with { AkaikeWeight = weights[i] } : c).ToList();
    }

    private static CleaningEffect Effect(Cleaning c, List<DailyPoint> daily, List<FoulingCycle> cycles)
    {
        var before = daily.Where(d => d.Day + TimeSpan.FromDays(1) <= (c.OutageStart ?? c.Date)).TakeLast(3).Select(d => d.FoulingResistance).Sorted();
        var after = daily.Where(d => d.Day + TimeSpan.FromDays(1) > c.Date).Take(3).Select(d => d.FoulingResistance).Sorted();
        double? b = before.Length > 0 ? DailyFouling.Median(before) : null;
        double? a = after.Length > 0 ? DailyFouling.Median(after) : null;
        double? fraction = b is > 0 && a is not null ? (b - a) / b : null;
        var previous = cycles.LastOrDefault(cy => cy.End <= c.Date.AddDays(1) && cy.Start < c.Date);
        var next = cycles.FirstOrDefault(cy => cy.Start == c.Date);
        return new CleaningEffect(c, b, a, fraction, LinearRate(previous), LinearRate(next));
    }

    private static double? LinearRate(FoulingCycle? c) =>
        c?.Candidates.FirstOrDefault(m => m.Model is LinearFouling)?.Fit?.Parameters[1];

    /// <summary>The Rf limit: configured directly, or from a minimum duty or cold-outlet limit turned into Rf at typical recent conditions.</summary>
    public static (double Limit, string Source)? Limit(ExchangerHistory history)
    {
        var x = history.Exchanger;
        if (x.Limits.FoulingResistance is { } rf) return (rf, "configured fouling-resistance limit");
        var c = history.Columns;
        var recent = c.RecentWithCleanU(30 * 144);
        if (recent.Length == 0 || (x.Limits.MinimumDuty is null && x.Limits.MinimumColdOutlet is null)) return null;
        double Med(double[] column) => SampleColumns.MedianAt(column, recent);
        var ch = Med(c.HotCapacityRate);
        var cc = Med(c.ColdCapacityRate);
        var thi = Temperature.FromKelvin(Med(c.Measured[Measurement.HotInlet]));
        var tci = Temperature.FromKelvin(Med(c.Measured[Measurement.ColdInlet]));
        var uc = Med(c.UClean);
        Func<double, double> metric = x.Limits.MinimumDuty is not null
            ? u => Rating.Rate(x.Arrangement, u * x.Area, ch, cc, thi, tci).Duty
            : u => Rating.Rate(x.Arrangement, u * x.Area, ch, cc, thi, tci).ColdOutlet.Kelvin;
        var target = x.Limits.MinimumDuty ?? x.Limits.MinimumColdOutlet!.Value;
        if (metric(uc) <= target) return null;
        double lo = 1e-3, hi = uc;
        for (var i = 0; i < 100; i++)
        {
            var mid = 0.5 * (lo + hi);
            if (metric(mid) < target) lo = mid; else hi = mid;
        }
        var what = x.Limits.MinimumDuty is not null ? "minimum duty" : "minimum cold outlet temperature";
        return (1 / hi - 1 / uc, $"{what} turned into an Rf limit at the median conditions of the last 30 days");
    }

    private static FoulingRate? Rate(FoulingCycle cycle)
    {
        if (cycle.Chosen?.Fit is not { } fit) return null;
        var model = cycle.Chosen.Model;
        var tNow = cycle.Days(cycle.Points[^1].Day) + 0.5;
        var rate = model.Rate(fit.Parameters, tNow);
        var k = fit.Parameters.Length;
        var g = new double[k];
        for (var i = 0; i < k; i++)
        {
            var h = Math.Max(1e-8, 1e-4 * Math.Abs(fit.Parameters[i]));
            var up = (double[])fit.Parameters.Clone();
            var down = (double[])fit.Parameters.Clone();
            up[i] += h;
            down[i] -= h;
            g[i] = (model.Rate(up, tNow) - model.Rate(down, tNow)) / (2 * h);
        }
        var variance = 0.0;
        for (var i = 0; i < k; i++)
        for (var j = 0; j < k; j++) variance += g[i] * fit.Covariance[i, j] * g[j];
        var sigma = Math.Sqrt(Math.Max(0, variance));

        var cut = cycle.Points[^1].Day - TimeSpan.FromDays(RecentDays);
        var recent = cycle.Points.Where(p => p.Day > cut).ToList();
        var earlier = cycle.Points.Where(p => p.Day <= cut).ToList();
        double? recentRate = null, earlierRate = null;
        var jump = false;
        if (recent.Count >= 10 && earlier.Count >= 10)
        {
            var r = Slope(cycle.Start, recent);
            var e = Slope(cycle.Start, earlier);
            recentRate = r?.Parameters[1];
            earlierRate = e?.Parameters[1];
            jump = r is not null && e is not null && r.Parameters[1] > 2 * r.StandardErrors[1]
                   && r.Parameters[1] > RateJumpFactor * Math.Max(e.Parameters[1], e.StandardErrors[1]);
        }
        var statement = FormattableString.Invariant($"fouling rate now {rate * 30:G3} ± {sigma * 30:G2} m2K/W per 30 days ({model.Key} fit)") +
                        (jump ? FormattableString.Invariant($"; ALERT: the last {RecentDays} days foul at {recentRate * 30:G3} per 30 days, more than {RateJumpFactor:0.#}x the cycle's earlier {earlierRate * 30:G3}") : "");
        return new FoulingRate(rate, sigma, recentRate, earlierRate, jump, statement);
    }

    private static FitResult? Slope(DateTimeOffset start, List<DailyPoint> points) =>
        LeastSquares.Fit(new LinearFouling(), points.Select(p => T(start, p)).ToArray(), points.Select(p => p.FoulingResistance).ToArray(),
            points.Select(p => 1 / (Sigma(p) * Sigma(p))).ToArray());

    /// <summary>FNV-1a hash of the id: a seed that is the same on every run and machine (string.GetHashCode is not).</summary>
    public static int StableSeed(string id)
    {
        unchecked
        {
            var h = 2166136261u;
            foreach (var c in id) { h ^= c; h *= 16777619u; }
            return (int)(h & 0x7FFFFFFF);
        }
    }
}
