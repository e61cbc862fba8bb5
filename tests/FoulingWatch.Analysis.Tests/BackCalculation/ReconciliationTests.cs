using FoulingWatch.Analysis.BackCalculation;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

public class ReconciliationTests
{
    // Analytic (Narasimhan & Jordache 2000, ch. 3): two measurements of one quantity, constraint x1 − x2 = 0, reconcile
    // to the inverse-variance weighted mean; with equal weights to the plain mean.
    [Theory]
    [InlineData(10.0, 12.0, 1.0, 1.0, 11.0)]
    [InlineData(10.0, 12.0, 1.0, 2.0, (10.0 / 1 + 12.0 / 4) / (1 + 1.0 / 4))]
    public void Two_measurements_of_one_quantity_reconcile_to_the_weighted_mean(double a, double b, double sa, double sb, double expected)
    {
        var r = Reconciliation.Reconcile([a, b], [sa, sb], x => x[0] - x[1]);
        Assert.Equal(expected, r.Adjusted[0], 9);
        Assert.Equal(expected, r.Adjusted[1], 9);
        // Global test: γ = (a − b)²/(σa² + σb²)
        Assert.Equal((a - b) * (a - b) / (sa * sa + sb * sb), r.GlobalTest, 9);
    }

    // Analytic: a flow balance F1 = F2 + F3 with one gross error injected fails the χ² global test at 95 % (3.841),
    // and the unbiased set passes.
    [Fact]
    public void A_gross_error_on_one_sensor_fails_the_global_test()
    {
        double[] sigma = [1.0, 0.7, 0.7];
        var clean = Reconciliation.Reconcile([100.3, 60.2, 39.8], sigma, x => x[0] - x[1] - x[2]);
        Assert.False(clean.GrossError);
        var biased = Reconciliation.Reconcile([100.3 + 6, 60.2, 39.8], sigma, x => x[0] - x[1] - x[2]);
        Assert.True(biased.GrossError);
        Assert.True(biased.GlobalTest > Reconciliation.ChiSquare1At95);
        // the constraint holds after reconciliation
        Assert.Equal(0.0, biased.Adjusted[0] - biased.Adjusted[1] - biased.Adjusted[2], 9);
    }

    // Nonlinear constraint (successive linearisation): m1·(T1 − T2) = m2·(t2 − t1), reconciled values satisfy it.
    [Fact]
    public void A_heat_balance_constraint_is_satisfied_after_reconciliation()
    {
        static double F(double[] x) => x[0] * 2.0 * (x[1] - x[2]) - x[3] * 4.0 * (x[5] - x[4]);
        var r = Reconciliation.Reconcile([10, 150, 90, 8, 30, 69], [0.2, 0.5, 0.5, 0.16, 0.5, 0.5], F);
        Assert.True(Math.Abs(F(r.Adjusted)) < 1e-6 * 1200);
    }
}
