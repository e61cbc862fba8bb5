using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Ingest.Configuration;
using FoulingWatch.Ingest.Historian;
using Xunit.Abstractions;

namespace FoulingWatch.Cli.Tests;

/// <summary>
/// σ(Rf) by chain-rule sensitivities (analytic duty derivatives with the fluid's own c_p; central differences of the
/// driving force and the clean U alone) against the whole model's central differences, GUM 5.1.3, on every usable
/// interval of the whole sample plant: all six exchangers, so every duty basis, clean-U model (datasheet, Wilson plot,
/// geometry) and fluid model (constant c_p, Kesler–Lee, petroleum transport, IAPWS-IF97 water, condensing steam) of the
/// sample configuration. A numerical cross-check of two derivative methods of the same model, not an external check
/// (the propagation itself is checked against the GUM's Annex H.2 example in Core and by Monte Carlo in Analysis).
/// </summary>
public sealed class SensitivityTests(ITestOutputHelper output)
{
    // The central differences' own truncation error at step σ/100 is of the order (σ/x/100)², below 1e-8 here; the
    // methods must agree far inside the nine digits the results are written with.
    private const double Tolerance = 1e-6;

    [Fact]
    public void Chain_rule_sigma_equals_whole_model_central_differences_on_the_whole_sample_plant()
    {
        using var plant = new SamplePlantCopy(windowStart: null);
        var config = PlantConfigurationReader.Load(plant.ConfigPath);
        var ingest = HistorianIngest.Run(config);
        var settings = OperatingStateSettings.Default with
        {
            FrozenAfter = config.Data.FrozenAfter ?? DataSettings.DefaultFrozenAfter,
        };
        var total = 0;
        foreach (var x in config.Exchangers)
        {
            var h = BackCalculator.Run(x, ingest, settings, config.Site.TimeZone);
            var clean = h.CleanModel ?? throw new InvalidOperationException($"{x.Id} has no clean model");
            var evaluator = new SampleEvaluator(x);
            var c = h.Columns;
            var m = new double[Measurement.Count];
            var (compared, worst) = (0, 0.0);
            for (var k = 0; k < c.Count; k++)
            {
                if (c.Status[k] != SampleStatus.Ok) continue;
                c.MeasurementsInto(k, m);
                var pHot = x.Hot.PressureTag is { } ph ? ingest.Series[ph.Tag][k] : x.Hot.PressurePascals;
                var pCold = x.Cold.PressureTag is { } pc ? ingest.Series[pc.Tag][k] : x.Cold.PressurePascals;
                var chain = evaluator.FoulingResistanceSigma(m, pHot, pCold, clean);
                var probes = evaluator.FoulingResistanceSigmaByProbes(m, pHot, pCold, clean);
                Assert.Equal(double.IsNaN(probes), double.IsNaN(chain));
                if (double.IsNaN(probes)) continue;
                Assert.True(probes > 0, $"{x.Id} k={k}: σ {probes}");
                var relative = Math.Abs(chain - probes) / probes;
                if (relative > Tolerance) Assert.Fail($"{x.Id} k={k}: chain rule {chain:R}, central differences {probes:R}");
                worst = Math.Max(worst, relative);
                compared++;
            }
            output.WriteLine($"{x.Id}: {compared} intervals, largest relative difference {worst:E2} ({clean.GetType().Name}, " +
                             $"{x.DutyBasis} basis, {x.Hot.Fluid.GetType().Name} / {x.Cold.Fluid.GetType().Name})");
            Assert.True(compared > 10_000, $"{x.Id}: only {compared} intervals compared");
            total += compared;
        }
        Assert.True(total > 250_000, $"only {total} intervals compared");
    }

    // The σ of 1/U alone (the calibration's weights) uses an infinite clean U: both methods give the same there too.
    [Fact]
    public void With_an_infinite_clean_U_both_methods_give_the_sigma_of_one_over_U()
    {
        using var plant = new SamplePlantCopy(windowStart: null);
        var config = PlantConfigurationReader.Load(plant.ConfigPath);
        var infinite = new WilsonPlotCleanU(0, 0, 0, 0, 0, "none");
        foreach (var x in config.Exchangers)
        {
            var evaluator = new SampleEvaluator(x);
            var m = new double[Measurement.Count];
            m[Measurement.HotFlow] = x.Hot.DesignFlow ?? 20;
            m[Measurement.ColdFlow] = x.Cold.DesignFlow ?? 20;
            (m[Measurement.HotInlet], m[Measurement.HotOutlet], m[Measurement.ColdInlet], m[Measurement.ColdOutlet]) =
                x.Hot.Fluid.IsPhaseChange ? (413.15, 411.15, 330.15, 370.15) : (480.15, 420.15, 330.15, 370.15);
            var probes = evaluator.FoulingResistanceSigmaByProbes(m, x.Hot.PressurePascals, x.Cold.PressurePascals, infinite);
            var chain = evaluator.FoulingResistanceSigma(m, x.Hot.PressurePascals, x.Cold.PressurePascals, infinite);
            if (double.IsNaN(probes)) continue;
            Assert.Equal(probes, chain, probes * Tolerance);
        }
    }
}
