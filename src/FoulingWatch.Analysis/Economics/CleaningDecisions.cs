using System.Globalization;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Economics;

/// <summary>One way to act on a fouled exchanger, priced over the common horizon against the reference (run to the limit,
/// or never clean where no limit applies). Money in the site currency, energy in J of lost duty, CO2 in kg.</summary>
/// <param name="Kind">"earliest" (planned, after the lead time), "window", "at-limit" (an unplanned stop when the limit
/// is reached) or "never".</param>
/// <param name="Cost">Expected cost over the horizon: fouling until the cleaning, the cleaning with its downtime, then the
/// long-run average cost of the cost-optimal cycle.</param>
/// <param name="Saving">Expected net saving against the reference (mean over the draws); SavingLow/High the 90 % interval.</param>
/// <param name="ProbabilitySaving">Probability that the net saving is positive (NaN for the reference itself).</param>
/// <param name="ProbabilityUnplannedStop">Probability that the limit comes before this option's date.</param>
public sealed record DecisionOption(string Kind, string Label, ShutdownWindow? Window, DateTimeOffset? Date, double Cost, double Saving,
    double SavingLow, double SavingHigh, double ProbabilitySaving, double PaybackDays, double EnergyAvoided, double Co2Avoided,
    double ProbabilityUnplannedStop);

/// <summary>The options of one exchanger, the recommended one and how sure the recommendation is.</summary>
/// <param name="PathCostPerDayNow">Fouling cost per day at the end of the data on the central path the options are priced on
/// (typical conditions of the last 30 days), to compare with the measured cost per day now.</param>
/// <param name="ReferenceEnergy">Expected fouling energy (J) of the reference path over the horizon: no option can avoid more.</param>
public sealed record CleaningDecision(IReadOnlyList<DecisionOption> Options, DecisionOption Recommended, DecisionOption Reference,
    double ProbabilityRecommendedBest, bool Uncertain, string? Settle, double? OptimalIntervalDays, double? OptimalCostRatePerDay,
    double HorizonDays, double DowntimeCostPerDay, double UnplannedStopCost, DateTimeOffset Now, LimitForecast? Limit,
    double? BreakEvenRate, double FoulingRateNow, string Currency, double ReferenceEnergy = double.NaN, double PathCostPerDayNow = double.NaN)
{
    public string Statement(TimeZoneInfo zone) => DecisionText.Statement(this, zone);
}

/// <summary>Prices every option on every joint draw of the fouling path and picks the one with the lowest expected cost.</summary>
/// <remarks>
/// Footing: all options are costed over the same horizon (three years from the end of the data). After its cleaning an
/// option pays the long-run average cost Φ* of the cost-optimal cleaning cycle (renewal reward, see <see cref="PathCosts"/>),
/// which is the terminal value that makes options cleaning at different dates comparable. A planned date after the limit
/// becomes, in the draws where the limit comes first, an unplanned stop at the limit (cleaning cost plus
/// unplannedStopCost, unplanned downtime). Energy and CO2 avoided count fouling energy only.
/// </remarks>
public static class CleaningDecisions
{
    public static readonly TimeSpan DefaultLeadTime = TimeSpan.FromDays(14);
    private const int TablePoints = 512;

