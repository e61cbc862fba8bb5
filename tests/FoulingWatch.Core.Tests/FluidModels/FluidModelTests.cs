using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.FluidModels;

public class FluidModelTests
{
    private static readonly Pressure Atm = Pressure.StandardAtmosphere;
    private static Temperature C(double c) => Temperature.FromCelsius(c);
    private static readonly TemperatureRange Wide = new(250, 700);

    // Analytic: for constant cp, Δh = cp·ΔT exactly.
    [Fact]
    public void Constant_cp_enthalpy_change_is_cp_times_the_difference()
    {
        IFluidModel m = new ConstantSpecificHeat(2100, Wide);
        Assert.Equal(2100 * 55.0, m.EnthalpyChange(C(25), C(80), Atm), 9);
    }

    // Analytic: ∫(a + bT + cT²)dT from T1 to T2 = a·ΔT + b(T2²−T1²)/2 + c(T2³−T1³)/3 (T in °C here, origin 273.15 K).
    [Fact]
    public void Polynomial_cp_enthalpy_is_the_exact_integral()
    {
        double a = 1800, b = 3.2, c = -0.004;
        IFluidModel m = new PolynomialSpecificHeat([a, b, c], 273.15, Wide);
        double t1 = 40, t2 = 260;
        var expected = a * (t2 - t1) + b * (t2 * t2 - t1 * t1) / 2 + c * (t2 * t2 * t2 - t1 * t1 * t1) / 3;
        Assert.Equal(expected, m.EnthalpyChange(C(t1), C(t2), Atm), 6);
        Assert.Equal(a + b * 100 + c * 1e4, m.SpecificHeat(C(100), Atm), 9);
    }

    // Analytic: the integral of a piecewise-linear cp is the sum of trapezoids.
    [Fact]
    public void Tabulated_cp_enthalpy_is_the_integral_of_the_piecewise_linear_table()
    {
        IFluidModel m = new TabulatedSpecificHeat([(300, 2000), (400, 2200), (500, 2600)]);
        // from 350 K (cp 2100) to 450 K (cp 2400): 50·(2100+2200)/2 + 50·(2200+2400)/2
        Assert.Equal(50 * 2150.0 + 50 * 2300.0, m.EnthalpyChange(Temperature.FromKelvin(350), Temperature.FromKelvin(450), Atm), 9);
        Assert.Equal(2400, m.SpecificHeat(Temperature.FromKelvin(450), Atm), 9);
    }

    [Fact]
    public void Tabulated_cp_refuses_to_extrapolate()
    {
        IFluidModel m = new TabulatedSpecificHeat([(300, 2000), (400, 2200)]);
        var ex = Assert.Throws<PropertyRangeException>(() => m.SpecificHeat(Temperature.FromKelvin(410), Atm));
        Assert.Contains("cp(T) table: temperature = 410 K is out of range", ex.Message);
    }

    // Source: Kesler & Lee (1976) liquid cp as in API TDB 7D2.2 (REFERENCES.md), evaluated by hand for
    // SG 0.85, K 12.0 at 600 °R: A1 = 0.0632201, A2 = 8.67956e-4, A3 = −2.25309e-7 → cp = 0.502882 Btu/(lb·°F).
    [Fact]
    public void Kesler_Lee_cp_matches_the_published_equation()
    {
        var m = new KeslerLeePetroleumLiquid(0.85, 12.0);
        var t = Temperature.FromKelvin(600 / 1.8);
        Assert.Equal(0.502882 * 4186.8, m.SpecificHeat(t, Atm), 0.000005 * 4186.8);
    }

    // Source: a 35 °API Watson-K 11.8 crude has a liquid cp near 0.50 Btu/(lb·°F) (2.1 kJ/kgK) at 150 °F
    // (API TDB liquid heat-capacity chart; from memory) — a ±4 % plausibility check of the SG and K handling.
    [Fact]
    public void Kesler_Lee_cp_of_a_medium_crude_is_in_the_handbook_band()
    {
        var m = KeslerLeePetroleumLiquid.FromApiGravity(35, 11.8);
        Assert.InRange(m.SpecificHeat(Temperature.FromFahrenheit(150), Atm) / 4186.8, 0.48, 0.52);
    }

