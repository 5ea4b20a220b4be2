"""The demo condenser C-401 reads a condensing-curve file (no CoolProp at check time), and a curve's condensate
(``vapour.condensate``) carries the subcooling below the curve's bubble point."""
from __future__ import annotations

import copy
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
import yaml

from revamp import unitfile
from test_condenser_unitfile import ENTRY, _unit
from test_unitfile import write_unit

CP = pytest.importorskip("CoolProp.CoolProp")

DEMO = Path(__file__).resolve().parents[1] / "data" / "demo"
MIXTURE = ("n-Pentane", "n-Hexane"), (0.9, 0.1)  # the invented overhead the demo's curve file states
PRESSURE = 2.4e5  # [Pa], the demo's condensing pressure today


def _demo_c401() -> dict:
    doc = yaml.safe_load((DEMO / "unit.yaml").read_text(encoding="utf-8"))
    return next(x for x in doc["exchangers"] if x["tag"] == "C-401")


def _state():
    names, z = MIXTURE
    st = CP.AbstractState("HEOS", "&".join(names))
    st.set_mole_fractions(list(z))
    return st


def test_demo_curve_is_the_stated_mixture_per_coolprop():
    """Dew and bubble points and the heat released between them, as CoolProp flashes the stated mixture itself."""
    entry = _demo_c401()
    v = entry["vapour"]
    assert v["curve_units"]["temperature"] == "degC" and v["curve_units"]["heat_released"] == "kJ/kg"
    table = pd.read_csv(DEMO / v["curve"])
    st = _state()
    st.update(CP.PQ_INPUTS, PRESSURE, 1.0)  # CoolProp (Bell et al. 2014): dew point of the mixture
    t_dew, h_dew = st.T(), st.hmass()
    st.update(CP.PQ_INPUTS, PRESSURE, 0.0)  # bubble point
    t_bub, h_bub = st.T(), st.hmass()
    assert table["temperature"].iloc[0] == pytest.approx(t_dew - 273.15, abs=0.01)
    assert table["temperature"].iloc[-1] == pytest.approx(t_bub - 273.15, abs=0.01)
    assert table["heat_released"].iloc[-1] == pytest.approx((h_dew - h_bub) / 1e3, rel=1e-4)
    assert 20 <= len(table) <= 41  # a data-sheet-sized curve
    # the equilibrium liquid at the bubble point is the feed: its density and heat capacity (CoolProp, PT flash)
    st.specify_phase(CP.iphase_liquid)
    st.update(CP.PT_INPUTS, PRESSURE, t_bub - 1e-3)
    assert table["liquid_density"].iloc[-1] == pytest.approx(st.rhomass(), rel=1e-4)
    assert table["liquid_heat_capacity"].iloc[-1] == pytest.approx(st.cpmass() / 1e3, rel=1e-4)
    st.unspecify_phase()


def test_demo_critical_pressure_is_kays_rule():
    # Kay (1936): the pseudo-critical pressure is the mole-fraction average of the components' critical pressures
    # (each from CoolProp)
    names, z = MIXTURE
    kay = sum(zi * CP.PropsSI("pcrit", n) for n, zi in zip(names, z))
    pc = unitfile.load(DEMO / "unit.yaml").exchanger("C-401").vapour.fluid.critical_pressure
    assert pc == pytest.approx(kay, rel=1e-3)


def test_demo_condensate_is_the_feed_liquid_per_coolprop():
    """The condensate table below the bubble point: the liquid of the feed composition at the condensing pressure."""
    c = _demo_c401()["vapour"]["condensate"]
    st = _state()
    for t, rho, cp, mu, k in zip(c["T"], c["density"], c["heat_capacity"], c["viscosity"], c["conductivity"]):
        st.specify_phase(CP.iphase_liquid)
        st.update(CP.PT_INPUTS, PRESSURE, float(t.split()[0]) + 273.15)  # CoolProp (Bell et al. 2014)
        st.unspecify_phase()
        assert (rho, cp, mu, k) == pytest.approx((st.rhomass(), st.cpmass(), st.viscosity(), st.conductivity()),
                                                 rel=2e-3)


