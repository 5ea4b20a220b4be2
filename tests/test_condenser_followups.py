"""Condenser engine follow-ups: the shell-side two-phase pressure drop, fluids on the condensing path, range texts,
the tube-pass correction of the zones.

Sources of the expected values (each named again beside its check):
- CoolProp (Bell et al. 2014): saturation states and the latent heat of propane and isobutane.
- `fluids` (Caleb Bell, ChEDL): ``fluids.two_phase.Lockhart_Martinelli`` (Chisholm's 1967 form of Lockhart &
  Martinelli) for the algebra of the two-phase multiplier at the engine's states.
- `ht` (Caleb Bell, ChEDL): ``ht.effectiveness_from_NTU`` for the 1-2N shell (TEMA E, even tube passes).
- Physical laws (monotonicity, the single-phase ends) with hypothesis.
"""
from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp.correlations import condensation as cond
from revamp.correlations._validity import range_warning

CP = pytest.importorskip("CoolProp.CoolProp")
ht = pytest.importorskip("ht")
two_phase_ref = pytest.importorskip("fluids.two_phase")

WATER = rv.fluids.water("3 bar")


def exchanger(**changes):
    kw = dict(shell_id="0.6 m", tube_od="19.05 mm", tube_wall="1.65 mm", tube_length="4 m", tube_count=400,
              tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="0.5 m", baffle_cut=0.25,
              tube_material="carbon steel")
    kw.update(changes)
    return rv.ShellAndTube(**kw)


# ------------------------------------------------------------------------------------- fluids on the path
@pytest.mark.parametrize("name, pressure", [("n-Propane", 15e5), ("IsoButane", 6e5)])
def test_light_hydrocarbons_condense_fully(name, pressure):
    """Propane and isobutane as CoolProp names them: the curve and a full condensation rating."""
    curve = rv.fluids.condensing(rv.fluids.pure(name, pressure))
    # CoolProp: saturation temperature and latent heat at the pressure
    assert curve.t_dew == pytest.approx(CP.PropsSI("T", "P", pressure, "Q", 1.0, name), abs=1e-6)
    h_fg = CP.PropsSI("H", "P", pressure, "Q", 1.0, name) - CP.PropsSI("H", "P", pressure, "Q", 0.0, name)
    assert curve.latent == pytest.approx(h_fg, rel=1e-9)
    svc = rv.Service(shell=rv.Stream(rv.fluids.pure(name, pressure), 1.0, quality=1.0),
                     tube=rv.Stream(WATER, 60.0, "20 degC"))
    r = rv.rate(exchanger(), svc)
    assert float(r.quality_out) == 0.0   # small load on a large exchanger: condensed and subcooled
    # duty at least m h_fg (CoolProp), the subcooling on top
    assert float(r.duty) > 1.0 * h_fg


# ------------------------------------------------------------------------------------- range warning text
def test_open_ended_range_says_below_or_above():
    """A one-sided range reads "below 1800" / "above 2.5", never "-inf to 1800" (plain English)."""
    w = range_warning("Nusselt (1916) laminar film", "film Re", [2500.0], None, 1800.0)
    assert w and "below 1800" in w[0] and "inf" not in w[0]
    w = range_warning("twisted tape", "twist ratio y", [2.0], 2.5, None)
    assert w and "above 2.5" in w[0] and "inf" not in w[0]
    w = range_warning("Gnielinski (1976)", "Re", [2000.0], 2300, 5e6)
    assert w and "2300 to 5e+06" in w[0]


def test_nusselt_film_warning_reads_below():
    # a thick film: film Re far above 1800 (wavy-laminar), outside Nusselt's laminar range
    res = cond.shell_condensation(600.0, 5.0, 0.1, 1.5e-4, 3.0e5, 0.025, 60.0, n_rows=40.0)
    assert res.warnings and "below 1800" in res.warnings[0] and "inf" not in res.warnings[0]


