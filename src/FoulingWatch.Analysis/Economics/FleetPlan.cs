using FoulingWatch.Analysis.Trends;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Economics;

/// <summary>One line of the fleet cleaning plan: what to do with one exchanger, and why.</summary>
/// <param name="Option">The planned option (null: no decision could be priced; see the note).</param>
/// <param name="BestAlone">What this exchanger would get without the window capacities.</param>
/// <param name="Warning">The limit's state when it constrains this entry (limit passed, at the limit, unplanned stop).</param>
public sealed record PlanEntry(int Rank, string ExchangerId, string Service, DecisionOption? Option, DecisionOption? BestAlone,
    double ProbabilityBest, bool Uncertain, string? Warning, string Note)
{
    public ShutdownWindow? Window => Option?.Window;
}

/// <summary>The site's ranked cleaning plan.</summary>
public sealed record FleetCleaningPlan(IReadOnlyList<PlanEntry> Entries, double TotalSaving, string Method);

public static class FleetPlan
{
    public const string Method =
        "cleanings placed in the shutdown windows to give the largest total expected saving within each window's capacity; " +
        "an exchanger without a window place is cleaned at the earliest date, run to its limit or left, whichever is cheaper";

    public static FleetCleaningPlan Build(IReadOnlyList<(ExchangerConfiguration Exchanger, ExchangerEconomics Economics)> fleet,
        IReadOnlyList<ShutdownWindow> windows, TimeZoneInfo? zone = null)
    {
        zone ??= TimeZoneInfo.Utc;
        var future = fleet.SelectMany(f => f.Economics.Options.Where(o => o.Window is not null).Select(o => o.Window!)).Distinct()
            .OrderBy(w => w.Start).ToList();
        var windowSaving = new double[fleet.Count, future.Count];
        var alternative = new double[fleet.Count];
        for (var e = 0; e < fleet.Count; e++)
        {
            var options = fleet[e].Economics.Options;
            alternative[e] = options.Where(o => o.Window is null).Select(o => o.Saving).DefaultIfEmpty(0).Max();
            for (var w = 0; w < future.Count; w++)
                windowSaving[e, w] = options.FirstOrDefault(o => o.Window == future[w])?.Saving ?? double.NaN;
        }
        var assignment = Assign(windowSaving, alternative, future.Select(w => w.Capacity).ToArray());
        var entries = new List<PlanEntry>();
        for (var e = 0; e < fleet.Count; e++)
        {
            var (x, econ) = fleet[e];
            if (econ.Decision is not { } d)
            {
                entries.Add(new PlanEntry(0, x.Id, x.Service, null, null, double.NaN, false, null, econ.Statement));
                continue;
            }
            var option = assignment[e] >= 0
                ? d.Options.First(o => o.Window == future[assignment[e]])
                : d.Options.Where(o => o.Window is null).MaxBy(o => o.Saving)!;
            var moved = option != d.Recommended;
            var note = moved
                ? $"alone it would be '{DecisionText.Action(d.Recommended, zone)}'; moved to respect window capacities"
                : d.Uncertain ? $"uncertain: {d.Settle}" : "";
            entries.Add(new PlanEntry(0, x.Id, x.Service, option, d.Recommended, moved ? double.NaN : d.ProbabilityRecommendedBest,
                d.Uncertain && !moved, DecisionText.LimitWarning(d, option, zone), note));
        }
        var ranked = entries.OrderByDescending(p => p.Warning is not null).ThenByDescending(p => p.Option?.Saving ?? double.NegativeInfinity)
            .ThenBy(p => p.ExchangerId, StringComparer.Ordinal).Select((p, i) => p with { Rank = i + 1 }).ToList();
        return new FleetCleaningPlan(ranked, ranked.Sum(p => p.Option?.Saving ?? 0), Method);
    }

    /// <summary>Window for each exchanger (−1: its best option outside the windows), maximising the total saving.</summary>
    /// <remarks>Relative to each exchanger's best option outside the windows (earliest date, at the limit, never), a window
    /// adds windowSaving − alternative; only positive gains enter the exact window assignment.</remarks>
    public static int[] Assign(double[,] windowSaving, double[] alternative, int[] capacity)
    {
        var gain = new double[windowSaving.GetLength(0), windowSaving.GetLength(1)];
        for (var e = 0; e < gain.GetLength(0); e++)
        for (var w = 0; w < gain.GetLength(1); w++) gain[e, w] = windowSaving[e, w] - alternative[e];
        return WindowAssignment.Solve(gain, capacity);
    }
}
