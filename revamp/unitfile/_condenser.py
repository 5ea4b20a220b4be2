"""Unit-file entries of ``kind: condenser``: checked and built into a :class:`CondenserCase` (layer 8).

An entry as written in the unit file (YAML already read; values as the user wrote them, with their units)::

    - tag: C-401
      kind: condenser
      description: splitter overhead condenser
      exchanger: shell and tube          # or: air cooler (then air_side instead of coolant, vapour in the tubes)
      condensing_side: shell             # shell-and-tube only: where the vapour condenses (default shell)
      geometry: {shell_id: 0.84 m, ...}  # the geometry of a shell-and-tube (or air-cooler) entry
      vapour:
        fluid: n-Pentane                 # a pure fluid (CoolProp name); or mixture: "HEOS::Pentane[0.6]&Hexane[0.4]"
        pressure: 2.6 bar                # or curve: overhead_curve.csv (a condensing-curve table, see the docs)
        quality: 1.0                     # or superheat: 5 K
        flow: 12 kg/s
        fouling: 0.0001 m**2*K/W
      coolant: {fluid: {kind: water, pressure: 4 bar}, flow: 90 kg/s, t_in: 30 degC, fouling: 0.0003 m**2*K/W}
      revamp: {vapour_load: 15 kg/s}     # or throughput: 1.25 (a factor on today's vapour flow)
      allowed: {pressure: 2.9 bar}       # the highest condensing pressure the column may run at (or temperature)
      options: [{type: add_shells, n: 1}, {type: coolant_change, flow_ratio: 1.3}]
      plant_data: {file: plant/C-401.csv, condensing_from: pressure}

:func:`build_condenser` returns the case or ``None`` and appends every problem with its path (as
:func:`revamp.unitfile.check` does for the other kinds). :data:`CONDENSER_SCHEMA` describes the entry for
``unit_schema.json``.
"""
from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ._aircooler import _FIN, _GEOMETRY as _AIR_GEOMETRY, _guard, _mapping, _quantity_problems, _unknown
from ._model import Problem
from ._reading import _show

__all__ = ["CONDENSER_KIND", "CONDENSER_PLANT_COLUMNS", "CONDENSER_SCHEMA", "CondenserCase", "CondenserPlantData",
           "build_condenser", "condenser_problems"]

CONDENSER_KIND = "condenser"
EXCHANGER_TYPES = ("shell and tube", "air cooler")
_ENTRY = {"tag", "kind", "description", "exchanger", "geometry", "condensing_side", "vapour", "coolant", "air_side",
          "revamp", "allowed", "options", "plant_data"}
_VAPOUR = {"fluid", "mixture", "curve", "curve_units", "condensate", "critical_pressure", "pressure", "quality",
           "superheat", "flow", "fouling", "dp_allowed"}
_COOLANT = {"fluid", "flow", "t_in", "fouling", "dp_allowed"}
_AIR = {"t_in", "flow", "face_velocity", "altitude", "fouling"}
_PLANT = {"file", "columns", "condensing_from", "uncertainty", "steady", "delimiter", "decimal", "timestamp_format",
          "dayfirst", "timezone"}
#: the keys of an air-cooled condenser's plant_data besides _PLANT
_PLANT_AIR = {"duty_from", "air_flow_from"}
_DIALECT = ("delimiter", "decimal", "timestamp_format", "dayfirst", "timezone")
#: plant-data column -> quantity kind (None: the timestamp)
CONDENSER_PLANT_COLUMNS = {"timestamp": None, "coolant_flow": "mass_flow", "coolant_t_in": "temperature",
                           "coolant_t_out": "temperature", "condensing_pressure": "pressure",
                           "condensing_t": "temperature", "condensate_t": "temperature"}
#: plant-data column of an air-cooled condenser -> quantity kind (None: the timestamp)
AIR_CONDENSER_PLANT_COLUMNS = {"timestamp": None, "air_t_in": "temperature", "condensing_pressure": "pressure",
                               "condensing_t": "temperature", "condensate_flow": "mass_flow",
                               "condensate_t": "temperature", "air_flow": "mass_flow", "fan_power": "power"}
#: an air-cooled condenser: where each row's duty comes from -> the column it needs (None: the stated vapour flow)
DUTY_FROM = {"condensate": "condensate_flow", "stated": None}
#: an air-cooled condenser: where each row's air flow comes from -> the column it needs (None: the stated one)
AIR_FLOW_FROM = {"stated": None, "measured": "air_flow", "fan_power": "fan_power"}
#: where the condensing temperature of each row comes from -> the column it needs
CONDENSING_FROM = {"pressure": "condensing_pressure", "temperature": "condensing_t"}
#: the columns of a condensing-curve table file and their quantity kinds (heat_released or enthalpy)
CURVE_COLUMNS = {"temperature": "temperature", "heat_released": "specific_energy", "enthalpy": "specific_energy",
                 "vapour_fraction": "dimensionless", "surface_tension": None,
                 **{f"{phase}_{prop}": prop for phase in ("liquid", "vapour")
                    for prop in ("density", "heat_capacity", "viscosity", "conductivity")}}
