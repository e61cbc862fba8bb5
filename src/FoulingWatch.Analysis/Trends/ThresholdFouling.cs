using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Trends;

/// <summary>
/// Threshold fouling: deposition minus removal, dRf/dt = α·Re^−0.66·Pr^−0.33·exp(−E/(R·T_film)) − γ·(Re/Re_d)^1.75,
/// integrated over the cycle's actual operating conditions.
/// </summary>
/// <remarks>
/// Source: Ebert &amp; Panchal (1995), "Analysis of Exxon crude-oil-slip stream coking data", Fouling Mitigation of
/// Industrial Heat-Exchange Equipment, Begell House, 451–460, with the Re exponent −0.66 of Panchal et al. (1997)
/// (from memory). The removal term is the wall shear stress, here τ_w ∝ Re^1.75 at fixed fluid properties and tube size
/// (Blasius friction factor, f ∝ Re^−0.25). Re follows the tube-side flow from its design value; the film temperature is the
/// tube-side bulk mean plus a configured rise. With E given, the law is linear in R0, α and γ, so the fit is a weighted
/// linear least-squares fit on the two integrated condition terms. Beyond the data the terms grow at their mean rate of
/// the last 30 days (today's conditions held).
/// </remarks>
public sealed class ThresholdFouling : FoulingModel
{
    public const double GasConstant = 8.314462618; // J/(mol·K), CODATA 2018 (exact since the 2019 SI)
    private readonly double[] _t;      // days since the cycle start, one per operating day
    private readonly double[] _x1;     // ∫ Re^−0.66 Pr^−0.33 exp(−E/RT) dt, cumulative, per day
    private readonly double[] _x2;     // ∫ (Re/Re_d)^1.75 dt, cumulative
    private readonly double _rate1, _rate2;

    private ThresholdFouling(double[] t, double[] x1, double[] x2, double rate1, double rate2)
    {
        _t = t;
        _x1 = x1;
        _x2 = x2;
        _rate1 = rate1;
        _rate2 = rate2;
    }

    public override string Key => "threshold";
    public override string Formula => "dRf/dt = α·Re^-0.66·Pr^-0.33·exp(-E/(R·Tfilm)) − γ·(Re/Re_d)^1.75";
    public override string Source => "Ebert & Panchal (1995) threshold fouling";
    public override string[] ParameterNames => ["R0_m2K_per_W", "alpha_m2K_per_W_per_day", "gamma_m2K_per_W_per_day"];

    /// <summary>Builds the condition integrals of a cycle from its usable samples; null when the cycle has fewer than two operating days.</summary>
    public static ThresholdFouling? ForCycle(ExchangerHistory h, ThresholdSettings s, DateTimeOffset start, DateTimeOffset end)
    {
        var x = h.Exchanger;
        var designTube = x.Tube.DesignFlow;
        if (designTube is null) return null;
        var tubeIsHot = x.Tube == x.Hot;
        var c = h.Columns;
        var days = Enumerable.Range(0, c.Count).Where(k => c.Timestamp(k) >= start && c.Timestamp(k) < end && c.Status[k] == SampleStatus.Ok
                && double.IsFinite(c.Measured[Measurement.HotFlow][k]))
            .GroupBy(k => (int)Math.Floor((c.Timestamp(k) - start).TotalDays)).OrderBy(g => g.Key).ToList();
        if (days.Count < 2) return null;
        var t = new double[days.Count];
        var x1 = new double[days.Count];
        var x2 = new double[days.Count];
        double c1 = 0, c2 = 0;
        var rates1 = new List<double>();
        var rates2 = new List<double>();
        for (var i = 0; i < days.Count; i++)
        {
            double d1 = 0, d2 = 0;
            foreach (var k in days[i])
            {
                var m = c.Measurements(k);
                var flow = tubeIsHot ? m[Measurement.HotFlow] : m[Measurement.ColdFlow];
                var bulk = tubeIsHot ? 0.5 * (m[Measurement.HotInlet] + m[Measurement.HotOutlet]) : 0.5 * (m[Measurement.ColdInlet] + m[Measurement.ColdOutlet]);
                var re = s.ReynoldsAtDesign * flow / designTube.Value;
                d1 += Math.Pow(re, -0.66) * Math.Pow(s.Prandtl, -1.0 / 3) * Math.Exp(-s.ActivationEnergy / (GasConstant * (bulk + s.FilmTemperatureRise)));
                d2 += Math.Pow(re / s.ReynoldsAtDesign, 1.75);
            }
            d1 /= days[i].Count();
            d2 /= days[i].Count();
            c1 += d1;
            c2 += d2;
            t[i] = days[i].Key + 1.0;
            x1[i] = c1;
            x2[i] = c2;
            rates1.Add(d1);
            rates2.Add(d2);
        }
        return new ThresholdFouling(t, x1, x2, rates1.TakeLast(30).Average(), rates2.TakeLast(30).Average());
    }

    private (double X1, double X2) Terms(double t)
    {
        if (t <= 0) return (0, 0);
        if (t >= _t[^1]) return (_x1[^1] + _rate1 * (t - _t[^1]), _x2[^1] + _rate2 * (t - _t[^1]));
        var i = Array.BinarySearch(_t, t);
        if (i >= 0) return (_x1[i], _x2[i]);
        i = ~i;
        if (i == 0) return (_x1[0] * t / _t[0], _x2[0] * t / _t[0]);
        var f = (t - _t[i - 1]) / (_t[i] - _t[i - 1]);
        return (_x1[i - 1] + f * (_x1[i] - _x1[i - 1]), _x2[i - 1] + f * (_x2[i] - _x2[i - 1]));
    }

    /// <summary>Scale of the deposition term so that α comes out in m²·K/W per day at typical conditions (keeps the fit well conditioned).</summary>
    private double Scale => _x1[^1] / _t[^1];

    public override double Value(ReadOnlySpan<double> p, double t)
    {
        var (a, b) = Terms(t);
        return p[0] + p[1] * a / Scale - p[2] * b;
    }

    public override void Gradient(ReadOnlySpan<double> p, double t, Span<double> g)
    {
        var (a, b) = Terms(t);
        g[0] = 1;
        g[1] = a / Scale;
        g[2] = -b;
    }

    public override double Rate(ReadOnlySpan<double> p, double t) => p[1] * _rate1 / Scale - p[2] * _rate2;

    public override double CrossingTime(ReadOnlySpan<double> p, double limit)
    {
        if (Value(p, 0) >= limit) return 0;
        for (var i = 0; i < _t.Length; i++)
            if (Value(p, _t[i]) >= limit) return _t[i];
        var rate = Rate(p, _t[^1]);
        return rate > 0 ? _t[^1] + (limit - Value(p, _t[^1])) / rate : double.PositiveInfinity;
    }

    // Deposition and removal constants are non-negative by their meaning; ±1 m²·K/W bounds the offset (MathNet needs finite bounds).
    public override double[] LowerBounds(double[] t, double[] y) => [-1.0, 0, 0];
    public override double[] UpperBounds(double[] t, double[] y) => [1.0, 1.0, 1.0];

    public override IEnumerable<double[]> StartingPoints(double[] t, double[] y)
    {
        var slope = (y[^1] - y[0]) / Math.Max(1, t[^1] - t[0]);
        yield return [y[0], Math.Max(slope, 1e-9), 1e-12];
        yield return [y[0], Math.Max(2 * slope, 1e-9), Math.Max(slope, 1e-9)];
    }
}
