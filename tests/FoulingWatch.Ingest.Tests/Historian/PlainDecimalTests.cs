using System.Globalization;
using System.Text;
using FoulingWatch.Ingest.Historian;

namespace FoulingWatch.Ingest.Tests.Historian;

/// <summary>
/// Reference: IEEE 754 correctly rounded decimal-to-binary conversion, as .NET's double.Parse performs it (correctly
/// rounded since .NET Core 3.0). The quick route must give the very same bits, or decline and leave the text to the
/// general parser; it must never accept text that is not a plain decimal.
/// </summary>
public class PlainDecimalTests
{
    private static void AssertSameAsRuntime(string text, byte separator)
    {
        var accepted = PlainDecimal.TryParse(Encoding.ASCII.GetBytes(text), separator, out var value);
        var invariant = separator == (byte)',' ? text.Replace(',', '\u0001').Replace('.', ',').Replace('\u0001', '.') : text;
        var runtime = double.TryParse(invariant, NumberStyles.AllowLeadingSign | NumberStyles.AllowDecimalPoint, CultureInfo.InvariantCulture, out var expected);
        if (accepted)
        {
            Assert.True(runtime, $"'{text}' was accepted but is not a plain decimal");
            Assert.True(BitConverter.DoubleToInt64Bits(expected) == BitConverter.DoubleToInt64Bits(value), $"'{text}': {value:R} vs {expected:R}");
        }
        // Read as the first field of a record: the prefix ends exactly at the delimiter when, and only when, the field is taken.
        var used = Prefix(Encoding.ASCII.GetBytes(text + ";7;x\n"), separator, out var prefixValue);
        Assert.True(accepted == (used == text.Length), $"'{text};7;x': prefix of {used} bytes, field taken: {accepted}");
        if (accepted) Assert.Equal(BitConverter.DoubleToInt64Bits(value), BitConverter.DoubleToInt64Bits(prefixValue));
    }

    /// <summary>How many bytes the plain decimal at the start of <paramref name="line"/> takes; -1 when declined.</summary>
    private static unsafe int Prefix(byte[] line, byte separator, out double value)
    {
        fixed (byte* start = line)
        {
            var after = PlainDecimal.ParseTerminated(start, separator, out value);
            return after == null ? -1 : (int)(after - start);
        }
    }

    [Theory]
    [InlineData("105.23", 105.23)]
    [InlineData("-0.5", -0.5)]
    [InlineData("+7", 7.0)]
    [InlineData("12345678", 12345678.0)]
    [InlineData("1234567.8", 1234567.8)]
    [InlineData(".5", 0.5)]
    [InlineData("5.", 5.0)]
    [InlineData("0.1", 0.1)]
    [InlineData("0.000000000000000001", 1e-18)] // 19 digits, 21 characters: the longest text the quick route takes
    [InlineData("-1234567890.123456789", -1234567890.123456789)] // 19 digits beyond 2^53: declined
    [InlineData("9007199254740993", 9007199254740992.0)] // 2^53 + 1: beyond the exact mantissas, declined (the general parser rounds it)
    public void Reads_plain_decimals_to_the_correctly_rounded_double(string text, double expected)
    {
        var bytes = Encoding.ASCII.GetBytes(text);
        if (PlainDecimal.TryParse(bytes, (byte)'.', out var value)) Assert.Equal(BitConverter.DoubleToInt64Bits(expected), BitConverter.DoubleToInt64Bits(value));
        else Assert.True(double.Parse(text, CultureInfo.InvariantCulture) == expected && text.Replace(".", "").TrimStart('-', '+').Length > 15,
            $"'{text}' was declined though it is a short plain decimal");
        AssertSameAsRuntime(text, (byte)'.');
    }

    [Theory]
    [InlineData("")]
    [InlineData("-")]
    [InlineData(".")]
    [InlineData("1.2.3")]
    [InlineData("1e5")]
    [InlineData(" 12")]
    [InlineData("12 ")]
    [InlineData("no reading")]
    [InlineData("1,5")]
    [InlineData("--1")]
    [InlineData("12:30")]
    [InlineData("1/2")]
    [InlineData("NaN")]
    public void Declines_what_is_not_a_plain_decimal(string text) =>
        Assert.False(PlainDecimal.TryParse(Encoding.ASCII.GetBytes(text), (byte)'.', out _));

    [Fact]
    public void Decimal_comma_reads_like_the_point_in_the_invariant_culture()
    {
        Assert.True(PlainDecimal.TryParse("101,35"u8, (byte)',', out var v));
        Assert.Equal(101.35, v);
        Assert.False(PlainDecimal.TryParse("101.35"u8, (byte)',', out _));
    }

    [Fact]
    public void Agrees_bit_for_bit_with_the_runtime_parser_on_200000_seeded_strings()
    {
        // Random plain decimals of 1 to 20 characters (both routes inside the quick path, short and long), and random
        // strings over digits, separators, signs and a few other bytes (which must be declined or read the same).
        var rng = new Random(20261202);
        const string alphabet = "0123456789012345678901234567890123456789.,-+eE x";
        var accepted = 0;
        for (var i = 0; i < 200_000; i++)
        {
            string text;
            if (i % 2 == 0)
            {
                var intDigits = rng.Next(0, 12);
                var fracDigits = rng.Next(0, 10);
                var sb = new StringBuilder();
                if (rng.Next(4) == 0) sb.Append('-');
                for (var k = 0; k < intDigits; k++) sb.Append((char)('0' + rng.Next(10)));
                if (fracDigits > 0 || rng.Next(3) == 0) sb.Append('.');
                for (var k = 0; k < fracDigits; k++) sb.Append((char)('0' + rng.Next(10)));
                text = sb.ToString();
            }
            else text = new string(Enumerable.Range(0, rng.Next(1, 12)).Select(_ => alphabet[rng.Next(alphabet.Length)]).ToArray());
            AssertSameAsRuntime(text, (byte)'.');
            AssertSameAsRuntime(text, (byte)',');
            if (PlainDecimal.TryParse(Encoding.ASCII.GetBytes(text), (byte)'.', out _)) accepted++;
        }
        // The quick route must actually be taken for most plain decimals (a route that declines everything would pass the rest).
        Assert.InRange(accepted, 120_000, 150_000);
    }
}
