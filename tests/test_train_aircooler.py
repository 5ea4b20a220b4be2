"""An air cooler in a train: a stream's rundown cooler, rated with its own rating at the inlet the network gives it.

Expected values come from outside the train solver: a direct ``rate()`` of the air cooler at the solved inlet
(consistency: the solver only feeds it), energy balances written by hand with constant heat capacities (first law),
the cross-flow effectiveness of one tube row with the tube fluid mixed and the air unmixed written out from Incropera
et al. (2007), *Fundamentals of Heat and Mass Transfer*, 6th ed., Table 11.3, and the paths the inputs' own layout
gives. All fluids, exchangers and streams are invented.
"""
from __future__ import annotations

import copy
import math

import numpy as np
import pytest
import yaml
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import unitfile
from revamp.errors import InputError
from revamp.options import TwistedTape
from revamp.options_air import CleanFins, FanUpgrade
from revamp.train import AirSide, Match, Train, network_services

CP_CRUDE, CP_DIESEL = 2300.0, 2500.0
CRUDE = rv.fluids.constant(density=830, heat_capacity=CP_CRUDE, viscosity=2e-3, conductivity=0.12)
DIESEL = rv.fluids.constant(density=800, heat_capacity=CP_DIESEL, viscosity=1.5e-3, conductivity=0.12)
HX = rv.ShellAndTube(shell_id="787 mm", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="6.1 m",
                     tube_count=500, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="450 mm",
                     baffle_cut=0.25, tube_material=45.0)


def air_cooler(rows=4, passes=4, tubes_per_row=46):
    return rv.AirCooler(bays=2, bundles_per_bay=1, tube_rows=rows, tubes_per_row=tubes_per_row, tube_passes=passes,
                        tube_length="9.14 m", tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm",
                        row_pitch="55 mm", tube_material="carbon steel",
                        fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m", material="aluminium",
                                   bond="embedded"),
                        fans_per_bay=2, fan_diameter="3.66 m", fan_efficiency=0.65, draft="forced")


AC = air_cooler()
AIR = AirSide("35 degC", air_flow="200 kg/s", fouling=1e-4)


def make_train(ac=AC, air=AIR, diesel_flow="22 kg/s"):
    return Train(streams={"crude": rv.Stream(CRUDE, "60 kg/s", "35 degC"),
                          "diesel": rv.Stream(DIESEL, diesel_flow, "265 degC")},
                 exchangers={"E-1": Match(HX, shell="diesel", tube="crude", fouling_tube=5e-4),
                             "AC-1": Match(ac, tube="diesel", air=air, fouling_tube=2e-4, dp_max_tube="100 kPa")},
                 routes={"crude": ["E-1"], "diesel": ["E-1", "AC-1"]}, rundown={"diesel": "60 degC"})


@pytest.fixture(scope="module")
def solved():
    return make_train().solve()


# ------------------------------------------------------------------------------------------------ the solve
def test_air_cooler_equals_a_direct_rating_at_the_solved_inlet(solved):
    """The solver only feeds the air cooler: its duty and outlet are those of rate() at the inlet it solved."""
    res = solved
    assert res.converged
    r = res.ratings["AC-1"]
    assert isinstance(r, rv.AirRating)
    # the diesel leaves E-1 into AC-1 (the route)
    t_in = res.exchangers.loc["E-1", "t_out_shell"]
    assert r.service.tube.t_in == pytest.approx(t_in, abs=1e-6)
    direct = rv.rate(AC, rv.AirService(tube=rv.Stream(DIESEL, 22.0, t_in), air_in="35 degC", air_flow=200.0,
                                       fouling_tube=2e-4, fouling_air=1e-4))  # consistency with rate()
    assert res.exchangers.loc["AC-1", "duty"] == pytest.approx(direct.duty, rel=1e-9)
    assert res.exchangers.loc["AC-1", "t_out_tube"] == pytest.approx(direct.t_out_tube, abs=1e-6)
    assert res.exchangers.loc["AC-1", "fan_power"] == pytest.approx(direct.fan_power, rel=1e-9)
    assert res.exchangers.loc["AC-1", "t_in_air"] == pytest.approx(308.15)  # 35 °C by definition
    # the stream ends at the air cooler's outlet: that is its rundown temperature
    assert res.final_temperatures["diesel"] == pytest.approx(direct.t_out_tube, abs=1e-6)
    assert any(c.name == "AC-1 dp_tube" for c in res.limits)


