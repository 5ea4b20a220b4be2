"""What a study decides: the value basis of the money, a ranking that respects the limits, one judging basis.

Every expected number is a hand calculation (stated beside it) or a direct ``rv.rate`` call on the state the rule
names; the rules themselves are common practice with no published source unless a comment says otherwise.
"""
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import economics as ec
from revamp import options as op
from revamp.errors import InputError

# invented case (constant properties): a kerosene-like oil cooled by a crude-like oil
OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=0.4e-3, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)
EX = rv.ShellAndTube(shell_id="21.25 in", tube_od="1 in", tube_wall="0.095 in", tube_length="16 ft", tube_count=158,
                     tube_passes=4, tube_pitch="1.25 in", layout=90, baffle_spacing="5 in", baffle_cut=0.25,
                     tube_material="carbon steel")
SVC = rv.Service(shell=rv.Stream(OIL, "43800 lb/h", "390 degF"), tube=rv.Stream(CRUDE, "149000 lb/h", "100 degF"),
                 fouling_shell=2e-4, fouling_tube=5e-4)
YEAR_S = 8000 * 3600.0  # 8000 h of operation per year, in seconds
NO_VIB = {"vibration": False, "dp_shell": 1e6}


def direct(ex, svc, fouling_shell=None, fouling_tube=None):
    """A rating of (ex, svc) with the fouling set as given (None: the service's design value)."""
    return rv.rate(ex, svc.replace(fouling_shell=SVC.fouling_shell if fouling_shell is None else fouling_shell,
                                   fouling_tube=SVC.fouling_tube if fouling_tube is None else fouling_tube))


# ------------------------------------------------------------------------------------------- value basis of the money
def test_fuel_basis_values_duty_as_fired_fuel():
    e = ec.Economics(energy_price=8.0, efficiency=0.85)
    # 1 MW × 8000 h × 3600 s/h × 8 per GJ / 1e9 J/GJ / 0.85 (hand calculation)
    assert e.value(1e6) == pytest.approx(1e6 * YEAR_S * 8e-9 / 0.85, rel=1e-12)
    assert "fired fuel" in e.basis_text()


def test_cooler_duty_costs_utility_and_earns_only_the_throughput_it_frees():
    e = ec.Economics(value_basis="cooling", utility_price=0.5, capacity_flow=0.5, capacity_margin=0.02)
    # 1 MW more removed × 8000 h × 0.5 per GJ of cooling utility: a cost (hand calculation)
    utility = 1e6 * YEAR_S * 0.5e-9
    capacity = 0.5 * YEAR_S * 0.02  # kg/s × s/yr × per kg (hand calculation)
    assert e.value(1e6) == pytest.approx(-utility, rel=1e-12)
    assert e.value(1e6, meets_target=True) == pytest.approx(capacity - utility, rel=1e-12)
    # no fuel credit whatever fuel price is given
    assert ec.Economics(energy_price=8.0, value_basis="cooling").value(1e6) == 0.0
    assert "cooling utility" in e.basis_text()
    assert "counted as zero" in ec.Economics(value_basis="cooling").basis_text()


@pytest.mark.parametrize("basis", ["throughput", "column"])
def test_throughput_and_condenser_bases_value_only_the_limit_lifted(basis):
    e = ec.Economics(value_basis=basis, capacity_flow=1.0, capacity_margin=0.01)
    assert e.value(5e6) == 0.0
    assert e.value(5e6, meets_target=True) == pytest.approx(1.0 * YEAR_S * 0.01, rel=1e-12)  # hand calculation
    assert basis in e.basis_text()


def test_value_basis_inputs_are_checked():
    with pytest.raises(InputError, match="economics.value_basis"):
        ec.Economics(energy_price=8.0, value_basis="steam")
    with pytest.raises(InputError, match="economics.energy_price"):
        ec.Economics(value_basis="fuel")
    with pytest.raises(InputError, match="energy_price"):
        ec.Economics(value_basis="cooling", utility_price=-1.0)


def test_study_states_the_value_basis_of_every_money_figure():
    econ = {"value_basis": "cooling", "utility_price": 0.5, "capex": {"add 1 shell in series": 2e5}}
    s = rv.compare(EX, SVC, [op.AddShells(1)], economics=econ, limits=NO_VIB)
    row = s.table.loc["add 1 shell in series"]
    assert (s.table["value_basis"] == "cooling").all()
    assert "cooling utility" in s.value_text
    # the extra duty of a cooler that lifts no limit only costs utility: negative value, no payback
    assert row["duty_gain"] > 0
    assert row["annual_value"] == pytest.approx(-row["duty_gain"] * YEAR_S * 0.5e-9, rel=1e-9)
    assert row["payback"] == math.inf