#: units a curve's heat released (or enthalpy) column may be given in -> J/kg (definitions; Btu/lb: IT Btu)
SPECIFIC_ENERGY = {"J/kg": 1.0, "kJ/kg": 1e3, "MJ/kg": 1e6, "Btu/lb": 2326.0}
#: the largest revamp throughput factor accepted (as for the other kinds)
MAX_THROUGHPUT = 10.0
#: shell-and-tube option types (``revamp.options``) and the coolant change (``revamp.options_condenser``)
_ST_OPTIONS = ("clean", "twisted_tape", "wire_coil", "add_shells", "new_bundle", "retube", "baffle_change")
_AIR_OPTIONS = {"add_bays": ("AddBays", {"n"}), "add_bundles": ("AddBundles", {"n"}),
                "more_rows": ("MoreRows", {"tube_rows", "tube_passes"}),
                "fan_upgrade": ("FanUpgrade", {"speed_ratio", "air_flow_ratio"}),
                "clean_fins": ("CleanFins", {"side", "residual"})}
_COOLANT_CHANGE = {"flow_ratio", "t_in"}

_Q = {"type": ["string", "number"]}
_COLUMN = {"$ref": "#/$defs/column"}
CONDENSER_SCHEMA = {
    "type": "object",
    "required": ["tag", "kind", "geometry", "vapour"],
    "additionalProperties": False,
    "description": "A condenser: a shell-and-tube exchanger or an air cooler condensing a vapour (a pure fluid, a "
                   "CoolProp mixture or a condensing-curve table) against a coolant.",
    "properties": {
        "tag": {"type": "string", "minLength": 1, "maxLength": 64},
        "kind": {"const": CONDENSER_KIND},
        "description": {"type": "string"},
        "exchanger": {"enum": list(EXCHANGER_TYPES)},
        "condensing_side": {"enum": ["shell", "tube"]},
        "geometry": {"type": "object", "description": "The geometry of a shell-and-tube entry, or of an air cooler "
                                                      "(exchanger: air cooler)."},
        "vapour": {"type": "object", "additionalProperties": False, "required": ["pressure", "flow"],
                   "properties": {"fluid": {"type": "string", "minLength": 1},
                                  "mixture": {"type": "string", "minLength": 1},
                                  "curve": {"type": "string", "minLength": 1},
                                  "curve_units": {"type": "object", "additionalProperties": False,
                                                  "properties": {k: {"type": "string"} for k in CURVE_COLUMNS
                                                                 if CURVE_COLUMNS[k] is not None}},
                                  "condensate": {"$ref": "#/$defs/fluid"},
                                  **{k: _Q for k in _VAPOUR - {"fluid", "mixture", "curve", "curve_units",
                                                               "condensate"}}}},
        "coolant": {"type": "object", "additionalProperties": False, "required": ["fluid", "flow", "t_in"],
                    "properties": {"fluid": {"$ref": "#/$defs/fluid"}, **{k: _Q for k in _COOLANT - {"fluid"}}}},
        "air_side": {"type": "object", "additionalProperties": False, "required": ["t_in"],
                     "properties": {k: _Q for k in _AIR}},
        "revamp": {"type": "object", "additionalProperties": False,
                   "properties": {"vapour_load": _Q, "throughput": _Q}},
        "allowed": {"type": "object", "additionalProperties": False,
                    "properties": {"pressure": _Q, "temperature": _Q}},
        "options": {"type": "array", "items": {"type": "object", "required": ["type"], "properties": {"type": {
            "enum": sorted(set(_ST_OPTIONS) | set(_AIR_OPTIONS) | {"coolant_change"})}}}},
        "plant_data": {
            "type": "object", "additionalProperties": False, "required": ["file"],
            "description": "Shell and tube: measured coolant flow and temperatures with the condensing pressure (or "
                           "temperature), the fouling from the coolant-side heat balance. Air cooler: the condensing "
                           "pressure (or temperature), the condensate flow (or the stated vapour flow), the ambient, "
                           "and the air flow stated, measured or from the fan power.",
            "properties": {
                "file": {"type": "string", "minLength": 1},
                "columns": {"type": "object", "additionalProperties": False,
                            "properties": {k: _COLUMN for k in {**CONDENSER_PLANT_COLUMNS,
                                                                 **AIR_CONDENSER_PLANT_COLUMNS}}},
                "condensing_from": {"enum": sorted(CONDENSING_FROM)},
                "duty_from": {"enum": sorted(DUTY_FROM), "description": "Air cooler only."},
                "air_flow_from": {"enum": sorted(AIR_FLOW_FROM), "description": "Air cooler only."},
                "uncertainty": {"type": "object", "additionalProperties": False,
                                "properties": {"flow": _Q, "temperature": _Q, "pressure": _Q, "air_flow": _Q}},
                "steady": {"type": ["object", "boolean"]},
                "delimiter": {"enum": [",", ";", "\t", "|"]},
                "decimal": {"enum": [".", ","]},
                "timestamp_format": {"type": "string", "minLength": 2},
                "dayfirst": {"type": "boolean"},
                "timezone": {"type": "string", "minLength": 1},
            },
        },
    },
}


