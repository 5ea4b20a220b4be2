"""The exchanger protocol (revamp.exchanger): both kinds implement it, the models give what the engines give, and the
films, networks and effectiveness agree with independent sources.

Sources:
- `ht` (Caleb Bell, ChEDL): ``ht.conv_internal.turbulent_Gnielinski``, ``ht.air_cooler.h_Briggs_Young``,
  ``ht.air_cooler.dP_ESDU_high_fin``, ``ht.hx.effectiveness_from_NTU``; `fluids.geometry.AirCooledExchanger` for the
  air-cooler areas given to ht.
- Petukhov (1970) smooth-tube friction f = (0.790 ln Re - 1.64)^-2 and Gnielinski's entrance factor
  [1 + (d/L)^(2/3)] (Gnielinski 1976), written out here.
- Kern (1950), *Process Heat Transfer*, eq. 6.15 and §7: ho De/k = 0.36 Re^0.55 Pr^(1/3) with As = Ds C' B / Pt and
  the square-pitch De = 4 (Pt² - pi do²/4) / (pi do), written out here.
- The consistency checks (model against the rating at the rating's own state) are internal by design: the engines
  and the models must give the same numbers.
"""
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp.correlations import air
from revamp.errors import InputError
from revamp.exchanger import (MODELS, AirCoolerModel, ExchangerModel, ShellAndTubeModel, SideFilm, TubeBundle,
                              layers_of, model_of)
from revamp.rating_air import AIR_LAYERS
from revamp.resistance import TUBE_LAYERS

ht = pytest.importorskip("ht")
pytest.importorskip("fluids")
from fluids.geometry import AirCooledExchanger  # noqa: E402

WATER = rv.fluids.water()
OIL = rv.fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)


def _hx(**changes):
    kw = dict(shell_id="0.54 m", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="4.88 m", tube_count=250,
              tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="0.3 m", baffle_cut=0.25,
              tube_material="carbon steel")
    kw.update(changes)
    return rv.ShellAndTube(**kw)


def _svc(**changes):
    kw = dict(shell=rv.Stream(WATER, "30 kg/s", "120 degC"), tube=rv.Stream(WATER, "40 kg/s", "30 degC"),
              fouling_shell=2e-4, fouling_tube=3e-4)
    kw.update(changes)
    return rv.Service(**kw)


def _cooler(**changes):
    kw = dict(bays=2, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=4, tube_length="9.14 m",
              tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
              tube_material="carbon steel",
              fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m", material="aluminium",
                         bond="embedded"),
              fans_per_bay=2, fan_diameter="3.66 m", fan_efficiency=0.65, draft="forced")
    kw.update(changes)
    return rv.AirCooler(**kw)


def _air_service(**changes):
    kw = dict(tube=rv.Stream(OIL, flow="25 kg/s", t_in="150 degC"), air_in="35 degC", air_flow="250 kg/s",
              fouling_tube="0.0003 m**2*K/W", fouling_air="0.0001 m**2*K/W")
    kw.update(changes)
    return rv.AirService(**kw)


SHELL_CASES = {
    "E, 2 shells, nozzles": dict(shells=2, nozzle_shell="0.2 m", nozzle_tube="0.2 m"),
    "E, 1 pass, 2 trains": dict(tube_passes=1, shells_parallel=2),
    "F": dict(shell_type="F", tube_passes=4),
    "J": dict(shell_type="J", nozzle_shell="0.2 m"),
    "X": dict(shell_type="X", tube_passes=1),
}


# ------------------------------------------------------------------------------------------------ the protocol
def test_both_kinds_satisfy_the_protocol():
    st, ac = model_of(_hx()), model_of(_cooler())
    assert isinstance(st, ExchangerModel) and isinstance(st, ShellAndTubeModel)
    assert isinstance(ac, ExchangerModel) and isinstance(ac, AirCoolerModel)
    assert (st.kind, st.sides, st.layers) == ("shell and tube", ("shell", "tube"), TUBE_LAYERS)
    assert (ac.kind, ac.sides, ac.layers) == ("air cooler", ("air", "tube"), AIR_LAYERS)
    assert set(MODELS) == set(rv.rating.RATERS) == {"shell and tube", "air cooler"}
    assert isinstance(st.bundle, TubeBundle) and isinstance(ac.bundle, TubeBundle)
    assert not isinstance(object(), ExchangerModel)


@pytest.mark.parametrize("exchanger", [_hx(shells=2, shells_parallel=3, tube_passes=4), _cooler()],
                         ids=["shell and tube", "air cooler"])
