"""TEMA design fouling resistances (Table RGP-T-2.4) as data, with a lookup that explains the row it matched.

Values are stored as TEMA prints them, in h·ft²·°F/BTU, and converted to SI with
1 h·ft²·°F/BTU = 3600 s × 0.3048² m² × (5/9) K / 1055.05585 J = 0.17611 m²·K/W.
Where TEMA gives a range (e.g. kerosene 0.002–0.003) the lookup returns the upper end and says so.

Sources, per row (``source`` column):
``read``: TEMA RGP-T-2.4 as reproduced in Ludwig, E.E. (2001), Applied Process Design for Chemical and Petrochemical
Plants, vol. 3, 3rd ed., Gulf Professional Publishing, Table 10-12 (read from a public page copy of pp. 80-81).
``from memory``: recalled, not read; check against TEMA (8th ed. 1999 or later), Table RGP-T-2.4 before relying on it.

These are design allowances for sizing, not predictions of the fouling an exchanger will reach: TEMA says they "do
not recognize the time related behavior of fouling". Plant data (``revamp.fouling.models``) gives the real values.

References
----------
Tubular Exchanger Manufacturers Association (1999), Standards of the TEMA, 8th ed., Table RGP-T-2.4.
"""
from __future__ import annotations

import math
import re
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..units import to_si

__all__ = ["SERVICE_ALIASES", "US_TO_SI", "FoulingLookup", "design_fouling", "fouling_table", "services"]

#: 1 h·ft²·°F/BTU (International Table BTU) in m²·K/W.
US_TO_SI = 3600.0 * 0.3048**2 * (5.0 / 9.0) / 1055.05585262

READ = "TEMA RGP-T-2.4 via Ludwig (2001) Table 10-12 (read)"
MEM = "TEMA RGP-T-2.4 (from memory)"
OCR = "TEMA RGP-T-2.4 (from memory; partly legible in a reproduction of Ludwig (2001) Table 10-12)"