@dataclass(frozen=True)
class CondenserPlantData:
    """Where a condenser's plant data is and how to read it
    (:func:`revamp.monitoring_condenser.monitor_condenser_data`)."""

    file: object                          #: Path of the CSV file
    columns: dict                         #: standard name -> (CSV column, unit or None)
    condensing_from: str = "pressure"     #: "pressure" or "temperature"
    uncertainty: dict = None              #: {"flow": [-], "temperature": [K], "pressure": [-]} as given
    steady: object = None                 #: steady-state settings as written, False for none, None: defaults
    dialect: dict = None                  #: CSV dialect settings given
    duty_from: str | None = None          #: air cooler: "condensate" or "stated" (None: shell and tube)
    air_flow_from: str | None = None      #: air cooler: "stated", "measured" or "fan_power"

    def monitor_options(self) -> dict:
        """Keyword arguments of :func:`revamp.monitoring_condenser.monitor_condenser_data` this section gives."""
        out = {"columns": dict(self.columns), "condensing_from": self.condensing_from,
               "uncertainty": dict(self.uncertainty or {}) or None, "steady": self.steady,
               "dialect": dict(self.dialect or {})}
        if self.duty_from is not None:
            out.update(duty_from=self.duty_from, air_flow_from=self.air_flow_from)
        return out


@dataclass(frozen=True)
class CondenserCase:
    """One condenser of a unit, ready to rate (:func:`revamp.rate`), compare
    (:func:`revamp.options_condenser.compare_condenser`) and question on its condensing pressure
    (:func:`revamp.rating_condenser.condensing_pressure_for`)."""

    tag: str
    description: str
    exchanger: object
    service: object                       #: today: Service (shell and tube) or AirService (air cooler)
    condensing_side: str                  #: "shell" or "tube"
    coolant_side: str                     #: "tube", "shell" or "air"
    options: tuple = ()
    revamp_service: object = None         #: the service at the revamp vapour load (None: no revamp section)
    vapour_load: float | None = None      #: the revamp vapour load [kg/s]
    throughput: float = 1.0               #: revamp vapour load over today's vapour flow
    allowed_pressure: float | None = None     #: the highest condensing pressure allowed [Pa]
    allowed_temperature: float | None = None  #: or the highest condensing (dew-point) temperature allowed [K]
    dp_allowed: dict = None               #: {"condensing": Pa, "coolant": Pa} as given
    plant_data: CondenserPlantData | None = None
    index: int = -1
    curve_file: object = None             #: Path of the condensing-curve table file (None: a fluid or mixture)
    kind: str = CONDENSER_KIND

    @property
    def vapour(self):
        """Today's condensing stream."""
        return getattr(self.service, self.condensing_side)


#: quantity fields checked one by one before the constructors run: section -> field -> (kind, lower bound, strict)
_QUANTITIES = {
    "vapour": {"pressure": ("pressure", 0.0, True), "flow": ("mass_flow", 0.0, True),
               "quality": ("dimensionless", 0.0, False), "superheat": ("temperature_difference", 0.0, False),
               "fouling": ("fouling", 0.0, False), "dp_allowed": ("pressure", 0.0, True),
               "critical_pressure": ("pressure", 0.0, True)},
    "coolant": {"flow": ("mass_flow", 0.0, True), "t_in": ("temperature", 0.0, True),
                "fouling": ("fouling", 0.0, False), "dp_allowed": ("pressure", 0.0, True)},
    "revamp": {"vapour_load": ("mass_flow", 0.0, True), "throughput": ("dimensionless", 0.0, True)},
    "allowed": {"pressure": ("pressure", 0.0, True), "temperature": ("temperature", 0.0, True)},
}


def _quantities(section: dict, name: str, where: str, problems: list) -> dict:
    """Every quantity of ``section`` in SI (fields with problems left out, their problems appended)."""
    from ..units import to_si

    out = {}
    for key, (kind, low, strict) in _QUANTITIES[name].items():
        if key not in section:
            continue
        try:
            v = to_si(section[key], kind, key)
        except InputError as exc:
            problems.append(Problem(f"{where}.{key}", _show(section[key]), f"must be {exc.allowed}"))
            continue
        if not isinstance(v, float) or not np.isfinite(v):
            problems.append(Problem(f"{where}.{key}", _show(section[key]), "must be one finite value (not a list)"))
        elif low is not None and (v <= low if strict else v < low):
            problems.append(Problem(f"{where}.{key}", _show(section[key]),
                                    f"must be {'>' if strict else '>='} {low:g} (SI)"))
        else:
            out[key] = v
    return out


