namespace FoulingWatch.Analysis.Tests;

public class PlantAnalysisTests
{
    // An exchanger with no usable interval is told with its top reasons and what to change, word for word.
    [Fact]
    public void No_usable_interval_names_the_top_reasons_and_what_to_change()
    {
        var counts = new Dictionary<string, int> { ["ok"] = 0, ["balance"] = 52_338, ["correction-undefined"] = 214, ["missing"] = 8, ["downtime"] = 0 };
        Assert.Equal("no usable interval: 52,338 balance, 214 correction-undefined, 8 missing; check flow units and densities, fluid models and balanceTolerance",
            PlantAnalysis.NoUsableIntervals(counts));
        Assert.Null(PlantAnalysis.NoUsableIntervals(new Dictionary<string, int> { ["ok"] = 1, ["balance"] = 5 }));
    }
}
