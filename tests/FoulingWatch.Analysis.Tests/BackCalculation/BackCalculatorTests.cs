using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

public class BackCalculatorTests
{
    public static TheoryData<string, string> Arrangements() => new()
    {
        { "counterflow", "\"counterflow\"" },
        { "parallel", "\"parallel\"" },
        { "plate", "\"plate\"" },
        { "1-2", "{ \"type\": \"shell-and-tube\", \"shells\": 1, \"tubePasses\": 2 }" },
        { "1-4", "{ \"type\": \"shell-and-tube\", \"shells\": 1, \"tubePasses\": 4 }" },
        { "2 shells", "{ \"type\": \"shell-and-tube\", \"shells\": 2, \"tubePasses\": 2 }" },
        { "crossflow unmixed", "\"crossflow-unmixed\"" },
        { "crossflow hot mixed", "\"crossflow-hot-mixed\"" },
        { "crossflow cold mixed", "\"crossflow-cold-mixed\"" },
    };

    private static FlowArrangement ArrangementOf(string name) => name switch
    {
        "counterflow" => Counterflow.Instance,
        "parallel" => new ParallelFlow(),
        "plate" => new PlateAsCounterflow(),
        "1-2" => new OneShellPassEvenTubePasses(2),
        "1-4" => new OneShellPassEvenTubePasses(4),
        "2 shells" => new ShellsInSeries(2),
        "crossflow unmixed" => new CrossflowBothUnmixed(),
        "crossflow hot mixed" => new CrossflowOneMixed(StreamSide.Hot),
        _ => new CrossflowOneMixed(StreamSide.Cold),
    };

    private static double TrueRf(double day) => 1.5e-5 * day;  // fouling starts at zero (clean on day 0)

    // Synthetic (self-consistency): noise-free samples built from a known Rf history with flows swinging ±30 %
    // must give that Rf back for every arrangement. A naive U/U_design comparison would move by ±20 % with flow alone.
    [Theory]
    [MemberData(nameof(Arrangements))]
    public void A_known_fouling_history_is_recovered_with_the_datasheet_clean_U(string name, string json)
    {
        using var plant = new SyntheticPlant(json, ArrangementOf(name), TrueRf, days: 30);
        var x = Assert.Single(plant.Analyse().Exchangers);
        var ok = x.History.Samples.Where(s => s.Status == SampleStatus.Ok).ToList();
        Assert.True(ok.Count > 0.95 * x.History.Samples.Count, $"{name}: only {ok.Count} usable samples");
        var worst = ok.Max(s => Math.Abs(s.Evaluation.FoulingResistance - TrueRf((s.Timestamp - plant.Start).TotalDays)));
        Assert.True(worst < 1e-9, $"{name}: worst Rf error {worst:G3} m2K/W");
        // the naive approach: actual U over the design U, which varies with flow even without fouling
        var early = ok.Where(s => (s.Timestamp - plant.Start).TotalDays < 2).Select(s => s.Evaluation.UActual / SyntheticPlant.CleanUDesign).ToList();
        Assert.True(early.Max() - early.Min() > 0.1, "the flow swing must be large enough to defeat U/U_design");
    }

