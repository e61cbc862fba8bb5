using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Economics;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests.Economics;

public class DecisionTests
{
    // Analytic (REFERENCES.md, "Cost-optimal cleaning interval"): with the cost rate growing linearly at β per day,
    // Φ(T) = (C + βT²/2)/(T + τ) is least at T* = −τ + √(τ² + 2C/β), where Φ* = βT*. The renewal optimum on whole days
    // must be within one day of it, and its rate within 0.1 %.
    [Theory]
    [InlineData(40_000.0, 2.0, 0.0)]
    [InlineData(40_000.0, 2.0, 5.0)]
    [InlineData(9_000.0, 0.35, 2.0)]
    public void The_renewal_optimum_equals_the_closed_form_for_linear_cost_growth(double cost, double beta, double downtime)
    {
        const double moneyPerJoule = 1e-9;
        // Rf = age in days and lost duty = Rf in W make the cost rate 86400·1e-9·age per day: scale by β/(86400·1e-9).
        var scale = beta / (86400 * moneyPerJoule);
        var path = new PathCosts(a => a, rf => scale * rf, moneyPerJoule, 3000);
        var (days, rate, _, atEdge) = path.Optimum(cost, downtime, 3000);
        var closed = CleaningInterval.LinearOptimum(cost, beta, downtime);
        Assert.False(atEdge);
        Assert.InRange(days, closed - 1, closed + 1);
        Assert.Equal(beta * closed, rate, beta * closed * 1e-3);
    }

    // Analytic: a cost rate that never grows (no fouling) has no interior optimum: the search ends at the edge.
    [Fact]
    public void Without_fouling_growth_no_finite_optimum_is_reported()
    {
        var path = new PathCosts(_ => 1e-4, rf => 1e5 * rf, 1e-8, 1000);
        Assert.True(path.Optimum(10_000, 2, 1000).AtEdge);
    }

    // Self-consistency (not an external check): a path priced in place from a model's daily path equals the path priced
    // through functions day by day, bit for bit, for each law with random parameters and offsets (the decision prices
    // a thousand draws this way; the figures it reports must not depend on which path was taken).
    [Fact]
    public void A_daily_path_priced_in_place_equals_the_path_priced_day_by_day_bit_for_bit()
    {
        var rng = new Random(20261203);
        FoulingModel[] models = [new LinearFouling(), new AsymptoticFouling(), new FallingRateFouling(), new AcceleratingFouling()];
        double[][] parameters =
        [
            [1e-5, 2e-6], [2e-5, 4e-4, 120], [-1e-5, 3e-5, 0.55], [0, 1e-4, 1.8],
        ];
        var table = Enumerable.Range(0, 64).Select(i => 1e3 * i + 7 * i * i).ToArray();
        var curve = new LostDutyCurve(table, 2e-5);
        const int days = 1900;
        var path = new PathCosts(days);
        var daily = new double[days + 1];
        for (var m = 0; m < models.Length; m++)
            for (var trial = 0; trial < 5; trial++)
            {
                var p = parameters[m].Select(v => v * (0.5 + rng.NextDouble())).ToArray();
                var offset = (rng.NextDouble() - 0.5) * 4e-5;
                models[m].DailyPath(p, offset, daily);
                for (var a = 0; a <= days; a += 37) Assert.Equal(models[m].Value(p, a) - offset, daily[a]);
                path.Fill(daily, curve, 3e-9);
                var reference = new PathCosts(a => models[m].Value(p, a) - offset, curve.At, 3e-9, days);
                for (var a = 0.0; a <= days + 10; a += 13.7)
                {
                    Assert.Equal(reference.Cost(a), path.Cost(a));
                    Assert.Equal(reference.Energy(a), path.Energy(a));
                }
                Assert.True(path.Cost(days) > 0, "the test paths must foul");
            }
    }

    // Brute force: on seeded random small fleets (≤ 5 exchangers, ≤ 3 windows) the plan's assignment of windows, with
    // each exchanger's best option outside the windows (earliest date, at the limit, never) as the alternative, gives
    // the same total saving as enumerating every feasible assignment.
    [Fact]
    public void The_fleet_assignment_equals_exhaustive_enumeration_including_options_outside_the_windows()
    {
        var rng = new Random(20261202);
        for (var trial = 0; trial < 300; trial++)
        {
            var e = rng.Next(1, 6);
            var w = rng.Next(1, 4);
            var saving = new double[e, w];
            var alternative = new double[e];
            for (var i = 0; i < e; i++)
            {
                alternative[i] = rng.NextDouble() < 0.3 ? 0 : rng.NextDouble() * 800;
                for (var j = 0; j < w; j++) saving[i, j] = rng.NextDouble() < 0.2 ? -rng.NextDouble() * 100 : rng.NextDouble() * 1000;
            }
            var capacity = Enumerable.Range(0, w).Select(_ => rng.Next(0, 3)).ToArray();
            var result = FleetPlan.Assign(saving, alternative, capacity);
            for (var j = 0; j < w; j++) Assert.True(result.Count(r => r == j) <= capacity[j]);
            var total = result.Select((r, i) => r < 0 ? alternative[i] : saving[i, r]).Sum();
            Assert.Equal(BruteForce(saving, alternative, capacity), total, 1e-6);
        }
    }

    private static double BruteForce(double[,] s, double[] alternative, int[] capacity)
    {
        var e = s.GetLength(0);
        var w = s.GetLength(1);
        var best = double.NegativeInfinity;
        void Recurse(int i, double sum, int[] used)
        {
            if (i == e) { best = Math.Max(best, sum); return; }
            Recurse(i + 1, sum + alternative[i], used);
            for (var j = 0; j < w; j++)
            {
                if (used[j] >= capacity[j]) continue;
                used[j]++;
                Recurse(i + 1, sum + s[i, j], used);
                used[j]--;
            }
        }
        Recurse(0, 0, new int[w]);
        return best;
    }

    // Synthetic: linear fouling reaches the limit about 25 days after the data, a shutdown window opens 100 days after the
    // data. No plan entry may put the cleaning after the limit's P10 date without the unplanned-stop warning, over 20
    // seeds, and the window after the limit is never the plan. Property: the fouling energy an option avoids is at most
    // the fouling energy of the reference path it avoids.
    [Fact]
    public void A_limit_before_the_window_gives_an_unplanned_stop_or_an_earlier_cleaning()
    {
        var (x, config) = TestExchangers.Plant(windowStartDay: 200);
        for (var seed = 0; seed < 20; seed++)
        {
            var h = TestExchangers.History(x, d => 5e-5 + 6e-6 * d, 100, 1.5e-5, seed, typical: true);
            var trend = TrendAnalysis.Run(h, config.ShutdownWindows);
            var current = PlantAnalysis.Current(h);
            var economics = FoulingEconomics.Run(h, trend, config, current);
            var plan = FleetPlan.Build([(x, economics)], config.ShutdownWindows);
            var entry = Assert.Single(plan.Entries);
            var p10 = trend.Forecast!.P10!.Value;
            Assert.NotNull(entry.Option);
            if (entry.Option!.Date > p10 || entry.Option.Kind == "at-limit")
                Assert.Contains("UNPLANNED STOP", entry.Warning ?? "");
            Assert.NotEqual("window", entry.Option.Kind);
            Assert.All(economics.Options, o => Assert.True(o.EnergyAvoided <= economics.Decision!.ReferenceEnergy,
                $"{o.Kind} avoids {o.EnergyAvoided:E3} J of {economics.Decision!.ReferenceEnergy:E3} J"));
        }
    }
}
