using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Settings of the operating-state tests; the defaults are common practice for 10-minute historian data.</summary>
/// <param name="SteadyWindow">Trailing window of the steady-state test.</param>
/// <param name="SteadyFlowBand">Largest (max − min)/mean of each flow inside the window.</param>
/// <param name="SteadyTemperatureBand">Largest max − min of each inlet temperature inside the window, K.</param>
/// <param name="FrozenAfter">A measurement holding one value this long is frozen (zero: no check).</param>
public sealed record OperatingStateSettings(TimeSpan SteadyWindow, double SteadyFlowBand, double SteadyTemperatureBand, TimeSpan FrozenAfter)
{
    public static OperatingStateSettings Default { get; } = new(TimeSpan.FromHours(1), 0.10, 3.0, DataSettings.DefaultFrozenAfter);
}

/// <summary>One analysed instant of one exchanger.</summary>
/// <param name="FoulingResistanceSigma">Combined standard uncertainty of Rf, √(systematic² + random²), m²·K/W.</param>
/// <param name="SigmaSystematic">Systematic part: instrument calibration (configured accuracies) and the clean reference;
/// it does not average away. NaN: not evaluated (then the combined σ is taken as random).</param>
/// <param name="SigmaRandom">Random part, from the scatter of the day's Rf about its median; it averages away.</param>
public sealed record SampleResult(DateTimeOffset Timestamp, SampleStatus Status, SampleEvaluation Evaluation, double FoulingResistanceSigma,
    double SigmaSystematic = double.NaN, double SigmaRandom = double.NaN);

/// <summary>What the clean-U reference is and how well it was determined.</summary>
/// <param name="Cycles">The clean U learned after each logged cleaning in the data (Wilson plot with a fouling term), at
/// reference flows: how it moves from cycle to cycle is itself a health indicator.</param>
public sealed record CleanReferenceReport(string Method, string Description, string? Refusal, int CalibrationSamples, double? ResidualStandardDeviation,
    DateTimeOffset? PeriodStart, DateTimeOffset? PeriodEnd, IReadOnlyList<CycleBaseline>? Cycles = null, string? CycleStatement = null);

/// <summary>Per-sensor check of the heat balance over the latest days: which single sensor bias best explains the mismatch.</summary>
public sealed record SensorCheck(int Samples, double FractionFailingGlobalTest, string? LikelySensor, string? Tag, double? Bias, string? BiasUnit,
    double? ExplainedFraction, bool LikelyFault, string Statement);

/// <summary>The back-calculated history of one exchanger.</summary>
/// <param name="Drift">A lasting change of the heat balance (an instrument drifting) found over the whole record, or null.</param>
/// <param name="Columns">The samples in columns, index k the interval (see <see cref="SampleColumns"/>).</param>
public sealed record ExchangerHistory(ExchangerConfiguration Exchanger, SampleColumns Columns, CleanReferenceReport CleanReference,
    SensorCheck SensorCheck, string? Refusal, BalanceDrift? Drift = null)
{
    /// <summary>A history of the given samples (any timestamps), as tests and small callers build one.</summary>
    public ExchangerHistory(ExchangerConfiguration exchanger, IReadOnlyList<SampleResult> samples, CleanReferenceReport cleanReference,
        SensorCheck sensorCheck, string? refusal, BalanceDrift? drift = null)
        : this(exchanger, SampleColumns.From(samples), cleanReference, sensorCheck, refusal, drift) { }

    /// <summary>The clean-U reference the samples were completed with (null when none could be found).</summary>
    public ICleanUModel? CleanModel { get; init; }

    /// <summary>The samples as records, built one at a time on access; the columns are the cheaper way through many.</summary>
    public IReadOnlyList<SampleResult> Samples => Columns.AsResults();
}

