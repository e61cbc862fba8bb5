using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>Calibrates a clean-U model from samples taken just after a cleaning by weighted least squares of 1/U on ṁ_t^−n_t and ṁ_s^−n_s (Wilson plot).</summary>
/// <remarks>
/// Source: Wilson, E. E. (1915), "A basis for rational design of heat transfer apparatus", Trans. ASME 37, 47–82; the
/// two-stream form as in Shah &amp; Sekulić (2003) §7.5 (from memory). Refusals: fewer than 20 samples; both
/// regressors varying by less than 3 % (coefficient of variation) cannot separate the sides; regressors correlated
/// beyond 0.95 cannot separate them either; a negative side coefficient is unphysical. Then a single constant
/// 1/U (mean of the period) is used, and the report says so.
/// </remarks>
public static class WilsonPlot
{
    public const int MinimumSamples = 20;
    public const double MinimumVariation = 0.03;
    public const double MaximumCorrelation = 0.95;

    public static (ICleanUModel?, CleanReferenceReport) Fit(IReadOnlyList<(double Y, double Xt, double Xs, double W)> rows, double nt, double ns,
        DateTimeOffset start, DateTimeOffset end)
    {
        if (rows.Count < MinimumSamples)
            return (null, new CleanReferenceReport("baseline", "Wilson-plot baseline", $"only {rows.Count} usable samples between {start:yyyy-MM-dd} and {end:yyyy-MM-dd}; at least {MinimumSamples} are needed (lengthen clean.duration or set clean.start)", rows.Count, null, start, end));
        var cvT = Cv(rows.Select(r => r.Xt));
        var cvS = Cv(rows.Select(r => r.Xs));
        var corr = Correlation(rows.Select(r => r.Xt).ToArray(), rows.Select(r => r.Xs).ToArray());
        var useT = cvT >= MinimumVariation;
        var useS = cvS >= MinimumVariation;
        string? note = null;
        if (useT && useS && Math.Abs(corr) > MaximumCorrelation)
        {
            note = FormattableString.Invariant($"tube and shell flows moved together (correlation {corr:0.###}), so the sides cannot be separated");
            useT = useS = false;
        }
        if (!useT && !useS && note is null)
            note = FormattableString.Invariant($"flows varied too little to separate the sides (variation {cvT:P1} tube, {cvS:P1} shell; {MinimumVariation:P0} needed)");

        if (useT || useS)
        {
            var columns = new List<Func<(double Y, double Xt, double Xs, double W), double>> { _ => 1.0 };
            if (useT) columns.Add(r => r.Xt);
            if (useS) columns.Add(r => r.Xs);
            var x = Matrix<double>.Build.Dense(rows.Count, columns.Count, (i, j) => columns[j](rows[i]) * Math.Sqrt(rows[i].W));
            var y = Vector<double>.Build.Dense(rows.Count, i => rows[i].Y * Math.Sqrt(rows[i].W));
            var beta = x.QR().Solve(y);
            var a = beta[0];
            var b = useT ? beta[1] : 0;
            var c = useS ? beta[useT ? 2 : 1] : 0;
            if (b >= 0 && c >= 0 && a > -0.5 * rows.Average(r => r.Y))
            {
                var resid = Math.Sqrt(rows.Sum(r => Math.Pow(r.Y - (a + b * r.Xt + c * r.Xs), 2)) / Math.Max(1, rows.Count - columns.Count));
                var sides = useT && useS ? "both sides" : useT ? "tube side only (shell flow steady)" : "shell side only (tube flow steady)";
                var description = FormattableString.Invariant($"baseline (Wilson plot, {sides}) from {rows.Count} samples {start:yyyy-MM-dd} to {end:yyyy-MM-dd}: 1/U = {a:G4} + {b:G4}·ṁt^-{nt:0.##} + {c:G4}·ṁs^-{ns:0.##}");
                var map = new List<int> { 0 };
                if (useT) map.Add(1);
                if (useS) map.Add(2);
                var covariance = Covariance(x, y - x * beta, map);
                return (new WilsonPlotCleanU(a, b, c, nt, ns, description, covariance),
                    new CleanReferenceReport("baseline", description, null, rows.Count, resid, start, end));
            }
            note = "the fit gave a negative side resistance, which is unphysical";
        }
        var mean = rows.Sum(r => r.W * r.Y) / rows.Sum(r => r.W);
        var sd = Math.Sqrt(rows.Sum(r => Math.Pow(r.Y - mean, 2)) / Math.Max(1, rows.Count - 1));
        var text = FormattableString.Invariant($"baseline: single constant clean U = {1 / mean:0.#} W/m2K (mean of {rows.Count} samples {start:yyyy-MM-dd} to {end:yyyy-MM-dd}) because {note}; Rf then also moves with flow");
        var meanCovariance = new double[3, 3];
        meanCovariance[0, 0] = sd * sd / rows.Count * SerialInflation(rows.Select(r => r.Y - mean).ToArray());
        return (new WilsonPlotCleanU(mean, 0, 0, nt, ns, text, meanCovariance),
            new CleanReferenceReport("baseline-constant", text, null, rows.Count, sd, start, end));
    }