    // A clean reference ten times too low (or flows read a thousand times too large) gives a U no deposit explains:
    // cleanliness far above 1 is a status of its own with the reason, not an "ok" sample with a negative Rf.
    [Fact]
    public void A_U_far_above_the_clean_U_is_implausible_not_ok()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, TrueRf, days: 10,
            clean: "{ \"method\": \"datasheet\", \"u\": \"50 W/m2K\", \"tubeShare\": \"45 %\" }");
        var x = Assert.Single(plant.Analyse().Exchangers);
        var judged = x.History.Samples.Where(s => s.Status is SampleStatus.Ok or SampleStatus.Implausible).ToList();
        Assert.True(judged.Count > 200);
        Assert.All(judged, s => Assert.Equal(SampleStatus.Implausible, s.Status));
        Assert.Contains("times the clean U; check flow units and scales", judged[0].Evaluation.Detail);
        var why = PlantAnalysis.NoUsableIntervals(PlantAnalysis.StatusCounts(x.History));
        Assert.Contains("implausible", why);
        Assert.Contains("U far above the clean U", why);

        // the same exchanger with the right clean U: every judged sample stays ok (cleanliness ≤ 1 here)
        using var right = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, TrueRf, days: 10);
        Assert.DoesNotContain(Assert.Single(right.Analyse().Exchangers).History.Samples, s => s.Status == SampleStatus.Implausible);
    }

    // Synthetic: with the baseline method the clean U is fitted (Wilson plot) over the first 10 days, during which Rf = 0;
    // the fitted law then reproduces the datasheet law and Rf afterwards.
    [Theory]
    [InlineData("counterflow", "\"counterflow\"")]
    [InlineData("1-2", "{ \"type\": \"shell-and-tube\", \"shells\": 1, \"tubePasses\": 2 }")]
    [InlineData("crossflow unmixed", "\"crossflow-unmixed\"")]
    public void A_known_fouling_history_is_recovered_with_the_baseline_clean_U(string name, string json)
    {
        static double Rf(double d) => d < 10 ? 0 : 2e-5 * (d - 10);
        using var plant = new SyntheticPlant(json, ArrangementOf(name), Rf, days: 40, clean: "{ \"method\": \"baseline\", \"duration\": \"10 d\" }");
        var x = Assert.Single(plant.Analyse().Exchangers);
        Assert.Equal("baseline", x.History.CleanReference.Method);
        Assert.Null(x.History.CleanReference.Refusal);
        var ok = x.History.Samples.Where(s => s.Status == SampleStatus.Ok).ToList();
        var worst = ok.Max(s => Math.Abs(s.Evaluation.FoulingResistance - Rf((s.Timestamp - plant.Start).TotalDays)));
        Assert.True(worst < 1e-8, $"{name}: worst Rf error {worst:G3} m2K/W");
    }

    [Fact]
    public void The_baseline_refuses_to_separate_the_sides_when_flows_do_not_vary()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, TrueRf, days: 20,
            clean: "{ \"method\": \"baseline\", \"duration\": \"10 d\" }", flowSwing: 0.0);
        var x = Assert.Single(plant.Analyse().Exchangers);
        Assert.Equal("baseline-constant", x.History.CleanReference.Method);
        Assert.Contains("flows varied too little to separate the sides", x.History.CleanReference.Description);
    }

    // Synthetic: exact data close the balance, so reconciliation changes nothing and the duty equals the rated one.
    [Fact]
    public void Reconciled_basis_on_exact_data_recovers_the_same_fouling()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, TrueRf, days: 10, dutyBasis: "reconciled");
        var x = Assert.Single(plant.Analyse().Exchangers);
        var ok = x.History.Samples.Where(s => s.Status == SampleStatus.Ok).ToList();
        Assert.NotEmpty(ok);
        Assert.All(ok, s => Assert.Equal(TrueRf((s.Timestamp - plant.Start).TotalDays), s.Evaluation.FoulingResistance, 1e-9));
        Assert.All(ok, s => Assert.False(s.Evaluation.Reconciliation!.GrossError));
    }

    // Analytic: lost duty is zero when Rf is zero, and equals the ε-NTU duty difference otherwise.
    [Fact]
    public void Lost_duty_is_zero_for_a_clean_exchanger_and_positive_when_fouled()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, TrueRf, days: 20);
        var ok = Assert.Single(plant.Analyse().Exchangers).History.Samples.Where(s => s.Status == SampleStatus.Ok).ToList();
        Assert.Equal(0.0, ok[0].Evaluation.LostDuty, 1e-3);
        Assert.True(ok[^1].Evaluation.LostDuty > 1000);
        Assert.Equal(ok[^1].Evaluation.DutyClean - ok[^1].Evaluation.Duty, ok[^1].Evaluation.LostDuty, 1e-3 * ok[^1].Evaluation.Duty);
    }
}
