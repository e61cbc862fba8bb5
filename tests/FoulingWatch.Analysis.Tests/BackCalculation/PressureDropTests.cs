using System.Globalization;
using FoulingWatch.Core.Exchangers;

namespace FoulingWatch.Analysis.Tests.BackCalculation;

/// <summary>
/// The tube-side pressure drop as a second fouling signal. Synthetic: the drop at the design flow rises linearly from
/// 0.50 to 0.60 bar over 30 days while the flow swings ±30 %; the measured drop follows ΔP = ΔP_ref·(ṁ/ṁ_ref)^1.8, so
/// the referred drop is ΔP_ref exactly and the medians of the first and the last week are its values at their middles
/// (analytic for a linear history).
/// </summary>
public class PressureDropTests
{
    private static double Reference(double day) => 0.5 + 0.1 * day / 30;

    [Fact]
    public void The_drop_referred_to_the_design_flow_shows_the_rise_the_flow_swings_hide()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, d => 1.5e-5 * d, days: 30);
        var (raw, config) = AddDropTag(plant, (_, dp) => dp);

        var x = Assert.Single(plant.Analyse().Exchangers);
        var dpChange = Assert.Single(x.PressureDrops);
        Assert.Equal("tube", dpChange.Side);
        Assert.Equal(Reference(3.5) * 1e5, dpChange.First, 1e5 * 0.002);
        // the last week: the hours after day 29 23:00 − 7 d up to it, whose middle is day (23 + 29 23/24)/2
        Assert.Equal(Reference((23 + 29 + 23.0 / 24) / 2) * 1e5, dpChange.Last, 1e5 * 0.002);
        Assert.StartsWith("tube-side pressure drop at 108 t/h: 0.512 → 0.588 bar (+15%)", dpChange.Statement);
        // Without a geometry the cycle's first week is the clean reference: the referred drop over it is linear in time,
        // so the daily medians of measured over clean lie on a line of slope (0.1 bar/30 d)/first-week median exactly.
        Assert.Equal(PressureDropTrend.CleaningBasis, dpChange.RatioBasis);
        var slope = 0.1e5 / 30 / dpChange.First;
        Assert.Equal(slope, dpChange.RatioSlopePerDay!.Value, 0.01 * slope);
        Assert.InRange(dpChange.RatioSlopeSigma!.Value, 0, 0.01 * slope);
        Assert.Equal(Reference(29.9) * 1e5 / dpChange.First, dpChange.Ratio.Last(double.IsFinite), 0.01);
        // the raw readings swing far more than the rise: without referring them to one flow the trend is hidden
        Assert.True(raw.Max() / raw.Min() > 2, $"raw swing {raw.Max() / raw.Min():0.00}");

        // With the tube bore and a deposit conductivity the rise becomes a thickness (analytic): r = 0.58826/0.51160,
        // δ = (15.75 mm/2)·(1 − r^(−1/4.75)) = 0.2281 mm; Rf rose 1.5e-5·23 = 3.45e-4 m²K/W, δ = 3.45e-4·0.2 = 0.069 mm:
        // the bore narrows more than Rf says, and the statement names it.
        File.WriteAllText(plant.ConfigPath, config.Replace("\"unit\": \"bar\" }",
            "\"unit\": \"bar\", \"tubeInnerDiameter\": \"15.75 mm\", \"depositConductivity\": \"0.2 W/mK\" }"));
        var withBore = Assert.Single(Assert.Single(plant.Analyse().Exchangers).PressureDrops);
        Assert.Equal(2.281e-4, withBore.DepositFromDrop!.Value, 2e-6);
        Assert.Equal(6.9e-5, withBore.DepositFromRf!.Value, 1e-6);
        Assert.Contains("deposit about 0.23 mm from the drop, 0.07 mm from Rf at 0.2 W/mK: the bore narrows more than Rf says; " +
            "a more conductive deposit, debris, or a partly closed valve", withBore.Statement);
        Assert.EndsWith(FormattableString.Invariant($"; measured over clean moving +{slope * 100:0.000} ± 0.000 %/day over the cycle"),
            withBore.Statement);
    }

    /// <summary>Adds a tube-side drop column DPT (bar) made from the true referred drop at each row's cold flow, passed
    /// through <paramref name="measure"/> (row index, true drop), and names it in the configuration.</summary>
    private static (List<double> Raw, string Config) AddDropTag(SyntheticPlant plant, Func<int, double, double> measure)
    {
        var path = Path.Combine(plant.Directory, "export.csv");
        var lines = File.ReadAllLines(path);
        var start = DateTimeOffset.Parse(lines[1].Split(',')[0], CultureInfo.InvariantCulture);
        var raw = new List<double>();
        for (var i = 1; i < lines.Length; i++)
        {
            var f = lines[i].Split(',');
            var day = (DateTimeOffset.Parse(f[0], CultureInfo.InvariantCulture) - start).TotalDays;
            var coldFlow = double.Parse(f[4], CultureInfo.InvariantCulture) / 3.6;   // t/h to kg/s
            var dp = measure(i, Reference(day) * Math.Pow(coldFlow / SyntheticPlant.DesignCold, 1.8));
            raw.Add(dp);
            lines[i] += "," + dp.ToString("R", CultureInfo.InvariantCulture);
        }
        lines[0] += ",DPT";
        File.WriteAllLines(path, lines);
        var config = File.ReadAllText(plant.ConfigPath).Replace("\"designFlow\": \"30 kg/s\" }",
            "\"designFlow\": \"30 kg/s\", \"pressureDrop\": { \"tag\": \"DPT\", \"unit\": \"bar\" } }");
        File.WriteAllText(plant.ConfigPath, config);
        return (raw, config);
    }

    // Adversarial: the transmitter's noise is serially correlated (AR(1), φ = 0.95, 1 % innovations, so about 3 % wander
    // that lasts a day) and it reads 4 % high throughout (a span error). The span error cancels in the ratio of the two
    // weeks; the wander moves each week's median by a little: the change stays within 2 points of the true +14.99 %.
    [Fact]
    public void The_rise_survives_correlated_noise_and_a_span_error_of_the_transmitter()
    {
        using var plant = new SyntheticPlant("\"counterflow\"", Counterflow.Instance, d => 1.5e-5 * d, days: 30);
        var rng = new Random(20261202);
        var ar = 0.0;
        AddDropTag(plant, (_, dp) =>
        {
            ar = 0.95 * ar + 0.01 * Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());
            return 1.04 * dp * (1 + ar);
        });
        var drop = Assert.Single(Assert.Single(plant.Analyse().Exchangers).PressureDrops);
        var truth = Reference((23 + 29 + 23.0 / 24) / 2) / Reference((0 + 6 + 23.0 / 24) / 2) - 1;
        Assert.InRange(drop.Change, truth - 0.02, truth + 0.02);
        // the ratio's trend: the span error cancels, the wander widens the interval, which must still cover the truth
        var slope = 0.1 / 30 / Reference(3.5);
        var (fitted, sigma) = (drop.RatioSlopePerDay!.Value, drop.RatioSlopeSigma!.Value);
        Assert.InRange(sigma, 1e-5, 0.3 * slope);
        Assert.InRange(fitted, slope - 3 * sigma, slope + 3 * sigma);
    }
}
