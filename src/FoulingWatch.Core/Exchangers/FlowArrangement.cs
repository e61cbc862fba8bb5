using FoulingWatch.Core.Quantities;

namespace FoulingWatch.Core.Exchangers;

/// <summary>The hot or the cold stream.</summary>
public enum StreamSide { Hot, Cold }

/// <summary>
/// A flow arrangement: effectiveness ε(NTU, Cr), its inverse NTU(ε, Cr), and the LMTD correction factor F(P, R).
/// </summary>
/// <remarks>
/// Definitions (Kays &amp; London, Compact Heat Exchangers, 3rd ed.; Shah &amp; Sekulić, Fundamentals of Heat
/// Exchanger Design, 2003): NTU = UA/C_min, Cr = C_min/C_max (0 ≤ Cr ≤ 1; 0 for a phase-change side),
/// ε = Q/(C_min·(T_h,in − t_c,in)). P = (t_out − t_in)/(T_in − t_in) and R = (T_in − T_out)/(t_out − t_in) refer P
/// to the cold stream. For every arrangement F = NTU_counterflow(ε, Cr)/NTU(ε, Cr) at the same ε and Cr, which
/// is the definition of F restated (Shah &amp; Sekulić §3.7); arrangements with a published closed form use it.
/// </remarks>
public abstract class FlowArrangement
{
    /// <summary>Cr below this is treated as exactly 0 (one side isothermal).</summary>
    protected const double ZeroCr = 1e-12;

    /// <summary>Name in the trade's words, for reports.</summary>
    public abstract string Name { get; }

    /// <summary>Effectiveness ε in [0, 1) for NTU ≥ 0 and 0 ≤ Cr ≤ 1; <paramref name="minSide"/> matters only for arrangements with one mixed stream.</summary>
    public double Effectiveness(double ntu, double cr, StreamSide minSide = StreamSide.Hot)
    {
        CheckNtu(ntu);
        CheckCr(cr);
        if (ntu == 0) return 0;
        return cr < ZeroCr ? -Precise.ExpM1(-ntu) : EffectivenessCore(ntu, cr, minSide);
    }

    protected abstract double EffectivenessCore(double ntu, double cr, StreamSide minSide);

    /// <summary>The largest effectiveness the arrangement reaches as NTU → ∞ at this Cr.</summary>
    public virtual double MaximumEffectiveness(double cr, StreamSide minSide = StreamSide.Hot) => 1.0;

    /// <summary>NTU for an effectiveness; false when ε is at or beyond the arrangement's maximum.</summary>
    public bool TryNtu(double effectiveness, double cr, out double ntu, StreamSide minSide = StreamSide.Hot)
    {
        CheckCr(cr);
        ntu = double.NaN;
        if (!(effectiveness >= 0)) throw new QuantityOutOfRangeException("effectiveness", effectiveness, "", "0 to the arrangement's maximum (below 1)");
        if (effectiveness == 0) { ntu = 0; return true; }
        if (effectiveness >= MaximumEffectiveness(cr, minSide) * (1 - 1e-14)) return false;
        if (cr < ZeroCr) { ntu = -Math.Log(1 - effectiveness); return true; }
        ntu = NtuCore(effectiveness, cr, minSide);
        return double.IsFinite(ntu) && ntu >= 0;
    }

    /// <summary>NTU for an effectiveness; throws <see cref="QuantityOutOfRangeException"/> beyond the arrangement's maximum.</summary>
    public double Ntu(double effectiveness, double cr, StreamSide minSide = StreamSide.Hot) =>
        TryNtu(effectiveness, cr, out var ntu, minSide) ? ntu
            : throw new QuantityOutOfRangeException($"effectiveness ({Name})", effectiveness, "",
                FormattableString.Invariant($"0 to below {MaximumEffectiveness(cr, minSide):0.######} at Cr = {cr:0.####}"));

    /// <summary>Default inverse: bisection on the monotone ε(NTU), to 1e-13 relative.</summary>
    protected virtual double NtuCore(double effectiveness, double cr, StreamSide minSide)
    {
        double lo = 0, hi = 1;
        while (EffectivenessCore(hi, cr, minSide) < effectiveness)
        {
            lo = hi;
            hi *= 2;
            if (hi > 1e6) return double.NaN;
        }
        for (var i = 0; i < 200 && hi - lo > 1e-14 * hi; i++)
        {
            var mid = 0.5 * (lo + hi);
            if (EffectivenessCore(mid, cr, minSide) < effectiveness) lo = mid; else hi = mid;
        }
        return 0.5 * (lo + hi);
    }