    // Analytic: the enthalpy is the integral of cp; check numerically by Simpson's rule.
    [Fact]
    public void Kesler_Lee_enthalpy_is_the_integral_of_its_cp()
    {
        IFluidModel m = new KeslerLeePetroleumLiquid(0.87, 11.9);
        double t1 = 320, t2 = 560;
        var n = 200;
        var hstep = (t2 - t1) / n;
        var sum = 0.0;
        for (var i = 0; i <= n; i++)
        {
            var w = i == 0 || i == n ? 1 : i % 2 == 1 ? 4 : 2;
            sum += w * m.SpecificHeat(Temperature.FromKelvin(t1 + i * hstep), Atm);
        }
        Assert.Equal(sum * hstep / 3, m.EnthalpyChange(Temperature.FromKelvin(t1), Temperature.FromKelvin(t2), Atm), 1e-6);
    }

    [Fact]
    public void Kesler_Lee_refuses_a_Watson_K_outside_its_range()
    {
        var ex = Assert.Throws<QuantityOutOfRangeException>(() => new KeslerLeePetroleumLiquid(0.85, 14.5));
        Assert.Equal("Watson K = 14.5  is out of range; valid: 10 to 13 (Kesler–Lee liquid cp).", ex.Message);
    }

    // Source: IAPWS R7-97 Table 5, row T = 300 K, p = 3 MPa / 500 K, 3 MPa: Δh = 975.542239 − 115.331273 kJ/kg.
    [Fact]
    public void Liquid_water_enthalpy_change_follows_IAPWS_region_1()
    {
        IFluidModel m = new IapwsWater();
        var dh = m.EnthalpyChange(Temperature.FromKelvin(300), Temperature.FromKelvin(500), Pressure.FromMegapascals(3));
        Assert.Equal((975.542239 - 115.331273) * 1e3, dh, 1e-3);
        Assert.Equal(1 / 0.100215168e-2, m.Density(Temperature.FromKelvin(300), Pressure.FromMegapascals(3))!.Value, 1e-5);
    }

    [Fact]
    public void Water_crossing_saturation_is_refused_with_advice()
    {
        IFluidModel m = new IapwsWater();
        var why = m.WhyNotEvaluable(C(90), C(120), Atm);
        Assert.NotNull(why);
        Assert.Contains("crosses saturation at 100 °C; use the condensing or evaporating steam model", why);
    }

    // Analytic from IAPWS: saturated vapour in, saturated liquid out gives exactly the latent heat.
    [Fact]
    public void Condensing_saturated_steam_releases_the_latent_heat()
    {
        var p = Pressure.FromBar(10);
        IFluidModel m = new SteamPhaseChange(p, PhaseChangeDirection.Condensing);
        var ts = IapwsIf97.SaturationTemperature(1.0);
        var dh = m.EnthalpyChange(Temperature.FromKelvin(ts + 0.2), Temperature.FromKelvin(ts - 0.2), p);
        Assert.Equal(-IapwsIf97.LatentHeat(1.0), dh, 1e-6);
        Assert.True(m.IsPhaseChange);
    }

    // Source: IAPWS-IF97 regions 1 and 2 at 1 MPa: superheat and subcooling add the single-phase enthalpy differences.
    [Fact]
    public void Condensing_steam_with_superheat_and_subcooling_adds_the_sensible_parts()
    {
        var p = Pressure.FromMegapascals(1.0);
        IFluidModel m = new SteamPhaseChange(p, PhaseChangeDirection.Condensing);
        var ts = IapwsIf97.SaturationTemperature(1.0);
        double tin = 500, tout = 400;
        var expected = IapwsIf97.Region1(tout, 1.0).SpecificEnthalpy - IapwsIf97.Region2(tin, 1.0).SpecificEnthalpy;
        Assert.Equal(expected, m.EnthalpyChange(Temperature.FromKelvin(tin), Temperature.FromKelvin(tout), p), 1e-6);
        Assert.True(tin > ts && tout < ts);
    }

