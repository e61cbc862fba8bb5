using MathNet.Numerics.LinearAlgebra;

namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>One calibration sample: 1/U, the two flow regressors, days since the cleaning, and the weight 1/σ².</summary>
public readonly record struct WilsonRow(double Y, double Xt, double Xs, double Days, double W);

/// <summary>Calibrates a clean-U model from samples taken just after a cleaning by weighted least squares of 1/U on
/// ṁ_t^−n_t, ṁ_s^−n_s and the days since the cleaning (Wilson plot with a fouling term).</summary>
/// <remarks>
/// Source: Wilson, E. E. (1915), "A basis for rational design of heat transfer apparatus", Trans. ASME 37, 47–82; the
/// two-stream form as in Shah &amp; Sekulić (2003) §7.5 (from memory). Deposits grow while the calibration runs: a term
/// d·τ (τ days since the cleaning, d ≥ 0) takes them, so the intercept a is the clean value at the cleaning instead of
/// the window's mean fouling spread over the film terms. The intercept (wall and any constant resistance) cannot be
/// below a minimum (the wall resistance, or zero): a fit below it is redone with a fixed
/// there (a bounded least-squares solution, the bound active). Refusals: fewer than 20 samples; both regressors
/// varying by less than 3 % (coefficient of variation) cannot separate the sides; regressors correlated beyond 0.95
/// cannot separate them either; a negative side coefficient is unphysical. Then a single constant clean 1/U (with the
/// fouling term) is used, and the report says so.
/// </remarks>
public static class WilsonPlot
{
    public const int MinimumSamples = 20;
    public const double MinimumVariation = 0.03;
    public const double MaximumCorrelation = 0.95;

    /// <param name="scalings">Property factors already applied to the rows' regressors (a property-corrected baseline),
    /// carried into the clean-U model; default none.</param>
    public static (ICleanUModel?, CleanReferenceReport) Fit(IReadOnlyList<WilsonRow> rows, double nt, double ns,
        DateTimeOffset start, DateTimeOffset end, double minimumIntercept = 0,
        (FilmPropertyScaling? Tube, FilmPropertyScaling? Shell) scalings = default)
    {
        var corrected = scalings.Tube is not null || scalings.Shell is not null ? ", property-corrected" : "";
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
            var fit = Solve(rows, useT, useS, minimumIntercept);
            if (fit.B >= 0 && fit.C >= 0)
            {
                var sides = useT && useS ? "both sides" : useT ? "tube side only (shell flow steady)" : "shell side only (tube flow steady)";
                var description = FormattableString.Invariant(
                    $"baseline (Wilson plot, {sides}{corrected}, fouling term {fit.D:G3} m2K/W per day{(fit.Bounded ? ", intercept held at its physical bound" : "")}) from {rows.Count} samples {start:yyyy-MM-dd} to {end:yyyy-MM-dd}: 1/U = {fit.A:G4} + {fit.B:G4}·ṁt^-{nt:0.##} + {fit.C:G4}·ṁs^-{ns:0.##}");
                return (new WilsonPlotCleanU(fit.A, fit.B, fit.C, nt, ns, description, fit.Covariance, scalings),
                    new CleanReferenceReport("baseline", description, null, rows.Count, fit.Residual, start, end));
            }
            note = "the fit gave a negative side resistance, which is unphysical";
        }
        var constant = Solve(rows, false, false, minimumIntercept);
        var text = FormattableString.Invariant($"baseline: single constant clean U = {1 / constant.A:0.#} W/m2K (at the cleaning, from {rows.Count} samples {start:yyyy-MM-dd} to {end:yyyy-MM-dd}, fouling term {constant.D:G3} m2K/W per day) because {note}; Rf then also moves with flow");
        return (new WilsonPlotCleanU(constant.A, 0, 0, nt, ns, text, constant.Covariance),
            new CleanReferenceReport("baseline-constant", text, null, rows.Count, constant.Residual, start, end));
    }

    /// <summary>A weighted fit of 1/U = a + b·Xt + c·Xs + d·τ with the chosen side columns; d &lt; 0 (no fouling seen)
    /// drops the fouling term, a below its bound fixes a there.</summary>
    public static (double A, double B, double C, double D, bool Bounded, double[,] Covariance, double Residual) Solve(
        IReadOnlyList<WilsonRow> rows, bool useT, bool useS, double minimumIntercept)
    {
        var useDays = Cv(rows.Select(r => r.Days + 1)) > 0;
        var fit = Attempt(rows, useT, useS, useDays, null);
        if (fit.D < 0) fit = Attempt(rows, useT, useS, useDays = false, null);
        if (fit.A >= minimumIntercept) return fit;
        fit = Attempt(rows, useT, useS, useDays, minimumIntercept);
        return fit.D < 0 ? Attempt(rows, useT, useS, false, minimumIntercept) : fit;
    }

    private static (double A, double B, double C, double D, bool Bounded, double[,] Covariance, double Residual) Attempt(
        IReadOnlyList<WilsonRow> rows, bool useT, bool useS, bool useDays, double? fixedIntercept)
    {
        var columns = new List<(int Slot, Func<WilsonRow, double> Value)>();
        if (fixedIntercept is null) columns.Add((0, _ => 1.0));
        if (useT) columns.Add((1, r => r.Xt));
        if (useS) columns.Add((2, r => r.Xs));
        if (useDays) columns.Add((3, r => r.Days));
        var offset = fixedIntercept ?? 0;
        var x = Matrix<double>.Build.Dense(rows.Count, columns.Count, (i, j) => columns[j].Value(rows[i]) * Math.Sqrt(rows[i].W));
        var y = Vector<double>.Build.Dense(rows.Count, i => (rows[i].Y - offset) * Math.Sqrt(rows[i].W));
        var beta = x.QR().Solve(y);
        var p = new double[4];
        p[0] = offset;
        for (var j = 0; j < columns.Count; j++) p[columns[j].Slot] = beta[j];
        var residual = Math.Sqrt(rows.Sum(r => Math.Pow(r.Y - (p[0] + p[1] * r.Xt + p[2] * r.Xs + p[3] * r.Days), 2)) /
                                 Math.Max(1, rows.Count - columns.Count));
        var slots = columns.Select(c => c.Slot).ToList();
        var covariance = Covariance(x, y - x * beta, slots.Where(slot => slot < 3).ToList(), slots);
        return (p[0], p[1], p[2], p[3], fixedIntercept is not null, covariance, residual);
    }

    /// <summary>Covariance of (a, b, c) as s²·(XᵀX)⁻¹ of the weighted fit, widened for serially correlated residuals;
    /// parameters not fitted (or held at a bound) stay zero.</summary>
    private static double[,] Covariance(Matrix<double> x, Vector<double> residual, List<int> keep, List<int> slots)
    {
        var dof = Math.Max(1, x.RowCount - x.ColumnCount);
        var s2 = residual.DotProduct(residual) / dof;
        var inverse = (x.TransposeThisAndMultiply(x)).Inverse() * (s2 * SerialInflation(residual.ToArray()));
        var result = new double[3, 3];
        for (var i = 0; i < slots.Count; i++)
        for (var j = 0; j < slots.Count; j++)
            if (keep.Contains(slots[i]) && keep.Contains(slots[j]))
                result[slots[i], slots[j]] = double.IsFinite(inverse[i, j]) ? inverse[i, j] : 0;
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
