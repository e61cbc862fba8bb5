using System.Diagnostics;
using System.Globalization;
using System.IO.Compression;
using System.Text;
using CsvHelper;

/// <summary>The whole-job benchmark: in turns, the bare parse floor (a child process reading and parsing every number of
/// the plant's exports on one thread) and <c>foulingwatch analyze</c> as a user runs it (a child process writing every
/// output), each with wall time, CPU time, peak resident set and, for the analysis, its stage breakdown.</summary>
public static class WholeJob
{
    private static readonly CultureInfo Inv = CultureInfo.InvariantCulture;

    public static void Run(string name, string config, IReadOnlyList<string> files, int turns)
    {
        var cli = Path.Combine(AppContext.BaseDirectory, "foulingwatch.dll");
        var self = Path.Combine(AppContext.BaseDirectory, "FoulingWatch.Benchmark.dll");
        var outDir = Path.Combine(Path.GetTempPath(), "fw-bench-out-" + name);
        var floors = new List<Dictionary<string, double>>();
        var runs = new List<Dictionary<string, double>>();
        for (var i = 0; i < turns; i++)
        {
            floors.Add(Child(self, ["--floor", .. files]));
            runs.Add(Child(cli, ["analyze", "--config", config, "--out", outDir, "--quiet"]));
        }
        double Median(IEnumerable<double> x) { var o = x.Order().ToList(); return o[o.Count / 2]; }
        var ratios = floors.Zip(runs, (f, r) => r["wall_s"] / f["wall_s"]).ToList();
        Console.WriteLine($"{name}: {turns} turns of floor then analyze (median; all turns)");
        foreach (var (label, list) in new[] { ("parse floor", floors), ("analyze", runs) })
            Console.WriteLine(string.Create(Inv,
                $"  {label,-12} wall {Median(list.Select(d => d["wall_s"])):0.00} s, CPU {Median(list.Select(d => d["cpu_s"])):0.00} s, peak RSS {Median(list.Select(d => d["peak_rss_mb"])):0} MB  (wall {string.Join(" ", list.Select(d => d["wall_s"].ToString("0.00", Inv)))})"));
        Console.WriteLine(string.Create(Inv, $"  analyze / floor: median of the turns' ratios {Median(ratios):0.00}x ({string.Join(" ", ratios.Select(r => r.ToString("0.00", Inv)))})"));
        string[] memory = ["allocated_mb", "gc_pause_s", "collections_gen0", "collections_gen1", "collections_gen2"];
        if (runs[0].ContainsKey("allocated_mb"))
            Console.WriteLine(string.Create(Inv,
                $"  analyze memory (median): allocated {Median(runs.Select(d => d["allocated_mb"])):0} MB, " +
                $"GC pauses {Median(runs.Select(d => d["gc_pause_s"])):0.00} s, collections by generation " +
                $"{Median(runs.Select(d => d["collections_gen0"])):0}/{Median(runs.Select(d => d["collections_gen1"])):0}/" +
                $"{Median(runs.Select(d => d["collections_gen2"])):0}"));
        Console.WriteLine("  analyze stages (seconds summed over threads, median):");
        var stages = runs[0].Keys.Where(k => k is not ("wall_s" or "cpu_s" or "peak_rss_mb") && !memory.Contains(k));
        foreach (var stage in stages)
            Console.WriteLine(string.Create(Inv, $"    {stage,-24} {Median(runs.Select(d => d.GetValueOrDefault(stage))):0.000}"));
    }

    /// <summary>Runs a child process with FOULINGWATCH_TIMINGS=1 and collects its "timing key value" lines and wall time.</summary>
    private static Dictionary<string, double> Child(string dll, string[] args)
    {
        var start = new ProcessStartInfo("dotnet") { RedirectStandardError = true, RedirectStandardOutput = true };
        start.ArgumentList.Add(dll);
        foreach (var a in args) start.ArgumentList.Add(a);
        start.Environment["FOULINGWATCH_TIMINGS"] = "1";
        var sw = Stopwatch.StartNew();
        using var p = Process.Start(start)!;
        var stdout = p.StandardOutput.ReadToEndAsync();
        var stderr = p.StandardError.ReadToEnd();
        p.WaitForExit();
        var wall = sw.Elapsed.TotalSeconds;
        _ = stdout.Result;
        if (p.ExitCode != 0) throw new InvalidOperationException($"{Path.GetFileName(dll)} {string.Join(' ', args)} exited {p.ExitCode}: {stderr}");
        var result = new Dictionary<string, double> { ["wall_s"] = wall };
        foreach (var line in stderr.Split('\n'))
        {
            var parts = line.Trim().Split(' ');
            if (parts.Length == 3 && parts[0] == "timing") result[parts[1]] = double.Parse(parts[2], Inv);
        }
        return result;
    }

    /// <summary>The floor itself (run in the child): read every row of each file (gzip-decompressed when .gz) with
    /// CsvHelper byte spans and parse every field as a number with csFastFloat, on one thread; then print the process's
    /// CPU time and peak resident set.</summary>
    public static void Floor(IEnumerable<string> files)
    {
        long numbers = 0;
        foreach (var file in files)
        {
            using var raw = File.OpenRead(file);
            using Stream stream = file.EndsWith(".gz", StringComparison.OrdinalIgnoreCase) ? new GZipStream(raw, CompressionMode.Decompress) : raw;
            var (separator, comma) = Dialect(file);
            using var reader = CsvReader.Create(stream, new CsvReaderOptions { Separator = separator, HasHeader = false }, leaveOpen: true);
            while (reader.Read())
                for (var i = 0; i < reader.FieldCount; i++)
                    if (csFastFloat.FastDoubleParser.TryParseDouble(reader.GetSpan(i), out double _, NumberStyles.Float, comma ? (byte)',' : (byte)'.'))
                        numbers++;
        }
        var process = Process.GetCurrentProcess();
        Console.Error.WriteLine(string.Create(Inv, $"timing numbers {numbers}"));
        Console.Error.WriteLine(string.Create(Inv, $"timing cpu_s {process.TotalProcessorTime.TotalSeconds:0.000}"));
        var hwm = File.ReadLines("/proc/self/status").FirstOrDefault(l => l.StartsWith("VmHWM:", StringComparison.Ordinal));
        var peak = hwm is null ? process.PeakWorkingSet64 : long.Parse(hwm[6..].Trim().Split(' ')[0], Inv) * 1024;
        Console.Error.WriteLine(string.Create(Inv, $"timing peak_rss_mb {peak / 1e6:0}"));
    }

    /// <summary>Separator and decimal comma of an export, from its first lines (';' with decimal commas where semicolons
    /// outnumber commas).</summary>
    private static (char Separator, bool Comma) Dialect(string file)
    {
        using var raw = File.OpenRead(file);
        using Stream stream = file.EndsWith(".gz", StringComparison.OrdinalIgnoreCase) ? new GZipStream(raw, CompressionMode.Decompress) : raw;
        using var text = new StreamReader(stream, Encoding.Latin1);
        var head = string.Concat(Enumerable.Range(0, 20).Select(_ => text.ReadLine() ?? ""));
        var semicolons = head.Count(c => c == ';');
        return semicolons > head.Count(c => c == ',') ? (';', true) : (',', false);
    }
}
