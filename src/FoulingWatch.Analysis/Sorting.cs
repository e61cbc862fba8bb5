namespace FoulingWatch.Analysis;

/// <summary>Sorting for medians and quantiles.</summary>
public static class Sorting
{
    /// <summary>The values in ascending order in a new array (NaN first, as <c>Order()</c> puts them), sorted by
    /// <see cref="Array.Sort{T}(T[])"/>: the same array as <c>Order().ToArray()</c> for doubles, several times faster
    /// (no key comparer per comparison); the daily medians sort every sample of the record.</summary>
    public static double[] Sorted(this IEnumerable<double> values)
    {
        var array = values.ToArray();
        Array.Sort(array);
        return array;
    }
}
