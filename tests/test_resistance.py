"""Tests of revamp.resistance: the series network referred to an area basis.

Expected values come from closed forms of conduction (Incropera et al. 2007, §3.3) and from the independent
library `ht` (ht.conduction), never from this package's own output.
"""
import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ht

from revamp.errors import InputError
from revamp.resistance import (
    TUBE_LAYERS,
    Network,
    cylinder,
    deposit,
    film,
    fouling,
    plane,
    tube_network,
)

SETTINGS = settings(max_examples=50, deadline=None)
pos = st.floats(min_value=1.0, max_value=1e5)
rf = st.floats(min_value=0.0, max_value=5e-3)


def test_plane_layers_add():
    # composite plane wall: R = sum(L_i/k_i) (Incropera et al. 2007, eq. 3.19)
    net = Network.of([("steel", plane(0.01, 50.0)), ("insulation", plane(0.05, 0.04))])
    assert net.total == pytest.approx(0.01 / 50.0 + 0.05 / 0.04, rel=1e-12)
    assert net.U == pytest.approx(1.0 / (0.01 / 50.0 + 0.05 / 0.04), rel=1e-12)


def test_cylinder_against_ht_R_cylinder():
    # ht.R_cylinder gives the absolute resistance ln(Do/Di)/(2 pi L k) [K/W]; per unit outside area it is R*A_o
    Di, Do, k, L = 0.02118, 0.0254, 45.0, 3.0
    R_abs = ht.R_cylinder(Di=Di, Do=Do, k=k, L=L)
    assert cylinder(Di, Do, k) == pytest.approx(R_abs * math.pi * Do * L, rel=1e-12)
    # and per unit inside area
    assert cylinder(Di, Do, k, d_basis=Di) == pytest.approx(R_abs * math.pi * Di * L, rel=1e-12)


def test_tube_network_against_ht_cylindrical_heat_transfer():
    # ht.cylindrical_heat_transfer returns U_outer/U_inner, the overall coefficient on the outer/inner surface
    # [W/m²K], for films + conducting layers (independent implementation of the same physics).
    Di, Do, k = 0.02118, 0.0254, 45.0
    hi, ho = 1800.0, 650.0
    res = ht.cylindrical_heat_transfer(Ti=400.0, To=300.0, hi=hi, ho=ho, Di=Di, ts=[(Do - Di) / 2], ks=[k])
    U_out_ref = res["U_outer"]
    U_in_ref = res["U_inner"]
    # and its UA per metre is U_outer * pi * Do
    assert res["UA"] == pytest.approx(U_out_ref * math.pi * Do, rel=1e-12)
    net_o = tube_network(ho, hi, 0.0, 0.0, Do, Di, k, basis="outside")
    net_i = tube_network(ho, hi, 0.0, 0.0, Do, Di, k, basis="inside")
    assert net_o.U == pytest.approx(U_out_ref, rel=1e-10)
    assert net_i.U == pytest.approx(U_in_ref, rel=1e-10)


def test_textbook_outside_basis_formula():
    # 1/Uo = 1/ho + Rfo + do ln(do/di)/(2k) + Rfi do/di + do/(di hi)  (Kern 1950, ch. 6; Incropera §11.2)
    do, di, k = 0.01905, 0.01483, 16.3
    ho, hi, Rfo, Rfi = 1200.0, 3400.0, 3.5e-4, 1.8e-4
    expected = 1 / ho + Rfo + do * math.log(do / di) / (2 * k) + Rfi * do / di + do / (di * hi)
    net = tube_network(ho, hi, Rfo, Rfi, do, di, k)
    assert net.total == pytest.approx(expected, rel=1e-13)
    assert net.names == TUBE_LAYERS
    assert sum(net.shares().values()) == pytest.approx(1.0, rel=1e-13)


