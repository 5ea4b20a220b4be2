"""Condenser options (``revamp.options_condenser``): each option moves the physics the right way (laws, no outside
numbers needed), inserts only on a tube-side coolant, errors name their fields."""
from __future__ import annotations

import numpy as np
import pytest

import revamp as rv
from revamp.errors import InputError
from revamp.options import AddShells, Clean, TwistedTape
from revamp.options_condenser import CoolantChange, compare_condenser

VAPOUR = rv.fluids.pure("n-Hexane", pressure=1.5e5)
WATER = rv.fluids.water("3 bar")


def exchanger(**changes):
    kw = dict(shell_id="0.6 m", tube_od="19.05 mm", tube_wall="1.65 mm", tube_length="2 m", tube_count=400,
              tube_passes=2, tube_pitch="23.81 mm", layout=30, baffle_spacing="0.5 m", baffle_cut=0.25,
              tube_material="carbon steel")
    kw.update(changes)
    return rv.ShellAndTube(**kw)


def service(flow=8.0):
    return rv.Service(shell=rv.Stream(VAPOUR, flow, quality=1.0), tube=rv.Stream(WATER, 40.0, "30 degC"),
                      fouling_shell=1e-4, fouling_tube=3e-4)


@pytest.fixture(scope="module")
def table():
    options = [AddShells(1), Clean(), CoolantChange(flow_ratio=1.5), CoolantChange(t_in="20 degC"),
               TwistedTape(twist_ratio=4.0)]
    return compare_condenser(exchanger(), service(), options, increments=8)


def test_every_option_condenses_more(table):
    base = table.loc["base"]
    for label in table.index[1:]:
        # more area, cleaner surfaces, more or colder coolant, a better coolant film: never less duty (law)
        assert table.loc[label, "duty"] > base.duty, label
        assert table.loc[label, "condensed"] >= base.condensed - 1e-9, label
    assert table.loc["add 1 shell in series", "area"] == pytest.approx(2.0 * base.area)
    assert table.loc["coolant: flow x1.5", "dp_coolant"] > base.dp_coolant  # more flow, more pressure drop (law)
    assert table.loc["twisted tape y=4", "dp_coolant"] > base.dp_coolant


def test_insert_refused_in_condensing_tubes():
    svc = rv.Service(tube=rv.Stream(VAPOUR, 4.0, quality=1.0), shell=rv.Stream(WATER, 40.0, "30 degC"))
    with pytest.raises(InputError) as exc:
        compare_condenser(exchanger(), svc, [TwistedTape(twist_ratio=4.0)], increments=6)
    assert exc.value.field == "options"


def test_coolant_change_errors_and_label():
    with pytest.raises(InputError) as exc:
        CoolantChange(flow_ratio=-1.0)
    assert exc.value.field == "CoolantChange.flow_ratio"
    with pytest.raises(InputError) as exc:
        CoolantChange()
    assert exc.value.field == "CoolantChange"
    assert CoolantChange(flow_ratio=2).label == "coolant: flow x2"


def test_more_area_holds_a_lower_condensing_pressure():
    # the column-pressure question: with a shell added, the same revamp load condenses at a lower pressure (law)
    table = compare_condenser(exchanger(), service(), [AddShells(1)], vapour_load="9 kg/s", increments=6)
    assert np.isfinite(table["condensing_pressure"]).all()
    assert table.loc["add 1 shell in series", "condensing_pressure"] < table.loc["base", "condensing_pressure"]
    assert table.loc["add 1 shell in series", "condensing_temperature"] < table.loc["base", "condensing_temperature"]


def test_the_liquid_comparison_refuses_a_condensing_service_by_path():
    """study.compare judges liquid services; a condensing one is named and pointed to compare_condenser
    (common practice, no source: an unsupported input is a path-named error, never an AttributeError)."""
    with pytest.raises(InputError) as err:
        rv.compare(exchanger(), service(), [Clean()])
    assert "service.shell" in str(err.value) and "compare_condenser" in str(err.value)


def test_a_base_pressure_already_found_is_reused_not_searched_again(monkeypatch):
    """Consistency: the base row given the caller's answer equals the one the comparison finds itself, and the
    search is then run once per option only (common practice, no source: reuse of a computed result)."""
    import revamp.rating_condenser as rc

    held = rc.condensing_pressure_for(exchanger(), service(), 9.0, increments=6)
    options = [AddShells(1)]
    searched = compare_condenser(exchanger(), service(), options, vapour_load=9.0, increments=6)
    calls = []
    real = rc.condensing_pressure_for
    monkeypatch.setattr(rc, "condensing_pressure_for", lambda *a, **k: calls.append(1) or real(*a, **k))
    reused = compare_condenser(exchanger(), service(), options, vapour_load=9.0, base_pressure=held, increments=6)
    assert len(calls) == 1  # the option's search only
    assert np.allclose(reused[["condensing_pressure", "condensing_temperature", "duty"]].to_numpy(float),
                       searched[["condensing_pressure", "condensing_temperature", "duty"]].to_numpy(float),
                       rtol=1e-9)


def test_a_base_pressure_must_match_the_comparison():
    import revamp.rating_condenser as rc

    rc_held = rc.condensing_pressure_for(exchanger(), service(), 9.0, increments=6)
    with pytest.raises(InputError) as err:  # another load's answer is refused, by its path
        compare_condenser(exchanger(), service(), [], vapour_load=12.0, base_pressure=rc_held, increments=6)
    assert err.value.field == "base_pressure.vapour_load"
    with pytest.raises(InputError) as err:
        compare_condenser(exchanger(), service(), [], base_pressure=rc_held, increments=6)
    assert err.value.field == "base_pressure"
    # a failed search handed over gives the same NaN row the comparison's own failed search gives
    failed = InputError("duty_or_vapour_load", 99.0, "a load the exchanger can condense")
    table = compare_condenser(exchanger(), service(), [], vapour_load=99.0, base_pressure=failed, increments=6)
    assert np.isnan(table.loc["base", "condensing_pressure"])