# ---------------------------------------------------------------------------------------- the ranking and the limits
@pytest.fixture(scope="module")
def limited():
    """No option meets a far target; twisted tapes pay back fastest but break the tube-side pressure drop limit."""
    tape, par = op.TwistedTape(3.0), op.AddShells(1, "parallel")
    dp_base = float(direct(EX, SVC).dp_tube)
    dp_tape = float(direct(*tape.apply(EX, SVC)).dp_tube)
    assert dp_tape > 1.5 * dp_base  # the premise: tapes raise Δp well beyond the base
    econ = {"energy_price": 8.0, "discount_rate": 0.1, "horizon": 10,
            "capex": {tape.label: 1e3, par.label: 9e5}}
    limits = dict(NO_VIB, dp_tube=1.2 * dp_base)
    target = 10 * float(direct(EX, SVC).duty)
    return tape, par, econ, limits, target


def test_an_option_failing_a_limit_never_ranks_above_one_within_every_limit(limited):
    tape, par, econ, limits, target = limited
    s = rv.compare(EX, SVC, [tape, par], target=target, economics=econ, limits=limits)
    t = s.table
    assert not t["meets_target"].any()
    assert t.loc[tape.label, "screening"] == "fail" and t.loc[par.label, "screening"] != "fail"
    assert t.loc[tape.label, "payback"] < t.loc[par.label, "payback"]  # money alone would put the tapes first
    assert t.loc[par.label, "rank"] == 1 and t.loc[tape.label, "rank"] == 2
    assert s.recommendation.startswith("No option meets the target; the nearest within every limit: "
                                       + par.label)


def test_every_option_failing_a_limit_is_said_to_be_no_recommendation(limited):
    tape, _, econ, limits, target = limited
    s = rv.compare(EX, SVC, [tape], target=target, economics=econ, limits=limits)
    assert "fails a screening limit" in s.recommendation and "Not a recommendation" in s.recommendation


@pytest.mark.parametrize("rank_by", ["npv", "payback", "npv_per_capex", "duty_gain"])
def test_ranking_criterion_orders_options_and_is_stated(rank_by):
    opts = [op.TwistedTape(4.0), op.AddShells(1), op.AddShells(1, "parallel"), op.TwistedTape(6.0)]
    econ = {"energy_price": 8.0, "discount_rate": 0.1, "horizon": 10,
            "capex": {opts[0].label: 1.5e5, opts[1].label: 9e5, opts[2].label: 6e5, opts[3].label: 1e5}}
    s = rv.compare(EX, SVC, opts, economics=econ, limits={"vibration": False, "dp_tube": 1e7, "dp_shell": 1e7},
                   rank_by=rank_by)
    r = s.ranked()
    assert (r["screening"] != "fail").all() and r["meets_target"].all()
    # each criterion from the table's own columns, recomputed here from capex and value by hand
    npv = -r["capex"] + r["annual_value"] * ec.annuity_factor(0.1, 10)
    key = {"npv": -npv, "payback": r["capex"] / r["annual_value"], "npv_per_capex": -npv / r["capex"],
           "duty_gain": -r["duty_gain"]}[rank_by]
    assert list(key) == sorted(key)
    assert s.rank_by == rank_by
    assert ec.Economics  # the sentence names the criterion and the rule
    words = {"npv": "net present value", "payback": "payback", "npv_per_capex": "NPV per unit of capex",
             "duty_gain": "duty gain"}[rank_by]
    assert words in s.ranking_text and "never ranks above" in s.ranking_text


def test_ranking_falls_back_and_says_why_when_the_money_is_missing():
    s = rv.compare(EX, SVC, [op.AddShells(1)], economics={"energy_price": 8.0}, limits=NO_VIB)
    assert s.rank_by == "payback" and "no discount rate" in s.ranking_text
    s = rv.compare(EX, SVC, [op.AddShells(1)], limits=NO_VIB)
    assert s.rank_by == "duty_gain" and "no economics" in s.ranking_text
    with pytest.raises(InputError, match="rank_by"):
        rv.compare(EX, SVC, [op.AddShells(1)], rank_by="irr")