    public static CleaningDecision Decide(ExchangerConfiguration x, FoulingEconomics.TypicalConditions typical, Pricing pricing,
        FoulingCycle cycle, JointDraws draws, LimitForecast? forecast, PlantConfiguration config)
    {
        var now = cycle.Points[^1].Day + TimeSpan.FromDays(1);
        var tNow = cycle.Days(now);
        var horizon = TrendAnalysis.Horizon.TotalDays;
        var tau = x.Cleaning.Downtime?.TotalDays ?? 0;
        var tauUnplanned = x.Cleaning.UnplannedDowntime?.TotalDays ?? tau;
        var downtimeCost = x.Cleaning.DowntimeCostPerDay ?? Math.Max(0, typical.Duty) * 86400 * pricing.MoneyPerJoule;
        var cost = x.Cleaning.Cost!.Value;
        var unplannedExtra = x.Cleaning.UnplannedStopCost ?? cost;
        var planned = cost + tau * downtimeCost;
        var unplanned = cost + unplannedExtra + tauUnplanned * downtimeCost;
        var lead = (x.Cleaning.LeadTime ?? DefaultLeadTime).TotalDays;
        var limit = forecast?.Limit;
        var gridDays = Math.Max((int)Math.Ceiling(tNow + horizon) + 60, 5 * 365);

        var specs = new List<(string Kind, string Label, ShutdownWindow? Window, double Days)> { ("earliest", "earliest date", null, lead) };
        foreach (var w in config.ShutdownWindows.Where(w => w.Start >= now + TimeSpan.FromDays(lead) && w.Capacity > 0).OrderBy(w => w.Start))
            if ((w.Start - now).TotalDays + tau < horizon) specs.Add(("window", w.Name, w, (w.Start - now).TotalDays));
        specs.Add(limit is null ? ("never", "never clean", null, double.PositiveInfinity) : ("at-limit", "at the limit (unplanned stop)", null, double.NaN));
        var reference = specs.Count - 1;

        var lostDuty = LostDutyTable(x, typical, draws, gridDays, limit);
        var n = draws.Length;
        var costs = new double[specs.Count, n];
        var energies = new double[specs.Count, n];
        var unplannedHit = new int[specs.Count];
        var path = new PathCosts(gridDays);
        var daily = new double[gridDays + 1];
        for (var j = 0; j < n; j++)
        {
            var crossing = limit is { } l ? draws.Crossing(j, l) : double.PositiveInfinity;
            var days = DaysPriced(crossing, tNow + horizon, gridDays);
            draws.TrueDailyPath(j, daily.AsSpan(0, days + 1));
            path.Fill(daily.AsSpan(0, days + 1), lostDuty, pricing.MoneyPerJoule);
            var (_, phi, energyRate, _) = path.Optimum(planned, tau, MaxCycle(crossing, gridDays));
            for (var i = 0; i < specs.Count; i++)
            {
                var (c, e, hit) = Price(specs[i].Days, crossing - tNow, path, tNow, horizon, planned, tau, unplanned, tauUnplanned, phi, energyRate);
                costs[i, j] = c;
                energies[i, j] = e;
                if (hit) unplannedHit[i]++;
            }
        }

        var central = CentralPath(cycle, lostDuty, pricing, gridDays);
        var centralCrossing = limit is { } cl ? cycle.Chosen!.Model.CrossingTime(cycle.Chosen.Fit!.Parameters, cl) : double.PositiveInfinity;
        var centralCap = MaxCycle(centralCrossing, gridDays);
        var optimum = central.Optimum(planned, tau, centralCap);
        double? optimalDays = optimum.AtEdge && centralCap >= gridDays ? null : optimum.Days;

        var options = new List<DecisionOption>();
        for (var i = 0; i < specs.Count; i++)
        {
            var saving = new double[n];
            var avoided = 0.0;
            for (var j = 0; j < n; j++)
            {
                saving[j] = costs[reference, j] - costs[i, j];
                avoided += energies[reference, j] - energies[i, j];
            }
            avoided /= n;
            var sorted = saving.Sorted();
            var days = specs[i].Kind == "at-limit" ? JointDraws.Quantile(Enumerable.Range(0, n).Select(j => draws.Crossing(j, limit!.Value) - tNow).Sorted(), 0.1) : specs[i].Days;
            DateTimeOffset? date = double.IsFinite(days) && days <= horizon ? now + TimeSpan.FromDays(Math.Max(0, days)) : null;
            var rate = double.IsFinite(days) ? central.Rate(tNow + Math.Max(0, days)) : 0;
            options.Add(new DecisionOption(specs[i].Kind, specs[i].Label, specs[i].Window, date, Mean(costs, i), saving.Average(),
                JointDraws.Quantile(sorted, 0.05), JointDraws.Quantile(sorted, 0.95),
                i == reference ? double.NaN : saving.Count(v => v > 0) / (double)n,
                specs[i].Kind is "at-limit" or "never" || !(rate > 0) ? double.NaN : planned / rate,
                avoided, avoided * pricing.Co2PerJoule, unplannedHit[i] / (double)n));
        }
        var best = Enumerable.Range(0, options.Count).MinBy(i => options[i].Cost);
        var wins = 0;
        for (var j = 0; j < n; j++)
        {
            var ok = true;
            for (var i = 0; i < options.Count && ok; i++) ok = i == best || costs[best, j] <= costs[i, j];
            if (ok) wins++;
        }
        var pBest = wins / (double)n;
        var uncertain = pBest < config.Economics.DecisionConfidence;
        var rfRate = cycle.Chosen!.Model.Rate(cycle.Chosen.Fit!.Parameters, tNow);
        return new CleaningDecision(options, options[best], options[reference], pBest, uncertain,
            uncertain ? Settle(cycle, draws, tNow) : null, optimalDays, optimalDays is null ? null : optimum.Rate,
            horizon, downtimeCost, unplanned, now, forecast, BreakEvenRate(options[best], planned, horizon, lostDuty, cycle, tNow, pricing),
            rfRate, pricing.Currency, Enumerable.Range(0, n).Average(j => energies[reference, j]), central.Rate(tNow));
    }

