using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>Log-mean temperature difference.</summary>
public static class Lmtd
{
    /// <summary>LMTD in K of two terminal differences, (ΔT₁ − ΔT₂)/ln(ΔT₁/ΔT₂); equal differences give that difference. False when either is not positive.</summary>
    public static bool TryFromTerminalDifferences(double dt1, double dt2, out double lmtd)
    {
        lmtd = double.NaN;
        if (!(dt1 > 0) || !(dt2 > 0) || double.IsInfinity(dt1) || double.IsInfinity(dt2)) return false;
        var ratio = dt1 / dt2;
        // Near ratio 1 the quotient is 0/0; the series (ΔT₁ΔT₂)^½·(1 + (ln r)²/24) is exact to 1e-16 there.
        if (Math.Abs(ratio - 1) < 1e-4)
        {
            var lr = Math.Log(ratio);
            lmtd = Math.Sqrt(dt1 * dt2) * (1 + lr * lr / 24);
        }
        else lmtd = (dt1 - dt2) / Math.Log(ratio);
        return true;
    }

    /// <summary>LMTD in K; throws <see cref="QuantityOutOfRangeException"/> for a non-positive terminal difference.</summary>
    public static double FromTerminalDifferences(double dt1, double dt2) =>
        TryFromTerminalDifferences(dt1, dt2, out var l) ? l
            : throw new QuantityOutOfRangeException("terminal temperature difference", Math.Min(dt1, dt2), "K", "above 0 K at both ends");

    /// <summary>Counterflow LMTD from the four terminal temperatures: ΔT₁ = T_h,in − t_c,out, ΔT₂ = T_h,out − t_c,in.</summary>
    public static bool TryCounterflow(Temperature hotIn, Temperature hotOut, Temperature coldIn, Temperature coldOut, out double lmtd) =>
        TryFromTerminalDifferences(hotIn.Kelvin - coldOut.Kelvin, hotOut.Kelvin - coldIn.Kelvin, out lmtd);

    /// <summary>Parallel-flow LMTD: ΔT₁ = T_h,in − t_c,in, ΔT₂ = T_h,out − t_c,out.</summary>
    public static bool TryParallel(Temperature hotIn, Temperature hotOut, Temperature coldIn, Temperature coldOut, out double lmtd) =>
        TryFromTerminalDifferences(hotIn.Kelvin - coldIn.Kelvin, hotOut.Kelvin - coldOut.Kelvin, out lmtd);
}

/// <summary>Thermal-effectiveness parameters P and R from terminal temperatures, referred to the cold stream.</summary>
public readonly record struct TemperatureEffectiveness(double P, double R)
{
    /// <summary>P = (t_out − t_in)/(T_in − t_in), R = (T_in − T_out)/(t_out − t_in). Null when the cold stream does not warm or the inlets do not differ.</summary>
    public static TemperatureEffectiveness? FromTemperatures(Temperature hotIn, Temperature hotOut, Temperature coldIn, Temperature coldOut)
    {
        var span = hotIn.Kelvin - coldIn.Kelvin;
        var rise = coldOut.Kelvin - coldIn.Kelvin;
        if (!(span > 0) || !(rise > 0)) return null;
        return new TemperatureEffectiveness(rise / span, (hotIn.Kelvin - hotOut.Kelvin) / rise);
    }
}