# --------------------------------------------------------------------------------------------- one judging basis
def test_cleaning_is_judged_fouled_again_at_end_of_run_like_every_option():
    clean, shell = op.Clean(), op.AddShells(1)
    econ = {"energy_price": 8.0, "discount_rate": 0.1, "horizon": 10,
            "capex": {clean.label: 4e4, shell.label: 3e5}}
    s = rv.compare(EX, SVC, [clean, shell], economics=econ, limits=dict(NO_VIB, dp_tube=1e7))
    t = s.table
    # at the end of its next run the cleaned exchanger is back at its design fouling: the base case's rating
    assert t.loc[clean.label, "duty"] == pytest.approx(float(direct(EX, SVC).duty), rel=1e-12)
    assert t.loc[clean.label, "duty_gain"] == pytest.approx(0.0, abs=1e-6)
    # the added shell carries the same design fouling at end of run
    assert t.loc[shell.label, "duty"] == pytest.approx(float(direct(*shell.apply(EX, SVC)).duty), rel=1e-12)
    # NPV: the cleaning earns nothing that lasts (−capex); the shell 474 kW × 8000 h × 8 /GJ × 6.1446 − 300k > 0
    assert t.loc[clean.label, "npv"] == pytest.approx(-4e4) and t.loc[shell.label, "npv"] > 0
    assert t.loc[shell.label, "rank"] == 1
    assert (t["judged_on"] == "end_of_run").all()
    assert "end of run" in s.basis_text and "the same for all" in s.basis_text


def test_end_of_run_with_a_growth_model_uses_each_rows_own_end_fouling():
    def model(t):
        return 1e-4 + 1e-11 * np.asarray(t, dtype=float)

    tau, age = 300 * 86400.0, 100 * 86400.0
    s = rv.compare(EX, SVC, [op.Clean(side="tube"), op.Clean()],
                   cycle={"fouling": model, "run_length": "300 day", "points": 5, "base_age": "100 day"})
    t = s.table
    # the base goes on from its age; the cleaned bundles start clean: tube Rf at the end of the run [m²K/W]
    assert t.loc["base", "duty"] == pytest.approx(float(direct(EX, SVC, fouling_tube=model(age + tau)).duty), rel=1e-12)
    for label in ("clean tube side", "clean both sides"):
        # the side without a growth model (shell) is back at its design value at end of run, cleaned or not
        assert t.loc[label, "duty"] == pytest.approx(float(direct(EX, SVC, fouling_tube=model(tau)).duty),
                                                     rel=1e-12)


def test_cycle_average_of_a_cleaned_side_without_growth_model_ramps_to_design():
    def model(t):
        return 1e-11 * np.asarray(t, dtype=float)

    s = rv.compare(EX, SVC, [op.Clean()], cycle={"fouling": model, "run_length": "200 day", "points": 5})
    n, tau = 5, 200 * 86400.0

    def duty_at(rf):  # shell side from 0 (cleaned) to its design 2e-4 over the run, linearly (the stated rule)
        return rv.rate(EX, SVC.replace(fouling_tube=rf, fouling_shell=2e-4 * np.linspace(0, 1, n))).duty

    expected = ec.cycle_average(duty_at, model, tau, points=n).duty_mean
    assert s.table.loc["clean both sides", "duty_cycle_avg"] == pytest.approx(expected, rel=1e-9)


def test_cycle_average_basis_judges_the_target_on_the_run_mean():
    def model(t):
        return 1e-11 * np.asarray(t, dtype=float)

    cycle = {"fouling": model, "run_length": "300 day", "points": 7}
    tau = 300 * 86400.0
    mean = ec.cycle_average(lambda rf: direct(EX, SVC, fouling_tube=rf).duty, model, tau, points=7).duty_mean
    end = float(direct(EX, SVC, fouling_tube=model(tau)).duty)
    assert end < mean  # the premise: a target between them is met on average, missed at end of run
    target = 0.5 * (end + mean)
    avg = rv.compare(EX, SVC, [op.AddShells(1)], target=target, cycle=cycle, basis="cycle_average", limits=NO_VIB)
    eor = rv.compare(EX, SVC, [op.AddShells(1)], target=target, cycle=cycle, limits=NO_VIB)
    assert avg.table.loc["base", "target_mean"] == pytest.approx(mean, rel=1e-9)
    assert bool(avg.table.loc["base", "meets_target"]) and not bool(eor.table.loc["base", "meets_target"])
    assert "cycle average" in avg.basis_text
    with pytest.raises(InputError, match="basis"):
        rv.compare(EX, SVC, [op.AddShells(1)], basis="cycle_average")
    with pytest.raises(InputError, match="basis"):
        rv.compare(EX, SVC, [op.AddShells(1)], basis="day0")


