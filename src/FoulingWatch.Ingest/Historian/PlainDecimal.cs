using System.Runtime.CompilerServices;

namespace FoulingWatch.Ingest.Historian;

/// <summary>
/// The quick route for the numbers historians write almost always: an optional sign, digits and at most one
/// decimal separator ("-12.50", "101,3"), with no exponent, blanks or group separators.
/// </summary>
/// <remarks>
/// Clinger's fast path (W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990): when the
/// decimal digits form an integer m ≤ 2^53 and the number of fraction digits k ≤ 22, both m and 10^k are
/// exact doubles, so the single IEEE division m / 10^k is the correctly rounded value of the decimal, the
/// same bits a correctly rounding parser gives. Anything else returns false and goes to the general parser.
/// </remarks>
public static class PlainDecimal
{
    private static readonly double[] PowersOfTen =
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
        1e17, 1e18, 1e19, 1e20, 1e21, 1e22,
    ];

    private const ulong ExactLimit = 1UL << 53;

    /// <summary>Parses all of <paramref name="s"/>, or returns false (the caller then tries the general parser).</summary>
    /// <remarks>A word-at-a-time (SWAR) variant was measured slower than this loop on the benchmark machine, so the loop stays.</remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static bool TryParse(ReadOnlySpan<byte> s, byte decimalSeparator, out double value) =>
        ParsePrefix(s, decimalSeparator, out value) == s.Length;

    /// <summary>
    /// Reads the plain decimal at the start of <paramref name="s"/>, up to the first byte that is neither a digit nor
    /// the (first) decimal separator, and returns how many bytes it took; -1 when that prefix is not a plain decimal
    /// the quick route takes. A field is a plain decimal exactly when its prefix is the whole field, so a record can be
    /// read field by field without finding the field ends first.
    /// </summary>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    public static int ParsePrefix(ReadOnlySpan<byte> s, byte decimalSeparator, out double value)
    {
        value = 0;
        var i = 0;
        var negative = false;
        if (s.Length > 0 && (s[0] == (byte)'-' || s[0] == (byte)'+'))
        {
            negative = s[0] == (byte)'-';
            i = 1;
        }
        var digitsStart = i;
        ulong mantissa = 0;
        var fractionStart = -1;
        for (; i < s.Length; i++)
        {
            var d = (uint)(s[i] - (byte)'0');
            // Past 19 digits the mantissa wraps; such text is declined below by its digit count.
            if (d <= 9) mantissa = mantissa * 10 + d;
            else if (s[i] == decimalSeparator && fractionStart < 0) fractionStart = i + 1;
            else break;
        }
        var fractionDigits = fractionStart < 0 ? 0 : i - fractionStart;
        var digits = i - digitsStart - (fractionStart < 0 ? 0 : 1);
        // 19 digits always fit in 64 bits; more, or a mantissa beyond 2^53, are left to the general parser.
        if (digits == 0 || digits > 19 || mantissa > ExactLimit || fractionDigits >= PowersOfTen.Length) return -1;
        var magnitude = fractionDigits == 0 ? (double)mantissa : mantissa / PowersOfTen[fractionDigits];
        value = negative ? -magnitude : magnitude;
        return i;
    }
}
