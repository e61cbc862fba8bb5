namespace FoulingWatch.Core.Quantities;

/// <summary>Absolute temperature level in kelvin (≥ 0 K). Subtracting two levels gives a <see cref="TemperatureDifference"/>.</summary>
public readonly record struct Temperature
{
    public Temperature(double kelvin)
    {
        if (!(kelvin >= 0.0) || double.IsInfinity(kelvin))
            QuantityOutOfRangeException.Throw("temperature", kelvin, "K", "0 K or above (absolute temperature)");
        Kelvin = kelvin;
    }

    public double Kelvin { get; }
    public double Celsius => Kelvin - 273.15;

    public static Temperature FromKelvin(double kelvin) => new(kelvin);
    public static Temperature FromCelsius(double celsius) => new(celsius + 273.15);
    // °F → K: T = (t_F + 459.67) × 5/9 (NIST SP 811, B.9).
    public static Temperature FromFahrenheit(double fahrenheit) => new((fahrenheit + 459.67) * 5.0 / 9.0);

    public static TemperatureDifference operator -(Temperature a, Temperature b) => new(a.Kelvin - b.Kelvin);
    public static Temperature operator +(Temperature a, TemperatureDifference d) => new(a.Kelvin + d.Kelvin);
    public override string ToString() => $"{Celsius:0.###} °C";
}

/// <summary>Temperature difference in kelvin; a °F difference converts by 5/9 with no offset. May be negative.</summary>
public readonly record struct TemperatureDifference(double Kelvin)
{
    public static TemperatureDifference FromFahrenheitDegrees(double value) => new(value * 5.0 / 9.0);
}

/// <summary>Mass flow in kg/s (≥ 0).</summary>
public readonly record struct MassFlow
{
    public MassFlow(double kilogramsPerSecond)
    {
        if (!(kilogramsPerSecond >= 0.0) || double.IsInfinity(kilogramsPerSecond))
            QuantityOutOfRangeException.Throw("mass flow", kilogramsPerSecond, "kg/s", "0 kg/s or above");
        KilogramsPerSecond = kilogramsPerSecond;
    }

    public double KilogramsPerSecond { get; }
    public static MassFlow FromKilogramsPerSecond(double value) => new(value);
}

/// <summary>Heat flow (duty) in W; the sign is the caller's convention.</summary>
public readonly record struct HeatFlow(double Watts)
{
    public static HeatFlow operator -(HeatFlow a, HeatFlow b) => new(a.Watts - b.Watts);
}

/// <summary>Heat-transfer area in m² (&gt; 0).</summary>
public readonly record struct Area
{
    public Area(double squareMetres)
    {
        if (!(squareMetres > 0.0) || double.IsInfinity(squareMetres))
            QuantityOutOfRangeException.Throw("area", squareMetres, "m2", "above 0 m2");
        SquareMetres = squareMetres;
    }

    public double SquareMetres { get; }
}

/// <summary>Absolute pressure in Pa (&gt; 0).</summary>
public readonly record struct Pressure
{
    public Pressure(double pascals)
    {
        if (!(pascals > 0.0) || double.IsInfinity(pascals))
            QuantityOutOfRangeException.Throw("absolute pressure", pascals, "Pa", "above 0 Pa");
        Pascals = pascals;
    }

    public double Pascals { get; }
    public double Megapascals => Pascals * 1e-6;
    public static Pressure FromMegapascals(double value) => new(value * 1e6);
    public static Pressure FromBar(double value) => new(value * 1e5);
    /// <summary>Standard atmosphere, 101 325 Pa (NIST SP 811, B.8).</summary>
    public static Pressure StandardAtmosphere => new(101_325.0);
}

/// <summary>Overall or film heat-transfer coefficient in W/(m²·K) (&gt; 0).</summary>
public readonly record struct HeatTransferCoefficient
{
    public HeatTransferCoefficient(double wattsPerSquareMetreKelvin)
    {
        if (!(wattsPerSquareMetreKelvin > 0.0) || double.IsInfinity(wattsPerSquareMetreKelvin))
            QuantityOutOfRangeException.Throw("heat-transfer coefficient", wattsPerSquareMetreKelvin, "W/m2K", "above 0 W/m2K");
        WattsPerSquareMetreKelvin = wattsPerSquareMetreKelvin;
    }

    public double WattsPerSquareMetreKelvin { get; }
}

/// <summary>Fouling (thermal) resistance per unit area in m²·K/W; may be negative in back-calculated data.</summary>
public readonly record struct FoulingResistance(double SquareMetreKelvinPerWatt)
{
    // 1 h·ft²·°F/Btu(IT) = 3600 s × 0.3048² m² × (5/9) K / 1055.05585262 J ≈ 0.176110 m²·K/W
    public static FoulingResistance FromHourSquareFootFahrenheitPerBtu(double value) =>
        new(value * 3600.0 * 0.3048 * 0.3048 * (5.0 / 9.0) / 1055.05585262);
}
