using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.FluidModels;

/// <summary>A fluid with one constant specific heat: h = cp·(T − 273.15 K).</summary>
public sealed class ConstantSpecificHeat : IFluidModel
{
    public ConstantSpecificHeat(double specificHeat, TemperatureRange validity, string name = "constant cp")
    {
        if (!(specificHeat > 0) || double.IsInfinity(specificHeat))
            throw new QuantityOutOfRangeException("specific heat", specificHeat, "J/kgK", "above 0 J/kgK");
        SpecificHeatValue = specificHeat;
        Validity = validity;
        Description = FormattableString.Invariant($"{name} ({specificHeat:0.#} J/kgK)");
    }

    public double SpecificHeatValue { get; }
    public string Description { get; }
    public TemperatureRange Validity { get; }

    public double SpecificEnthalpy(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        return SpecificHeatValue * (temperature.Kelvin - 273.15);
    }

    public double SpecificHeat(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        return SpecificHeatValue;
    }
}

/// <summary>A fluid with cp(T) = Σ aᵢ·(T − T₀)ⁱ; enthalpy is the exact integral Σ aᵢ·(T − T₀)ⁱ⁺¹/(i+1).</summary>
public sealed class PolynomialSpecificHeat : IFluidModel
{
    private readonly double[] _coefficients;
    private readonly double _origin;

    /// <param name="coefficients">a₀, a₁, … in J/(kg·K), J/(kg·K²), …</param>
    /// <param name="originKelvin">T₀ of the polynomial's temperature variable (0 K for a kelvin polynomial, 273.15 K for °C).</param>
    public PolynomialSpecificHeat(IReadOnlyList<double> coefficients, double originKelvin, TemperatureRange validity, string name = "cp(T) polynomial")
    {
        if (coefficients.Count == 0) throw new ArgumentException("a cp polynomial needs at least one coefficient", nameof(coefficients));
        _coefficients = [.. coefficients];
        _origin = originKelvin;
        Validity = validity;
        Description = name;
        for (var t = validity.MinimumKelvin; t <= validity.MaximumKelvin; t += Math.Max(1.0, (validity.MaximumKelvin - validity.MinimumKelvin) / 50))
            if (!(Evaluate(t) > 0))
                throw new QuantityOutOfRangeException($"{name}: cp at {t - 273.15:0.#} °C", Evaluate(t), "J/kgK", "above 0 J/kgK throughout the validity range");
    }

    public string Description { get; }
    public TemperatureRange Validity { get; }

    private double Evaluate(double t)
    {
        var x = t - _origin;
        var sum = 0.0;
        for (var i = _coefficients.Length - 1; i >= 0; i--) sum = sum * x + _coefficients[i];
        return sum;
    }

    public double SpecificHeat(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        return Evaluate(temperature.Kelvin);
    }

    public double SpecificEnthalpy(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        var x = temperature.Kelvin - _origin;
        var sum = 0.0;
        for (var i = _coefficients.Length - 1; i >= 0; i--) sum = sum * x + _coefficients[i] / (i + 1);
        return sum * x;
    }
}

/// <summary>A fluid with cp(T) from a table, linear between points; enthalpy is the exact integral of that piecewise-linear cp.</summary>
/// <remarks>Validity is the table's span: no extrapolation beyond its first and last points.</remarks>
public sealed class TabulatedSpecificHeat : IFluidModel
{
    private readonly double[] _t;
    private readonly double[] _cp;
    private readonly double[] _hAtPoint;

    /// <param name="points">(temperature in K, cp in J/(kg·K)), at least two, strictly increasing in temperature.</param>
    public TabulatedSpecificHeat(IReadOnlyList<(double TemperatureKelvin, double SpecificHeat)> points, string name = "cp(T) table")
    {
        if (points.Count < 2) throw new ArgumentException("a cp table needs at least two points", nameof(points));
        _t = new double[points.Count];
        _cp = new double[points.Count];
        _hAtPoint = new double[points.Count];
        for (var i = 0; i < points.Count; i++)
        {
            _t[i] = points[i].TemperatureKelvin;
            _cp[i] = points[i].SpecificHeat;
            if (!(_cp[i] > 0)) throw new QuantityOutOfRangeException($"{name}: cp at point {i + 1}", _cp[i], "J/kgK", "above 0 J/kgK");
            if (i > 0 && !(_t[i] > _t[i - 1]))
                throw new ArgumentException($"{name}: temperatures must increase strictly; point {i + 1} ({_t[i]:G6} K) follows {_t[i - 1]:G6} K", nameof(points));
            if (i > 0) _hAtPoint[i] = _hAtPoint[i - 1] + 0.5 * (_cp[i] + _cp[i - 1]) * (_t[i] - _t[i - 1]);
        }
        Validity = new TemperatureRange(_t[0], _t[^1]);
        Description = name;
    }