INF = math.inf
# crude oil: temperature bands [°F], velocity bands [ft/s]
_CRUDE_T = [(-INF, 250.0), (250.0, 350.0), (350.0, 450.0), (450.0, INF)]
_CRUDE_V = [(0.0, 2.0), (2.0, 4.0), (4.0, INF)]
_CRUDE = {  # (t band index, salt) -> values per velocity band, source
    (0, False): ((0.003, 0.002, 0.002), READ), (0, True): ((0.003, 0.002, 0.002), READ),
    (1, False): ((0.003, 0.002, 0.002), READ), (1, True): ((0.005, 0.004, 0.004), READ),
    (2, False): ((0.004, 0.003, 0.003), OCR), (2, True): ((0.006, 0.005, 0.005), MEM),
    (3, False): ((0.005, 0.004, 0.004), OCR), (3, True): ((0.007, 0.006, 0.006), MEM),
}
# waters: water temperature up to 125 °F (heating medium up to 240 °F) or above (240-400 °F);
# velocity below 3 ft/s or 3 ft/s and more
_WATER_T = [(-INF, 125.0), (125.0, INF)]
_WATER_V = [(0.0, 3.0), (3.0, INF)]
_WATER = {  # service: (v<3 & t<=125, v>=3 & t<=125, v<3 & t>125, v>=3 & t>125), source
    "sea water": ((0.0005, 0.0005, 0.001, 0.001), READ),
    "brackish water": ((0.002, 0.001, 0.003, 0.002), READ),
    "cooling tower water (treated makeup)": ((0.001, 0.001, 0.002, 0.002), READ),
    "cooling tower water (untreated)": ((0.003, 0.003, 0.005, 0.004), READ),
    "city or well water": ((0.001, 0.001, 0.002, 0.002), READ),
    "river water (minimum)": ((0.002, 0.001, 0.003, 0.002), READ),
    "river water (average)": ((0.003, 0.002, 0.004, 0.003), READ),
    "muddy or silty water": ((0.003, 0.002, 0.004, 0.003), READ),
    "hard water": ((0.003, 0.003, 0.005, 0.005), MEM),
    "engine jacket water": ((0.001, 0.001, 0.001, 0.001), MEM),
    "distilled water": ((0.0005, 0.0005, 0.0005, 0.0005), MEM),
    "treated boiler feedwater": ((0.001, 0.0005, 0.001, 0.001), MEM),
    "boiler blowdown": ((0.002, 0.002, 0.002, 0.002), MEM),
}
# single-value services: service: (group, low, high, source)
_SINGLE = {
    # industrial fluids
    "fuel oil no. 2": ("industrial oils", 0.002, 0.002, READ),
    "fuel oil no. 6": ("industrial oils", 0.005, 0.005, READ),
    "transformer oil": ("industrial oils", 0.001, 0.001, READ),
    "engine lube oil": ("industrial oils", 0.001, 0.001, READ),
    "quench oil": ("industrial oils", 0.004, 0.004, READ),
    "manufactured gas": ("industrial gases and vapors", 0.010, 0.010, READ),
    "engine exhaust gas": ("industrial gases and vapors", 0.010, 0.010, READ),
    "steam (non-oil-bearing)": ("industrial gases and vapors", 0.0005, 0.0005, READ),
    "exhaust steam (oil-bearing)": ("industrial gases and vapors", 0.0015, 0.002, READ),
    "refrigerant vapors (oil-bearing)": ("industrial gases and vapors", 0.002, 0.002, READ),
    "compressed air": ("industrial gases and vapors", 0.001, 0.001, READ),
    "ammonia vapor": ("industrial gases and vapors", 0.001, 0.001, READ),
    "co2 vapor": ("industrial gases and vapors", 0.001, 0.001, READ),
    "chlorine vapor": ("industrial gases and vapors", 0.002, 0.002, READ),
    "coal flue gas": ("industrial gases and vapors", 0.010, 0.010, READ),
    "natural gas flue gas": ("industrial gases and vapors", 0.005, 0.005, READ),
    "molten heat transfer salts": ("industrial liquids", 0.0005, 0.0005, READ),
    "refrigerant liquids": ("industrial liquids", 0.001, 0.001, READ),
    "hydraulic fluid": ("industrial liquids", 0.001, 0.001, READ),
    "industrial organic heat transfer media": ("industrial liquids", 0.002, 0.002, READ),
    "ammonia liquid": ("industrial liquids", 0.001, 0.001, READ),
    "ammonia liquid (oil-bearing)": ("industrial liquids", 0.003, 0.003, READ),
    "calcium chloride solutions": ("industrial liquids", 0.003, 0.003, READ),
    "sodium chloride solutions": ("industrial liquids", 0.003, 0.003, MEM),
    "co2 liquid": ("industrial liquids", 0.001, 0.001, MEM),
    "chlorine liquid": ("industrial liquids", 0.002, 0.002, READ),
    "methanol solutions": ("industrial liquids", 0.002, 0.002, READ),
    "ethanol solutions": ("industrial liquids", 0.002, 0.002, MEM),
    "ethylene glycol solutions": ("industrial liquids", 0.002, 0.002, MEM),
    # chemical processing streams
    "acid gases": ("chemical processing", 0.002, 0.003, MEM),
    "solvent vapors": ("chemical processing", 0.001, 0.001, MEM),
    "stable overhead products": ("chemical processing", 0.001, 0.001, MEM),
    "mea and dea solutions": ("chemical processing", 0.002, 0.002, MEM),
    "deg and teg solutions": ("chemical processing", 0.002, 0.002, MEM),
    "stable side draw and bottom product": ("chemical processing", 0.001, 0.002, MEM),
    "caustic solutions": ("chemical processing", 0.002, 0.002, MEM),
    "vegetable oils": ("chemical processing", 0.003, 0.003, MEM),
    # natural gas-gasoline processing
    "natural gas": ("natural gas-gasoline processing", 0.001, 0.002, READ),
    "gas plant overhead products": ("natural gas-gasoline processing", 0.001, 0.002, READ),
    "lean oil": ("natural gas-gasoline processing", 0.002, 0.002, READ),
    "rich oil": ("natural gas-gasoline processing", 0.001, 0.002, READ),
    "natural gasoline and lpg": ("natural gas-gasoline processing", 0.001, 0.002, READ),
    # oil refinery: crude and vacuum unit
    "atmospheric tower overhead vapors": ("refinery: crude and vacuum unit", 0.001, 0.001, READ),
    "light naphtha vapors": ("refinery: crude and vacuum unit", 0.001, 0.001, READ),
    "vacuum overhead vapors": ("refinery: crude and vacuum unit", 0.002, 0.002, READ),
    "gasoline": ("refinery: crude and vacuum unit", 0.002, 0.002, MEM),
    "naphtha and light distillates": ("refinery: crude and vacuum unit", 0.002, 0.004, MEM),
    "kerosene": ("refinery: crude and vacuum unit", 0.002, 0.003, MEM),
    "light gas oil": ("refinery: crude and vacuum unit", 0.002, 0.003, MEM),
    "heavy gas oil": ("refinery: crude and vacuum unit", 0.003, 0.005, MEM),
    "heavy fuel oils": ("refinery: crude and vacuum unit", 0.005, 0.007, MEM),
    "vacuum tower bottoms": ("refinery: crude and vacuum unit", 0.010, 0.010, MEM),
    "atmospheric tower bottoms": ("refinery: crude and vacuum unit", 0.007, 0.007, MEM),
    # cracking and coking
    "cracking unit overhead vapors": ("refinery: cracking and coking", 0.002, 0.002, MEM),
    "light cycle oil": ("refinery: cracking and coking", 0.002, 0.003, MEM),
    "heavy cycle oil": ("refinery: cracking and coking", 0.003, 0.004, MEM),
    "light coker gas oil": ("refinery: cracking and coking", 0.003, 0.004, READ),
    "heavy coker gas oil": ("refinery: cracking and coking", 0.004, 0.005, READ),
    "bottoms slurry oil": ("refinery: cracking and coking", 0.003, 0.003, READ),
    "cracking light liquid products": ("refinery: cracking and coking", 0.002, 0.002, READ),
    # reforming, hydrocracking, hydrodesulfurization
    "reformer charge": ("refinery: reforming and hydrotreating", 0.0015, 0.0015, READ),
    "reformer effluent": ("refinery: reforming and hydrotreating", 0.0015, 0.0015, READ),
    "hydrocracker charge and effluent": ("refinery: reforming and hydrotreating", 0.002, 0.002, READ),
    "recycle gas": ("refinery: reforming and hydrotreating", 0.001, 0.001, READ),
    "hydrodesulfurization charge and effluent": ("refinery: reforming and hydrotreating", 0.002, 0.002, READ),
    "hydrotreater overhead vapors": ("refinery: reforming and hydrotreating", 0.001, 0.001, READ),
    "liquid product over 50 api": ("refinery: reforming and hydrotreating", 0.001, 0.001, READ),
    "liquid product 30-50 api": ("refinery: reforming and hydrotreating", 0.002, 0.002, READ),
    # light ends
    "light ends overhead vapors and gases": ("refinery: light ends", 0.001, 0.001, READ),
    "light ends liquid products": ("refinery: light ends", 0.001, 0.001, READ),
    "absorption oils": ("refinery: light ends", 0.002, 0.003, READ),
    "alkylation trace acid streams": ("refinery: light ends", 0.002, 0.002, READ),
    "reboiler streams": ("refinery: light ends", 0.002, 0.003, READ),
    # lube oil processing
    "lube oil feed stock": ("refinery: lube oil", 0.002, 0.002, READ),
    "solvent feed mix": ("refinery: lube oil", 0.002, 0.002, READ),
    "lube solvent": ("refinery: lube oil", 0.001, 0.001, READ),
    "lube extract": ("refinery: lube oil", 0.003, 0.003, READ),
    "lube raffinate": ("refinery: lube oil", 0.001, 0.001, READ),
    "asphalt": ("refinery: lube oil", 0.005, 0.005, READ),
    "wax slurries": ("refinery: lube oil", 0.003, 0.003, READ),
    "refined lube oil": ("refinery: lube oil", 0.001, 0.001, MEM),
    # catalytic hydrodesulfurizer, HF alky
    "hds charge": ("refinery: catalytic hydrodesulfurizer", 0.004, 0.005, READ),
    "hds effluent": ("refinery: catalytic hydrodesulfurizer", 0.002, 0.002, READ),
    "hds stripper charge": ("refinery: catalytic hydrodesulfurizer", 0.003, 0.003, READ),
    "hf alkylate and fractionator streams": ("refinery: HF alky unit", 0.003, 0.003, READ),
    "hf alky other process streams": ("refinery: HF alky unit", 0.002, 0.002, READ),
}

