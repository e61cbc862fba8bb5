using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Analysis.Trends;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Economics;

/// <summary>How lost duty is priced for one exchanger: per joule of lost heat transfer.</summary>
/// <param name="Basis">"fuel" (a fired heater makes up the lost heat recovery) or "cooling" (a cost per unit of lost cooling).</param>
/// <param name="MoneyPerJoule">Currency per J of lost duty (fuel and CO2 cost together for the fuel basis).</param>
/// <param name="FuelPerJoule">J of fuel per J of lost duty (1/η), 0 for the cooling basis.</param>
/// <param name="Co2PerJoule">kg CO2 per J of lost duty, 0 for the cooling basis.</param>
public sealed record Pricing(string Basis, string Currency, double MoneyPerJoule, double FuelPerJoule, double Co2PerJoule, string Description);

/// <summary>Lost heat, fuel, CO2 and money over a period.</summary>
public sealed record CostTotals(DateTimeOffset From, DateTimeOffset To, double LostEnergy, double Fuel, double Co2, double Money);

/// <summary>The decision for one shutdown window: what cleaning there costs and saves against not cleaning within the horizon.</summary>
public sealed record WindowOption(ShutdownWindow Window, double FoulingCostUntil, double TotalCost, double Saving, double SavingLow, double SavingHigh,
    double PaybackDays, double Co2Avoided);

/// <summary>Economics of one exchanger: pricing, costs to date, optimal interval and the window options.</summary>
public sealed record ExchangerEconomics(string ExchangerId, Pricing? Pricing, string? NotPriced, CostTotals? CurrentCycle, CostTotals? LastYear,
    CostTotals? WholeRecord, double CostPerDayNow, double Co2PerDayNow, double? OptimalIntervalDays, double? OptimalCostRatePerDay,
    DateTimeOffset? UnconstrainedOptimum, IReadOnlyList<WindowOption> Windows, WindowOption? Recommended, string Statement);

/// <summary>Prices the lost duty and finds the cost-optimal cleaning time and window for one exchanger.</summary>
public static class FoulingEconomics
{
    public const int UncertaintyDraws = 200;
    public static readonly TimeSpan LastYear = TimeSpan.FromDays(365);

    public static (Pricing? Pricing, string? Why) Price(ExchangerConfiguration x, EconomicsSettings site)
    {
        var e = x.Economics ?? site;
        if (e.LostCoolingCostPerJoule is { } cooling)
            return (new Pricing("cooling", e.Currency, cooling, 0, 0, FormattableString.Invariant($"lost cooling at {cooling * 3.6e6:G4} {e.Currency}/kWh")), null);
        if (e.FuelPricePerJoule is not { } fuel || e.HeaterEfficiency is not { } eta)
            return (null, "not priced: give economics.fuelPrice and economics.heaterEfficiency (or lostCoolingCost for a cooler)");
        var co2 = e.Co2KilogramsPerJoule ?? 0;
        var co2Price = e.Co2PricePerKilogram ?? 0;
        var money = (fuel + co2 * co2Price) / eta;
        return (new Pricing("fuel", e.Currency, money, 1 / eta, co2 / eta,
            FormattableString.Invariant($"extra heater fuel at {fuel * 1e9:G4} {e.Currency}/GJ, efficiency {eta:P0}, CO2 {co2 * 1e12:G5} kg/TJ at {co2Price * 1000:G4} {e.Currency}/t")), null);
    }

    /// <summary>Lost energy per interval (J): usable samples as computed, downtime zero, other operating intervals holding the last usable value.</summary>
    public static double[] LostEnergyPerInterval(ExchangerHistory h, TimeSpan interval)
    {
        var result = new double[h.Samples.Count];
        var last = 0.0;
        for (var k = 0; k < h.Samples.Count; k++)
        {
            var s = h.Samples[k];
            if (s.Status == SampleStatus.Ok && double.IsFinite(s.Evaluation.LostDuty)) last = Math.Max(0, s.Evaluation.LostDuty);
            result[k] = s.Status == SampleStatus.Downtime ? 0 : last * interval.TotalSeconds;
        }
        return result;
    }

    public static CostTotals Totals(ExchangerHistory h, double[] lost, Pricing p, DateTimeOffset from, DateTimeOffset to)
    {
        var energy = 0.0;
        for (var k = 0; k < h.Samples.Count; k++)
            if (h.Samples[k].Timestamp >= from && h.Samples[k].Timestamp < to) energy += lost[k];
        return new CostTotals(from, to, energy, energy * p.FuelPerJoule, energy * p.Co2PerJoule, energy * p.MoneyPerJoule);
    }

