"""Hostile or empty input through the Python API (not only the unit file): a path-named InputError, never another
exception and never a silent substitute."""
import io

import pandas as pd
import pytest

import revamp as rv
from revamp.errors import InputError

HDR = "timestamp,shell_flow,shell_t_in,shell_t_out,tube_flow,tube_t_in,tube_t_out\n"


@pytest.mark.parametrize("name", ["Water&Ethanol", "HEOS::Water", "REFPROP::Water", "Water[0.5]&Ethanol[0.5]"])
def test_a_mixture_or_backend_is_never_read_as_pure_water(name):
    with pytest.raises(InputError) as e:
        rv.fluids.pure(name)
    assert e.value.field == "pure.name"


def test_monitor_on_plant_data_without_rows_is_a_named_error():
    hx = rv.ShellAndTube(shell_id="0.5 m", tube_od="19.05 mm", tube_wall="2.11 mm", tube_length="5 m",
                         tube_count=200, tube_passes=2, tube_pitch="25.4 mm", layout=90, baffle_spacing="0.3 m",
                         baffle_cut=0.25)
    oil = rv.fluids.constant(density=850, heat_capacity=2200, viscosity=2e-3, conductivity=0.12)
    water = rv.fluids.constant(density=995, heat_capacity=4180, viscosity=8e-4, conductivity=0.6)
    svc = rv.Service(shell=rv.Stream(oil, 10, 423.15), tube=rv.Stream(water, 12, 303.15))
    with pytest.raises(InputError) as e:
        rv.monitor(hx, svc, pd.read_csv(io.StringIO(HDR)))
    assert e.value.field == "data"