/// <summary>Turns the aligned historian data of an exchanger into per-sample duty, U, clean U, Rf with σ, and lost duty.</summary>
public static class BackCalculator
{
    public static ExchangerHistory Run(ExchangerConfiguration x, IngestResult data, OperatingStateSettings? settings = null,
        TimeZoneInfo? zone = null)
    {
        settings ??= OperatingStateSettings.Default;
        var n = data.IntervalCount;
        double[] S(TagReference t) => data.Series[t.Tag];
        var series = new[] { S(x.Hot.Flow), S(x.Hot.Inlet), S(x.Hot.Outlet), S(x.Cold.Flow), S(x.Cold.Inlet), S(x.Cold.Outlet) };
        var pHotSeries = x.Hot.PressureTag is null ? null : S(x.Hot.PressureTag);
        var pColdSeries = x.Cold.PressureTag is null ? null : S(x.Cold.PressureTag);
        var evaluator = new SampleEvaluator(x);

        var hotReference = x.Hot.DesignFlow ?? Percentile(series[Measurement.HotFlow], 0.9);
        var coldReference = x.Cold.DesignFlow ?? Percentile(series[Measurement.ColdFlow], 0.9);
        var window = Math.Max(1, (int)(settings.SteadyWindow.Ticks / data.Interval.Ticks));

        var frozenRun = settings.FrozenAfter > TimeSpan.Zero ? (int)Math.Ceiling(settings.FrozenAfter.Ticks / (double)data.Interval.Ticks) : 0;
        var frozen = frozenRun > 0 ? FrozenValues.Mark(series, n, Math.Max(2, frozenRun)) : Enumerable.Repeat(-1, n).ToArray();
        var tags = new[] { x.Hot.Flow, x.Hot.Inlet, x.Hot.Outlet, x.Cold.Flow, x.Cold.Inlet, x.Cold.Outlet };
        var c = new SampleColumns(n, data.GridStart, data.Interval, series, x.DutyBasis == DutyBasis.Reconciled);
        var frozenDetail = tags.Select(t => $"{t.Tag} held one value for at least {settings.FrozenAfter.TotalHours:0.#} h").ToArray();
        // Each worker reads its samples into one buffer of its own: the evaluation record is stored in the columns at once.
        Parallel.For(0, n, () => (Measured: new double[Measurement.Count], Memo: new DutyMemo()), (k, _, buffers) =>
        {
            Evaluate(k, buffers.Measured, buffers.Memo);
            return buffers;
        }, _ => { });
        void Evaluate(int k, double[] m, DutyMemo memo)
        {
            for (var i = 0; i < m.Length; i++) m[i] = series[i][k];
            var pHot = pHotSeries?[k] ?? x.Hot.PressurePascals;
            var pCold = pColdSeries?[k] ?? x.Cold.PressurePascals;
            if (m.Any(double.IsNaN) || double.IsNaN(pHot) || double.IsNaN(pCold)) { c.Status[k] = SampleStatus.Missing; return; }
            if (m[Measurement.HotFlow] < x.DowntimeFlowFraction * hotReference || m[Measurement.ColdFlow] < x.DowntimeFlowFraction * coldReference)
            {
                c.Status[k] = SampleStatus.Downtime;
                return;
            }
            if (frozen[k] >= 0)
            {
                c.Status[k] = SampleStatus.Frozen;
                c.Detail[k] = frozenDetail[frozen[k]];
                return;
            }
            var e = evaluator.Evaluate(m, pHot, pCold, reconcile: true, memo);
            if (e.Status == SampleStatus.Ok && Math.Abs(e.BalanceMismatch) > x.BalanceTolerance)
                e = e with { Status = SampleStatus.Balance, Detail = FormattableString.Invariant($"hot and cold duties differ by {e.BalanceMismatch:P1}") };
            if (e.Status == SampleStatus.Ok && !IsSteady(series, k, window, settings))
                e = e with { Status = SampleStatus.Unsteady };
            c.Set(k, e);
        }

        var drift = BalanceDriftDetector.Detect(data, c, evaluator, tags.Select(t => t.Tag).ToArray(), zone);
        if (drift is not null) MarkDrift(data, c, drift, zone ?? TimeZoneInfo.Utc);

        var (clean, cleanReport) = CleanModel(x, data, c, evaluator);
        var cycles = CycleBaselines.Fit(x, data, c, evaluator, clean, zone ?? TimeZoneInfo.Utc);
        cleanReport = cleanReport with { Cycles = cycles.Cycles, CycleStatement = cycles.Statement };
        if (clean is null)
        {
            for (var k = 0; k < n; k++) c.SetSigma(k, 0, 0, double.NaN);
            return new ExchangerHistory(x, c, cleanReport, SensorCheckOf(x, data, c, evaluator),
                $"no clean-U reference: {cleanReport.Refusal}", drift);
        }

        // Clean-U values straight into the columns, from two buffers per worker: no record per sample.
        Parallel.For(0, n,
            () => (Used: new double[Measurement.Count], Measured: new double[Measurement.Count], Memo: new DutyMemo()),
            (k, _, buffers) =>
            {
                Complete(k, buffers.Used, buffers.Measured, buffers.Memo);
                return buffers;
            }, _ => { });
        void Complete(int k, double[] used, double[] measured, DutyMemo memo)
        {
            var u = c.UActual[k];
            if (!(u > 0)) return;
            c.UsedInto(k, used);
            if (evaluator.CleanValues(u, c.TubeFlow[k], c.ShellFlow[k], c.HotCapacityRate[k], c.ColdCapacityRate[k], used, clean)
                is not { } v)
            {
                (c.Status[k], c.Detail[k]) = (SampleStatus.PropertyRange, SampleEvaluator.CleanUUndefined);
                return;
            }
            c.SetClean(k, v);
            if (c.Status[k] == SampleStatus.Ok && v.Cleanliness > SampleStatusText.MaxCleanliness)
                (c.Status[k], c.Detail[k]) = (SampleStatus.Implausible, FormattableString.Invariant(
                    $"U = {u:0} W/m2K is {v.Cleanliness:0.0} times the clean U; check flow units and scales, the area and the clean reference"));
            if (c.Status[k] != SampleStatus.Ok) return;
            var pHot = pHotSeries?[k] ?? x.Hot.PressurePascals;
            var pCold = pColdSeries?[k] ?? x.Cold.PressurePascals;
            var instruments = evaluator.FoulingResistanceSigma(c.MeasurementsInto(k, measured), pHot, pCold, clean, memo);
            var (tubeBulk, shellBulk) = evaluator.BulkTemperatures(used);
            var reference = clean.InverseSigma(c.TubeFlow[k], c.ShellFlow[k], tubeBulk, shellBulk);
            c.SigmaSystematic[k] = Math.Sqrt(instruments * instruments + reference * reference);
        }
        var random = RandomPart.PerSample(data, c);
        for (var k = 0; k < n; k++)
        {
            var (sys, rnd) = (c.SigmaSystematic[k], random[k]);
            c.SetSigma(k, double.IsFinite(rnd) ? Math.Sqrt(sys * sys + rnd * rnd) : sys, sys, rnd);
        }
        return new ExchangerHistory(x, c, cleanReport, SensorCheckOf(x, data, c, evaluator), null, drift) { CleanModel = clean };
    }

