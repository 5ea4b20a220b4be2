"""Tests of revamp.study.compare on a small invented case: every number traced to a direct rv.rate call, to the
economics closed forms, or to the screening functions."""
import math

import numpy as np
import pytest

import revamp as rv
from revamp import economics as ec
from revamp import options as op
from revamp.errors import InputError
from revamp.screening import screen
from revamp.study import RESISTANCE_NAMES, Target

# invented demo case: a kerosene-like oil cooled by a crude-like oil (constant properties)
OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=0.4e-3, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)
EX = rv.ShellAndTube(shell_id="21.25 in", tube_od="1 in", tube_wall="0.095 in", tube_length="16 ft", tube_count=158,
                     tube_passes=4, tube_pitch="1.25 in", layout=90, baffle_spacing="5 in", baffle_cut=0.25,
                     tube_material="carbon steel")
SVC = rv.Service(shell=rv.Stream(OIL, "43800 lb/h", "390 degF"), tube=rv.Stream(CRUDE, "149000 lb/h", "100 degF"),
                 fouling_shell=2e-4, fouling_tube=5e-4)
OPTIONS = (op.Clean(), op.TwistedTape(4.0, "0.8 mm"), op.AddShells(1), op.AddShells(1, "parallel"))
ECON = {"energy_price": 8.0, "price_per": "GJ", "efficiency": 0.85, "operating_time": "8000 h", "discount_rate": 0.1,
            "horizon": 10, "capex": {"clean both sides": 40e3, "twisted tape y=4, 0.8 mm": 120e3,
                               "add 1 shell in series": 900e3, "add 1 parallel train": 900e3}}


@pytest.fixture(scope="module")
def study():
    base = rv.rate(EX, SVC.scaled(1.2))
    # target: 5 % more than the fouled exchanger gives at the revamp conditions
    return rv.compare(EX, SVC, OPTIONS, target=1.05 * float(base.duty), revamp=1.2, economics=ECON,
                      limits={"dp_tube": "1.5 bar", "dp_shell": "1 bar"})


def test_rows_trace_to_direct_ratings(study):
    rev = SVC.scaled(1.2)
    direct = {"base": rv.rate(EX, rev)}
    for o in OPTIONS:
        # every row is judged at the end of its next run: with no growth model, each side back at the design
        # fouling of the service (so a cleaning is judged fouled again, like every other option)
        ex, svc = o.apply(EX, rev)
        direct[o.label] = rv.rate(ex, svc.replace(fouling_shell=rev.fouling_shell, fouling_tube=rev.fouling_tube))
    assert list(study.table.index) == ["base"] + [o.label for o in OPTIONS]
    for label, r in direct.items():
        row = study.table.loc[label]
        for col in ("duty", "U_service", "t_out_shell", "t_out_tube", "dp_shell", "dp_tube", "velocity_tube"):
            assert row[col] == pytest.approx(float(getattr(r, col)), rel=1e-12), (label, col)
        assert row["duty_gain"] == pytest.approx(float(r.duty) - float(direct["base"].duty), rel=1e-9, abs=1e-6)
        assert study.resistances.loc[label].sum() == pytest.approx(1 / float(r.U_service), rel=1e-9)
        assert list(study.resistances.columns) == list(RESISTANCE_NAMES)
        # statuses from the screening functions on the same rating
        checks = {c.name: c.status for c in screen(r, study.limits)}
        assert row["dp_tube_status"] == checks["dp_tube"] and row["dp_shell_status"] == checks["dp_shell"]


