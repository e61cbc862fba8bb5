using System.Globalization;
using System.IO.Compression;
using System.Text;

namespace FoulingWatch.Fuzz;

/// <summary>A seed export with the source definition that reads it (an invented plant, "Kestrel Bay").</summary>
public sealed record Seed(string Name, string FileName, string SourceJson, byte[] Text, bool Compressed);

/// <summary>
/// Seed exports in the shapes historians write: wide with ISO timestamps; wide with metadata lines, a unit row, semicolons,
/// decimal commas, CRLF and a Latin-1 degree sign; wide with tabs and a quoted note; long with a quality column; and the
/// first and the long one compressed. Each holds markers, blanks and an out-of-range reading, so that most mutations land
/// near something the reader has to decide.
/// </summary>
public static class Seeds
{
    public static readonly string[] Tags = ["FI-101", "TI-101", "TI-102", "FI-201", "TI-201", "TI-202"];

    // (before All: static fields are set in text order)
    private static readonly DateTime Start = new(2026, 5, 4, 0, 0, 0, DateTimeKind.Utc);

    public static IReadOnlyList<Seed> All { get; } = Build();

    private static IReadOnlyList<Seed> Build()
    {
        var comma = Wide(',', '.', "\n", metadata: false, quoted: false);
        var longText = Long();
        return
        [
            new("wide-comma", "input.csv", """{ "files": ["input.csv"] }""", comma, false),
            new("wide-semicolon", "input.csv", """{ "files": ["input.csv"], "delimiter": ";", "decimal": ",", "encoding": "windows-1252" }""",
                Wide(';', ',', "\r\n", metadata: true, quoted: false), false),
            new("wide-tab", "input.csv", """{ "files": ["input.csv"], "delimiter": "\t" }""", Wide('\t', '.', "\n", metadata: false, quoted: true), false),
            new("long-quality", "input.csv", """{ "files": ["input.csv"], "layout": "long", "qualityColumn": "Quality" }""", longText, false),
            new("wide-comma-gz", "input.csv.gz", """{ "files": ["input.csv.gz"] }""", comma, true),
            new("long-gz", "input.csv.gz", """{ "files": ["input.csv.gz"], "layout": "long", "qualityColumn": "Quality" }""", longText, true),
        ];
    }

    private static byte[] Wide(char d, char dec, string nl, bool metadata, bool quoted)
    {
        var rng = new Random(7);
        string N(double v) => v.ToString("0.000", CultureInfo.InvariantCulture).Replace('.', dec);
        var sb = new StringBuilder();
        if (metadata) sb.Append("Export of Kestrel Bay (fictional)").Append(d).Append(nl).Append("Interval: 1 min").Append(nl).Append(nl);
        sb.Append("Timestamp").Append(d).AppendJoin(d, Tags).Append(nl);
        if (metadata) sb.Append("Unit").Append(d).AppendJoin(d, new[] { "t/h", "°C", "°C", "t/h", "°C", "°C" }).Append(nl);
        for (var m = 0; m < 240; m++)
        {
            var ts = Start.AddMinutes(m).ToString(metadata ? "yyyy-MM-dd HH:mm:ss" : "yyyy-MM-ddTHH:mm:ssZ", CultureInfo.InvariantCulture);
            var f = new[] { 120 + rng.NextDouble(), 250 + rng.NextDouble(), 180 + rng.NextDouble(), 90 + rng.NextDouble(), 40 + rng.NextDouble(), 95 + rng.NextDouble() }
                .Select(N).ToArray();
            if (m % 17 == 3) f[0] = "idle";
            if (m % 23 == 5) f[2] = "";
            if (m % 31 == 7) f[4] = N(9999);
            if (quoted && m % 41 == 9) f[5] = "\"" + f[5] + "\"";
            sb.Append(ts).Append(d).AppendJoin(d, f).Append(nl);
            if (m % 59 == 11) sb.Append(nl);
        }
        return (metadata ? Encoding.Latin1 : Encoding.UTF8).GetBytes(sb.ToString());
    }

    private static byte[] Long()
    {
        var rng = new Random(8);
        var sb = new StringBuilder("Tag,Timestamp,Value,Quality\n");
        for (var m = 0; m < 120; m++)
            foreach (var tag in Tags)
            {
                var v = (100 + 50 * rng.NextDouble()).ToString("0.00", CultureInfo.InvariantCulture);
                var q = m % 13 == 4 ? "Bad" : "Good";
                sb.Append(CultureInfo.InvariantCulture, $"{tag},{Start.AddMinutes(m):yyyy-MM-dd HH:mm:ss}+00:00,{(m % 19 == 2 ? "offline" : v)},{q}\n");
            }
        sb.Append("XX-999,2026-05-04 00:00:00+00:00,1.0,Good\n");
        return Encoding.UTF8.GetBytes(sb.ToString());
    }

    public static byte[] Compress(byte[] text)
    {
        var ms = new MemoryStream();
        using (var z = new GZipStream(ms, CompressionLevel.Fastest, leaveOpen: true)) z.Write(text);
        return ms.ToArray();
    }
}