    /// <summary>Samples from the drift onset that would otherwise be judged (ok, balance, unsteady) get the status drift.</summary>
    private static void MarkDrift(IngestResult data, SampleColumns c, BalanceDrift drift, TimeZoneInfo zone)
    {
        var detail = drift.SingleSensor
            ? $"after the onset {SiteCalendar.Date(drift.Onset, zone)} of a drift on {drift.Tag}"
            : $"after the onset {SiteCalendar.Date(drift.Onset, zone)} of a heat-balance change";
        for (var k = 0; k < c.Count; k++)
        {
            if (data.IntervalStart(k) < drift.Onset) continue;
            if (c.Status[k] is not (SampleStatus.Ok or SampleStatus.Balance or SampleStatus.Unsteady)) continue;
            c.Status[k] = SampleStatus.Drift;
            c.Detail[k] = detail;
        }
    }

    /// <summary>Windowed range test over the trailing window: each flow within a band of its mean and each inlet temperature within a band in K; needs half the window present.</summary>
    private static bool IsSteady(double[][] series, int k, int window, OperatingStateSettings s)
    {
        var from = Math.Max(0, k - window + 1);
        foreach (var (i, isFlow) in new[] { (Measurement.HotFlow, true), (Measurement.ColdFlow, true), (Measurement.HotInlet, false), (Measurement.ColdInlet, false) })
        {
            double min = double.MaxValue, max = double.MinValue, sum = 0;
            var count = 0;
            for (var j = from; j <= k; j++)
            {
                var v = series[i][j];
                if (double.IsNaN(v)) continue;
                min = Math.Min(min, v);
                max = Math.Max(max, v);
                sum += v;
                count++;
            }
            if (count * 2 < k - from + 1) return false;
            var band = isFlow ? s.SteadyFlowBand * sum / count : s.SteadyTemperatureBand;
            if (max - min > band) return false;
        }
        return true;
    }

