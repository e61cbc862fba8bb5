namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>The back-calculated history of one exchanger in columns: one array per quantity, index k the interval.</summary>
/// <remarks>
/// A sample costs a status byte and a few dozen doubles in arrays that live as long as the history, instead of a record
/// per sample with arrays of its own (about half the memory, and nothing per sample for the garbage collector to trace).
/// The measured columns are the aligned series themselves (shared, not copied). <see cref="Evaluation"/> and
/// <see cref="Result"/> rebuild one sample's records, the same values bit for bit, for the code that wants one sample whole.
/// </remarks>
public sealed class SampleColumns
{
    private readonly DateTimeOffset _start;
    private readonly TimeSpan _interval;
    private readonly DateTimeOffset[]? _timestamps;

    public int Count { get; }
    public SampleStatus[] Status { get; }
    /// <summary>Why a sample is not usable, in words; null for most.</summary>
    public string?[] Detail { get; }
    public double[] DutyHot { get; }
    public double[] DutyCold { get; }
    public double[] Duty { get; }
    public double[] BalanceMismatch { get; }
    public double[] Lmtd { get; }
    public double[] CorrectionFactor { get; }
    public double[] UActual { get; }
    public double[] HotCapacityRate { get; }
    public double[] ColdCapacityRate { get; }
    public double[] TubeFlow { get; }
    public double[] ShellFlow { get; }
    public double[] UClean { get; }
    public double[] FoulingResistance { get; }
    public double[] Cleanliness { get; }
    public double[] DutyClean { get; }
    public double[] DutyRated { get; }
    public double[] LostDuty { get; }
    public double[] HotOutletClean { get; }
    public double[] ColdOutletClean { get; }
    /// <summary>Combined standard uncertainty of Rf, √(systematic² + random²) (systematic alone where random is NaN).</summary>
    public double[] Sigma { get; }
    public double[] SigmaSystematic { get; }
    public double[] SigmaRandom { get; }
    /// <summary>The six measurements (<see cref="Measurement"/> order), SI.</summary>
    public double[][] Measured { get; }
    /// <summary>Reconciliation per sample: 0 none, 1 reconciled, 2 reconciled with a gross error.</summary>
    public byte[] Reconciled { get; }
    public double[] GlobalTest { get; }
    /// <summary>Reconciled measurements, normalised adjustments and balance sensitivities; empty arrays unless the duty basis
    /// reconciles.</summary>
    public double[][] Adjusted { get; }
    public double[][] NormalisedAdjustments { get; }
    public double[][] Sensitivities { get; }

    /// <param name="measured">The six measurement series (shared), or null to allocate them (filled by <see cref="Set"/>).</param>
    /// <param name="reconciles">Whether samples may carry a reconciliation (allocates its columns).</param>
    public SampleColumns(int count, DateTimeOffset start, TimeSpan interval, double[][]? measured, bool reconciles,
        DateTimeOffset[]? timestamps = null)
    {
        Count = count;
        (_start, _interval, _timestamps) = (start, interval, timestamps);
        Status = new SampleStatus[count];
        Detail = new string?[count];
        double[] Nan() { var a = GC.AllocateUninitializedArray<double>(count); Array.Fill(a, double.NaN); return a; }
        (DutyHot, DutyCold, Duty, BalanceMismatch, Lmtd, CorrectionFactor) = (Nan(), Nan(), Nan(), Nan(), Nan(), Nan());
        (UActual, HotCapacityRate, ColdCapacityRate, TubeFlow, ShellFlow) = (Nan(), Nan(), Nan(), Nan(), Nan());
        (UClean, FoulingResistance, Cleanliness, DutyClean, DutyRated, LostDuty) = (Nan(), Nan(), Nan(), Nan(), Nan(), Nan());
        (HotOutletClean, ColdOutletClean, Sigma, SigmaSystematic, SigmaRandom) = (Nan(), Nan(), Nan(), Nan(), Nan());
        Measured = measured ?? Six(Nan);
        Reconciled = new byte[count];
        GlobalTest = reconciles ? Nan() : [];
        Adjusted = reconciles ? Six(Nan) : Six(() => []);
        NormalisedAdjustments = reconciles ? Six(Nan) : Six(() => []);
        Sensitivities = reconciles ? Six(Nan) : Six(() => []);
    }

