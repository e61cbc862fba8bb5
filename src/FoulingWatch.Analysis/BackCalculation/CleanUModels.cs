using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.Core.Uncertainty;
using FoulingWatch.Ingest.Configuration;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Clean overall U (W/(m²·K)) of an exchanger at given tube- and shell-side mass flows (kg/s).</summary>
public interface ICleanUModel
{
    /// <summary>Clean U at these flows and, where the model scales films with fluid properties, these bulk temperatures
    /// (K; NaN: at the design temperatures).</summary>
    double CleanU(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN);
    string Description { get; }

    /// <summary>Standard uncertainty of 1/U_clean (m²·K/W) at these flows: a systematic error, whole for the cycle.</summary>
    double InverseSigma(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN);
}

/// <summary>How a forced-convection film coefficient moves with the fluid's properties at a fixed mass flow.</summary>
/// <remarks>
/// From Nu = C·Reⁿ·Pr^0.4 (Dittus–Boelter, heating; the same exponent form as the flow scaling):
/// h = (k/D)·C·(ṁD/(Aμ))ⁿ·(cₚμ/k)^0.4, so at a given flow 1/h ∝ μ^(n−0.4)·cₚ^(−0.4)·k^(−0.6). The factor returned is
/// that product at the bulk temperature over its value at the design bulk temperature (analytic consequence of the
/// correlation; exponent 0.4 for heating the fluid, from memory 0.3 for cooling, a difference under 1 % of 1/h over a
/// 10 K swing, left out).
/// </remarks>
public sealed class FilmPropertyScaling
{
    private readonly ITransportFluid _fluid;
    private readonly double _pressure, _exponent, _design;

    public FilmPropertyScaling(ITransportFluid fluid, double pressure, double designBulk, double flowExponent)
    {
        (_fluid, _pressure, _exponent, DesignBulk) = (fluid, pressure, flowExponent, designBulk);
        _design = Group(designBulk);
    }

    public double DesignBulk { get; }

    private double Group(double bulk)
    {
        var t = Temperature.FromKelvin(bulk);
        var p = new Pressure(_pressure);
        return Math.Pow(_fluid.Viscosity(t, p), _exponent - 0.4) * Math.Pow(_fluid.SpecificHeat(t, p), -0.4)
               * Math.Pow(_fluid.ThermalConductivity(t, p), -0.6);
    }

    /// <summary>(1/h at the bulk temperature) / (1/h at the design bulk temperature), same mass flow; 1 when the bulk
    /// temperature is not known or outside the property models.</summary>
    public double InverseFactor(double bulk)
    {
        if (!double.IsFinite(bulk)) return 1;
        // The uncertainty probes of one sample move one measurement at a time, so most of them ask again for the bulk
        // temperature asked last on this thread: the last answer is kept per thread (a pure function, same values).
        var last = _last.Value!;
        if (last[0].Equals(bulk)) return last[1];
        double factor;
        try { factor = Group(bulk) / _design; }
        catch (PropertyRangeException) { factor = 1; }
        (last[0], last[1]) = (bulk, factor);
        return factor;
    }

    private readonly ThreadLocal<double[]> _last = new(() => [double.NaN, double.NaN]);
}

/// <summary>
/// Clean U from the datasheet: the clean film resistance (1/U − wall) is split between the sides and each side
/// is scaled as 1/h ∝ ṁ⁻ⁿ from its design flow: 1/U(ṁ_t, ṁ_s) = R_t·(ṁ_t,d/ṁ_t)^n_t + R_s·(ṁ_s,d/ṁ_s)^n_s + R_wall.
/// </summary>
/// <remarks>
/// Tube side n = 0.8 by Dittus–Boelter (Nu ∝ Re^0.8); shell side n = 0.6 (common practice for cross-flow over
/// tube banks, Nu ∝ Re^0.6). A condensing or evaporating side is taken as flow-independent (n = 0, common practice:
/// condensing film coefficients vary only weakly with condensate load). Default split 50/50 when the datasheet
/// gives no film coefficients.
/// </remarks>
public sealed class DatasheetCleanU : ICleanUModel
{
    private readonly DatasheetCleanReference _r;
    private readonly double _rTube, _rShell, _nTube, _nShell;

    private readonly FilmPropertyScaling? _tubeScaling, _shellScaling;