    /// <summary>Typical recent conditions (median of the last 30 days of usable samples) for turning Rf into lost duty.</summary>
    public sealed record TypicalConditions(double HotCapacityRate, double ColdCapacityRate, Temperature HotInlet, Temperature ColdInlet, double CleanU);

    public static TypicalConditions? Typical(ExchangerHistory h)
    {
        var recent = h.Samples.Where(s => s.Status == SampleStatus.Ok && double.IsFinite(s.Evaluation.UClean)).TakeLast(30 * 144).ToList();
        if (recent.Count == 0) return null;
        double Med(Func<SampleResult, double> f) => DailyFouling.Median(recent.Select(f).Order().ToArray());
        var (thi, tci) = (Med(s => s.Evaluation.Measurements[Measurement.HotInlet]), Med(s => s.Evaluation.Measurements[Measurement.ColdInlet]));
        if (h.Exchanger.Hot.Fluid is Core.FluidModels.SteamPhaseChange hs) thi = hs.SaturationTemperature.Kelvin;
        if (h.Exchanger.Cold.Fluid is Core.FluidModels.SteamPhaseChange cs) tci = cs.SaturationTemperature.Kelvin;
        return new TypicalConditions(Med(s => s.Evaluation.HotCapacityRate), Med(s => s.Evaluation.ColdCapacityRate),
            Temperature.FromKelvin(thi), Temperature.FromKelvin(tci), Med(s => s.Evaluation.UClean));
    }

    /// <summary>Lost duty (W) at typical conditions for a fouling resistance: Q(U_clean) − Q(U) with 1/U = 1/U_clean + Rf, by ε-NTU.</summary>
    public static double LostDutyAt(ExchangerConfiguration x, TypicalConditions c, double rf)
    {
        var clean = Rating.Rate(x.Arrangement, c.CleanU * x.Area, c.HotCapacityRate, c.ColdCapacityRate, c.HotInlet, c.ColdInlet).Duty;
        var u = 1 / (1 / c.CleanU + Math.Max(0, rf));
        return clean - Rating.Rate(x.Arrangement, u * x.Area, c.HotCapacityRate, c.ColdCapacityRate, c.HotInlet, c.ColdInlet).Duty;
    }

    public static ExchangerEconomics Run(ExchangerHistory h, TrendResult trend, PlantConfiguration config, CurrentState current)
    {
        var x = h.Exchanger;
        var (pricing, why) = Price(x, config.Economics);
        if (pricing is null)
            return new ExchangerEconomics(x.Id, null, why, null, null, null, 0, 0, null, null, null, [], null, why!);
        var lost = LostEnergyPerInterval(h, config.Data.Interval);
        var end = h.Samples.Count > 0 ? h.Samples[^1].Timestamp + config.Data.Interval : DateTimeOffset.MinValue;
        var start = h.Samples.Count > 0 ? h.Samples[0].Timestamp : end;
        var cycle = trend.Cycles.Count > 0 ? trend.Cycles[^1] : null;
        var currentCycle = cycle is null ? null : Totals(h, lost, pricing, cycle.Start, end);
        var lastYear = Totals(h, lost, pricing, end - LastYear, end);
        var whole = Totals(h, lost, pricing, start, end);
        var lostNow = double.IsFinite(current.LostDuty) ? Math.Max(0, current.LostDuty) : 0;
        var perDay = lostNow * 86400 * pricing.MoneyPerJoule;
        var co2PerDay = lostNow * 86400 * pricing.Co2PerJoule;

        var cleaningCost = (x.Cleaning.Cost ?? double.NaN) + (x.Cleaning.DowntimeCostPerDay ?? 0) * (x.Cleaning.Downtime?.TotalDays ?? 0);
        var downtime = x.Cleaning.Downtime?.TotalDays ?? 0;
        var typical = Typical(h);
        string statement;
        if (!double.IsFinite(cleaningCost) || cycle?.Chosen?.Fit is null || typical is null)
        {
            statement = !double.IsFinite(cleaningCost) ? "no cleaning plan: give cleaning.cost (and cleaning.downtime)"
                : typical is null ? "no cleaning plan: no usable recent samples"
                : $"no cleaning plan: the current cycle has no fitted fouling law ({cycle?.Refusal ?? "no cycle"})";
            return new ExchangerEconomics(x.Id, pricing, null, currentCycle, lastYear, whole, perDay, co2PerDay, null, null, null, [], null, statement);
        }

        var model = cycle.Chosen.Model;
        var fit = cycle.Chosen.Fit;
        var now = cycle.Points[^1].Day + TimeSpan.FromDays(1);
        var tNow = cycle.Days(now);
        var futureWindows = config.ShutdownWindows.Where(w => w.Start >= now && w.Capacity > 0).OrderBy(w => w.Start).ToList();
        var horizon = (futureWindows.Count > 0 ? futureWindows.Max(w => w.End) : now) + TimeSpan.FromDays(365);

        var central = Evaluate(x, typical, pricing, model, fit.Parameters, cleaningCost, downtime, tNow, now, horizon, futureWindows);
        var savings = futureWindows.Select(_ => new List<double>()).ToList();
        foreach (var p in TrendAnalysis.ParameterDraws(model, fit, TrendAnalysis.StableSeed(x.Id) + 1, UncertaintyDraws))
        {
            var e = Evaluate(x, typical, pricing, model, p, cleaningCost, downtime, tNow, now, horizon, futureWindows);
            for (var i = 0; i < futureWindows.Count; i++) savings[i].Add(e.Options[i].Saving);
        }
        var options = central.Options.Select((o, i) =>
        {
            var s = savings[i].Order().ToArray();
            return s.Length == 0 ? o : o with { SavingLow = s[(int)(0.05 * (s.Length - 1))], SavingHigh = s[(int)(0.95 * (s.Length - 1))] };
        }).ToList();
        var recommended = options.Where(o => o.Saving > 0).MaxBy(o => o.Saving);
        var optimumDate = cycle.Start + TimeSpan.FromDays(central.TStar);
        var currency = pricing.Currency;
        var zone = config.Site.TimeZone;
        string Local(DateTimeOffset t) => TimeZoneInfo.ConvertTime(t, zone).ToString("yyyy-MM-dd", System.Globalization.CultureInfo.InvariantCulture);
        statement = recommended is null
            ? FormattableString.Invariant($"no window pays: cleaning costs {cleaningCost:N0} {currency} against fouling at {perDay:N0} {currency}/day now; optimal interval {central.TStar:0} days")
            : FormattableString.Invariant($"clean in '{recommended.Window.Name}' ({Local(recommended.Window.Start)}): saves {recommended.Saving:N0} {currency} (90 % interval {recommended.SavingLow:N0} to {recommended.SavingHigh:N0}) over not cleaning before {Local(horizon)}; payback {recommended.PaybackDays:0} days; cost-optimal interval {central.TStar:0} days{(optimumDate < now ? " (already passed: clean at the first opportunity)" : $" (optimum {Local(optimumDate)})")}");
        return new ExchangerEconomics(x.Id, pricing, null, currentCycle, lastYear, whole, perDay, co2PerDay, central.TStar, central.PhiStar * 86400,
            optimumDate, options, recommended, statement);
    }