def test_bundle_of_one_unit_gives_the_area(exchanger):
    m = model_of(exchanger)
    b = m.bundle
    # definition: outside area = pi d_o L x tubes, summed over the identical parallel units
    assert math.pi * b.d_o * b.length * b.tubes_per_pass * b.passes * m.n_parallel == pytest.approx(m.area, rel=1e-12)
    assert m.area_inside / m.area == pytest.approx(b.d_i / b.d_o, rel=1e-12)  # same tubes, diameters ratio
    assert b.rows_vertical >= 1.0


def test_air_cooler_bundle_rows_are_the_tube_rows():
    b = model_of(_cooler(tube_rows=6, tube_passes=6)).bundle
    assert b.rows_vertical == 6 and b.passes == 6


# --------------------------------------------------------------------- consistency with the engines (internal)
@pytest.mark.parametrize("case", list(SHELL_CASES), ids=list(SHELL_CASES))
def test_shell_and_tube_model_gives_what_the_rating_gives(case):
    hx, svc = _hx(**SHELL_CASES[case]), _svc()
    r = rv.rate(hx, svc)
    m = model_of(hx)
    n_par = m.n_parallel
    ps = WATER.props(0.5 * (svc.shell.t_in + r.t_out_shell))
    pt = WATER.props(0.5 * (svc.tube.t_in + r.t_out_tube))
    fs = m.film("shell", svc.shell.flow / n_par, ps, WATER.props(r.t_wall_shell))
    ft = m.film("tube", svc.tube.flow / n_par, pt, WATER.props(r.t_wall_tube))
    assert isinstance(fs, SideFilm) and isinstance(ft, SideFilm)
    # the rating's state is converged to 1e-6 K, hence the tolerance
    for got, want in ((fs.h, r.h_shell), (fs.dp, r.dp_shell), (fs.Re, r.Re_shell), (fs.velocity, r.velocity_shell),
                      (ft.h, r.h_tube), (ft.dp, r.dp_tube), (ft.Re, r.Re_tube), (ft.velocity, r.velocity_tube)):
        assert float(got) == pytest.approx(want, rel=1e-6)
    R = m.network(r.h_shell, r.h_tube, svc.fouling_shell, svc.fouling_tube, 0.5 * (r.t_wall_shell + r.t_wall_tube))
    assert len(R) == len(m.layers)
    for name, value in zip(m.layers, R):
        assert float(value) == pytest.approx(r.resistances[name], rel=1e-9)
    assert 1.0 / sum(float(v) for v in R) == pytest.approx(r.U_service, rel=1e-9)
    c_min, c_max = min(r.C_shell, r.C_tube), max(r.C_shell, r.C_tube)
    eps, w = m.effectiveness(r.NTU, c_min / c_max, r.C_shell <= r.C_tube)
    assert float(eps) == pytest.approx(r.effectiveness, rel=1e-9)
    assert float(eps + w) == pytest.approx(1.0, rel=1e-12)


def test_air_cooler_model_gives_what_the_rating_gives():
    ac, svc = _cooler(), _air_service()
    r = rv.rate(ac, svc)
    m = model_of(ac)
    pa = air.air_properties(0.5 * (svc.air_in + r.t_out_air))
    fa = m.film("air", r.air_flow / m.n_parallel, pa)
    pt = OIL.props(0.5 * (svc.tube.t_in + r.t_out_tube))
    ft = m.film("tube", svc.tube.flow / m.n_parallel, pt, OIL.props(r.t_wall_tube))
    for got, want in ((fa.h, r.h_air), (fa.dp, r.dp_air), (fa.Re, r.Re_air), (ft.h, r.h_tube), (ft.dp, r.dp_tube),
                      (ft.Re, r.Re_tube), (ft.velocity, r.velocity_tube)):
        assert float(got) == pytest.approx(want, rel=1e-6)
    R = m.network(r.h_air, r.h_tube, svc.fouling_air, svc.fouling_tube, r.t_wall_tube)
    for name, value in zip(m.layers, R):
        assert float(value) == pytest.approx(r.resistances[name], rel=1e-9, abs=1e-15)
    assert 1.0 / float(R[0]) == pytest.approx(r.h_air_bare, rel=1e-9)
    assert 1.0 / sum(float(v) for v in R) == pytest.approx(r.U_service, rel=1e-9)
    c_min, c_max = min(r.C_air, r.C_tube), max(r.C_air, r.C_tube)
    eps, _ = m.effectiveness(r.NTU, c_min / c_max, r.C_air < r.C_tube)
    assert float(eps) == pytest.approx(r.effectiveness, rel=1e-9)