    /// <summary>LMTD correction factor F in (0, 1] for P and R referred to the cold stream; false outside the arrangement's domain.</summary>
    public virtual bool TryLmtdCorrectionFactor(double p, double r, out double f)
    {
        f = double.NaN;
        if (!(p > 0 && p < 1) || !(r >= 0) || double.IsInfinity(r)) return false;
        // Cmin is the cold stream when R = Cc/Ch ≤ 1.
        var (eps, cr, minSide) = r <= 1 ? (p, r, StreamSide.Cold) : (p * r, 1 / r, StreamSide.Hot);
        if (!(eps < 1)) return false;
        if (!TryNtu(eps, cr, out var ntu, minSide) || ntu <= 0) return false;
        f = Counterflow.NtuCounterflow(eps, cr) / ntu;
        return f > 0 && f <= 1 + 1e-12;
    }

    /// <summary>LMTD correction factor F; throws <see cref="QuantityOutOfRangeException"/> naming the domain when undefined.</summary>
    public double LmtdCorrectionFactor(double p, double r) =>
        TryLmtdCorrectionFactor(p, r, out var f) ? Math.Min(f, 1.0)
            : throw new QuantityOutOfRangeException($"P ({Name}, R = {r:G4})", p, "", DomainText(r));

    /// <summary>Words describing where F is defined, for messages.</summary>
    protected virtual string DomainText(double r) => "0 < P < 1 with a defined NTU for the arrangement";

    private static void CheckNtu(double ntu)
    {
        if (!(ntu >= 0) || double.IsInfinity(ntu)) throw new QuantityOutOfRangeException("NTU", ntu, "", "0 or above, finite");
    }

    private static void CheckCr(double cr)
    {
        if (!(cr >= 0 && cr <= 1 + 1e-12)) throw new QuantityOutOfRangeException("capacity-rate ratio Cr", cr, "", "0 to 1");
    }
}

/// <summary>Pure counterflow. ε = [1 − e^(−NTU(1−Cr))]/[1 − Cr·e^(−NTU(1−Cr))]; Cr = 1: ε = NTU/(1+NTU).</summary>
public sealed class Counterflow : FlowArrangement
{
    public static readonly Counterflow Instance = new();
    public override string Name => "counterflow";

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide)
    {
        if (Math.Abs(1 - cr) < 1e-9) return ntu / (1 + ntu);
        var e = Math.Exp(-ntu * (1 - cr));
        return (1 - e) / (1 - cr * e);
    }

    protected override double NtuCore(double eps, double cr, StreamSide minSide) => NtuCounterflow(eps, cr);

    /// <summary>NTU = ln[(1 − ε·Cr)/(1 − ε)]/(1 − Cr); Cr = 1: ε/(1 − ε); Cr = 0: −ln(1 − ε).</summary>
    public static double NtuCounterflow(double eps, double cr)
    {
        if (cr < ZeroCr) return -Math.Log(1 - eps);
        if (Math.Abs(1 - cr) < 1e-9) return eps / (1 - eps);
        return Math.Log((1 - eps * cr) / (1 - eps)) / (1 - cr);
    }

    public override bool TryLmtdCorrectionFactor(double p, double r, out double f)
    {
        f = 1.0;
        return p > 0 && p < 1 && r >= 0 && (r <= 1 || p * r < 1);
    }
}

/// <summary>Plate exchanger, treated as counterflow (the usual assumption for many-plate units in series-counter-current arrangement).</summary>
public sealed class PlateAsCounterflow : FlowArrangement
{
    public override string Name => "plate (treated as counterflow)";
    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide) => Counterflow.Instance.Effectiveness(ntu, cr, minSide);
    protected override double NtuCore(double eps, double cr, StreamSide minSide) => Counterflow.NtuCounterflow(eps, cr);
    public override bool TryLmtdCorrectionFactor(double p, double r, out double f) => Counterflow.Instance.TryLmtdCorrectionFactor(p, r, out f);
}