    private static double Percentile(double[] values, double p)
    {
        var v = values.Where(d => !double.IsNaN(d)).ToArray();
        return v.Length == 0 ? double.NaN : Sorting.Select(v, (int)Math.Clamp(Math.Round(p * (v.Length - 1)), 0, v.Length - 1));
    }

    private static (ICleanUModel?, CleanReferenceReport) CleanModel(ExchangerConfiguration x, IngestResult data, SampleColumns evaluations, SampleEvaluator evaluator)
    {
        var tubePhase = x.Tube.Fluid.IsPhaseChange;
        var shellPhase = x.Shell.Fluid.IsPhaseChange;
        if (x.Clean is DatasheetCleanReference d)
        {
            FilmPropertyScaling? Scaling(StreamConfiguration side, double? bulk, double n) =>
                bulk is { } t && side.Fluid is Core.FluidModels.ITransportFluid fluid ? new FilmPropertyScaling(fluid, side.PressurePascals, t, n) : null;
            var model = new DatasheetCleanU(d, tubePhase, shellPhase, Scaling(x.Tube, d.TubeBulkTemperature, d.TubeExponent),
                Scaling(x.Shell, d.ShellBulkTemperature, d.ShellExponent));
            return (model, new CleanReferenceReport("datasheet", model.Description, null, 0, null, null, null));
        }
        if (x.Clean is GeometryCleanReference g)
        {
            var model = new GeometryCleanU(g, (Core.FluidModels.ITransportFluid)x.Tube.Fluid, x.Tube.PressurePascals,
                (Core.FluidModels.ITransportFluid)x.Shell.Fluid, x.Shell.PressurePascals);
            return (model, new CleanReferenceReport("geometry", model.Description, null, 0, null, null, null));
        }
        if (x.Clean is PlateGeometryCleanReference pg)
        {
            var model = new PlateGeometryCleanU(pg, (Core.FluidModels.ITransportFluid)x.Tube.Fluid, x.Tube.PressurePascals,
                (Core.FluidModels.ITransportFluid)x.Shell.Fluid, x.Shell.PressurePascals);
            return (model, new CleanReferenceReport("geometry", model.Description, null, 0, null, null, null));
        }
        var b = (BaselineCleanReference)x.Clean;
        var start = b.Start ?? x.Maintenance.Where(m => m.IsCleaning).Select(m => (DateTimeOffset?)m.Date).LastOrDefault()
                    ?? FirstOk(data, evaluations);
        if (start is null)
            return (null, new CleanReferenceReport("baseline", "Wilson-plot baseline", "no usable sample to calibrate on", 0, null, null, null));
        var end = start.Value + b.Duration;
        var nt = tubePhase ? 0 : b.TubeExponent;
        var ns = shellPhase ? 0 : b.ShellExponent;
        var scalings = b.PropertyCorrected ? BaselineScalings(x, evaluations, evaluator, data, start.Value, end) : default;
        return WilsonPlot.Fit(CalibrationRows(data, evaluations, evaluator, start.Value, end, nt, ns, scalings), nt, ns, start.Value, end,
            scalings: scalings);
    }