# ------------------------------------------------------------------------- shell-side two-phase pressure drop
from revamp.correlations import two_phase  # noqa: E402
from revamp.exchanger import model_of  # noqa: E402
from revamp.fluids.base import Props  # noqa: E402
from revamp.rating_condenser import shell_two_phase_dp  # noqa: E402

HEXANE = rv.fluids.pure("n-Hexane", 1.5e5)


def shell_service(flow=4.0, water=60.0, t_water="30 degC"):
    return rv.Service(shell=rv.Stream(HEXANE, flow, quality=1.0), tube=rv.Stream(WATER, water, t_water))


@pytest.fixture(scope="module")
def shell_rating():
    return rv.rate(exchanger(), shell_service())


def _lm_pipe_phase(m, rho, mu, D):
    """Single-phase pipe drop per metre with the friction factors of Lockhart & Martinelli's original (turbulent:
    0.184 Re^-0.2, as fluids.two_phase.Lockhart_Martinelli uses them)."""
    A = np.pi * D * D / 4.0
    v = m / (rho * A)
    re = rho * v * D / mu
    return 0.184 * re ** -0.2 / D * 0.5 * rho * v * v


def test_bundle_form_is_chisholms_lockhart_martinelli_at_the_engine_states(shell_rating):
    """The combination Δp_l + C (Δp_l Δp_v)^½ + Δp_v is Lockhart & Martinelli's φl² = 1 + C/X + 1/X² (Chisholm
    1967): with the pipe's C = 20 (both phases turbulent) it must equal fluids.two_phase.Lockhart_Martinelli at the
    engine's own phase properties and vapour fractions (a 50 mm pipe at 2 kg/s, so both phases are turbulent)."""
    inc = shell_rating.increments
    inc = inc[(inc["zone"] == "condensing") & (inc["x"] > 0.05) & (inc["x"] < 0.95)]
    assert len(inc) > 5
    D, m = 0.05, 2.0
    for row in inc.itertuples():
        ref = two_phase_ref.Lockhart_Martinelli(m=m, x=row.x, rhol=row.rho_l, rhog=row.rho_v, mul=row.mu_l,
                                                mug=row.mu_v, D=D, L=1.0)   # fluids (Chisholm's form, C = 20)
        dp_l = _lm_pipe_phase((1 - row.x) * m, row.rho_l, row.mu_l, D)
        dp_v = _lm_pipe_phase(row.x * m, row.rho_v, row.mu_v, D)
        assert two_phase.dp_crossflow_bundle(dp_l, dp_v, 20.0) == pytest.approx(ref, rel=1e-9)


def test_bundle_c_is_ishiharas():
    # Ishihara, Palen & Taborek (1980): C = 8 for two-phase crossflow over tube banks (from memory)
    assert two_phase.C_CROSSFLOW_BUNDLE == 8.0


@settings(max_examples=30, deadline=None)
@given(dp_l=st.floats(1.0, 1e5), dp_v=st.floats(0.0, 1e5), more=st.floats(1.01, 10.0))
def test_bundle_form_rises_with_the_vapour_drop(dp_l, dp_v, more):
    # physical law: at the same liquid flow, more vapour never lowers the drop; never below the phases' sum
    a = two_phase.dp_crossflow_bundle(dp_l, dp_v)
    b = two_phase.dp_crossflow_bundle(dp_l, dp_v * more + 1.0)
    assert b > a >= dp_l + dp_v - 1e-9


def _sat_props(curve):
    s = curve.saturation(0.0)
    return s.liquid, s.vapour


def test_shell_two_phase_ends_are_the_single_phase_drops():
    """x = 0: the liquid drop of the whole flow; x = 1: the vapour drop (the form's ends, Chisholm 1967); both by
    the exchanger's own shell method."""
    model = model_of(exchanger())
    liquid, vapour = _sat_props(rv.fluids.condensing(HEXANE))
    dp = shell_two_phase_dp(model, "shell", 4.0, np.array([0.0, 1.0]), liquid, vapour)
    assert dp[0] == pytest.approx(float(model.film("shell", 4.0, liquid).dp), rel=1e-9)
    assert dp[1] == pytest.approx(float(model.film("shell", 4.0, vapour).dp), rel=1e-9)


