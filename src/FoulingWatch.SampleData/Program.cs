using System.Globalization;
using System.IO.Compression;
using System.Text;
using FoulingWatch.Core.Exchangers;
using FoulingWatch.Core.FluidModels;
using FoulingWatch.Core.Quantities;
using FoulingWatch.SampleData;

// Writes the Kestrel Bay sample historian exports (invented site) into the folder given, default sample-data/.
// Seeded: the same run gives the same bytes. Usage: dotnet run --project src/FoulingWatch.SampleData -- [folder]
var folder = args.Length > 0 ? args[0] : "sample-data";
Directory.CreateDirectory(folder);
Encoding.RegisterProvider(CodePagesEncodingProvider.Instance);
var zone = TimeZoneInfo.FindSystemTimeZoneById("Europe/Amsterdam");
var inv = CultureInfo.InvariantCulture;

var area1 = Simulate(SamplePlant.Area1, seed: 101);
var utilities = Simulate(SamplePlant.Utilities, seed: 201);

// Area 1: two half-year exports in local wall-clock time, one day of overlap, one hour exported twice.
var split = new DateTimeOffset(2026, 6, 1, 0, 0, 0, TimeSpan.Zero);
WriteArea1(Path.Combine(folder, "kestrel-area1-2025-12_2026-05.csv.gz"), area1, SamplePlant.Start, split + TimeSpan.FromDays(1),
    duplicatedHour: new DateTimeOffset(2026, 1, 15, 8, 0, 0, TimeSpan.Zero));
WriteArea1(Path.Combine(folder, "kestrel-area1-2026-06_2026-11.csv.gz"), area1, split, SamplePlant.End, duplicatedHour: null);
// Utilities: a Windows-1252, semicolon, decimal-comma export with a preamble and a unit row, and a 36 h historian outage.
WriteUtilities(Path.Combine(folder, "kestrel-utilities-2025-12_2026-11.csv.gz"), utilities,
    outageFrom: new DateTimeOffset(2026, 2, 10, 6, 0, 0, TimeSpan.Zero), outageTo: new DateTimeOffset(2026, 2, 11, 18, 0, 0, TimeSpan.Zero));
Console.WriteLine($"wrote sample exports to {Path.GetFullPath(folder)}");