/// <summary>Parallel (co-current) flow. ε = [1 − e^(−NTU(1+Cr))]/(1 + Cr), at most 1/(1 + Cr).</summary>
public sealed class ParallelFlow : FlowArrangement
{
    public override string Name => "parallel flow";

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide) =>
        -Precise.ExpM1(-ntu * (1 + cr)) / (1 + cr);

    public override double MaximumEffectiveness(double cr, StreamSide minSide = StreamSide.Hot) => 1 / (1 + cr);

    protected override double NtuCore(double eps, double cr, StreamSide minSide) => -Math.Log(1 - eps * (1 + cr)) / (1 + cr);

    protected override string DomainText(double r) => "P < 1/(1 + R) (outlets cannot cross in parallel flow)";
}

/// <summary>Shell-and-tube, one shell pass and 2, 4, … tube passes (TEMA E shell, "1-2N").</summary>
/// <remarks>
/// ε₁ = 2/{1 + Cr + S·[1 + e^(−NTU·S)]/[1 − e^(−NTU·S)]}, S = √(1 + Cr²) (Kays &amp; London).
/// F by Bowman, Mueller &amp; Nagle (1940), Trans. ASME 62, 283–294, defined for P &lt; P_max = 2/(R + 1 + √(R² + 1)).
/// </remarks>
public sealed class OneShellPassEvenTubePasses : FlowArrangement
{
    public OneShellPassEvenTubePasses(int tubePasses = 2)
    {
        if (tubePasses < 2 || tubePasses % 2 != 0)
            throw new QuantityOutOfRangeException("tube passes", tubePasses, "", "an even number, 2 or more");
        TubePasses = tubePasses;
    }

    public int TubePasses { get; }
    public override string Name => $"shell-and-tube 1-{TubePasses}";

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide) => Epsilon1(ntu, cr);

    internal static double Epsilon1(double ntu, double cr)
    {
        var s = Math.Sqrt(1 + cr * cr);
        var e = Math.Exp(-ntu * s);
        return 2 / (1 + cr + s * (1 + e) / (1 - e));
    }

    public override double MaximumEffectiveness(double cr, StreamSide minSide = StreamSide.Hot) => 2 / (1 + cr + Math.Sqrt(1 + cr * cr));

    protected override double NtuCore(double eps, double cr, StreamSide minSide) => Ntu1(eps, cr);

    /// <summary>NTU = −ln[(E − 1)/(E + 1)]/S with E = [2/ε − (1 + Cr)]/S.</summary>
    internal static double Ntu1(double eps, double cr)
    {
        var s = Math.Sqrt(1 + cr * cr);
        var e = (2 / eps - (1 + cr)) / s;
        return -Math.Log((e - 1) / (e + 1)) / s;
    }

    /// <summary>P_max(R) = 2/(R + 1 + √(R² + 1)), where F → 0.</summary>
    public static double MaximumP(double r) => 2 / (r + 1 + Math.Sqrt(r * r + 1));

    public override bool TryLmtdCorrectionFactor(double p, double r, out double f) => BowmanMuellerNagle.TryOneShellEvenTubePasses(p, r, out f);

    protected override string DomainText(double r) => FormattableString.Invariant($"0 < P < P_max = {MaximumP(r):0.######} (Bowman–Mueller–Nagle)");
}

/// <summary>N shells of the 1-2N type in series, overall counterflow between shells; each shell gets NTU/N.</summary>
/// <remarks>ε = {[(1 − ε₁Cr)/(1 − ε₁)]ᴺ − 1}/{[(1 − ε₁Cr)/(1 − ε₁)]ᴺ − Cr}; Cr = 1: ε = Nε₁/[1 + (N − 1)ε₁] (Kays &amp; London).</remarks>
public sealed class ShellsInSeries : FlowArrangement
{
    public ShellsInSeries(int shells, int tubePassesPerShell = 2)
    {
        if (shells < 1) throw new QuantityOutOfRangeException("shells in series", shells, "", "1 or more");
        if (tubePassesPerShell < 2 || tubePassesPerShell % 2 != 0)
            throw new QuantityOutOfRangeException("tube passes per shell", tubePassesPerShell, "", "an even number, 2 or more");
        Shells = shells;
        TubePassesPerShell = tubePassesPerShell;
    }

