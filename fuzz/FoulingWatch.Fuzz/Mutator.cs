using System.Text;

namespace FoulingWatch.Fuzz;

/// <summary>
/// Deterministic byte-level mutations of an export: flips, inserted tokens the reader must decide on (quotes,
/// delimiters, line ends, byte-order marks, NULs, huge numbers, dates at the ends of the calendar), deleted and
/// repeated ranges and lines, a repeated header, truncation. One to six per input.
/// </summary>
public static class Mutator
{
    private static readonly byte[][] Tokens = new[]
    {
        "\"", "\"\"", ",", ";", "\t", "|", "\r", "\n", "\r\n", "\0", " ", "-", "+", "e", ".", "E+", "1e400", "-1e-400", "NaN", "Infinity",
        "9999-12-31T23:59:59Z", "0001-01-01 00:00", "2026-02-30 10:00", "24:00", "1900-01-01", "00000000000000000000000000001",
        ",,,,,,,,,,", "\"quoted, with delimiter\"", "\"open quote", "FI-101", "Timestamp", "°C", "1,5", "1.5.5", "0x1F", "∞",
        "Tag,Timestamp,Value,Quality", "TI-101,2026-05-04 01:00:00+00:00,12.5,Good",
    }.Select(Encoding.UTF8.GetBytes).Concat([[0xFF, 0xFE], [0xFE, 0xFF], [0xEF, 0xBB, 0xBF], [0xE9], [0xB0], [0xC3], [0x80, 0x80]]).ToArray();

    public static byte[] Mutate(byte[] input, Random rng)
    {
        var data = new List<byte>(input);
        var count = 1 + (int)Math.Min(5, -Math.Log(1 - rng.NextDouble()) * 1.5);
        for (var i = 0; i < count; i++) Once(data, rng);
        return data.ToArray();
    }

    private static void Once(List<byte> d, Random rng)
    {
        int Pos() => rng.Next(d.Count + 1);
        switch (rng.Next(12))
        {
            case 0 when d.Count > 0: d[rng.Next(d.Count)] = (byte)rng.Next(256); break;
            case 1 when d.Count > 0: d[rng.Next(d.Count)] ^= (byte)(1 << rng.Next(8)); break;
            case 2: case 3: d.InsertRange(Pos(), Tokens[rng.Next(Tokens.Length)]); break;
            case 4 when d.Count > 0:
            {
                var at = rng.Next(d.Count);
                d.RemoveRange(at, Math.Min(d.Count - at, 1 + rng.Next(64)));
                break;
            }
            case 5 when d.Count > 0:
            {
                var at = rng.Next(d.Count);
                var copy = d.GetRange(at, Math.Min(d.Count - at, 1 + rng.Next(400)));
                d.InsertRange(Pos(), copy);
                break;
            }
            case 6: LineOp(d, rng, repeat: true); break;
            case 7: LineOp(d, rng, repeat: false); break;
            case 8: // the header line again somewhere
            {
                var end = d.IndexOf((byte)'\n');
                if (end > 0) d.InsertRange(LineStart(d, Pos()), d.GetRange(0, end + 1));
                break;
            }
            case 9 when d.Count > 0: Truncate(d, rng); break;
            case 10: ReplaceDigits(d, rng); break;
            default: d.InsertRange(LineStart(d, Pos()), Tokens[rng.Next(Tokens.Length)].Concat("\n"u8.ToArray())); break;
        }
    }

    private static void Truncate(List<byte> d, Random rng)
    {
        var keep = (int)(d.Count * Math.Sqrt(rng.NextDouble()));
        d.RemoveRange(keep, d.Count - keep);
    }

    private static int LineStart(List<byte> d, int at)
    {
        while (at > 0 && d[at - 1] != '\n') at--;
        return at;
    }

    private static void LineOp(List<byte> d, Random rng, bool repeat)
    {
        if (d.Count == 0) return;
        var start = LineStart(d, rng.Next(d.Count));
        var end = d.IndexOf((byte)'\n', start);
        end = end < 0 ? d.Count : end + 1;
        var line = d.GetRange(start, end - start);
        if (repeat) d.InsertRange(LineStart(d, rng.Next(d.Count + 1)), line);
        else d.RemoveRange(start, end - start);
    }

    /// <summary>A run of digits replaced by a number of another size: huge, tiny, negative, many digits.</summary>
    private static void ReplaceDigits(List<byte> d, Random rng)
    {
        if (d.Count == 0) return;
        var at = rng.Next(d.Count);
        while (at < d.Count && !char.IsAsciiDigit((char)d[at])) at++;
        if (at >= d.Count) return;
        var end = at;
        while (end < d.Count && (char.IsAsciiDigit((char)d[end]) || d[end] == '.')) end++;
        string[] numbers = ["0", "-0", "1e308", "4.9e-324", "-999999999", "123456789012345678901234567890", "3.4028235e38", "0.000000000000000000001", "7"];
        d.RemoveRange(at, end - at);
        d.InsertRange(at, Encoding.ASCII.GetBytes(numbers[rng.Next(numbers.Length)]));
    }
}
