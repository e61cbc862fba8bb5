using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

public enum TubeLayout { Triangular, Square, RotatedSquare }

/// <summary>TEMA-style geometry of a segmentally baffled shell-and-tube exchanger (SI: m, W/(m·K)).</summary>
/// <param name="TubeLength">Effective length of one tube (one pass).</param>
/// <param name="TubeCount">Tubes in the shell (each of the passes holds TubeCount / TubePasses).</param>
/// <param name="TubePitch">Centre-to-centre distance of neighbouring tubes.</param>
/// <param name="BaffleSpacing">Central baffle spacing.</param>
/// <param name="WallConductivity">Thermal conductivity of the tube material.</param>
public sealed record ShellAndTubeGeometry(double ShellDiameter, double TubeOuterDiameter, double TubeInnerDiameter, double TubeLength,
    int TubeCount, double TubePitch, TubeLayout Layout, int TubePasses, double BaffleSpacing, double WallConductivity)
{
    /// <summary>Heat-transfer surface on the outside of the tubes, N·π·Do·L.</summary>
    public double OutsideArea => TubeCount * Math.PI * TubeOuterDiameter * TubeLength;

    /// <summary>Flow area of one tube pass.</summary>
    public double TubeFlowArea => (double)TubeCount / TubePasses * Math.PI * TubeInnerDiameter * TubeInnerDiameter / 4;

    /// <summary>Kern's cross-flow area at the shell's centre line, Ds·(Pt − Do)·B/Pt.</summary>
    public double ShellCrossFlowArea => ShellDiameter * (TubePitch - TubeOuterDiameter) * BaffleSpacing / TubePitch;

    /// <summary>Kern's equivalent diameter: 4·(free area of a pitch cell)/(wetted perimeter in it); square and rotated
    /// square 4(Pt² − πDo²/4)/(πDo), triangular 4(√3/4·Pt² − πDo²/8)/(πDo/2).</summary>
    public double EquivalentDiameter => Layout == TubeLayout.Triangular
        ? 4 * (Math.Sqrt(3) / 4 * TubePitch * TubePitch - Math.PI * TubeOuterDiameter * TubeOuterDiameter / 8) / (Math.PI * TubeOuterDiameter / 2)
        : 4 * (TubePitch * TubePitch - Math.PI * TubeOuterDiameter * TubeOuterDiameter / 4) / (Math.PI * TubeOuterDiameter);

    /// <summary>Conduction through the tube wall referred to the outside surface, Do·ln(Do/Di)/(2·k_w).</summary>
    public double WallResistance => TubeOuterDiameter * Math.Log(TubeOuterDiameter / TubeInnerDiameter) / (2 * WallConductivity);

    /// <summary>Tubes a shell of this diameter can hold, CTP·(π/4)·Ds²/(CL·Pt²): CL = 0.866 for a triangular layout and 1
    /// for square ones, CTP = 0.93, 0.90 and 0.85 for one, two and more tube passes (Taborek's tube-count estimate; from
    /// memory).</summary>
    public double TubeCapacity
    {
        get
        {
            var cl = Layout == TubeLayout.Triangular ? 0.866 : 1.0;
            var ctp = TubePasses == 1 ? 0.93 : TubePasses == 2 ? 0.90 : 0.85;
            return ctp * Math.PI / 4 * ShellDiameter * ShellDiameter / (cl * TubePitch * TubePitch);
        }
    }

    /// <summary>Tube-side film (W/(m²·K), on the inside surface) at a mass flow (kg/s) and the fluid's state.</summary>
    public double TubeFilm(double massFlow, ITransportFluid fluid, Temperature bulk, Pressure pressure, out double reynolds)
    {
        var (mu, k, pr) = Transport(fluid, bulk, pressure);
        reynolds = massFlow / TubeFlowArea * TubeInnerDiameter / mu;
        return FilmCorrelations.TubeSide(reynolds, pr, TubeInnerDiameter / TubeLength) * k / TubeInnerDiameter;
    }

    /// <summary>Baffle cut and clearances: when given, the shell side is rated by Bell–Delaware instead of Kern.</summary>
    public BaffleDetails? Baffles { get; init; }

    private static readonly System.Runtime.CompilerServices.ConditionalWeakTable<ShellAndTubeGeometry, BellDelawareShell> Shells = new();

    /// <summary>The Bell–Delaware shell of this bundle (null when <see cref="Baffles"/> is not given); built once per
    /// record instance (a copy made with other dimensions is another instance and gets its own).</summary>
    public BellDelawareShell? BellDelaware => Baffles is null ? null : Shells.GetValue(this, g => new BellDelawareShell(g, g.Baffles!));

    /// <summary>Shell-side film (W/(m²·K)) at a mass flow (kg/s) and the fluid's state: Bell–Delaware when the baffle
    /// details are given, else Kern.</summary>
    public double ShellFilm(double massFlow, ITransportFluid fluid, Temperature bulk, Pressure pressure, out double reynolds)
    {
        var (mu, k, pr) = Transport(fluid, bulk, pressure);
        if (BellDelaware is { } bd)
        {
            reynolds = bd.Reynolds(massFlow, mu);
            return bd.Film(massFlow, mu, fluid.SpecificHeat(bulk, pressure), k);
        }
        reynolds = massFlow / ShellCrossFlowArea * EquivalentDiameter / mu;
        return FilmCorrelations.Kern(reynolds, pr) * k / EquivalentDiameter;
    }

    /// <summary>
    /// Clean U (outside surface) at both streams' flows and bulk states, each film corrected by Sieder and Tate's
    /// (μ/μ_w)^0.14 at its wall temperature. The wall temperatures come from the uncorrected films: the temperature
    /// difference between the streams divides over the resistances in series (one pass, common practice). A wall
    /// temperature outside a fluid's model leaves that side uncorrected.
    /// </summary>
    public double CleanU(double tubeFlow, ITransportFluid tubeFluid, Temperature tubeBulk, Pressure tubePressure,
        double shellFlow, ITransportFluid shellFluid, Temperature shellBulk, Pressure shellPressure)
    {
        var hi = TubeFilm(tubeFlow, tubeFluid, tubeBulk, tubePressure, out _);
        var ho = ShellFilm(shellFlow, shellFluid, shellBulk, shellPressure, out _);
        var ri = TubeOuterDiameter / TubeInnerDiameter / hi;
        var ro = 1 / ho;
        var total = ri + WallResistance + ro;
        var difference = shellBulk.Kelvin - tubeBulk.Kelvin;
        var tubeWall = Temperature.FromKelvin(tubeBulk.Kelvin + difference * ri / total);
        var shellWall = Temperature.FromKelvin(shellBulk.Kelvin - difference * ro / total);
        hi *= WallFactor(tubeFluid, tubeBulk, tubeWall, tubePressure);
        ho *= WallFactor(shellFluid, shellBulk, shellWall, shellPressure);
        return CleanU(hi, ho);
    }

    private static double WallFactor(ITransportFluid fluid, Temperature bulk, Temperature wall, Pressure pressure)
    {
        try { return FilmCorrelations.ViscosityRatioFactor(fluid.Viscosity(bulk, pressure), fluid.Viscosity(wall, pressure)); }
        catch (QuantityOutOfRangeException) { return 1; }
    }

    /// <summary>
    /// Clean tube-side pressure drop (Pa) at a mass flow (kg/s): friction in the tubes by Darcy–Weisbach, f = 64/Re when
    /// laminar and Petukhov's smooth-tube f from Re 3000 (linear between), plus four velocity heads per pass for the
    /// return (Kern's rule, common practice): ΔP = (f·N_p·L/Di + 4·N_p)·ρ·v²/2.
    /// </summary>
    public double TubePressureDrop(double massFlow, ITransportFluid fluid, Temperature bulk, Pressure pressure)
    {
        var rho = fluid.Density(bulk, pressure) ?? throw new QuantityOutOfRangeException("density of " + fluid.Description, double.NaN, "kg/m3", "a fluid model that knows its density");
        var mu = fluid.Viscosity(bulk, pressure);
        var g = massFlow / TubeFlowArea;
        var re = g * TubeInnerDiameter / mu;
        var f = re <= 2300 ? 64 / re : re >= 3000 ? FilmCorrelations.PetukhovFriction(re)
            : 64 / 2300.0 + (re - 2300) / 700 * (FilmCorrelations.PetukhovFriction(3000) - 64 / 2300.0);
        var head = g * g / (2 * rho);
        return (f * TubePasses * TubeLength / TubeInnerDiameter + 4 * TubePasses) * head;
    }

    /// <summary>Clean U referred to the outside surface: 1/U = 1/h_o + R_wall + (Do/Di)/h_i.</summary>
    public double CleanU(double hTube, double hShell) =>
        1 / (1 / hShell + WallResistance + TubeOuterDiameter / TubeInnerDiameter / hTube);

    private static (double Mu, double K, double Pr) Transport(ITransportFluid fluid, Temperature t, Pressure p)
    {
        var mu = fluid.Viscosity(t, p);
        var k = fluid.ThermalConductivity(t, p);
        return (mu, k, fluid.SpecificHeat(t, p) * mu / k);
    }
}
