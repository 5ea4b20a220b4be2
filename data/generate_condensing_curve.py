"""Generate the demo condenser's condensing curve: ``data/demo/curves/C-401.csv``.

THE SCENARIO IS INVENTED. The overhead of the demo's fictional pentane splitter is taken as a binary of n-pentane
with 10 mol% n-hexane (the heavy key that slips overhead); a plant would take this curve from its process
simulation. Here CoolProp's mixture model computes it (:func:`revamp.fluids.condensing_curve` with ``mixture=``:
flashed from the dew point to the bubble point at the column's condensing pressure, each phase in equilibrium
evaluated at its own composition), and the curve is written as the table a unit file reads (``vapour: {curve: ...}``,
docs/unit-file.md, "A condenser"). With a curve file, ``revamp check`` and the batch need no CoolProp for this
exchanger.

Run from the repository root (needs CoolProp)::

    python data/generate_condensing_curve.py      # writes data/demo/curves/C-401.csv, prints the critical pressure
                                                  # and the condensate table for the unit file

The columns and their units (the unit file's ``curve_units`` must say the same):

==========================  ==========================================================
``temperature``             [°C]
``heat_released``           from the dew point [kJ/kg] (0 at the dew point)
``vapour_fraction``         vapour mass fraction [-], 1 at the dew point, 0 at the bubble point
``liquid_density``          condensate in equilibrium [kg/m³]
``liquid_heat_capacity``    [kJ/(kg·K)]
``liquid_viscosity``        [cP] (mPa·s)
``liquid_conductivity``     [W/(m·K)]
``vapour_*``                the same four for the vapour in equilibrium
``surface_tension``         [N/m] (mole-fraction average of the pure components')
==========================  ==========================================================

The critical pressure the in-tube correlations need (reduced pressure) is the pseudo-critical pressure by Kay's
rule, the mole-fraction average of the components' critical pressures (Kay 1936); the script prints it for the unit
file's ``critical_pressure``.

The curve's rows end at the bubble point. Below it the condensate is a liquid of the feed composition, which the
rating needs for the subcooling zone: the script prints its properties at the condensing pressure from 20 degC to
the bubble point (CoolProp, the same mixture model) as the ``vapour.condensate`` table fluid of the unit file.

References
----------
Bell, I.H., Wronski, J., Quoilin, S., Lemort, V. (2014), "Pure and pseudo-pure fluid thermophysical property
evaluation and the open-source thermophysical property library CoolProp", Ind. Eng. Chem. Res. 53(6):2498-2508.
Kay, W.B. (1936), "Density of hydrocarbon gases and vapors at high temperature and pressure", Ind. Eng. Chem.
28(9):1014-1019.
"""
from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd

#: the invented overhead vapour (mole fractions) and the column's condensing pressure today (unit.yaml, C-401)
MIXTURE = "HEOS::n-Pentane[0.9]&n-Hexane[0.1]"
PRESSURE = "2.4 bar"
#: rows written: every STEP-th of the points the mixture curve is flashed at (41), dew and bubble points kept
STEP = 2
#: column -> (unit written, factor from SI, decimals)
COLUMNS = {
    "temperature": ("degC", None, 3),
    "heat_released": ("kJ/kg", 1e-3, 3),
    "vapour_fraction": ("-", 1.0, 5),
    "liquid_density": ("kg/m**3", 1.0, 3),
    "liquid_heat_capacity": ("kJ/(kg*K)", 1e-3, 5),
    "liquid_viscosity": ("cP", 1e3, 6),
    "liquid_conductivity": ("W/(m*K)", 1.0, 6),
    "vapour_density": ("kg/m**3", 1.0, 5),
    "vapour_heat_capacity": ("kJ/(kg*K)", 1e-3, 5),
    "vapour_viscosity": ("cP", 1e3, 7),
    "vapour_conductivity": ("W/(m*K)", 1.0, 7),
    "surface_tension": ("N/m", 1.0, 7),
}
#: the ``curve_units`` of the unit file for this table (columns in SI need none)
CURVE_UNITS = {"temperature": "degC", "heat_released": "kJ/kg", "liquid_heat_capacity": "kJ/(kg*K)",
               "liquid_viscosity": "cP", "vapour_heat_capacity": "kJ/(kg*K)", "vapour_viscosity": "cP"}