@settings(max_examples=10, deadline=None)
@given(m_l=st.floats(0.2, 5.0), m_v=st.floats(0.05, 3.0), more=st.floats(1.05, 3.0))
def test_shell_two_phase_rises_with_vapour_flow(m_l, m_v, more):
    # physical law: adding vapour at the same liquid flow raises the shell-side drop
    model = model_of(exchanger())
    liquid, vapour = _sat_props(rv.fluids.condensing(HEXANE))

    def dp(mv):
        m = m_l + mv
        return float(shell_two_phase_dp(model, "shell", m, mv / m, liquid, vapour))

    assert dp(m_v * more) > dp(m_v)


def test_shell_dp_is_the_sum_over_the_increments(shell_rating):
    """The rating's shell-side drop is the sum of the increments' drops, each its share of the bundle (area over the
    path's area) at the local two-phase drop (the integration the engine states)."""
    r = shell_rating
    inc = r.increments
    assert float(r.dp_shell) == pytest.approx(float(inc["dp"].sum()), rel=1e-9)
    model = model_of(r.exchanger)
    liquid = Props(inc["rho_l"].to_numpy(), inc["cp_l"].to_numpy(), inc["mu_l"].to_numpy(), inc["k_l"].to_numpy())
    curve = rv.fluids.condensing(HEXANE)
    sat_v = curve.saturation(0.0).vapour  # a pure fluid: one saturated vapour
    x = np.where(inc["zone"] == "subcooling", 0.0, inc["x"].to_numpy())
    whole = shell_two_phase_dp(model, "shell", 4.0, x, liquid, sat_v)
    share = inc["area"].to_numpy() / inc["area"].sum()
    assert float(r.dp_shell) == pytest.approx(float((whole * share).sum()), rel=1e-6)


def test_shell_dp_rises_with_the_vapour_load():
    # physical law: more vapour through the same shell, a larger drop (and a larger saturation drop)
    r = rv.rate(exchanger(), shell_service(flow=np.array([2.0, 4.0, 6.0])))
    assert np.all(np.diff(r.dp_shell) > 0)
    assert np.all(np.diff(r.dt_sat_drop) > 0)


# ------------------------------------------------------------------------- tube passes: the zones' F factor
from revamp.rating_condenser import zone_F  # noqa: E402


@pytest.fixture(scope="module")
def desuperheated_rating():
    svc = rv.Service(shell=rv.Stream(HEXANE, 4.0, t_in="110 degC", phase="vapour"),
                     tube=rv.Stream(WATER, 60.0, "30 degC"))
    return rv.rate(exchanger(), svc)


def test_sensible_zones_follow_the_1_2N_relation(desuperheated_rating):
    """Desuperheating and subcooling zones of a two-pass exchanger: their effectiveness, from the zone's duty and
    terminal temperatures, is the 1-2 shell's at the zone's NTU = U A / C_min (ht.effectiveness_from_NTU, TEMA E
    with one shell pass and an even number of tube passes)."""
    z = desuperheated_rating.zones.set_index("zone")
    for name in ("desuperheating", "subcooling"):
        row = z.loc[name]
        c_hot = row.duty / (row.t_in - row.t_out)
        c_cold = row.duty / (row.t_coolant_out - row.t_coolant_in)
        c_min, c_max = min(c_hot, c_cold), max(c_hot, c_cold)
        ntu = row.U * row.area / c_min
        eps = row.duty / (c_min * (row.t_in - row.t_coolant_in))
        ref = ht.effectiveness_from_NTU(ntu, c_min / c_max, "S&T", n_shell_tube=1)   # ht, 1-2N shell
        assert row.F < 1.0
        # the heat capacities vary a little along a zone (the relation assumes them constant): 0.5 %
        assert eps == pytest.approx(ref, rel=5e-3), name


