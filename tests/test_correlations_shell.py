"""Tests for revamp.correlations.shell (Bell-Delaware and Kern).

Expected values come from: Taborek's (1983) published fit coefficients typed here from Serth & Lestina (2014)
Table 6.1 and evaluated by hand; the independent `ht` library (ht.conv_tube_bank Bell-Delaware helpers, both its
HEDH curve fits and its digitized Bell charts, and dP_Kern); Kern (1950) Fig. 28 and Example 7.3 (from memory).
"""
from __future__ import annotations

import math

import fluids.fittings as fl
import ht.conv_tube_bank as tb
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from revamp.correlations.shell_bell import baffle_cut_factor
from revamp.correlations.shell import (SHELL_METHODS, ShellSideResult, bell_delaware, correction_factors, ideal_f,
                                       ideal_j, kern, kern_equivalent_diameter)
from revamp.errors import InputError
from revamp.geometry import ShellAndTube, bell_geometry

INCH, FT = 0.0254, 0.3048
LB_H = 0.45359237 / 3600.0

# Kern (1950) Example 7.3 geometry: 21-1/4 in shell, 158 tubes 1 in od on 1-1/4 in square pitch, 16 ft, 4 passes,
# baffles 5 in apart (the exchanger of the rating issue's example)
KERN_73 = dict(shell_id=21.25 * INCH, tube_od=INCH, tube_wall=0.095 * INCH, tube_length=16 * FT, tube_count=158,
               tube_passes=4, tube_pitch=1.25 * INCH, layout=90, baffle_spacing=5 * INCH, baffle_cut=0.25,
               tube_material="carbon steel", rear_head="fixed")


def hx(**changes):
    return ShellAndTube(**{**KERN_73, **changes})


# ---------------------------------------------------------------------------------------------- ideal j and f
# Taborek (1983) coefficients as printed in Serth & Lestina (2014) Table 6.1 (with 1.498 for 45°, 10-100, see below)
TABLE = {
    30: [(1e5, 1e4, 0.321, -0.388, 0.372, -0.123), (1e4, 1e3, 0.321, -0.388, 0.486, -0.152),
         (1e3, 1e2, 0.593, -0.477, 4.570, -0.476), (1e2, 10, 1.360, -0.657, 45.10, -0.973),
         (10, 0, 1.400, -0.667, 48.00, -1.000)],
    45: [(1e5, 1e4, 0.370, -0.396, 0.303, -0.126), (1e4, 1e3, 0.370, -0.396, 0.333, -0.136),
         (1e3, 1e2, 0.730, -0.500, 3.500, -0.476), (1e2, 10, 1.498, -0.656, 26.20, -0.913),
         (10, 0, 1.550, -0.667, 32.00, -1.000)],
    90: [(1e5, 1e4, 0.370, -0.395, 0.391, -0.148), (1e4, 1e3, 0.107, -0.266, 0.0815, 0.022),
         (1e3, 1e2, 0.408, -0.460, 6.090, -0.602), (1e2, 10, 0.900, -0.631, 32.10, -0.963),
         (10, 0, 0.970, -0.667, 35.00, -1.000)],
}
A34B34 = {30: (1.450, 0.519, 7.00, 0.500), 45: (1.930, 0.500, 6.59, 0.520), 90: (1.187, 0.370, 6.30, 0.378)}


def by_hand(Re, ratio, layout):
    """Taborek's fit evaluated straight from the printed table."""
    a3, a4, b3, b4 = A34B34[layout]
    for hi, lo, a1, a2, b1, b2 in TABLE[layout]:
        if lo <= Re < hi:
            a = a3 / (1 + 0.14 * Re ** a4)
            b = b3 / (1 + 0.14 * Re ** b4)
            return a1 * (1.33 / ratio) ** a * Re ** a2, b1 * (1.33 / ratio) ** b * Re ** b2
    raise ValueError(Re)


@pytest.mark.parametrize("Re", [3.0, 50.0, 500.0, 5e3, 5e4])
@pytest.mark.parametrize("layout", [30, 45, 90])
@pytest.mark.parametrize("ratio", [1.25, 1.33, 1.5])
def test_ideal_j_f_match_the_published_fit(Re, layout, ratio):
    j, f = by_hand(Re, ratio, layout)
    assert ideal_j(Re, ratio, layout) == pytest.approx(j, rel=1e-12)
    assert ideal_f(Re, ratio, layout) == pytest.approx(f, rel=1e-12)