def _read_curve(file: str, units: dict, where: str, base, problems: list):
    """A condensing-curve table file (CSV) as the columns :func:`revamp.fluids.condensing_curve` takes (SI)."""
    import pandas as pd

    from ..units import to_si
    from ._building import _safe_file

    full, reason = _safe_file(file, base) if base is not None else (None, "must be read from a unit file")
    if reason:
        problems.append(Problem(f"{where}.curve", file, reason))
        return None
    try:
        frame = pd.read_csv(full, encoding="utf-8-sig")
    except Exception as exc:  # unreadable: one line naming the file
        problems.append(Problem(f"{where}.curve", file, f"must be a readable CSV file ({exc.__class__.__name__})"))
        return None
    table = {}
    for col in frame.columns:
        kind = CURVE_COLUMNS.get(col)
        unit = (units or {}).get(col)
        values = pd.to_numeric(frame[col], errors="coerce").to_numpy(float)
        if not np.all(np.isfinite(values)):
            problems.append(Problem(f"{where}.curve", file, f"must hold numbers only (column {col!r} has others)"))
            return None
        if kind is None and unit is not None:
            problems.append(Problem(f"{where}.curve_units.{col}", unit, "must not be given: the column is read in "
                                                                        "SI (or is not a curve column)"))
            return None
        if unit is None or kind is None:
            table[col] = values
            continue
        try:
            if kind == "specific_energy":
                if unit not in SPECIFIC_ENERGY:
                    raise InputError(col, unit, f"one of {', '.join(SPECIFIC_ENERGY)}")
                table[col] = values * SPECIFIC_ENERGY[unit]
            elif kind == "temperature":
                table[col] = np.array([to_si(f"{v} {unit}", kind, col) for v in values])
            else:
                table[col] = values * to_si(f"1 {unit}", kind, col)
        except InputError as exc:
            problems.append(Problem(f"{where}.curve_units.{col}", unit, f"must be {exc.allowed}"))
            return None
    return table


def _vapour_fluid(v: dict, q: dict, where: str, base, problems: list):
    """The condensing fluid of the ``vapour`` section (None with problems)."""
    from .. import fluids

    given = [k for k in ("fluid", "mixture", "curve") if k in v]
    if len(given) != 1:
        problems.append(Problem(where, ", ".join(given) or "(none)",
                                "must name the vapour one way: fluid (a pure fluid), mixture (CoolProp) or curve "
                                "(a condensing-curve CSV file)"))
        return None
    if "pressure" not in q:
        return None
    p = q["pressure"]
    if "condensate" in v and "curve" not in v:
        problems.append(Problem(f"{where}.condensate", _show(v["condensate"]), "must be given only with a curve (a "
                                "pure fluid's or a mixture's condensate comes from CoolProp)"))
        return None
    if "fluid" in v:
        name = v["fluid"]
        if not isinstance(name, str) or not name.strip():
            problems.append(Problem(f"{where}.fluid", _show(name), "must be a pure fluid's name (CoolProp)"))
            return None
        if any(c in name for c in "&[]|:"):
            problems.append(Problem(f"{where}.fluid", name, "must be one pure substance (a mixture goes under "
                                                            "'mixture', e.g. HEOS::n-Pentane[0.6]&n-Hexane[0.4])"))
            return None
        make = (lambda: fluids.water(p)) if name.strip().lower() == "water" else (lambda: fluids.pure(name, p))
        return _guard(problems, where, make, rename=lambda f: "fluid" if f.split(".")[-1] in ("name", "fluid") else f)
    if "mixture" in v:
        return _guard(problems, where, lambda: fluids.condensing_curve(mixture=v["mixture"], pressure=p),
                      rename=lambda f: "mixture" if f.startswith(("condensing_curve", "mixture", "table")) else f)
    if not isinstance(v["curve"], str):
        problems.append(Problem(f"{where}.curve", _show(v["curve"]), "must be the path of a CSV file"))
        return None
    units = v.get("curve_units") or {}
    if not isinstance(units, dict):
        problems.append(Problem(f"{where}.curve_units", _show(units), "must map a column to its unit"))
        return None
    _unknown(units, set(CURVE_COLUMNS), f"{where}.curve_units", problems)
    table = _read_curve(v["curve"], units, where, base, problems)
    if table is None:
        return None
    kw = {"critical_pressure": q["critical_pressure"]} if "critical_pressure" in q else {}
    if "condensate" in v:  # the subcooled condensate below the curve's bubble point (the curve's rows end there)
        from ._building import _build_fluid

        spec = v["condensate"]
        if not isinstance(spec, dict) or "kind" not in spec:
            problems.append(Problem(f"{where}.condensate", _show(spec), "must be a fluid mapping with a 'kind'"))
            return None
        kind = str(spec["kind"])
        kw["liquid"] = _guard(problems, f"{where}.condensate", lambda: _build_fluid(dict(spec)),
                              rename=lambda f: f[len(kind) + 1:] if f.startswith(kind + ".") else f)
        if kw["liquid"] is None:
            return None
    return _guard(problems, where, lambda: fluids.condensing_curve(table=table, pressure=p, name=str(v["curve"]),
                                                                   **kw),
                  rename=lambda f: "curve" if f.startswith(("table", "condensing_curve")) else f)


