using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.FluidModels;

/// <summary>Single-phase water or steam by IAPWS-IF97: region 1 below the saturation temperature at the stream pressure, region 2 above it.</summary>
/// <remarks>A stream whose two temperatures lie on opposite sides of saturation changes phase: use <see cref="SteamPhaseChange"/>.</remarks>
public sealed class IapwsWater : ITransportFluid
{
    public string Description => "water/steam, IAPWS-IF97 regions 1 and 2";
    public TemperatureRange Validity { get; } = new(IapwsIf97.MinimumTemperature, IapwsIf97.Region2MaximumTemperature);

    private static bool IsLiquid(double t, double pMPa) =>
        t <= IapwsIf97.Region1MaximumTemperature &&
        (pMPa > IapwsIf97.CriticalPressureMPa || t < Saturation(pMPa));

    // A stream's pressure is fixed, and a back-calculation asks for the same few states again and again (the duty's
    // inlet and outlet, each probe of the uncertainty propagation moving one temperature, the film properties at the
    // bulk temperature): the last saturation temperature and the last few states are kept per thread. Pure functions
    // of (T, p), so the values are the same bits as evaluating afresh.
    [ThreadStatic] private static double _saturationPressure, _saturationTemperature;
    [ThreadStatic] private static StateCache? _states;

    private static double Saturation(double pMPa)
    {
        if (pMPa == _saturationPressure && pMPa > 0) return _saturationTemperature;
        var t = IapwsIf97.SaturationTemperature(pMPa);
        (_saturationPressure, _saturationTemperature) = (pMPa, t);
        return t;
    }

    private IapwsIf97.State StateAt(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        var t = temperature.Kelvin;
        var p = pressure.Megapascals;
        var cache = _states ??= new StateCache();
        if (cache.TryGet(t, p, out var state)) return state;
        state = IsLiquid(t, p) ? IapwsIf97.Region1(t, p) : IapwsIf97.Region2(t, p);
        cache.Add(t, p, state);
        return state;
    }

    /// <summary>The last four states evaluated on a thread, by (T, p), replaced in turn.</summary>
    private sealed class StateCache
    {
        private const int Size = 4;
        private readonly double[] _t = [double.NaN, double.NaN, double.NaN, double.NaN];
        private readonly double[] _p = new double[Size];
        private readonly IapwsIf97.State[] _state = new IapwsIf97.State[Size];
        private int _next;

        public bool TryGet(double t, double p, out IapwsIf97.State state)
        {
            for (var i = 0; i < Size; i++)
                if (_t[i] == t && _p[i] == p) { state = _state[i]; return true; }
            state = default;
            return false;
        }

        public void Add(double t, double p, IapwsIf97.State state)
        {
            (_t[_next], _p[_next], _state[_next]) = (t, p, state);
            _next = (_next + 1) % Size;
        }
    }

    public double SpecificEnthalpy(Temperature temperature, Pressure pressure) => StateAt(temperature, pressure).SpecificEnthalpy;
    public double SpecificHeat(Temperature temperature, Pressure pressure) => StateAt(temperature, pressure).SpecificHeat;
    public double? Density(Temperature temperature, Pressure pressure) => 1.0 / StateAt(temperature, pressure).SpecificVolume;

    /// <summary>Dynamic viscosity in Pa·s (IAPWS R12-08 on the IF97 density).</summary>
    public double Viscosity(Temperature temperature, Pressure pressure) =>
        WaterTransport.Viscosity(temperature.Kelvin, Density(temperature, pressure)!.Value);

    /// <summary>Thermal conductivity in W/(m·K) (IAPWS R15-11 on the IF97 density).</summary>
    public double ThermalConductivity(Temperature temperature, Pressure pressure) =>
        WaterTransport.ThermalConductivity(temperature.Kelvin, Density(temperature, pressure)!.Value);

    /// <summary>Prandtl number μ·cp/λ.</summary>
    public double Prandtl(Temperature temperature, Pressure pressure) =>
        Viscosity(temperature, pressure) * SpecificHeat(temperature, pressure) / ThermalConductivity(temperature, pressure);

    public string? WhyNotEvaluable(Temperature from, Temperature to, Pressure pressure)
    {
        if (!Validity.Contains(from) || !Validity.Contains(to))
            return $"{Description}: temperature outside {Validity}";
        if (pressure.Megapascals > IapwsIf97.MaximumPressureMPa) return $"{Description}: pressure above 100 MPa";
        if (pressure.Megapascals < IapwsIf97.CriticalPressureMPa &&
            IsLiquid(from.Kelvin, pressure.Megapascals) != IsLiquid(to.Kelvin, pressure.Megapascals))
            return $"{Description}: the stream crosses saturation at {IapwsIf97.SaturationTemperature(pressure.Megapascals) - 273.15:0.#} °C; use the condensing or evaporating steam model";
        return null;
    }

    double IFluidModel.EnthalpyChange(Temperature from, Temperature to, Pressure pressure)
    {
        var why = WhyNotEvaluable(from, to, pressure);
        if (why is not null) throw new PropertyRangeException(Description, "temperature", to.Kelvin, "K", why);
        return SpecificEnthalpy(to, pressure) - SpecificEnthalpy(from, pressure);
    }
}

/// <summary>Whether the steam side gives up latent heat (condensing) or takes it (evaporating).</summary>
public enum PhaseChangeDirection { Condensing, Evaporating }