def test_models_take_arrays_in_the_flat_shape():
    m = model_of(_hx())
    flows = np.array([10.0, 20.0, 40.0])
    f = m.film("tube", flows, OIL.props(np.full(3, 330.0)))
    assert f.h.shape == f.dp.shape == f.Re.shape == f.velocity.shape == (3,)
    assert np.all(np.diff(f.h) > 0) and np.all(np.diff(f.dp) > 0)  # more flow, more h and dp (physics)
    R = m.network(np.array([800.0, 900.0, 1000.0]), f.h, 0.0, 1e-4, 350.0)
    assert all(np.shape(r) == (3,) for r in R)


# --------------------------------------------------------------------------------------- independent sources
def _petukhov(Re):
    return (0.790 * np.log(Re) - 1.64) ** -2  # Petukhov (1970)


@pytest.mark.parametrize("exchanger", [_hx(), _cooler()], ids=["shell and tube", "air cooler"])
def test_tube_film_against_ht_gnielinski(exchanger):
    m = model_of(exchanger)
    b = m.bundle
    flow = 60.0 / m.n_parallel  # turbulent, Re well above 1e4 in both
    f = m.film("tube", flow, OIL.props(330.0))
    Re = 4.0 * flow / (math.pi * b.d_i * b.tubes_per_pass * OIL.props(330.0).viscosity)  # definition
    assert Re > 1e4
    assert float(f.Re) == pytest.approx(Re, rel=1e-12)
    Pr = 2300.0 * 1e-3 / 0.12
    # ht.conv_internal.turbulent_Gnielinski with Petukhov's friction, times Gnielinski's entrance factor
    nu = ht.conv_internal.turbulent_Gnielinski(Re=Re, Pr=Pr, fd=_petukhov(Re)) * (1.0 + (b.d_i / b.length) ** (2 / 3))
    assert float(f.h) == pytest.approx(nu * 0.12 / b.d_i, rel=1e-9)


def _ht_geometry(ac):
    """The same bundle described to fluids.geometry.AirCooledExchanger (independent geometry)."""
    return AirCooledExchanger(tube_rows=ac.tube_rows, tube_passes=ac.tube_passes, tubes_per_row=ac.tubes_per_row,
                              tube_length=ac.tube_length, tube_diameter=ac.tube_od, fin_thickness=ac.fin.thickness,
                              fin_density=ac.fin.per_length, pitch_normal=ac.transverse_pitch,
                              pitch_parallel=ac.row_pitch, fin_height=ac.fin.height, tube_thickness=ac.tube_wall,
                              bundles_per_bay=ac.bundles_per_bay, parallel_bays=ac.bays)


def test_air_film_and_network_against_ht_briggs_young_at_the_engines_state():
    ac, svc = _cooler(), _air_service()
    r = rv.rate(ac, svc)
    m = model_of(ac)
    p = air.air_properties(0.5 * (svc.air_in + r.t_out_air))
    fa = m.film("air", r.air_flow / m.n_parallel, p)
    R = m.network(fa.h, 1000.0, 0.0, 0.0, 330.0)
    ref = _ht_geometry(ac)
    # ht.air_cooler.h_Briggs_Young (Bell): film with the Kern-Kraus fin efficiency, on the bare-tube basis; all
    # bundles at once in ht's geometry
    h_ref = ht.air_cooler.h_Briggs_Young(m=r.air_flow, A=ref.A, A_min=ref.A_min, A_increase=ref.A_increase,
                                         A_fin=ref.A_fin, A_tube_showing=ref.A_tube_showing,
                                         tube_diameter=ref.tube_diameter, fin_diameter=ref.fin_diameter,
                                         fin_thickness=ref.fin_thickness, bare_length=ref.bare_length, rho=p.density,
                                         Cp=p.heat_capacity, mu=p.viscosity, k=p.conductivity,
                                         k_fin=ac.fin.conductivity)
    assert 1.0 / float(R[0]) == pytest.approx(h_ref, rel=1e-6)