    [Fact]
    public void Condensing_side_with_a_subcooled_inlet_cannot_be_evaluated()
    {
        var p = Pressure.FromBar(5);
        IFluidModel m = new SteamPhaseChange(p, PhaseChangeDirection.Condensing);
        Assert.Contains("below saturation", m.WhyNotEvaluable(C(120), C(110), p));
        Assert.Throws<PropertyRangeException>(() => m.EnthalpyChange(C(120), C(110), p));
    }

    // Analytic: evaporating is condensing reversed.
    [Fact]
    public void Evaporating_water_takes_the_latent_heat()
    {
        var p = Pressure.FromBar(3);
        IFluidModel m = new SteamPhaseChange(p, PhaseChangeDirection.Evaporating);
        var ts = IapwsIf97.SaturationTemperature(0.3);
        Assert.Equal(IapwsIf97.LatentHeat(0.3), m.EnthalpyChange(Temperature.FromKelvin(ts), Temperature.FromKelvin(ts), p), 1e-6);
    }

    // Analytic (the definition c_p = (∂h/∂T)_p): the slopes of each model's enthalpy change, which the Rf uncertainty
    // uses as its duty derivatives, equal central differences (step 1 mK) of the model's own enthalpy change within
    // 1e-6, for every sensible model and for condensing steam and evaporating water outside the saturation band.
    [Fact]
    public void Enthalpy_change_slopes_equal_central_differences_of_the_enthalpy_change()
    {
        var bar5 = new Pressure(5e5);
        (IFluidModel Model, double From, double To, Pressure P)[] cases =
        [
            (new ConstantSpecificHeat(2100, Wide), 80, 30, Atm),
            (new PolynomialSpecificHeat([1800, 3.2, -0.004], 273.15, Wide), 140, 60, Atm),
            (new TabulatedSpecificHeat([(300, 2000), (400, 2200), (500, 2600)]), 215, 95, Atm),
            (new KeslerLeePetroleumLiquid(0.87, 11.9), 260, 150, Atm),
            (new IapwsWater(), 20, 75, bar5),
            (new SteamPhaseChange(new Pressure(4e5), PhaseChangeDirection.Condensing), 175, 130, bar5),
            (new SteamPhaseChange(new Pressure(2e5), PhaseChangeDirection.Evaporating), 95, 160, bar5),
        ];
        const double h = 1e-3;
        foreach (var (model, from, to, p) in cases)
        {
            double Change(double f, double t) => model.EnthalpyChange(C(f), C(t), p);
            var (slopeFrom, slopeTo) = model.EnthalpyChangeSlopes(C(from), C(to), p);
            var numericFrom = (Change(from + h, to) - Change(from - h, to)) / (2 * h);
            var numericTo = (Change(from, to + h) - Change(from, to - h)) / (2 * h);
            Assert.True(Math.Abs(slopeFrom) > 500 && Math.Abs(slopeTo) > 500, $"{model.Description}: slopes {slopeFrom}, {slopeTo}");
            Assert.Equal(numericFrom, slopeFrom, Math.Abs(numericFrom) * 1e-6);
            Assert.Equal(numericTo, slopeTo, Math.Abs(numericTo) * 1e-6);
        }
        // inside the saturation band the state is taken as saturated: the enthalpy does not move with the reading
        var condensing = new SteamPhaseChange(new Pressure(4e5), PhaseChangeDirection.Condensing);
        var ts = condensing.SaturationTemperature.Celsius;
        Assert.Equal((0.0, 0.0), condensing.EnthalpyChangeSlopes(C(ts + 0.2), C(ts - 0.2), bar5));
    }
}
