using System.Globalization;
using System.Text;
using FoulingWatch.Reporting.Results;

namespace FoulingWatch.Cli.Tests;

/// <summary>The time series' own nine-digit formatter against the runtime's "G9" (the reference: the same bytes).</summary>
public sealed class NineDigitsTests
{
    private static void Same(double v)
    {
        Span<byte> buffer = stackalloc byte[40];
        var n = NineDigits.Write(v, buffer);
        var expected = v.ToString("G9", CultureInfo.InvariantCulture);
        var actual = Encoding.UTF8.GetString(buffer[..n]);
        if (actual != expected) Assert.Fail($"{v:R}: runtime \"{expected}\", ours \"{actual}\"");
    }

    [Fact]
    public void Random_values_over_every_decade_format_as_the_runtime_does()
    {
        var random = new Random(20261203);
        for (var i = 0; i < 2_000_000; i++)
        {
            var decade = random.Next(-14, 12);
            var v = (1 + 9 * random.NextDouble()) * Math.Pow(10, decade);
            Same(random.Next(2) == 0 ? v : -v);
        }
        // values as the time series holds them: short decimals, parsed
        for (var i = 0; i < 500_000; i++)
        {
            var text = (random.Next(-100_000, 100_000) / 1000.0).ToString(CultureInfo.InvariantCulture);
            Same(double.Parse(text, CultureInfo.InvariantCulture));
        }
    }

    [Fact]
    public void Ties_decade_edges_and_special_values_format_as_the_runtime_does()
    {
        // exact ties at the ninth digit are representable only with a half unit at 10^8..10^9
        for (var k = 0; k < 2000; k++) { Same(100_000_000.5 + k); Same(999_998_000.5 + k); Same(123_456_788.5 + 2 * k); }
        foreach (var edge in new[] { 1e-12, 1e-11, 1e-10, 1e-9, 1e-8, 1e-7, 1e-6, 1e-5, 1e-4, 1e-3, 0.01, 0.1, 1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9 })
            for (var step = -50; step <= 50; step++)
            {
                var v = edge;
                for (var j = 0; j < Math.Abs(step); j++) v = step < 0 ? Math.BitDecrement(v) : Math.BitIncrement(v);
                Same(v);
                Same(edge * (1 + step * 1e-9));
                Same(-v);
            }
        foreach (var v in new[] { 0.0, -0.0, 999_999_999.4, 999_999_999.5, 999_999_999.6, 9.999999995, 0.000099999999951, 1e300, 1e-300,
                     5e-324, double.MaxValue, double.Epsilon, 123456789, 0.5, 2.5, 1.5e-5, 9.9999999951e-6, 9.999999995e-12,
                     1.0000000049e-11, 2.00925424e-5, 6.59495332E-05, 1.23456789e-10 })
            Same(v);
    }
}
