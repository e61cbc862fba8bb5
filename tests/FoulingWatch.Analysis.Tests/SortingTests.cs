namespace FoulingWatch.Analysis.Tests;

/// <summary>Selection against a full sort (self-consistency, not an external check).</summary>
public sealed class SortingTests
{
    [Fact]
    public void Select_gives_the_element_a_full_sort_puts_at_k()
    {
        var random = new Random(11);
        for (var trial = 0; trial < 400; trial++)
        {
            var n = random.Next(1, 300);
            // ties on purpose: few distinct values in half the trials
            var values = Enumerable.Range(0, n).Select(_ => trial % 2 == 0 ? random.NextDouble() : random.Next(5)).ToArray();
            var sorted = values.Sorted();
            var k = random.Next(n);
            Assert.Equal(sorted[k], Sorting.Select((double[])values.Clone(), k));
        }
        Assert.Throws<ArgumentOutOfRangeException>(() => Sorting.Select([1.0], 1));
    }
}
