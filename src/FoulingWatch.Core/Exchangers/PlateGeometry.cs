using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>
/// A gasketed or brazed chevron-plate exchanger, one pass per side (SI: m, degrees, W/(m·K)). The N plates form N − 1
/// channels, alternately one stream's and the other's: the "tube" side takes ⌊(N − 1)/2⌋ channels, the "shell" side
/// the rest (the names the configuration uses for a plate's two channels).
/// </summary>
/// <param name="PlateWidth">Channel width inside the gasket.</param>
/// <param name="PlateLength">Effective length between the port centres.</param>
/// <param name="ChannelGap">Mean channel gap (the pressing depth), b.</param>
/// <param name="ChevronAngle">Corrugation angle to the main flow direction, 0–80° (Martin's convention).</param>
/// <param name="EnlargementFactor">Developed over projected area of the corrugated plate, Φ (typically 1.1–1.25).</param>
public sealed record PlateGeometry(int PlateCount, double PlateWidth, double PlateLength, double ChannelGap, double ChevronAngle,
    double EnlargementFactor, double PlateThickness, double WallConductivity)
{
    /// <summary>Hydraulic diameter of a channel, 2b/Φ (Martin 1996).</summary>
    public double HydraulicDiameter => 2 * ChannelGap / EnlargementFactor;

    /// <summary>Heat-transfer surface of the N − 2 thermal plates, (N − 2)·w·L·Φ.</summary>
    public double Area => (PlateCount - 2) * PlateWidth * PlateLength * EnlargementFactor;

    public int TubeSideChannels => (PlateCount - 1) / 2;

    public int ShellSideChannels => PlateCount - 1 - TubeSideChannels;

    /// <summary>Conduction through the plate, t/k_w.</summary>
    public double WallResistance => PlateThickness / WallConductivity;

    /// <summary>Film coefficient (W/(m²·K)) of one side at a mass flow (kg/s) spread over its channels, by Martin's
    /// correlation (<see cref="FilmCorrelations.MartinPlate"/>) on the hydraulic diameter, G = ṁ/(n·b·w).</summary>
    public double Film(double massFlow, int channels, ITransportFluid fluid, Temperature bulk, Pressure pressure, out double reynolds,
        double viscosityRatio = 1)
    {
        var mu = fluid.Viscosity(bulk, pressure);
        var k = fluid.ThermalConductivity(bulk, pressure);
        var pr = fluid.SpecificHeat(bulk, pressure) * mu / k;
        reynolds = massFlow / (channels * ChannelGap * PlateWidth) * HydraulicDiameter / mu;
        return FilmCorrelations.MartinPlate(reynolds, pr, ChevronAngle, viscosityRatio) * k / HydraulicDiameter;
    }

    /// <summary>Clean U at both sides' flows and bulk states, 1/U = 1/h_t + t/k_w + 1/h_s, each film with Martin's wall
    /// correction (μ/μ_w)^(1/6) at the wall temperature the uncorrected films put it (as for the shell-and-tube bundle).</summary>
    public double CleanU(double tubeFlow, ITransportFluid tubeFluid, Temperature tubeBulk, Pressure tubePressure,
        double shellFlow, ITransportFluid shellFluid, Temperature shellBulk, Pressure shellPressure)
    {
        var ht = Film(tubeFlow, TubeSideChannels, tubeFluid, tubeBulk, tubePressure, out _);
        var hs = Film(shellFlow, ShellSideChannels, shellFluid, shellBulk, shellPressure, out _);
        var total = 1 / ht + WallResistance + 1 / hs;
        var difference = shellBulk.Kelvin - tubeBulk.Kelvin;
        var tubeWall = Temperature.FromKelvin(tubeBulk.Kelvin + difference / ht / total);
        var shellWall = Temperature.FromKelvin(shellBulk.Kelvin - difference / hs / total);
        ht = Film(tubeFlow, TubeSideChannels, tubeFluid, tubeBulk, tubePressure, out _, Ratio(tubeFluid, tubeBulk, tubeWall, tubePressure));
        hs = Film(shellFlow, ShellSideChannels, shellFluid, shellBulk, shellPressure, out _, Ratio(shellFluid, shellBulk, shellWall, shellPressure));
        return 1 / (1 / ht + WallResistance + 1 / hs);
    }

    private static double Ratio(ITransportFluid fluid, Temperature bulk, Temperature wall, Pressure pressure)
    {
        try { return fluid.Viscosity(bulk, pressure) / fluid.Viscosity(wall, pressure); }
        catch (QuantityOutOfRangeException) { return 1; }
    }
}