def test_ideal_j_hand_value():
    # by hand (calculator) from Serth & Lestina Table 6.1, 30°, Re = 5000, Pt/do = 1.25:
    # 5000**0.519 = 83.13, a = 1.45/(1 + 0.14*83.13) = 0.1147; (1.33/1.25)**a = 1.00714; 5000**-0.388 = 0.036711;
    # j = 0.321*1.00714*0.036711 = 0.011868
    assert ideal_j(5000.0, 1.25, 30) == pytest.approx(0.011868, rel=1e-4)
    assert ideal_j(5000.0, 1.25, 60) == ideal_j(5000.0, 1.25, 30)  # Taborek: 60° uses the 30° fits


@pytest.mark.parametrize("layout", [30, 45, 60, 90])
@pytest.mark.parametrize("edge", [10.0, 100.0, 1e3, 1e4])
def test_fits_are_continuous_across_bands(layout, edge):
    # the bands were fitted to one smooth curve (Taborek 1983): neighbours agree within a few per cent at each edge.
    # This is what shows that the 45° a1 for 10 < Re < 100 is 1.498 and not the 0.498 of some printed copies.
    for fn, tol in ((ideal_j, 0.07), (ideal_f, 0.03)):
        below, above = fn(edge * (1 - 1e-9), 1.25, layout), fn(edge, 1.25, layout)
        assert above == pytest.approx(below, rel=tol), (fn.__name__, layout, edge)


def test_the_0498_misprint_would_break_continuity():
    # with 0.498 the 45° j at Re = 100 would be a third of its neighbour's (0.730*100**-0.5 = 0.073)
    assert 0.498 * 100 ** -0.656 / (0.730 * 100 ** -0.5) == pytest.approx(1 / 3, rel=0.02)
    assert ideal_j(99.999, 1.33, 45) == pytest.approx(0.073, rel=0.02)


def test_ideal_fits_are_array_native():
    re = np.array([[5.0, 50.0], [5e3, 5e4]])
    out = ideal_j(re, 1.25, 90)
    assert out.shape == (2, 2)
    assert out[1, 0] == pytest.approx(ideal_j(5e3, 1.25, 90))


# ---------------------------------------------------------------------------------------------- J and R factors
GEOMS = [dict(), dict(baffle_cut=0.2, sealing_strip_pairs=1), dict(baffle_cut=0.35, layout=30, tube_count=170),
         dict(rear_head="split-ring", tube_count=120, baffle_spacing_in=0.3, baffle_spacing_out=0.25),
         dict(layout=45, clearance_tube_baffle=0.4e-3, clearance_shell_baffle=3e-3, sealing_strip_pairs=3)]


@pytest.mark.parametrize("changes", GEOMS)
@pytest.mark.parametrize("Re", [15.0, 35.0, 5e3])  # outside the blend band 40-250 around the switch at Re = 100
def test_factors_match_ht_hedh_fits(changes, Re):
    g = hx(**changes).bell()
    c = correction_factors(g, Re)
    lam = Re < 100
    # ht.conv_tube_bank codes the same HEDH (Taborek 1983) equations under method='HEDH' (Jc: the linear fit holds
    # below Fc = 0.8333, where it reaches the chart's 1.15 cap; every geometry here is below)
    assert g.Fc < 0.83
    assert float(c["Jc"]) == pytest.approx(tb.baffle_correction_Bell(g.Fc, method="HEDH"), rel=1e-9)
    assert float(c["Jl"]) == pytest.approx(tb.baffle_leakage_Bell(g.Ssb, g.Stb, g.Sm, method="HEDH"), rel=1e-9)
    assert float(c["Jb"]) == pytest.approx(tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc, laminar=lam,
                                                                   method="HEDH"), rel=1e-9)
    assert float(c["Js"]) == pytest.approx(tb.unequal_baffle_spacing_Bell(g.Nb, g.Lbc, g.Lbi, g.Lbo, laminar=lam),
                                           rel=1e-9)
    nct = (g.Nb + 1) * (g.Nc + g.Ncw)
    assert float(c["Jr"]) == pytest.approx(tb.laminar_correction_Bell(Re, nct), rel=1e-9)


@pytest.mark.parametrize("changes", GEOMS)
def test_factors_near_bells_charts(changes):
    g = hx(**changes).bell()
    c = correction_factors(g, 5e3)
    # ht's default methods interpolate Bell's digitized charts: the HEDH fits follow them within a few per cent
    # (Jc within 4.5 % for Fc <= 0.9, Jl within 10 %, Jb within 2 %: differences seen in ht's own docstrings)
    assert float(c["Jc"]) == pytest.approx(tb.baffle_correction_Bell(g.Fc), rel=0.045)
    assert float(c["Jl"]) == pytest.approx(tb.baffle_leakage_Bell(g.Ssb, g.Stb, g.Sm), rel=0.10)
    assert float(c["Jb"]) == pytest.approx(tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc), rel=0.02)