def test_rundown_temperature_by_hand(solved):
    """First law with constant heat capacities: the diesel gives E-1's and AC-1's duties, the crude takes E-1's."""
    res = solved
    q1, q_ac = res.exchangers.loc["E-1", "duty"], res.exchangers.loc["AC-1", "duty"]
    supply = 265.0 + 273.15
    assert res.final_temperatures["diesel"] == pytest.approx(supply - (q1 + q_ac) / (22.0 * CP_DIESEL), abs=1e-6)
    assert res.final_temperatures["crude"] == pytest.approx(308.15 + q1 / (60.0 * CP_CRUDE), abs=1e-6)
    # the streams' table: what the diesel gives is what the crude and the air take
    assert res.streams["duty"].sum() + q_ac == pytest.approx(0.0, abs=1e-6 * q_ac)
    # the trim cooler takes the diesel from its final temperature to the 60 °C rundown limit (first law)
    final = res.final_temperatures["diesel"]
    assert res.streams.loc["diesel", "trim_duty"] == pytest.approx(22.0 * CP_DIESEL * max(final - 333.15, 0.0),
                                                                     rel=1e-9, abs=1e-6)


def test_one_row_air_cooler_outlet_from_the_textbook_relation():
    """One tube row in one pass: cross flow, tube fluid mixed (Cmin), air unmixed (Incropera et al. 2007, Table
    11.3): eps = 1 - exp(-(1/Cr)(1 - exp(-Cr NTU))); the train's outlet is that of the rating's U and area."""
    ac = air_cooler(rows=1, passes=1, tubes_per_row=60)
    res = make_train(ac=ac, air=AirSide("30 degC", air_flow="250 kg/s"), diesel_flow="10 kg/s").solve()
    r = res.ratings["AC-1"]
    c_t, c_a = float(r.C_tube), float(r.C_air)
    assert c_t < c_a  # the tube side is Cmin here: the relation below is the one for a mixed Cmin
    ntu, cr = float(r.U_service) * r.area / c_t, c_t / c_a
    eps = 1.0 - math.exp(-(1.0 / cr) * (1.0 - math.exp(-cr * ntu)))
    t_in = float(r.service.tube.t_in)
    assert res.final_temperatures["diesel"] == pytest.approx(t_in - eps * (t_in - 303.15), abs=1e-6)


@settings(max_examples=5, deadline=None)
@given(ambient=st.floats(5.0, 45.0), air_flow=st.floats(120.0, 400.0))
def test_energy_balance_holds_for_any_air(ambient, air_flow):
    """First law over the whole train: what the streams give up is what the air takes."""
    res = make_train(air=AirSide(f"{ambient} degC", air_flow=air_flow)).solve()
    q_ac = res.exchangers.loc["AC-1", "duty"]
    assert q_ac > 0
    assert res.streams["duty"].sum() + q_ac == pytest.approx(0.0, abs=1e-6 * q_ac)


def test_an_ambient_sweep_is_the_single_cases_and_hotter_air_runs_down_hotter():
    ambients = np.array([288.15, 303.15, 318.15])
    sweep = make_train(air=AirSide(ambients, air_flow="200 kg/s")).solve()
    final = sweep.final_temperatures["diesel"]
    assert np.all(np.diff(final) > 0)  # hotter ambient, less duty: physical law
    for k, t in enumerate(ambients):  # a sweep case is the single case (consistency)
        one = make_train(air=AirSide(float(t), air_flow="200 kg/s")).solve()
        assert final[k] == pytest.approx(one.final_temperatures["diesel"], abs=1e-6)


