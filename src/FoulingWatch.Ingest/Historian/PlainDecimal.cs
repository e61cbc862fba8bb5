using System.Runtime.CompilerServices;
using System.Runtime.InteropServices;

namespace FoulingWatch.Ingest.Historian;

/// <summary>
/// The quick route for the numbers historians write almost always: an optional sign, digits and at most one
/// decimal separator ("-12.50", "101,3"), with no exponent, blanks or group separators.
/// </summary>
/// <remarks>
/// Clinger's fast path (W. D. Clinger, "How to read floating point numbers accurately", PLDI 1990): when the
/// decimal digits form an integer m ≤ 2^53 and the number of fraction digits k ≤ 22, both m and 10^k are
/// exact doubles, so the single IEEE division m / 10^k is the correctly rounded value of the decimal, the
/// same bits a correctly rounding parser gives. Anything else is declined and goes to the general parser.
/// </remarks>
public static class PlainDecimal
{
    // Constant data (no static constructor to check on each use). 10^0 = 1 makes the integer case the same division.
    private static ReadOnlySpan<double> PowersOfTen =>
    [
        1e0, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16,
        1e17, 1e18, 1e19,
    ];

    private const ulong ExactLimit = 1UL << 53;

    /// <summary>A sign, 19 digits and a separator: no longer text is a plain decimal the quick route takes.</summary>
    private const int LongestPlain = 21;

    /// <summary>Parses all of <paramref name="s"/>, or returns false (the caller then tries the general parser).</summary>
    public static unsafe bool TryParse(ReadOnlySpan<byte> s, byte decimalSeparator, out double value)
    {
        value = 0;
        if (s.Length > LongestPlain) return false;
        // The text copied with a terminator after it (a byte that is neither a digit nor a separator).
        var copy = stackalloc byte[LongestPlain + 1];
        s.CopyTo(new Span<byte>(copy, LongestPlain));
        copy[s.Length] = 0;
        var after = ParseTerminated(copy, decimalSeparator, out value);
        return after == copy + s.Length;
    }

    /// <summary>
    /// Reads the plain decimal at <paramref name="p"/>, up to the first byte that is neither a digit nor the (first)
    /// decimal separator, and returns where it stopped; null when that prefix is not a plain decimal the quick route
    /// takes. A field is a plain decimal exactly when it stops at the field's end, so a record can be read field by
    /// field without finding the field ends first.
    /// </summary>
    /// <remarks>
    /// The text must be followed, within readable memory, by a byte that is neither a digit nor the separator (a
    /// delimiter or a line end): the loops stop on it, so they need no length checks. A word-at-a-time (SWAR) variant
    /// was measured slower than these byte loops on the benchmark machine, so the loops stay.
    /// </remarks>
    [MethodImpl(MethodImplOptions.AggressiveInlining)]
    internal static unsafe byte* ParseTerminated(byte* p, byte decimalSeparator, out double value)
    {
        var negative = *p == (byte)'-';
        if (negative || *p == (byte)'+') p++;
        var digitsStart = p;
        ulong mantissa = 0;
        ulong d; // 64 bits wide, so the digit needs no widening before it is added
        // Past 19 digits the mantissa wraps; such text is declined below by its digit count.
        while ((d = (ulong)*p - '0') <= 9)
        {
            mantissa = mantissa * 10 + d;
            p++;
        }
        long fractionDigits = 0, separators = 0;
        if (*p == decimalSeparator)
        {
            var fractionStart = ++p;
            while ((d = (ulong)*p - '0') <= 9)
            {
                mantissa = mantissa * 10 + d;
                p++;
            }
            fractionDigits = p - fractionStart;
            separators = 1;
        }
        var digits = p - digitsStart - separators;
        // 1 to 19 digits always fit in 64 bits (and then fractionDigits ≤ 19); more, or a mantissa beyond 2^53, are
        // left to the general parser.
        if ((ulong)(digits - 1) > 18 || mantissa > ExactLimit)
        {
            value = 0;
            return null;
        }
        var magnitude = mantissa / Unsafe.Add(ref MemoryMarshal.GetReference(PowersOfTen), (nint)fractionDigits);
        value = negative ? -magnitude : magnitude;
        return p;
    }
}
