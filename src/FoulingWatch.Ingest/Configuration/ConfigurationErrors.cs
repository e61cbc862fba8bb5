namespace FoulingWatch.Ingest.Configuration;

/// <summary>One problem in the plant configuration: the JSON path of the key, what is wrong and what is expected.</summary>
public sealed record ConfigurationError(string Path, string Message)
{
    public override string ToString() => $"{Path}: {Message}";
}

/// <summary>The plant configuration cannot be used; carries every problem found, not only the first.</summary>
public sealed class ConfigurationException : Exception
{
    public ConfigurationException(string file, IReadOnlyList<ConfigurationError> errors)
        : base(Format(file, errors))
    {
        File = file;
        Errors = errors;
    }

    public string File { get; }
    public IReadOnlyList<ConfigurationError> Errors { get; }

    private static string Format(string file, IReadOnlyList<ConfigurationError> errors)
    {
        var name = System.IO.Path.GetFileName(file);
        var lines = errors.Select(e => $"{name}: {e}");
        return errors.Count == 1 ? lines.First()
            : $"{errors.Count} problems in {name}:{Environment.NewLine}" + string.Join(Environment.NewLine, lines);
    }
}

/// <summary>Edit distance for "did you mean" suggestions.</summary>
internal static class Suggest
{
    public static string? Closest(string key, IEnumerable<string> candidates)
    {
        string? best = null;
        var bestDistance = int.MaxValue;
        foreach (var c in candidates)
        {
            var d = Levenshtein(key.ToLowerInvariant(), c.ToLowerInvariant());
            if (d < bestDistance) { bestDistance = d; best = c; }
        }
        return best is not null && bestDistance <= Math.Max(2, key.Length / 3) ? best : null;
    }

    private static int Levenshtein(string a, string b)
    {
        var prev = new int[b.Length + 1];
        var cur = new int[b.Length + 1];
        for (var j = 0; j <= b.Length; j++) prev[j] = j;
        for (var i = 1; i <= a.Length; i++)
        {
            cur[0] = i;
            for (var j = 1; j <= b.Length; j++)
                cur[j] = Math.Min(Math.Min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1));
            (prev, cur) = (cur, prev);
        }
        return prev[b.Length];
    }
}
