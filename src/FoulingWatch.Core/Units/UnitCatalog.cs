using System.Collections.Frozen;
using System.Globalization;

namespace FoulingWatch.Core.Units;

/// <summary>The physical dimension a unit string must belong to.</summary>
public enum Dimension
{
    Temperature,
    TemperatureDifference,
    MassFlow,
    VolumetricFlow,
    Power,
    Energy,
    Area,
    HeatTransferCoefficient,
    FoulingResistance,
    Pressure,
    Length,
    Density,
    SpecificHeat,
    ThermalConductivity,
    Velocity,
    Duration,
    KinematicViscosity,
}

/// <summary>An affine map from a unit to SI: si = value × Scale + Offset. Resolve once per column, apply per value.</summary>
public readonly record struct LinearUnit(string Symbol, double Scale, double Offset = 0.0)
{
    public double ToSi(double value) => value * Scale + Offset;
    public double FromSi(double si) => (si - Offset) / Scale;
}

/// <summary>
/// Unit strings accepted in configuration and historian headers, with exact factors to SI.
/// </summary>
/// <remarks>
/// Factors are built from exact definitions (NIST SP 811, 2008 ed., appendix B): lb = 0.45359237 kg,
/// ft = 0.3048 m, in = 0.0254 m, Btu(IT) = 1055.05585262 J, US gallon = 231 in³, oil barrel = 42 US gal,
/// lbf = 0.45359237 kg × 9.80665 m/s², °F difference = 5/9 K. Matching ignores case, spaces, "·", "*", ".",
/// brackets and the superscripts ² ³, so "W/(m²·K)" and "w/m2k" are the same unit. The SI of each
/// dimension: K, K, kg/s, m³/s, W, J, m², W/(m²·K), m²·K/W, Pa (absolute), m, kg/m³, J/(kg·K), W/(m·K), m/s, s.
/// We keep our own catalogue rather than a general unit library because historian exports use trade
/// spellings (t/h, klb/h, MMBtu/h, barg, bbl/d) and the hot path needs one scale and offset per column.
/// </remarks>
public static class UnitCatalog
{
    private const double Pound = 0.45359237;                 // kg, exact
    private const double Foot = 0.3048;                      // m, exact
    private const double Inch = 0.0254;                      // m, exact
    private const double Btu = 1055.05585262;                // J, International Table Btu, exact
    private const double UsGallon = 231.0 * Inch * Inch * Inch; // m³ = 3.785411784e-3, exact
    private const double OilBarrel = 42.0 * UsGallon;        // m³ = 0.158987294928, exact
    private const double PoundForce = Pound * 9.80665;       // N, exact
    private const double Psi = PoundForce / (Inch * Inch);   // Pa ≈ 6894.757
    private const double Hour = 3600.0;
    private const double Day = 86400.0;
    private const double FahrenheitDegree = 5.0 / 9.0;       // K per °F difference

    // Declared before Catalogue: static initialisers run in textual order and Build fills these.
    private static readonly Dictionary<Dimension, List<string>> AcceptedSymbols = new();
    private static readonly Dictionary<Dimension, Dictionary<string, LinearUnit>> Staging = new();
    private static readonly FrozenDictionary<Dimension, FrozenDictionary<string, LinearUnit>> Catalogue = Build();

    /// <summary>The unit symbols accepted for a dimension, in catalogue order, for messages.</summary>
    public static IReadOnlyList<string> Accepted(Dimension dimension) => AcceptedSymbols[dimension];

    /// <summary>Resolves a unit string to its SI scale and offset, or throws <see cref="UnknownUnitException"/>.</summary>
    public static LinearUnit Resolve(string unit, Dimension dimension)
    {
        if (TryResolve(unit, dimension, out var resolved)) return resolved;
        throw new UnknownUnitException(unit, dimension, Accepted(dimension));
    }

    public static bool TryResolve(string? unit, Dimension dimension, out LinearUnit resolved)
    {
        resolved = default;
        if (string.IsNullOrWhiteSpace(unit)) return false;
        return Catalogue[dimension].TryGetValue(Normalise(unit), out resolved);
    }

    /// <summary>Resolves a gauge or absolute pressure unit; gauge units (barg, psig, kPag) add the stated atmosphere.</summary>
    public static LinearUnit ResolvePressure(string unit, double atmospherePascals)
    {
        var key = Normalise(unit);
        foreach (var (suffixes, scale) in GaugePressures)
            if (suffixes.Contains(key))
                return new LinearUnit(unit, scale, atmospherePascals);
        return Resolve(unit, Dimension.Pressure);
    }