def test_options_on_the_air_cooler_change_its_air():
    train = make_train()
    faster = train.apply({"AC-1": FanUpgrade(speed_ratio=1.15)})
    # fan laws: air flow proportional to fan speed (Kröger 2004, ch. 8)
    assert faster.exchangers["AC-1"].air.air_flow == pytest.approx(200.0 * 1.15)
    clean = train.apply({"AC-1": CleanFins()})
    assert clean.exchangers["AC-1"].air.fouling == 0.0
    inserts = train.apply({"AC-1": TwistedTape(twist_ratio=4.0)})
    assert inserts.exchangers["AC-1"].exchanger.insert is not None
    base, more = train.solve(), faster.solve()
    assert more.exchangers.loc["AC-1", "duty"] > base.exchangers.loc["AC-1", "duty"]  # more air, more duty


def test_network_services_give_the_air_cooler_its_solved_inlet(solved):
    services = network_services(make_train(), revamp=1.2)
    svc = services.today["AC-1"]
    assert isinstance(svc, rv.AirService)
    assert svc.tube.t_in == pytest.approx(solved.exchangers.loc["E-1", "t_out_shell"], abs=1e-5)
    assert svc.air_in == pytest.approx(308.15) and svc.fouling_air == pytest.approx(1e-4)
    assert services.revamp["AC-1"].tube.flow == pytest.approx(22.0 * 1.2)


# ------------------------------------------------------------------------------------------------ bad input
@pytest.mark.parametrize("build, field", [
    (lambda: Match(AC, tube="diesel"), "air"),
    (lambda: Match(AC, shell="crude", tube="diesel", air=AIR), "shell"),
    (lambda: Match(AC, tube="diesel", air=AIR, fouling_shell=1e-4), "fouling_shell"),
    (lambda: Match(AC, tube="diesel", air=AIR, dp_max_shell="50 kPa"), "dp_max_shell"),
    (lambda: Match(HX, shell="diesel", tube="crude", air=AIR), "air"),
    (lambda: Match(AC, tube=None, air=AIR), "tube"),
    (lambda: Match(AC, tube="diesel", air={"air_in": 300}), "air"),
    (lambda: AirSide("35 degC"), "air_flow"),
    (lambda: AirSide("35 degC", air_flow=100, face_velocity=3), "air_flow"),
    (lambda: AirSide("35 kg", air_flow=100), "air_in"),
    (lambda: AirSide("35 degC", air_flow=-1), "air_flow"),
    (lambda: AirSide("35 degC", air_flow=100, fouling=-1e-4), "fouling"),
    (lambda: AirSide("35 degC", air_flow=100, altitude="9 km"), "altitude"),
])
def test_bad_air_cooler_matches_name_the_field(build, field):
    with pytest.raises(InputError) as err:
        build()
    assert err.value.field == field


def test_an_air_cooler_on_the_wrong_route_or_none_is_named():
    streams = {"crude": rv.Stream(CRUDE, 60.0, 308.15), "diesel": rv.Stream(DIESEL, 22.0, 538.15)}
    matches = {"E-1": Match(HX, shell="diesel", tube="crude"), "AC-1": Match(AC, tube="diesel", air=AIR)}
    with pytest.raises(InputError) as err:
        Train(streams=streams, exchangers=matches, routes={"crude": ["E-1", "AC-1"], "diesel": ["E-1", "AC-1"]})
    assert err.value.field == "routes['crude'][1]" and "cooled by air" in err.value.allowed
    with pytest.raises(InputError) as err:
        Train(streams=streams, exchangers=matches, routes={"crude": ["E-1"], "diesel": ["E-1"]})
    assert err.value.field == "exchangers['AC-1'].tube"


# ------------------------------------------------------------------------------------------------ unit file
from test_train_unitfile import CRUDE as CRUDE_DOC  # noqa: E402
from test_train_unitfile import unit_doc  # noqa: E402

AC_ENTRY = yaml.safe_load("""
tag: AC-1
kind: air cooler
description: residue rundown cooler (invented)
geometry:
  bays: 2
  bundles_per_bay: 1
  tube_rows: 4
  tubes_per_row: 46
  tube_passes: 4
  tube_length: 9.14 m
  tube_od: 25.4 mm
  tube_wall: 2.11 mm
  transverse_pitch: 63.5 mm
  row_pitch: 55 mm
  tube_material: carbon steel
  fin: {height: 15.9 mm, thickness: 0.4 mm, per_length: 394 /m, material: aluminium, bond: embedded}
  fans_per_bay: 2
  fan_diameter: 3.66 m
  fan_efficiency: 0.65
  draft: forced
tube_side: {stream: resid, fouling: 0.0002 m**2*K/W, dp_allowed: 150 kPa}
air_side: {t_in: 35 degC, flow: 300 kg/s, fouling: 0.0001 m**2*K/W}
""")


