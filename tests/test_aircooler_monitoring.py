"""Air-cooler fouling from the tube-side balance: a round trip through the rating (the rating at a known fouling
gives the outlet a plant would measure; the monitor must find that fouling again), and the band's behaviour."""
import numpy as np
import pytest

import revamp as rv
from revamp import fluids
from revamp.errors import InputError
from revamp.monitoring_air import monitor_air
from revamp.rating_air import rate_air_cooler

OIL = fluids.constant(density=800.0, heat_capacity=2300.0, viscosity=1e-3, conductivity=0.12)
AC = rv.AirCooler(bays=2, bundles_per_bay=1, tube_rows=4, tubes_per_row=46, tube_passes=4, tube_length="9.14 m",
                  tube_od="25.4 mm", tube_wall="2.11 mm", transverse_pitch="63.5 mm", row_pitch="55 mm",
                  fin=rv.Fin(height="15.9 mm", thickness="0.4 mm", per_length="394 /m"))


def _svc(**kw):
    base = dict(tube=rv.Stream(OIL, flow="25 kg/s", t_in="150 degC"), air_in=np.array([290.0, 300.0, 310.0]),
                air_flow="250 kg/s", fouling_tube=np.array([0.0003, 0.0006, 0.001]), fouling_air=0.0002)
    base.update(kw)
    return rv.AirService(**base)


def test_round_trip_finds_the_fouling_within_its_band():
    svc = _svc()
    r = rate_air_cooler(AC, svc)
    truth = (r.resistances["air fouling"] + r.resistances["tube fouling"]).to_numpy()  # bare-area basis
    m = monitor_air(AC, svc, r.t_out_tube)
    # consistency with the rating (no outside number exists for a synthetic plant): within 1 %, the second-order
    # property shift between the clean and the fouled state
    assert np.allclose(m.fouling, truth, rtol=0.01)
    assert np.all((m.fouling_low < truth) & (truth < m.fouling_high))
    # first law: the implied air outlet carries the tube-side duty
    assert np.allclose(m.t_out_air, r.t_out_air, atol=0.05)
    assert len(m.to_frame()) == 3


def test_band_widens_with_the_air_flow_uncertainty():
    svc = _svc()
    r = rate_air_cooler(AC, svc)
    narrow = monitor_air(AC, svc, r.t_out_tube, air_flow_uncertainty=0.05, t_uncertainty=0.0)
    wide = monitor_air(AC, svc, r.t_out_tube, air_flow_uncertainty=0.2, t_uncertainty=0.0)
    assert np.all(wide.fouling_high - wide.fouling_low > narrow.fouling_high - narrow.fouling_low)


def test_outlet_outside_the_inlets_is_refused_or_nan():
    svc = _svc(air_in=300.0, fouling_tube=0.0)
    with pytest.raises(InputError, match="t_out_tube"):
        monitor_air(AC, svc, "160 degC")
    m = monitor_air(AC, svc, np.array([330.0, 290.0]))
    assert np.isfinite(m.fouling[0]) and np.isnan(m.fouling[1]) and m.notes
