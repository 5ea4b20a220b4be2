"""Tests of revamp.options: the transforms themselves, and their physical effect through rv.rate.

Sources: closed forms (cylinder wall resistance do·ln(do/di)/(2k), e.g. Incropera & DeWitt, *Fundamentals of Heat and
Mass Transfer*, ch. 3), and invariants (cleaning never lowers duty; shells in series add area; parallel trains halve
the flow per train).
"""
import dataclasses
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import revamp as rv
from revamp import options as op
from revamp.correlations.inserts import FactorInsert, TwistedTapeInsert, WireCoilInsert
from revamp.errors import InputError

SETTINGS = settings(max_examples=15, deadline=None)

# invented demo fluids with constant properties (a light oil on the shell side, a heavier oil in the tubes)
OIL = rv.fluids.constant(density=730.0, heat_capacity=2470.0, viscosity=0.4e-3, conductivity=0.132)
CRUDE = rv.fluids.constant(density=830.0, heat_capacity=2050.0, viscosity=3.6e-3, conductivity=0.133)


def exchanger(**changes):
    kw = {"shell_id": "21.25 in", "tube_od": "1 in", "tube_wall": "0.095 in", "tube_length": "16 ft", "tube_count": 158,
              "tube_passes": 4, "tube_pitch": "1.25 in", "layout": 90, "baffle_spacing": "5 in", "baffle_cut": 0.25,
              "tube_material": 50.0}
    kw.update(changes)
    return rv.ShellAndTube(**kw)


def service(**changes):
    kw = {"shell": rv.Stream(OIL, "43800 lb/h", "390 degF"), "tube": rv.Stream(CRUDE, "149000 lb/h", "100 degF"),
              "fouling_shell": 2e-4, "fouling_tube": 4e-4}
    kw.update(changes)
    return rv.Service(**kw)


# ------------------------------------------------------------------------------------------ transforms (no rating)
def test_clean_sets_fouling_and_never_raises_it():
    ex, svc = exchanger(), service()
    ex2, svc2 = op.Clean().apply(ex, svc)
    assert ex2 is ex and svc2.fouling_shell == 0 and svc2.fouling_tube == 0
    _, svc3 = op.Clean("tube", residual=1e-4).apply(ex, svc)
    assert svc3.fouling_tube == 1e-4 and svc3.fouling_shell == 2e-4
    _, svc4 = op.Clean("both", residual=3e-4).apply(ex, svc)
    assert svc4.fouling_shell == 2e-4 and svc4.fouling_tube == 3e-4  # a cleaner side stays as clean
    assert svc.fouling_tube == 4e-4  # the input is unchanged
    assert op.Clean("tube", "0.001 h*ft**2*degF/BTU").label.startswith("clean tube side to")


def test_inserts_form_ratios_with_tube_id():
    ex, svc = exchanger(), service()
    ex2, svc2 = op.TwistedTape(4.0, "1 mm").apply(ex, svc)
    assert isinstance(ex2.insert, TwistedTapeInsert) and svc2 is svc and ex.insert is None
    assert ex2.insert.twist_ratio == 4.0
    assert ex2.insert.thickness_ratio == pytest.approx(1e-3 / ex.tube_id)
    ex3, _ = op.WireCoil("30 mm", "2 mm").apply(ex, svc)
    assert isinstance(ex3.insert, WireCoilInsert)
    assert ex3.insert.pitch_ratio == pytest.approx(0.030 / ex.tube_id)
    assert ex3.insert.wire_ratio == pytest.approx(0.002 / ex.tube_id)
    ex4, _ = op.InsertFactors([1e3, 1e5], [2.0, 1.5], [3.0, 2.0], label="vendor X").apply(ex, svc)
    assert isinstance(ex4.insert, FactorInsert) and ex4.insert.nu_factor == (2.0, 1.5)