@SETTINGS
@given(ho=pos, hi=pos, rfo=rf, rfi=rf, k=st.floats(5.0, 400.0), do=st.floats(0.008, 0.06), frac=st.floats(0.5, 0.95))
def test_UoAo_equals_UiAi(ho, hi, rfo, rfi, k, do, frac):
    # Uo Ao = Ui Ai: the same UA whatever the basis (definition of an area basis; Incropera eq. 11.5)
    di = do * frac
    Uo = tube_network(ho, hi, rfo, rfi, do, di, k, basis="outside").U
    Ui = tube_network(ho, hi, rfo, rfi, do, di, k, basis="inside").U
    L = 1.0
    assert Uo * math.pi * do * L == pytest.approx(Ui * math.pi * di * L, rel=1e-12)


@SETTINGS
@given(d=st.floats(0.005, 2.0), t=st.floats(1e-7, 1e-5), k=st.floats(0.05, 400.0))
def test_thin_cylinder_tends_to_plane_wall(d, t, k):
    # a layer much thinner than its diameter conducts like a plane wall: d ln(1 + 2t/d)/(2k) -> t/k (series limit)
    assert cylinder(d, d + 2 * t, k, d_basis=d) == pytest.approx(plane(t, k), rel=2 * t / d + 1e-12)
    assert deposit(d, t, k, side="inside") == pytest.approx(plane(t, k), rel=2 * t / d + 1e-12)


def test_refer_to_scales_by_diameter_ratio():
    # a resistance per unit area scales with the area ratio when referred to another surface (same UA)
    net = tube_network(900.0, 2500.0, 2e-4, 3e-4, 0.0254, 0.02, 50.0)
    inside = net.refer_to(0.02)
    direct = tube_network(900.0, 2500.0, 2e-4, 3e-4, 0.0254, 0.02, 50.0, basis="inside")
    for name in TUBE_LAYERS:
        assert inside[name] == pytest.approx(direct[name], rel=1e-13)


def test_arrays_broadcast_and_match_scalars():
    # array path equals the scalar path element by element (common practice for array-native code, no source)
    ho = np.array([300.0, 800.0, 2000.0])
    rfi = np.array([[0.0], [4e-4]])
    net = tube_network(ho, 1500.0, 1e-4, rfi, 0.0254, 0.02, 50.0)
    assert np.shape(net.U) == (2, 3)
    for i in range(2):
        for j in range(3):
            scalar = tube_network(float(ho[j]), 1500.0, 1e-4, float(rfi[i, 0]), 0.0254, 0.02, 50.0)
            assert net.U[i, j] == pytest.approx(scalar.U, rel=1e-14)
    wide = net.breakdown()
    assert list(wide.columns) == list(TUBE_LAYERS)
    assert len(wide) == 6


def test_film_and_fouling_referral():
    # inside film referred outside is (1/hi)(do/di) (Kern 1950, ch. 6)
    assert film(2000.0, 0.02, 0.025) == pytest.approx(0.025 / (0.02 * 2000.0))
    assert fouling(3e-4, 0.02, 0.025) == pytest.approx(3e-4 * 0.025 / 0.02)


@pytest.mark.parametrize(
    "call, field",
    [
        (lambda: plane(-0.01, 50.0), "thickness"),
        (lambda: plane(0.01, 0.0), "k"),
        (lambda: film(0.0), "h"),
        (lambda: fouling(-1e-4), "fouling resistance"),
        (lambda: cylinder(0.03, 0.02, 50.0), "d_out"),
        (lambda: deposit(0.02, 0.011, 1.0), "thickness"),
        (lambda: tube_network(1e3, 1e3, 0, 0, 0.02, 0.025, 50.0), "d_in"),
        (lambda: tube_network(1e3, 1e3, 0, 0, 0.025, 0.02, 50.0, basis="middle"), "basis"),
    ],
)
def test_bad_input_names_the_field(call, field):
    with pytest.raises(InputError) as info:
        call()
    assert info.value.field == field
    assert field in str(info.value)
