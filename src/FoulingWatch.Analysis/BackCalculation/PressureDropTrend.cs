using System.Globalization;
using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis;

/// <summary>How one side's pressure drop at a reference flow moved over the current cycle: a second sign of deposits,
/// independent of the temperature and flow instruments behind Rf.</summary>
/// <param name="ReferenceFlow">Mass flow the drops are referred to (kg/s): the design flow, else the median flow.</param>
/// <param name="First">Median referred drop (Pa) over the first week from <paramref name="From"/>.</param>
/// <param name="Last">Median referred drop (Pa) over the last week to <paramref name="To"/>.</param>
/// <param name="DepositFromDrop">Deposit thickness (m) that the drop's rise means in the tube bore; null unless the tube
/// diameter is configured.</param>
/// <param name="DepositFromRf">Deposit thickness (m) that Rf's rise over the same weeks means at the configured deposit
/// conductivity, δ = ΔRf·k; null unless configured.</param>
/// <param name="CleanRatio">Median of measured over clean drop (tube side, from the geometry method's bundle) over the
/// last week; null without a geometry.</param>
public sealed record PressureDropChange(string Side, string Tag, double ReferenceFlow, DateTimeOffset From, double First,
    DateTimeOffset To, double Last, string Statement, double? DepositFromDrop = null, double? DepositFromRf = null,
    double? CleanRatio = null)
{
    public double Change => Last / First - 1;

    /// <summary>Measured over clean drop per interval (NaN where the unit was down or a value missing): the clean drop
    /// from the geometry method's bundle when there is one, else the cycle's first week after its cleaning referred to
    /// the interval's flow (<see cref="RatioBasis"/>).</summary>
    public double[] Ratio { get; init; } = [];

    /// <summary>What the clean drop of <see cref="Ratio"/> is.</summary>
    public string RatioBasis { get; init; } = "";

    /// <summary>Slope of the daily median ratio over the current cycle (per day) and its standard error (AR(1) errors),
    /// or null with fewer than 7 days.</summary>
    public double? RatioSlopePerDay { get; init; }

    public double? RatioSlopeSigma { get; init; }
}

/// <summary>
/// Each side's measured pressure drop referred to one flow, ΔP_ref = ΔP·(ṁ_ref/ṁ)^1.8 (turbulent friction, ΔP ∝ ṁ^1.75–2;
/// common practice), compared between the first and the last week of the current cycle with data (since the last logged
/// cleaning, else the data's start). Samples at downtime or with a missing measurement are left out.
/// </summary>
public static class PressureDropTrend
{
    public const double FlowExponent = 1.8;
    private static readonly TimeSpan Week = TimeSpan.FromDays(7);

    public static IReadOnlyList<PressureDropChange> Evaluate(ExchangerConfiguration x, IngestResult data, SampleColumns samples,
        TimeZoneInfo zone)
    {
        var list = new List<PressureDropChange>();
        foreach (var (side, stream) in new[] { ("tube", x.Tube), ("shell", x.Shell) })
        {
            if (stream.PressureDropTag is not { } tag || !data.Series.TryGetValue(tag.Tag, out var dp)) continue;
            var flow = data.Series[stream.Flow.Tag];
            var running = Enumerable.Range(0, Math.Min(samples.Count, dp.Length))
                .Where(k => samples.Status[k] is not (SampleStatus.Missing or SampleStatus.Downtime) && dp[k] > 0 && flow[k] > 0).ToList();
            if (running.Count < 10) continue;
            var reference = stream.DesignFlow ?? Median(running.Select(k => flow[k]));
            var gridEnd = data.IntervalStart(data.IntervalCount);
            var start = x.Maintenance.Where(m => m.IsCleaning && m.Date < gridEnd).Select(m => (DateTimeOffset?)m.Date).LastOrDefault() ?? data.GridStart;
            double Referred(int k) => dp[k] * Math.Pow(reference / flow[k], FlowExponent);
            // the cycle's first week with data (a window may start after the cleaning)
            if (running.FirstOrDefault(k => data.IntervalStart(k) >= start, -1) is var firstIndex && firstIndex < 0) continue;
            start = data.IntervalStart(firstIndex);
            var first = running.Where(k => data.IntervalStart(k) >= start && data.IntervalStart(k) < start + Week).Select(Referred).ToList();
            var end = data.IntervalStart(running[^1]);
            var last = running.Where(k => data.IntervalStart(k) > end - Week).Select(Referred).ToList();
            if (first.Count < 5 || last.Count < 5 || end - start < 2 * Week) continue;
            var (a, b) = (Median(first), Median(last));
            var unit = tag.Unit;
            var text = string.Create(CultureInfo.InvariantCulture,
                $"{side}-side pressure drop at {reference * 3.6:0.#} t/h: {unit.FromSi(a):0.###} → {unit.FromSi(b):0.###} {unit.Symbol} ({b / a - 1:+0%;-0%}) " +
                $"from the week of {SiteCalendar.Date(start, zone)} to that of {SiteCalendar.Date(end, zone)}") +
                (b / a - 1 > 0.15 ? "; rising with deposits on this side, or a partly closed valve" : "");
            var (fromDrop, fromRf, comparison) = Deposits(stream, samples, data, start, end, b / a);
            var (ratio, basis) = Ratios(x, stream, side, data, samples, dp, flow, running, reference);
            double? cleanRatio = basis == GeometryBasis
                ? MedianOrNull(running.Where(k => data.IntervalStart(k) > end - Week).Select(k => ratio[k]).Where(double.IsFinite))
                : null;
            if (cleanRatio is { } cr) comparison += string.Create(CultureInfo.InvariantCulture, $"; measured over clean (geometry) {cr:0.00} in the last week");
            var (slope, sigma) = RatioTrend(data, ratio, start);
            if (slope is { } sl && sigma is { } sg)
                comparison += string.Create(CultureInfo.InvariantCulture, $"; measured over clean moving {sl * 100:+0.000;-0.000} ± {sg * 100:0.000} %/day over the cycle");
            list.Add(new PressureDropChange(side, tag.Tag, reference, start, a, end, b, text + comparison, fromDrop, fromRf, cleanRatio)
            {
                Ratio = ratio, RatioBasis = basis, RatioSlopePerDay = slope, RatioSlopeSigma = sigma,
            });
        }
        return list;
    }

