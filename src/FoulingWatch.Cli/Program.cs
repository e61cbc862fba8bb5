using FoulingWatch.Cli;

if (args.Length > 0 && args[0] is "analyze" or "plan" or "demo") Warmup.Start();
var code = FoulingWatchCommand.Run(args, Console.Out, Console.Error);
// FOULINGWATCH_TIMINGS=1: the stage breakdown, CPU time and peak resident set on standard error (used by the benchmark).
if (Environment.GetEnvironmentVariable("FOULINGWATCH_TIMINGS") == "1") RunTimings.Print(Console.Error);
return code;
