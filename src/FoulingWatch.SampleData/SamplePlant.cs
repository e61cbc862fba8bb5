using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;

namespace FoulingWatch.SampleData;

/// <summary>How an invented exchanger of the Kestrel Bay sample plant behaves: true physics, fouling law and artefacts.</summary>
/// <remarks>With <c>TubeWaterDesignBulkC</c> the tube-side water film also follows the water's viscosity, conductivity
/// and cp at its bulk temperature (Dittus–Boelter form), as a real cooling-water film does through the seasons. With
/// <c>TubePressureDropBar</c> a differential-pressure tag across the tube side is written: that drop at design flow in a
/// clean bundle, growing as the deposit (thickness Rf·0.2 W/mK on 15.75 mm tubes) narrows the bore, ΔP ∝ ṁ^1.8·D^−4.75.
/// With <c>Geometry</c> the clean U is the bundle's own (Gnielinski in the tubes, Bell–Delaware or Kern on the shell,
/// Sieder–Tate wall correction, both fluids' transport properties at their bulk temperatures) and <c>CleanU</c> is only a label.</remarks>
public sealed record SampleExchanger(
    string Id,
    string TagPrefix,
    FlowArrangement Arrangement,
    double Area,
    IFluidModel Hot,
    IFluidModel Cold,
    bool HotOnTube,
    double DesignHotFlow,
    double DesignColdFlow,
    double CleanU,
    double HotInletC,
    double ColdInletC,
    Func<double, double> FoulingAfterDays,
    DateTimeOffset[] Cleanings,
    double HotFlowPeriodDays,
    double ColdFlowPeriodDays,
    double PressureHot,
    double PressureCold,
    Func<DateTimeOffset, double>? ColdOutletDrift = null,
    double? TubeWaterDesignBulkC = null,
    double? TubePressureDropBar = null,
    ShellAndTubeGeometry? Geometry = null);

/// <summary>The invented site: a crude preheat train, a cooling-water cooler, a plate exchanger and a steam heater.</summary>
public static class SamplePlant
{
    public static readonly DateTimeOffset Start = new(2025, 12, 1, 0, 0, 0, TimeSpan.Zero);
    public static readonly DateTimeOffset End = new(2026, 12, 1, 0, 0, 0, TimeSpan.Zero);
    public static readonly TimeSpan Step = TimeSpan.FromMinutes(10);
    private const double Tph = 1000.0 / 3600.0;

    /// <summary>A petroleum liquid from an assay: API gravity, Watson K and kinematic viscosities (cSt) at 40 and 100 °C.</summary>
    private static PetroleumLiquidTransport Assay(double api, double watsonK, double cSt40, double cSt100)
    {
        var liquid = KeslerLeePetroleumLiquid.FromApiGravity(api, watsonK);
        return new PetroleumLiquidTransport(liquid, liquid.SpecificGravity, new WaltherViscosity(313.15, cSt40 * 1e-6, 373.15, cSt100 * 1e-6));
    }

    public static IReadOnlyList<SampleExchanger> Area1 { get; } =
    [
        new("E-101", "101", new OneShellPassEvenTubePasses(4), 180, Assay(45, 11.8, 1.6, 0.85), Assay(32, 11.9, 9, 2.6),
            false, 60 * Tph, 110 * Tph, 447, 200, 60,
            d => 8e-4 * (1 - Math.Exp(-d / 150.0)), [new(2025, 11, 20, 0, 0, 0, TimeSpan.Zero)], 11, 17, 8e5, 15e5,
            Geometry: new ShellAndTubeGeometry(0.635, 0.01905, 0.01575, 6.096, 493, 0.02381, TubeLayout.Triangular, 4, 0.4, 50)
                { Baffles = new BaffleDetails(0.25, SealingStripPairs: 2) }),
        new("E-102", "102", new ShellsInSeries(2), 300, KeslerLeePetroleumLiquid.FromApiGravity(35, 11.7), KeslerLeePetroleumLiquid.FromApiGravity(32, 11.9),
            false, 80 * Tph, 110 * Tph, 380, 260, 105,
            d => 5e-5 + 4e-6 * d, [new(2025, 10, 1, 0, 0, 0, TimeSpan.Zero), new(2026, 5, 14, 0, 0, 0, TimeSpan.Zero)], 13, 17, 8e5, 15e5,
            TubePressureDropBar: 0.8),
        new("E-103", "103", new OneShellPassEvenTubePasses(4), 220, KeslerLeePetroleumLiquid.FromApiGravity(15, 11.5), KeslerLeePetroleumLiquid.FromApiGravity(32, 11.9),
            false, 70 * Tph, 110 * Tph, 300, 330, 180,
            d => 2.9e-5 * Math.Pow(d, 0.6), [new(2025, 11, 25, 0, 0, 0, TimeSpan.Zero), new(2026, 8, 3, 0, 0, 0, TimeSpan.Zero)], 9, 17, 8e5, 15e5),
    ];

    public static IReadOnlyList<SampleExchanger> Utilities { get; } =
    [
        new("C-201", "201", new OneShellPassEvenTubePasses(2), 140, KeslerLeePetroleumLiquid.FromApiGravity(60, 12.2), new IapwsWater(),
            false, 50 * Tph, 150 * Tph, 650, 95, 24,
            d => 2e-5 + 1.5e-6 * d, [new(2025, 11, 1, 0, 0, 0, TimeSpan.Zero)], 7, 23, 6e5, 5e5,
            t => t < new DateTimeOffset(2026, 9, 1, 0, 0, 0, TimeSpan.Zero) ? 0 : 0.035 * (t - new DateTimeOffset(2026, 9, 1, 0, 0, 0, TimeSpan.Zero)).TotalDays,
            TubeWaterDesignBulkC: 27),
        new("P-301", "301", new PlateAsCounterflow(), 95, new ConstantSpecificHeat(3600, new TemperatureRange(250, 400), "glycol solution"),
            new ConstantSpecificHeat(3600, new TemperatureRange(250, 400), "glycol solution"),
            true, 40 * Tph, 40 * Tph, 2400, 85, 35,
            d => 1e-5 + 4e-7 * d, [new(2025, 9, 1, 0, 0, 0, TimeSpan.Zero)], 5, 8, 4e5, 4e5),
        new("E-401", "401", new OneShellPassEvenTubePasses(2), 60, new SteamPhaseChange(new Pressure(11.01325e5), PhaseChangeDirection.Condensing), new IapwsWater(),
            false, 4 * Tph, 70 * Tph, 1800, 0, 30,
            _ => 2e-5, [new(2025, 6, 1, 0, 0, 0, TimeSpan.Zero)], 6, 10, 11.01325e5, 7e5),
    ];
}
