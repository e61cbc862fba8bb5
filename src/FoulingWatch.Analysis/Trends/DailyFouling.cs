using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Trends;

/// <summary>One day's fouling resistance: median of the usable samples, m²·K/W, with its uncertainty in two parts.</summary>
/// <param name="Sigma">Random part of the daily value's standard uncertainty (averaged over the day's samples).</param>
/// <param name="SigmaSystematic">Systematic part (instrument calibration, clean reference), whole: it does not average
/// away over samples or days.</param>
public sealed record DailyPoint(DateTimeOffset Day, double FoulingResistance, double Sigma, int Samples, double SigmaSystematic = 0)
{
    /// <summary>Combined standard uncertainty √(random² + systematic²).</summary>
    public double SigmaCombined => Math.Sqrt(Sigma * Sigma + SigmaSystematic * SigmaSystematic);
}

/// <summary>Resamples per-sample Rf to daily medians (robust against spikes), each with its uncertainty.</summary>
/// <remarks>
/// Random part: σ of a daily median = √(π/2)·s/√n, the large-sample standard error of a median (e.g. Kendall &amp; Stuart),
/// with s the larger of the robust spread 1.4826·MAD of the day's values and the samples' random σ. Only the random part
/// is divided by √n (GUM, JCGM 100:2008, 4.2 and F.1.2: a systematic effect common to all readings does not average);
/// the systematic part is the median of the samples' systematic σ, kept whole. Days with fewer than
/// <see cref="MinimumSamples"/> usable samples are left out.
/// </remarks>
public static class DailyFouling
{
    public const int MinimumSamples = 6;

    public static List<DailyPoint> Resample(SampleColumns samples)
    {
        var result = new List<DailyPoint>();
        foreach (var (date, day) in samples.UtcDays(samples.UsableRf))
        {
            var v = day.Select(k => samples.FoulingResistance[k]).Sorted();
            if (v.Length < MinimumSamples) continue;
            var median = Median(v);
            var mad = Median(v.Select(x => Math.Abs(x - median)).Sorted()) * 1.4826;
            var sampleRandom = Median(day.Select(k => RandomSigma(samples, k)).Where(double.IsFinite).Sorted());
            var systematic = Median(day.Select(k => samples.SigmaSystematic[k]).Where(double.IsFinite).Sorted());
            var s = Math.Max(mad, double.IsFinite(sampleRandom) ? sampleRandom : 0);
            result.Add(new DailyPoint(new DateTimeOffset(date, TimeSpan.Zero), median, Math.Sqrt(Math.PI / 2) * s / Math.Sqrt(v.Length),
                v.Length,
                double.IsFinite(systematic) ? systematic : 0));
        }
        return result;
    }

    /// <summary>A sample's random σ; a sample without the split (systematic not evaluated) counts its σ as random.</summary>
    private static double RandomSigma(SampleColumns s, int k) =>
        double.IsFinite(s.SigmaRandom[k]) ? s.SigmaRandom[k] : double.IsFinite(s.SigmaSystematic[k]) ? double.NaN : s.Sigma[k];

    public static double Median(double[] sorted) =>
        sorted.Length == 0 ? double.NaN : sorted.Length % 2 == 1 ? sorted[sorted.Length / 2] : 0.5 * (sorted[sorted.Length / 2 - 1] + sorted[sorted.Length / 2]);
}