def test_money_by_hand(study):
    t = study.table
    for o in OPTIONS:
        row = t.loc[o.label]
        gain = row["duty"] - t.loc["base", "duty"]
        # ΔQ [W] × 8000 h × 3600 s/h / 1e9 J/GJ × 8 per GJ / 0.85 (hand calculation)
        value = gain * 8000 * 3600 / 1e9 * 8.0 / 0.85
        assert row["annual_value"] == pytest.approx(value, rel=1e-9)
        assert row["capex"] == ECON["capex"][o.label]
        if value > 0:
            assert row["payback"] == pytest.approx(row["capex"] / value, rel=1e-9)
        else:
            assert row["payback"] == math.inf
        # NPV: -capex + value × annuity factor (10 %, 10 years = 6.1446, PV tables [from memory])
        assert row["npv"] == pytest.approx(-row["capex"] + value * 6.1446, abs=1e-4 * abs(value) + 1e-6)


def test_target_and_ranking(study):
    t = study.table
    target = study.target.value
    assert (t["meets_target"] == (t["duty"] >= target * (1 - 1e-9))).all()
    ranked = study.ranked()
    assert sorted(ranked["rank"]) == list(range(1, len(OPTIONS) + 1))
    within = ranked["screening"] != "fail"
    ok = ranked["meets_target"] & within
    # options within every limit come first, then those meeting the target, then by NPV (the default criterion)
    assert list(within) == sorted(within, reverse=True)
    assert list(ok) == sorted(ok, reverse=True)
    good = ranked[ok]
    assert list(good["npv"]) == sorted(good["npv"], reverse=True)
    assert all(isinstance(r, str) and r for r in t["reason"])
    assert study.recommendation.startswith(ranked.index[0]) or study.recommendation.startswith("No option")


def test_cases_today_and_revamp_clean_and_fouled(study):
    c = study.cases
    assert list(c.index) == ["today", "today (clean)", "revamp", "revamp (clean)"]
    pairs = {"today": SVC, "today (clean)": SVC.clean(), "revamp": SVC.scaled(1.2),
             "revamp (clean)": SVC.scaled(1.2).clean()}
    for label, svc in pairs.items():
        assert c.loc[label, "duty"] == pytest.approx(float(rv.rate(EX, svc).duty), rel=1e-12)
    assert c.loc["revamp", "duty"] == pytest.approx(study.table.loc["base", "duty"], rel=1e-12)


def test_breakdowns_and_warnings(study):
    for label in study.table.index:
        b = study.breakdowns[label]
        assert b["share"].sum() == pytest.approx(1.0)
        assert study.table.loc[label, "controlling"] == b["resistance"].idxmax()


def test_outlet_temperature_target():
    # the crude (tube side) is heated: the target is met when its outlet reaches the value or more
    base = rv.rate(EX, SVC)
    s = rv.compare(EX, SVC, [op.Clean()], target={"t_out_tube": float(base.t_out_tube) + 0.5})
    assert not s.table.loc["base", "meets_target"]
    # judged at the end of its next run, the cleaned exchanger is back at its design fouling: it misses like the base
    assert not s.table.loc["clean both sides", "meets_target"]
    assert list(s.cases.index) == ["today", "today (clean)"]
    assert math.isnan(s.table.loc["clean both sides", "payback"])  # no economics given


def test_cycle_average_column():
    # linear tube-side fouling from clean; the base case's cycle-averaged duty lies between clean and end-of-run
    model = lambda t: 5e-4 * np.asarray(t) / 3.15e7
    s = rv.compare(EX, SVC, [op.TwistedTape(4.0)], cycle={"fouling": model, "run_length": "365 day", "points": 5})
    avg = s.table.loc["base", "duty_cycle_avg"]
    clean = float(rv.rate(EX, SVC.replace(fouling_tube=0.0)).duty)
    end = float(rv.rate(EX, SVC.replace(fouling_tube=model(365 * 86400.0))).duty)
    assert end < avg < clean
    direct = ec.cycle_average(lambda rf: rv.rate(EX, SVC.replace(fouling_tube=rf)).duty, model, "365 day", points=5)
    assert avg == pytest.approx(direct.duty_mean, rel=1e-9)


