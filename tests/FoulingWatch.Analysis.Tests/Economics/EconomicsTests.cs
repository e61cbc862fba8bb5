using FoulingWatch.Analysis.Economics;
using FoulingWatch.Core.Economics;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests.Economics;

public class CleaningIntervalTests
{
    // Analytic (REFERENCES.md, derived): Φ(t) = (C + βt²/2)/(t + τ); dΦ/dt = 0 ⇒ t² + 2τt − 2C/β = 0 ⇒ t* = −τ + √(τ² + 2C/β),
    // and at the optimum Φ* = β·t*. With τ = 0: t* = √(2C/β) and the cycle's fouling cost βt*²/2 equals C.
    [Theory]
    [InlineData(40_000.0, 2.0, 0.0)]
    [InlineData(40_000.0, 2.0, 5.0)]
    [InlineData(9_000.0, 0.35, 2.0)]
    public void The_numeric_optimum_equals_the_closed_form_for_linear_cost_growth(double cost, double beta, double downtime)
    {
        var closed = CleaningInterval.LinearOptimum(cost, beta, downtime);
        Assert.Equal(-downtime + Math.Sqrt(downtime * downtime + 2 * cost / beta), closed, 9);
        var (t, phi) = CleaningInterval.NumericOptimum(cost, downtime, t => beta * t * t / 2, 1, 5000);
        Assert.Equal(closed, t, closed * 1e-6);
        Assert.Equal(beta * closed, phi, beta * closed * 1e-9);
        if (downtime == 0) Assert.Equal(cost, beta * closed * closed / 2, cost * 1e-9);
    }

    [Fact]
    public void Downtime_shortens_the_optimal_cycle()
        => Assert.True(CleaningInterval.LinearOptimum(40_000, 2, 10) < CleaningInterval.LinearOptimum(40_000, 2, 0));
}

public class WindowAssignmentTests
{
    // Check against brute force (every assignment of exchangers to windows or none) on seeded random small cases.
    [Fact]
    public void The_assignment_is_optimal_against_brute_force()
    {
        var rng = new Random(20261201);
        for (var trial = 0; trial < 300; trial++)
        {
            var e = rng.Next(1, 6);
            var w = rng.Next(1, 4);
            var saving = new double[e, w];
            for (var i = 0; i < e; i++)
            for (var j = 0; j < w; j++) saving[i, j] = rng.NextDouble() < 0.2 ? -rng.NextDouble() * 100 : rng.NextDouble() * 1000;
            var capacity = Enumerable.Range(0, w).Select(_ => rng.Next(0, 3)).ToArray();
            var result = WindowAssignment.Solve(saving, capacity);
            for (var j = 0; j < w; j++) Assert.True(result.Count(r => r == j) <= capacity[j]);
            Assert.All(result.Select((r, i) => (r, i)), p => Assert.True(p.r < 0 || saving[p.i, p.r] > 0));
            var total = result.Select((r, i) => r < 0 ? 0 : saving[i, r]).Sum();
            Assert.Equal(BruteForce(saving, capacity), total, 1e-6);
        }
    }

    private static double BruteForce(double[,] s, int[] capacity)
    {
        var e = s.GetLength(0);
        var w = s.GetLength(1);
        var best = 0.0;
        void Recurse(int i, double sum, int[] used)
        {
            if (i == e) { best = Math.Max(best, sum); return; }
            Recurse(i + 1, sum, used);
            for (var j = 0; j < w; j++)
            {
                if (used[j] >= capacity[j] || !(s[i, j] > 0)) continue;
                used[j]++;
                Recurse(i + 1, sum + s[i, j], used);
                used[j]--;
            }
        }
        Recurse(0, 0, new int[w]);
        return best;
    }
}

public class PricingTests
{
    // Source: IPCC 2006 Guidelines, Vol. 2, ch. 1, Tables 1.2 and 1.4: natural gas 56 100 kg CO2/TJ and 48.0 TJ/Gg;
    // residual fuel oil 77 400 kg CO2/TJ and 40.4 TJ/Gg (net calorific basis).
    [Fact]
    public void Fuel_factors_are_the_IPCC_defaults()
    {
        Assert.Equal(56_100, FuelFactors.NaturalGas.Co2KilogramsPerTerajoule);
        Assert.Equal(48.0, FuelFactors.NaturalGas.NetCalorificValueTerajoulesPerGigagram);
        Assert.Equal(77_400, FuelFactors.ResidualFuelOil.Co2KilogramsPerTerajoule);
        Assert.Equal(40.4, FuelFactors.ResidualFuelOil.NetCalorificValueTerajoulesPerGigagram);
    }

    // Analytic: 1 GJ of lost duty with a heater of efficiency 0.8 burns 1.25 GJ of gas: at 10 EUR/GJ that is 12.5 EUR,
    // plus 1.25e-3 TJ × 56 100 kg/TJ = 70.125 kg CO2 at 0.08 EUR/kg = 5.61 EUR.
    [Fact]
    public void Lost_duty_is_priced_through_heater_efficiency_fuel_and_CO2()
    {
        var x = TestExchangers.Simple();
        var e = new EconomicsSettings("EUR", "natural-gas", 10e-9, 0.8, FuelFactors.NaturalGas.Co2KilogramsPerJoule, 0.08, null);
        var (p, why) = FoulingEconomics.Price(x, e);
        Assert.Null(why);
        Assert.Equal("fuel", p!.Basis);
        Assert.Equal(12.5 + 5.61, p.MoneyPerJoule * 1e9, 1e-9);
        Assert.Equal(70.125, p.Co2PerJoule * 1e9, 1e-9);
        Assert.Equal(1.25, p.FuelPerJoule, 12);
    }

    [Fact]
    public void Without_a_fuel_price_the_exchanger_is_not_priced_and_says_why()
    {
        var (p, why) = FoulingEconomics.Price(TestExchangers.Simple(), new EconomicsSettings("EUR", null, null, null, null, null, null));
        Assert.Null(p);
        Assert.Equal("not priced: give economics.fuelPrice and economics.heaterEfficiency (or lostCoolingCost for a cooler)", why);
    }
}
