namespace FoulingWatch.Core.Exchangers;

/// <summary>LMTD correction factors by the closed forms of Bowman, Mueller &amp; Nagle.</summary>
public static class BowmanMuellerNagle
{
    /// <summary>LMTD correction factor F for one shell pass and an even number of tube passes.</summary>
    /// <remarks>Source: Bowman, Mueller &amp; Nagle (1940), Trans. ASME 62, 283–294:
    /// F = [√(R²+1)/(R−1)]·ln[(1−P)/(1−PR)] / ln{[2 − P(R+1−√(R²+1))]/[2 − P(R+1+√(R²+1))]};
    /// R = 1 takes the analytic limit F = [P√2/(1−P)] / ln{[2 − P(2−√2)]/[2 − P(2+√2)]}.
    /// Defined for 0 &lt; P &lt; P_max(R) = 2/(R+1+√(R²+1)). Returns false beyond P_max.</remarks>
    public static bool TryOneShellEvenTubePasses(double p, double r, out double f)
    {
        f = double.NaN;
        if (!(p > 0) || !(r >= 0) || double.IsInfinity(r)) return false;
        var s = Math.Sqrt(r * r + 1);
        if (p >= OneShellPassEvenTubePasses.MaximumP(r)) return false;
        var denominator = Math.Log((2 - p * (r + 1 - s)) / (2 - p * (r + 1 + s)));
        if (Math.Abs(r - 1) < 1e-6)
            f = p * Math.Sqrt(2) / (1 - p) / denominator;
        else
            f = s / (r - 1) * Math.Log((1 - p) / (1 - p * r)) / denominator;
        return double.IsFinite(f) && f > 0;
    }
}
