using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class TrendAnalysisTests
{
    // Synthetic: an asymptotic cycle (Kern–Seaton form) with noise is recognised by AICc and its parameters recovered
    // within three standard errors.
    [Fact]
    public void An_asymptotic_cycle_is_chosen_and_its_parameters_recovered()
    {
        var x = TestExchangers.Simple(maintenance: "[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]", limits: "{ \"foulingResistance\": \"0.0007 m2K/W\" }");
        var h = TestExchangers.History(x, d => 6e-4 * (1 - Math.Exp(-d / 80.0)), 240, 2e-5, seed: 3);
        var trend = TrendAnalysis.Run(h);
        var cycle = Assert.Single(trend.Cycles);
        Assert.Equal("asymptotic", cycle.Chosen!.Model.Key);
        var f = cycle.Chosen.Fit!;
        Assert.InRange(f.Parameters[1], 6e-4 - 3 * f.StandardErrors[1], 6e-4 + 3 * f.StandardErrors[1]);
        Assert.InRange(f.Parameters[2], 80 - 3 * f.StandardErrors[2], 80 + 3 * f.StandardErrors[2]);
        // a limit above the asymptote (6e-4) is never reached
        Assert.True(trend.Forecast!.BeyondHorizon);
        Assert.Contains("not reached within", trend.Forecast.Statement);
    }

    [Fact]
    public void A_falling_rate_cycle_is_chosen_and_its_exponent_recovered()
    {
        var x = TestExchangers.Simple(maintenance: "[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]");
        var h = TestExchangers.History(x, d => 3e-5 * Math.Pow(d, 0.55), 300, 1.5e-5, seed: 5);
        var cycle = Assert.Single(TrendAnalysis.Run(h).Cycles);
        Assert.Equal("falling-rate", cycle.Chosen!.Model.Key);
        var f = cycle.Chosen.Fit!;
        Assert.InRange(f.Parameters[2], 0.55 - 3 * f.StandardErrors[2], 0.55 + 3 * f.StandardErrors[2]);
    }

    // Synthetic: linear fouling reaching the limit; the forecast date is within the interval and near the truth.
    [Fact]
    public void A_linear_cycle_forecasts_the_limit_date()
    {
        var x = TestExchangers.Simple(maintenance: "[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]");
        var h = TestExchangers.History(x, d => 5e-5 + 3e-6 * d, 120, 2e-5, seed: 11);
        var trend = TrendAnalysis.Run(h);
        var truth = TestExchangers.Start + TimeSpan.FromDays((8e-4 - 5e-5) / 3e-6);
        var f = trend.Forecast!;
        Assert.NotNull(f.Date);
        Assert.InRange((f.Date!.Value - truth).TotalDays, -10, 10);
        Assert.True(f.Low <= f.Date && f.Date <= f.High);
        Assert.InRange(trend.Rate!.Rate, 3e-6 - 3 * trend.Rate.Sigma, 3e-6 + 3 * trend.Rate.Sigma);
    }

    // Calibration (synthetic, seeded): linear cycles with AR(1) daily noise (φ = 0.8, as the sample plant's residuals
    // show) and a systematic offset drawn from the stated σ_sys. The 90 % interval of the limit date, from the joint draws
    // of the AR(1)-aware fit and the offset, must cover the true date at about its nominal rate (0.85–0.95 over 200 seeds).
    // Without the serial-correlation allowance and the offset, the same test covers far less (printed for comparison).
    [Fact]
    public void The_limit_date_interval_covers_the_truth_with_correlated_noise_and_a_systematic_offset()
    {
        var linear = new LinearFouling();
        const double limit = 8e-4, r0 = 5e-5, a = 3e-6, sigma = 3e-5, phi = 0.8, systematic = 4e-5;
        var truth = (limit - r0) / a;
        int covered = 0, naive = 0;
        const int seeds = 200;
        for (var seed = 0; seed < seeds; seed++)
        {
            var rng = new Random(1000 + seed);
            var t = Enumerable.Range(0, 120).Select(d => d + 0.5).ToArray();
            var bias = systematic * JointDraws.Gaussian(rng);
            var e = 0.0;
            var y = t.Select(d =>
            {
                e = phi * e + sigma * Math.Sqrt(1 - phi * phi) * JointDraws.Gaussian(rng);
                return r0 + a * d + e + bias;
            }).ToArray();
            var w = t.Select(_ => 1 / (sigma * sigma)).ToArray();
            var fit = LeastSquares.FitWithSerialCorrelation(linear, t, y, w)!;
            var candidate = new ModelCandidate(linear, fit, 0, double.NaN, null);
            var draws = JointDraws.Draw([candidate], systematic, seed)!;
            var crossings = LimitForecasting.Crossings(draws, limit).Order().ToArray();
            if (JointDraws.Quantile(crossings, 0.05) <= truth && truth <= JointDraws.Quantile(crossings, 0.95)) covered++;
            var plain = LeastSquares.Fit(linear, t, y, w)!;
            var plainDraws = JointDraws.Draw([new ModelCandidate(linear, plain, 0, double.NaN, null)], 0, seed)!;
            var plainCrossings = LimitForecasting.Crossings(plainDraws, limit).Order().ToArray();
            if (JointDraws.Quantile(plainCrossings, 0.05) <= truth && truth <= JointDraws.Quantile(plainCrossings, 0.95)) naive++;
        }
        Console.WriteLine($"limit-date 90 % interval coverage: {covered / (double)seeds:P1} (independent-error fit, no offset: {naive / (double)seeds:P1})");
        Assert.InRange(covered / (double)seeds, 0.85, 0.95);
        Assert.True(naive < covered);
    }

    // Synthetic, seeded: sawtooth histories with three logged and three unlogged cleanings (each across a 2-day
    // downtime) must give every unlogged cleaning within ±3 days (recall) and nothing else (precision), over 10 seeds.
    [Fact]
    public void Unlogged_cleanings_are_detected_with_full_precision_and_recall()
    {
        var cleanings = new[] { 60, 120, 180, 240, 300, 360 };
        var logged = new[] { 60, 180, 300 };
        var maintenance = "[ " + string.Join(", ", logged.Select(d => $"{{ \"date\": \"{TestExchangers.Start.AddDays(d):yyyy-MM-ddTHH:mm:ssZ}\", \"action\": \"cleaned\" }}")) + " ]";
        var x = TestExchangers.Simple(maintenance);
        int truePositives = 0, falsePositives = 0, missed = 0;
        for (var seed = 0; seed < 10; seed++)
        {
            double Rf(double d)
            {
                var last = cleanings.Where(c => c <= d).DefaultIfEmpty(-30).Max();
                return 2e-5 + 4e-6 * (d - last);
            }
            var h = TestExchangers.History(x, Rf, 400, 3e-5, seed, down: d => cleanings.Any(c => d >= c - 2 && d < c));
            var detected = TrendAnalysis.Run(h).Cleanings.Where(c => c.Cleaning.Source == CleaningSource.Detected).Select(c => (c.Cleaning.Date - TestExchangers.Start).TotalDays).ToList();
            foreach (var c in cleanings.Except(logged))
                if (detected.Any(d => Math.Abs(d - c) <= 3)) truePositives++; else missed++;
            falsePositives += detected.Count(d => !cleanings.Except(logged).Any(c => Math.Abs(d - c) <= 3));
        }
        Assert.Equal(30, truePositives);
        Assert.Equal(0, missed);
        Assert.Equal(0, falsePositives);
    }

    [Fact]
    public void A_not_cleaned_entry_suppresses_a_detection()
    {
        var x = TestExchangers.Simple("[ { \"date\": \"2026-03-02T00:00:00Z\", \"action\": \"not-cleaned\" } ]");
        var h = TestExchangers.History(x, d => d < 60 ? 2e-5 + 4e-6 * d : 2e-5 + 4e-6 * (d - 60), 120, 2e-5, 1);
        Assert.DoesNotContain(TrendAnalysis.Run(h).Cleanings, c => c.Cleaning.Source == CleaningSource.Detected);
    }

    [Fact]
    public void A_cleaning_record_says_what_the_cleaning_removed()
    {
        var x = TestExchangers.Simple("[ { \"date\": \"2026-03-02T00:00:00Z\", \"action\": \"cleaned\" } ]");
        var h = TestExchangers.History(x, d => d < 60 ? 1e-4 + 5e-6 * d : 1e-4 + 8e-6 * (d - 60), 120, 1e-5, 1);
        var effect = TrendAnalysis.Run(h).Cleanings.Single(c => c.Cleaning.Source == CleaningSource.Logged);
        Assert.InRange(effect.RfBefore!.Value, 3.9e-4, 4.1e-4);
        Assert.InRange(effect.RfAfter!.Value, 1.0e-4, 1.2e-4);
        Assert.InRange(effect.FractionRemoved!.Value, 0.70, 0.76);
        Assert.InRange(effect.RateAfter!.Value / effect.RateBefore!.Value, 1.5, 1.7);
    }

    [Fact]
    public void A_flat_history_is_refused_as_too_flat_and_a_short_one_as_too_short()
    {
        var x = TestExchangers.Simple();
        var flat = TrendAnalysis.Run(TestExchangers.History(x, _ => 2e-5, 200, 1e-5, 2));
        Assert.StartsWith("no significant fouling", Assert.Single(flat.Cycles).Refusal);
        Assert.Null(flat.Forecast);
        var shortOne = TrendAnalysis.Run(TestExchangers.History(x, d => 1e-5 * d, 5, 1e-5, 2));
        Assert.Equal("too short to fit: 5 usable days, at least 7 needed", Assert.Single(shortOne.Cycles).Refusal);
    }

    [Fact]
    public void A_jump_in_the_fouling_rate_raises_the_alert()
    {
        var x = TestExchangers.Simple("[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]", limits: "{ \"foulingResistance\": \"0.005 m2K/W\" }");
        var h = TestExchangers.History(x, d => d < 100 ? 2e-6 * d : 2e-4 + 1.2e-5 * (d - 100), 128, 1e-5, 4);
        var rate = TrendAnalysis.Run(h).Rate!;
        Assert.True(rate.Jump);
        Assert.Contains("ALERT", rate.Statement);
        var steady = TrendAnalysis.Run(TestExchangers.History(x, d => 3e-6 * d, 128, 1e-5, 4)).Rate!;
        Assert.False(steady.Jump);
    }
}