# ------------------------------------------------------------------------------------------- the unit file's keys
def test_unit_file_value_basis_per_exchanger_with_a_unit_default(tmp_path):
    from test_unitfile import make_unit, write_unit

    from revamp import unitfile
    from revamp.studies import study_exchanger

    doc = make_unit("E-1", "C-2")
    doc["economics"].update(value_basis="fuel", utility_price="0.4 USD/GJ", rank_by="payback",
                            capacity_margin="4 USD/t")
    doc["exchangers"][1]["value_basis"] = "cooling"
    doc["exchangers"][1]["revamp"]["capacity_flow"] = "2 kg/s"
    path = write_unit(tmp_path / "unit.yaml", doc)
    assert unitfile.check(path) == []
    unit = unitfile.load(path)
    e1, c2 = unit.exchanger("E-1"), unit.exchanger("C-2")
    assert e1.economics.value_basis == "fuel" and c2.economics.value_basis == "cooling"
    # 0.4 USD/GJ = 0.4e-9 USD/J, given back per GJ (definition of the prefix)
    assert c2.economics.utility_price == pytest.approx(0.4, rel=1e-12)
    assert c2.rank_by == "payback"
    res = study_exchanger(c2, mc_draws=0)
    assert res.study.rank_by == "payback" and (res.study.table["value_basis"] == "cooling").all()
    assert any(n.quantity == "value_basis" and "exchangers[1].value_basis" in n.text for n in res.notes)
    assert any(n.quantity == "value_basis" and "economics.value_basis" in n.text
               for n in study_exchanger(e1, mc_draws=0).notes)


def test_unit_file_refuses_an_unknown_basis_by_path(tmp_path):
    from test_unitfile import make_unit, write_unit

    from revamp import unitfile

    doc = make_unit("E-1")
    doc["exchangers"][0]["value_basis"] = "steam credit"
    doc["economics"]["rank_by"] = "irr"
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", doc))
    paths = {p.path for p in problems}
    assert "exchangers[0].value_basis" in paths and "economics.rank_by" in paths


# ------------------------------------------------------------------------------------------------- invariants
@settings(max_examples=6, deadline=None)
@given(capex=st.lists(st.floats(1e3, 2e6), min_size=3, max_size=3), dp_factor=st.floats(0.8, 3.0))
def test_rank_classes_hold_whatever_the_prices_and_the_limit(capex, dp_factor):
    # limits before target before NPV, for any capex and any tube-side Δp limit (the stated rule, no source)
    opts = [op.TwistedTape(3.0), op.AddShells(1), op.AddShells(1, "parallel")]
    econ = {"energy_price": 8.0, "discount_rate": 0.1, "horizon": 10,
            "capex": {o.label: c for o, c in zip(opts, capex)}}
    dp = dp_factor * float(direct(EX, SVC).dp_tube)
    s = rv.compare(EX, SVC, opts, target=1.3 * float(direct(EX, SVC).duty), economics=econ,
                   limits=dict(NO_VIB, dp_tube=dp))
    r = s.ranked()
    key = list(zip(r["screening"] == "fail", ~r["meets_target"].astype(bool)))
    assert key == sorted(key)
    for _, group in r.groupby([r["screening"] == "fail", r["meets_target"]], sort=False):
        assert list(group["npv"]) == sorted(group["npv"], reverse=True)


@settings(max_examples=25, deadline=None)
@given(gain=st.floats(0.0, 1e8), price=st.floats(0.0, 50.0))
def test_a_coolers_extra_duty_alone_never_earns_money(gain, price):
    # a cooler's duty replaces no fuel: without lifting a limit its value is never positive (the stated basis)
    e = ec.Economics(energy_price=10.0, value_basis="cooling", utility_price=price)
    assert e.value(gain) <= 0.0
    assert ec.Economics(value_basis="throughput").value(gain) == 0.0
