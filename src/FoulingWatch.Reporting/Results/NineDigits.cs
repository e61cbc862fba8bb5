using System.Globalization;

namespace FoulingWatch.Reporting.Results;

/// <summary>
/// Formats a double as "G9" does (nine significant digits, invariant culture), straight into UTF-8 bytes, by exact
/// integer arithmetic: the double is m·2^q exactly, so the nine digits are ⌊m·10^s / 2^−q⌉ computed in 128 bits, with
/// the remainder deciding the rounding (a tie to even, as the runtime's formatter does). The fixed notation range
/// (10^−4 ≤ |v| &lt; 10^9) and the small scientific one (10^−11 ≤ |v| &lt; 10^−4, "1.5E-05": fouling resistances
/// and their uncertainties in m²·K/W) take this route; zero, other magnitudes and any case the route does not cover go
/// to the runtime's formatter. The bytes are the runtime's, value for value (checked against it in the tests
/// on millions of values, ties and decade edges); it is several times faster, which matters for time series of
/// millions of cells.
/// </summary>
public static class NineDigits
{
    private static readonly ulong[] Pow10 = Enumerable.Range(0, 20).Select(i => (ulong)Math.Pow(10, i)).ToArray();

    /// <summary>10^k as doubles for k = −11…9 (index k + Lowest).</summary>
    private static readonly double[] Decades =
        Enumerable.Range(-Lowest, Lowest + 10).Select(k => double.Parse($"1e{k}", CultureInfo.InvariantCulture)).ToArray();

    /// <summary>The smallest decade this route formats is 10^−Lowest (its nine digits need 10^(8 + Lowest) &lt; 2^64).</summary>
    private const int Lowest = 11;