def _vapour_stream(v: dict, q: dict, fluid, where: str, problems: list):
    """Today's condensing stream: saturated at ``quality`` (default 1) or superheated by ``superheat``."""
    from .. import fluids
    from ..service import Stream

    if "quality" in v and "superheat" in v:
        problems.append(Problem(f"{where}.superheat", _show(v["superheat"]),
                                "must not be given with quality (a saturated inlet has no superheat)"))
        return None
    if "quality" in q and q["quality"] > 1.0:
        problems.append(Problem(f"{where}.quality", _show(v["quality"]), "must be between 0 and 1"))
        return None
    if fluid is None or "flow" not in q:
        return None
    if "superheat" in q and q["superheat"] > 0:
        curve = fluid if hasattr(fluid, "t_dew") else _guard(problems, where, lambda: fluids.condensing(fluid))
        if curve is None:
            return None
        return _guard(problems, where, lambda: Stream(fluid, q["flow"], t_in=float(curve.t_dew) + q["superheat"],
                                                      phase="vapour"))
    return _guard(problems, where, lambda: Stream(fluid, q["flow"], quality=q.get("quality", 1.0)))


def _shell_and_tube(geo: dict, tag, where: str, problems: list):
    from .. import geometry
    from ._reading import schema

    allowed = set(schema()["$defs"]["geometry"]["properties"])
    before = len(problems)
    _unknown(geo, allowed, where, problems)
    g = dict(geo)
    tema = g.pop("tema_type", None)
    if tema is not None:
        code = str(tema).strip().upper()
        if len(code) == 3 and code[1] in geometry.SHELL_TYPES:
            g["shell_type"] = code[1]
        else:
            problems.append(Problem(f"{where}.tema_type", str(tema), "must be a three-letter TEMA designation whose "
                                    f"shell letter (the middle one) is one of {', '.join(geometry.SHELL_TYPES)}"))
    if len(problems) > before:
        return None
    return _guard(problems, where, lambda: geometry.ShellAndTube(**g, tag=str(tag)))


def _air_cooler(geo: dict, tag, where: str, problems: list):
    from .. import aircooler
    before = len(problems)
    _unknown(geo, _AIR_GEOMETRY, where, problems)
    _quantity_problems(geo, "geometry", where, problems)
    fin_spec = _mapping(geo, "fin", where, problems)
    fin = None
    if fin_spec is not None:
        _unknown(fin_spec, _FIN, f"{where}.fin", problems)
        fin = _guard(problems, f"{where}.fin", lambda: aircooler.Fin(**fin_spec),
                     rename=lambda f: f[4:] if f.startswith("fin.") else f)
    if fin is None or len(problems) > before:
        return None
    kw = {k: v for k, v in geo.items() if k != "fin"}
    return _guard(problems, where, lambda: aircooler.AirCooler(**kw, fin=fin, name=str(tag)))


def _coolant_stream(c: dict, where: str, problems: list):
    from ..service import Stream
    from ._building import _build_fluid

    before = len(problems)
    _unknown(c, _COOLANT, where, problems)
    _quantities(c, "coolant", where, problems)
    spec = c.get("fluid")
    fluid = None
    if not isinstance(spec, dict) or "kind" not in spec:
        problems.append(Problem(f"{where}.fluid", _show(spec), "must be a fluid mapping with a 'kind'"))
    else:
        kind = str(spec["kind"])
        fluid = _guard(problems, f"{where}.fluid", lambda: _build_fluid(dict(spec)),
                       rename=lambda f: f[len(kind) + 1:] if f.startswith(kind + ".") else f)
    for key in ("flow", "t_in"):
        if key not in c:
            problems.append(Problem(f"{where}.{key}", "(missing)", "must be given"))
    if fluid is None or len(problems) > before:
        return None
    return _guard(problems, where, lambda: Stream(fluid, c["flow"], c["t_in"]))


def _options(specs, exchanger, svc, is_air: bool, coolant_side: str, pre: str, problems: list) -> list:
    from .. import options as options_mod
    from .. import options_air, options_condenser
    from ._building import _build_option

    if specs is None:
        return []
    if not isinstance(specs, list):
        problems.append(Problem(f"{pre}.options", _show(specs), "must be a list of options"))
        return []
    allowed = ({"coolant_change"} | (set(_AIR_OPTIONS) | {"twisted_tape", "wire_coil"} if is_air
                                     else set(_ST_OPTIONS)))
    out, labels = [], {}
    for j, spec in enumerate(specs):
        where = f"{pre}.options[{j}]"
        kind = spec.get("type") if isinstance(spec, dict) else None
        if kind not in allowed:
            problems.append(Problem(f"{where}.type", _show(kind if isinstance(spec, dict) else spec),
                                    f"must be one of {', '.join(sorted(allowed))} (for a condenser "
                                    f"{'air cooler' if is_air else 'shell and tube'})"))
            continue
        params = {k: v for k, v in spec.items() if k not in ("type", "capex", "note")}
        if kind == "coolant_change":
            _unknown({k: v for k, v in params.items() if k != "label"}, _COOLANT_CHANGE, where, problems)
            opt = _guard(problems, where, lambda: options_condenser.CoolantChange(**params),
                         rename=lambda f: f.split(".", 1)[-1] if f.startswith("CoolantChange") else f)
        elif kind in _AIR_OPTIONS:
            cls_name, fields = _AIR_OPTIONS[kind]
            _unknown({k: v for k, v in params.items() if k != "label"}, fields, where, problems)
            opt = _guard(problems, where, lambda: getattr(options_air, cls_name)(**params),
                         rename=lambda f: f.split(".", 1)[-1])
        elif is_air:  # inserts in an air cooler's tubes: where the vapour condenses, refused below
            cls = getattr(options_mod, {"twisted_tape": "TwistedTape", "wire_coil": "WireCoil"}[kind])
            opt = _guard(problems, where, lambda: cls(**params), rename=lambda f: f.split(".", 1)[-1])
        else:
            opt = _guard(problems, where, lambda: _build_option(dict(spec)), rename=lambda f: f.split(".", 1)[-1])
        if opt is None:
            continue
        label = str(getattr(opt, "label", None) or f"{kind} {j + 1}")
        if label in labels or label.strip().lower() in ("base", "today", "revamp"):
            problems.append(Problem(f"{where}.label" if "label" in spec else where, label,
                                    "must be a label of its own (not repeated, not base, today or revamp)"))
            continue
        if kind in ("twisted_tape", "wire_coil") and coolant_side != "tube":
            problems.append(Problem(f"{where}.type", kind, "must not be a tube insert where the vapour condenses in "
                                                           "the tubes (the condensing correlations have no insert "
                                                           "form): inserts go on a tube-side coolant"))
            continue
        if exchanger is not None and svc is not None:  # apply once (no rating): what the study would refuse
            if _guard(problems, where, lambda: opt.apply(exchanger, svc), rename=lambda f: f.split(".", 1)[-1]) \
                    is None:
                continue
        labels[label] = j
        out.append(opt)
    return out