    /// <summary>Property factors for a property-corrected baseline: each single-phase side with transport properties,
    /// relative to its median bulk temperature over the calibration window (any reference would do: it scales the
    /// fitted coefficient), with the side's flow exponent.</summary>
    private static (FilmPropertyScaling? Tube, FilmPropertyScaling? Shell) BaselineScalings(ExchangerConfiguration x,
        SampleColumns evaluations, SampleEvaluator evaluator, IngestResult data, DateTimeOffset start, DateTimeOffset end)
    {
        var bulks = Enumerable.Range(0, evaluations.Count)
            .Where(k => data.IntervalStart(k) >= start && data.IntervalStart(k) < end && evaluations.Status[k] == SampleStatus.Ok)
            .Select(k => evaluator.BulkTemperatures(evaluations.Measurements(k))).ToList();
        FilmPropertyScaling? For(StreamConfiguration side, Func<(double Tube, double Shell), double> pick, double n)
        {
            if (bulks.Count == 0 || side.Fluid.IsPhaseChange || side.Fluid is not Core.FluidModels.ITransportFluid fluid) return null;
            var reference = bulks.Select(pick).Order().ElementAt(bulks.Count / 2);
            return new FilmPropertyScaling(fluid, side.PressurePascals, reference, n);
        }
        return (For(x.Tube, b => b.Tube, x.Clean.TubeExponent), For(x.Shell, b => b.Shell, x.Clean.ShellExponent));
    }

    /// <summary>The usable samples in [start, end) as Wilson-plot rows, weighted by 1/σ²(1/U).</summary>
    public static List<WilsonRow> CalibrationRows(IngestResult data, SampleColumns evaluations, SampleEvaluator evaluator,
        DateTimeOffset start, DateTimeOffset end, double nt, double ns,
        (FilmPropertyScaling? Tube, FilmPropertyScaling? Shell) scalings = default)
    {
        var rows = new List<WilsonRow>();
        for (var k = 0; k < evaluations.Count; k++)
        {
            var t = data.IntervalStart(k);
            if (t < start || t >= end || evaluations.Status[k] != SampleStatus.Ok || !(evaluations.UActual[k] > 0)) continue;
            var e = evaluations.Evaluation(k);
            var sigmaU = SigmaOfInverseU(evaluator, e);
            var w = sigmaU > 0 ? 1 / (sigmaU * sigmaU) : 1;
            var (tubeBulk, shellBulk) = evaluator.BulkTemperatures(e.Measurements);
            rows.Add(new WilsonRow(1 / e.UActual, Math.Pow(e.TubeFlow, -nt) * (scalings.Tube?.InverseFactor(tubeBulk) ?? 1),
                Math.Pow(e.ShellFlow, -ns) * (scalings.Shell?.InverseFactor(shellBulk) ?? 1), (t - start).TotalDays, w));
        }
        return rows;
    }

    private static DateTimeOffset? FirstOk(IngestResult data, SampleColumns evaluations)
    {
        for (var k = 0; k < evaluations.Count; k++)
            if (evaluations.Status[k] == SampleStatus.Ok) return data.IntervalStart(k);
        return null;
    }

    private static double SigmaOfInverseU(SampleEvaluator evaluator, SampleEvaluation e)
    {
        // σ(1/U) ≈ σ_Rf with a fixed clean U: reuse the Rf propagation with a clean model of infinite U.
        var infinite = new WilsonPlotCleanU(0, 0, 0, 0, 0, "none");
        var x = evaluator.Exchanger;
        return evaluator.FoulingResistanceSigma(e.Measurements, x.Hot.PressurePascals, x.Cold.PressurePascals, infinite);
    }