/// <summary>
/// Steam condensing (or water evaporating) at a stated pressure, by IAPWS-IF97: the enthalpy change runs from the
/// inlet state to the outlet state, each read as superheated/subcooled when its temperature lies beyond a band
/// around saturation and as saturated vapour/liquid inside the band.
/// </summary>
/// <remarks>
/// The band (default 0.5 K, common practice for instrument error) keeps a saturated stream read a few tenths off
/// T_s from being taken as single-phase. Duty: Q = ṁ·(h_in − h_out) for a condensing side. Capacity rate infinite
/// (the side is isothermal at T_s), so Cr = 0 in ε-NTU.
/// </remarks>
public sealed class SteamPhaseChange : IFluidModel
{
    public SteamPhaseChange(Pressure saturationPressure, PhaseChangeDirection direction, double saturationBandKelvin = 0.5)
    {
        Pressure = saturationPressure;
        Direction = direction;
        SaturationBand = saturationBandKelvin;
        SaturationTemperature = Temperature.FromKelvin(IapwsIf97.SaturationTemperature(saturationPressure.Megapascals));
        if (SaturationTemperature.Kelvin > IapwsIf97.Region1MaximumTemperature)
            throw new PropertyRangeException("IAPWS-IF97 region 4", "saturation temperature", SaturationTemperature.Kelvin, "K", "up to 623.15 K (16.5 MPa)");
        Description = FormattableString.Invariant(
            $"{(direction == PhaseChangeDirection.Condensing ? "condensing steam" : "evaporating water")} at {saturationPressure.Pascals / 1e5:0.###} bar(a), T_s {SaturationTemperature.Celsius:0.##} °C (IAPWS-IF97)");
    }

    public Pressure Pressure { get; }
    public PhaseChangeDirection Direction { get; }
    public double SaturationBand { get; }
    public Temperature SaturationTemperature { get; }
    public string Description { get; }
    public bool IsPhaseChange => true;
    public TemperatureRange Validity { get; } = new(IapwsIf97.MinimumTemperature, IapwsIf97.Region2MaximumTemperature);

    /// <summary>Latent heat h'' − h' in J/kg at the stated pressure.</summary>
    public double LatentHeat => IapwsIf97.LatentHeat(Pressure.Megapascals);

    private double VapourEnthalpy(Temperature t) =>
        t.Kelvin > SaturationTemperature.Kelvin + SaturationBand
            ? IapwsIf97.Region2(t.Kelvin, Pressure.Megapascals).SpecificEnthalpy
            : IapwsIf97.Region2Unchecked(SaturationTemperature.Kelvin, Pressure.Megapascals).SpecificEnthalpy;

    private double LiquidEnthalpy(Temperature t) =>
        t.Kelvin < SaturationTemperature.Kelvin - SaturationBand
            ? IapwsIf97.Region1(t.Kelvin, Pressure.Megapascals).SpecificEnthalpy
            : IapwsIf97.Region1Unchecked(SaturationTemperature.Kelvin, Pressure.Megapascals).SpecificEnthalpy;

    public string? WhyNotEvaluable(Temperature from, Temperature to, Pressure pressure)
    {
        var ts = SaturationTemperature.Kelvin;
        var (vapour, liquid) = Direction == PhaseChangeDirection.Condensing ? (from, to) : (to, from);
        if (vapour.Kelvin < ts - SaturationBand)
            return FormattableString.Invariant($"{Description}: vapour-side temperature {vapour.Celsius:0.##} °C is below saturation; no phase change is possible");
        if (liquid.Kelvin > ts + SaturationBand)
            return FormattableString.Invariant($"{Description}: liquid-side temperature {liquid.Celsius:0.##} °C is above saturation");
        if (!Validity.Contains(from) || !Validity.Contains(to)) return $"{Description}: temperature outside {Validity}";
        return null;
    }

    /// <summary>h(to) − h(from) in J/kg across the phase change; negative when condensing.</summary>
    public double EnthalpyChange(Temperature from, Temperature to, Pressure pressure)
    {
        var why = WhyNotEvaluable(from, to, pressure);
        if (why is not null) throw new PropertyRangeException(Description, "temperature", from.Kelvin, "K", why);
        return Direction == PhaseChangeDirection.Condensing
            ? LiquidEnthalpy(to) - VapourEnthalpy(from)
            : VapourEnthalpy(to) - LiquidEnthalpy(from);
    }

    /// <summary>Slopes of <see cref="EnthalpyChange"/>: the vapour's c_p (IAPWS-IF97 region 2) where its temperature is
    /// above the saturation band, the liquid's (region 1) where below, and 0 inside the band, where the state is taken as
    /// saturated whatever the reading.</summary>
    public (double From, double To) EnthalpyChangeSlopes(Temperature from, Temperature to, Pressure pressure)
    {
        var p = Pressure.Megapascals;
        var ts = SaturationTemperature.Kelvin;
        double Vapour(Temperature t) => t.Kelvin > ts + SaturationBand ? IapwsIf97.Region2(t.Kelvin, p).SpecificHeat : 0;
        double Liquid(Temperature t) => t.Kelvin < ts - SaturationBand ? IapwsIf97.Region1(t.Kelvin, p).SpecificHeat : 0;
        return Direction == PhaseChangeDirection.Condensing ? (-Vapour(from), Liquid(to)) : (-Liquid(from), Vapour(to));
    }

    /// <summary>Specific enthalpy of the single-phase state at a temperature off saturation; at saturation the phase is ambiguous.</summary>
    public double SpecificEnthalpy(Temperature temperature, Pressure pressure) =>
        temperature.Kelvin > SaturationTemperature.Kelvin ? VapourEnthalpy(temperature) : LiquidEnthalpy(temperature);

    /// <summary>Infinite: the side changes phase at constant temperature.</summary>
    public double SpecificHeat(Temperature temperature, Pressure pressure) => double.PositiveInfinity;

    double IFluidModel.MeanSpecificHeat(Temperature from, Temperature to, Pressure pressure) => double.PositiveInfinity;
}