def test_pressure_factors_by_hand_and_limits():
    g = hx(clearance_tube_baffle=0.8e-3, clearance_shell_baffle=4.8e-3, clearance_bundle_shell=15e-3).bell()
    c = correction_factors(g, np.array([30.0, 5e3]))  # outside the laminar/turbulent blend band 40-250
    rs, rlm = g.Ssb / (g.Ssb + g.Stb), (g.Ssb + g.Stb) / g.Sm
    # Taborek (1983): Rl = exp(-1.33 (1 + rs) rlm^p), p = -0.15 (1 + rs) + 0.8
    assert c["Rl"][1] == pytest.approx(math.exp(-1.33 * (1 + rs) * rlm ** (-0.15 * (1 + rs) + 0.8)))
    # Rb = exp(-Cbp Fsbp (1 - (2 rss)^(1/3))), Cbp = 4.5 laminar, 3.7 turbulent (no strips: rss = 0)
    assert c["Rb"][0] == pytest.approx(math.exp(-4.5 * g.Fsbp)) and c["Rb"][1] == pytest.approx(math.exp(-3.7 * g.Fsbp))
    # Rs = [(Lbc/Lbo)^(2-n) + (Lbc/Lbi)^(2-n)]/2, n = 1 laminar, 0.2 turbulent
    assert c["Rs"][1] == pytest.approx(0.5 * ((g.Lbc / g.Lbo) ** 1.8 + (g.Lbc / g.Lbi) ** 1.8))
    # limits: no clearances -> no leakage correction; rss >= 1/2 -> no bypass correction; equal spacings -> Rs = 1
    tight = hx(clearance_tube_baffle=0.0, clearance_shell_baffle=0.0, sealing_strip_pairs=10, tube_length=4.064,
               baffle_spacing=0.127).bell()
    ct = correction_factors(tight, 5e3)
    assert float(ct["Jl"]) == pytest.approx(1.0) and float(ct["Rl"]) == pytest.approx(1.0)
    assert float(ct["Jb"]) == 1.0 and float(ct["Rb"]) == 1.0
    assert float(ct["Rs"]) == pytest.approx(1.0) and float(ct["Js"]) == pytest.approx(1.0)


# ---------------------------------------------------------------------------------------------- bell_delaware
PROPS = dict(rho=730.0, cp=2470.0, mu=0.40e-3, k=0.13)  # a light hydrocarbon near 140 °C (invented values)


def test_h_and_dp_assemble_the_published_equations():
    g = hx().bell()
    m = 43800 * LB_H
    r = bell_delaware(g, m, **PROPS, mu_wall=0.5e-3)
    G = m / g.Sm
    Re = g.tube_od * G / PROPS["mu"]
    Pr = PROPS["cp"] * PROPS["mu"] / PROPS["k"]
    phi = (0.40 / 0.5) ** 0.14
    j, f = by_hand(Re, g.pitch / g.tube_od, 90)
    J = (tb.baffle_correction_Bell(g.Fc, "HEDH") * tb.baffle_leakage_Bell(g.Ssb, g.Stb, g.Sm, "HEDH")
         * tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc, method="HEDH")
         * tb.unequal_baffle_spacing_Bell(g.Nb, g.Lbc, g.Lbi, g.Lbo))
    # Taborek (1983): h = j cp (m/Sm) Pr^(-2/3) (mu/mu_w)^0.14 Jc Jl Jb Js Jr (Jr = 1 in turbulent flow)
    assert r.h == pytest.approx(j * PROPS["cp"] * G * Pr ** (-2 / 3) * phi * J, rel=1e-9)
    assert r.Re == pytest.approx(Re) and r.velocity_crossflow == pytest.approx(G / PROPS["rho"])
    # Δpbi = 2 f Nc G²/ρ (μw/μ)^0.14; Δpc = (Nb-1) Δpbi Rb Rl; Δpw = Nb (2 + 0.6 Ncw) Gw²/(2ρ) Rl
    dpbi = 2 * f * g.Nc * G ** 2 / PROPS["rho"] / phi
    assert r.dp_crossflow == pytest.approx((g.Nb - 1) * dpbi * r.Rb * r.Rl, rel=1e-9)
    gw = m / math.sqrt(g.Sm * g.Sw)
    assert r.dp_window == pytest.approx(g.Nb * (2 + 0.6 * g.Ncw) * gw ** 2 / (2 * PROPS["rho"]) * r.Rl, rel=1e-9)
    assert r.dp_ends == pytest.approx(2 * dpbi * (1 + g.Ncw / g.Nc) * r.Rb * r.Rs, rel=1e-9)
    assert r.dp == pytest.approx(r.dp_crossflow + r.dp_window + r.dp_ends)
    # inside every validity range: the only possible notes are the leakage/bypass design-guidance ones
    assert [w for w in r.warnings if "Jl =" not in w and "Jb =" not in w] == []
    assert all(("Jl =" in w) == (r.Jl < 0.6) for w in r.warnings if "Jl =" in w)


