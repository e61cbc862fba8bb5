using System.Globalization;

namespace FoulingWatch.Reporting.Results;

/// <summary>
/// Formats a double as "G9" does (nine significant digits, invariant culture), straight into UTF-8 bytes, by exact
/// integer arithmetic: the double is m·2^q exactly, so the nine digits are ⌊m·10^s / 2^−q⌉ computed in 128 bits, with
/// the remainder deciding the rounding (a tie to even, as the runtime's formatter does). Only the fixed
/// notation range (10^−4 ≤ |v| &lt; 10^9) takes this route; zero, the scientific range and any case the route does not
/// cover go to the runtime's formatter. The bytes are the runtime's, value for value (checked against it in the tests
/// on millions of values, ties and decade edges); it is several times faster, which matters for time series of
/// millions of cells.
/// </summary>
public static class NineDigits
{
    private static readonly ulong[] Pow10 = Enumerable.Range(0, 20).Select(i => (ulong)Math.Pow(10, i)).ToArray();

    /// <summary>10^k as doubles for k = −4…9 (index k + 4).</summary>
    private static readonly double[] Decades = Enumerable.Range(-4, 14).Select(k => double.Parse($"1e{k}", CultureInfo.InvariantCulture)).ToArray();

    /// <summary>Writes <paramref name="v"/> (finite) as "G9" would; returns the number of bytes (needs up to 32).</summary>
    public static int Write(double v, Span<byte> target)
    {
        var a = Math.Abs(v);
        if (a >= 1e-4 && a < 1e9)
        {
            var n = Fixed(a, target[(v < 0 ? 1 : 0)..]);
            if (n > 0)
            {
                if (v < 0) target[0] = (byte)'-';
                return n + (v < 0 ? 1 : 0);
            }
        }
        return v.TryFormat(target, out var written, "G9", CultureInfo.InvariantCulture)
            ? written : throw new InvalidOperationException("a number did not fit its cell buffer");
    }

    /// <summary>Fixed notation of a positive value in [1e-4, 1e9); 0 when the route does not apply.</summary>
    private static int Fixed(double a, Span<byte> target)
    {
        var bits = BitConverter.DoubleToInt64Bits(a);
        var exponent = (int)((bits >> 52) & 0x7FF);
        if (exponent == 0) return 0;
        var m = (ulong)(bits & 0xFFFFFFFFFFFFFL) | (1UL << 52);
        var q = exponent - 1075; // a = m·2^q, q in about [−69, −23] here
        if (q >= 0) return 0;
        // decimal exponent e with 10^e ≤ a < 10^(e+1), estimated from the binary exponent (log10 2 ≈ 0.30103) and the
        // table; off by one at most, which the exact comparison below corrects
        var e = (int)Math.Floor((exponent - 1023) * 0.30102999566398120);
        if (e + 1 < Decades.Length - 4 && e + 1 >= -4 && a >= Decades[e + 1 + 4]) e++;
        for (var attempt = 0; attempt < 3; attempt++)
        {
            var s = 8 - e; // nine digits: N = round(a·10^s) in [10^8, 10^9)
            if (s < 0 || s > 19) return 0;
            var product = (UInt128)m * Pow10[s];
            var shift = -q;
            if (shift >= 127) return 0;
            var whole = product >> shift;
            var remainder = product - (whole << shift);
            var half = (UInt128)1 << (shift - 1);
            if (whole < Pow10[8]) { e--; continue; }
            if (whole >= Pow10[9]) { e++; continue; }
            var digits = (ulong)whole;
            if (remainder > half || (remainder == half && (digits & 1) == 1)) digits++; // a tie rounds to even
            if (digits == Pow10[9]) { digits = Pow10[8]; e++; }
            if (e > 8 || e < -4) return 0; // scientific notation: the runtime's route
            return Place(digits, e, target);
        }
        return 0;
    }

    /// <summary>Writes nine digits (10^8 ≤ digits &lt; 10^9) with the decimal point after the first e + 1 (e in [−4, 8]),
    /// trailing zeros of the fraction dropped.</summary>
    private static int Place(ulong digits, int e, Span<byte> target)
    {
        var n = 0;
        if (e < 0)
        {
            target[n++] = (byte)'0';
            target[n++] = (byte)'.';
            for (var i = -1; i > e; i--) target[n++] = (byte)'0';
            return n + Digits(Trim(digits, out _), target[n..]);
        }
        var scale = Pow10[8 - e];
        n = Digits(digits / scale, target);
        var fraction = digits % scale;
        if (fraction == 0) return n;
        target[n++] = (byte)'.';
        var width = 8 - e;
        fraction = Trim(fraction, out var dropped);
        width -= dropped;
        for (var i = width - 1; i >= 0; i--) { target[n + i] = (byte)('0' + fraction % 10); fraction /= 10; }
        return n + width;
    }

    private static ulong Trim(ulong value, out int dropped)
    {
        dropped = 0;
        while (value % 10 == 0) { value /= 10; dropped++; }
        return value;
    }

    /// <summary>A positive integer's decimal digits.</summary>
    private static int Digits(ulong value, Span<byte> target)
    {
        var count = 1;
        while (count < 20 && value >= Pow10[count]) count++;
        for (var i = count - 1; i >= 0; i--) { target[i] = (byte)('0' + value % 10); value /= 10; }
        return count;
    }
}
