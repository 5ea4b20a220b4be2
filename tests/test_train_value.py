"""An exchanger of a train valued by the train: its study's money is the fired duty the whole train saves.

Sources:
- the value of fuel saved: annual value = ΔQ_absorbed × operating time × fuel price / heater efficiency (the
  economics definitions of revamp's METHODS, the usual fuel-saving valuation of heat recovery; e.g. Smith, R.
  *Chemical Process Design and Integration*, 2nd ed. 2016, ch. on heat-exchanger networks: energy cost = fuel
  fired × fuel price); here ΔQ_absorbed is the change of the furnace's absorbed duty between two train solves and
  the efficiency is the furnace's own;
- simple payback = capex / annual value; NPV = -capex + annual value × (1 - (1 + r)^-n) / r (Brealey, Myers & Allen,
  *Principles of Corporate Finance*, 13th ed. 2020, ch. 2-3: present value of an annuity);
- 1 GJ = 1e9 J, 1 h = 3600 s (SI definitions).
All units, exchangers, prices and options are invented.
"""
import copy
import math
import sys
from pathlib import Path

import pytest

from revamp import unitfile
from revamp.studies import study_exchanger

sys.path.insert(0, str(Path(__file__).parent))
from test_train_unitfile import unit_doc, write  # noqa: E402

PRICE = 8.0 / 1e9  # 8 EUR/GJ in EUR/J
HOURS = 8000.0
RATE, YEARS = 0.10, 10.0
FURNACE_EFF = 0.85  # the network's furnace efficiency (unit_doc: "85 %")
CAPEX = {"second shell": 400000.0, "clean": 50000.0}


def annuity(rate, years):
    return (1.0 - (1.0 + rate) ** -years) / rate  # present value of 1 a year (Brealey, Myers & Allen 2020)


def _doc(value_basis="fuel"):
    doc = copy.deepcopy(unit_doc())
    doc["economics"] = {"currency": "EUR", "energy_price": "8 EUR/GJ", "heater_efficiency": "85 %",
                        "hours_per_year": "8000 h", "discount_rate": RATE, "horizon": "10 yr",
                        "value_basis": value_basis}
    if value_basis == "cooling":
        doc["economics"]["utility_price"] = "0.4 EUR/GJ"
    doc["exchangers"][0]["options"] = [
        {"type": "add_shells", "n": 1, "label": "second shell", "capex": CAPEX["second shell"]},
        {"type": "clean", "label": "clean", "capex": CAPEX["clean"]}]
    return doc


def _study(tmp_path, value_basis="fuel", with_train=True):
    path = write(tmp_path, _doc(value_basis))
    unit = unitfile.load(path)
    case = unit.exchanger("E-1")
    today, rev, _ = unitfile.network_inlets(path, "E-1")
    train = unitfile.network_option_values(path, "E-1") if with_train else None
    return study_exchanger(case, service_today=today, service_revamp=rev, mc_draws=0, train_values=train), train


@pytest.fixture(scope="module")
def valued(tmp_path_factory):
    return _study(tmp_path_factory.mktemp("tv"))


def test_money_is_the_fired_duty_the_train_saves(valued):
    result, train = valued
    t = result.study.table
    base = train.results["base"]
    for label in ("second shell", "clean"):
        res = train.results[f"E-1: {label}"]
        absorbed_saved = float(base.furnace_absorbed) - float(res.furnace_absorbed)
        # hand calculation: ΔQ_absorbed × t × price / η_furnace (economics definitions, module docstring)
        expected = absorbed_saved * HOURS * 3600.0 * PRICE / FURNACE_EFF
        assert t.loc[label, "annual_value"] == pytest.approx(expected, rel=1e-9, abs=1e-6)
        if expected > 0:
            assert t.loc[label, "payback"] == pytest.approx(CAPEX[label] / expected, rel=1e-9)
        assert t.loc[label, "npv"] == pytest.approx(-CAPEX[label] + expected * annuity(RATE, YEARS), rel=1e-9)
        assert t.loc[label, "money_basis"].startswith("train")


