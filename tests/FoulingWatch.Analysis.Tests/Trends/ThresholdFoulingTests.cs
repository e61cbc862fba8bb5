using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class ThresholdFoulingTests
{
    private const double E = 48_000, Pr = 12, ReDesign = 30_000, Rise = 15;

    // Synthetic: a history built by integrating the Ebert–Panchal threshold law day by day under varying tube-side flow
    // and temperature; the fit must recover α and γ, and the threshold law must win the AICc choice.
    [Fact]
    public void A_threshold_history_under_varying_conditions_is_recovered()
    {
        var x = TestExchangers.Simple(maintenance: "[ { \"date\": \"2026-01-01T00:00:00Z\", \"action\": \"cleaned\" } ]",
            extra: ", \"threshold\": { \"reynoldsAtDesign\": 30000, \"prandtl\": 12, \"activationEnergy\": \"48 kJ/mol\", \"filmTemperatureRise\": \"15 K\" }");
        Assert.NotNull(x.Threshold);
        const double alphaRaw = 9.0e5, gamma = 1.5e-6;  // deposition constant (raw) and removal constant per day
        var rng = new Random(9);
        var samples = new List<SampleResult>();
        var rf = 0.0;
        for (var day = 0; day < 150; day++)
        {
            var flowFactor = 1 + 0.35 * Math.Sin(day / 9.0);           // tube-side flow swings ±35 %
            var bulk = 273.15 + 200 + 25 * Math.Sin(day / 23.0);         // tube-side bulk temperature, K
            var re = ReDesign * flowFactor;
            var rate = alphaRaw * Math.Pow(re, -0.66) * Math.Pow(Pr, -1.0 / 3) * Math.Exp(-E / (ThresholdFouling.GasConstant * (bulk + Rise))) - gamma * Math.Pow(flowFactor, 1.75);
            for (var h = 0; h < 24; h += 2)
            {
                var noise = 5e-6 * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
                double[] m = [25, 300 + 273.15, 250 + 273.15, 30 * flowFactor, bulk - 20, bulk + 20];
                samples.Add(new SampleResult(TestExchangers.Start.AddDays(day).AddHours(h), SampleStatus.Ok,
                    new SampleEvaluation { Status = SampleStatus.Ok, FoulingResistance = rf + rate * (h + 1) / 24.0 + noise, Measurements = m }, 5e-6));
            }
            rf += rate;
        }
        var history = new ExchangerHistory(x, samples, new CleanReferenceReport("datasheet", "test", null, 0, null, null, null),
            new SensorCheck(0, 0, null, null, null, null, null, false, "not checked"), null);
        var trend = TrendAnalysis.Run(history);
        Assert.Null(trend.ThresholdModelNote);
        var cycle = Assert.Single(trend.Cycles);
        var threshold = cycle.Candidates.Single(c => c.Model is ThresholdFouling);
        Assert.NotNull(threshold.Fit);
        Assert.Equal("threshold", cycle.Chosen!.Model.Key);
        var f = threshold.Fit!;
        Assert.InRange(f.Parameters[2], gamma - 3 * f.StandardErrors[2], gamma + 3 * f.StandardErrors[2]);
        Assert.True(f.StandardErrors[2] < 0.2 * gamma, "γ must be determined to better than 20 %");
    }

    [Fact]
    public void Without_its_inputs_the_threshold_model_is_skipped_with_the_reason()
    {
        var trend = TrendAnalysis.Run(TestExchangers.History(TestExchangers.Simple(), d => 3e-6 * d, 60, 1e-5, 1));
        Assert.Equal(TrendAnalysis.ThresholdNote, trend.ThresholdModelNote);
        Assert.DoesNotContain(trend.Cycles.SelectMany(c => c.Candidates), c => c.Model is ThresholdFouling);
    }
}
