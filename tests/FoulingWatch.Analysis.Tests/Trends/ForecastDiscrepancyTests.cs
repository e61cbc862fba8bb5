using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class ForecastDiscrepancyTests
{
    private static List<DailyPoint> Days(Func<double, double> law, int n, int seed)
    {
        var rng = new Random(seed);
        return Enumerable.Range(0, n).Select(d => new DailyPoint(TestExchangers.Start.AddDays(d), law(d + 0.5) + 2e-6 * JointDraws.Gaussian(rng), 2e-6, 12))
            .ToList();
    }

    private static List<ModelCandidate> Linear(List<DailyPoint> points)
    {
        var t = points.Select(p => (p.Day - TestExchangers.Start).TotalDays + 0.5).ToArray();
        var fit = LeastSquares.FitWithSerialCorrelation(new LinearFouling(), t, points.Select(p => p.FoulingResistance).ToArray(),
            points.Select(p => 1 / (p.Sigma * p.Sigma)).ToArray());
        return [new ModelCandidate(new LinearFouling(), fit, 0, double.NaN, null)];
    }

    // Synthetic: a line fitted to linear data extrapolates within its own uncertainty (k below 1.5); a line fitted to
    // accelerating data (Rf ∝ t^1.6) misses the late days by several standard deviations (k above 3; 4.1 at the last run).
    [Fact]
    public void The_extrapolation_check_widens_only_when_the_law_cannot_follow_the_data()
    {
        double Time(DailyPoint p) => (p.Day - TestExchangers.Start).TotalDays + 0.5;
        var inFamily = ForecastDiscrepancy.Factor(Time, Days(t => 2e-5 + 3e-6 * t, 150, 1), Linear);
        var outside = ForecastDiscrepancy.Factor(Time, Days(t => 2e-5 + 3e-4 * Math.Pow(t / 100, 1.6), 150, 1), Linear);
        Assert.InRange(inFamily, 1.0, 1.5);
        Assert.True(outside > 3, $"k = {outside}");
    }
}
