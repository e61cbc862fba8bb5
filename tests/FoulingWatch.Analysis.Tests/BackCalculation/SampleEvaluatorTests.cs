using FoulingWatch.Analysis.BackCalculation;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

public class SampleEvaluatorTests
{
    private static ExchangerConfiguration Exchanger(string arrangement = "\"counterflow\"", string area = "120 m2", string hotFluid = "{ \"model\": \"constant-cp\", \"cp\": \"2300 J/kgK\" }",
        string coldFluid = "{ \"model\": \"constant-cp\", \"cp\": \"4100 J/kgK\" }", string hotPressure = "") =>
        TestExchangers.Simple(arrangement: arrangement, area: area, hotFluid: hotFluid, coldFluid: coldFluid, hotPressure: hotPressure);

    private static double[] M(double mh, double thi, double tho, double mc, double tci, double tco) =>
        [mh, thi + 273.15, tho + 273.15, mc, tci + 273.15, tco + 273.15];

    // Source: Incropera, DeWitt, Bergman & Lavine, Fundamentals of Heat and Mass Transfer, Example 11.1 (from memory):
    // oil 0.1 kg/s (cp 2131 J/kgK) 100 → 60 °C against water 0.2 kg/s (cp 4178) from 30 °C in a counterflow double pipe of
    // D_i = 25 mm and L = 66.5 m; the book's U is 38.1 W/m²K... computed from h_i = 2250 and h_o = 38.4 W/m²K it is 37.8.
    // Run backwards from the outlets the engine must give U within 0.5 % of 37.8 W/m²K.
    [Fact]
    public void A_textbook_oil_cooler_run_backwards_gives_its_U()
    {
        var area = Math.PI * 0.025 * 66.5;
        var x = Exchanger(area: FormattableString.Invariant($"{area} m2"), hotFluid: "{ \"model\": \"constant-cp\", \"cp\": \"2131 J/kgK\" }",
            coldFluid: "{ \"model\": \"constant-cp\", \"cp\": \"4178 J/kgK\" }");
        var q = 0.1 * 2131 * 40;
        var e = new SampleEvaluator(x).Evaluate(M(0.1, 100, 60, 0.2, 30, 30 + q / (0.2 * 4178)), 5e5, 5e5, reconcile: true);
        Assert.Equal(SampleStatus.Ok, e.Status);
        Assert.Equal(8524, e.Duty, 1);
        Assert.Equal(37.76, e.UActual, 37.76 * 0.005);
    }

    [Fact]
    public void A_temperature_cross_in_counterflow_terms_is_refused_with_its_reason()
    {
        // hot leaves colder than the cold stream enters: ΔT₂ = 35 − 40 < 0
        var e = new SampleEvaluator(Exchanger()).Evaluate(M(10, 150, 35, 8.4, 40, 55.5), 5e5, 5e5, true);
        Assert.Equal(SampleStatus.TemperatureCross, e.Status);
    }

    [Fact]
    public void P_beyond_the_maximum_of_a_1_2_shell_is_refused_as_correction_undefined()
    {
        // P = 0.7 with R = 1 lies beyond P_max = 0.586 (Bowman–Mueller–Nagle); the terminal differences stay positive.
        var x = Exchanger(arrangement: "{ \"type\": \"shell-and-tube\" }", hotFluid: "{ \"model\": \"constant-cp\", \"cp\": \"4100 J/kgK\" }");
        var e = new SampleEvaluator(x).Evaluate(M(10, 130, 60, 10, 30, 100), 5e5, 5e5, true);
        Assert.Equal(SampleStatus.CorrectionUndefined, e.Status);
        Assert.Contains("beyond the maximum", e.Detail);
    }

    [Fact]
    public void A_hot_stream_that_warms_has_no_duty()
    {
        var e = new SampleEvaluator(Exchanger()).Evaluate(M(10, 100, 110, 8, 30, 40), 5e5, 5e5, true);
        Assert.Equal(SampleStatus.NoDuty, e.Status);
        Assert.StartsWith("the hot stream is not cooling: hot outlet ", e.Detail);
        // Analytic: the outlet reads 110 °C, 10 K above the 100 °C inlet; both tags are named so the swap can be checked.
        var x = Exchanger();
        Assert.Contains($"hot outlet {x.Hot.Outlet.Tag} reads 10.0 K above hot inlet {x.Hot.Inlet.Tag}; swapped or mislabelled sensors?", e.Detail);
    }

