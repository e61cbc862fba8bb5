namespace FoulingWatch.Core.Exchangers;

/// <summary>What the Bell–Delaware method needs beyond the bundle: baffle cut and the clearances the leakage and bypass
/// streams pass through (SI: m). Null clearances take the defaults below.</summary>
/// <param name="BaffleCut">Segmental baffle cut as a share of the shell diameter (0.15–0.45).</param>
/// <param name="TubeBaffleClearance">Diametral clearance of a tube in its baffle hole; default 0.8 mm (TEMA, 1/32 in; from
/// memory).</param>
/// <param name="ShellBaffleClearance">Diametral clearance between shell and baffle; default 3.1 mm + 0.004·Ds (Taborek's
/// estimate of TEMA practice; from memory).</param>
/// <param name="BundleShellClearance">Shell diameter minus the outer tube limit; default 12 mm + 0.005·Ds (fixed tube
/// sheet or U-tube bundle, Taborek; from memory).</param>
/// <param name="SealingStripPairs">Pairs of sealing strips blocking the bundle bypass.</param>
/// <param name="InletSpacing">Baffle spacing at the inlet nozzle (default the central spacing).</param>
/// <param name="OutletSpacing">Baffle spacing at the outlet nozzle (default the central spacing).</param>
public sealed record BaffleDetails(double BaffleCut = 0.25, double? TubeBaffleClearance = null, double? ShellBaffleClearance = null,
    double? BundleShellClearance = null, int SealingStripPairs = 0, double? InletSpacing = null, double? OutletSpacing = null);

/// <summary>The Bell–Delaware correction factors of one flow state.</summary>
/// <param name="Jc">Baffle cut and spacing (window flow).</param>
/// <param name="Jl">Baffle leakage (tube-to-baffle and shell-to-baffle streams).</param>
/// <param name="Jb">Bundle bypass.</param>
/// <param name="Js">Unequal inlet and outlet baffle spacing.</param>
/// <param name="Jr">Adverse temperature gradient in laminar flow.</param>
public readonly record struct BellDelawareFactors(double Reynolds, double IdealJ, double Jc, double Jl, double Jb, double Js, double Jr);

/// <summary>
/// Shell-side film coefficient and pressure drop of a segmentally baffled shell by the Bell–Delaware method in Taborek's
/// form (Heat Exchanger Design Handbook, 1983, §3.3.7; also Serth, Process Heat Transfer, 2007, ch. 6): the ideal tube-bank
/// j and f factors (Taborek's curve fits by layout angle and Reynolds number) corrected for the window (Jc), baffle
/// leakage (Jl), bundle bypass (Jb), unequal end spacings (Js) and laminar build-up (Jr), and the pressure drop of the
/// cross-flow, window and end zones with the leakage (Rl), bypass (Rb) and end-spacing (Rs) factors. The leakage and
/// bypass factors use HEDH's curve fits of Bell's charts. Valid for 1 ≤ Re_s ≤ 10⁶ (the fits are given to 10⁵; beyond it
/// their last range is used) and baffle cuts of 15–45 %.
/// </summary>
public sealed class BellDelawareShell
{
    private readonly ShellAndTubeGeometry _g;
    private readonly double _bin, _bout, _sw, _dw, _rs, _rlm, _fsbp, _rss, _crossRows, _windowRows, _rowPitch;
    private readonly int _baffles;
    private readonly (double A1, double A2, double B1, double B2)[] _bands;
    private readonly double _a3, _a4, _b3, _b4;