def test_add_shells():
    ex, svc = exchanger(), service()
    ser, _ = op.AddShells(1).apply(ex, svc)
    par, _ = op.AddShells(2, "parallel").apply(ex, svc)
    assert (ser.shells, ser.shells_parallel) == (2, 1) and (par.shells, par.shells_parallel) == (1, 3)
    assert ser.area_outside == pytest.approx(2 * ex.area_outside)
    assert par.area_outside == pytest.approx(3 * ex.area_outside)
    with pytest.raises(InputError, match="arrangement"):
        op.AddShells(1, "mixed")
    with pytest.raises(InputError, match="AddShells.n"):
        op.AddShells(0)


def test_new_bundle_retube_baffles():
    ex, svc = exchanger(), service()
    nb, _ = op.NewBundle(tube_length="20 ft", tube_count=150).apply(ex, svc)
    assert nb.tube_length == pytest.approx(20 * 0.3048) and nb.tube_count == 150
    with pytest.raises(InputError, match="NewBundle.tubes"):
        op.NewBundle(tubes=3)
    rt, _ = op.Retube(16.0, "1.65 mm").apply(ex, svc)
    assert rt.tube_wall == pytest.approx(1.65e-3)
    assert float(np.asarray(rt.tube_material.conductivity(350.0))) == pytest.approx(16.0)
    bc, _ = op.BaffleChange(spacing="8 in", cut=0.3).apply(ex, svc)
    assert bc.baffle_spacing == pytest.approx(8 * 0.0254) and bc.baffle_cut == 0.3
    assert ex.baffle_spacing == pytest.approx(5 * 0.0254)
    with pytest.raises(InputError, match="BaffleChange"):
        op.BaffleChange()


def test_combined_applies_in_order_with_joined_label():
    c = op.Combined(op.Clean("tube"), op.AddShells(1), op.TwistedTape(5.0))
    assert c.label == "clean tube side + add 1 shell in series + twisted tape y=5"
    ex2, svc2 = c.apply(exchanger(), service())
    assert ex2.shells == 2 and isinstance(ex2.insert, TwistedTapeInsert) and svc2.fouling_tube == 0
    assert op.Combined(op.Clean(), label="quick win").label == "quick win"
    with pytest.raises(InputError, match="options"):
        op.Combined(op.Clean(), "not an option")


def test_options_are_frozen():
    c = op.Clean()
    with pytest.raises(dataclasses.FrozenInstanceError):
        c.side = "tube"


# ------------------------------------------------------------------------------------------ effects through rate()
def test_inserts_raise_h_tube_and_dp_tube():
    ex, svc = exchanger(), service()
    base = rv.rate(ex, svc)
    for option in (op.TwistedTape(4.0, "0.8 mm"), op.WireCoil("30 mm", "2 mm"),
                   op.InsertFactors([1e3, 1e5], [2.0, 2.0], [3.0, 3.0])):
        r = rv.rate(*option.apply(ex, svc))
        assert r.h_tube > base.h_tube, option.label
        assert r.dp_tube > base.dp_tube, option.label


def test_lower_conductivity_changes_1_over_U_by_the_wall_resistance_exactly():
    # constant-property fluids: the films do not depend on the wall temperature, so only the wall term changes;
    # wall resistance on the outside area do·ln(do/di)/(2k) (closed form, Incropera & DeWitt ch. 3)
    ex, svc = exchanger(tube_material=50.0), service()
    r1 = rv.rate(ex, svc)
    r2 = rv.rate(*op.Retube(16.0).apply(ex, svc))
    do, di = ex.tube_od, ex.tube_id
    for r, k in ((r1, 50.0), (r2, 16.0)):
        assert r.resistances["wall"] == pytest.approx(do * math.log(do / di) / (2 * k), rel=1e-9)
    delta = do * math.log(do / di) / 2 * (1 / 16.0 - 1 / 50.0)
    assert 1 / r2.U_service - 1 / r1.U_service == pytest.approx(delta, rel=1e-6)
    assert r2.h_tube == pytest.approx(r1.h_tube, rel=1e-9) and r2.h_shell == pytest.approx(r1.h_shell, rel=1e-9)