static (List<DateTimeOffset> Times, Dictionary<string, string[]> Columns, List<string> Tags, Dictionary<string, string> Units) Simulate(IReadOnlyList<SampleExchanger> exchangers, int seed)
{
    var rng = new Random(seed);
    var times = new List<DateTimeOffset>();
    for (var t = SamplePlant.Start; t < SamplePlant.End; t += SamplePlant.Step) times.Add(t);
    var columns = new Dictionary<string, string[]>();
    var tags = new List<string>();
    var units = new Dictionary<string, string>();
    var inv = CultureInfo.InvariantCulture;
    foreach (var x in exchangers)
    {
        string[] names = [$"FI-{x.TagPrefix}1", $"TI-{x.TagPrefix}1", $"TI-{x.TagPrefix}2", $"FI-{x.TagPrefix}3", $"TI-{x.TagPrefix}3", $"TI-{x.TagPrefix}4"];
        foreach (var n in names) { columns[n] = new string[times.Count]; tags.Add(n); units[n] = n.StartsWith("FI") ? "t/h" : "°C"; }
        var dpTag = $"PDI-{x.TagPrefix}3";
        if (x.TubePressureDropBar is not null) { columns[dpTag] = new string[times.Count]; tags.Add(dpTag); units[dpTag] = "bar"; }
        var dpRng = new Random(seed * 1000 + int.Parse(x.TagPrefix, inv));   // its own noise: the other columns stay as they were
        double arHot = 0, arCold = 0, arT = 0;
        var phase = rng.NextDouble() * 10;
        for (var k = 0; k < times.Count; k++)
        {
            var t = times[k];
            var days = (t - SamplePlant.Start).TotalDays;
            arHot = 0.97 * arHot + 0.01 * Gauss(rng);
            arCold = 0.97 * arCold + 0.01 * Gauss(rng);
            arT = 0.98 * arT + 0.1 * Gauss(rng);
            var hotFactor = 0.85 + 0.15 * Math.Sin(2 * Math.PI * days / x.HotFlowPeriodDays + phase) + 0.04 * Math.Sin(2 * Math.PI * days) + arHot;
            var coldFactor = 0.87 + 0.13 * Math.Sin(2 * Math.PI * days / x.ColdFlowPeriodDays + 2 * phase) + 0.03 * Math.Sin(2 * Math.PI * days + 1) + arCold;
            var season = Math.Cos(2 * Math.PI * (days - 230) / 365.0); // warmest around mid-July
            var mHot = x.DesignHotFlow * hotFactor;
            var mCold = x.DesignColdFlow * coldFactor;
            var tci = x.ColdInletC + (x.Cold is IapwsWater && x.Id.StartsWith('C') ? 5 * season : 2 * Math.Sin(2 * Math.PI * days / 29)) + arT;
            var thi = x.HotInletC + 3 * Math.Sin(2 * Math.PI * days / 13 + phase) + 0.5 * arT;
            var lastCleaning = x.Cleanings.Where(c => c <= t).Max();
            var rf = x.FoulingAfterDays((t - lastCleaning).TotalDays);
            var downtime = x.Cleanings.Any(c => t >= c - TimeSpan.FromDays(2) && t < c + TimeSpan.FromDays(2))
                           || (x.TagPrefix.StartsWith('1') && t >= new DateTimeOffset(2026, 3, 3, 4, 0, 0, TimeSpan.Zero) && t < new DateTimeOffset(2026, 3, 3, 16, 0, 0, TimeSpan.Zero));
            double[] values;
            if (downtime)
            {
                var ambient = 25 + 5 * season;
                values = [rng.NextDouble() * 0.3, ambient + rng.NextDouble(), ambient + rng.NextDouble(), rng.NextDouble() * 0.3, ambient + rng.NextDouble(), ambient + rng.NextDouble()];
            }
            else values = Operate(x, mHot, mCold, thi, tci, rf, t);
            for (var i = 0; i < 6; i++)
            {
                var isFlow = i is 0 or 3;
                var v = values[i] + (isFlow ? values[i] * 0.003 * Gauss(rng) : 0.05 * Gauss(rng));
                if (i == 5 && x.ColdOutletDrift is not null) v += x.ColdOutletDrift(t);
                var text = isFlow ? (v * 3.6).ToString("0.00", inv) : v.ToString("0.00", inv);
                var u = rng.NextDouble();
                if (downtime && isFlow && (t - x.Cleanings.Where(c => c <= t + TimeSpan.FromDays(2)).Max()).TotalHours > -48 && (t - x.Cleanings.Where(c => c <= t + TimeSpan.FromDays(2)).Max()).TotalHours < -42) text = "unit down";
                else if (u < 0.0008) text = "no reading";
                else if (u < 0.0012) text = "link lost";
                else if (u < 0.0014) text = "";
                columns[names[i]][k] = text;
            }
            if (x.TubePressureDropBar is { } dpDesign)
            {
                // the bore narrowed by the deposit (δ = Rf·0.2 W/mK on a 15.75 mm tube): ΔP ∝ ṁ^1.8·D^−4.75 (Blasius friction)
                var tubeFlow = x.HotOnTube ? mHot : mCold;
                var tubeDesign = x.HotOnTube ? x.DesignHotFlow : x.DesignColdFlow;
                var bore = 15.75e-3;
                var dp = downtime ? 0.01 * dpRng.NextDouble()
                    : dpDesign * Math.Pow(bore / (bore - 2 * rf * 0.2), 4.75) * Math.Pow(tubeFlow / tubeDesign, 1.8) * (1 + 0.005 * Gauss(dpRng));
                columns[dpTag][k] = dp.ToString("0.0000", inv);
            }
        }
    }
    return (times, columns, tags, units);
}

