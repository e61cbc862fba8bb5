namespace FoulingWatch.Analysis.Trends;

/// <summary>
/// Weighted nonlinear least squares for the few-parameter fouling laws: minimises Σ wᵢ·(yᵢ − fᵢ(p))² within box bounds.
/// </summary>
/// <remarks>
/// Levenberg–Marquardt with Marquardt's diagonal scaling, (JᵀWJ + μ·diag(JᵀWJ))·δ = JᵀW·r (Marquardt, J. SIAM 11 (1963)
/// 431), and Nielsen's damping update, μ ← μ·max(1/3, 1 − (2ρ − 1)³) after a step whose gain ratio ρ is positive, μ ← μ·ν,
/// ν ← 2ν after a rejected one (Madsen, Nielsen &amp; Tingleff, Methods for Non-Linear Least Squares Problems, DTU 2004,
/// §3.2; from memory). Bounds are kept by projecting each trial point onto the box. Written for k ≤ 8 parameters and
/// arrays reused across iterations: the general library solver allocated matrices on every step and took nine tenths of
/// the trend stage's time. Checked on NIST StRD Misra1a from both certified start points (`LeastSquaresTests`).
/// </remarks>
public sealed class LevenbergMarquardt
{
    /// <summary>Writes the model values f(p) (length n) and the Jacobian ∂f/∂p (row-major n × k) for parameters p.</summary>
    public delegate void Evaluate(ReadOnlySpan<double> p, Span<double> values, Span<double> jacobian);

    public int MaximumIterations { get; init; } = 2000;

    /// <summary>Stop when every step component is below this share of its parameter (plus the same absolute amount).</summary>
    public double StepTolerance { get; init; } = 1e-12;

    /// <summary>Stop when an accepted step lowers the sum of squares by less than this share of it.</summary>
    public double CostTolerance { get; init; } = 1e-15;

    public int Iterations { get; private set; }

    /// <summary>Minimises from a start (changed in place to the solution); false when no finite evaluation was possible.</summary>
    public bool Minimise(Evaluate evaluate, double[] y, double[] w, double[] p, double[]? lower, double[]? upper)
    {
        int n = y.Length, k = p.Length;
        var f = new double[n];
        var jac = new double[n * k];
        var fTrial = new double[n];
        var jacTrial = new double[n * k];
        var a = new double[k * k];
        var g = new double[k];
        var trial = new double[k];
        var delta = new double[k];
        var rhs = new double[k];
        var system = new double[k * k];
        Project(p, lower, upper);
        evaluate(p, f, jac);
        var cost = Cost(y, w, f);
        if (!double.IsFinite(cost)) return false;
        Normal(jac, y, w, f, n, k, a, g);
        var mu = 1e-3;
        var nu = 2.0;
        for (Iterations = 0; Iterations < MaximumIterations; Iterations++)
        {
            for (var i = 0; i < k * k; i++) system[i] = a[i];
            for (var j = 0; j < k; j++)
            {
                system[j * k + j] += mu * Math.Max(a[j * k + j], 1e-300);
                rhs[j] = g[j];
            }
            // A parameter on its bound whose descent direction points out of the box is held there (active set): the
            // others then step as the reduced problem asks instead of zigzagging against the projection.
            for (var j = 0; j < k; j++)
            {
                var atLower = lower is not null && p[j] <= lower[j] && g[j] <= 0;
                var atUpper = upper is not null && p[j] >= upper[j] && g[j] >= 0;
                if (!atLower && !atUpper) continue;
                for (var l = 0; l < k; l++) system[j * k + l] = system[l * k + j] = 0;
                system[j * k + j] = 1;
                rhs[j] = 0;
            }
            if (!Cholesky.Solve(system, rhs, delta, k))
            {
                mu *= nu;
                nu *= 2;
                if (!double.IsFinite(mu) || mu > 1e300) return true;
                continue;
            }
            for (var j = 0; j < k; j++) trial[j] = p[j] + delta[j];
            Project(trial, lower, upper);
            var small = true;
            for (var j = 0; j < k; j++)
                if (Math.Abs(trial[j] - p[j]) > StepTolerance * (Math.Abs(p[j]) + StepTolerance)) small = false;
            if (small) return true;
            evaluate(trial, fTrial, jacTrial);
            var trialCost = Cost(y, w, fTrial);
            var predicted = 0.0;
            for (var j = 0; j < k; j++)
            {
                var step = trial[j] - p[j];
                predicted += step * (mu * Math.Max(a[j * k + j], 1e-300) * step + g[j]);
            }
            var gain = double.IsFinite(trialCost) && predicted > 0 ? (cost - trialCost) / predicted : -1;
            if (gain > 0)
            {
                var decrease = cost - trialCost;
                Array.Copy(trial, p, k);
                cost = trialCost;
                (f, fTrial) = (fTrial, f);
                (jac, jacTrial) = (jacTrial, jac);
                Normal(jac, y, w, f, n, k, a, g);
                mu *= Math.Max(1.0 / 3, 1 - Math.Pow(2 * gain - 1, 3));
                nu = 2;
                if (decrease <= CostTolerance * cost) return true;
            }
            else
            {
                mu *= nu;
                nu *= 2;
                if (!double.IsFinite(mu) || mu > 1e300) return true;
            }
        }
        return true;
    }