    public BellDelawareShell(ShellAndTubeGeometry g, BaffleDetails d)
    {
        _g = g;
        if (!(d.BaffleCut >= 0.15 && d.BaffleCut <= 0.45))
            throw new Quantities.QuantityOutOfRangeException("baffle cut (Bell–Delaware)", d.BaffleCut * 100, "%", "15 % to 45 % of the shell diameter");
        double ds = g.ShellDiameter, d0 = g.TubeOuterDiameter, pt = g.TubePitch, b = g.BaffleSpacing;
        var ltb = d.TubeBaffleClearance ?? 0.8e-3;
        var lsb = d.ShellBaffleClearance ?? 3.1e-3 + 0.004 * ds;
        var lbb = d.BundleShellClearance ?? 12e-3 + 0.005 * ds;
        _bin = d.InletSpacing ?? b;
        _bout = d.OutletSpacing ?? b;
        var dotl = ds - lbb;
        var dctl = dotl - d0;
        var thetaCtl = 2 * Math.Acos(ds * (1 - 2 * d.BaffleCut) / dctl);
        var thetaDs = 2 * Math.Acos(1 - 2 * d.BaffleCut);
        var fw = thetaCtl / (2 * Math.PI) - Math.Sin(thetaCtl) / (2 * Math.PI);
        Fc = 1 - 2 * fw;
        (_rowPitch, var effectivePitch) = g.Layout switch
        {
            TubeLayout.Triangular => (0.866 * pt, pt),
            TubeLayout.Square => (pt, pt),
            _ => (0.707 * pt, 0.707 * pt),
        };
        CrossFlowArea = b * (lbb + dctl / effectivePitch * (pt - d0));
        var ssb = Math.PI * ds * lsb / 2 * (1 - thetaDs / (2 * Math.PI));
        var stb = Math.PI / 4 * ((d0 + ltb) * (d0 + ltb) - d0 * d0) * g.TubeCount * (1 - fw);
        _rs = ssb + stb > 0 ? ssb / (ssb + stb) : 0;
        _rlm = (ssb + stb) / CrossFlowArea;
        _fsbp = b * (ds - dotl) / CrossFlowArea;
        _crossRows = ds * (1 - 2 * d.BaffleCut) / _rowPitch;
        _windowRows = 0.8 / _rowPitch * (ds * d.BaffleCut - (ds - dctl) / 2);
        _rss = d.SealingStripPairs / _crossRows;
        var windowGross = ds * ds / 8 * (thetaDs - Math.Sin(thetaDs));
        var windowTubes = g.TubeCount * fw * Math.PI * d0 * d0 / 4;
        _sw = windowGross - windowTubes;
        _dw = 4 * _sw / (Math.PI * d0 * g.TubeCount * fw + thetaDs * ds);
        _baffles = Math.Max(1, (int)Math.Round((g.TubeLength - _bin - _bout) / b) + 1);
        (_bands, _a3, _a4, _b3, _b4) = Coefficients(g.Layout);
    }

    /// <summary>Fraction of tubes in pure cross flow, 1 − 2·F_w.</summary>
    public double Fc { get; }

    /// <summary>S_m, the cross-flow area at the shell's centre line.</summary>
    public double CrossFlowArea { get; }

    /// <summary>Number of baffles.</summary>
    public int Baffles => _baffles;

    /// <summary>Window flow area S_w (gross window less the tubes in it).</summary>
    public double WindowArea => _sw;

    /// <summary>Shell-side Reynolds number Do·ṁ/(μ·S_m).</summary>
    public double Reynolds(double massFlow, double viscosity) => _g.TubeOuterDiameter * massFlow / (viscosity * CrossFlowArea);

    /// <summary>The correction factors at a mass flow (kg/s) and bulk viscosity (Pa·s).</summary>
    public BellDelawareFactors Factors(double massFlow, double viscosity)
    {
        var re = Reynolds(massFlow, viscosity);
        FilmCorrelations.Check("Reynolds number (Bell–Delaware shell side)", re, 1, 1e6);
        var laminar = re < 100;
        var jc = 0.55 + 0.72 * Fc;
        var jl = LeakageFactor(_rs, _rlm);
        var jb = BypassFactor(_fsbp, _rss, laminar);
        var js = EndSpacingFactor(_baffles, _bin / _g.BaffleSpacing, _bout / _g.BaffleSpacing, laminar);
        var jr = LaminarFactor(re, (_crossRows + _windowRows) * (_baffles + 1));
        return new BellDelawareFactors(re, IdealJ(re), jc, jl, jb, js, jr);
    }