def _curve_entry(tmp_path, condensate=None):
    # an invented curve (a light hydrocarbon's order of magnitude, SI): 85 -> 75 degC over 300 kJ/kg
    (tmp_path / "curve.csv").write_text(
        "temperature,heat_released,vapour_fraction,liquid_density,liquid_heat_capacity,liquid_viscosity,"
        "liquid_conductivity,vapour_density,vapour_heat_capacity,vapour_viscosity,vapour_conductivity\n"
        "85,0,1,600,2400,0.0002,0.11,5,1900,0.000008,0.018\n"
        "80,150,0.5,605,2380,0.00021,0.111,5.1,1890,0.0000079,0.0179\n"
        "75,300,0,610,2360,0.00022,0.112,5.2,1880,0.0000078,0.0178\n", encoding="utf-8")
    entry = copy.deepcopy(ENTRY)
    entry["vapour"].pop("fluid")
    entry["vapour"].update(curve="curve.csv", curve_units={"temperature": "degC", "heat_released": "kJ/kg"},
                           critical_pressure="30 bar", flow="3 kg/s")
    if condensate is not None:
        entry["vapour"]["condensate"] = condensate
    return entry


def test_a_curves_condensate_subcools_by_its_own_heat_capacity(tmp_path):
    from revamp.rating_condenser import rate_condenser

    cp = 2300.0  # [J/kg/K], the condensate stated below (invented, constant)
    entry = _curve_entry(tmp_path, {"kind": "constant", "density": 640, "heat_capacity": cp, "viscosity": 3e-4,
                                    "conductivity": 0.12})
    path = write_unit(tmp_path / "unit.yaml", _unit(entry))
    assert unitfile.check(path) == []
    case = unitfile.load(path).exchanger("C-1")
    r = rate_condenser(case.exchanger, case.service)
    zones = r.zones.set_index("zone")
    sub = zones.loc["subcooling"]
    # the condenser has spare area at 3 kg/s: the condensate leaves well below the curve's last row
    assert float(r.t_out_condensing) < 348.15 - 5.0
    # first law: the subcooling zone's duty is the condensate's flow x cp x its temperature fall
    assert float(sub["duty"]) == pytest.approx(3.0 * cp * (float(sub["t_in"]) - float(sub["t_out"])), rel=1e-3)
    # and the condensing zone releases the curve's 300 kJ/kg (the table), give or take the sensible heat of the
    # saturation-temperature drop its pressure drop causes (a fraction of a kelvin here)
    assert float(zones.loc["condensing", "duty"]) == pytest.approx(3.0 * 3e5, rel=5e-3)


@pytest.mark.parametrize("where, value, path", [
    ("fluid", {"kind": "constant", "density": 640, "heat_capacity": 2300, "viscosity": 3e-4, "conductivity": 0.12},
     "exchangers[1].vapour.condensate"),  # a pure fluid's condensate comes from CoolProp
    ("curve", "a liquid", "exchangers[1].vapour.condensate"),
    ("curve", {"kind": "table", "T": ["60 degC", "40 degC"], "density": [600, 620], "heat_capacity": [2400, 2300],
               "viscosity": [2e-4, 3e-4], "conductivity": [0.11, 0.12]}, "exchangers[1].vapour.condensate.T"),
])
def test_condensate_problems_are_named_by_path(tmp_path, where, value, path):
    if where == "fluid":
        entry = copy.deepcopy(ENTRY)
        entry["vapour"]["condensate"] = value
    else:
        entry = _curve_entry(tmp_path, value)
    problems = unitfile.check(write_unit(tmp_path / "unit.yaml", _unit(entry)))
    assert [p.path for p in problems] == [path], problems
    assert np.all([p.message for p in problems])