    private static double[][] Six(Func<double[]> make) => [make(), make(), make(), make(), make(), make()];

    /// <summary>Whether the columns were released after the exchanger's files were written: only the timestamps, the
    /// status and the lost duty remain (what the summary and the energy audit read); every other column is empty.</summary>
    public bool IsReleased { get; private init; }

    /// <summary>These columns without all but the status and lost duty (about 9 bytes a sample instead of ~190): for
    /// a run that wrote the exchanger's time series and charts already and keeps only its summary.</summary>
    public SampleColumns Released() => new(this, new SampleColumns(0, _start, _interval, null, false));

    private SampleColumns(SampleColumns full, SampleColumns empty)
    {
        (_start, _interval, _timestamps, Count, IsReleased) = (full._start, full._interval, full._timestamps, full.Count, true);
        (Status, LostDuty) = (full.Status, full.LostDuty);
        Detail = empty.Detail;
        (DutyHot, DutyCold, Duty, BalanceMismatch, Lmtd, CorrectionFactor) = (empty.DutyHot, empty.DutyCold, empty.Duty,
            empty.BalanceMismatch, empty.Lmtd, empty.CorrectionFactor);
        (UActual, HotCapacityRate, ColdCapacityRate, TubeFlow, ShellFlow) = (empty.UActual, empty.HotCapacityRate,
            empty.ColdCapacityRate, empty.TubeFlow, empty.ShellFlow);
        (UClean, FoulingResistance, Cleanliness, DutyClean, DutyRated) = (empty.UClean, empty.FoulingResistance,
            empty.Cleanliness, empty.DutyClean, empty.DutyRated);
        (HotOutletClean, ColdOutletClean, Sigma, SigmaSystematic, SigmaRandom) = (empty.HotOutletClean, empty.ColdOutletClean,
            empty.Sigma, empty.SigmaSystematic, empty.SigmaRandom);
        (Measured, Reconciled, GlobalTest) = (empty.Measured, empty.Reconciled, empty.GlobalTest);
        (Adjusted, NormalisedAdjustments, Sensitivities) = (empty.Adjusted, empty.NormalisedAdjustments, empty.Sensitivities);
    }

    /// <summary>Columns holding the given samples (any timestamps), as tests and small callers build them.</summary>
    public static SampleColumns From(IReadOnlyList<SampleResult> samples)
    {
        var reconciles = samples.Any(s => s.Evaluation.Reconciliation is not null);
        var c = new SampleColumns(samples.Count, default, default, null, reconciles, samples.Select(s => s.Timestamp).ToArray());
        for (var k = 0; k < samples.Count; k++)
        {
            var s = samples[k];
            c.Set(k, s.Evaluation with { Status = s.Status }, writeMeasured: true);
            c.SetSigma(k, s.FoulingResistanceSigma, s.SigmaSystematic, s.SigmaRandom);
        }
        return c;
    }

    public DateTimeOffset Timestamp(int k) => _timestamps?[k] ?? _start + _interval * k;