    /// <summary>Writes <paramref name="v"/> (finite) as "G9" would; returns the number of bytes (needs up to 32).</summary>
    public static int Write(double v, Span<byte> target)
    {
        var a = Math.Abs(v);
        if (a >= 1e-11 && a < 1e9)
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

    /// <summary>A positive value in [1e-11, 1e9) as "G9" writes it (fixed from 1e-4, scientific below); 0 when the route
    /// does not apply.</summary>
    private static int Fixed(double a, Span<byte> target)
    {
        var bits = BitConverter.DoubleToInt64Bits(a);
        var exponent = (int)((bits >> 52) & 0x7FF);
        if (exponent == 0) return 0;
        var m = (ulong)(bits & 0xFFFFFFFFFFFFFL) | (1UL << 52);
        var shift = 1075 - exponent; // a = m·2^−shift; shift in about [23, 69] here
        if (shift <= 0 || shift >= 127) return 0;
        // decimal exponent e with 10^e ≤ a < 10^(e+1), estimated from the binary exponent (log10 2 ≈ 0.30103) and the
        // table; off by one at most, which the exact comparison below corrects
        var e = ((exponent - 1023) * 78913) >> 18; // ⌊E·log10 2⌋ for |E| < 1024
        if (e + 1 < Decades.Length - Lowest && e + 1 >= -Lowest && a >= Decades[e + 1 + Lowest]) e++;
        for (var attempt = 0; attempt < 3; attempt++)
        {
            var s = 8 - e; // nine digits: N = round(a·10^s) in [10^8, 10^9)
            if (s < 0 || s > 19) return 0;
            // m·10^s < 2^53·2^64 in 128 bits (hardware multiply), then split at the binary point
            var high = Math.BigMul(m, Pow10[s], out var low);
            if (!Split(high, low, shift, out var whole, out var above, out var tie)) return 0;
            if (whole < Pow10[8]) { e--; continue; }
            if (whole >= Pow10[9]) { e++; continue; }
            var digits = whole;
            if (above || (tie && (digits & 1) == 1)) digits++; // a tie rounds to even
            if (digits == Pow10[9]) { digits = Pow10[8]; e++; }
            if (e > 8 || e < -Lowest) return 0; // the runtime's route
            return e < -4 ? Scientific(digits, e, target) : Place(digits, e, target);
        }
        return 0;
    }

    /// <summary>The integer part of (high:low)/2^shift (false when it does not fit 64 bits) and whether the remainder is
    /// above or exactly at one half.</summary>
    private static bool Split(ulong high, ulong low, int shift, out ulong whole, out bool above, out bool tie)
    {
        ulong remHigh, remLow, halfHigh, halfLow;
        if (shift < 64)
        {
            if (high >> shift != 0) { (whole, above, tie) = (0, false, false); return false; }
            whole = (high << (64 - shift)) | (low >> shift);
            (remHigh, remLow) = (0, low & ((1UL << shift) - 1));
            (halfHigh, halfLow) = (0, 1UL << (shift - 1));
        }
        else
        {
            var up = shift - 64;
            whole = up == 0 ? high : high >> up;
            (remHigh, remLow) = (up == 0 ? 0 : high & ((1UL << up) - 1), low);
            (halfHigh, halfLow) = up == 0 ? (0UL, 1UL << 63) : (1UL << (up - 1), 0UL);
        }
        above = remHigh > halfHigh || (remHigh == halfHigh && remLow > halfLow);
        tie = remHigh == halfHigh && remLow == halfLow;
        return true;
    }

    /// <summary>"00" … "99".</summary>
    private static readonly byte[] Pairs =
        Enumerable.Range(0, 100).SelectMany(i => new[] { (byte)('0' + i / 10), (byte)('0' + i % 10) }).ToArray();

    /// <summary>Writes nine digits (10^8 ≤ digits &lt; 10^9) with the decimal point after the first e + 1 (e in [−4, 8]),
    /// trailing zeros of the fraction dropped.</summary>
    private static int Place(ulong digits, int e, Span<byte> target)
    {
        Span<byte> d = stackalloc byte[10];
        Digits(digits, d);
        var last = 8;
        while (last > 0 && d[last] == '0' && last > e) last--;
        var n = 0;
        if (e < 0)
        {
            target[n++] = (byte)'0';
            target[n++] = (byte)'.';
            for (var i = -1; i > e; i--) target[n++] = (byte)'0';
            d[..(last + 1)].CopyTo(target[n..]);
            return n + last + 1;
        }
        d[..(e + 1)].CopyTo(target);
        n = e + 1;
        if (last <= e) return n;
        target[n++] = (byte)'.';
        d[(e + 1)..(last + 1)].CopyTo(target[n..]);
        return n + last - e;
    }

    /// <summary>The nine digits as text, two at a time by constant divisions.</summary>
    private static void Digits(ulong digits, Span<byte> d)
    {
        var v = (uint)digits;
        for (var i = 8; i > 0; i -= 2)
        {
            var pair = (int)(v % 100) * 2;
            v /= 100;
            d[i] = Pairs[pair + 1];
            d[i - 1] = Pairs[pair];
        }
        d[0] = (byte)('0' + v);
    }

    /// <summary>Scientific notation as "G9" writes it for a decimal exponent e in [−99, −5]: "d.dddE-ee", trailing zeros
    /// of the fraction dropped, at least two exponent digits.</summary>
    private static int Scientific(ulong digits, int e, Span<byte> target)
    {
        Span<byte> d = stackalloc byte[10];
        Digits(digits, d);
        var last = 8;
        while (last > 0 && d[last] == '0') last--;
        target[0] = d[0];
        var n = 1;
        if (last > 0)
        {
            target[n++] = (byte)'.';
            d[1..(last + 1)].CopyTo(target[n..]);
            n += last;
        }
        target[n++] = (byte)'E';
        target[n++] = (byte)'-';
        target[n++] = (byte)('0' + -e / 10);
        target[n++] = (byte)('0' + -e % 10);
        return n;
    }
}