    public int Shells { get; }
    public int TubePassesPerShell { get; }
    public override string Name => $"{Shells} shells in series, 1-{TubePassesPerShell} each";

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide)
    {
        var e1 = OneShellPassEvenTubePasses.Epsilon1(ntu / Shells, cr);
        if (Math.Abs(1 - cr) < 1e-9) return Shells * e1 / (1 + (Shells - 1) * e1);
        var x = Math.Pow((1 - e1 * cr) / (1 - e1), Shells);
        return (x - 1) / (x - cr);
    }

    public override double MaximumEffectiveness(double cr, StreamSide minSide = StreamSide.Hot)
    {
        var e1 = new OneShellPassEvenTubePasses().MaximumEffectiveness(cr);
        if (Math.Abs(1 - cr) < 1e-9) return Shells * e1 / (1 + (Shells - 1) * e1);
        var x = Math.Pow((1 - e1 * cr) / (1 - e1), Shells);
        return (x - 1) / (x - cr);
    }

    protected override double NtuCore(double eps, double cr, StreamSide minSide)
    {
        // Invert the series relation for the one-shell effectiveness, then the 1-2 relation.
        double e1;
        if (Math.Abs(1 - cr) < 1e-9) e1 = eps / (Shells - eps * (Shells - 1));
        else
        {
            var f = Math.Pow((eps * cr - 1) / (eps - 1), 1.0 / Shells);
            e1 = (f - 1) / (f - cr);
        }
        return Shells * OneShellPassEvenTubePasses.Ntu1(e1, cr);
    }
}

/// <summary>Single-pass crossflow, both streams unmixed, by the approximate relation ε = 1 − exp{(1/Cr)·NTU^0.22·[exp(−Cr·NTU^0.78) − 1]} (Incropera et al., Table 11.3).</summary>
/// <remarks>NTU from ε by bisection: the relation has no closed inverse.</remarks>
public sealed class CrossflowBothUnmixed : FlowArrangement
{
    public override string Name => "crossflow, both streams unmixed";

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide) =>
        1 - Math.Exp(Math.Pow(ntu, 0.22) / cr * Precise.ExpM1(-cr * Math.Pow(ntu, 0.78)));
}

/// <summary>Single-pass crossflow with one stream mixed (named) and the other unmixed (Kays &amp; London).</summary>
/// <remarks>
/// C_max mixed, C_min unmixed: ε = (1/Cr)·{1 − exp[−Cr·(1 − e^(−NTU))]}, NTU = −ln[1 + ln(1 − ε·Cr)/Cr].
/// C_min mixed, C_max unmixed: ε = 1 − exp{−(1/Cr)·[1 − e^(−Cr·NTU)]}, NTU = −ln[1 + Cr·ln(1 − ε)]/Cr.
/// </remarks>
public sealed class CrossflowOneMixed : FlowArrangement
{
    public CrossflowOneMixed(StreamSide mixedSide) => MixedSide = mixedSide;

    public StreamSide MixedSide { get; }
    public override string Name => $"crossflow, {(MixedSide == StreamSide.Hot ? "hot" : "cold")} stream mixed";

    private bool MinIsMixed(StreamSide minSide) => minSide == MixedSide;

    protected override double EffectivenessCore(double ntu, double cr, StreamSide minSide) =>
        MinIsMixed(minSide)
            ? 1 - Math.Exp(Precise.ExpM1(-cr * ntu) / cr)
            : -Precise.ExpM1(cr * Precise.ExpM1(-ntu)) / cr;

    public override double MaximumEffectiveness(double cr, StreamSide minSide = StreamSide.Hot) =>
        cr < ZeroCr ? 1.0 : MinIsMixed(minSide) ? 1 - Math.Exp(-1 / cr) : -Precise.ExpM1(-cr) / cr;

    protected override double NtuCore(double eps, double cr, StreamSide minSide) =>
        MinIsMixed(minSide)
            ? -Math.Log(1 + cr * Math.Log(1 - eps)) / cr
            : -Math.Log(1 + Math.Log(1 - eps * cr) / cr);
}