    private static readonly (string[] Keys, double Scale)[] GaugePressures =
    [
        // keys in Normalise form: "bar(g)" and "barG" both become "barg"
        (["barg"], 1e5),
        (["psig"], Psi),
        (["kpag"], 1e3),
        (["mpag"], 1e6),
    ];

    /// <summary>Parses "250 m2" or "250" with a separate unit into an SI value; the number uses the invariant culture.</summary>
    public static double ParseToSi(string text, Dimension dimension)
    {
        var (value, unit) = SplitNumberAndUnit(text, dimension);
        return Resolve(unit, dimension).ToSi(value);
    }

    /// <summary>Splits "250 m2" into 250 and "m2"; throws <see cref="FormatException"/> naming what was expected.</summary>
    public static (double Value, string Unit) SplitNumberAndUnit(string text, Dimension dimension)
    {
        var s = text.Trim();
        var end = 0;
        while (end < s.Length && (char.IsDigit(s[end]) || s[end] is '.' or '-' or '+' or 'e' or 'E'))
        {
            // 'e' belongs to the number only when followed by a digit or sign (so "250 ea" is not swallowed).
            if (s[end] is 'e' or 'E' && !(end + 1 < s.Length && (char.IsDigit(s[end + 1]) || s[end + 1] is '-' or '+'))) break;
            end++;
        }
        if (end == 0 || !double.TryParse(s[..end], NumberStyles.Float, CultureInfo.InvariantCulture, out var value))
            throw new FormatException($"'{text}' is not a number with a unit; write it like \"{Example(dimension)}\".");
        var unit = s[end..].Trim();
        if (unit.Length == 0)
            throw new FormatException($"'{text}' has no unit; write it like \"{Example(dimension)}\" (accepted units: {string.Join(", ", Accepted(dimension))}).");
        return (value, unit);
    }

    private static string Example(Dimension d) => d switch
    {
        Dimension.Temperature => "150 degC",
        Dimension.TemperatureDifference => "5 K",
        Dimension.MassFlow => "120 t/h",
        Dimension.VolumetricFlow => "300 m3/h",
        Dimension.Power => "2.5 MW",
        Dimension.Energy => "10 GJ",
        Dimension.Area => "250 m2",
        Dimension.HeatTransferCoefficient => "450 W/m2K",
        Dimension.FoulingResistance => "0.0004 m2K/W",
        Dimension.Pressure => "12 bar",
        Dimension.Length => "25 mm",
        Dimension.Density => "850 kg/m3",
        Dimension.SpecificHeat => "2.1 kJ/kgK",
        Dimension.ThermalConductivity => "45 W/mK",
        Dimension.Velocity => "1.5 m/s",
        Dimension.Duration => "3 d",
        Dimension.KinematicViscosity => "32 cSt",
        _ => "1 unit",
    };

    /// <summary>Canonical lookup key: lower case, without spaces, "·", "*", ".", brackets; ² ³ → 2 3; ° and "deg" unified.</summary>
    public static string Normalise(string unit)
    {
        Span<char> buffer = stackalloc char[unit.Length * 3];
        var n = 0;
        foreach (var ch in unit)
        {
            switch (ch)
            {
                case ' ' or '\t' or '·' or '*' or '.' or '(' or ')' or '[' or ']' or '⋅' or '_':
                    continue;
                case '²': buffer[n++] = '2'; continue;
                case '³': buffer[n++] = '3'; continue;
                case '°' or 'º':
                    buffer[n++] = 'd'; buffer[n++] = 'e'; buffer[n++] = 'g'; continue;
                case 'µ' or 'μ': buffer[n++] = 'u'; continue;
                default: buffer[n++] = char.ToLowerInvariant(ch); continue;
            }
        }
        return new string(buffer[..n]);
    }