    /// <summary>
    /// The deposit the two signals mean: from the drop, in a tube of bore D at a fixed flow ΔP ∝ D^−4.75 (Darcy–Weisbach
    /// with Blasius friction), so a ratio r means a layer δ = (D/2)·(1 − r^(−1/4.75)); from Rf, δ = ΔRf·k_deposit over the
    /// same weeks (a thin layer's conduction resistance). Two signals that disagree by more than a factor of two (and
    /// 0.02 mm) are named: heat-transfer loss without a narrowing bore points at the instruments, a narrowing bore without
    /// it at a more conductive deposit, debris or a valve.
    /// </summary>
    private static (double? FromDrop, double? FromRf, string Text) Deposits(Ingest.Configuration.StreamConfiguration stream,
        SampleColumns samples, IngestResult data, DateTimeOffset start, DateTimeOffset end, double ratio)
    {
        if (stream.TubeInnerDiameter is not { } bore || stream.DepositConductivity is not { } k) return (null, null, "");
        var fromDrop = ratio > 1 ? bore / 2 * (1 - Math.Pow(ratio, -1 / 4.75)) : 0;
        double? WeekRf(Func<DateTimeOffset, bool> inWeek)
        {
            var v = Enumerable.Range(0, samples.Count).Where(k => samples.UsableRf(k) && inWeek(samples.Timestamp(k)))
                .Select(k => samples.FoulingResistance[k]).ToList();
            return v.Count < 5 ? null : Median(v);
        }
        var rfFirst = WeekRf(t => t >= start && t < start + Week);
        var rfLast = WeekRf(t => t > end - Week && t <= end);
        if (rfFirst is null || rfLast is null) return (fromDrop, null, "");
        var fromRf = Math.Max(0, rfLast.Value - rfFirst.Value) * k;
        var text = string.Create(CultureInfo.InvariantCulture,
            $"; deposit about {fromDrop * 1e3:0.00} mm from the drop, {fromRf * 1e3:0.00} mm from Rf at {k:0.##} W/mK");
        const double floor = 2e-5;
        if (fromRf > 2 * fromDrop + floor) text += ": the heat-transfer loss is not matched by a narrowing bore; check the temperature and flow instruments";
        else if (fromDrop > 2 * fromRf + floor) text += ": the bore narrows more than Rf says; a more conductive deposit, debris, or a partly closed valve";
        else text += ": the two agree";
        return (fromDrop, fromRf, text);
    }

    public const string GeometryBasis = "the clean drop of the bundle geometry at each interval's flow and temperature";
    public const string CleaningBasis = "the first week after the cycle's cleaning, referred to each interval's flow";

