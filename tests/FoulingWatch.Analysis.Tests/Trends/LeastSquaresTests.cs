using System.Globalization;
using FoulingWatch.Analysis.Trends;

namespace FoulingWatch.Analysis.Tests.Trends;

public class LeastSquaresTests
{
    private static (double[] X, double[] Y) Load(string name)
    {
        var rows = File.ReadLines(Path.Combine(AppContext.BaseDirectory, "data", "nist", name))
            .Where(l => l.Length > 0 && l[0] != '#')
            .Select(l => l.Split(' ', StringSplitOptions.RemoveEmptyEntries).Select(v => double.Parse(v, CultureInfo.InvariantCulture)).ToArray()).ToList();
        return (rows.Select(r => r[1]).ToArray(), rows.Select(r => r[0]).ToArray());
    }

    private static void Digits(double certified, double actual, double relative) =>
        Assert.True(Math.Abs(actual - certified) <= relative * Math.Abs(certified), $"certified {certified:G11}, got {actual:G11}");

    /// <summary>The asymptotic fouling form with R0 = 0 and τ = 1/b2, which is NIST's Misra1a model y = b1·(1 − e^(−b2·x)).</summary>
    private sealed class Misra1aForm : FoulingModel
    {
        private readonly AsymptoticFouling _asymptotic = new();
        public override string Key => "misra1a";
        public override string Formula => "y = b1*(1-exp(-b2*x))";
        public override string Source => "NIST StRD Misra1a";
        public override string[] ParameterNames => ["b1", "b2"];
        public override double Value(ReadOnlySpan<double> p, double t) => _asymptotic.Value([0, p[0], 1 / p[1]], t);
        public override void Gradient(ReadOnlySpan<double> p, double t, Span<double> g)
        {
            var e = Math.Exp(-p[1] * t);
            g[0] = 1 - e;
            g[1] = p[0] * t * e;
        }
        public override double Rate(ReadOnlySpan<double> p, double t) => p[0] * p[1] * Math.Exp(-p[1] * t);
        public override IEnumerable<double[]> StartingPoints(double[] t, double[] y) => [];
        public override double CrossingTime(ReadOnlySpan<double> p, double limit) => _asymptotic.CrossingTime([0, p[0], 1 / p[1]], limit);
    }

    // Source: NIST StRD nonlinear regression, Misra1a (certified values to 11 digits). Both certified start points must
    // reach the certified parameters, standard deviations and residual sum of squares; tolerance 1e-8 relative
    // (the certified values carry 11 significant digits; an LM solution agrees to about 9).
    [Theory]
    [InlineData(500.0, 1e-4)]
    [InlineData(250.0, 5e-4)]
    public void Misra1a_converges_to_the_certified_values_from_both_start_points(double b1, double b2)
    {
        var (x, y) = Load("Misra1a.txt");
        var fit = LeastSquares.Fit(new Misra1aForm(), x, y, x.Select(_ => 1.0).ToArray(), [[b1, b2]]);
        Assert.NotNull(fit);
        Digits(2.3894212918E+02, fit!.Parameters[0], 1e-8);
        Digits(5.5015643181E-04, fit.Parameters[1], 1e-8);
        Digits(2.7070075241E+00, fit.StandardErrors[0], 1e-6);
        Digits(7.2668688436E-06, fit.StandardErrors[1], 1e-6);
        Digits(1.2455138894E-01, fit.WeightedResidualSumOfSquares, 1e-8);
        Digits(1.0187876330E-01, fit.ResidualStandardDeviation, 1e-8);
        Assert.Equal(12, fit.DegreesOfFreedom);
    }

    // Source: NIST StRD linear regression, Norris (certified values to 15 digits); tolerance 1e-10 relative.
    [Fact]
    public void Norris_linear_fit_matches_the_certified_values()
    {
        var (x, y) = Load("Norris.txt");
        var fit = LeastSquares.Fit(new LinearFouling(), x, y, x.Select(_ => 1.0).ToArray());
        Assert.NotNull(fit);
        Digits(-0.262323073774029, fit!.Parameters[0], 1e-10);
        Digits(1.00211681802045, fit.Parameters[1], 1e-10);
        Digits(0.232818234301152, fit.StandardErrors[0], 1e-9);
        Digits(0.429796848199937E-03, fit.StandardErrors[1], 1e-9);
        Digits(0.884796396144373, fit.ResidualStandardDeviation, 1e-10);
    }
}