SERVICE_ALIASES = {
    "crude": "crude oil", "seawater": "sea water", "cooling tower water": "cooling tower water (treated makeup)",
    "cooling water": "cooling tower water (treated makeup)", "treated cooling water":
    "cooling tower water (treated makeup)", "river water": "river water (average)", "city water":
    "city or well water", "well water": "city or well water", "boiler feed water": "treated boiler feedwater",
    "boiler feedwater": "treated boiler feedwater", "condensate": "distilled water", "steam": "steam (non-oil-bearing)",
    "naphtha": "naphtha and light distillates", "lgo": "light gas oil", "hgo": "heavy gas oil", "heavy fuel oil":
    "heavy fuel oils", "atmospheric residue": "atmospheric tower bottoms", "vacuum residue": "vacuum tower bottoms",
    "refrigerant": "refrigerant liquids", "refrigerant liquid": "refrigerant liquids",
    "heat transfer oil": "industrial organic heat transfer media", "thermal oil":
    "industrial organic heat transfer media", "lco": "light cycle oil", "hco": "heavy cycle oil",
    "slurry oil": "bottoms slurry oil", "amine": "mea and dea solutions", "glycol": "ethylene glycol solutions",
}


@dataclass(frozen=True)
class FoulingLookup:
    """One design fouling resistance and why it was chosen.

    Attributes
    ----------
    value : float
        Fouling resistance [m²K/W].
    value_us : float
        The same [h·ft²·°F/BTU], as TEMA prints it.
    matched : str
        Which row and band matched, and why.
    source : str
        Where the number comes from (read or from memory).
    """

    value: float
    value_us: float
    matched: str
    source: str