def test_isothermal_zone_has_F_one():
    # Bowman, Mueller & Nagle (1940): one stream isothermal (R = 0), F = 1 for any P
    Th = np.full((1, 3, 5), 350.0)
    Tc = np.linspace(340.0, 300.0, 5)[None, None, :] * np.ones((1, 3, 1))
    assert np.all(zone_F(Th, Tc, 1) == 1.0)
    assert np.all(zone_F(Th, Tc, 3) == 1.0)


def _counterflow_only(monkeypatch):
    import revamp.rating as rating_mod

    monkeypatch.setattr(rating_mod, "arrangement", lambda hx: ("counterflow", 1))


def test_pure_condensing_zone_unchanged_and_sensible_zones_not_optimistic(monkeypatch):
    """A pure fluid condensing without subcooling (a partial condenser, small saturation drop): the two-pass rating
    equals the counterflow one (F = 1 for an isothermal zone, Bowman et al. 1940); with desuperheating and
    subcooling the two-pass rating gives less duty than the counterflow one (F < 1 there)."""
    hx = exchanger(tube_length="1 m", tube_count=100)
    partial = rv.Service(shell=rv.Stream(HEXANE, 1.0, quality=1.0), tube=rv.Stream(WATER, 60.0, "30 degC"))
    sensible = rv.Service(shell=rv.Stream(HEXANE, 4.0, t_in="110 degC", phase="vapour"),
                          tube=rv.Stream(WATER, 60.0, "30 degC"))
    r2p, s2p = rv.rate(hx, partial), rv.rate(exchanger(), sensible)
    assert 0.0 < float(r2p.quality_out) < 1.0 and float(r2p.dt_sat_drop) < 0.05
    _counterflow_only(monkeypatch)
    rcf, scf = rv.rate(hx, partial), rv.rate(exchanger(), sensible)
    # F of the condensing zone is 1 up to the small glide of the saturation drop (< 0.05 K)
    assert float(r2p.duty) == pytest.approx(float(rcf.duty), rel=1e-4)
    assert float(s2p.duty) < float(scf.duty)
    assert (scf.zones["F"] == 1.0).all()


# ------------------------------------------------------------------------------------------- Shah (2009)
# Shah (2009), HVAC&R Research 15:889, horizontal tubes (equations from memory, agreeing with a public
# open-source implementation of the paper): h_I = h_LT (mu_l/14 mu_v)^n [Shah 1979 bracket], n = 0.0058 + 0.557 p_r;
# h_Nu = 1.32 Re_LS^(-1/3) [rho_l (rho_l - rho_v) g k_l^3 / mu_l^2]^(1/3); regime I where
# J_g >= 0.98 (Z + 0.263)^-0.62, else h_I + h_Nu. The Shah (1979) part is checked against ht.condensation.Shah.
GRAV = 9.80665


def _shah2009_reference(G, x, D, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, P, Pc):
    A = np.pi * D * D / 4.0
    p_r = P / Pc
    h_1979 = ht.condensation.Shah(m=G * A, x=x, D=D, rhol=rho_l, mul=mu_l, kl=k_l, Cpl=cp_l, P=P, Pc=Pc)  # ht
    h_i = h_1979 * (mu_l / (14.0 * mu_v)) ** (0.0058 + 0.557 * p_r)
    re_ls = G * (1.0 - x) * D / mu_l
    h_nu = 1.32 * re_ls ** (-1.0 / 3.0) * (rho_l * (rho_l - rho_v) * GRAV * k_l ** 3 / mu_l ** 2) ** (1.0 / 3.0)
    j_g = x * G / np.sqrt(GRAV * D * rho_v * (rho_l - rho_v))
    z = (1.0 / x - 1.0) ** 0.8 * p_r ** 0.4
    return (h_i if j_g >= 0.98 * (z + 0.263) ** -0.62 else h_i + h_nu), j_g >= 0.98 * (z + 0.263) ** -0.62