    /// <summary>Covariance of (a, b, c) as s²·(XᵀX)⁻¹ of the weighted fit, widened for serially correlated residuals;
    /// columns not fitted stay zero.</summary>
    private static double[,] Covariance(Matrix<double> x, Vector<double> residual, List<int> map)
    {
        var dof = Math.Max(1, x.RowCount - x.ColumnCount);
        var s2 = residual.DotProduct(residual) / dof;
        var inverse = (x.TransposeThisAndMultiply(x)).Inverse() * (s2 * SerialInflation(residual.ToArray()));
        var result = new double[3, 3];
        for (var i = 0; i < map.Count; i++)
        for (var j = 0; j < map.Count; j++) result[map[i], map[j]] = double.IsFinite(inverse[i, j]) ? inverse[i, j] : 0;
        return result;
    }

    /// <summary>Variance factor (1 + ρ)/(1 − ρ) for residuals with lag-1 autocorrelation ρ (samples in time order),
    /// clamped to [1, 100].</summary>
    /// <remarks>The variance of a mean of an AR(1) series is σ²/n·(1 + ρ)/(1 − ρ) for large n: the "effective sample size"
    /// n' = n(1 − ρ)/(1 + ρ) (e.g. Wilks, Statistical Methods in the Atmospheric Sciences, ch. 5; from memory). Samples
    /// minutes apart after a cleaning are far from independent, so the plain covariance would be much too small.</remarks>
    public static double SerialInflation(double[] residual)
    {
        double num = 0, den = 0;
        for (var i = 0; i < residual.Length; i++)
        {
            den += residual[i] * residual[i];
            if (i > 0) num += residual[i] * residual[i - 1];
        }
        var rho = den > 0 ? Math.Clamp(num / den, 0, 0.99) : 0;
        return Math.Min(100, (1 + rho) / (1 - rho));
    }

    private static double Cv(IEnumerable<double> values)
    {
        var v = values.ToArray();
        var mean = v.Average();
        var sd = Math.Sqrt(v.Sum(x => (x - mean) * (x - mean)) / Math.Max(1, v.Length - 1));
        return mean == 0 ? 0 : sd / Math.Abs(mean);
    }

    private static double Correlation(double[] a, double[] b)
    {
        var ma = a.Average();
        var mb = b.Average();
        double sab = 0, saa = 0, sbb = 0;
        for (var i = 0; i < a.Length; i++)
        {
            sab += (a[i] - ma) * (b[i] - mb);
            saa += (a[i] - ma) * (a[i] - ma);
            sbb += (b[i] - mb) * (b[i] - mb);
        }
        return saa > 0 && sbb > 0 ? sab / Math.Sqrt(saa * sbb) : 0;
    }
}
