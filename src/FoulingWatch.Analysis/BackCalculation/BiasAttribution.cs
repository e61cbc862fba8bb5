namespace FoulingWatch.Analysis.BackCalculation;

/// <summary>How well a bias on one sensor explains a heat-balance mismatch: f ≈ J·(a + b·τ).</summary>
/// <param name="Explained">R² of the fit (share of Σf² explained).</param>
/// <param name="Bias">a + b·τ at the last sample: the sensor reads this much above truth there.</param>
/// <param name="RatePerDay">b, the bias's growth per day (zero for a constant-bias fit).</param>
public readonly record struct SensorBias(int Sensor, double Explained, double Bias, double RatePerDay);

/// <summary>Which single sensor's bias best explains a set of heat-balance mismatches.</summary>
/// <remarks>
/// The mismatch f = Q_hot − Q_cold of a sample moves with a bias δᵢ on sensor i by Jᵢ·δᵢ, Jᵢ = ∂f/∂xᵢ (the reconciliation
/// sensitivity). Least squares of f on Jᵢ (constant bias) or on Jᵢ and Jᵢ·τ (bias growing linearly with time τ) gives the
/// bias and the share of the mismatch it explains; the sensor with the largest share is the likeliest culprit (the
/// serial-elimination idea of gross-error identification, Narasimhan &amp; Jordache 2000, ch. 8, from memory). A stream's
/// inlet and outlet enter with opposite sensitivities Jᵢ = ±ṁcₚ, so a bias on one is indistinguishable from the opposite
/// bias on the other by the balance alone: callers name every sensor within a small margin of the best.
/// </remarks>
public static class BiasAttribution
{
    public const double TieMargin = 0.02;

    /// <param name="f">Mismatch per sample, W.</param>
    /// <param name="j">Sensitivities per sample (6 each).</param>
    /// <param name="tau">Days since the drift onset per sample, or null for a constant bias.</param>
    public static SensorBias[] Rank(IReadOnlyList<double> f, IReadOnlyList<double[]> j, IReadOnlyList<double>? tau)
    {
        var total = 0.0;
        foreach (var v in f) total += v * v;
        var result = new SensorBias[Measurement.Count];
        var tauEnd = tau is null || tau.Count == 0 ? 0 : tau[^1];
        for (var i = 0; i < Measurement.Count; i++)
        {
            // normal equations of f ≈ a·J + b·J·τ
            double s11 = 0, s12 = 0, s22 = 0, r1 = 0, r2 = 0;
            for (var s = 0; s < f.Count; s++)
            {
                var x1 = j[s][i];
                var x2 = tau is null ? 0 : x1 * tau[s];
                s11 += x1 * x1; s12 += x1 * x2; s22 += x2 * x2; r1 += x1 * f[s]; r2 += x2 * f[s];
            }
            if (!(s11 > 0)) { result[i] = new SensorBias(i, double.NegativeInfinity, 0, 0); continue; }
            double a, b;
            var det = s11 * s22 - s12 * s12;
            if (tau is not null && det > 1e-12 * s11 * s22) { a = (r1 * s22 - r2 * s12) / det; b = (s11 * r2 - s12 * r1) / det; }
            else { a = r1 / s11; b = 0; }
            var residual = 0.0;
            for (var s = 0; s < f.Count; s++)
            {
                var e = f[s] - j[s][i] * (a + b * (tau?[s] ?? 0));
                residual += e * e;
            }
            result[i] = new SensorBias(i, total > 0 ? 1 - residual / total : 0, a + b * tauEnd, b);
        }
        return result;
    }

    /// <summary>Sensitivities of the mismatch to each measurement, by central differences.</summary>
    public static double[] Sensitivities(SampleEvaluator evaluator, double[] m)
    {
        var x = evaluator.Exchanger;
        return Reconciliation.Reconcile(m, evaluator.Sigmas(m), v =>
        {
            var d = evaluator.Duties(v, x.Hot.PressurePascals, x.Cold.PressurePascals, out _);
            return d is null ? double.NaN : d.Value.Hot - d.Value.Cold;
        }, iterations: 1).Sensitivities;
    }

    /// <summary>"hot outlet TI-1 (+0.8 K) or hot inlet TI-2 (−0.8 K)": every sensor within <see cref="TieMargin"/> of the best.</summary>
    public static List<string> Suspects(SensorBias[] ranked, IReadOnlyList<string> tags)
    {
        var best = ranked.Max(r => r.Explained);
        return ranked.Where(r => r.Explained >= best - TieMargin).OrderByDescending(r => r.Explained)
            .Select(r => FormattableString.Invariant(
                $"{Measurement.Names[r.Sensor]} {tags[r.Sensor]} ({r.Bias:+0.##;-0.##} {UnitOf(r.Sensor)})")).ToList();
    }

    public static string UnitOf(int sensor) => sensor is Measurement.HotFlow or Measurement.ColdFlow ? "kg/s" : "K";
}