def unit_with_air_cooler():
    doc = unit_doc()
    doc["exchangers"].append(copy.deepcopy(AC_ENTRY))
    doc["network"]["routes"]["resid"] = ["E-2", "E-1", "AC-1"]
    return doc


def write(tmp_path, doc):
    path = tmp_path / "unit.yaml"
    path.write_text(yaml.safe_dump(doc, sort_keys=False), encoding="utf-8")
    return path


def test_unit_file_network_takes_an_air_cooler_in_a_route(tmp_path):
    path = write(tmp_path, unit_with_air_cooler())
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    m = unit.network.exchangers["AC-1"]
    assert m.is_air_cooler and m.tube == "resid" and m.shell is None
    # the entry's own numbers: 35 °C (Celsius definition), 300 kg/s, fouling and allowed dp as written
    assert m.air.air_in == pytest.approx(308.15) and m.air.air_flow == pytest.approx(300.0)
    assert m.air.fouling == pytest.approx(1e-4) and m.fouling_tube == pytest.approx(2e-4)
    assert m.dp_max_tube == pytest.approx(150e3)
    # the tube side took the stream's fluid, flow and supply temperature (network.streams.resid)
    case = unit.exchanger("AC-1")
    assert case.stream == "resid" and case.service.tube.flow == pytest.approx(30.0)
    # the same train built in Python solves to the same rundown (the loader only translates the file)
    res = unit.network.solve()
    r = res.ratings["AC-1"]
    direct = rv.rate(m.exchanger, m.air.service(rv.Stream(case.service.tube.fluid, 30.0, r.service.tube.t_in),
                                                2e-4))
    assert res.final_temperatures["resid"] == pytest.approx(direct.t_out_tube, abs=1e-6)


def test_network_inlets_give_the_air_cooler_its_tube_inlet(tmp_path):
    path = write(tmp_path, unit_with_air_cooler())
    today, rev, text = unitfile.network_inlets(path, "AC-1")
    res = unitfile.load(path).network.solve(tol=1e-3)
    assert isinstance(today, rv.AirService)
    assert today.tube.t_in == pytest.approx(res.exchangers.loc["E-1", "t_out_shell"], abs=0.05)
    assert rev.tube.flow == pytest.approx(30.0 * 1.2)
    assert "Tube inlet from the train" in text


@pytest.mark.parametrize("change, path, words", [
    (lambda d: d["exchangers"][3]["tube_side"].update(stream="naphtha"), "exchangers[3].tube_side.stream",
     "network's streams"),
    (lambda d: d["network"]["routes"].update(crude=["E-1", {"point": "desalter", "t_min": "90 degC"}, "E-2",
                                                    "AC-1"]),
     "network.routes.crude[3]", "names stream 'crude'"),
    (lambda d: d["network"]["routes"].update(resid=["E-2", "E-1"]), "exchangers[3].tube_side.stream",
     "route lists AC-1"),
    (lambda d: d["exchangers"][3]["tube_side"].update(fluid=dict(CRUDE_DOC)), "exchangers[3].tube_side.fluid",
     "fluid of stream 'resid'"),
    (lambda d: d["exchangers"][3]["air_side"].update(flow="-3 kg/s"), "exchangers[3].air_side.flow", "> 0"),
])
def test_unit_file_air_cooler_network_problems_are_named(tmp_path, change, path, words):
    doc = unit_with_air_cooler()
    change(doc)
    problems = unitfile.check(write(tmp_path, doc))
    mine = [p for p in problems if p.path == path]
    assert mine, problems
    assert words in mine[0].message


def test_train_page_shows_the_air_cooler(solved):
    from revamp.report.train import _exchanger_rows, train_svg

    table = _exchanger_rows(solved)
    assert "air / diesel" in table and "fan power [kW]" in table
    assert f"{solved.exchangers.loc['AC-1', 'fan_power'] / 1e3:.1f}" in table
    svg = train_svg(solved, "train")
    assert "AC-1" in svg and "air 35 °C" in svg