    private sealed record Evaluation(double TStar, double PhiStar, List<WindowOption> Options);

    private static Evaluation Evaluate(ExchangerConfiguration x, TypicalConditions typical, Pricing pricing, FoulingModel model, double[] p,
        double cleaningCost, double downtime, double tNow, DateTimeOffset now, DateTimeOffset horizon, List<ShutdownWindow> windows)
    {
        // Cumulative fouling cost F(age) in currency, age in days, on a daily grid to 6 years after the cleaning.
        var maxAge = Math.Max(tNow + (horizon - now).TotalDays, 5 * 365) + 2;
        var n = (int)Math.Ceiling(maxAge) + 1;
        var cumulative = new double[n];
        var r0 = model.Value(p, 0);
        double Rate(double age) => LostDutyAt(x, typical, model.Value(p, age) - Math.Min(0, r0)) * pricing.MoneyPerJoule * 86400; // per day
        var previous = Rate(0);
        for (var i = 1; i < n; i++)
        {
            var r = Rate(i);
            cumulative[i] = cumulative[i - 1] + 0.5 * (previous + r);
            previous = r;
        }
        double F(double age)
        {
            if (age <= 0) return 0;
            var i = Math.Min((int)age, n - 2);
            return cumulative[i] + (cumulative[i + 1] - cumulative[i]) * (age - i);
        }
        var (tStar, phi) = CleaningInterval.NumericOptimum(cleaningCost, downtime, F, 1, n - 2);
        var totalDays = (horizon - now).TotalDays;
        var none = F(tNow + totalDays) - F(tNow);
        var options = new List<WindowOption>();
        foreach (var w in windows)
        {
            var d = (w.Start - now).TotalDays;
            var until = F(tNow + d) - F(tNow);
            var after = phi * Math.Max(0, totalDays - d - downtime);
            var total = until + cleaningCost + after;
            var ratePerDay = Rate(tNow + d);
            var avoidedEnergy = (none - until - after) / pricing.MoneyPerJoule;
            options.Add(new WindowOption(w, until, total, none - total, double.NaN, double.NaN,
                ratePerDay > 0 ? cleaningCost / ratePerDay : double.PositiveInfinity, Math.Max(0, avoidedEnergy) * pricing.Co2PerJoule));
        }
        return new Evaluation(tStar, phi / 86400, options);
    }
}
