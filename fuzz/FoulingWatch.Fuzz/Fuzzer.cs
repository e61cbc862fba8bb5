using System.Diagnostics;

namespace FoulingWatch.Fuzz;

/// <summary>Totals of a fuzz run; failures keep the input index (reproducible from the seed) and what went wrong.</summary>
public sealed record FuzzSummary(long Inputs, long Read, long Refused, IReadOnlyList<(long Index, string Seed, string Detail)> Failures,
    IReadOnlyDictionary<string, long> RefusalKinds, TimeSpan Elapsed);

public static class Fuzzer
{
    /// <summary>The input of a given index: its seed and mutated bytes (the same on every machine for one run seed).</summary>
    public static (Seed Seed, byte[] File, Random Rng) Input(long index, int runSeed)
    {
        var rng = new Random(Mix(runSeed, index));
        var seed = Seeds.All[rng.Next(Seeds.All.Count)];
        byte[] file;
        if (!seed.Compressed) file = Mutator.Mutate(seed.Text, rng);
        else if (rng.Next(5) == 0) file = Mutator.Mutate(Seeds.Compress(seed.Text), rng);   // damaged compressed bytes
        else file = Seeds.Compress(Mutator.Mutate(seed.Text, rng));
        return (seed, file, rng);
    }

    /// <summary>SplitMix64 of run seed and index (HashCode would differ from one process to the next).</summary>
    private static int Mix(int runSeed, long index)
    {
        var z = unchecked((ulong)runSeed * 0x9E3779B97F4A7C15UL + (ulong)index + 0x9E3779B97F4A7C15UL);
        z = unchecked((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9UL);
        z = unchecked((z ^ (z >> 27)) * 0x94D049BB133111EBUL);
        return (int)((z ^ (z >> 31)) & 0x7FFFFFFF);
    }

    public static FuzzSummary Run(long inputs, int runSeed, int workers, string? reproducers = null, Action<long, long>? progress = null)
    {
        var watch = Stopwatch.StartNew();
        long read = 0, refused = 0, done = 0;
        var failures = new List<(long, string, string)>();
        var kinds = new Dictionary<string, long>();
        Parallel.For(0, workers, new ParallelOptions { MaxDegreeOfParallelism = workers }, w =>
        {
            using var worker = new FuzzWorker();
            for (long i = w; i < inputs; i += workers)
            {
                var (seed, file, rng) = Input(i, runSeed);
                var (verdict, detail) = worker.Check(seed, file, rng);
                lock (failures)
                {
                    switch (verdict)
                    {
                        case Verdict.Read: read++; break;
                        case Verdict.Refused: refused++; kinds[detail] = kinds.GetValueOrDefault(detail) + 1; break;
                        default:
                            failures.Add((i, seed.Name, detail));
                            if (reproducers is not null)
                            {
                                Directory.CreateDirectory(reproducers);
                                File.WriteAllBytes(Path.Combine(reproducers, $"{i:D8}-{seed.Name}-{seed.FileName}"), file);
                            }
                            break;
                    }
                    if (++done % 10_000 == 0) progress?.Invoke(done, failures.Count);
                }
            }
        });
        return new FuzzSummary(inputs, read, refused, failures.OrderBy(f => f.Item1).ToList(), kinds, watch.Elapsed);
    }
}
