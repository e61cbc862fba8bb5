namespace FoulingWatch.Analysis.Economics;

/// <summary>Assigns cleanings to shutdown windows to maximise the total saving, each window taking at most its capacity and each exchanger at most one cleaning.</summary>
/// <remarks>
/// This is a transportation problem (a bipartite b-matching), whose constraint matrix is totally unimodular, so the
/// integer optimum equals the LP optimum. Solved exactly as a min-cost flow by successive shortest paths
/// (Bellman–Ford on the residual graph; Ahuja, Magnanti &amp; Orlin, Network Flows, 1993, ch. 9): source → exchanger
/// (capacity 1) → window (capacity 1, cost −saving, only for positive savings) → sink (capacity of the window).
/// Augmenting stops when the cheapest path no longer has negative cost, i.e. when no further cleaning adds saving.
/// </remarks>
public static class WindowAssignment
{
    /// <param name="saving">saving[e, w]: money saved by cleaning exchanger e in window w (≤ 0 or NaN: not worth it).</param>
    /// <returns>For each exchanger the window index, or −1 for none.</returns>
    public static int[] Solve(double[,] saving, int[] capacity)
    {
        var e = saving.GetLength(0);
        var w = saving.GetLength(1);
        var n = 2 + e + w;
        int source = 0, sink = n - 1;
        var edges = new List<(int From, int To, int Cap, double Cost)>();
        var adjacency = Enumerable.Range(0, n).Select(_ => new List<int>()).ToArray();
        void Add(int from, int to, int cap, double cost)
        {
            adjacency[from].Add(edges.Count); edges.Add((from, to, cap, cost));
            adjacency[to].Add(edges.Count); edges.Add((to, from, 0, -cost));
        }
        for (var i = 0; i < e; i++) Add(source, 1 + i, 1, 0);
        for (var i = 0; i < e; i++)
        for (var j = 0; j < w; j++)
            if (saving[i, j] > 0) Add(1 + i, 1 + e + j, 1, -saving[i, j]);
        for (var j = 0; j < w; j++) Add(1 + e + j, sink, Math.Max(0, capacity[j]), 0);
        var cap = edges.Select(x => x.Cap).ToArray();
        while (true)
        {
            var dist = Enumerable.Repeat(double.PositiveInfinity, n).ToArray();
            var via = Enumerable.Repeat(-1, n).ToArray();
            dist[source] = 0;
            for (var round = 0; round < n; round++)
            {
                var changed = false;
                for (var k = 0; k < edges.Count; k++)
                {
                    var (from, to, _, cost) = edges[k];
                    if (cap[k] > 0 && dist[from] + cost < dist[to] - 1e-9) { dist[to] = dist[from] + cost; via[to] = k; changed = true; }
                }
                if (!changed) break;
            }
            if (!(dist[sink] < -1e-9)) break;
            for (var v = sink; v != source; v = edges[via[v]].From) { cap[via[v]]--; cap[via[v] ^ 1]++; }
        }
        var result = Enumerable.Repeat(-1, e).ToArray();
        for (var k = 0; k < edges.Count; k += 2)
        {
            var (from, to, _, _) = edges[k];
            if (from >= 1 && from <= e && to > e && to < sink && cap[k] == 0) result[from - 1] = to - 1 - e;
        }
        return result;
    }
}