// Outlets of an operating exchanger (°C, and flows in kg/s) from the true clean U at these flows plus the fouling.
static double[] Operate(SampleExchanger x, double mHot, double mCold, double thiC, double tciC, double rf, DateTimeOffset t)
{
    var p = new Pressure(x.PressureHot);
    var pc = new Pressure(x.PressureCold);
    var tubeFlow = x.HotOnTube ? mHot : mCold;
    var shellFlow = x.HotOnTube ? mCold : mHot;
    var tubeDesign = x.HotOnTube ? x.DesignHotFlow : x.DesignColdFlow;
    var shellDesign = x.HotOnTube ? x.DesignColdFlow : x.DesignHotFlow;
    var film = 1 / x.CleanU;
    var nShell = x.Hot.IsPhaseChange ? 0 : 0.6;
    // A water film at a fixed flow: 1/h ∝ μ^(0.8−0.4)·cp^(−0.4)·k^(−0.6) (Dittus–Boelter, Nu = 0.023·Re^0.8·Pr^0.4).
    var waterScaling = x.TubeWaterDesignBulkC is not null && x.Cold is IapwsWater;
    double WaterGroup(double kelvin)
    {
        var w = (IapwsWater)x.Cold;
        var t = Temperature.FromKelvin(kelvin);
        return Math.Pow(w.Viscosity(t, pc), 0.4) * Math.Pow(w.SpecificHeat(t, pc), -0.4) * Math.Pow(w.ThermalConductivity(t, pc), -0.6);
    }
    double Factor(double tubeBulkK) => waterScaling ? WaterGroup(tubeBulkK) / WaterGroup(x.TubeWaterDesignBulkC!.Value + 273.15) : 1;
    double U(double tubeBulkK) => 1 / (1 / (1 / (0.5 * film * Math.Pow(tubeDesign / tubeFlow, 0.8) * Factor(tubeBulkK)
        + 0.5 * film * Math.Pow(shellDesign / shellFlow, nShell))) + rf);
    // A bundle given by its geometry: both films from the correlations at the sides' bulk temperatures.
    double GeometryU(double hotBulkK, double coldBulkK)
    {
        var g = x.Geometry!;
        var (tubeFluid, shellFluid) = x.HotOnTube ? ((ITransportFluid)x.Hot, (ITransportFluid)x.Cold) : ((ITransportFluid)x.Cold, (ITransportFluid)x.Hot);
        var (tubeBulk, shellBulk) = x.HotOnTube ? (hotBulkK, coldBulkK) : (coldBulkK, hotBulkK);
        var (tubeP, shellP) = x.HotOnTube ? (p, pc) : (pc, p);
        var clean = g.CleanU(tubeFlow, tubeFluid, Temperature.FromKelvin(tubeBulk), tubeP, shellFlow, shellFluid, Temperature.FromKelvin(shellBulk), shellP);
        return 1 / (1 / clean + rf);
    }
    var u = x.Geometry is null ? U(tciC + 273.15 + 3) : GeometryU(thiC + 273.15 - 20, tciC + 273.15 + 20);
    if (x.Hot is SteamPhaseChange steam)
    {
        var thi = steam.SaturationTemperature + new TemperatureDifference(5);
        var tho = Temperature.FromKelvin(steam.SaturationTemperature.Kelvin - 1.5);
        var tci = Temperature.FromCelsius(tciC);
        var cc = mCold * x.Cold.SpecificHeat(tci, pc);
        for (var it = 0; it < 4; it++)
        {
            var r0 = Rating.Rate(x.Arrangement, u * x.Area, double.PositiveInfinity, cc, steam.SaturationTemperature, tci);
            cc = mCold * x.Cold.MeanSpecificHeat(tci, r0.ColdOutlet, pc);
        }
        var r = Rating.Rate(x.Arrangement, u * x.Area, double.PositiveInfinity, cc, steam.SaturationTemperature, tci);
        var steamFlow = r.Duty / -x.Hot.EnthalpyChange(thi, tho, p);
        return [steamFlow, thi.Celsius, tho.Celsius, mCold, tciC, r.ColdOutlet.Celsius];
    }
    var hIn = Temperature.FromCelsius(thiC);
    var cIn = Temperature.FromCelsius(tciC);
    var ch = mHot * x.Hot.SpecificHeat(hIn, p);
    var c2 = mCold * x.Cold.SpecificHeat(cIn, pc);
    RatingResult rr = default;
    for (var it = 0; it < 6; it++)
    {
        rr = Rating.Rate(x.Arrangement, u * x.Area, ch, c2, hIn, cIn);
        ch = mHot * x.Hot.MeanSpecificHeat(hIn, rr.HotOutlet, p);
        c2 = mCold * x.Cold.MeanSpecificHeat(cIn, rr.ColdOutlet, pc);
        if (waterScaling) u = U(0.5 * (cIn.Kelvin + rr.ColdOutlet.Kelvin));
        if (x.Geometry is not null) u = GeometryU(0.5 * (hIn.Kelvin + rr.HotOutlet.Kelvin), 0.5 * (cIn.Kelvin + rr.ColdOutlet.Kelvin));
    }
    if (waterScaling || x.Geometry is not null) rr = Rating.Rate(x.Arrangement, u * x.Area, ch, c2, hIn, cIn);
    return [mHot, thiC, rr.HotOutlet.Celsius, mCold, tciC, rr.ColdOutlet.Celsius];
}