    /// <summary>The days of a draw's path that its pricing reads: to the horizon's end and, for the optimum cycle (capped
    /// at the limit), to the crossing, with two days' margin; the whole grid when the limit is beyond it or not crossed.
    /// A path priced no further than it is read gives the same figures with fewer evaluations of the law.</summary>
    private static int DaysPriced(double crossing, double horizonEnd, int gridDays)
    {
        var read = double.IsFinite(crossing) ? Math.Max(crossing, horizonEnd) : double.PositiveInfinity;
        return read + 2 < gridDays ? (int)Math.Ceiling(read) + 2 : gridDays;
    }

    private static double MaxCycle(double crossing, int gridDays) =>
        double.IsFinite(crossing) ? Math.Clamp(crossing, 1, gridDays) : gridDays;

    /// <summary>Cost and fouling energy over the horizon of cleaning d days from now, when the limit is dL days away.</summary>
    private static (double Cost, double Energy, bool Unplanned) Price(double d, double dL, PathCosts path, double tNow, double horizon,
        double planned, double tau, double unplanned, double tauUnplanned, double phi, double energyRate)
    {
        double Fouling(double days) => path.Cost(tNow + days) - path.Cost(tNow);
        double Energy(double days) => path.Energy(tNow + days) - path.Energy(tNow);
        var atLimit = double.IsNaN(d);
        var hit = atLimit || dL < d;
        if (hit && double.IsFinite(dL) && dL < horizon)
        {
            var du = Math.Max(0, dL);
            return (Fouling(du) + unplanned + phi * Math.Max(0, horizon - du - tauUnplanned),
                Energy(du) + energyRate * Math.Max(0, horizon - du - tauUnplanned), true);
        }
        if (atLimit || !double.IsFinite(d) || d >= horizon) return (Fouling(horizon), Energy(horizon), false);
        return (Fouling(d) + planned + phi * Math.Max(0, horizon - d - tau), Energy(d) + energyRate * Math.Max(0, horizon - d - tau), false);
    }

    private static double Mean(double[,] a, int i)
    {
        var s = 0.0;
        for (var j = 0; j < a.GetLength(1); j++) s += a[i, j];
        return s / a.GetLength(1);
    }