    public DatasheetCleanU(DatasheetCleanReference reference, bool tubePhaseChange, bool shellPhaseChange,
        FilmPropertyScaling? tubeScaling = null, FilmPropertyScaling? shellScaling = null)
    {
        (_tubeScaling, _shellScaling) = (tubeScaling, shellScaling);
        _r = reference;
        var film = 1 / reference.CleanU - reference.WallResistance;
        _rTube = reference.TubeShare * film;
        _rShell = (1 - reference.TubeShare) * film;
        _nTube = tubePhaseChange ? 0 : reference.TubeExponent;
        _nShell = shellPhaseChange ? 0 : reference.ShellExponent;
        Description = string.Create(System.Globalization.CultureInfo.InvariantCulture,
            $"datasheet: U = {reference.CleanU:0.#} W/m2K ± {reference.RelativeUncertainty:P0} at design flows, tube share " +
            $"{reference.TubeShare:P0} with n = {_nTube:0.##}, shell n = {_nShell:0.##}, wall {reference.WallResistance:G3} m2K/W") +
            (tubeScaling is null ? "" : FormattableString.Invariant($"; tube film scaled with fluid properties from {tubeScaling.DesignBulk - 273.15:0.#} °C")) +
            (shellScaling is null ? "" : FormattableString.Invariant($"; shell film scaled with fluid properties from {shellScaling.DesignBulk - 273.15:0.#} °C"));
    }

    public string Description { get; }

    /// <summary>Standard uncertainty assumed for a configured tube share (absolute, 0.10) and for each film's flow exponent
    /// (0.05): neither is printed on a datasheet, and both move the clean U only away from design flows (common practice,
    /// from memory: Dittus–Boelter's 0.8 and the shell side's 0.6 are each quoted within about ±0.05).</summary>
    public const double ShareUncertainty = 0.10, ExponentUncertainty = 0.05;

    /// <summary>u(1/U_c) by first-order propagation (GUM 5.1.2) of the datasheet U (its relative uncertainty), the tube
    /// share and the two flow exponents (a phase-change side keeps n = 0).</summary>
    public double InverseSigma(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN)
    {
        double[] x = [_r.CleanU, _r.TubeShare, _nTube, _nShell];
        double[] u = [_r.RelativeUncertainty * _r.CleanU, ShareUncertainty, _nTube > 0 ? ExponentUncertainty : 0, _nShell > 0 ? ExponentUncertainty : 0];
        var (ft, fs) = Factors(tubeBulk, shellBulk);
        return FirstOrderPropagation.StandardUncertainty(v => Inverse(v[0], v[1], v[2], v[3], tubeFlow, shellFlow, ft, fs), x, u);
    }

    private (double Tube, double Shell) Factors(double tubeBulk, double shellBulk) =>
        (_tubeScaling?.InverseFactor(tubeBulk) ?? 1, _shellScaling?.InverseFactor(shellBulk) ?? 1);

    private double Inverse(double u, double share, double nTube, double nShell, double tubeFlow, double shellFlow, double ft, double fs)
    {
        var film = 1 / u - _r.WallResistance;
        return share * film * Math.Pow(_r.DesignTubeFlow / tubeFlow, nTube) * ft
               + (1 - share) * film * Math.Pow(_r.DesignShellFlow / shellFlow, nShell) * fs + _r.WallResistance;
    }

    public double CleanU(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN)
    {
        var (ft, fs) = Factors(tubeBulk, shellBulk);
        return 1 / (_rTube * Math.Pow(_r.DesignTubeFlow / tubeFlow, _nTube) * ft
                    + _rShell * Math.Pow(_r.DesignShellFlow / shellFlow, _nShell) * fs + _r.WallResistance);
    }
}

/// <summary>Clean U from a Wilson-plot fit: 1/U = a + b·ṁ_t^−n_t + c·ṁ_s^−n_s (b or c may be zero when a side did not vary).</summary>
/// <param name="covariance">Covariance of (a, b, c) from the fit (zeros for a side not fitted), or null for none.</param>
/// <param name="scalings">With a property-corrected baseline, each side's film term times its fluid's property factor at
/// the bulk temperature (<see cref="FilmPropertyScaling.InverseFactor"/>); null sides are not corrected.</param>
public sealed class WilsonPlotCleanU(double a, double b, double c, double nTube, double nShell, string description,
    double[,]? covariance = null, (FilmPropertyScaling? Tube, FilmPropertyScaling? Shell) scalings = default) : ICleanUModel
{
    public double A { get; } = a;
    public double B { get; } = b;
    public double C { get; } = c;
    public string Description { get; } = description;

    private double TubeTerm(double flow, double bulk) => Math.Pow(flow, -nTube) * (scalings.Tube?.InverseFactor(bulk) ?? 1);
    private double ShellTerm(double flow, double bulk) => Math.Pow(flow, -nShell) * (scalings.Shell?.InverseFactor(bulk) ?? 1);

    public double CleanU(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN) =>
        1 / (A + B * TubeTerm(tubeFlow, tubeBulk) + C * ShellTerm(shellFlow, shellBulk));

    /// <summary>u(1/U_c) = √(gᵀ·Cov·g) with g = (1, ṁ_t^−n_t, ṁ_s^−n_s) (times the property factors when corrected): the
    /// fit's parameter covariance at these flows.</summary>
    public double InverseSigma(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN)
    {
        if (covariance is null) return 0;
        Span<double> g = [1, TubeTerm(tubeFlow, tubeBulk), ShellTerm(shellFlow, shellBulk)];
        var v = 0.0;
        for (var i = 0; i < 3; i++)
        for (var j = 0; j < 3; j++) v += g[i] * covariance[i, j] * g[j];
        return Math.Sqrt(Math.Max(0, v));
    }
}