def test_laminar_window_pressure_drop():
    g = hx().bell()
    props = dict(rho=900.0, cp=2000.0, mu=0.5, k=0.12)  # a heavy oil: Re well below 100
    r = bell_delaware(g, 2.0, **props)
    assert r.Re < 100 and r.Jr < 1.0
    gw = 2.0 / math.sqrt(g.Sm * g.Sw)
    # Taborek (1983), laminar window: 26 μ mw/ρ [Ncw/(Pt - do) + Lbc/Dw²] + mw²/ρ (from memory of HEDH §3.3.9)
    dpwi = 26 * 0.5 * gw / 900 * (g.Ncw / (g.pitch - g.tube_od) + g.Lbc / g.Dw ** 2) + gw ** 2 / 900
    assert r.dp_window == pytest.approx(g.Nb * dpwi * r.Rl, rel=1e-9)


def test_arrays_broadcast_and_match_scalars():
    g = hx().bell()
    m = np.array([1.0, 3.0, 6.0])
    mu = np.array([[0.4e-3], [2e-3]])
    r = bell_delaware(g, m, 730.0, 2470.0, mu, 0.13)
    assert r.h.shape == (2, 3) and r.dp.shape == (2, 3)
    one = bell_delaware(g, 3.0, 730.0, 2470.0, 2e-3, 0.13)
    assert isinstance(one.h, float)
    assert r.h[1, 1] == pytest.approx(one.h) and r.dp[1, 1] == pytest.approx(one.dp)
    assert bell_delaware(g, [1.0, 3.0], 730.0, 2470.0, 0.4e-3, 0.13).h.shape == (2,)


def test_warnings_outside_validity():
    g = hx().bell()
    assert any("Re" in w for w in bell_delaware(g, 400.0, 730.0, 2470.0, 0.2e-3, 0.13).warnings)  # Re > 1e5
    odd = bell_geometry(Ds=0.54, tube_od=0.0254, pitch=0.03175, layout=90, tubes=158, length=4.88, Lbc=0.7,
                        Lbi=0.7, Lbo=0.7, Nb=5, Bc=0.10, Lbb=0.015, Lsb=0.0048, Ltb=0.0008)
    text = " ".join(bell_delaware(odd, 5.0, **PROPS).warnings)
    assert "baffle cut" in text and "spacing" in text


@pytest.mark.parametrize("name, value", [("m_dot", 0.0), ("rho", -1.0), ("mu", 0.0), ("k", -0.1), ("cp", 0.0)])
def test_bad_flow_or_property_names_the_field(name, value):
    args = dict(m_dot=5.0, **PROPS)
    args[name] = value
    with pytest.raises(InputError) as err:
        bell_delaware(hx().bell(), **args)
    assert err.value.field == name


def test_method_registry():
    assert SHELL_METHODS["bell-delaware"] is bell_delaware and SHELL_METHODS["kern"] is kern
    assert isinstance(kern(hx().bell(), 5.0, **PROPS), ShellSideResult)


# ---------------------------------------------------------------------------------------------- invariants
@settings(max_examples=40, deadline=None)
@given(m=st.floats(0.05, 50.0), factor=st.floats(1.05, 3.0), mu=st.floats(2e-4, 0.2), cut=st.floats(0.15, 0.45),
       layout=st.sampled_from([30, 45, 60, 90]))
def test_h_and_dp_rise_with_flow(m, factor, mu, cut, layout):
    g = hx(baffle_cut=cut, layout=layout, tube_count=120).bell()
    lo = bell_delaware(g, m, 800.0, 2200.0, mu, 0.12)
    hi = bell_delaware(g, m * factor, 800.0, 2200.0, mu, 0.12)
    # more flow, more h and more dp everywhere, including across the laminar/turbulent switch at Re = 100
    # (physical expectation, no source needed)
    assert hi.dp > lo.dp and hi.dp_window >= lo.dp_window
    assert hi.h > lo.h
    assert 0.4 <= hi.Jr <= 1 and 0 < hi.Jl <= 1 and 0 < hi.Jb <= 1


@settings(max_examples=30, deadline=None)
@given(m=st.floats(0.5, 30.0), extra=st.floats(0.2e-3, 3e-3), which=st.sampled_from(["clearance_tube_baffle",
                                                                                      "clearance_shell_baffle",
                                                                                      "clearance_bundle_shell"]))
def test_more_clearance_lowers_h(m, extra, which):
    base = hx(clearance_tube_baffle=0.8e-3, clearance_shell_baffle=4.8e-3, clearance_bundle_shell=15e-3,
              tube_count=140)
    loose = base.replace(**{which: getattr(base, which) + extra})
    h0 = bell_delaware(base.bell(), m, **PROPS).h
    h1 = bell_delaware(loose.bell(), m, **PROPS).h
    assert h1 < h0