def _rows():
    rows = []
    for (ti, salt), (vals, src) in _CRUDE.items():
        for vi, v in enumerate(vals):
            rows.append({"service": "crude oil", "group": "refinery: crude and vacuum unit", "t_low_F": _CRUDE_T[ti][0],
                         "t_high_F": _CRUDE_T[ti][1], "v_low_fts": _CRUDE_V[vi][0], "v_high_fts": _CRUDE_V[vi][1],
                         "salt": salt, "value_us_low": v, "value_us": v, "source": src})
    for svc, (vals, src) in _WATER.items():
        for j, v in enumerate(vals):
            ti, vi = divmod(j, 2)
            rows.append({"service": svc, "group": "waters", "t_low_F": _WATER_T[ti][0],
                         "t_high_F": _WATER_T[ti][1], "v_low_fts": _WATER_V[vi][0], "v_high_fts": _WATER_V[vi][1],
                         "salt": None, "value_us_low": v, "value_us": v, "source": src})
    for svc, (group, lo, hi, src) in _SINGLE.items():
        rows.append({"service": svc, "group": group, "t_low_F": -INF, "t_high_F": INF, "v_low_fts": 0.0,
                     "v_high_fts": INF, "salt": None, "value_us_low": lo, "value_us": hi, "source": src})
    return rows


_ROWS = _rows()


def services() -> list[str]:
    """The known service names (aliases in :data:`SERVICE_ALIASES`)."""
    return sorted({r["service"] for r in _ROWS})


def fouling_table():
    """The whole table as a pandas DataFrame, with US [h·ft²·°F/BTU] and SI [m²K/W] columns.

    ``value_us`` is the design value (the upper end of a TEMA range), ``value_us_low`` the lower end; temperature
    bands in °F (``t_low_F`` inclusive, ``t_high_F`` exclusive; for waters the other way round, 125 °F being in the
    lower band), velocity bands in ft/s (``v_low_fts`` inclusive, ``v_high_fts`` exclusive).
    """
    import pandas as pd

    df = pd.DataFrame(_ROWS)
    df["value_si"] = df["value_us"] * US_TO_SI
    df["value_si_low"] = df["value_us_low"] * US_TO_SI
    return df


def _band_text(lo, hi, unit):
    if lo == -INF or (lo == 0.0 and unit == "ft/s"):
        return f"below {hi:g} {unit}"
    if hi == INF:
        return f"{lo:g} {unit} and over"
    return f"{lo:g} to {hi:g} {unit}"


