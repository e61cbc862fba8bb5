using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Analysis.Economics;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis;

/// <summary>Current state of an exchanger: medians over the latest day of usable samples.</summary>
public sealed record CurrentState(DateTimeOffset? LastUsable, int Samples, double UActual, double UClean, double FoulingResistance,
    double FoulingResistanceSigma, double Cleanliness, double Duty, double LostDuty);

/// <summary>Everything computed for one exchanger.</summary>
public sealed record ExchangerResult(ExchangerHistory History, CurrentState Current, IReadOnlyDictionary<string, int> StatusCounts, TrendResult Trend, ExchangerEconomics Economics)
{
    /// <summary>Each side's pressure drop at a reference flow over the current cycle, where a pressureDrop tag is configured.</summary>
    public IReadOnlyList<PressureDropChange> PressureDrops { get; init; } = [];

    /// <summary>Duties at the latest usable interval in the actual arrangement, as counterflow and as parallel flow.</summary>
    public IReadOnlyList<ArrangementDuty> WhatIf { get; init; } = [];
}

/// <summary>Everything computed for the plant in one run.</summary>
/// <param name="AuditPeriod">Period [From, To) of the energy audit; null: the last 12 months of data.</param>
public sealed record PlantResult(PlantConfiguration Configuration, IngestResult Ingest, IReadOnlyList<ExchangerResult> Exchangers, FleetCleaningPlan Plan,
    (DateTimeOffset From, DateTimeOffset To)? AuditPeriod = null);

/// <summary>Runs the pipeline on a plant: ingest, then per exchanger back-calculation.</summary>
public static class PlantAnalysis
{
    /// <param name="finished">Called with each exchanger's result as soon as it is complete (from a worker thread); what
    /// it returns is kept in the plant result. A run that writes each exchanger's files there and returns the result with
    /// its samples released (<see cref="ReleaseSamples"/>) holds one or two exchangers' samples at a time, not the fleet's.</param>
    public static PlantResult Run(PlantConfiguration config, IProgress<(string Stage, double Fraction)>? progress = null,
        Func<ExchangerResult, ExchangerResult>? finished = null)
    {
        // No local holds the ingest result: the run below may drop its series as it goes.
        return Run(config, StageClock.Time("ingest", () => HistorianIngest.Run(config,
            progress is null ? null : new Progress<(string File, double Fraction)>(p => progress.Report(($"reading {Path.GetFileName(p.File)}", p.Fraction))))),
            progress, finished);
    }

    /// <summary>The result with its per-sample columns released but for the status and lost duty (see
    /// <see cref="SampleColumns.Released"/>).</summary>
    public static ExchangerResult ReleaseSamples(ExchangerResult x) =>
        x with { History = x.History with { Columns = x.History.Columns.Released() } };

    /// <summary>Runs the analysis on data already ingested and aligned.</summary>
    public static PlantResult Run(PlantConfiguration config, IngestResult ingest, IProgress<(string Stage, double Fraction)>? progress = null,
        Func<ExchangerResult, ExchangerResult>? finished = null)
    {
        // Exchangers are independent (each seeds its own draws from its id): they run side by side, results in
        // configuration order, so a run is identical whatever the number of cores.
        // A run that releases each exchanger's samples when it is finished also drops each aligned input series as soon as
        // no exchanger still to finish reads it: the fleet's series shrink as the run goes instead of staying to its end.
        var inputs = finished is null ? null : new InputSeries(config, ingest);
        if (inputs is not null) ingest = inputs.Ingest;
        var results = new ExchangerResult[config.Exchangers.Count];
        var done = 0;
        Parallel.For(0, config.Exchangers.Count, new ParallelOptions { MaxDegreeOfParallelism = Environment.ProcessorCount }, i =>
        {
            var x = config.Exchangers[i];
            var history = StageClock.Time("back-calculation", () => BackCalculator.Run(x, ingest,
                OperatingStateSettings.Default with { FrozenAfter = config.Data.FrozenAfter ?? DataSettings.DefaultFrozenAfter },
                config.Site.TimeZone));
            var current = Current(history);
            var trend = StageClock.Time("trends", () => TrendAnalysis.Run(history, config.ShutdownWindows, config.Site.TimeZone));
            var economics = StageClock.Time("economics", () => FoulingEconomics.Run(history, trend, config, current));
            var result = new ExchangerResult(history, current, StatusCounts(history), trend, economics)
            {
                PressureDrops = PressureDropTrend.Evaluate(x, ingest, history.Columns, config.Site.TimeZone),
                WhatIf = WhatIf.Rate(x, history.Columns),
            };
            results[i] = finished is null ? result : finished(result);
            inputs?.Finished(x);
            progress?.Report(($"back-calculated, fitted and priced {x.Id}", Interlocked.Increment(ref done) / (double)config.Exchangers.Count));
        });
        var plan = StageClock.Time("plan", () => FleetPlan.Build(results.Select(r => (r.History.Exchanger, r.Economics)).ToList(),
            config.ShutdownWindows, config.Site.TimeZone));
        return new PlantResult(config, ingest, results, plan);
    }