    private static PathCosts CentralPath(FoulingCycle cycle, LostDutyCurve lostDuty, Pricing pricing, int gridDays)
    {
        var daily = new double[gridDays + 1];
        cycle.Chosen!.Model.DailyPath(cycle.Chosen.Fit!.Parameters, 0, daily);
        var path = new PathCosts(gridDays);
        path.Fill(daily, lostDuty, pricing.MoneyPerJoule);
        return path;
    }

    /// <summary>Lost duty (W) as a function of true Rf, tabulated once at typical conditions (ε-NTU twice per point).</summary>
    private static LostDutyCurve LostDutyTable(ExchangerConfiguration x, FoulingEconomics.TypicalConditions typical, JointDraws draws,
        int gridDays, double? limit)
    {
        var top = limit is { } l ? 3 * l : 0;
        for (var j = 0; j < draws.Length; j += 10) top = Math.Max(top, draws.TrueValue(j, gridDays));
        top = Math.Clamp(top, 1e-6, 0.05);
        var step = top / (TablePoints - 1);
        var table = new double[TablePoints];
        for (var i = 0; i < TablePoints; i++) table[i] = FoulingEconomics.LostDutyAt(x, typical, i * step);
        return new LostDutyCurve(table, step);
    }

    /// <summary>What would settle an uncertain recommendation: the larger of the systematic uncertainty (calibration, clean
    /// reference) and the fit's spread of Rf now.</summary>
    private static string Settle(FoulingCycle cycle, JointDraws draws, double tNow)
    {
        var values = Enumerable.Range(0, draws.Length).Select(j => draws.TrueValue(j, tNow) + draws.Offset[j]).ToArray();
        var mean = values.Average();
        var fitSpread = Math.Sqrt(values.Sum(v => (v - mean) * (v - mean)) / Math.Max(1, values.Length - 1));
        if (draws.SystematicSigma >= fitSpread)
            return string.Create(CultureInfo.InvariantCulture,
                $"check the calibration of the six instruments and the clean reference: their systematic uncertainty (±{draws.SystematicSigma:0.0e0} m2K/W) outweighs the trend's (±{fitSpread:0.0e0})");
        var more = Math.Max(14, (int)Math.Round(cycle.Points.Count / 2.0));
        return string.Create(CultureInfo.InvariantCulture,
            $"about {more} more days of data: the trend's uncertainty (±{fitSpread:0.0e0} m2K/W now) outweighs the systematic one (±{draws.SystematicSigma:0.0e0})");
    }

    /// <summary>Where never cleaning is best: the fouling rate (m²·K/W per day) above which a cleaning would pay within the
    /// horizon: a cost rate growing at β pays back a cleaning costing K within H when β ≥ 2K/H² (t* = √(2K/β) = H).</summary>
    private static double? BreakEvenRate(DecisionOption best, double planned, double horizon, LostDutyCurve lostDuty, FoulingCycle cycle,
        double tNow, Pricing pricing)
    {
        if (best.Kind != "never") return null;
        var rf = Math.Max(0, cycle.Chosen!.Model.Value(cycle.Chosen.Fit!.Parameters, tNow));
        const double step = 1e-6;
        var slope = (lostDuty.At(rf + step) - lostDuty.At(rf)) / step * 86400 * pricing.MoneyPerJoule; // currency per day per m2K/W
        return slope > 0 ? 2 * planned / (horizon * horizon) / slope : null;
    }
}

/// <summary>Lost duty (W) against true Rf (m²·K/W), tabulated at equal steps of Rf from 0 and interpolated linearly;
/// above the table's end it grows at its last slope; 0 for Rf ≤ 0.</summary>
public sealed class LostDutyCurve(double[] table, double step)
{
    public double At(double rf)
    {
        if (!(rf > 0)) return 0;
        var pos = rf / step;
        var k = Math.Min((int)pos, table.Length - 2);
        return table[k] + (table[k + 1] - table[k]) * (pos - k);
    }
}