    /// <summary>Shell-side film coefficient (W/(m²·K)): h = j_i·cp·(ṁ/S_m)·Pr^(−2/3)·(μ/μ_w)^0.14·Jc·Jl·Jb·Js·Jr.</summary>
    public double Film(double massFlow, double viscosity, double specificHeat, double conductivity, double wallViscosity = double.NaN)
    {
        var f = Factors(massFlow, viscosity);
        var pr = specificHeat * viscosity / conductivity;
        FilmCorrelations.Check("Prandtl number (Bell–Delaware shell side)", pr, 0.5, 5000);
        var phi = double.IsFinite(wallViscosity) ? Math.Pow(viscosity / wallViscosity, 0.14) : 1;
        var ideal = f.IdealJ * specificHeat * massFlow / CrossFlowArea * Math.Pow(pr, -2.0 / 3) * phi;
        return ideal * f.Jc * f.Jl * f.Jb * f.Js * f.Jr;
    }

    /// <summary>Shell-side pressure drop (Pa) without nozzles: cross flow (N_b − 1)·ΔP_bi·R_b·R_l, windows N_b·ΔP_wi·R_l and
    /// the two end zones ΔP_bi·(1 + N_tcw/N_tcc)·R_b·R_s, with ΔP_bi = 2·f_i·N_tcc·(ṁ/S_m)²/ρ·(μ_w/μ)^0.14.</summary>
    public double PressureDrop(double massFlow, double viscosity, double density, double wallViscosity = double.NaN)
    {
        var re = Reynolds(massFlow, viscosity);
        FilmCorrelations.Check("Reynolds number (Bell–Delaware shell side)", re, 1, 1e6);
        var laminar = re < 100;
        var gm = massFlow / CrossFlowArea;
        var phi = double.IsFinite(wallViscosity) ? Math.Pow(viscosity / wallViscosity, 0.14) : 1;
        var ideal = 2 * IdealF(re) * _crossRows * gm * gm / density / phi;
        var p = -0.15 * (1 + _rs) + 0.8;
        var rl = Math.Exp(-1.33 * (1 + _rs) * Math.Pow(_rlm, p));
        var rb = _rss >= 0.5 ? 1 : Math.Exp(-(laminar ? 4.5 : 3.7) * _fsbp * (1 - Math.Cbrt(2 * _rss)));
        var n = laminar ? 1.0 : 0.2;
        var rsEnds = Math.Pow(_g.BaffleSpacing / _bin, 2 - n) + Math.Pow(_g.BaffleSpacing / _bout, 2 - n);
        var cross = (_baffles - 1) * ideal * rb * rl;
        var gw2 = massFlow * massFlow / (CrossFlowArea * _sw);
        var window = laminar
            ? 26 * viscosity * massFlow / (density * Math.Sqrt(CrossFlowArea * _sw))
                * (_windowRows / (_g.TubePitch - _g.TubeOuterDiameter) + _g.BaffleSpacing / (_dw * _dw)) + gw2 / density
            : (2 + 0.6 * _windowRows) * gw2 / (2 * density);
        var ends = ideal * (1 + _windowRows / _crossRows) * rb * rsEnds;
        return cross + _baffles * window * rl + ends;
    }

    /// <summary>J_l = 0.44·(1 − r_s) + [1 − 0.44·(1 − r_s)]·exp(−2.2·r_lm) (HEDH curve fit of Bell's chart).</summary>
    public static double LeakageFactor(double rs, double rlm) => 0.44 * (1 - rs) + (1 - 0.44 * (1 - rs)) * Math.Exp(-2.2 * rlm);

    /// <summary>J_b = exp[−C·F_sbp·(1 − (2·r_ss)^(1/3))], C = 1.25 (Re ≥ 100) or 1.35 (laminar); 1 from r_ss ≥ ½.</summary>
    public static double BypassFactor(double fsbp, double rss, bool laminar) =>
        rss >= 0.5 ? 1 : Math.Exp(-(laminar ? 1.35 : 1.25) * fsbp * (1 - Math.Cbrt(2 * rss)));

