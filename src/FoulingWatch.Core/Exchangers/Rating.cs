using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>Outcome of rating an exchanger: duty in W and the two outlet temperatures.</summary>
public readonly record struct RatingResult(double Duty, Temperature HotOutlet, Temperature ColdOutlet, double Effectiveness, double Ntu);

/// <summary>Rating by effectiveness-NTU: outlets and duty from UA, capacity rates and inlets.</summary>
public static class Rating
{
    /// <summary>Rates an exchanger of conductance UA (W/K) with capacity rates C_hot, C_cold (W/K; +∞ for a phase-change side).</summary>
    /// <remarks>Q = ε·C_min·(T_h,in − t_c,in) (Kays &amp; London). Outlets from Q and each side's C (a phase-change side stays at its inlet temperature).</remarks>
    public static RatingResult Rate(FlowArrangement arrangement, double ua, double hotCapacityRate, double coldCapacityRate,
        Temperature hotInlet, Temperature coldInlet)
    {
        if (!(ua >= 0) || double.IsInfinity(ua)) throw new QuantityOutOfRangeException("UA", ua, "W/K", "0 or above, finite");
        if (!(hotCapacityRate > 0)) throw new QuantityOutOfRangeException("hot capacity rate", hotCapacityRate, "W/K", "above 0");
        if (!(coldCapacityRate > 0)) throw new QuantityOutOfRangeException("cold capacity rate", coldCapacityRate, "W/K", "above 0");
        if (double.IsInfinity(hotCapacityRate) && double.IsInfinity(coldCapacityRate))
            throw new QuantityOutOfRangeException("capacity rates", hotCapacityRate, "W/K", "at most one side changing phase");
        var span = hotInlet.Kelvin - coldInlet.Kelvin;
        var minSide = hotCapacityRate <= coldCapacityRate ? StreamSide.Hot : StreamSide.Cold;
        var cmin = Math.Min(hotCapacityRate, coldCapacityRate);
        var cmax = Math.Max(hotCapacityRate, coldCapacityRate);
        var cr = double.IsInfinity(cmax) ? 0.0 : cmin / cmax;
        var ntu = ua / cmin;
        var eps = arrangement.Effectiveness(ntu, cr, minSide);
        var q = eps * cmin * span;
        var hotOut = double.IsInfinity(hotCapacityRate) ? hotInlet : Temperature.FromKelvin(hotInlet.Kelvin - q / hotCapacityRate);
        var coldOut = double.IsInfinity(coldCapacityRate) ? coldInlet : Temperature.FromKelvin(coldInlet.Kelvin + q / coldCapacityRate);
        return new RatingResult(q, hotOut, coldOut, eps, ntu);
    }
}