def test_compare_train_rates_an_air_cooler_option():
    """A fan upgrade on the rundown cooler: more duty there, and the furnace-free train's streams still balance."""
    study = rv.compare_train(make_train(), {"faster fans": {"AC-1": FanUpgrade(speed_ratio=1.15)}})
    assert study.duty_changes.loc["faster fans", "AC-1"] > 0  # more air, more duty (physical law)
    assert study.duty_changes.loc["faster fans", "E-1"] == pytest.approx(0.0, abs=1e-3)  # upstream: unchanged
    # its isolated gain is the air cooler rated alone at its base inlet with the faster fans (consistency)
    assert study.isolated_gains.loc["faster fans", "AC-1"] == pytest.approx(
        study.duty_changes.loc["faster fans", "AC-1"], rel=1e-6)


def test_the_train_page_job_runs_with_an_air_cooler(tmp_path):
    """The batch's train page (run in a worker) on a unit whose network ends the residue in an air cooler."""
    from revamp.batch_train import run_train_page

    path = write(tmp_path, unit_with_air_cooler())
    out = run_train_page({"unit_file": str(path), "out": str(tmp_path), "points": 5})
    assert out["status"] == "ok", out["reason"]
    html = (tmp_path / out["file"]).read_text(encoding="utf-8")
    assert "air / resid" in html and "fan power [kW]" in html


def test_the_air_coolers_own_study_takes_the_trains_inlets(tmp_path):
    from revamp.report.air import air_header_html
    from revamp.studies.air import run_air_case

    path = write(tmp_path, unit_with_air_cooler())
    today, rev, text = unitfile.network_inlets(path, "AC-1")
    unit = unitfile.load(path)
    study = run_air_case(unit.exchanger("AC-1"), service_today=today, service_revamp=rev, inlets=text)
    assert study.ratings["today"].service.tube.t_in == pytest.approx(float(today.tube.t_in))
    assert study.ratings["revamp"].service.tube.flow == pytest.approx(36.0)  # 30 kg/s x 1.2 (network throughput)
    assert "train" in study.basis
    assert "Tube inlet from the train" in air_header_html(unit.exchanger("AC-1"), unit, "SI", study.inlets)


def test_cleaning_plan_refuses_an_air_cooler_by_path(tmp_path):
    """The cleaning plan prices fired fuel: an air cooler's bundle is not on it (named by its path)."""
    doc = unit_with_air_cooler()
    doc["cleaning"] = {"horizon": "1 yr", "exchangers": {
        "E-1": {"fouling": {"model": "linear", "rate": "0.0002 m**2*K/W/yr"}},
        "AC-1": {"fouling": {"model": "linear", "rate": "0.0002 m**2*K/W/yr"}}}}
    problems = unitfile.check(write(tmp_path, doc))
    mine = [p for p in problems if "AC-1" in p.path]
    assert [p.path for p in mine] == ["cleaning.exchangers.AC-1"], problems
    assert "shell-and-tube" in mine[0].message
    del doc["cleaning"]["exchangers"]["AC-1"]
    assert unitfile.check(write(tmp_path, doc)) == []


def test_an_air_coolers_shell_side_cannot_be_drawn_or_scheduled():
    """An air cooler has no shell side: a Monte Carlo draw on it, or a cleaning plan for it, is refused by path
    (common practice, no source: the input names what it cannot mean)."""
    from revamp.cleaning import schedule_cleaning
    from revamp.fouling.growth import Linear
    from revamp.train.montecarlo import monte_carlo

    train = make_train()
    with pytest.raises(InputError) as err:
        monte_carlo(train, 10, {"AC-1.fouling_shell": 0.2})
    assert "uncertainty['AC-1.fouling_shell']" in str(err.value) and "no shell side" in str(err.value)
    with pytest.raises(InputError) as err:
        schedule_cleaning(train.replace(furnace=rv.train.Furnace("crude", "360 degC", 0.85)),
                          {"AC-1": Linear("1e-10 m**2*K/W/s")})
    assert "fouling['AC-1']" in str(err.value)
