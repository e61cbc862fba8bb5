using FoulingWatch.Cli;

return FoulingWatchCommand.Run(args, Console.Out, Console.Error);
