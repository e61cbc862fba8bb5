using System.Reflection;
using System.Runtime.CompilerServices;

namespace FoulingWatch.Cli;

/// <summary>Compiles the analysis and reporting code on a background thread while the run starts and reads its files.</summary>
/// <remarks>The tool runs without tiered compilation (every method is compiled once, optimised, on first call; the hot
/// loops gain more than the compilation costs). That compilation, ~1 s of CPU for an analysis, otherwise happens on the
/// threads that first need each method, at moments when the other core is often idle (start-up, the first exchanger,
/// the site's files at the end). Compiling ahead changes no result; a method that cannot be prepared is skipped.</remarks>
internal static class Warmup
{
    /// <summary>Starts compiling ahead, where a second core can do it (on one core it would only compete).</summary>
    public static void Start()
    {
        if (Environment.ProcessorCount < 2) return;
        var thread = new Thread(Run) { IsBackground = true, Priority = ThreadPriority.BelowNormal, Name = "warm-up" };
        thread.Start();
    }

    private static void Run()
    {
        // What the run needs after reading its files, in the order it needs it; the reading code itself is compiled by
        // the main thread as it starts reading (ahead of any warm-up).
        Assembly[] assemblies =
        [
            typeof(Analysis.PlantAnalysis).Assembly, typeof(Core.Quantities.Temperature).Assembly,
            typeof(Reporting.Results.ResultWriter).Assembly,
        ];
        const BindingFlags all = BindingFlags.Public | BindingFlags.NonPublic | BindingFlags.Instance | BindingFlags.Static |
                                 BindingFlags.DeclaredOnly;
        foreach (var assembly in assemblies)
        {
            Type[] types;
            try { types = assembly.GetTypes(); }
            catch (ReflectionTypeLoadException e) { types = e.Types.OfType<Type>().ToArray(); }
            foreach (var type in types)
            {
                if (type.ContainsGenericParameters) continue;
                foreach (var method in type.GetMethods(all).Cast<MethodBase>().Concat(type.GetConstructors(all)))
                {
                    if (method.IsAbstract || method.ContainsGenericParameters) continue;
                    try { RuntimeHelpers.PrepareMethod(method.MethodHandle); }
                    catch (Exception) { /* not preparable ahead (e.g. an interop stub): compiled on first call as usual */ }
                }
            }
        }
    }
}
