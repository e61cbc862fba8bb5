using System.Diagnostics;
using System.Globalization;
using FoulingWatch.Analysis;

namespace FoulingWatch.Cli;

/// <summary>Prints the stage breakdown of a run as "timing &lt;stage&gt; &lt;seconds&gt;" lines, then the process's CPU seconds and
/// peak resident set (VmHWM from /proc on Linux; the peak working set elsewhere), the bytes allocated, the collectors'
/// pause time and the collection counts by generation.</summary>
public static class RunTimings
{
    public static void Print(TextWriter error)
    {
        var inv = CultureInfo.InvariantCulture;
        foreach (var (stage, seconds) in StageClock.Totals()) error.WriteLine(string.Create(inv, $"timing {stage.Replace(' ', '_')} {seconds:0.000}"));
        var process = Process.GetCurrentProcess();
        error.WriteLine(string.Create(inv, $"timing cpu_s {process.TotalProcessorTime.TotalSeconds:0.000}"));
        error.WriteLine(string.Create(inv, $"timing peak_rss_mb {PeakResidentBytes(process) / 1e6:0}"));
        error.WriteLine(string.Create(inv, $"timing allocated_mb {GC.GetTotalAllocatedBytes() / 1e6:0}"));
        error.WriteLine(string.Create(inv, $"timing gc_pause_s {GC.GetTotalPauseDuration().TotalSeconds:0.000}"));
        for (var generation = 0; generation <= 2; generation++)
            error.WriteLine(string.Create(inv, $"timing collections_gen{generation} {GC.CollectionCount(generation)}"));
    }

    private static long PeakResidentBytes(Process process)
    {
        try
        {
            foreach (var line in File.ReadLines("/proc/self/status"))
                if (line.StartsWith("VmHWM:", StringComparison.Ordinal))
                    return long.Parse(line[6..].Trim().Split(' ')[0], CultureInfo.InvariantCulture) * 1024;
        }
        catch (IOException) { }
        catch (UnauthorizedAccessException) { }
        return process.PeakWorkingSet64;
    }
}