@pytest.mark.parametrize("G", [30.0, 150.0, 600.0])
@pytest.mark.parametrize("x", [0.1, 0.5, 0.9])
def test_shah_2009_against_its_equations_and_ht(G, x):
    # saturated n-hexane at 1.5 bar from CoolProp
    P, name = 1.5e5, "n-Hexane"
    rho_l, rho_v = (CP.PropsSI("D", "P", P, "Q", q, name) for q in (0.0, 1.0))
    mu_l, mu_v = (CP.PropsSI("V", "P", P, "Q", q, name) for q in (0.0, 1.0))
    k_l, cp_l = CP.PropsSI("L", "P", P, "Q", 0.0, name), CP.PropsSI("C", "P", P, "Q", 0.0, name)
    Pc = CP.PropsSI("pcrit", name)
    D = 0.0157
    ref, _ = _shah2009_reference(G, x, D, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, P, Pc)
    got = cond.shah_2009(G, x, D, rho_l, rho_v, mu_l, mu_v, k_l, cp_l, P / Pc)
    assert got == pytest.approx(ref, rel=1e-9)


def test_shah_2009_both_regimes_reached():
    # low mass flux: regime II (gravity part added); high: regime I (Shah 2009's map, as above)
    args = (0.5, 0.0157, 600.0, 4.5, 2.0e-4, 7.5e-6, 0.11, 2400.0, 0.05)
    h_lo, hi_lo, nu_lo, r_lo = cond.shah_2009_parts(20.0, *args)
    h_hi, hi_hi, nu_hi, r_hi = cond.shah_2009_parts(800.0, *args)
    assert not r_lo and h_lo == pytest.approx(hi_lo + nu_lo)
    assert r_hi and h_hi == pytest.approx(hi_hi)


def test_shah_2009_wrapper_needs_the_vapour_viscosity_and_warns_its_range():
    with pytest.raises(rv.errors.InputError) as e:
        cond.tube_condensation(100.0, 0.5, 0.0157, 600.0, 4.5, 2e-4, 0.11, 2400.0, 3e5, 0.05, 5.0,
                               method="shah2009")
    assert e.value.field == "mu_v"
    res = cond.tube_condensation(2000.0, 0.5, 0.0157, 600.0, 4.5, 2e-4, 0.11, 2400.0, 3e5, 0.05, 5.0,
                                 method="shah2009", mu_v=7.5e-6)
    # mass flux 2000 is above Shah's (2009) data, 4 to 820 kg/m²s (from memory)
    assert any("Shah (2009)" in w and "G" in w for w in res.warnings)


def test_engine_with_shah_2009_in_tubes():
    """The in-tube film at every condensing increment of the engine is Shah (2009) at that increment's state
    (a pure fluid: no mixture correction), its Shah (1979) part by ht; the energy balance holds (law)."""
    hx = exchanger()
    svc = rv.Service(tube=rv.Stream(HEXANE, 4.0, quality=1.0), shell=rv.Stream(WATER, 60.0, "30 degC"))
    r = rv.rate(hx, svc, tube_condensation="shah2009")
    inc = r.increments[r.increments["zone"] == "condensing"]
    Pc = CP.PropsSI("pcrit", "n-Hexane")
    D = float(hx.tube_id)
    for row in inc.itertuples():
        ref, _ = _shah2009_reference(row.G, row.x, D, row.rho_l, row.rho_v, row.mu_l, row.mu_v, row.k_l, row.cp_l,
                                     1.5e5, Pc)
        assert row.h_condensing == pytest.approx(ref, rel=1e-9)
    assert float(r.zones["duty"].sum()) == pytest.approx(float(r.duty), rel=1e-9)
    with pytest.raises(rv.errors.InputError):
        rv.rate(hx, svc, tube_condensation="nusselt")