def test_sealing_strips_raise_h():
    base = hx(rear_head="pull-through", tube_count=110)
    sealed = base.replace(sealing_strip_pairs=2)
    assert bell_delaware(sealed.bell(), 5.0, **PROPS).h > bell_delaware(base.bell(), 5.0, **PROPS).h


# ---------------------------------------------------------------------------------------------- Kern
@pytest.mark.parametrize("do, pt, layout, de_in", [(1.0, 1.25, 90, 0.99), (0.75, 1.0, 90, 0.95),
                                                   (1.0, 1.25, 30, 0.72), (0.75, 1.0, 30, 0.73)])
def test_kern_equivalent_diameter_matches_his_figure(do, pt, layout, de_in):
    # Kern (1950) Fig. 28 (from memory): De = 0.99, 0.95 in (square), 0.72, 0.73 in (triangular)
    assert kern_equivalent_diameter(do * INCH, pt * INCH, layout) / INCH == pytest.approx(de_in, rel=0.03)


def test_kern_example_7_3():
    # Kern (1950) Example 7.3, kerosene in the shell (values from memory): 43,800 lb/h, mu = 0.40 cP at 280 °F,
    # s = 0.73; Re_s = 25,300, jH = 93, ΔPs = 3.5 psi (with phi_s = 1)
    g = hx().bell()
    r = kern(g, 43800 * LB_H, rho=0.73 * 62.5 * 16.018, cp=2470.0, mu=0.40e-3, k=0.13)
    assert r.Re == pytest.approx(25300, rel=0.02)
    de = kern_equivalent_diameter(g.tube_od, g.pitch, 90)
    jh = r.h * de / 0.13 / (2470.0 * 0.40e-3 / 0.13) ** (1 / 3)
    assert jh == pytest.approx(93, rel=0.05)  # Kern's chart reading vs his line 0.36 Re^0.55
    assert r.dp == pytest.approx(3.5 * 6894.76, rel=0.10)
    assert math.isnan(r.Jl) and math.isnan(r.dp_window) and r.method == "kern"


@pytest.mark.parametrize("m", [2.0, 5.0, 15.0])
def test_kern_dp_against_ht(m):
    g = hx().bell()
    r = kern(g, m, **PROPS, mu_wall=0.5e-3)
    # ht.conv_tube_bank.dP_Kern interpolates Kern's friction chart; the exp(0.576 - 0.19 ln Re) fit is within ~12 %
    ref = tb.dP_Kern(m=m, rho=PROPS["rho"], mu=PROPS["mu"], mu_w=0.5e-3, DShell=g.Ds, LSpacing=g.Lbc,
                     pitch=g.pitch, Do=g.tube_od, NBaffles=g.Nb)
    assert r.dp == pytest.approx(ref, rel=0.12)


def test_kern_h_by_hand():
    g = hx().bell()
    r = kern(g, 5.0, **PROPS, mu_wall=0.6e-3)
    de = 4 * (g.pitch ** 2 - math.pi * g.tube_od ** 2 / 4) / (math.pi * g.tube_od)  # Kern eq. for square pitch
    gs = 5.0 / (g.Ds * (g.pitch - g.tube_od) * g.Lbc / g.pitch)
    re = de * gs / PROPS["mu"]
    pr = PROPS["cp"] * PROPS["mu"] / PROPS["k"]
    # Kern (1950): ho De/k = 0.36 Re^0.55 Pr^(1/3) (mu/mu_w)^0.14
    assert r.h == pytest.approx(0.36 * PROPS["k"] / de * re ** 0.55 * pr ** (1 / 3) * (0.4 / 0.6) ** 0.14)
    assert kern(g, 0.05, **PROPS).warnings  # Re below 2000