    [Fact]
    public void A_cold_outlet_below_its_inlet_is_named_as_a_likely_swap()
    {
        var x = Exchanger();
        var e = new SampleEvaluator(x).Evaluate(M(10, 150, 110, 8, 40, 33), 5e5, 5e5, true);
        Assert.Equal(SampleStatus.NoDuty, e.Status);
        Assert.Equal($"the cold stream is not warming: cold outlet {x.Cold.Outlet.Tag} reads 7.0 K below cold inlet {x.Cold.Inlet.Tag}; swapped or mislabelled sensors?", e.Detail);
    }

    [Fact]
    public void Water_that_would_boil_is_a_property_range_problem()
    {
        var x = Exchanger(hotFluid: "{ \"model\": \"water\" }", hotPressure: "\"pressure\": \"1 bar\",");
        var e = new SampleEvaluator(x).Evaluate(M(10, 120, 90, 8, 30, 60), 1e5, 5e5, true);
        Assert.Equal(SampleStatus.PropertyRange, e.Status);
        Assert.Contains("crosses saturation", e.Detail);
    }

    [Fact]
    public void A_missing_measurement_gives_the_missing_status()
    {
        var e = new SampleEvaluator(Exchanger()).Evaluate(M(double.NaN, 150, 90, 8, 30, 60), 5e5, 5e5, true);
        Assert.Equal(SampleStatus.Missing, e.Status);
    }

    // Check against a Monte Carlo of the same model (the first-order propagation of ASME PTC 19.1 must match the spread
    // of Rf when the six measurements are drawn with their stated σ; 20 000 seeded draws, agreement within 4 %).
    [Fact]
    public void First_order_uncertainty_of_Rf_matches_a_Monte_Carlo()
    {
        var x = Exchanger();
        var evaluator = new SampleEvaluator(x);
        var clean = new DatasheetCleanU((DatasheetCleanReference)x.Clean, false, false);
        var m = M(20, 150, 95.9, 28, 30, 53.03);
        var first = evaluator.FoulingResistanceSigma(m, 5e5, 5e5, clean);
        var sigma = evaluator.Sigmas(m);
        var rng = new Random(42);
        var draws = new List<double>();
        var probe = new double[6];
        for (var i = 0; i < 20_000; i++)
        {
            for (var j = 0; j < 6; j++)
                probe[j] = m[j] + sigma[j] * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            var rf = evaluator.FoulingResistanceOf(probe, 5e5, 5e5, clean);
            if (double.IsFinite(rf)) draws.Add(rf);
        }
        var mean = draws.Average();
        var sd = Math.Sqrt(draws.Sum(d => (d - mean) * (d - mean)) / (draws.Count - 1));
        Assert.True(draws.Count > 19_900);
        Assert.InRange(first / sd, 0.96, 1.04);
    }

