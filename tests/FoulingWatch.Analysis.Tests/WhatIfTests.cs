using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;

namespace FoulingWatch.Analysis.Tests;

/// <summary>Re-rating at today's conditions in other arrangements, against the textbook ε-NTU relations (Incropera,
/// Fundamentals of Heat and Mass Transfer, Table 11.3): counterflow, parallel flow, one shell pass with two tube passes.</summary>
public class WhatIfTests
{
    private static double Counter(double ntu, double cr) => Math.Abs(cr - 1) < 1e-12 ? ntu / (1 + ntu)
        : (1 - Math.Exp(-ntu * (1 - cr))) / (1 - cr * Math.Exp(-ntu * (1 - cr)));

    private static double Parallel(double ntu, double cr) => (1 - Math.Exp(-ntu * (1 + cr))) / (1 + cr);

    private static double OneShellTwoPasses(double ntu, double cr)
    {
        var r = Math.Sqrt(1 + cr * cr);
        return 2 / (1 + cr + r * (1 + Math.Exp(-ntu * r)) / (1 - Math.Exp(-ntu * r)));
    }

    [Fact]
    public void Duties_in_each_arrangement_follow_the_textbook_effectiveness_relations()
    {
        using var plant = new SyntheticPlant("{ \"type\": \"shell-and-tube\", \"shells\": 1, \"tubePasses\": 2 }", new OneShellPassEvenTubePasses(2),
            d => 2e-5 * d, days: 12);
        var x = Assert.Single(plant.Analyse().Exchangers);
        var last = x.History.Samples.Last(s => s.Status == SampleStatus.Ok);
        var e = last.Evaluation;
        var cmin = Math.Min(e.HotCapacityRate, e.ColdCapacityRate);
        var cr = cmin / Math.Max(e.HotCapacityRate, e.ColdCapacityRate);
        var dtMax = e.Measurements[Measurement.HotInlet] - e.Measurements[Measurement.ColdInlet];
        Assert.Equal([new OneShellPassEvenTubePasses(2).Name, Counterflow.Instance.Name, new ParallelFlow().Name], x.WhatIf.Select(w => w.Arrangement));
        Func<double, double, double>[] eps = [OneShellTwoPasses, Counter, Parallel];
        for (var i = 0; i < 3; i++)
        {
            var w = x.WhatIf[i];
            Assert.Equal(i == 0, w.Actual);
            foreach (var (u, duty) in new[] { (e.UClean, w.CleanDuty), (e.UActual, w.DutyNow) })
                Assert.Equal(eps[i](u * SyntheticPlant.Area / cmin, cr) * cmin * dtMax, duty, duty * 1e-9);
        }
        // counterflow does best and parallel flow worst at the same U (for any NTU and Cr)
        Assert.True(x.WhatIf[1].CleanDuty > x.WhatIf[0].CleanDuty && x.WhatIf[0].CleanDuty > x.WhatIf[2].CleanDuty);
    }
}