# ---------------------------------------------------------------------------------------------- printed forms
@pytest.mark.parametrize("changes", GEOMS)
def test_geometry_matches_the_degree_forms_printed_in_data_book_iii(changes):
    # Taborek (1983) as printed in Thome, Engineering Data Book III (Wolverine Tube), ch. 3, eqs. 3.4.4-3.4.12,
    # 3.4.15-3.4.17, 3.4.21, 3.5.13-3.5.17, with angles in degrees (numbers checked against a public
    # reproduction of that chapter). A different algebraic form from ours (radians), so a slip in either shows.
    h = hx(**changes)
    g = h.bell()
    Ds, do, Lbc, N = g.Ds, g.tube_od, g.Lbc, g.tubes
    Bc = 100 * g.Bc
    Dotl = Ds - h.clearance_bundle_shell
    Dctl = Dotl - do
    th_ds = 2 * math.degrees(math.acos(1 - 2 * Bc / 100))
    th_ctl = 2 * math.degrees(math.acos(Ds / Dctl * (1 - 2 * Bc / 100)))
    Fw = th_ctl / 360 - math.sin(math.radians(th_ctl)) / (2 * math.pi)
    assert g.Fw == pytest.approx(Fw, rel=1e-12) and g.Fc == pytest.approx(1 - 2 * Fw, rel=1e-12)
    # 0.00436 is pi/720 rounded, hence rel=1e-3
    assert g.Ssb == pytest.approx(0.00436 * Ds * h.clearance_shell_baffle * (360 - th_ds), rel=1e-3)
    Ltb = h.clearance_tube_baffle
    assert g.Stb == pytest.approx(math.pi / 4 * ((do + Ltb) ** 2 - do ** 2) * N * (1 - Fw), rel=1e-12)
    Ptef = {30: 1.0, 45: 0.707, 90: 1.0}[g.layout] * g.pitch
    assert g.Sm == pytest.approx(Lbc * (h.clearance_bundle_shell + Dctl / Ptef * (g.pitch - do)), rel=1e-3)
    assert g.Sb == pytest.approx(Lbc * (Ds - Dotl), rel=1e-12)  # no pass lanes counted (Lpl = 0)
    Lpp = {30: 0.866, 45: 0.707, 90: 1.0}[g.layout] * g.pitch
    assert g.Nc == pytest.approx(Ds / Lpp * (1 - 2 * Bc / 100), rel=1e-3)
    assert g.Ncw == pytest.approx(0.8 / Lpp * (Ds * Bc / 100 - (Ds - Dctl) / 2), rel=1e-3)
    Swg = math.pi * Ds ** 2 / 4 * (th_ds / 360 - math.sin(math.radians(th_ds)) / (2 * math.pi))
    Ntw = N * Fw
    Sw = Swg - Ntw * math.pi / 4 * do ** 2
    assert g.Swg == pytest.approx(Swg, rel=1e-12) and g.Sw == pytest.approx(Sw, rel=1e-12)
    assert g.Dw == pytest.approx(4 * Sw / (math.pi * do * Ntw + math.pi * Ds * th_ds / 360), rel=1e-12)


def test_end_zone_pressure_drop_matches_the_printed_rs_form():
    # Engineering Data Book III eqs. 3.5.18-3.5.19 (Taborek 1983): dp_e = dp_b1 (1 + Ncw/Nc) Rb Rs with
    # Rs = (Lbc/Lbo)^(2-n) + (Lbc/Lbi)^(2-n) (= 2 for equal spacings), n = 0.2 turbulent; ours halves Rs and doubles
    # dp_e, so the products must agree
    g = hx(baffle_spacing_in=0.3, baffle_spacing_out=0.25).bell()
    m = 43800 * LB_H
    r = bell_delaware(g, m, **PROPS)
    G = m / g.Sm
    dpb1 = 2 * r.f_ideal * g.Nc * G ** 2 / PROPS["rho"]
    Rs = (g.Lbc / g.Lbo) ** 1.8 + (g.Lbc / g.Lbi) ** 1.8
    assert r.dp_ends == pytest.approx(dpb1 * (1 + g.Ncw / g.Nc) * r.Rb * Rs, rel=1e-12)


def test_large_leakage_and_bypass_are_reported():
    # Jl and Jb far below their usual ranges (Jl ~0.7-0.8, Jb ~0.7-0.9: Taborek 1983 design guidance, from memory)
    # must come back with a warning naming the factor
    import revamp as rv

    leaky = rv.ShellAndTube(shell_id="0.54 m", tube_od="25.4 mm", tube_wall="2.41 mm", tube_length="4.88 m",
                            tube_count=120, tube_passes=4, tube_pitch="31.75 mm", layout=90, baffle_spacing="127 mm",
                            baffle_cut=0.25, clearance_shell_baffle="12 mm", clearance_tube_baffle="1.6 mm",
                            rear_head="pull-through")
    from revamp.correlations.shell import bell_delaware

    res = bell_delaware(leaky.bell(), 6.0, 730.0, 2470.0, 4e-4, 0.13)
    assert res.Jl < 0.6 and any("Jl" in w for w in res.warnings)
    assert res.Jb < 0.7 and any("Jb" in w for w in res.warnings)


# ---------------------------------------------------------------------------------------------- seams and bounds
def _laminar_switch_case(cut=0.25, layout=90, pitch=1.25 * INCH):
    g = hx(baffle_cut=cut, layout=layout, tube_pitch=pitch, tube_count=120).bell()
    mu = 0.05  # a viscous oil: Re = 100 near 1 kg/s in this shell
    m100 = 100.0 * mu * g.Sm / g.tube_od
    return g, mu, m100