def test_the_second_shell_saves_fuel_in_the_train(valued):
    # a second shell in series adds area: the train recovers more and fires less (energy balance; not zero, so the
    # hand calculation above is not trivially met)
    _, train = valued
    assert float(train.table.loc["E-1: second shell", "furnace_duty_saved"]) > 1e5


def test_the_own_duty_money_stays_beside_it(valued):
    result, _ = valued
    t = result.study.table
    for label in ("second shell", "clean"):
        # hand calculation: this exchanger's own duty gain × t × price / heater efficiency (0.85, the unit's
        # economics), on the duty the table judges by
        gain = t.loc[label, "duty"] - t.loc["base", "duty"]
        own = gain * HOURS * 3600.0 * PRICE / 0.85
        assert t.loc[label, "annual_value_own"] == pytest.approx(own, rel=1e-9)
        assert t.loc[label, "npv_own"] == pytest.approx(-CAPEX[label] + own * annuity(RATE, YEARS), rel=1e-9)
    # the train takes off what the exchanger downstream no longer recovers: on this two-exchanger crude route a gain
    # in E-1 is partly lost in E-2, so the train's value is below the exchanger's own (energy balance of the train)
    assert t.loc["second shell", "annual_value"] < t.loc["second shell", "annual_value_own"]


def test_rank_and_report_follow_the_train_money(valued):
    result, _ = valued
    study = result.study
    t = study.table
    assert "train" in study.value_text and "fired duty" in study.value_text
    ok = [k for k in t.index if k != "base" and t.loc[k, "screening"] != "fail" and t.loc[k, "meets_target"]]
    if len(ok) == 2 and study.rank_by == "npv":  # same class: the higher train NPV ranks first (stated rule)
        best = max(ok, key=lambda k: t.loc[k, "npv"])
        assert t.loc[best, "rank"] == 1
        assert study.recommendation.startswith(best)
    from revamp.report import study_money_table

    money = study_money_table(study)
    assert "money on" in money.columns and any("own" in c for c in money.columns)


def test_without_the_train_the_money_is_the_exchanger_s_own(tmp_path):
    result, _ = _study(tmp_path, with_train=False)
    assert "money_basis" not in result.study.table
    assert "annual_value_own" not in result.study.table


def test_a_cooler_basis_is_not_turned_into_fuel(tmp_path):
    result, train = _study(tmp_path, value_basis="cooling")
    t = result.study.table
    assert "money_basis" not in t
    gain = t.loc["clean", "duty"] - t.loc["base", "duty"]
    # cooling basis: -ΔQ × t × utility price (0.4 EUR/GJ), the exchanger's own (economics definitions)
    assert t.loc["clean", "annual_value"] == pytest.approx(-gain * HOURS * 3600.0 * 0.4e-9, rel=1e-9)
    assert any(n.quantity == "value_basis" and "not used" in n.text for n in result.notes)
    assert math.isfinite(float(train.table.loc["E-1: clean", "furnace_duty_saved"]))


def test_cleaning_is_judged_at_the_end_of_its_run_in_the_train_too(valued):
    result, train = valued
    # one judging basis for every option (end of run): a cleaned bundle carries its design fouling again, so the
    # exchanger and the train are as in the base case and nothing is saved (same inputs, same solve: definition)
    assert float(train.table.loc["E-1: clean", "furnace_duty_saved"]) == pytest.approx(0.0, abs=1e-6)
    assert result.study.table.loc["clean", "annual_value"] == pytest.approx(0.0, abs=1e-6)


def test_a_row_the_train_cannot_value_keeps_its_own_money_and_says_so(tmp_path):
    import dataclasses

    from revamp.studies.exchanger import train_valued

    result, train = _study(tmp_path, with_train=False)
    _, full = _study(tmp_path)
    partial = dataclasses.replace(full, table=full.table.drop(index="E-1: clean"))
    study, notes = train_valued(result.study, partial, "E-1")
    t = study.table
    # never a silent number: the row keeps the exchanger's own money, its basis column and a note say so
    assert t.loc["clean", "annual_value"] == t.loc["clean", "annual_value_own"]
    assert t.loc["clean", "money_basis"].startswith("own")
    assert t.loc["second shell", "money_basis"].startswith("train")
    assert any(n.source == "clean" and n.severity == "warning" for n in notes)
