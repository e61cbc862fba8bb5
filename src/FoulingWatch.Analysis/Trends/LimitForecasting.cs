using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Trends;

/// <summary>Where the current Rf stands against the limit.</summary>
public enum ForecastState
{
    /// <summary>The limit lies ahead: the probability it is already reached is below 10 %.</summary>
    Forecast,
    /// <summary>At the limit within uncertainty: reached with a probability between 10 % and 95 %.</summary>
    AtLimit,
    /// <summary>Already reached beyond the uncertainty (probability at least 95 %).</summary>
    Reached,
    /// <summary>More likely than not still below the limit at the end of the forecast horizon.</summary>
    BeyondHorizon,
}

/// <summary>The probability that the limit is reached before a shutdown window starts.</summary>
public sealed record WindowRisk(string Window, DateTimeOffset Start, double ProbabilityReachedBefore);

/// <summary>When the fouling limit is reached, as a distribution over the joint draws (law, parameters, systematic offset).</summary>
/// <param name="Date">P50 crossing date (null beyond the horizon).</param>
/// <param name="Low">P5: lower end of the 90 % interval.</param>
/// <param name="High">P95: upper end of the 90 % interval (null beyond the horizon).</param>
/// <param name="ProbabilityReachedNow">Probability that the true Rf is at or above the limit at the end of the data.</param>
public sealed record LimitForecast(double Limit, string LimitSource, ForecastState State, DateTimeOffset? Date, DateTimeOffset? Low,
    DateTimeOffset? High, DateTimeOffset? P10, DateTimeOffset? P90, double ProbabilityReachedNow, double FractionBeyondHorizon,
    DateTimeOffset Now, DateTimeOffset Horizon, IReadOnlyList<WindowRisk> Windows, string Statement)
{
    public bool AlreadyReached => State == ForecastState.Reached;
    public bool BeyondHorizon => State == ForecastState.BeyondHorizon;
}

/// <summary>The limit-crossing distribution of the current cycle.</summary>
public static class LimitForecasting
{
    public const double ReachedProbability = 0.95, AtLimitProbability = 0.10;

    /// <summary>Crossing times (days since the cycle start) of every draw.</summary>
    public static double[] Crossings(JointDraws draws, double limit)
    {
        var c = new double[draws.Length];
        for (var j = 0; j < c.Length; j++) c[j] = draws.Crossing(j, limit);
        return c;
    }

    /// <param name="zone">The site's time zone: dates a person reads are the site's calendar dates.</param>
    public static LimitForecast? Forecast(ExchangerHistory history, FoulingCycle cycle, JointDraws draws, IReadOnlyList<ShutdownWindow> windows,
        TimeZoneInfo zone)
    {
        if (TrendAnalysis.Limit(history) is not { } limit) return null;
        var (l, source) = limit;
        var now = cycle.Points[^1].Day + TimeSpan.FromDays(1);
        var tNow = cycle.Days(now);
        var horizon = now + TrendAnalysis.Horizon;
        var tHorizon = cycle.Days(horizon);
        var crossings = Crossings(draws, l);
        var sorted = crossings.Sorted();
        double Fraction(Func<double, bool> f) => crossings.Count(f) / (double)crossings.Length;
        var reachedNow = Fraction(c => c <= tNow);
        var beyond = Fraction(c => c > tHorizon);
        DateTimeOffset? At(double q)
        {
            var t = JointDraws.Quantile(sorted, q);
            return double.IsFinite(t) && t <= tHorizon ? cycle.Start + TimeSpan.FromDays(Math.Max(0, t)) : null;
        }
        var state = reachedNow >= ReachedProbability ? ForecastState.Reached
            : reachedNow >= AtLimitProbability ? ForecastState.AtLimit
            : beyond > 0.5 ? ForecastState.BeyondHorizon : ForecastState.Forecast;
        var risks = windows.Where(w => w.End > now).OrderBy(w => w.Start)
            .Select(w => new WindowRisk(w.Name, w.Start, Fraction(c => c < cycle.Days(w.Start)))).ToList();
        var f = new LimitForecast(l, source, state, At(0.5), At(0.05), At(0.95), At(0.10), At(0.90), reachedNow, beyond, now, horizon,
            risks, "");
        var statement = Statement(f, Laws(cycle), zone);
        var lastData = history.Columns.Count > 0 ? history.Columns.Timestamp(history.Columns.Count - 1) : cycle.End;
        if ((lastData - cycle.Points[^1].Day).TotalDays > 7)
            statement += FormattableString.Invariant(
                $"; note: the last usable day is {Economics.DecisionText.Date(cycle.Points[^1].Day, zone)}, {(lastData - cycle.Points[^1].Day).TotalDays:0} days before the end of the data — see the sample statuses and the sensor check");
        return f with { Statement = statement };
    }

    private static string Laws(FoulingCycle cycle) => string.Join(", ", cycle.Candidates
        .Where(c => c.AkaikeWeight >= 0.005).OrderByDescending(c => c.AkaikeWeight)
        .Select(c => FormattableString.Invariant($"{c.Model.Key} {c.AkaikeWeight:P0}")));

    private static string Statement(LimitForecast f, string laws, TimeZoneInfo zone)
    {
        string D(DateTimeOffset? d) => Economics.DecisionText.Date(d, zone);
        var limit = FormattableString.Invariant($"{f.Limit:0.00e0} m2K/W");
        return f.State switch
        {
            ForecastState.Reached => FormattableString.Invariant(
                $"limit {limit} already reached (probability {f.ProbabilityReachedNow:P0}), about {D(f.Date)}; laws weighted {laws}"),
            ForecastState.AtLimit => FormattableString.Invariant(
                $"at the limit within uncertainty: probability {f.ProbabilityReachedNow:P0} that {limit} is already reached; P50 {D(f.Date)}, P90 {D(f.P90)}; laws weighted {laws}"),
            ForecastState.BeyondHorizon => FormattableString.Invariant(
                $"limit {limit} not reached within the {TrendAnalysis.Horizon.TotalDays / 365:0}-year horizon (probability of reaching it by then {1 - f.FractionBeyondHorizon:P0}); laws weighted {laws}"),
            _ => FormattableString.Invariant(
                $"limit {limit} reached P10 {D(f.P10)}, P50 {D(f.Date)}, P90 {D(f.P90)} (90 % interval {D(f.Low)} to {D(f.High)}); laws weighted {laws}"),
        };
    }
}