def test_air_dp_esdu_against_ht():
    ac = _cooler()
    m = model_of(ac, dp_method="esdu")
    p = air.air_properties(320.0)
    fa = m.film("air", 250.0 / m.n_parallel, p)
    ref = _ht_geometry(ac)
    # ht.air_cooler.dP_ESDU_high_fin (Bell), the whole air flow on ht's all-bundle geometry
    expected = ht.air_cooler.dP_ESDU_high_fin(m=250.0, A_min=ref.A_min, A_increase=ref.A_increase,
                                              flow_area_contraction_ratio=ref.flow_area_contraction_ratio,
                                              tube_diameter=ref.tube_diameter, pitch_parallel=ref.pitch_parallel,
                                              pitch_normal=ref.pitch_normal, tube_rows=ref.tube_rows, rho=p.density,
                                              mu=p.viscosity)
    assert float(fa.dp) == pytest.approx(expected, rel=1e-9)


def test_kern_shell_film_against_kerns_equation():
    hx = _hx(layout=90, tube_pitch="25.4 mm", tube_count=200)
    m = model_of(hx, shell_method="kern")
    p = OIL.props(330.0)
    f = m.film("shell", 25.0, p)
    do, pt, ds, bsp = 0.01905, 0.0254, 0.54, 0.3
    # Kern (1950) eq. 7.1 and Fig. 28 definitions: As = Ds C' B / Pt, square-pitch De = 4 (Pt² - pi do²/4)/(pi do)
    a_s = ds * (pt - do) * bsp / pt
    de = 4.0 * (pt ** 2 - math.pi * do ** 2 / 4.0) / (math.pi * do)
    Re = de * 25.0 / a_s / 1e-3
    h = 0.36 * 0.12 / de * Re ** 0.55 * (2300.0 * 1e-3 / 0.12) ** (1 / 3)  # Kern eq. 6.15b, no wall correction
    assert float(f.Re) == pytest.approx(Re, rel=1e-9)
    assert float(f.h) == pytest.approx(h, rel=1e-9)


@pytest.mark.parametrize("passes, subtype", [(1, "counterflow"), (2, "S&T")])
def test_shell_and_tube_effectiveness_against_ht(passes, subtype):
    m = model_of(_hx(tube_passes=passes))
    for ntu in (0.2, 1.0, 3.0):
        for cr in (0.0, 0.4, 1.0):
            eps, w = m.effectiveness(ntu, cr, True)
            # ht.hx.effectiveness_from_NTU (Bell): counterflow and the 1-2N shell-and-tube relation
            assert float(eps) == pytest.approx(ht.hx.effectiveness_from_NTU(ntu, cr, subtype=subtype), rel=1e-9)
            assert float(w) == pytest.approx(1.0 - ht.hx.effectiveness_from_NTU(ntu, cr, subtype=subtype),
                                             rel=1e-7, abs=1e-12)


def test_network_sums_like_resistances_in_series():
    # Incropera et al. (2007) eq. 11.5: 1/(U A_o) = 1/(h_o A_o) + Rf_o/A_o + ln(do/di)/(2 pi k L) + Rf_i/A_i
    # + 1/(h_i A_i), written out here for a plain carbon-steel tube at a k taken from the material
    hx = _hx()
    m = model_of(hx)
    do, di = m.bundle.d_o, m.bundle.d_i
    k = hx.tube_material.conductivity(350.0)
    by_hand = 1 / 900.0 + 2e-4 + do * math.log(do / di) / (2 * k) + 3e-4 * do / di + do / (di * 2500.0)
    assert sum(float(v) for v in m.network(900.0, 2500.0, 2e-4, 3e-4, 350.0)) == pytest.approx(by_hand, rel=1e-12)


# --------------------------------------------------------------------------------------- layers and the results
def test_result_layers_come_from_the_kind():
    r = rv.rate(_hx(), _svc())
    assert r.layers == model_of(_hx()).layers == layers_of(_hx()) == tuple(r.resistances.index)
    ra = rv.rate(_cooler(), _air_service())
    assert ra.layers == model_of(_cooler()).layers == tuple(ra.resistances.index)
    assert [c[2:] for c in ra.to_frame().columns if c.startswith("R ")] == list(AIR_LAYERS)


def test_rate_passes_the_kinds_methods_on():
    ac, svc = _cooler(), _air_service()
    a = rv.rate(ac, svc, h_method="esdu")
    b = rv.rating_air.rate_air_cooler(ac, svc, h_method="esdu")
    assert a.h_air == b.h_air and a.h_air != rv.rate(ac, svc).h_air


# ----------------------------------------------------------------------------------------------------- errors
class _Plate:
    kind = "plate"


@pytest.mark.parametrize("thing", [object(), _Plate(), "E-101", None], ids=["object", "unregistered kind", "str",
                                                                              "None"])