    /// <summary>Stores one sample's evaluation (its measurements only when <paramref name="writeMeasured"/>: they are
    /// normally the shared series already).</summary>
    public void Set(int k, SampleEvaluation e, bool writeMeasured = false)
    {
        Status[k] = e.Status;
        Detail[k] = e.Detail;
        DutyHot[k] = e.DutyHot; DutyCold[k] = e.DutyCold; Duty[k] = e.Duty; BalanceMismatch[k] = e.BalanceMismatch;
        Lmtd[k] = e.Lmtd; CorrectionFactor[k] = e.CorrectionFactor; UActual[k] = e.UActual;
        HotCapacityRate[k] = e.HotCapacityRate; ColdCapacityRate[k] = e.ColdCapacityRate;
        TubeFlow[k] = e.TubeFlow; ShellFlow[k] = e.ShellFlow; UClean[k] = e.UClean;
        FoulingResistance[k] = e.FoulingResistance; Cleanliness[k] = e.Cleanliness; DutyClean[k] = e.DutyClean;
        DutyRated[k] = e.DutyRated; LostDuty[k] = e.LostDuty;
        HotOutletClean[k] = e.HotOutletClean; ColdOutletClean[k] = e.ColdOutletClean;
        if (writeMeasured)
            for (var i = 0; i < Measurement.Count; i++) Measured[i][k] = i < e.Measurements.Length ? e.Measurements[i] : double.NaN;
        if (e.Reconciliation is not { } r) { Reconciled[k] = 0; return; }
        Reconciled[k] = r.GrossError ? (byte)2 : (byte)1;
        GlobalTest[k] = r.GlobalTest;
        for (var i = 0; i < Measurement.Count; i++)
        {
            Adjusted[i][k] = r.Adjusted[i];
            NormalisedAdjustments[i][k] = r.NormalisedAdjustments[i];
            Sensitivities[i][k] = r.Sensitivities[i];
        }
    }

    /// <summary>Stores the clean-U dependent values of sample k.</summary>
    public void SetClean(int k, in CleanValues v)
    {
        (UClean[k], FoulingResistance[k], Cleanliness[k]) = (v.UClean, v.FoulingResistance, v.Cleanliness);
        (DutyClean[k], DutyRated[k], LostDuty[k]) = (v.DutyClean, v.DutyRated, v.LostDuty);
        (HotOutletClean[k], ColdOutletClean[k]) = (v.HotOutletClean, v.ColdOutletClean);
    }

    public void SetSigma(int k, double combined, double systematic, double random) =>
        (Sigma[k], SigmaSystematic[k], SigmaRandom[k]) = (combined, systematic, random);

    /// <summary>Sample k's six measurements, in a new array.</summary>
    public double[] Measurements(int k) => MeasurementsInto(k, new double[Measurement.Count]);

    /// <summary>Sample k's six measurements into <paramref name="m"/> (returned).</summary>
    public double[] MeasurementsInto(int k, double[] m)
    {
        for (var i = 0; i < Measurement.Count; i++) m[i] = Measured[i][k];
        return m;
    }

    /// <summary>The measurements the sample was evaluated on: reconciled where it was reconciled, else as measured.</summary>
    public double[] Used(int k) => UsedInto(k, new double[Measurement.Count]);

    /// <summary><see cref="Used"/> into <paramref name="m"/> (returned).</summary>
    public double[] UsedInto(int k, double[] m)
    {
        var source = Reconciled[k] == 0 ? Measured : Adjusted;
        for (var i = 0; i < Measurement.Count; i++) m[i] = source[i][k];
        return m;
    }

    public ReconciliationResult? Reconciliation(int k)
    {
        if (Reconciled[k] == 0) return null;
        double[] Row(double[][] columns)
        {
            var v = new double[Measurement.Count];
            for (var i = 0; i < v.Length; i++) v[i] = columns[i][k];
            return v;
        }
        return new ReconciliationResult(Row(Adjusted), Row(NormalisedAdjustments), GlobalTest[k], Reconciled[k] == 2,
            Row(Sensitivities));
    }

