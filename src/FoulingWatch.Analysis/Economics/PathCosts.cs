namespace FoulingWatch.Analysis.Economics;

/// <summary>Cumulative fouling cost and fouling energy of one fouling path on a daily grid of cycle age, and the
/// long-run average cost of cleaning it periodically.</summary>
/// <remarks>
/// Renewal-reward: cleaning every T days (downtime τ, cost K per cleaning) costs on average Φ(T) = (K + C(T))/(T + τ) per
/// day, C the cumulative fouling cost of a cycle (Ross, Applied Probability Models with Optimization Applications, 1970,
/// ch. 5; for cleaning schedules e.g. Ishiyama, Paterson &amp; Wilson, Chem. Eng. Sci. 66 (2011) 604; from memory). The
/// optimum is searched over [1, min(limit crossing, grid end)] days: the limit caps the cycle.
/// </remarks>
public sealed class PathCosts
{
    private readonly double[] _cost;   // currency, cumulative from age 0, per whole day of age
    private readonly double[] _energy; // J of lost duty, cumulative
    private int _days;                  // the priced path's last day (the grid may hold more)

    public PathCosts(Func<double, double> trueRf, Func<double, double> lostDutyOfRf, double moneyPerJoule, int days) : this(days)
    {
        var q = new double[days + 1];
        for (var a = 0; a <= days; a++) q[a] = Math.Max(0, lostDutyOfRf(Math.Max(0, trueRf(a))));
        Accumulate(q, moneyPerJoule);
    }

    /// <summary>An empty grid of <paramref name="days"/> days, to be priced by <see cref="Fill"/> (one per worker, reused
    /// for every draw).</summary>
    public PathCosts(int days)
    {
        _cost = new double[days + 1];
        _energy = new double[days + 1];
        _days = days;
    }

    /// <summary>Prices the path whose true Rf at each whole day of age is <paramref name="trueRf"/> (at most the grid's
    /// days + 1 values; <see cref="Days"/> becomes its last day), overwritten with the lost duty: the same numbers as
    /// the constructor taking functions over that many days.</summary>
    public void Fill(Span<double> trueRf, LostDutyCurve lostDuty, double moneyPerJoule)
    {
        if (trueRf.Length < 2 || trueRf.Length > _cost.Length)
            throw new ArgumentException($"the path needs 2 to {_cost.Length} daily values", nameof(trueRf));
        _days = trueRf.Length - 1;
        for (var a = 0; a < trueRf.Length; a++) trueRf[a] = Math.Max(0, lostDuty.At(Math.Max(0, trueRf[a])));
        Accumulate(trueRf, moneyPerJoule);
    }

    /// <summary>Cumulative energy and cost by the trapezoidal rule over whole days, from the daily lost duty q (W).</summary>
    private void Accumulate(ReadOnlySpan<double> q, double moneyPerJoule)
    {
        _cost[0] = 0;
        _energy[0] = 0;
        for (var a = 1; a < q.Length; a++)
        {
            var e = 0.5 * (q[a - 1] + q[a]) * 86400;
            _energy[a] = _energy[a - 1] + e;
            _cost[a] = _cost[a - 1] + e * moneyPerJoule;
        }
    }

    public int Days => _days;

    /// <summary>Cumulative fouling cost from age 0 to age a (days), linear between whole days; held beyond the grid's end
    /// at the last day's rate.</summary>
    public double Cost(double a) => Interpolate(_cost, _days, a);

    public double Energy(double a) => Interpolate(_energy, _days, a);

    /// <summary>Cost rate per day at age a.</summary>
    public double Rate(double a)
    {
        var i = Math.Clamp((int)a, 0, _days - 1);
        return _cost[i + 1] - _cost[i];
    }

    private static double Interpolate(double[] c, int last, double a)
    {
        if (a <= 0) return 0;
        if (a >= last) return c[last] + (c[last] - c[last - 1]) * (a - last);
        var i = (int)a;
        return c[i] + (c[i + 1] - c[i]) * (a - i);
    }

    /// <summary>The cycle length T* (days) minimising (K + C(T))/(T + τ) over [1, maxDays], Φ* per day and the fouling
    /// energy per day of that policy; AtEdge when T* is the end of the range (no interior optimum).</summary>
    /// <remarks>The search is <see cref="CleaningInterval.NumericOptimum"/>, checked there against the closed form.</remarks>
    public (double Days, double Rate, double EnergyRate, bool AtEdge) Optimum(double cleaningCost, double downtimeDays, double maxDays)
    {
        maxDays = Math.Clamp(maxDays, 1, Days);
        if (maxDays <= 1) return (1, (cleaningCost + Cost(1)) / (1 + downtimeDays), Energy(1) / (1 + downtimeDays), true);
        var (t, rate) = CleaningInterval.NumericOptimum(cleaningCost, downtimeDays, Cost, 1, maxDays);
        return (t, rate, Energy(t) / (t + downtimeDays), t > maxDays - 0.5);
    }
}