def _plant_data(pd_spec: dict, where: str, base, problems: list, is_air: bool = False):
    """Check and build a condenser's ``plant_data`` section (None with problems, appended)."""
    from ..units import to_si
    from ._building import _csv_head, _safe_file

    start = len(problems)
    _unknown(pd_spec, _PLANT | _PLANT_AIR if is_air else _PLANT, where, problems)
    known = AIR_CONDENSER_PLANT_COLUMNS if is_air else CONDENSER_PLANT_COLUMNS
    file = pd_spec.get("file")
    if not isinstance(file, str) or not file.strip():
        problems.append(Problem(f"{where}.file", _show(file), "must be the path of a CSV file"))
        return None
    full, reason = _safe_file(file, base) if base is not None else (None, "must be read from a unit file")
    if reason:
        problems.append(Problem(f"{where}.file", file, reason))
        return None
    source = pd_spec.get("condensing_from", "pressure")
    if source not in CONDENSING_FROM:
        problems.append(Problem(f"{where}.condensing_from", _show(source),
                                f"must be one of {', '.join(CONDENSING_FROM)}"))
        return None
    dialect = {k: pd_spec[k] for k in _DIALECT if k in pd_spec}
    from ..monitoring.data import CsvDialect, dialect_problem

    try:
        CsvDialect.make(dialect)
    except InputError as exc:
        problems.append(Problem(f"{where}.{exc.field}", _show(exc.value), f"must be {exc.allowed}"))
        dialect = {}
    given = pd_spec.get("columns") or {}
    if not isinstance(given, dict):
        problems.append(Problem(f"{where}.columns", _show(given), "must be a mapping of standard name -> column"))
        given = {}
    _unknown(given, set(known), f"{where}.columns", problems)
    duty_from = air_from = None
    if is_air:
        duty_from, air_from = pd_spec.get("duty_from", "condensate"), pd_spec.get("air_flow_from", "stated")
        for key, value, allowed in (("duty_from", duty_from, DUTY_FROM), ("air_flow_from", air_from, AIR_FLOW_FROM)):
            if value not in allowed:
                problems.append(Problem(f"{where}.{key}", _show(value), f"must be one of {', '.join(allowed)}"))
        if len(problems) > start:
            return None
        need = ["timestamp", "air_t_in", CONDENSING_FROM[source]] + [
            c for c in (DUTY_FROM[duty_from], AIR_FLOW_FROM[air_from]) if c]
    else:
        need = ["timestamp", "coolant_flow", "coolant_t_in", "coolant_t_out", CONDENSING_FROM[source]]
    if "condensate_t" in given:  # optional: the condensate outlet (read from the file by its standard name too)
        need.append("condensate_t")
    columns = {}
    for std in need:
        spec = given.get(std, std)
        if isinstance(spec, str):
            name, unit = spec, None
        elif isinstance(spec, dict) and isinstance(spec.get("column"), str):
            name, unit = spec["column"], spec.get("unit")
            kind = known[std]
            if unit is not None and kind is not None:
                try:
                    to_si(f"1 {unit}", kind, "unit")
                except InputError as exc:
                    problems.append(Problem(f"{where}.columns.{std}.unit", _show(unit), f"must be {exc.allowed}"))
        else:
            problems.append(Problem(f"{where}.columns.{std}", _show(spec), "must be a column name or {column, unit}"))
            continue
        columns[std] = (name, unit)
    unc = pd_spec.get("uncertainty") or {}
    uncertainty = {}
    if not isinstance(unc, dict):
        problems.append(Problem(f"{where}.uncertainty", _show(unc), "must be a mapping of flow, temperature, "
                                                                    "pressure"))
        unc = {}
    _unknown(unc, {"flow", "temperature", "pressure"} | ({"air_flow"} if is_air else set()), f"{where}.uncertainty",
             problems)
    for key, kind, hi in (("flow", "dimensionless", 1.0), ("temperature", "temperature_difference", 50.0),
                          ("pressure", "dimensionless", 1.0), ("air_flow", "dimensionless", 1.0)):
        if key in unc:
            try:
                v = to_si(unc[key], kind, key)
            except InputError as exc:
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be {exc.allowed}"))
                continue
            if not (isinstance(v, float) and 0.0 <= v < hi):
                problems.append(Problem(f"{where}.uncertainty.{key}", _show(unc[key]), f"must be >= 0 and < {hi:g}"))
            else:
                uncertainty[key] = v
    steady = pd_spec.get("steady")
    if steady is not None and not isinstance(steady, (bool, dict)):
        problems.append(Problem(f"{where}.steady", _show(steady), "must be true, false or a mapping of window, "
                                                                  "flow_rsd, t_range, min_rows"))
    elif isinstance(steady, dict):
        _unknown(steady, {"window", "flow_rsd", "t_range", "min_rows"}, f"{where}.steady", problems)
    if len(problems) > start:
        return None
    try:
        header, rows, lines = _csv_head(full, dialect.get("delimiter", ","))
    except Exception as exc:  # unreadable: one line naming the file, never a traceback
        problems.append(Problem(f"{where}.file", file, f"must be a readable UTF-8 CSV file "
                                                       f"({exc.__class__.__name__}: {str(exc)[:80]})"))
        return None
    names = [name for name, _ in columns.values()]
    if any(name not in header for name in names):
        problem = dialect_problem(lines, names, dialect)
        if problem is not None:
            problems.append(Problem(f"{where}.delimiter", _show(pd_spec.get("delimiter", ",")),
                                    f"must be {problem.allowed}"))
            return None
        for std, (name, _) in columns.items():
            if name not in header:
                problems.append(Problem(f"{where}.columns.{std}", name,
                                        f"must be a column of {file} (it has: {', '.join(header)[:200]})"))
        return None
    return CondenserPlantData(file=full, columns=columns, condensing_from=source, uncertainty=uncertainty,
                              steady=steady, dialect=dialect, duty_from=duty_from, air_flow_from=air_from)


