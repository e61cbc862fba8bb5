using System.Globalization;
using FoulingWatch.Fuzz;

// The long fuzz run: dotnet run -c Release --project fuzz/FoulingWatch.Fuzz -- [inputs] [run seed] [workers] [reproducer folder]
// One input again, with its whole stack trace: ... -- one <index> [run seed]
// A file against every small part size: ... -- sizes <file> <seed name>
if (args.Length > 2 && args[0] == "sizes")
{
    var seed = Seeds.All.Single(s => s.Name == args[2]);
    using var w = new FuzzWorker();
    foreach (var size in new int?[] { null }.Concat(Enumerable.Range(16, 500).Select(i => (int?)i)))
        Console.WriteLine($"{size?.ToString(CultureInfo.InvariantCulture) ?? "whole"}: {w.Describe(seed, File.ReadAllBytes(args[1]), size)}");
    return 0;
}
if (args.Length > 1 && args[0] == "one")
{
    FuzzWorker.Verbose = true;
    var index = long.Parse(args[1], CultureInfo.InvariantCulture);
    var (seed, file, rng) = Fuzzer.Input(index, args.Length > 2 ? int.Parse(args[2], CultureInfo.InvariantCulture) : 1);
    using var one = new FuzzWorker();
    var (verdict, detail) = one.Check(seed, file, rng);
    Console.WriteLine($"#{index} ({seed.Name}): {verdict} {detail}");
    return verdict == Verdict.Failed ? 1 : 0;
}
var inputs = args.Length > 0 ? long.Parse(args[0], CultureInfo.InvariantCulture) : 1_000_000;
var runSeed = args.Length > 1 ? int.Parse(args[1], CultureInfo.InvariantCulture) : 1;
var workers = args.Length > 2 ? int.Parse(args[2], CultureInfo.InvariantCulture) : Environment.ProcessorCount;
var folder = args.Length > 3 ? args[3] : Path.Combine(Path.GetTempPath(), "fw-fuzz-reproducers");
var start = DateTime.UtcNow;
var summary = Fuzzer.Run(inputs, runSeed, workers, folder, (done, failed) =>
    Console.Error.WriteLine(FormattableString.Invariant($"{done:N0} inputs, {failed} failures, {done / (DateTime.UtcNow - start).TotalSeconds:N0}/s")));
Console.WriteLine(FormattableString.Invariant(
    $"{summary.Inputs:N0} inputs (run seed {runSeed}, {workers} workers, each read whole and in two small part sizes) in {summary.Elapsed.TotalSeconds:N0} s"));
Console.WriteLine(FormattableString.Invariant($"read {summary.Read:N0}, refused with a documented error {summary.Refused:N0}, failed {summary.Failures.Count:N0}"));
foreach (var (kind, n) in summary.RefusalKinds.OrderByDescending(k => k.Value).Take(15)) Console.WriteLine(FormattableString.Invariant($"  {n,9:N0}  {kind}"));
foreach (var (index, seed, detail) in summary.Failures.Take(50)) Console.WriteLine($"FAIL #{index} ({seed}): {detail}");
if (summary.Failures.Count > 0) Console.WriteLine($"reproducers in {folder}");
return summary.Failures.Count == 0 ? 0 : 1;