def test_an_unknown_exchanger_is_an_input_error_naming_the_kinds(thing):
    for call in (lambda: rv.rate(thing, _svc()), lambda: model_of(thing), lambda: layers_of(thing)):
        with pytest.raises(InputError) as e:
            call()
        assert e.value.field == "exchanger"
        assert "shell and tube" in str(e.value) and "air cooler" in str(e.value)


def test_bad_methods_and_sides_are_input_errors():
    with pytest.raises(InputError) as e:
        model_of(_hx(), h_method="esdu")  # an air-cooler choice on a shell-and-tube
    assert e.value.field == "h_method"
    with pytest.raises(InputError) as e:
        model_of(_cooler(), fin_method="exact")
    assert e.value.field == "fin_method"
    with pytest.raises(InputError) as e:
        model_of(_hx(shell_type="X", tube_passes=1), shell_method="kern")
    assert e.value.field == "shell_method"
    with pytest.raises(InputError) as e:
        rv.rate(_hx(), _svc(), h_method="esdu")
    assert e.value.field == "h_method"
    with pytest.raises(InputError) as e:
        model_of(_cooler()).film("shell", 1.0, OIL.props(300.0))
    assert e.value.field == "side"


def test_report_labels_read_the_names_from_the_result():
    from revamp.report.labels import RESISTANCE_COLOURS, resistance_names

    r, ra = rv.rate(_hx(), _svc()), rv.rate(_cooler(), _air_service())
    assert resistance_names(r) == TUBE_LAYERS and resistance_names(ra) == AIR_LAYERS
    for cls in MODELS.values():  # every layer of every kind has its own colour in the charts
        assert all(name in RESISTANCE_COLOURS for name in cls.layers)


# ------------------------------------------------------------------------------------------ physical laws
MODELS_BY_NAME = {"E shell": model_of(_hx()), "F shell": model_of(_hx(shell_type="F", tube_passes=4)),
                  "X shell": model_of(_hx(shell_type="X", tube_passes=1)), "air cooler": model_of(_cooler())}


@settings(max_examples=25, deadline=None)
@given(name=st.sampled_from(sorted(MODELS_BY_NAME)), ntu=st.floats(0.01, 8.0), cr=st.floats(0.0, 1.0),
       outer_min=st.booleans())
def test_effectiveness_is_bounded_and_grows_with_ntu(name, ntu, cr, outer_min):
    # second law: 0 <= eps <= 1; more area (NTU) never less duty for these arrangements (no temperature cross in
    # counterflow, 1-2N, crossflow and the air cooler's rows and passes; common knowledge, Kays & London 1984)
    m = MODELS_BY_NAME[name]
    eps, w = m.effectiveness(np.array([ntu, 1.2 * ntu]), cr, outer_min)
    assert np.all((eps >= 0.0) & (eps <= 1.0))
    assert np.allclose(eps + w, 1.0, rtol=0, atol=1e-12)
    assert eps[1] >= eps[0] - 1e-12


@settings(max_examples=15, deadline=None)
@given(name=st.sampled_from(sorted(MODELS_BY_NAME)), rf=st.floats(0.0, 1e-3), h=st.floats(50.0, 5000.0))
def test_fouling_and_films_move_the_network_the_right_way(name, rf, h):
    # resistances in series (Incropera et al. 2007 §11.2): more fouling on either side, a larger total; a better
    # film, a smaller one. The film check is made without outer fouling: the air cooler's network takes the fin
    # efficiency at the clean air film and divides the air fouling by the surface efficiency, so with heavy air
    # fouling a better film can raise the fouling term by more than it lowers the film term (a limit of that
    # approximation, seen only far above an air cooler's films: from about 900 W/m²K with 1e-3 m²K/W of fouling)
    m = MODELS_BY_NAME[name]
    base = sum(float(r) for r in m.network(h, 2000.0, rf, rf, 330.0))
    assert sum(float(r) for r in m.network(h, 2000.0, rf + 1e-4, rf, 330.0)) > base
    assert sum(float(r) for r in m.network(h, 2000.0, rf, rf + 1e-4, 330.0)) > base
    clean_outer = sum(float(r) for r in m.network(h, 2000.0, 0.0, rf, 330.0))
    assert sum(float(r) for r in m.network(1.5 * h, 2000.0, 0.0, rf, 330.0)) < clean_outer


def test_a_class_with_an_odd_kind_is_an_input_error():
    class Odd:
        kind = ["shell and tube"]  # not a name

    for call in (lambda: rv.rate(Odd(), _svc()), lambda: model_of(Odd())):
        with pytest.raises(InputError) as e:
            call()
        assert e.value.field == "exchanger"