static double Gauss(Random rng) => Math.Sqrt(-2 * Math.Log(1 - rng.NextDouble())) * Math.Cos(2 * Math.PI * rng.NextDouble());

void WriteArea1(string path, (List<DateTimeOffset> Times, Dictionary<string, string[]> Columns, List<string> Tags, Dictionary<string, string> Units) d,
    DateTimeOffset from, DateTimeOffset to, DateTimeOffset? duplicatedHour)
{
    var sb = new StringBuilder();
    sb.Append("Timestamp,").AppendJoin(',', d.Tags).Append('\n');
    for (var k = 0; k < d.Times.Count; k++)
    {
        var t = d.Times[k];
        if (t < from || t >= to) continue;
        var local = TimeZoneInfo.ConvertTime(t, zone).ToString("yyyy-MM-dd HH:mm:ss", inv);
        var line = local + "," + string.Join(',', d.Tags.Select(tag => d.Columns[tag][k])) + "\n";
        sb.Append(line);
        if (duplicatedHour is { } h && t >= h && t < h + TimeSpan.FromHours(1)) sb.Append(line);
    }
    WriteGz(path, Encoding.UTF8.GetBytes(sb.ToString()));
}

void WriteUtilities(string path, (List<DateTimeOffset> Times, Dictionary<string, string[]> Columns, List<string> Tags, Dictionary<string, string> Units) d,
    DateTimeOffset outageFrom, DateTimeOffset outageTo)
{
    var sb = new StringBuilder();
    var sep = new string(';', d.Tags.Count);
    sb.Append("Historian export, Kestrel Bay utilities area (fictional site)").Append(sep).Append("\r\n");
    sb.Append("Sample interval: 10 min; times are local plant time").Append(sep).Append("\r\n");
    sb.Append("Time;").AppendJoin(';', d.Tags).Append("\r\n");
    sb.Append("Unit;").AppendJoin(';', d.Tags.Select(t => d.Units[t])).Append("\r\n");
    for (var k = 0; k < d.Times.Count; k++)
    {
        var t = d.Times[k];
        if (t >= outageFrom && t < outageTo) continue;
        var local = TimeZoneInfo.ConvertTime(t, zone).ToString("dd.MM.yyyy HH:mm", inv);
        sb.Append(local).Append(';').AppendJoin(';', d.Tags.Select(tag => d.Columns[tag][k].Replace('.', ','))).Append("\r\n");
    }
    WriteGz(path, Encoding.GetEncoding(1252).GetBytes(sb.ToString()));
}

static void WriteGz(string path, byte[] bytes)
{
    using var fs = File.Create(path);
    // No file name or time in the header, so the bytes depend only on the content.
    using var gz = new GZipStream(fs, CompressionLevel.SmallestSize);
    gz.Write(bytes);
}