    public string Description { get; }
    public TemperatureRange Validity { get; }

    private int Segment(double t)
    {
        var i = Array.BinarySearch(_t, t);
        if (i < 0) i = ~i - 1;
        return Math.Clamp(i, 0, _t.Length - 2);
    }

    public double SpecificHeat(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        var t = temperature.Kelvin;
        var i = Segment(t);
        return _cp[i] + (_cp[i + 1] - _cp[i]) * (t - _t[i]) / (_t[i + 1] - _t[i]);
    }

    public double SpecificEnthalpy(Temperature temperature, Pressure pressure)
    {
        var cpHere = SpecificHeat(temperature, pressure);
        var i = Segment(temperature.Kelvin);
        return _hAtPoint[i] + 0.5 * (_cp[i] + cpHere) * (temperature.Kelvin - _t[i]);
    }
}

/// <summary>
/// A petroleum liquid characterised by specific gravity (60/60 °F) and Watson K, with cp(T) by Kesler &amp; Lee.
/// </summary>
/// <remarks>
/// Source: Kesler, M. G. &amp; Lee, B. I., Hydrocarbon Processing 55(3), 1976, 153–158; the liquid heat-capacity
/// equation as given in the API Technical Data Book, procedure 7D2.2:
/// cp [Btu/(lb·°F)] = A1 + A2·T + A3·T², T in °R. Enthalpy is its exact integral.
/// Validity used here: 0 °F to 700 °F liquid, SG 0.6 to 1.1, K 10 to 13 (common practice for the procedure's
/// data base, from memory); the procedure's reduced-temperature limit is not checked as Tc is not known here.
/// </remarks>
public sealed class KeslerLeePetroleumLiquid : IFluidModel
{
    private const double BtuPerPoundFahrenheit = 4186.8; // J/(kg·K), exact: 1055.05585262 / (0.45359237 × 5/9)
    private readonly double _a1, _a2, _a3;

    public KeslerLeePetroleumLiquid(double specificGravity, double watsonK)
    {
        if (!(specificGravity >= 0.6 && specificGravity <= 1.1))
            throw new QuantityOutOfRangeException("specific gravity 60/60 °F", specificGravity, "", "0.6 to 1.1 (Kesler–Lee liquid cp)");
        if (!(watsonK >= 10.0 && watsonK <= 13.0))
            throw new QuantityOutOfRangeException("Watson K", watsonK, "", "10 to 13 (Kesler–Lee liquid cp)");
        SpecificGravity = specificGravity;
        WatsonK = watsonK;
        var sg = specificGravity;
        var k = watsonK;
        _a1 = -1.17126 + (0.023722 + 0.024907 * sg) * k + (1.14982 - 0.046535 * k) / sg;
        _a2 = 1e-4 * (1 + 0.82463 * k) * (1.12172 - 0.27634 / sg);
        _a3 = -1e-8 * (1 + 0.82463 * k) * (2.9027 - 0.70958 / sg);
        Validity = new TemperatureRange(Temperature.FromFahrenheit(0).Kelvin, Temperature.FromFahrenheit(700).Kelvin);
        Description = FormattableString.Invariant($"petroleum liquid SG {sg:0.###}, Watson K {k:0.##} (Kesler–Lee cp)");
    }

    /// <summary>Builds the model from API gravity: SG = 141.5/(°API + 131.5).</summary>
    public static KeslerLeePetroleumLiquid FromApiGravity(double apiGravity, double watsonK) =>
        new(141.5 / (apiGravity + 131.5), watsonK);

    public double SpecificGravity { get; }
    public double WatsonK { get; }
    public string Description { get; }
    public TemperatureRange Validity { get; }

    public double SpecificHeat(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        var tr = temperature.Kelvin * 1.8;
        return (_a1 + _a2 * tr + _a3 * tr * tr) * BtuPerPoundFahrenheit;
    }

    public double SpecificEnthalpy(Temperature temperature, Pressure pressure)
    {
        FluidModelGuard.Check(this, temperature);
        // dh = cp dT_K = cp dT_R / 1.8
        var tr = temperature.Kelvin * 1.8;
        return (_a1 * tr + _a2 * tr * tr / 2 + _a3 * tr * tr * tr / 3) * BtuPerPoundFahrenheit / 1.8;
    }
}