/// <summary>
/// Clean U from the bundle's geometry and both fluids' properties at each interval's flows and bulk temperatures:
/// tube side Gnielinski (Hausen when laminar), shell side Kern, wall conduction (<see cref="ShellAndTubeGeometry"/>).
/// Outside a correlation's range the clean U is undefined (NaN) and the sample says so.
/// </summary>
public sealed class GeometryCleanU(GeometryCleanReference reference, ITransportFluid tubeFluid, double tubePressure,
    ITransportFluid shellFluid, double shellPressure) : ICleanUModel
{
    private readonly ShellAndTubeGeometry _g = reference.Geometry;

    public string Description { get; } = FormattableString.Invariant(
        $"geometry: {reference.Geometry.TubeCount} tubes {reference.Geometry.TubeOuterDiameter * 1000:0.##}/{reference.Geometry.TubeInnerDiameter * 1000:0.##} mm × ") +
        FormattableString.Invariant($"{reference.Geometry.TubeLength:0.###} m, {reference.Geometry.TubePasses} pass(es), shell {reference.Geometry.ShellDiameter * 1000:0} mm; ") +
        FormattableString.Invariant($"Gnielinski tube side, {(reference.Geometry.Baffles is null ? "Kern" : "Bell–Delaware")} shell side, (μ/μw)^0.14 on both, wall {reference.Geometry.WallResistance:G3} m2K/W; ± {reference.RelativeUncertainty:P0} on 1/U");

    public double CleanU(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN)
    {
        if (!double.IsFinite(tubeBulk) || !double.IsFinite(shellBulk) || !(tubeFlow > 0) || !(shellFlow > 0)) return double.NaN;
        try
        {
            return _g.CleanU(tubeFlow, tubeFluid, Temperature.FromKelvin(tubeBulk), new Pressure(tubePressure),
                shellFlow, shellFluid, Temperature.FromKelvin(shellBulk), new Pressure(shellPressure));
        }
        catch (QuantityOutOfRangeException) { return double.NaN; }
    }

    public double InverseSigma(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN) =>
        reference.RelativeUncertainty / CleanU(tubeFlow, shellFlow, tubeBulk, shellBulk);
}

/// <summary>Clean U of a chevron-plate pack at each interval's flows and bulk temperatures (<see cref="PlateGeometry"/>,
/// Martin's correlation on both sides); NaN outside the correlation's range, and the sample says so.</summary>
public sealed class PlateGeometryCleanU(PlateGeometryCleanReference reference, ITransportFluid tubeFluid, double tubePressure,
    ITransportFluid shellFluid, double shellPressure) : ICleanUModel
{
    public string Description { get; } = FormattableString.Invariant(
        $"geometry: {reference.Geometry.PlateCount} chevron plates {reference.Geometry.PlateWidth * 1000:0} × {reference.Geometry.PlateLength * 1000:0} mm, ") +
        FormattableString.Invariant($"gap {reference.Geometry.ChannelGap * 1000:0.##} mm, {reference.Geometry.ChevronAngle:0.#}°; Martin on both sides, ") +
        FormattableString.Invariant($"(μ/μw)^(1/6), plate {reference.Geometry.WallResistance:G3} m2K/W; ± {reference.RelativeUncertainty:P0} on 1/U");

    public double CleanU(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN)
    {
        if (!double.IsFinite(tubeBulk) || !double.IsFinite(shellBulk) || !(tubeFlow > 0) || !(shellFlow > 0)) return double.NaN;
        try
        {
            return reference.Geometry.CleanU(tubeFlow, tubeFluid, Temperature.FromKelvin(tubeBulk), new Pressure(tubePressure),
                shellFlow, shellFluid, Temperature.FromKelvin(shellBulk), new Pressure(shellPressure));
        }
        catch (QuantityOutOfRangeException) { return double.NaN; }
    }

    public double InverseSigma(double tubeFlow, double shellFlow, double tubeBulk = double.NaN, double shellBulk = double.NaN) =>
        reference.RelativeUncertainty / CleanU(tubeFlow, shellFlow, tubeBulk, shellBulk);
}
