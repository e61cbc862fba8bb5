namespace FoulingWatch.Core.Exchangers;

internal static class Precise
{
    /// <summary>eˣ − 1 without cancellation for small x (Kahan's trick: (u − 1)·x/ln u with u = eˣ); .NET's double.ExpM1 is computed as Exp(x) − 1.</summary>
    public static double ExpM1(double x)
    {
        var u = Math.Exp(x);
        if (u == 1.0) return x;
        var um1 = u - 1.0;
        if (um1 == -1.0) return -1.0;
        if (double.IsInfinity(u)) return u;
        return um1 * x / Math.Log(u);
    }
}
