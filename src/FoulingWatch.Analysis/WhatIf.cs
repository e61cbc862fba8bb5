using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis;

/// <summary>The duty an exchanger would have in one flow arrangement at the latest usable interval's flows and inlets,
/// with its clean U and with its U of today (the same U in every arrangement: films and area are kept).</summary>
public sealed record ArrangementDuty(string Arrangement, bool Actual, double CleanDuty, double DutyNow);

/// <summary>Re-rating at today's conditions by ε-NTU: the actual arrangement, counterflow and parallel flow.</summary>
public static class WhatIf
{
    public static IReadOnlyList<ArrangementDuty> Rate(ExchangerConfiguration x, SampleColumns samples)
    {
        var k = samples.Count - 1;
        while (k >= 0 && !(samples.Status[k] == SampleStatus.Ok && samples.UClean[k] > 0 && samples.UActual[k] > 0)) k--;
        if (k < 0) return [];
        var e = samples.Evaluation(k);
        var used = e.Reconciliation?.Adjusted ?? e.Measurements;
        var evaluator = new SampleEvaluator(x);
        var (thi, _, tci, _) = evaluator.TerminalTemperatures(used);
        var arrangements = new List<(FlowArrangement Arrangement, bool Actual)> { (x.Arrangement, true) };
        if (x.Arrangement is not (Counterflow or PlateAsCounterflow)) arrangements.Add((Counterflow.Instance, false));
        if (x.Arrangement is not ParallelFlow) arrangements.Add((new ParallelFlow(), false));
        return arrangements.Select(a => new ArrangementDuty(a.Arrangement.Name, a.Actual,
            Duty(a.Arrangement, e.UClean * x.Area, e, thi, tci), Duty(a.Arrangement, e.UActual * x.Area, e, thi, tci))).ToList();
    }

    private static double Duty(FlowArrangement arrangement, double ua, SampleEvaluation e, double thi, double tci) =>
        Rating.Rate(arrangement, ua, e.HotCapacityRate, e.ColdCapacityRate, Temperature.FromKelvin(thi), Temperature.FromKelvin(tci)).Duty;
}