@pytest.mark.parametrize("layout", [30, 45, 90])
@pytest.mark.parametrize("cut", [0.2, 0.35])
def test_no_step_at_the_laminar_turbulent_switch(layout, cut):
    g, mu, m100 = _laminar_switch_case(cut, layout)
    below = bell_delaware(g, m100 * (1 - 1e-7), 850.0, 2100.0, mu, 0.12)
    above = bell_delaware(g, m100 * (1 + 1e-7), 850.0, 2100.0, mu, 0.12)
    # continuity: a flow change of 2e-7 changes h and dp by about that much, not by the 6-10 % (h) and several-fold
    # (window dp) steps of an abrupt switch (physical expectation)
    for name in ("h", "dp", "dp_window", "dp_crossflow", "dp_ends", "Jb", "Js", "Rb", "Rs"):
        assert getattr(above, name) == pytest.approx(getattr(below, name), rel=1e-5), name


def test_published_constants_hold_outside_the_blend_band():
    g, mu, m100 = _laminar_switch_case()
    lam = bell_delaware(g, m100 * 0.3, 850.0, 2100.0, mu, 0.12)  # Re = 30
    turb = bell_delaware(g, m100 * 3.0, 850.0, 2100.0, mu, 0.12)  # Re = 300
    # ht.conv_tube_bank (HEDH equations) with the laminar / turbulent constants
    assert lam.Jb == pytest.approx(tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc, laminar=True, method="HEDH"))
    assert turb.Jb == pytest.approx(tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc, laminar=False, method="HEDH"))
    assert lam.Js == pytest.approx(tb.unequal_baffle_spacing_Bell(g.Nb, g.Lbc, g.Lbi, g.Lbo, laminar=True))
    assert turb.Js == pytest.approx(tb.unequal_baffle_spacing_Bell(g.Nb, g.Lbc, g.Lbi, g.Lbo, laminar=False))
    # Taborek (1983) window forms (the laminar one from memory of HEDH §3.3, as in test_laminar_window_pressure_drop)
    gw = 3.0 * m100 / math.sqrt(g.Sm * g.Sw)
    assert turb.dp_window == pytest.approx(g.Nb * (2 + 0.6 * g.Ncw) * gw ** 2 / (2 * 850.0) * turb.Rl)
    # inside the band every factor lies between its laminar and turbulent values
    mid = bell_delaware(g, m100, 850.0, 2100.0, mu, 0.12)
    jb = sorted(tb.bundle_bypassing_Bell(g.Fsbp, g.Nss, g.Nc, laminar=x, method="HEDH") for x in (True, False))
    assert jb[0] <= mid.Jb <= jb[1]


@settings(max_examples=30, deadline=None)
@given(layout=st.sampled_from([30, 45, 60, 90]), cut=st.floats(0.15, 0.45), pitch=st.floats(1.25, 1.6),
       spacing=st.floats(0.11, 0.5), lo=st.floats(0.2, 1.0))
def test_h_and_dp_rise_through_the_switch_band(layout, cut, pitch, spacing, lo):
    g = hx(baffle_cut=cut, layout=layout, tube_pitch=pitch * INCH, baffle_spacing=spacing, tube_count=100).bell()
    mu = 0.05
    m100 = 100.0 * mu * g.Sm / g.tube_od
    m = m100 * np.geomspace(lo, 5.0 * lo, 400)  # a fine sweep from Re = 20-100 to 100-500
    r = bell_delaware(g, m, 850.0, 2100.0, mu, 0.12, mu_wall=0.08)
    # more flow never gives less h or less dp (physical expectation)
    for name in ("h", "dp", "dp_window"):
        assert np.all(np.diff(getattr(r, name)) > 0), name


@pytest.mark.parametrize("edge", [10.0, 100.0, 1e3, 1e4])
@pytest.mark.parametrize("layout", [30, 45, 90])
def test_ideal_fits_have_no_step_at_band_edges(edge, layout):
    # the printed bands differ by up to a few per cent at their common edge (see the test above); blended, the fit is
    # continuous (physical expectation: the data behind the fits are one smooth curve, Taborek 1983)
    for fn in (ideal_j, ideal_f):
        assert fn(edge * (1 - 1e-9), 1.25, layout) == pytest.approx(fn(edge * (1 + 1e-9), 1.25, layout), rel=1e-6)


@pytest.mark.parametrize("fc", np.linspace(0.1, 1.0, 19))
def test_jc_follows_bells_chart_to_fc_one(fc):
    # ht.baffle_correction_Bell interpolates a digitization of Bell's (1963) chart: 1.03 at Fc = 1, maximum ~1.154
    # near Fc = 0.91. The linear fit 0.55 + 0.72 Fc (1.27 at Fc = 1) is what it replaces above Fc = 0.83. The
    # chart is read to a few per cent; the linear fit itself is up to 2.8 % off it at Fc = 0.4.
    assert baffle_cut_factor(fc) == pytest.approx(tb.baffle_correction_Bell(fc), rel=0.045)


