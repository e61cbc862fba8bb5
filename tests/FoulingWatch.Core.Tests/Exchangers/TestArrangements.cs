using FoulingWatch.Core.Exchangers;

namespace FoulingWatch.Core.Tests.Exchangers;

/// <summary>Every arrangement the product supports, for tests that must hold for all of them.</summary>
public static class TestArrangements
{
    public static readonly Dictionary<string, FlowArrangement> All = new()
    {
        ["counterflow"] = Counterflow.Instance,
        ["plate"] = new PlateAsCounterflow(),
        ["parallel"] = new ParallelFlow(),
        ["1-2 shell"] = new OneShellPassEvenTubePasses(2),
        ["1-4 shell"] = new OneShellPassEvenTubePasses(4),
        ["2 shells"] = new ShellsInSeries(2),
        ["3 shells"] = new ShellsInSeries(3),
        ["crossflow unmixed"] = new CrossflowBothUnmixed(),
        ["crossflow hot mixed"] = new CrossflowOneMixed(StreamSide.Hot),
        ["crossflow cold mixed"] = new CrossflowOneMixed(StreamSide.Cold),
    };

    public static TheoryData<string> Names()
    {
        var d = new TheoryData<string>();
        foreach (var k in All.Keys) d.Add(k);
        return d;
    }
}
