using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>The random part of the uncertainty of Rf, estimated from the data: the scatter of each UTC day's usable Rf
/// about the day's median.</summary>
/// <remarks>
/// Robust spread 1.4826·MAD (the MAD scaled to σ for a normal distribution; Hampel 1974). The local smooth is the day's
/// median, so slow fouling adds nothing and anything faster than a day (noise, control cycling) counts as random. Days with
/// fewer than <see cref="MinimumSamples"/> usable samples take the median spread of the other days. Interval means hide
/// the scatter inside an interval; what the grid sees is what this estimates.
/// </remarks>
public static class RandomPart
{
    public const int MinimumSamples = 6;

    public static double[] PerSample(IngestResult data, SampleColumns evaluations)
    {
        var n = evaluations.Count;
        var result = new double[n];
        Array.Fill(result, double.NaN);
        var days = new List<(int From, int To, double Spread)>();
        var k = 0;
        while (k < n)
        {
            var day = data.IntervalStart(k).UtcDateTime.Date;
            var from = k;
            while (k < n && data.IntervalStart(k).UtcDateTime.Date == day) k++;
            days.Add((from, k, Spread(evaluations, from, k)));
        }
        var spreads = days.Select(d => d.Spread).Where(double.IsFinite).Sorted();
        var fallback = spreads.Length == 0 ? double.NaN : spreads[spreads.Length / 2];
        foreach (var (from, to, spread) in days)
        {
            var s = double.IsFinite(spread) ? spread : fallback;
            for (var i = from; i < to; i++)
                if (evaluations.UsableRf(i)) result[i] = s;
        }
        return result;
    }

    private static double Spread(SampleColumns evaluations, int from, int to)
    {
        var values = new List<double>();
        for (var i = from; i < to; i++)
            if (evaluations.UsableRf(i))
                values.Add(evaluations.FoulingResistance[i]);
        if (values.Count < MinimumSamples) return double.NaN;
        var sorted = values.Sorted();
        var median = Median(sorted);
        return 1.4826 * Median(values.Select(v => Math.Abs(v - median)).Sorted());
    }

    public static double Median(double[] sorted) =>
        sorted.Length == 0 ? double.NaN
        : sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : 0.5 * (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]);
}