    /// <summary>
    /// Measured over clean drop per interval. With the geometry method the clean drop is the bundle's own at the interval's
    /// flow and bulk temperature: tube side Darcy–Weisbach (<see cref="Core.Exchangers.ShellAndTubeGeometry.TubePressureDrop"/>),
    /// shell side Bell–Delaware's when the baffle cut is given. Otherwise each cycle (between logged cleanings) is its own
    /// reference: the median referred drop of its first week with data.
    /// </summary>
    private static (double[] Ratio, string Basis) Ratios(ExchangerConfiguration x, StreamConfiguration stream, string side, IngestResult data,
        SampleColumns samples, double[] dp, double[] flow, List<int> running, double reference)
    {
        var ratio = new double[dp.Length];
        Array.Fill(ratio, double.NaN);
        var hot = ReferenceEquals(stream, x.Hot);
        if (x.Clean is GeometryCleanReference g && stream.Fluid is Core.FluidModels.ITransportFluid fluid
            && (side == "tube" || g.Geometry.Baffles is not null))
        {
            var pressure = new Core.Quantities.Pressure(stream.PressurePascals);
            foreach (var k in running)
            {
                var m = samples.Measurements(k);
                var bulk = Core.Quantities.Temperature.FromKelvin(hot
                    ? 0.5 * (m[Measurement.HotInlet] + m[Measurement.HotOutlet]) : 0.5 * (m[Measurement.ColdInlet] + m[Measurement.ColdOutlet]));
                try
                {
                    var clean = side == "tube"
                        ? g.Geometry.TubePressureDrop(flow[k], fluid, bulk, pressure)
                        : g.Geometry.BellDelaware!.PressureDrop(flow[k], fluid.Viscosity(bulk, pressure),
                            fluid.Density(bulk, pressure) ?? double.NaN);
                    if (clean > 0) ratio[k] = dp[k] / clean;
                }
                catch (Core.Quantities.QuantityOutOfRangeException) { }
            }
            return (ratio, GeometryBasis);
        }
        var cleanings = x.Maintenance.Where(mt => mt.IsCleaning).Select(mt => mt.Date).Order().ToList();
        var bySegment = running.GroupBy(k => cleanings.Count(c => c <= data.IntervalStart(k)));
        foreach (var segment in bySegment)
        {
            var ks = segment.ToList();
            var first = data.IntervalStart(ks[0]);
            var week = ks.Where(k => data.IntervalStart(k) < first + Week).Select(k => dp[k] * Math.Pow(reference / flow[k], FlowExponent)).ToList();
            if (week.Count < 5) continue;
            var baseline = Median(week);
            foreach (var k in ks) ratio[k] = dp[k] * Math.Pow(reference / flow[k], FlowExponent) / baseline;
        }
        return (ratio, CleaningBasis);
    }

    /// <summary>Straight line through the daily medians of the ratio from the cycle's start, by least squares with AR(1)
    /// plus white-noise errors (<see cref="Trends.LeastSquares.FitWithSerialCorrelation"/>): slope per day and its standard
    /// error; null with fewer than 7 days.</summary>
    private static (double? Slope, double? Sigma) RatioTrend(IngestResult data, double[] ratio, DateTimeOffset start)
    {
        var days = new SortedDictionary<int, List<double>>();
        for (var k = 0; k < ratio.Length; k++)
        {
            var t = data.IntervalStart(k);
            if (t < start || !double.IsFinite(ratio[k])) continue;
            var day = (int)Math.Floor((t - start).TotalDays);
            if (!days.TryGetValue(day, out var list)) days[day] = list = [];
            list.Add(ratio[k]);
        }
        var used = days.Where(d => d.Value.Count >= 3).ToList();
        if (used.Count < 7) return (null, null);
        var tDays = used.Select(d => d.Key + 0.5).ToArray();
        var y = used.Select(d => Median(d.Value)).ToArray();
        var fit = Trends.LeastSquares.FitWithSerialCorrelation(new Trends.LinearFouling(), tDays, y, Enumerable.Repeat(1.0, y.Length).ToArray());
        return fit is null ? (null, null) : (fit.Parameters[1], fit.StandardErrors[1]);
    }

    private static double? MedianOrNull(IEnumerable<double> values)
    {
        var v = values.ToList();
        return v.Count < 5 ? null : Median(v);
    }

    private static double Median(IEnumerable<double> values)
    {
        var v = values.Sorted();
        return v.Length % 2 == 1 ? v[v.Length / 2] : 0.5 * (v[v.Length / 2 - 1] + v[v.Length / 2]);
    }
}
