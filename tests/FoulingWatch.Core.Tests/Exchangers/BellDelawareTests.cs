using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

/// <summary>A fluid whose viscosity falls with temperature (μ = μ₀·exp(−(T − 300 K)/40 K)), other properties fixed.</summary>
internal sealed class ThinningFluid(double mu300, double k, double cp) : ITransportFluid
{
    public double? Density(Temperature temperature, Pressure pressure) => 850;
    public string Description => "viscosity falling with temperature";
    public TemperatureRange Validity => new(200, 800);
    public double SpecificEnthalpy(Temperature temperature, Pressure pressure) => cp * temperature.Kelvin;
    public double SpecificHeat(Temperature temperature, Pressure pressure) => cp;
    public double Viscosity(Temperature temperature, Pressure pressure) => mu300 * Math.Exp(-(temperature.Kelvin - 300) / 40);
    public double ThermalConductivity(Temperature temperature, Pressure pressure) => k;
}

public class BellDelawareTests
{
    private static readonly ShellAndTubeGeometry Bundle = new(0.489, 0.01905, 0.01575, 4.877, 300, 0.02381, TubeLayout.Triangular, 2, 0.3, 50);

    // Source: the Heat Exchanger Design Handbook's curve fits of Bell's leakage and bypass charts and Taborek's end-spacing
    // and laminar factors, as evaluated by an independent open-source implementation (the `ht` library's documented
    // examples: baffle_leakage_Bell(1, 3, 8, 'HEDH') = 0.5530236260777, bundle_bypassing_Bell(0.5, 5, 25, method='HEDH') =
    // 0.84832109705, unequal_baffle_spacing_Bell(16, .1, .15, .15) = 0.9640087802805195, laminar_correction_Bell(30, 80) =
    // 0.7267995454361379).
    [Fact]
    public void Correction_factors_match_the_published_curve_fits()
    {
        Assert.Equal(0.5530236260777, BellDelawareShell.LeakageFactor(1.0 / 4, 4.0 / 8), 12);
        Assert.Equal(0.84832109705, BellDelawareShell.BypassFactor(0.5, 5.0 / 25, laminar: false), 1e-10);
        Assert.Equal(0.9640087802805195, BellDelawareShell.EndSpacingFactor(16, 1.5, 1.5, laminar: false), 12);
        Assert.Equal(0.7267995454361379, BellDelawareShell.LaminarFactor(30, 80), 12);
        Assert.Equal(1, BellDelawareShell.BypassFactor(0.5, 0.5, laminar: false));
        Assert.Equal(1, BellDelawareShell.LaminarFactor(150, 80));
    }

    // Taborek's ideal tube-bank j factor (HEDH 3.3.7; coefficients from memory, the same in several published
    // compilations) by hand for a triangular bank, Pt/Do = 23.81/19.05 = 1.24987, Re = 10⁴:
    // a = 1.45/(1 + 0.14·10⁴^0.519) = 0.082064, j = 0.321·(1.33/1.24987)^a·10⁴^−0.388 = 0.0090514;
    // friction (Re ≥ 10⁴ band) b = 7/(1 + 0.14·10⁴^0.5) = 0.46667, f = 0.372·1.06411^b·10⁴^−0.123 = 0.372·1.02942·0.32211
    // = 0.12335.
    [Fact]
    public void Ideal_bank_factors_follow_Taboreks_fits()
    {
        var bd = new BellDelawareShell(Bundle, new BaffleDetails());
        Assert.Equal(0.0090514, bd.IdealJ(1e4), 6);
        Assert.Equal(0.12335, bd.IdealF(1e4), 5);
    }

    // Analytic: without clearances (tube and shell holes tight, bundle filling the shell) leakage and bypass vanish, so
    // J_l = J_b = 1, and with equal spacings J_s = 1: the film is the ideal bank's times J_c = 0.55 + 0.72·F_c alone.
    [Fact]
    public void Without_clearances_only_the_window_correction_remains()
    {
        var tight = new BaffleDetails(0.25, TubeBaffleClearance: 0, ShellBaffleClearance: 0, BundleShellClearance: 1e-9);
        var bd = new BellDelawareShell(Bundle, tight);
        var f = bd.Factors(15, 1.5e-3);
        Assert.Equal(1, f.Jl, 6);
        Assert.Equal(1, f.Jb, 6);
        Assert.Equal(1, f.Js, 12);
        Assert.Equal(0.55 + 0.72 * bd.Fc, f.Jc, 12);
        double cp = 2300, k = 0.125, mu = 1.5e-3;
        var pr = cp * mu / k;
        var expected = f.IdealJ * cp * 15 / bd.CrossFlowArea * Math.Pow(pr, -2.0 / 3) * f.Jc;
        Assert.Equal(expected, bd.Film(15, mu, cp, k), expected * 1e-7);
    }

