using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Economics;

/// <summary>One line of the fleet cleaning plan.</summary>
public sealed record PlanEntry(int Rank, string ExchangerId, string Service, ShutdownWindow? Window, WindowOption? Option, double? BestAloneSaving,
    string? BestAloneWindow, string Note);

/// <summary>The site's ranked cleaning plan: exchangers assigned to shutdown windows within each window's capacity, maximising the total saving.</summary>
public sealed record FleetCleaningPlan(IReadOnlyList<PlanEntry> Entries, double TotalSaving, string Method);

public static class FleetPlan
{
    public const string Method = "exact: transportation problem solved as a min-cost flow (successive shortest paths); capacities respected, one cleaning per exchanger";

    public static FleetCleaningPlan Build(IReadOnlyList<(ExchangerConfiguration Exchanger, ExchangerEconomics Economics)> fleet, IReadOnlyList<ShutdownWindow> windows)
    {
        var future = fleet.SelectMany(f => f.Economics.Windows.Select(o => o.Window)).Distinct().OrderBy(w => w.Start).ToList();
        var saving = new double[fleet.Count, future.Count];
        for (var e = 0; e < fleet.Count; e++)
        for (var w = 0; w < future.Count; w++)
            saving[e, w] = fleet[e].Economics.Windows.FirstOrDefault(o => o.Window == future[w])?.Saving ?? double.NaN;
        var assignment = WindowAssignment.Solve(saving, future.Select(w => w.Capacity).ToArray());
        var entries = new List<PlanEntry>();
        for (var e = 0; e < fleet.Count; e++)
        {
            var (x, econ) = fleet[e];
            var best = econ.Recommended;
            if (assignment[e] >= 0)
            {
                var option = econ.Windows.First(o => o.Window == future[assignment[e]]);
                var note = best is not null && best.Window != option.Window
                    ? FormattableString.Invariant($"alone it would go in '{best.Window.Name}'; moved to respect window capacities")
                    : "";
                entries.Add(new PlanEntry(0, x.Id, x.Service, option.Window, option, best?.Saving, best?.Window.Name, note));
            }
            else entries.Add(new PlanEntry(0, x.Id, x.Service, null, null, best?.Saving, best?.Window.Name,
                best is null ? econ.Statement : "no capacity left in a window where cleaning pays"));
        }
        var ranked = entries.OrderByDescending(p => p.Option?.Saving ?? double.NegativeInfinity).ThenBy(p => p.ExchangerId, StringComparer.Ordinal)
            .Select((p, i) => p with { Rank = i + 1 }).ToList();
        return new FleetCleaningPlan(ranked, ranked.Sum(p => p.Option?.Saving ?? 0), Method);
    }
}