def build_condenser(i: int, x: dict, problems: list, base=None) -> CondenserCase | None:
    """Check and build ``exchangers[i]`` of ``kind: condenser``; problems are appended (paths from the file).

    ``base`` is the unit file's folder (for ``vapour.curve`` and ``plant_data.file``)."""
    from ..service import Service
    from ..service_air import AirService
    from ._building import _safe_file

    pre, start = f"exchangers[{i}]", len(problems)
    if not isinstance(x, dict):
        problems.append(Problem(pre, _show(x), "must be a mapping"))
        return None
    _unknown(x, _ENTRY, pre, problems)
    tag = x.get("tag")
    if not isinstance(tag, str) or not tag.strip():
        problems.append(Problem(f"{pre}.tag", _show(tag), "must be a non-empty name"))
    kind = x.get("exchanger", "shell and tube")
    if kind not in EXCHANGER_TYPES:
        problems.append(Problem(f"{pre}.exchanger", _show(kind), f"must be one of {', '.join(EXCHANGER_TYPES)}"))
        return None
    is_air = kind == "air cooler"
    side = x.get("condensing_side", "tube" if is_air else "shell")
    if side not in ("shell", "tube") or (is_air and side != "tube"):
        problems.append(Problem(f"{pre}.condensing_side", _show(side),
                                "must be tube for an air cooler" if is_air else "must be shell or tube"))
        return None
    coolant_side = "air" if is_air else ("tube" if side == "shell" else "shell")
    wrong = "coolant" if is_air else "air_side"
    if wrong in x:
        problems.append(Problem(f"{pre}.{wrong}", "(given)", f"must not be given for a condenser {kind} (it takes "
                                                            f"{'air_side' if is_air else 'coolant'})"))
    geo = _mapping(x, "geometry", pre, problems)
    vap = _mapping(x, "vapour", pre, problems)
    cool = _mapping(x, "air_side" if is_air else "coolant", pre, problems)
    exchanger = None
    if geo is not None:
        exchanger = (_air_cooler if is_air else _shell_and_tube)(geo, tag, f"{pre}.geometry", problems)
    stream = None
    q = {}
    if vap is not None:
        _unknown(vap, _VAPOUR, f"{pre}.vapour", problems)
        before = len(problems)
        q = _quantities(vap, "vapour", f"{pre}.vapour", problems)
        for key in ("pressure", "flow"):
            if key not in vap:
                problems.append(Problem(f"{pre}.vapour.{key}", "(missing)", "must be given"))
        if len(problems) == before:
            fluid = _vapour_fluid(vap, q, f"{pre}.vapour", base, problems)
            stream = _vapour_stream(vap, q, fluid, f"{pre}.vapour", problems)
    svc = None
    if is_air and cool is not None:
        _unknown(cool, _AIR, f"{pre}.air_side", problems)
        before = len(problems)
        from ._aircooler import _quantity_problems as air_quantities

        air_quantities(cool, "air_side", f"{pre}.air_side", problems)
        if stream is not None and len(problems) == before:
            names = {"t_in": "air_in", "flow": "air_flow", "fouling": "fouling_air"}
            back = {v: k for k, v in names.items()}
            kw = {names.get(k, k): v for k, v in cool.items()}
            svc = _guard(problems, pre, lambda: AirService(tube=stream, fouling_tube=q.get("fouling", 0.0), **kw),
                         rename=lambda f: "vapour.fouling" if f == "fouling_tube" else "air_side." + back.get(f, f))
    elif cool is not None:
        coolant = _coolant_stream(cool, f"{pre}.coolant", problems)
        if stream is not None and coolant is not None:
            fouling = {f"fouling_{side}": q.get("fouling", 0.0),
                       f"fouling_{coolant_side}": _quantities(cool, "coolant", "", []).get("fouling", 0.0)}
            svc = _guard(problems, pre, lambda: Service(**{side: stream, coolant_side: coolant}, **fouling),
                         rename=lambda f: {side: "vapour", coolant_side: "coolant"}.get(f.split(".")[0], f))
    if svc is not None:  # the coolant must be colder than the vapour's bubble point to condense anything
        from ..rating_condenser import _curve_of

        t_cool = float(svc.air_in if is_air else getattr(svc, coolant_side).t_in)
        curve = _guard(problems, f"{pre}.vapour", lambda: _curve_of(stream.fluid))
        if curve is not None and t_cool >= float(curve.t_dew):
            where = f"{pre}.air_side.t_in" if is_air else f"{pre}.coolant.t_in"
            problems.append(Problem(where, f"{t_cool - 273.15:.6g} degC", f"must be below the vapour's dew point "
                                    f"({float(curve.t_dew) - 273.15:.6g} degC at its pressure): nothing condenses"))
            svc = None
    rv = _mapping(x, "revamp", pre, problems, required=False)
    load, throughput = None, 1.0
    if rv is not None:
        _unknown(rv, {"vapour_load", "throughput"}, f"{pre}.revamp", problems)
        r = _quantities(rv, "revamp", f"{pre}.revamp", problems)
        if ("vapour_load" in rv) == ("throughput" in rv):
            problems.append(Problem(f"{pre}.revamp", ", ".join(sorted(rv)) or "(empty)",
                                    "must give one of vapour_load (kg/s) or throughput (a factor on today's vapour "
                                    "flow)"))
        elif "throughput" in r and r["throughput"] > MAX_THROUGHPUT:
            problems.append(Problem(f"{pre}.revamp.throughput", _show(rv["throughput"]),
                                    f"must be > 0 and <= {MAX_THROUGHPUT:g}"))
        elif "flow" in q:
            load = r.get("vapour_load", q["flow"] * r.get("throughput", np.nan))
            throughput = load / q["flow"] if np.isfinite(load) else 1.0
            if not np.isfinite(load):
                load = None
    allowed = _mapping(x, "allowed", pre, problems, required=False)
    a = {}
    if allowed is not None:
        _unknown(allowed, {"pressure", "temperature"}, f"{pre}.allowed", problems)
        a = _quantities(allowed, "allowed", f"{pre}.allowed", problems)
        if len(allowed) != 1:
            problems.append(Problem(f"{pre}.allowed", ", ".join(sorted(allowed)) or "(empty)",
                                    "must give one of pressure or temperature (the highest condensing pressure, or "
                                    "dew point, the column may run at)"))
    dp = {}
    if vap is not None and "dp_allowed" in q:
        dp["condensing"] = q["dp_allowed"]
    if cool is not None and not is_air:
        c = _quantities(cool, "coolant", "", [])
        if "dp_allowed" in c:
            dp["coolant"] = c["dp_allowed"]
    revamp_service = None
    if svc is not None and load is not None:
        revamp_service = _guard(problems, f"{pre}.revamp", lambda: svc.replace(
            **{side: getattr(svc, side).replace(flow=load)}))
    opts = _options(x.get("options"), exchanger, revamp_service or svc, is_air, coolant_side, pre, problems)
    plant = None
    pd_spec = _mapping(x, "plant_data", pre, problems, required=False)
    if pd_spec is not None:
        plant = _plant_data(pd_spec, f"{pre}.plant_data", base, problems, is_air=is_air)
    if len(problems) > start or exchanger is None or svc is None:
        return None
    return CondenserCase(tag=tag, description=str(x.get("description", "")), exchanger=exchanger, service=svc,
                         condensing_side=side, coolant_side=coolant_side, options=tuple(opts),
                         revamp_service=revamp_service, vapour_load=load, throughput=throughput,
                         allowed_pressure=a.get("pressure"), allowed_temperature=a.get("temperature"),
                         dp_allowed=dp, plant_data=plant, index=i,
                         curve_file=_safe_file(vap["curve"], base)[0] if "curve" in vap and base is not None else None)


def condenser_problems(i: int, x: dict, base=None) -> list[Problem]:
    """Every problem of ``exchangers[i]`` (a condenser entry); empty when it builds."""
    problems: list[Problem] = []
    build_condenser(i, x, problems, base)
    return problems