    // Common practice: on a typical bundle (TEMA clearances, 25 % cut) Bell–Delaware's film is below Kern's ideal-stream
    // estimate (leakage and bypass take 20–40 % of the flow; Kern's constant already averages a real bundle), and the
    // pressure drop falls with leakage and bypass (R_l, R_b < 1) yet grows with flow about as ṁ^1.8 to ṁ^2.
    [Fact]
    public void On_a_typical_bundle_the_factors_and_the_drop_behave_as_published()
    {
        var g = Bundle with { Baffles = new BaffleDetails() };
        var bd = g.BellDelaware!;
        var f = bd.Factors(15, 1.5e-3);
        Assert.InRange(f.Jl, 0.6, 0.9);
        Assert.InRange(f.Jb, 0.7, 0.95);
        Assert.InRange(f.Jc, 0.95, 1.15);
        var low = bd.PressureDrop(15, 1.5e-3, 850);
        var high = bd.PressureDrop(30, 1.5e-3, 850);
        Assert.InRange(Math.Log(high / low) / Math.Log(2), 1.7, 2.0);
        Assert.Throws<QuantityOutOfRangeException>(() => new BellDelawareShell(Bundle, new BaffleDetails(0.6)));
    }

    // Source: Martin's chevron-plate correlation (Chem. Eng. Process. 35 (1996) 301, 1999 constants) as evaluated by an
    // independent open-source implementation (the `ht` library's documented example Nu_plate_Martin(Re=2000, Pr=.7,
    // chevron_angle=45) = 30.427601053757).
    [Fact]
    public void Martin_chevron_plate_matches_the_published_example()
    {
        Assert.Equal(30.427601053757, FilmCorrelations.MartinPlate(2000, 0.7, 45), 6);
        Assert.Throws<QuantityOutOfRangeException>(() => FilmCorrelations.MartinPlate(50, 0.7, 45));
        Assert.Throws<QuantityOutOfRangeException>(() => FilmCorrelations.MartinPlate(2000, 0.7, 85));
    }

    // Analytic (Sieder & Tate 1936): (μ/μ_w)^0.14 is 2^0.14 = 1.101905 for a wall viscosity half the bulk's; with both
    // streams at one temperature there is no correction; a liquid heated in the tubes (wall hotter, thinner) gains.
    [Fact]
    public void The_viscosity_ratio_correction_follows_the_wall_temperature()
    {
        Assert.Equal(1.101905, FilmCorrelations.ViscosityRatioFactor(2e-3, 1e-3), 6);
        var oil = new ThinningFluid(4e-3, 0.13, 2100);
        var p = new Pressure(5e5);
        var t = Temperature.FromKelvin(330);
        var hi = Bundle.TubeFilm(20, oil, t, p, out _);
        var ho = Bundle.ShellFilm(15, oil, t, p, out _);
        Assert.Equal(Bundle.CleanU(hi, ho), Bundle.CleanU(20, oil, t, p, 15, oil, t, p), 9);
        var heated = Bundle.CleanU(20, oil, t, p, 15, oil, Temperature.FromKelvin(400), p);
        var hiHot = Bundle.TubeFilm(20, oil, t, p, out _);
        var hoHot = Bundle.ShellFilm(15, oil, Temperature.FromKelvin(400), p, out _);
        Assert.True(heated > Bundle.CleanU(hiHot, hoHot) * 0.999, "the tube film of a heated liquid must not fall");
    }
}

public class PlateGeometryTests
{
    // An invented pack: 101 plates 0.5 × 0.7 m, gap 3 mm, 60° chevrons, Φ 1.17, 0.6 mm stainless (16 W/mK).
    private static readonly PlateGeometry Pack = new(101, 0.5, 0.7, 0.003, 60, 1.17, 0.0006, 16);

    // Hand evaluation of the pack's definitions (Martin 1996): d_h = 2b/Φ = 5.1282 mm; surface (N − 2)·w·L·Φ =
    // 99·0.5·0.7·1.17 = 40.5405 m²; 100 channels, 50 a side; at 20 kg/s of μ 0.8 mPa·s, G = 20/(50·0.003·0.5) = 266.67
    // kg/m²s and Re = G·d_h/μ = 1709.4; the film is Martin's Nu (checked against the published example) times k/d_h.
    [Fact]
    public void The_pack_gives_Martins_film_on_its_hydraulic_diameter()
    {
        Assert.Equal(5.1282e-3, Pack.HydraulicDiameter, 7);
        Assert.Equal(40.5405, Pack.Area, 4);
        Assert.Equal(50, Pack.TubeSideChannels);
        Assert.Equal(50, Pack.ShellSideChannels);
        var water = new FixedFluid(8e-4, 0.615, 4180);
        var h = Pack.Film(20, 50, water, Temperature.FromCelsius(40), new Pressure(3e5), out var re);
        Assert.Equal(1709.4, re, 1);
        var pr = 4180 * 8e-4 / 0.615;
        Assert.Equal(FilmCorrelations.MartinPlate(re, pr, 60) * 0.615 / Pack.HydraulicDiameter, h, 9);
        // with one fixed viscosity the wall correction is 1: U is the series sum of the two films and the plate
        var u = Pack.CleanU(20, water, Temperature.FromCelsius(40), new Pressure(3e5), 20, water, Temperature.FromCelsius(60), new Pressure(3e5));
        Assert.Equal(1 / (2 / h + 0.0006 / 16), u, 6);
    }
}