def test_jc_never_exceeds_the_charts_maximum():
    fc = np.linspace(0.0, 1.0, 1001)
    jc = baffle_cut_factor(fc)
    # Bell's chart peaks near 1.15 (ht's digitization: 1.1536; Taborek 1983: "about 1.15", from memory)
    assert jc.max() <= 1.155
    assert baffle_cut_factor(1.0) == pytest.approx(tb.baffle_correction_Bell(1.0), abs=0.035)
    assert np.all(np.abs(np.diff(jc)) < 0.0035)  # continuous: no step larger than the slope allows (<= 3 per unit Fc)


# ---------------------------------------------------------------------------------------------- nozzles
@pytest.mark.parametrize("method", [bell_delaware, kern])
def test_shell_nozzle_loss_is_added_only_when_asked(method):
    g = hx().bell()
    plain = method(g, 20.0, **PROPS)
    with_n = method(g, 20.0, **PROPS, d_nozzle="6 in")
    assert plain.dp_nozzles == 0.0
    # 1.0 velocity head at the inlet (sudden expansion) + 0.5 at the outlet (sudden contraction), Perry's Handbook §6
    # loss coefficients (from memory), by hand: v = m / (ρ π d²/4)
    v = 20.0 / (PROPS["rho"] * math.pi * (6 * INCH) ** 2 / 4)
    assert with_n.dp_nozzles == pytest.approx(1.5 * PROPS["rho"] * v ** 2 / 2, rel=1e-12)
    assert with_n.dp == pytest.approx(plain.dp + with_n.dp_nozzles, rel=1e-12)
    assert with_n.h == plain.h
    # independent check: fluids' loss coefficients, exit into a large space (Borda-Carnot, 1.0) and sharp-edged
    # entrance (0.57), total 1.57 velocity heads: ours is within 5 %
    k_fluids = fl.diffuser_sharp(Di1=6 * INCH, Di2=100.0) + fl.contraction_sharp(Di1=100.0, Di2=6 * INCH)
    assert with_n.dp_nozzles == pytest.approx(k_fluids * PROPS["rho"] * v ** 2 / 2, rel=0.05)
    # the nozzle density can differ from the bulk (inlet temperature): Δp ∝ 1/ρ at fixed mass flow
    other = method(g, 20.0, **PROPS, d_nozzle=6 * INCH, rho_nozzle=2 * PROPS["rho"])
    assert other.dp_nozzles == pytest.approx(with_n.dp_nozzles / 2, rel=1e-12)


def test_shell_nozzle_loss_broadcasts():
    g = hx().bell()
    r = bell_delaware(g, np.array([10.0, 20.0]), **PROPS, d_nozzle=0.15)
    assert r.dp_nozzles.shape == (2,)
    assert r.dp_nozzles[1] == pytest.approx(4 * r.dp_nozzles[0])  # v² ∝ m² (definition of the velocity head)


@pytest.mark.parametrize("kw", [dict(d_nozzle=0.0), dict(d_nozzle="-2 in"), dict(d_nozzle=[0.1, 0.2]),
                                dict(rho_nozzle=800.0), dict(d_nozzle=0.1, rho_nozzle=-1.0)])
def test_bad_nozzle_input_names_the_field(kw):
    with pytest.raises(InputError, match="nozzle"):
        bell_delaware(hx().bell(), 20.0, **PROPS, **kw)


def test_rated_duty_never_falls_as_shell_flow_rises_through_the_switch():
    import revamp as rv

    # a viscous oil on the shell side (constant properties: only the method can make a seam), water in the tubes;
    # the shell flows span Re_shell ~ 30 to ~ 400 across the laminar/turbulent switch at Re = 100
    oil = rv.fluids.constant(density=880.0, heat_capacity=2000.0, viscosity=0.08, conductivity=0.12)
    cw = rv.fluids.constant(density=995.0, heat_capacity=4180.0, viscosity=7.5e-4, conductivity=0.62)
    ex = hx(tube_count=120, baffle_spacing="0.3 m")
    g = ex.bell()
    m100 = 100.0 * 0.08 * g.Sm / g.tube_od
    flows = m100 * np.geomspace(0.3, 4.0, 120)
    r = rv.rate(ex, rv.Service(shell=rv.Stream(oil, flows, 420.0), tube=rv.Stream(cw, 30.0, 300.0)))
    assert r.Re_shell.min() < 40 and r.Re_shell.max() > 250
    # more flow never gives less duty or less shell dp (physical expectation; a 1.2 % flow rise once cost 2 % duty)
    assert np.all(np.diff(r.duty) > 0)
    assert np.all(np.diff(r.dp_shell) > 0)