    private static FrozenDictionary<Dimension, FrozenDictionary<string, LinearUnit>> Build()
    {
        var all = new Dictionary<Dimension, FrozenDictionary<string, LinearUnit>>();
        void Add(Dimension d, double scale, double offset, params string[] symbols)
        {
            if (!Staging.TryGetValue(d, out var map)) Staging[d] = map = new Dictionary<string, LinearUnit>();
            if (!AcceptedSymbols.TryGetValue(d, out var list)) AcceptedSymbols[d] = list = [];
            list.Add(symbols[0]);
            foreach (var s in symbols) map[Normalise(s)] = new LinearUnit(symbols[0], scale, offset);
        }

        Add(Dimension.Temperature, 1.0, 273.15, "degC", "°C", "C", "celsius", "deg C");
        Add(Dimension.Temperature, 1.0, 0.0, "K", "kelvin");
        Add(Dimension.Temperature, FahrenheitDegree, 459.67 * FahrenheitDegree, "degF", "°F", "F", "fahrenheit");
        Add(Dimension.Temperature, FahrenheitDegree, 0.0, "degR", "°R", "rankine");

        Add(Dimension.TemperatureDifference, 1.0, 0.0, "K", "kelvin", "delta K");
        Add(Dimension.TemperatureDifference, 1.0, 0.0, "degC", "°C", "C", "delta degC");
        Add(Dimension.TemperatureDifference, FahrenheitDegree, 0.0, "degF", "°F", "F", "delta degF", "degR", "°R");

        Add(Dimension.MassFlow, 1.0, 0.0, "kg/s");
        Add(Dimension.MassFlow, 1.0 / 60.0, 0.0, "kg/min");
        Add(Dimension.MassFlow, 1.0 / Hour, 0.0, "kg/h", "kg/hr");
        Add(Dimension.MassFlow, 1000.0 / Hour, 0.0, "t/h", "te/h", "tonne/h", "t/hr");
        Add(Dimension.MassFlow, 1000.0 / 60.0, 0.0, "t/min");
        Add(Dimension.MassFlow, 1000.0 / Day, 0.0, "t/d", "tonne/d");
        Add(Dimension.MassFlow, Pound / Hour, 0.0, "lb/h", "lb/hr", "lbm/h");
        Add(Dimension.MassFlow, 1000.0 * Pound / Hour, 0.0, "klb/h", "klb/hr", "Mlb/h");
        Add(Dimension.MassFlow, Pound, 0.0, "lb/s");

        Add(Dimension.VolumetricFlow, 1.0, 0.0, "m3/s");
        Add(Dimension.VolumetricFlow, 1.0 / Hour, 0.0, "m3/h", "m3/hr");
        Add(Dimension.VolumetricFlow, 1.0 / Day, 0.0, "m3/d");
        Add(Dimension.VolumetricFlow, 1e-3, 0.0, "L/s", "l/s");
        Add(Dimension.VolumetricFlow, 1e-3 / 60.0, 0.0, "L/min", "l/min");
        Add(Dimension.VolumetricFlow, UsGallon / 60.0, 0.0, "US gpm", "gpm", "USgal/min");
        Add(Dimension.VolumetricFlow, OilBarrel / Day, 0.0, "bbl/d", "bpd", "bbl/day");

        Add(Dimension.Power, 1.0, 0.0, "W");
        Add(Dimension.Power, 1e3, 0.0, "kW");
        Add(Dimension.Power, 1e6, 0.0, "MW");
        Add(Dimension.Power, 1e9 / Hour, 0.0, "GJ/h");
        Add(Dimension.Power, Btu / Hour, 0.0, "Btu/h", "Btu/hr");
        Add(Dimension.Power, 1e6 * Btu / Hour, 0.0, "MMBtu/h", "MMBtu/hr");

        Add(Dimension.Energy, 1.0, 0.0, "J");
        Add(Dimension.Energy, 1e3, 0.0, "kJ");
        Add(Dimension.Energy, 1e6, 0.0, "MJ");
        Add(Dimension.Energy, 1e9, 0.0, "GJ");
        Add(Dimension.Energy, 1e12, 0.0, "TJ");
        Add(Dimension.Energy, 3.6e6, 0.0, "kWh");
        Add(Dimension.Energy, 3.6e9, 0.0, "MWh");
        Add(Dimension.Energy, Btu, 0.0, "Btu");
        Add(Dimension.Energy, 1e6 * Btu, 0.0, "MMBtu");

        Add(Dimension.Area, 1.0, 0.0, "m2", "sq m");
        Add(Dimension.Area, Foot * Foot, 0.0, "ft2", "sq ft");

        Add(Dimension.HeatTransferCoefficient, 1.0, 0.0, "W/m2K", "W/m2/K", "W/(m2 K)");
        Add(Dimension.HeatTransferCoefficient, 1e3, 0.0, "kW/m2K", "kW/m2/K");
        // Btu/(h·ft²·°F) = 1055.05585262 J / (3600 s × 0.09290304 m² × 5/9 K) ≈ 5.678263 W/(m²·K)
        Add(Dimension.HeatTransferCoefficient, Btu / (Hour * Foot * Foot * FahrenheitDegree), 0.0,
            "Btu/h ft2 degF", "Btu/hft2F", "Btu/(h ft2 F)", "Btu/hr ft2 degF", "Btu/hrft2F");

        Add(Dimension.FoulingResistance, 1.0, 0.0, "m2K/W", "m2/W/K", "m2 K/W");
        // h·ft²·°F/Btu = 3600 s × 0.09290304 m² × 5/9 K / 1055.05585262 J ≈ 0.176110 m²·K/W
        Add(Dimension.FoulingResistance, Hour * Foot * Foot * FahrenheitDegree / Btu, 0.0,
            "h ft2 degF/Btu", "hft2F/Btu", "hr ft2 degF/Btu", "hrft2F/Btu");

        Add(Dimension.Pressure, 1.0, 0.0, "Pa", "Pa(a)");
        Add(Dimension.Pressure, 1e3, 0.0, "kPa", "kPa(a)", "kPaa");
        Add(Dimension.Pressure, 1e6, 0.0, "MPa", "MPa(a)", "MPaa");
        Add(Dimension.Pressure, 1e5, 0.0, "bar", "bara", "bar(a)");
        Add(Dimension.Pressure, Psi, 0.0, "psi", "psia", "psi(a)");

        Add(Dimension.Length, 1.0, 0.0, "m");
        Add(Dimension.Length, 1e-3, 0.0, "mm");
        Add(Dimension.Length, Inch, 0.0, "in", "inch");
        Add(Dimension.Length, Foot, 0.0, "ft");

        Add(Dimension.Density, 1.0, 0.0, "kg/m3");
        Add(Dimension.Density, 1e3, 0.0, "kg/L", "kg/l", "g/cm3");
        Add(Dimension.Density, Pound / (Foot * Foot * Foot), 0.0, "lb/ft3");

        Add(Dimension.SpecificHeat, 1.0, 0.0, "J/kgK", "J/kg/K");
        Add(Dimension.SpecificHeat, 1e3, 0.0, "kJ/kgK", "kJ/kg/K");
        // Btu(IT)/(lb·°F) = 1055.05585262 / (0.45359237 × 5/9) = 4186.8 J/(kg·K), exact
        Add(Dimension.SpecificHeat, Btu / (Pound * FahrenheitDegree), 0.0, "Btu/lb degF", "Btu/lbF", "Btu/lb/degF");

        Add(Dimension.ThermalConductivity, 1.0, 0.0, "W/mK", "W/m/K");
        Add(Dimension.ThermalConductivity, Btu / (Hour * Foot * FahrenheitDegree), 0.0, "Btu/h ft degF", "Btu/hftF");

        Add(Dimension.KinematicViscosity, 1.0, 0.0, "m2/s");
        Add(Dimension.KinematicViscosity, 1e-6, 0.0, "mm2/s", "cSt", "centistokes");

        Add(Dimension.Velocity, 1.0, 0.0, "m/s");
        Add(Dimension.Velocity, Foot, 0.0, "ft/s");

        Add(Dimension.Duration, 1.0, 0.0, "s", "sec", "secs", "second", "seconds");
        Add(Dimension.Duration, 60.0, 0.0, "min", "mins", "minute", "minutes");
        Add(Dimension.Duration, Hour, 0.0, "h", "hr", "hour", "hours");
        Add(Dimension.Duration, Day, 0.0, "d", "day", "days");

        foreach (var (d, map) in Staging) all[d] = map.ToFrozenDictionary();
        Staging.Clear();
        return all.ToFrozenDictionary();
    }
}