    private static SensorCheck SensorCheckOf(ExchangerConfiguration x, IngestResult data, SampleColumns evaluations, SampleEvaluator evaluator)
    {
        var lastIndex = Array.FindLastIndex(evaluations.Status, s => s is SampleStatus.Ok or SampleStatus.Balance or SampleStatus.Unsteady);
        if (lastIndex < 0) return new SensorCheck(0, 0, null, null, null, null, null, false, "no sample with both duties to check");
        var from = data.IntervalStart(lastIndex) - TimeSpan.FromDays(14);
        var fs = new List<double>();
        var js = new List<double[]>();
        var fails = 0;
        for (var k = 0; k <= lastIndex; k++)
        {
            if (data.IntervalStart(k) < from
                || evaluations.Status[k] is not (SampleStatus.Ok or SampleStatus.Balance or SampleStatus.Unsteady)) continue;
            var e = evaluations.Evaluation(k);
            var m = e.Measurements;
            var sigma = evaluator.Sigmas(m);
            var rec = Reconciliation.Reconcile(m, sigma, v =>
            {
                var d = evaluator.Duties(v, x.Hot.PressurePascals, x.Cold.PressurePascals, out _);
                return d is null ? double.NaN : d.Value.Hot - d.Value.Cold;
            }, iterations: 1);
            if (rec.Sensitivities.Any(double.IsNaN)) continue;
            if (rec.GrossError) fails++;
            fs.Add(e.DutyHot - e.DutyCold);
            js.Add(rec.Sensitivities);
        }
        if (fs.Count < 10) return new SensorCheck(fs.Count, 0, null, null, null, null, null, false, "too few samples in the last 14 days to check the sensors");
        var fraction = fails / (double)fs.Count;
        var total = fs.Sum(f => f * f);
        var best = -1;
        double bestR2 = double.NegativeInfinity, bestDelta = 0;
        var r2s = new double[Measurement.Count];
        var deltas = new double[Measurement.Count];
        for (var i = 0; i < Measurement.Count; i++)
        {
            double fj = 0, jj = 0;
            for (var s = 0; s < fs.Count; s++) { fj += fs[s] * js[s][i]; jj += js[s][i] * js[s][i]; }
            if (!(jj > 0)) continue;
            var delta = fj / jj;
            var residual = 0.0;
            for (var s = 0; s < fs.Count; s++) residual += Math.Pow(fs[s] - delta * js[s][i], 2);
            var r2 = total > 0 ? 1 - residual / total : 0;
            r2s[i] = r2;
            deltas[i] = delta;
            if (r2 > bestR2) { bestR2 = r2; best = i; bestDelta = delta; }
        }
        var tags = new[] { x.Hot.Flow, x.Hot.Inlet, x.Hot.Outlet, x.Cold.Flow, x.Cold.Inlet, x.Cold.Outlet };
        var isFlow = best is Measurement.HotFlow or Measurement.ColdFlow;
        // A bias δ explains the mismatch f when f ≈ J·δ; the measured value is then δ too high (the sensor reads δ above truth).
        var typicalSigma = evaluator.Sigmas(evaluations.Measurements(lastIndex))[best];
        var likely = fraction > 0.5 && bestR2 >= 0.8 && Math.Abs(bestDelta) > 2 * typicalSigma;
        var unit = isFlow ? "kg/s" : "K";
        // A stream's inlet and outlet enter the balance with opposite sensitivities: a bias on one looks like the opposite
        // bias on the other, so every sensor explaining the mismatch about as well is named.
        var suspects = Enumerable.Range(0, Measurement.Count).Where(i => r2s[i] >= bestR2 - 0.02).Select(i => $"{Measurement.Names[i]} {tags[i].Tag} ({deltas[i]:+0.##;-0.##} {(i is Measurement.HotFlow or Measurement.ColdFlow ? "kg/s" : "K")})").ToList();
        var statement = likely
            ? FormattableString.Invariant($"likely sensor fault: {string.Join(" or ", suspects)}; {fraction:P0} of the last 14 days fail the heat-balance test, and one bias explains {bestR2:P0} of the mismatch. Check the instrument before reading this as fouling.")
            : FormattableString.Invariant($"no persistent sensor fault found ({fraction:P0} of samples fail the heat-balance test)");
        return new SensorCheck(fs.Count, fraction, Measurement.Names[best], tags[best].Tag, bestDelta, unit, bestR2, likely, statement);
    }
}