    /// <summary>Sample k as an evaluation record (new arrays; the same values).</summary>
    public SampleEvaluation Evaluation(int k) => new()
    {
        Status = Status[k], Detail = Detail[k], DutyHot = DutyHot[k], DutyCold = DutyCold[k], Duty = Duty[k],
        BalanceMismatch = BalanceMismatch[k], Lmtd = Lmtd[k], CorrectionFactor = CorrectionFactor[k], UActual = UActual[k],
        HotCapacityRate = HotCapacityRate[k], ColdCapacityRate = ColdCapacityRate[k], TubeFlow = TubeFlow[k],
        ShellFlow = ShellFlow[k], UClean = UClean[k], FoulingResistance = FoulingResistance[k], Cleanliness = Cleanliness[k],
        DutyClean = DutyClean[k], DutyRated = DutyRated[k], LostDuty = LostDuty[k], HotOutletClean = HotOutletClean[k],
        ColdOutletClean = ColdOutletClean[k], Reconciliation = Reconciliation(k), Measurements = Measurements(k),
    };

    public SampleResult Result(int k) =>
        new(Timestamp(k), Status[k], Evaluation(k), Sigma[k], SigmaSystematic[k], SigmaRandom[k]);

    /// <summary>Whether sample k is usable with a finite Rf (the samples trends, state and charts use).</summary>
    public bool UsableRf(int k) => Status[k] == SampleStatus.Ok && double.IsFinite(FoulingResistance[k]);

    /// <summary>Indexes of the latest <paramref name="count"/> usable samples with a finite clean U, in time order: the
    /// recent conditions that limits and prices are judged at.</summary>
    public int[] RecentWithCleanU(int count)
    {
        var picked = new List<int>(Math.Min(count, Count));
        for (var k = Count - 1; k >= 0 && picked.Count < count; k--)
            if (Status[k] == SampleStatus.Ok && double.IsFinite(UClean[k])) picked.Add(k);
        picked.Reverse();
        return picked.ToArray();
    }

    /// <summary>The samples that <paramref name="include"/> picks, grouped by UTC calendar day, days in order (within a
    /// day in sample order). One pass when the timestamps run forward, as on the grid; grouped by key otherwise.</summary>
    public IEnumerable<(DateTime Day, List<int> Samples)> UtcDays(Func<int, bool> include)
    {
        var forward = true;
        for (var k = 1; k < Count && forward; k++) forward = Timestamp(k) >= Timestamp(k - 1);
        if (!forward)
        {
            var groups = Enumerable.Range(0, Count).Where(include).GroupBy(k => Timestamp(k).UtcDateTime.Date);
            foreach (var g in groups.OrderBy(g => g.Key)) yield return (g.Key, g.ToList());
            yield break;
        }
        List<int>? day = null;
        var current = DateTime.MinValue;
        for (var k = 0; k < Count; k++)
        {
            if (!include(k)) continue;
            var date = Timestamp(k).UtcDateTime.Date;
            if (day is not null && date != current)
            {
                yield return (current, day);
                day = null;
            }
            if (day is null) (day, current) = (new List<int>(), date);
            day.Add(k);
        }
        if (day is not null) yield return (current, day);
    }

    /// <summary>Median of a column over the given samples (all values, NaN included, as the records' medians were).</summary>
    public static double MedianAt(double[] column, int[] indexes)
    {
        var v = new double[indexes.Length];
        for (var i = 0; i < v.Length; i++) v[i] = column[indexes[i]];
        Array.Sort(v);
        return v.Length == 0 ? double.NaN : v.Length % 2 == 1 ? v[v.Length / 2] : 0.5 * (v[v.Length / 2 - 1] + v[v.Length / 2]);
    }

    /// <summary>The samples as records, built one at a time on access (for code that wants whole samples).</summary>
    public IReadOnlyList<SampleResult> AsResults() => new ResultView(this);

    private sealed class ResultView(SampleColumns c) : IReadOnlyList<SampleResult>
    {
        public SampleResult this[int index] =>
            (uint)index < (uint)c.Count ? c.Result(index) : throw new ArgumentOutOfRangeException(nameof(index));
        public int Count => c.Count;

        public IEnumerator<SampleResult> GetEnumerator()
        {
            for (var k = 0; k < c.Count; k++) yield return c.Result(k);
        }

        System.Collections.IEnumerator System.Collections.IEnumerable.GetEnumerator() => GetEnumerator();
    }
}
