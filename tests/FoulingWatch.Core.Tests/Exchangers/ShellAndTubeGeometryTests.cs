using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Tests.Exchangers;

/// <summary>A fluid with fixed transport properties, so that the geometry and the correlations are checked alone.</summary>
internal sealed class FixedFluid(double mu, double k, double cp, double? rho = null) : ITransportFluid
{
    public double? Density(Temperature temperature, Pressure pressure) => rho;
    public string Description => "fixed properties";
    public TemperatureRange Validity => new(200, 800);
    public double SpecificEnthalpy(Temperature temperature, Pressure pressure) => cp * temperature.Kelvin;
    public double SpecificHeat(Temperature temperature, Pressure pressure) => cp;
    public double Viscosity(Temperature temperature, Pressure pressure) => mu;
    public double ThermalConductivity(Temperature temperature, Pressure pressure) => k;
}

public class ShellAndTubeGeometryTests
{
    // An invented bundle: 19.25 in shell (0.489 m), 300 tubes 3/4 in (19.05 mm OD, 15.75 mm ID), 4.877 m, triangular
    // pitch 15/16 in (23.81 mm), two passes, baffles 0.3 m apart, carbon steel 50 W/mK.
    private static readonly ShellAndTubeGeometry Bundle = new(0.489, 0.01905, 0.01575, 4.877, 300, 0.02381, TubeLayout.Triangular, 2, 0.3, 50);

    // Hand evaluation of the published relations (Kern 1950 for the shell side; Gnielinski 1976 with Petukhov's friction
    // for the tubes; series resistances referred to the outside surface):
    // A_t = 150·π·0.01575²/4 = 0.029224 m², A_s = 0.489·(0.02381 − 0.01905)·0.3/0.02381 = 0.029328 m²,
    // D_e = 4(√3/4·Pt² − π·Do²/8)/(π·Do/2) = 0.013764 m, R_w = Do·ln(Do/Di)/(2·50) = 3.6238e-5 m²K/W;
    // tubes 20 kg/s of μ 0.8 mPa·s, k 0.615, cp 4180: Re 13473, Pr 5.4374, Nu 94.582, h_i = 3693.2 W/m²K;
    // shell 15 kg/s of μ 1.5 mPa·s, k 0.125, cp 2300: Re 4693.3, Pr 27.6, Nu 113.74, h_o = 1032.9 W/m²K;
    // U = 1/(1/1032.9 + 3.6238e-5 + (19.05/15.75)/3693.2) = 750.83 W/m²K.
    [Fact]
    public void Clean_U_from_the_geometry_matches_a_hand_evaluation_of_Kern_and_Gnielinski()
    {
        Assert.Equal(0.029224, Bundle.TubeFlowArea, 6);
        Assert.Equal(0.029328, Bundle.ShellCrossFlowArea, 6);
        Assert.Equal(0.013764, Bundle.EquivalentDiameter, 6);
        Assert.Equal(3.6238e-5, Bundle.WallResistance, 9);
        var t = Temperature.FromCelsius(60);
        var p = new Pressure(3e5);
        var hi = Bundle.TubeFilm(20, new FixedFluid(8e-4, 0.615, 4180), t, p, out var ret);
        var ho = Bundle.ShellFilm(15, new FixedFluid(1.5e-3, 0.125, 2300), t, p, out var res);
        Assert.Equal(13473, ret, 0);
        Assert.Equal(4693.3, res, 1);
        Assert.Equal(3693.2, hi, 1);
        Assert.Equal(1032.9, ho, 1);
        Assert.Equal(750.83, Bundle.CleanU(hi, ho), 2);
    }

    // Tube count against the shell: CTP·(π/4)·Ds²/(CL·Pt²) = 0.90·0.18781/(0.866·5.6692e-4) = 344 tubes (hand evaluation);
    // the surface N·π·Do·L = 87.56 m².
    [Fact]
    public void Tube_capacity_and_surface_follow_the_bundle()
    {
        Assert.Equal(344.3, Bundle.TubeCapacity, 1);
        Assert.Equal(87.563, Bundle.OutsideArea, 3);
    }

    // Darcy–Weisbach with Petukhov's friction and four velocity heads per pass for the returns (Kern's rule), by hand:
    // G = 20/0.029224 = 684.36 kg/m²s, Re = 13473, f = 0.029005, ρv²/2 = G²/(2·995) = 235.35 Pa,
    // ΔP = (0.029005·2·4.877/0.01575 + 4·2)·235.35 = 6110.5 Pa.
    [Fact]
    public void Clean_tube_side_pressure_drop_matches_a_hand_evaluation()
    {
        var dp = Bundle.TubePressureDrop(20, new FixedFluid(8e-4, 0.615, 4180, 995), Temperature.FromCelsius(40), new Pressure(3e5));
        Assert.Equal(6110.5, dp, 1);
        Assert.Throws<QuantityOutOfRangeException>(() => Bundle.TubePressureDrop(20, new FixedFluid(8e-4, 0.615, 4180), Temperature.FromCelsius(40), new Pressure(3e5)));
    }
}