def test_shells_in_series_raise_duty_and_parallel_lowers_both_dp():
    ex, svc = exchanger(), service()
    base = rv.rate(ex, svc)
    ser = rv.rate(*op.AddShells(1).apply(ex, svc))
    par = rv.rate(*op.AddShells(1, "parallel").apply(ex, svc))
    assert ser.duty > base.duty
    assert par.dp_shell < base.dp_shell and par.dp_tube < base.dp_tube
    assert par.velocity_tube == pytest.approx(base.velocity_tube / 2, rel=1e-6)  # half the flow per train


@SETTINGS
@given(st.floats(0.0, 2e-3), st.floats(0.0, 2e-3), st.sampled_from(["both", "shell", "tube"]),
       st.floats(0.0, 1.0))
def test_cleaning_never_lowers_duty(rf_shell, rf_tube, side, frac):
    ex, svc = exchanger(), service(fouling_shell=rf_shell, fouling_tube=rf_tube)
    residual = frac * max(rf_shell, rf_tube)
    before = rv.rate(ex, svc).duty
    after = rv.rate(*op.Clean(side, residual).apply(ex, svc)).duty
    assert after >= before * (1 - 1e-9)


# ---------------------------------------------------------------------------------------------- baffle change edges
def test_baffle_change_takes_units_and_percent():
    a = op.BaffleChange(spacing="380 mm", cut="25 %")
    # 380 mm = 0.38 m, 25 % = 0.25 (definitions of the units)
    assert a.spacing == pytest.approx(0.38) and a.cut == pytest.approx(0.25)
    assert op.BaffleChange(cut=0.3).cut == 0.3
    ex, _ = a.apply(exchanger(shell_id="0.8 m", tube_count=300), service())
    assert ex.baffle_spacing == pytest.approx(0.38) and ex.baffle_cut == pytest.approx(0.25)


@pytest.mark.parametrize("cut", ["25 mm", "abc", [0.2, 0.3], 0.6, "60 %", 0.0, True])
def test_baffle_change_bad_cut_names_the_field(cut):
    with pytest.raises(InputError, match="BaffleChange.cut"):
        op.BaffleChange(cut=cut)


def test_baffle_change_keeps_stated_end_spacings():
    ex = exchanger(shell_id="0.8 m", tube_count=300, baffle_spacing="0.3 m", baffle_spacing_in="0.4 m",
                   baffle_spacing_out="0.45 m")
    new, _ = op.BaffleChange(spacing="0.35 m").apply(ex, service())
    # the user's inlet/outlet spacings are data about the exchanger: a new central spacing does not move them
    assert new.baffle_spacing == pytest.approx(0.35)
    assert new.baffle_spacing_in == pytest.approx(0.4) and new.baffle_spacing_out == pytest.approx(0.45)
    # given with the change, they win
    new2, _ = op.BaffleChange(spacing="0.35 m", spacing_in="0.5 m").apply(ex, service())
    assert new2.baffle_spacing_in == pytest.approx(0.5) and new2.baffle_spacing_out == pytest.approx(0.45)


def test_baffle_change_recomputes_defaulted_end_spacings():
    ex = exchanger(shell_id="0.8 m", tube_count=300, baffle_spacing="0.3 m")
    new, _ = op.BaffleChange(spacing="0.35 m").apply(ex, service())
    b = new.bell()
    # defaulted end spacings follow the new central spacing: the spacings fill the tube length
    # (Lbi + (Nb - 1) Lbc + Lbo = L, definition) with end spaces at least one central spacing
    assert b.Lbi + (b.Nb - 1) * b.Lbc + b.Lbo == pytest.approx(16 * 0.3048)
    assert b.Lbi >= 0.35 - 1e-9 and b.Lbo >= 0.35 - 1e-9


def test_combined_accepts_a_list():
    a, b = op.Clean(), op.AddShells(1)
    c = op.Combined([a, b])
    assert c.options == (a, b) and c.label == op.Combined(a, b).label
    with pytest.raises(InputError):
        op.Combined([])
    with pytest.raises(InputError):
        op.Combined([a, "not an option"])