def test_bad_inputs():
    with pytest.raises(InputError, match="options.label"):
        rv.compare(EX, SVC, [op.Clean(), op.Clean()])
    with pytest.raises(InputError, match="options.label"):
        rv.compare(EX, SVC, [op.Clean(label="base")])
    with pytest.raises(InputError, match="target"):
        Target.of({"pressure": 1.0})
    with pytest.raises(InputError, match="limits"):
        rv.compare(EX, SVC, [], limits={"dp": 1.0})


def test_capacity_value_only_when_the_option_removes_the_bottleneck():
    base = float(rv.rate(EX, SVC).duty)
    econ = {"energy_price": 8.0, "capex": {"clean both sides": 1e4, "add 1 shell in series": 5e5},
                "capacity_flow": 0.5, "capacity_margin": 0.02}
    capacity = 0.5 * 8000 * 3600 * 0.02  # kg/s × s/year × per kg (hand calculation)
    s = rv.compare(EX, SVC, [op.Clean(), op.AddShells(1)], target=1.02 * base, economics=econ,
                   limits={"vibration": False, "dp_tube": 1e6, "dp_shell": 1e6})
    for label in ("clean both sides", "add 1 shell in series"):
        row = s.table.loc[label]
        energy = ec.annual_duty_value(row["duty"] - base, 8.0, "GJ", "8000 h")
        assert row["annual_value"] == pytest.approx(energy + (capacity if row["meets_target"] else 0.0), rel=1e-9)
    # the base case already meets a lower target: no capacity credit for anyone
    s2 = rv.compare(EX, SVC, [op.AddShells(1)], target=0.5 * base, economics=econ,
                    limits={"vibration": False, "dp_tube": 1e6, "dp_shell": 1e6})
    row = s2.table.loc["add 1 shell in series"]
    assert row["annual_value"] == pytest.approx(ec.annual_duty_value(row["duty"] - base, 8.0, "GJ", "8000 h"))


def test_cycle_fouling_for_sees_each_option_clean():
    seen = []

    def fouling_for(rating):
        seen.append((float(rating.service.fouling_tube), float(rating.velocity_tube)))
        return lambda t: 1e-11 * np.asarray(t) / float(rating.velocity_tube)  # slower at higher velocity

    s = rv.compare(EX, SVC, [op.AddShells(1, "parallel")],
                   cycle={"fouling_for": fouling_for, "run_length": "200 day", "points": 3})
    assert [f for f, _ in seen] == [0.0, 0.0]
    assert seen[1][1] == pytest.approx(seen[0][1] / 2, rel=1e-6)  # half the flow per train
    assert np.isfinite(s.table["duty_cycle_avg"]).all()


def test_base_goes_on_fouling_from_its_age_while_options_start_clean():
    # with base_age, the base case's run is the fitted law from t = age on (no shutdown), and each option, installed
    # at a shutdown, starts clean: check both against economics.cycle_average on direct ratings (Epstein 1979 mean)
    def model(t):
        return 2e-4 + 1e-11 * np.asarray(t, dtype=float)

    age = 200 * 86400.0
    s = rv.compare(EX, SVC, [op.Clean(side="tube")], cycle={"fouling": model, "run_length": "365 day", "points": 5,
                                                              "base_age": "200 day"})

    def duty_at(rf):
        return rv.rate(EX, SVC.replace(fouling_tube=rf)).duty

    base = ec.cycle_average(duty_at, lambda t: model(np.asarray(t) + age), "365 day", points=5).duty_mean
    fresh = ec.cycle_average(duty_at, model, "365 day", points=5).duty_mean
    assert s.table.loc["base", "duty_cycle_avg"] == pytest.approx(base, rel=1e-9)
    clean_label = [lbl for lbl in s.table.index if lbl != "base"][0]
    assert s.table.loc[clean_label, "duty_cycle_avg"] == pytest.approx(fresh, rel=1e-9)
    # a fresh run beats one that starts 200 days fouled: cleaning earns something (monotonic in Rf)
    assert fresh > base
