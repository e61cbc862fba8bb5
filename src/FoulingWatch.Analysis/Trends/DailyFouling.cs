using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Trends;

/// <summary>One day's fouling resistance: median of the usable samples and its standard uncertainty, m²·K/W.</summary>
public sealed record DailyPoint(DateTimeOffset Day, double FoulingResistance, double Sigma, int Samples);

/// <summary>Resamples per-sample Rf to daily medians (robust against spikes), each with its uncertainty.</summary>
/// <remarks>
/// σ of a daily median = √(π/2)·s/√n, the large-sample standard error of a median (e.g. Kendall &amp; Stuart), with
/// s the larger of the robust spread 1.4826·MAD of the day's values and the median propagated sample σ. Days with
/// fewer than <see cref="MinimumSamples"/> usable samples are left out.
/// </remarks>
public static class DailyFouling
{
    public const int MinimumSamples = 6;

    public static List<DailyPoint> Resample(IReadOnlyList<SampleResult> samples)
    {
        var result = new List<DailyPoint>();
        foreach (var day in samples.Where(s => s.Status == SampleStatus.Ok && double.IsFinite(s.Evaluation.FoulingResistance))
                     .GroupBy(s => new DateTimeOffset(s.Timestamp.UtcDateTime.Date, TimeSpan.Zero)).OrderBy(g => g.Key))
        {
            var v = day.Select(s => s.Evaluation.FoulingResistance).Order().ToArray();
            if (v.Length < MinimumSamples) continue;
            var median = Median(v);
            var mad = Median(v.Select(x => Math.Abs(x - median)).Order().ToArray()) * 1.4826;
            var sampleSigma = Median(day.Select(s => s.FoulingResistanceSigma).Where(double.IsFinite).Order().ToArray());
            var s = Math.Max(mad, double.IsFinite(sampleSigma) ? sampleSigma : 0);
            result.Add(new DailyPoint(day.Key, median, Math.Sqrt(Math.PI / 2) * s / Math.Sqrt(v.Length), v.Length));
        }
        return result;
    }

    public static double Median(double[] sorted) =>
        sorted.Length == 0 ? double.NaN : sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : 0.5 * (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]);
}