    /// <summary>Latest usable data older than this before the end of the data mark an exchanger stale (common practice:
    /// a week without a usable day means the state shown is not today's).</summary>
    public static readonly TimeSpan StaleAfter = TimeSpan.FromDays(7);

    /// <summary>Days from the exchanger's latest usable data to the end of the data when beyond <see cref="StaleAfter"/>,
    /// else null (also null when it has no usable data at all: that is said elsewhere).</summary>
    public static double? DaysStale(ExchangerResult x, IngestResult ingest)
    {
        if (x.Current.LastUsable is not { } last) return null;
        var age = ingest.IntervalStart(ingest.IntervalCount) - last;
        return age > StaleAfter ? age.TotalDays : null;
    }

    /// <summary>Why no interval is usable, in words with the top reasons and what to change; null when some are usable.</summary>
    public static string? NoUsableIntervals(IReadOnlyDictionary<string, int> counts)
    {
        if (counts.GetValueOrDefault("ok") > 0) return null;
        var top = counts.Where(kv => kv.Key != "ok" && kv.Value > 0).OrderByDescending(kv => kv.Value).Take(3).ToList();
        if (top.Count == 0) return "no interval to analyse: the grid is empty; check the data window and the exports";
        static string Advice(string key) => key switch
        {
            "balance" => "check flow units and densities, fluid models and balanceTolerance",
            "correction-undefined" or "temperature-cross" => "check the arrangement and which tags are inlets and outlets",
            "downtime" => "check designFlow and downtimeFlowFraction",
            "missing" => "check that all six tags have data in the same period",
            "frozen" => "check the frozen transmitters, or data.frozenAfter",
            "drift" => "check or recalibrate the drifting instrument named under sensors",
            "no-duty" => "check hot/cold assignment and swapped tags",
            "property-range" => "check the fluid models' ranges and the pressures",
            "implausible" => "U far above the clean U: check flow units and scales, the area and the clean reference",
            _ => "see the status column of timeseries.csv",
        };
        return "no usable interval: " + string.Join(", ", top.Select(kv => FormattableString.Invariant($"{kv.Value:N0} {kv.Key}"))) +
               "; " + Advice(top[0].Key);
    }

    public static IReadOnlyDictionary<string, int> StatusCounts(ExchangerHistory h)
    {
        var counts = SampleStatusText.All.ToDictionary(s => s.Key(), _ => 0);
        foreach (var s in h.Columns.Status) counts[s.Key()]++;
        return counts;
    }

    public static CurrentState Current(ExchangerHistory h)
    {
        var c = h.Columns;
        var lastIndex = Enumerable.Range(0, c.Count).LastOrDefault(c.UsableRf, -1);
        if (lastIndex < 0) return new CurrentState(null, 0, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN, double.NaN);
        var last = c.Timestamp(lastIndex);
        var day = new List<int>();
        for (var k = lastIndex; k >= 0 && c.Timestamp(k) > last - TimeSpan.FromDays(1); k--)
            if (c.UsableRf(k)) day.Add(k);
        day.Reverse();
        double Median(double[] column)
        {
            var v = day.Select(k => column[k]).Where(double.IsFinite).Sorted();
            return v.Length == 0 ? double.NaN : v.Length % 2 == 1 ? v[v.Length / 2] : 0.5 * (v[v.Length / 2 - 1] + v[v.Length / 2]);
        }
        return new CurrentState(last, day.Count, Median(c.UActual), Median(c.UClean), Median(c.FoulingResistance),
            Median(c.Sigma), Median(c.Cleanliness), Median(c.Duty), Median(c.LostDuty));
    }
}
