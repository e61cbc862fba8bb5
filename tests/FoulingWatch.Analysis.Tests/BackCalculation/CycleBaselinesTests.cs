using FoulingWatch.Core.Exchangers;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

public class CycleBaselinesTests
{
    // Synthetic (the exporter uses the Core ε-NTU rating): deposits grow 8e-6 m²K/W a day from the logged cleaning. The
    // clean U learned after the cleaning, at design flows, must match the true 500 W/m²K within 2 %; a datasheet that
    // says 500 agrees, one that says 650 is flagged as off the learned value.
    [Theory]
    [InlineData(500, false)]
    [InlineData(650, true)]
    public void The_clean_U_learned_after_a_cleaning_checks_the_datasheet(double datasheetU, bool flagged)
    {
        using var plant = new SyntheticPlant("\"counterflow\"", new Counterflow(), d => 8e-6 * d, days: 40,
            clean: $"{{ \"method\": \"datasheet\", \"u\": \"{datasheetU} W/m2K\", \"tubeShare\": \"45 %\" }}");
        var reference = plant.Analyse().Exchangers[0].History.CleanReference;
        var cycle = Assert.Single(reference.Cycles!);
        Assert.InRange(cycle.CleanU!.Value / SyntheticPlant.CleanUDesign, 0.98, 1.02);
        Assert.Equal(flagged, reference.CycleStatement!.Contains("off the learned value"));
        Assert.Equal(!flagged, reference.CycleStatement.Contains("in agreement"));
    }
}
