using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class AcceleratingFoulingTests
{
    // Analytic: noise-free data of Rf = 2e-5 + 3e-4·(t/100)^1.6 are fitted exactly (1e-6 relative), and the crossing of
    // 8e-4 is at 100·((8e-4 − 2e-5)/3e-4)^(1/1.6) days.
    [Fact]
    public void An_exact_accelerating_law_is_recovered_with_its_crossing_time()
    {
        var law = new AcceleratingFouling();
        var t = Enumerable.Range(0, 150).Select(d => d + 0.5).ToArray();
        double[] truth = [2e-5, 3e-4, 1.6];
        var y = t.Select(v => law.Value(truth, v)).ToArray();
        var fit = LeastSquares.Fit(law, t, y, t.Select(_ => 1e10).ToArray())!;
        for (var i = 0; i < 3; i++) Assert.Equal(truth[i], fit.Parameters[i], Math.Abs(truth[i]) * 1e-6);
        Assert.Equal(100 * Math.Pow((8e-4 - 2e-5) / 3e-4, 1 / 1.6), law.CrossingTime(truth, 8e-4), 1e-9);
        // dRf/dt = a·n·(t/100)^(n−1)/100 (analytic derivative)
        Assert.Equal(3e-4 * 1.6 * Math.Pow(0.5, 0.6) / 100, law.Rate(truth, 50), 1e-18);
    }
}