    /// <summary>J_s = [(N_b − 1) + L_i^(1−n) + L_o^(1−n)] / [(N_b − 1) + L_i + L_o], L the end spacings over the central
    /// one, n = 0.6 (turbulent) or 1/3 (laminar).</summary>
    public static double EndSpacingFactor(int baffles, double inletRatio, double outletRatio, bool laminar)
    {
        var n = laminar ? 1.0 / 3 : 0.6;
        return (baffles - 1 + Math.Pow(inletRatio, 1 - n) + Math.Pow(outletRatio, 1 - n)) / (baffles - 1 + inletRatio + outletRatio);
    }

    /// <summary>J_r = (10/N_c)^0.18 for Re ≤ 20, 1 from Re = 100, linear between, never below 0.4; N_c the rows crossed.</summary>
    public static double LaminarFactor(double re, double rowsCrossed)
    {
        if (re >= 100) return 1;
        var star = Math.Pow(10 / rowsCrossed, 0.18);
        var jr = re <= 20 ? star : star + (20 - re) / 80 * (star - 1);
        return Math.Max(0.4, jr);
    }

    /// <summary>Ideal tube-bank Colburn factor j_i = a₁·(1.33/(P_t/D_o))^a·Re^a₂, a = a₃/(1 + 0.14·Re^a₄).</summary>
    public double IdealJ(double re)
    {
        var band = _bands[Band(re)];
        var a = _a3 / (1 + 0.14 * Math.Pow(re, _a4));
        return band.A1 * Math.Pow(1.33 / (_g.TubePitch / _g.TubeOuterDiameter), a) * Math.Pow(re, band.A2);
    }

    /// <summary>Ideal tube-bank friction factor f_i = b₁·(1.33/(P_t/D_o))^b·Re^b₂, b = b₃/(1 + 0.14·Re^b₄).</summary>
    public double IdealF(double re)
    {
        var band = _bands[Band(re)];
        var b = _b3 / (1 + 0.14 * Math.Pow(re, _b4));
        return band.B1 * Math.Pow(1.33 / (_g.TubePitch / _g.TubeOuterDiameter), b) * Math.Pow(re, band.B2);
    }

    private static int Band(double re) => re < 10 ? 0 : re < 100 ? 1 : re < 1000 ? 2 : re < 10000 ? 3 : 4;

    /// <summary>Taborek's coefficients (HEDH 3.3.7, Table 2; from memory) for Re &lt; 10, 10–10², 10²–10³, 10³–10⁴, ≥ 10⁴.</summary>
    private static ((double, double, double, double)[] Bands, double A3, double A4, double B3, double B4) Coefficients(TubeLayout layout) =>
        layout switch
        {
            TubeLayout.Triangular => ([(1.400, -0.667, 48.0, -1.000), (1.360, -0.657, 45.10, -0.973), (0.593, -0.477, 4.570, -0.476),
                (0.321, -0.388, 0.486, -0.152), (0.321, -0.388, 0.372, -0.123)], 1.450, 0.519, 7.00, 0.500),
            TubeLayout.RotatedSquare => ([(1.550, -0.667, 32.0, -1.000), (0.498, -0.656, 26.20, -0.913), (0.730, -0.500, 3.500, -0.476),
                (0.370, -0.396, 0.333, -0.136), (0.370, -0.396, 0.303, -0.126)], 1.930, 0.500, 6.59, 0.520),
            _ => ([(0.970, -0.667, 35.0, -1.000), (0.900, -0.631, 32.10, -0.963), (0.408, -0.460, 6.090, -0.602),
                (0.107, -0.266, 0.0815, 0.022), (0.370, -0.395, 0.391, -0.148)], 1.187, 0.370, 6.30, 0.378),
        };
}