    // Two derivative methods of one model (a cross-check, not an external one): σ(Rf) from the chain-rule sensitivities
    // (analytic duty derivatives with each fluid's c_p) equals the whole model's central differences (GUM 5.1.3, step
    // σ/100) within 1e-6, for every sensible fluid model, duty basis and three arrangements, at seeded random states.
    // The sample plant test in the command-line tests covers condensing steam, the reconciled basis and the clean-U
    // models.
    [Theory]
    [InlineData("{ \"model\": \"constant-cp\", \"cp\": \"2300 J/kgK\" }")]
    [InlineData("{ \"model\": \"cp-polynomial\", \"coefficients\": [1800, 4.1, 0.002] }")]
    [InlineData("{ \"model\": \"cp-table\", \"points\": [[\"20 degC\", \"1900 J/kgK\"], [\"80 degC\", \"2050 J/kgK\"], [\"200 degC\", \"2400 J/kgK\"]] }")]
    [InlineData("{ \"model\": \"petroleum\", \"api\": 32, \"watsonK\": 11.8 }")]
    [InlineData("{ \"model\": \"water\" }")]
    public void Chain_rule_sigma_equals_whole_model_central_differences(string hotFluid)
    {
        var rng = new Random(20261203);
        foreach (var basis in new[] { "hot", "cold", "mean" })
            foreach (var arrangement in new[] { "\"counterflow\"", "\"shell-and-tube\"", "\"crossflow-unmixed\"" })
            {
                var x = TestExchangers.Simple(arrangement: arrangement, hotFluid: hotFluid, coldFluid: "{ \"model\": \"water\" }",
                    basis: basis);
                var evaluator = new SampleEvaluator(x);
                var clean = new DatasheetCleanU((DatasheetCleanReference)x.Clean, false, false);
                var compared = 0;
                for (var i = 0; i < 40; i++)
                {
                    var thi = 88 + 4 * rng.NextDouble();
                    var tho = 58 + 6 * rng.NextDouble();
                    var tci = 20 + 4 * rng.NextDouble();
                    var mh = 15 + 10 * rng.NextDouble();
                    var qh = evaluator.Duties(M(mh, thi, tho, 1, tci, tci + 1), 5e5, 5e5, out _)!.Value.Hot;
                    // cold capacity rate at least 1.2 times the hot: the crossflow relation is an approximation whose F
                    // has a kink where the two capacity rates swap roles (R = 1), where no derivative is defined
                    var mc = 32 + 8 * rng.NextDouble();
                    var tco = tci + qh / (mc * 4180) * (0.98 + 0.04 * rng.NextDouble()); // °C, balanced within ±2 %
                    var m = M(mh, thi, tho, mc, tci, tco);
                    var probes = evaluator.FoulingResistanceSigmaByProbes(m, 5e5, 5e5, clean);
                    var chain = evaluator.FoulingResistanceSigma(m, 5e5, 5e5, clean);
                    if (double.IsNaN(probes)) { Assert.True(double.IsNaN(chain)); continue; }
                    Assert.True(probes > 0);
                    if (Math.Abs(chain - probes) > 1e-6 * probes)
                        Assert.Fail($"{basis} {arrangement}: chain rule {chain:R}, central differences {probes:R}");
                    compared++;
                }
                Assert.True(compared >= 30, $"{basis} {arrangement}: only {compared} states compared");
            }
    }

    // Monte Carlo of the same model as an independent check of the chain-rule σ (GUM Supplement 1, JCGM 101:2008: the
    // spread of the output when the inputs are drawn with their stated σ; from memory for the reference): IAPWS-IF97
    // water on both sides, a 1-2 shell-and-tube arrangement (F varies with all four temperatures) and the hot basis;
    // 20 000 seeded draws, agreement within 4 %.
    [Fact]
    public void Chain_rule_uncertainty_of_Rf_matches_a_Monte_Carlo_with_water_and_a_shell_and_tube_F()
    {
        var x = TestExchangers.Simple(arrangement: "\"shell-and-tube\"", hotFluid: "{ \"model\": \"water\" }",
            coldFluid: "{ \"model\": \"water\" }", basis: "hot");
        var evaluator = new SampleEvaluator(x);
        var clean = new DatasheetCleanU((DatasheetCleanReference)x.Clean, false, false);
        var qh = evaluator.Duties(M(20, 95, 60, 1, 25, 26), 5e5, 5e5, out _)!.Value.Hot;
        var m = M(20, 95, 60, 30, 25, 25 + qh / (30 * 4180));
        var first = evaluator.FoulingResistanceSigma(m, 5e5, 5e5, clean);
        var sigma = evaluator.Sigmas(m);
        var rng = new Random(7);
        var draws = new List<double>();
        var probe = new double[6];
        for (var i = 0; i < 20_000; i++)
        {
            for (var j = 0; j < 6; j++)
                probe[j] = m[j] + sigma[j] * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            var rf = evaluator.FoulingResistanceOf(probe, 5e5, 5e5, clean);
            if (double.IsFinite(rf)) draws.Add(rf);
        }
        var mean = draws.Average();
        var sd = Math.Sqrt(draws.Sum(d => (d - mean) * (d - mean)) / (draws.Count - 1));
        Assert.True(draws.Count > 19_900);
        Assert.InRange(first / sd, 0.96, 1.04);
    }
}
