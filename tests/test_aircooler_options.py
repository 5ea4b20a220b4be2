"""Air-cooler options and the hot-day sweep: each option moves the physics the right way; the hot-day limit is where
the rating meets the target (checked by rating again at that ambient)."""
import numpy as np
import pytest

import revamp as rv
from revamp import fluids
from revamp.errors import InputError
from revamp.hot_day import hot_day
from revamp.options import TwistedTape
from revamp.options_air import AddBays, AddBundles, CleanFins, FanUpgrade, MoreRows, compare_air
from revamp.rating_air import rate_air_cooler

OIL = fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)
AC = rv.AirCooler(bays=2, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=4, tube_length="9.14 m",
                  tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                  fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m"), fans_per_bay=2,
                  fan_diameter="3.66 m")
SVC = rv.AirService(tube=rv.Stream(OIL, flow="25 kg/s", t_in="150 degC"), air_in="35 degC", air_flow="250 kg/s",
                    fouling_tube="0.0003 m**2*K/W", fouling_air="0.0002 m**2*K/W")
BASE = rate_air_cooler(AC, SVC)


def test_add_bay_scales_air_and_raises_duty():
    ac, svc = AddBays(1).apply(AC, SVC)
    assert ac.bays == 3 and svc.air_flow == pytest.approx(250.0 * 3 / 2)  # same air per bay (definition)
    assert rate_air_cooler(ac, svc).duty > BASE.duty


def test_add_bundle_keeps_fans_and_raises_duty():
    ac, svc = AddBundles(1).apply(AC, SVC)
    assert ac.bundles_per_bay == 2 and svc.air_flow == SVC.air_flow
    r = rate_air_cooler(ac, svc)
    assert r.duty > BASE.duty and r.dp_air < BASE.dp_air  # half the air per bundle: lower pressure drop


def test_more_rows_more_area_more_dp():
    ac, svc = MoreRows(6, tube_passes=6).apply(AC, SVC)
    r = rate_air_cooler(ac, svc)
    assert r.area == pytest.approx(BASE.area * 6 / 4)  # area proportional to the rows (definition)
    assert r.duty > BASE.duty and r.dp_air > BASE.dp_air and r.fan_power > BASE.fan_power
    with pytest.raises(InputError, match="MoreRows.tube_rows"):
        MoreRows(4).apply(AC, SVC)
    with pytest.raises(InputError, match="tube_passes"):
        MoreRows(6).apply(AC, SVC)  # 4 passes do not divide 6 rows


def test_fan_upgrade_follows_the_fan_laws():
    opt = FanUpgrade(speed_ratio=1.15)
    ac, svc = opt.apply(AC, SVC)
    assert svc.air_flow == pytest.approx(250.0 * 1.15)  # Q2/Q1 = N2/N1 (fan law)
    assert opt.power_ratio == pytest.approx(1.15 ** 3)  # P2/P1 = (N2/N1)³ (fan law)
    r = rate_air_cooler(ac, svc)
    assert r.duty > BASE.duty
    # the rating's power follows the bundle: dp ~ G^(2 - 0.316) (Robinson & Briggs 1966 exponent) plus a velocity
    # pressure ~ G², so the power ratio lies between 1.15^2.684 and the fan law's 1.15^3 (plus density change)
    ratio = r.fan_power / BASE.fan_power
    assert 1.15 ** 2.6 < ratio < 1.15 ** 3 * 1.02
    with pytest.raises(InputError):
        FanUpgrade()


def test_clean_fins_and_inserts():
    ac, svc = CleanFins().apply(AC, SVC)
    assert svc.fouling_air == 0.0 and svc.fouling_tube == SVC.fouling_tube
    assert rate_air_cooler(ac, svc).duty > BASE.duty
    ac2, svc2 = TwistedTape(twist_ratio=4.0).apply(AC, SVC)  # the shell-and-tube insert option, unchanged
    r = rate_air_cooler(ac2, svc2)
    assert r.h_tube > BASE.h_tube and r.dp_tube > BASE.dp_tube


def test_compare_air_table():
    table = compare_air(AC, SVC, [AddBays(1), CleanFins(), FanUpgrade(speed_ratio=1.1)])
    assert list(table.index) == ["base", AddBays(1).label, CleanFins().label, FanUpgrade(speed_ratio=1.1).label]
    assert table.loc["base", "duty"] == pytest.approx(BASE.duty)
    assert (table["duty"].iloc[1:] > table.loc["base", "duty"]).all()
    with pytest.raises(InputError, match="options"):
        compare_air(AC, SVC, [CleanFins(), CleanFins()])


def test_hot_day_sweep_and_limit():
    amb = np.linspace(273.15, 318.15, 7)
    target = 330.0
    hd = hot_day(AC, SVC, ambient=amb, t_out_target=target)
    assert np.all(np.diff(hd.t_out_tube) > 0) and np.all(np.diff(hd.duty) < 0)  # hotter ambient, hotter outlet
    assert 233.15 < hd.ambient_limit < 320.0
    # at the limit the rating meets the target (re-rated, within the solver tolerance)
    at = rate_air_cooler(AC, SVC.replace(air_in=hd.ambient_limit))
    assert at.t_out_tube == pytest.approx(target, abs=0.05)
    assert len(hd.to_frame()) == 7
    hopeless = hot_day(AC, SVC.replace(air_flow=5.0), ambient=amb, t_out_target=300.0)
    assert np.isnan(hopeless.ambient_limit) and hopeless.notes
    with pytest.raises(InputError, match="t_out_target"):
        hot_day(AC, SVC, ambient=amb, t_out_target="200 degC")


def test_hot_day_chart_shows_the_numbers_it_is_given():
    from revamp.plots_air import hot_day_chart

    amb = np.array([283.15, 298.15, 313.15])
    hd = hot_day(AC, SVC, ambient=amb, t_out_target=330.0)
    fig = hot_day_chart(hd)
    outlet = fig.data[0]
    # the chart converts K to °C for display (t[°C] = T[K] - 273.15, definition)
    assert np.allclose(outlet.x, amb - 273.15) and np.allclose(outlet.y, hd.t_out_tube - 273.15)
    texts = " ".join(a.text for a in fig.layout.annotations)
    assert "target" in texts and "lost above" in texts


def test_hot_day_with_a_face_velocity_moves_less_air_when_hot():
    svc = SVC.replace(air_flow=None, face_velocity="3 m/s")
    hd = hot_day(AC, svc, ambient=np.array([283.15, 313.15]))
    # a fixed volume of air at the face: the mass falls as 1/T (ideal gas, definition)
    flow = hd.rating.air_flow
    assert flow[1] / flow[0] == pytest.approx(283.15 / 313.15, rel=1e-9)


def test_induced_draft_fans_move_hotter_air_and_need_more_power():
    forced = rate_air_cooler(AC, SVC)
    induced = rate_air_cooler(AC.replace(draft="induced"), SVC)
    # the same mass at the air outlet is a larger volume (ideal gas): more fan power for the same pressure drop
    assert induced.duty == pytest.approx(forced.duty) and induced.fan_power > forced.fan_power
