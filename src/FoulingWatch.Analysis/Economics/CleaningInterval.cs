namespace FoulingWatch.Analysis.Economics;

/// <summary>The cost-optimal cleaning interval: minimises the average cost rate over a cycle.</summary>
/// <remarks>
/// A cycle runs for t, then is cleaned with downtime τ at cost C (cleaning plus downtime). With fouling cost rate c(t)
/// after a cleaning, the average cost rate is Φ(t) = (C + ∫₀ᵗ c(s) ds)/(t + τ) (the renewal-reward argument; e.g.
/// Epstein's and Ma &amp; Epstein's cleaning-cycle analyses, and any maintenance-optimisation text). For c(t) = β·t,
/// dΦ/dt = 0 gives t* = −τ + √(τ² + 2C/β), Φ* = β·t*; with τ = 0, t* = √(2C/β).
/// </remarks>
public static class CleaningInterval
{
    /// <summary>Closed form t* for a cost rate growing linearly at β (money per time²).</summary>
    public static double LinearOptimum(double cleaningCost, double beta, double downtime = 0)
    {
        if (!(cleaningCost > 0) || !(beta > 0)) throw new ArgumentOutOfRangeException(nameof(beta), "cleaning cost and cost growth must be positive");
        return -downtime + Math.Sqrt(downtime * downtime + 2 * cleaningCost / beta);
    }

    /// <summary>Φ(t) for a cumulative fouling cost F(t) = ∫₀ᵗ c.</summary>
    public static double AverageCostRate(double t, double cleaningCost, double downtime, Func<double, double> cumulativeFoulingCost) =>
        (cleaningCost + cumulativeFoulingCost(t)) / (t + downtime);

    /// <summary>Numeric optimum of Φ over (minimum, maximum]: a log-spaced scan then golden-section refinement; returns (t*, Φ*).</summary>
    public static (double Time, double Rate) NumericOptimum(double cleaningCost, double downtime, Func<double, double> cumulativeFoulingCost,
        double minimum, double maximum)
    {
        const int scan = 400;
        var best = minimum;
        var bestValue = double.PositiveInfinity;
        var ratio = Math.Pow(maximum / minimum, 1.0 / scan);
        for (var i = 0; i <= scan; i++)
        {
            var t = minimum * Math.Pow(ratio, i);
            var v = AverageCostRate(t, cleaningCost, downtime, cumulativeFoulingCost);
            if (v < bestValue) { bestValue = v; best = t; }
        }
        double a = Math.Max(minimum, best / ratio), b = Math.Min(maximum, best * ratio);
        var g = (Math.Sqrt(5) - 1) / 2;
        double x1 = b - g * (b - a), x2 = a + g * (b - a);
        double f1 = AverageCostRate(x1, cleaningCost, downtime, cumulativeFoulingCost), f2 = AverageCostRate(x2, cleaningCost, downtime, cumulativeFoulingCost);
        for (var i = 0; i < 200 && b - a > 1e-10 * b; i++)
        {
            if (f1 < f2) { b = x2; x2 = x1; f2 = f1; x1 = b - g * (b - a); f1 = AverageCostRate(x1, cleaningCost, downtime, cumulativeFoulingCost); }
            else { a = x1; x1 = x2; f1 = f2; x2 = a + g * (b - a); f2 = AverageCostRate(x2, cleaningCost, downtime, cumulativeFoulingCost); }
        }
        var tStar = 0.5 * (a + b);
        return (tStar, AverageCostRate(tStar, cleaningCost, downtime, cumulativeFoulingCost));
    }
}
