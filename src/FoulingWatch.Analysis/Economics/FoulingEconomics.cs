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

/// <summary>Economics of one exchanger: pricing, costs to date, the cost-optimal cycle and the cleaning decision.</summary>
/// <param name="OptimalIntervalDays">Cost-optimal cycle length after a cleaning (central path), capped at the limit; null when
/// no finite optimum exists within the search range (cleaning never pays for itself on this path).</param>
public sealed record ExchangerEconomics(string ExchangerId, Pricing? Pricing, string? NotPriced, CostTotals? CurrentCycle, CostTotals? LastYear,
    CostTotals? WholeRecord, double CostPerDayNow, double Co2PerDayNow, double? OptimalIntervalDays, double? OptimalCostRatePerDay,
    DateTimeOffset? UnconstrainedOptimum, CleaningDecision? Decision, string Statement)
{
    public DecisionOption? Recommended => Decision?.Recommended;
    public IReadOnlyList<DecisionOption> Options => Decision?.Options ?? [];
}

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
        var c = h.Columns;
        var result = new double[c.Count];
        var last = 0.0;
        for (var k = 0; k < c.Count; k++)
        {
            if (c.Status[k] == SampleStatus.Ok && double.IsFinite(c.LostDuty[k])) last = Math.Max(0, c.LostDuty[k]);
            result[k] = c.Status[k] == SampleStatus.Downtime ? 0 : last * interval.TotalSeconds;
        }
        return result;
    }

    public static CostTotals Totals(ExchangerHistory h, double[] lost, Pricing p, DateTimeOffset from, DateTimeOffset to)
    {
        var energy = 0.0;
        for (var k = 0; k < h.Columns.Count; k++)
            if (h.Columns.Timestamp(k) >= from && h.Columns.Timestamp(k) < to) energy += lost[k];
        return new CostTotals(from, to, energy, energy * p.FuelPerJoule, energy * p.Co2PerJoule, energy * p.MoneyPerJoule);
    }

    /// <summary>Typical recent conditions (median of the last 30 days of usable samples) for turning Rf into lost duty.</summary>
    /// <param name="Duty">Median duty, W: what the site loses per second while the exchanger is out of service.</param>
    public sealed record TypicalConditions(double HotCapacityRate, double ColdCapacityRate, Temperature HotInlet, Temperature ColdInlet, double CleanU,
        double Duty);

    public static TypicalConditions? Typical(ExchangerHistory h)
    {
        var c = h.Columns;
        var recent = c.RecentWithCleanU(30 * 144);
        if (recent.Length == 0) return null;
        double Med(double[] column) => SampleColumns.MedianAt(column, recent);
        var (thi, tci) = (Med(c.Measured[Measurement.HotInlet]), Med(c.Measured[Measurement.ColdInlet]));
        if (h.Exchanger.Hot.Fluid is Core.FluidModels.SteamPhaseChange hs) thi = hs.SaturationTemperature.Kelvin;
        if (h.Exchanger.Cold.Fluid is Core.FluidModels.SteamPhaseChange cs) tci = cs.SaturationTemperature.Kelvin;
        return new TypicalConditions(Med(c.HotCapacityRate), Med(c.ColdCapacityRate),
            Temperature.FromKelvin(thi), Temperature.FromKelvin(tci), Med(c.UClean), Med(c.Duty));
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
            return new ExchangerEconomics(x.Id, null, why, null, null, null, 0, 0, null, null, null, null, why!);
        var lost = LostEnergyPerInterval(h, config.Data.Interval);
        var end = h.Columns.Count > 0 ? h.Columns.Timestamp(h.Columns.Count - 1) + config.Data.Interval : DateTimeOffset.MinValue;
        var start = h.Columns.Count > 0 ? h.Columns.Timestamp(0) : end;
        var cycle = trend.Cycles.Count > 0 ? trend.Cycles[^1] : null;
        var currentCycle = cycle is null ? null : Totals(h, lost, pricing, cycle.Start, end);
        var lastYear = Totals(h, lost, pricing, end - LastYear, end);
        var whole = Totals(h, lost, pricing, start, end);
        var lostNow = double.IsFinite(current.LostDuty) ? Math.Max(0, current.LostDuty) : 0;
        var perDay = lostNow * 86400 * pricing.MoneyPerJoule;
        var co2PerDay = lostNow * 86400 * pricing.Co2PerJoule;
        ExchangerEconomics Partial(string statement) =>
            new(x.Id, pricing, null, currentCycle, lastYear, whole, perDay, co2PerDay, null, null, null, null, statement);

        var typical = Typical(h);
        if (x.Cleaning.Cost is null) return Partial("no cleaning plan: give cleaning.cost (and cleaning.downtime)");
        if (trend.Withheld is not null) return Partial(trend.Withheld);
        if (typical is null) return Partial("no cleaning plan: no usable recent samples");
        if (cycle?.Chosen?.Fit is null || trend.Draws is null)
            return Partial($"no cleaning plan: the current cycle has no fitted fouling law ({cycle?.Refusal ?? "no cycle"})");

        var decision = CleaningDecisions.Decide(x, typical, pricing, cycle, trend.Draws, trend.Forecast, config);
        var optimum = decision.OptimalIntervalDays is { } days ? cycle.Start + TimeSpan.FromDays(days) : (DateTimeOffset?)null;
        return new ExchangerEconomics(x.Id, pricing, null, currentCycle, lastYear, whole, perDay, co2PerDay, decision.OptimalIntervalDays,
            decision.OptimalCostRatePerDay, optimum, decision, decision.Statement(config.Site.TimeZone));
    }
}
