using FoulingWatch.Cli;

var code = FoulingWatchCommand.Run(args, Console.Out, Console.Error);
// FOULINGWATCH_TIMINGS=1: the stage breakdown, CPU time and peak resident set on standard error (used by the benchmark).
if (Environment.GetEnvironmentVariable("FOULINGWATCH_TIMINGS") == "1") RunTimings.Print(Console.Error);
return code;