def design_fouling(service: str, temperature=None, velocity=None, salt=None) -> FoulingLookup:
    """The TEMA RGP-T-2.4 design fouling resistance for a service.

    Parameters
    ----------
    service : str
        A service name (case-insensitive) from :func:`services`, or an alias (``"crude"``, ``"seawater"``,
        ``"cooling tower water"``, ``"kerosene"``, ``"vacuum residue"``...).
    temperature : float or str, optional
        Bulk temperature of the stream [K] (or a string with a unit). Needed for crude oil (TEMA bands below 250,
        250-350, 350-450, 450 °F and over) and for waters (water temperature up to 125 °F, i.e. heating medium up
        to 240 °F; or above).
    velocity : float or str, optional
        Velocity of the stream [m/s]. Needed for crude oil (below 2, 2-4, 4 ft/s and over) and waters (below 3,
        3 ft/s and over).
    salt : bool, optional
        Crude oil only: True for salty crude (TEMA's "SALT" rows assume desalting at about 250 °F), False for dry.

    Returns
    -------
    FoulingLookup

    Raises
    ------
    InputError
        Unknown service (the message lists the known ones) or a condition the row needs left out.

    Examples
    --------
    >>> r = design_fouling("crude", temperature="300 degF", velocity="5 ft/s", salt=True)
    >>> r.value_us, round(r.value, 6)
    (0.004, 0.000704)
    """
    if not isinstance(service, str):
        raise InputError("service", service, f"a service name, one of {services()}")
    key = re.sub(r"\s+", " ", service.strip().lower())
    key = SERVICE_ALIASES.get(key, key)
    rows = [r for r in _ROWS if r["service"] == key]
    if not rows:
        raise InputError("service", service, f"one of {services()} (or an alias: {sorted(SERVICE_ALIASES)})")
    notes = []
    banded_t = any(r["t_low_F"] != -INF or r["t_high_F"] != INF for r in rows)
    banded_v = any(r["v_low_fts"] != 0.0 or r["v_high_fts"] != INF for r in rows)
    needs_salt = any(r["salt"] is not None for r in rows)
    if banded_t:
        if temperature is None:
            raise InputError("temperature", None, f"a stream temperature: TEMA bands {key} by temperature")
        t_k = to_si(temperature, "temperature", "temperature")
        t_f = round((float(t_k) - 273.15) * 1.8 + 32.0, 9)  # round off the K round trip (125 °F stays 125)
        # waters: "125 °F" belongs to the lower band (TEMA: "125° [or less]" / "more than 125°"); crude: [low, high)
        rows = [r for r in rows if (r["t_low_F"] < t_f <= r["t_high_F"] if r["group"] == "waters"
                                    else r["t_low_F"] <= t_f < r["t_high_F"])]
        notes.append(f"temperature {t_f:.0f} °F in band {_band_text(rows[0]['t_low_F'], rows[0]['t_high_F'], '°F')}")
    elif temperature is not None:
        notes.append("temperature not used (TEMA gives one value)")
    if banded_v:
        if velocity is None:
            raise InputError("velocity", None, f"a stream velocity: TEMA bands {key} by velocity")
        v = to_si(velocity, "velocity", "velocity")
        if np.ndim(v) or v < 0:
            raise InputError("velocity", velocity, "one velocity >= 0 (m/s)")
        v_fts = round(float(v) / 0.3048, 9)  # round off the unit round trip (3 ft/s stays 3)
        rows = [r for r in rows if r["v_low_fts"] <= v_fts < r["v_high_fts"]]
        notes.append(f"velocity {v_fts:.2f} ft/s in band "
                     f"{_band_text(rows[0]['v_low_fts'], rows[0]['v_high_fts'], 'ft/s')}")
    elif velocity is not None:
        notes.append("velocity not used (TEMA gives one value)")
    if needs_salt:
        if salt is None:
            raise InputError("salt", None, "True (salty crude, desalted at about 250 °F) or False (dry crude)")
        rows = [r for r in rows if r["salt"] == bool(salt)]
        notes.append("salt (SALT row)" if salt else "dry crude (DRY row)")
    elif salt is not None:
        notes.append("salt not used (only crude oil has salt rows)")
    (row,) = rows
    if row["value_us_low"] != row["value_us"]:
        notes.append(f"TEMA range {row['value_us_low']:g}-{row['value_us']:g}; the upper end is returned")
    matched = f"{key} ({row['group']}): " + "; ".join(notes) if notes else f"{key} ({row['group']})"
    return FoulingLookup(value=row["value_us"] * US_TO_SI, value_us=row["value_us"], matched=matched,
                         source=row["source"])