    private static double Cost(double[] y, double[] w, double[] f)
    {
        var s = 0.0;
        for (var i = 0; i < y.Length; i++)
        {
            var r = y[i] - f[i];
            s += w[i] * r * r;
        }
        return s;
    }

    /// <summary>A = JᵀWJ and g = JᵀW(y − f).</summary>
    private static void Normal(double[] jac, double[] y, double[] w, double[] f, int n, int k, double[] a, double[] g)
    {
        Array.Clear(a);
        Array.Clear(g);
        for (var i = 0; i < n; i++)
        {
            var row = i * k;
            var r = w[i] * (y[i] - f[i]);
            for (var j = 0; j < k; j++)
            {
                var wj = w[i] * jac[row + j];
                g[j] += jac[row + j] * r;
                for (var l = 0; l <= j; l++) a[j * k + l] += wj * jac[row + l];
            }
        }
        for (var j = 0; j < k; j++)
        for (var l = 0; l < j; l++) a[l * k + j] = a[j * k + l];
    }

    private static void Project(double[] p, double[]? lower, double[]? upper)
    {
        for (var j = 0; j < p.Length; j++)
        {
            if (lower is not null && p[j] < lower[j]) p[j] = lower[j];
            if (upper is not null && p[j] > upper[j]) p[j] = upper[j];
        }
    }
}

/// <summary>Solves a small symmetric positive definite system in place by Cholesky factorisation.</summary>
internal static class Cholesky
{
    /// <summary>Solves M·x = b (M row-major k × k, overwritten by its factor); false when M is not positive definite.</summary>
    public static bool Solve(double[] m, double[] b, double[] x, int k)
    {
        for (var j = 0; j < k; j++)
        {
            var d = m[j * k + j];
            for (var l = 0; l < j; l++) d -= m[j * k + l] * m[j * k + l];
            if (!(d > 0) || !double.IsFinite(d)) return false;
            var root = Math.Sqrt(d);
            m[j * k + j] = root;
            for (var i = j + 1; i < k; i++)
            {
                var s = m[i * k + j];
                for (var l = 0; l < j; l++) s -= m[i * k + l] * m[j * k + l];
                m[i * k + j] = s / root;
            }
        }
        for (var i = 0; i < k; i++)
        {
            var s = b[i];
            for (var l = 0; l < i; l++) s -= m[i * k + l] * x[l];
            x[i] = s / m[i * k + i];
        }
        for (var i = k - 1; i >= 0; i--)
        {
            var s = x[i];
            for (var l = i + 1; l < k; l++) s -= m[l * k + i] * x[l];
            x[i] = s / m[i * k + i];
        }
        return true;
    }
}