/// <summary>A unit string that is not known for the dimension asked; the message lists the accepted units.</summary>
public sealed class UnknownUnitException : FormatException
{
    public UnknownUnitException(string unit, Dimension dimension, IReadOnlyList<string> accepted)
        : base($"'{unit}' is not {WithArticle(dimension)} unit; use {string.Join(", ", accepted)}.")
    {
        Unit = unit;
        Dimension = dimension;
    }

    public string Unit { get; }
    public Dimension Dimension { get; }

    /// <summary>"a mass-flow", "an area": the dimension's name with its indefinite article.</summary>
    public static string WithArticle(Dimension d) => ("aeiou".Contains(Describe(d)[0]) ? "an " : "a ") + Describe(d);

    public static string Describe(Dimension d) => d switch
    {
        Dimension.Temperature => "temperature",
        Dimension.TemperatureDifference => "temperature-difference",
        Dimension.MassFlow => "mass-flow",
        Dimension.VolumetricFlow => "volumetric-flow",
        Dimension.Power => "power",
        Dimension.Energy => "energy",
        Dimension.Area => "area",
        Dimension.HeatTransferCoefficient => "heat-transfer-coefficient",
        Dimension.FoulingResistance => "fouling-resistance",
        Dimension.Pressure => "pressure",
        Dimension.Length => "length",
        Dimension.Density => "density",
        Dimension.SpecificHeat => "specific-heat",
        Dimension.ThermalConductivity => "thermal-conductivity",
        Dimension.Velocity => "velocity",
        Dimension.Duration => "duration",
        _ => d.ToString(),
    };
}