def curve_table(mixture: str = MIXTURE, pressure=PRESSURE, step: int = STEP):
    """``(table, critical_pressure [Pa])``: the condensing curve of ``mixture`` at ``pressure`` as the CSV's
    columns (in the units of :data:`COLUMNS`), and its pseudo-critical pressure (Kay's rule)."""
    from revamp.fluids import condensing_curve

    c = condensing_curve(mixture=mixture, pressure=pressure)
    idx = np.unique(np.r_[np.arange(0, c.q.size, step), c.q.size - 1])
    si = {"temperature": c.T, "heat_released": c.q, "vapour_fraction": c.x,
          **{f"liquid_{k}": c.sat_liquid[j] for j, k in enumerate(("density", "heat_capacity", "viscosity",
                                                                    "conductivity"))},
          **{f"vapour_{k}": c.sat_vapour[j] for j, k in enumerate(("density", "heat_capacity", "viscosity",
                                                                    "conductivity"))},
          "surface_tension": c.sigma}
    out = {}
    for col, (_, factor, decimals) in COLUMNS.items():
        v = np.asarray(si[col], dtype=float)[idx]
        v = v - 273.15 if factor is None else v * factor
        out[col] = np.round(v, decimals)
    table = pd.DataFrame(out)
    table.loc[0, "heat_released"] = 0.0
    table.loc[0, "vapour_fraction"] = 1.0
    table.loc[len(table) - 1, "vapour_fraction"] = 0.0
    if not (np.all(np.diff(table["heat_released"]) > 0) and np.all(np.diff(table["temperature"]) <= 0)):
        raise ValueError("the rounded curve is not monotone: write more decimals")
    return table, float(c.critical_pressure)


def condensate_table(mixture: str = MIXTURE, pressure=PRESSURE, t_low=293.15, points: int = 6) -> dict:
    """The condensate (the liquid of the feed composition) at ``pressure`` from ``t_low`` [K] up to the bubble point:
    a ``kind: table`` fluid of the unit file (temperatures in degC, the rest in SI)."""
    from CoolProp import CoolProp as CP

    from revamp.fluids import condensing_curve
    from revamp.units import to_si

    p = float(to_si(pressure, "pressure", "pressure"))
    t_b = float(condensing_curve(mixture=mixture, pressure=p).t_bubble)
    spec = mixture.split("::")[-1]
    names = [part.split("[")[0] for part in spec.split("&")]
    z = [float(part.split("[")[1].rstrip("]")) for part in spec.split("&")]
    state = CP.AbstractState("HEOS", "&".join(names))
    state.set_mole_fractions(z)
    rows = []
    for t in np.r_[np.linspace(t_low, t_b, points)[:-1], t_b - 1e-3]:  # the last just below the bubble point
        state.specify_phase(CP.iphase_liquid)
        state.update(CP.PT_INPUTS, p, float(t))
        state.unspecify_phase()
        rows.append((float(t), state.rhomass(), state.cpmass(), state.viscosity(), state.conductivity()))
    T, rho, cp, mu, k = (list(c) for c in zip(*rows))
    return {"kind": "table", "name": "condensate (n-pentane with n-hexane)",
            "T": [f"{t - 273.15:.2f} degC" for t in T], "density": [round(v, 2) for v in rho],
            "heat_capacity": [round(v, 1) for v in cp], "viscosity": [float(f"{v:.4g}") for v in mu],
            "conductivity": [round(v, 5) for v in k]}


def main(argv=None) -> int:
    here = Path(__file__).resolve().parent
    out = here / "demo" / "curves" / "C-401.csv"
    out.parent.mkdir(parents=True, exist_ok=True)
    table, pc = curve_table()
    table.to_csv(out, index=False)
    print(f"C-401: {MIXTURE} at {PRESSURE}: {len(table)} rows, dew point {table['temperature'].iloc[0]:.2f} degC, "
          f"bubble point {table['temperature'].iloc[-1]:.2f} degC, heat released "
          f"{table['heat_released'].iloc[-1]:.1f} kJ/kg -> {out.relative_to(here.parent)}")
    print(f"critical_pressure (Kay's rule): {pc / 1e5:.2f} bar; curve_units: {CURVE_UNITS}")
    c = condensate_table()
    print("condensate:", "{" + ", ".join(f"{key}: {value}".replace("'", '"') for key, value in c.items()) + "}")
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
