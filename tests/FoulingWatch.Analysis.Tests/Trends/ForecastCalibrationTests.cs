using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Configuration;
using Xunit.Abstractions;

namespace FoulingWatch.Analysis.Tests.Trends;

/// <summary>Calibration of the whole trend stage (fits, Akaike averaging, significance, forecast draws) on invented
/// exchangers whose truth is known and whose data break the fit's assumptions.</summary>
public class ForecastCalibrationTests(ITestOutputHelper output)
{
    private const double Limit = 8e-4, Systematic = 4e-5, WithinDay = 2e-5;

    /// <summary>A cycle of <paramref name="days"/> days after a cleaning: 12 samples a day of the true law, plus daily AR(1)
    /// process noise, white noise within the day and one calibration bias for the whole cycle.</summary>
    private static ExchangerHistory Cycle(ExchangerConfiguration x, Func<double, double> law, int days, double dailySigma, double phi,
        double bias, Random rng)
    {
        var samples = new List<SampleResult>(days * 12);
        var e = 0.0;
        for (var d = 0; d < days; d++)
        {
            e = phi * e + dailySigma * Math.Sqrt(1 - phi * phi) * JointDraws.Gaussian(rng);
            for (var h = 0; h < 24; h += 2)
            {
                var t = d + h / 24.0;
                var rf = law(t) + e + bias + WithinDay * JointDraws.Gaussian(rng);
                samples.Add(new SampleResult(TestExchangers.Start.AddHours(d * 24 + h), SampleStatus.Ok,
                    new SampleEvaluation { Status = SampleStatus.Ok, FoulingResistance = rf }, Math.Sqrt(WithinDay * WithinDay + Systematic * Systematic),
                    Systematic, WithinDay));
            }
        }
        return new ExchangerHistory(x, samples, new CleanReferenceReport("datasheet", "test", null, 0, null, null, null),
            new SensorCheck(0, 0, null, null, null, null, null, false, "not checked"), null);
    }

    // Synthetic, seeded, 200 exchangers, 40 each: linear, asymptotic (Kern–Seaton), falling-rate, accelerating
    // (Rf ∝ t^1.2–1.8), and a law outside the candidate set: a linear cycle whose rate jumps ×2–3 at a day in its second
    // half (a change of feed). Daily AR(1) noise with φ 0.5–0.9, white scatter within the day, and a calibration bias drawn
    // from the stated systematic σ. The true crossing lies 20–200 days after the data. Target from the issue: the 90 %
    // interval covers the true date in 85–95 % of cases (86.0 % at the last run: linear 37/40, asymptotic 38/40,
    // falling-rate 32/40, accelerating 35/40, rate jump 30/40).
    [Fact]
    public void The_90_percent_limit_date_interval_covers_the_true_date_at_its_nominal_rate()
    {
        var x = TestExchangers.Simple("[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]");
        string[] kinds = ["linear", "asymptotic", "falling-rate", "accelerating", "rate jump (outside the set)"];
        var covered = new int[kinds.Length];
        var cases = new int[kinds.Length];
        for (var seed = 0; seed < 200; seed++)
        {
            var rng = new Random(5000 + seed);
            var kind = seed % kinds.Length;
            var days = 120 + rng.Next(80);
            var crossing = days + 20 + rng.NextDouble() * 180;
            var r0 = 2e-5 + 4e-5 * rng.NextDouble();
            Func<double, double> law = kind switch
            {
                0 => t => r0 + (Limit - r0) / crossing * t,
                1 => Asymptotic(r0, crossing, 150 + 200 * rng.NextDouble()),
                2 => Power(r0, crossing, 0.5 + 0.35 * rng.NextDouble()),
                3 => Power(r0, crossing, 1.2 + 0.6 * rng.NextDouble()),
                _ => RateJump(r0, crossing, days * (0.5 + 0.4 * rng.NextDouble()), 2 + rng.NextDouble()),
            };
            var h = Cycle(x, law, days, 1e-5 + 2e-5 * rng.NextDouble(), 0.5 + 0.4 * rng.NextDouble(), Systematic * JointDraws.Gaussian(rng), rng);
            var f = TrendAnalysis.Run(h).Forecast;
            cases[kind]++;
            if (f is null) continue;
            var truth = TestExchangers.Start + TimeSpan.FromDays(crossing);
            if ((f.Low ?? DateTimeOffset.MinValue) <= truth && truth <= (f.High ?? DateTimeOffset.MaxValue)) covered[kind]++;
        }
        var total = covered.Sum() / 200.0;
        output.WriteLine($"90 % limit-date interval coverage: {total:P1} (" +
                         string.Join(", ", kinds.Select((k, i) => $"{k} {covered[i]}/{cases[i]}")) + ")");
        Assert.InRange(total, 0.85, 0.95);
    }

    // Synthetic, seeded, 200 clean exchangers: constant Rf with the same noise and biases. Target from the issue: "no
    // significant fouling" in at least 95 % of cases (190/200 at the last run; 163/200 before the cleaning detector learnt
    // the day-to-day wander and the AR fit the white-noise share and the small-sample bias of φ).
    [Fact]
    public void A_clean_exchanger_is_called_no_significant_fouling()
    {
        var x = TestExchangers.Simple("[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]");
        var quiet = 0;
        for (var seed = 0; seed < 200; seed++)
        {
            var rng = new Random(9000 + seed);
            var level = 2e-5 + 4e-5 * rng.NextDouble();
            var h = Cycle(x, _ => level, 120 + rng.Next(120), 1e-5 + 2e-5 * rng.NextDouble(), 0.5 + 0.4 * rng.NextDouble(),
                Systematic * JointDraws.Gaussian(rng), rng);
            if (TrendAnalysis.Run(h).Cycles[^1].Refusal?.StartsWith("no significant fouling", StringComparison.Ordinal) == true) quiet++;
        }
        output.WriteLine($"clean exchangers called 'no significant fouling': {quiet}/200");
        Assert.True(quiet >= 190, $"{quiet}/200");
    }

    private static Func<double, double> Asymptotic(double r0, double crossing, double tau)
    {
        var rInf = (Limit - r0) / (1 - Math.Exp(-crossing / tau));
        return t => r0 + rInf * (1 - Math.Exp(-t / tau));
    }

    /// <summary>Linear growth whose rate jumps by <paramref name="factor"/> at day <paramref name="jump"/>, reaching the limit at
    /// <paramref name="crossing"/>.</summary>
    private static Func<double, double> RateJump(double r0, double crossing, double jump, double factor)
    {
        var a = (Limit - r0) / (jump + factor * (crossing - jump));
        return t => r0 + a * Math.Min(t, jump) + factor * a * Math.Max(0, t - jump);
    }

    private static Func<double, double> Power(double r0, double crossing, double n)
    {
        var k = (Limit - r0) / Math.Pow(crossing, n);
        return t => r0 + k * Math.Pow(Math.Max(0, t), n);
    }
}
